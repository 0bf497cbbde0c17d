"""Layout rules: coil and piping arrangements that trap steam pockets or form
condensate slugs, from ``[geometry]`` and ``[drain]``.

Each rule gives a finding with a stable code, a severity and the facts its message
(what happens and what to do, :mod:`stallcheck.render.words`) quotes. Severity rises where the computed state makes the hazard
live: a coil that runs near or below its stall point has lost the differential that
would otherwise push condensate out ahead of the steam. The README lists every rule
with where it comes from.
"""

from __future__ import annotations

from stallcheck.inputs import Unit
from stallcheck.result import Finding, Result

#: A vertical drop to the trap at least this long can hold a sealing slug [m]
#: (3 ft; common practice, from memory).
LONG_DROP = 0.9
#: "Near the stall": within this many points of load above the stall point [-] (ten
#: points: the swing of load across a mild day; common practice, from memory).
NEAR_STALL = 0.10


def live(r: Result) -> bool:
    """True where the unit runs at or near its stall point within its operating range
    (and so runs with little or no differential across the coil)."""
    s = r.stall
    return bool(s.occurs and s.load_fraction + NEAR_STALL > r.minimum_load)


def rules(unit: Unit, r: Result) -> list[Finding]:
    """The layout findings for one unit (none without ``[geometry]``)."""
    g = unit.geometry
    out: list[Finding] = []
    hot = live(r)
    purge_holds = r.drainage.installed == "constant-purge" and (r.purge is None or r.purge.holds_differential)
    if g is None:
        return out

    if g.supply_feed == "center" and not g.distributing_tubes:
        if purge_holds and not r.stall.in_range:
            severity, tail = "info", "purge-holds"
        elif r.drainage.installed == "constant-purge":
            severity, tail = "danger" if hot else "warning", "purge-fails"
        else:
            severity, tail = "danger" if hot else "warning", "fix"
        out.append(Finding("tube-fill-both-ends", severity, ("", "near" if hot else "far", tail)))

    if g.coils_per_trap is not None and g.coils_per_trap > 1:
        out.append(Finding("group-trapping", "danger" if hot else "warning", ("",), {"coils": g.coils_per_trap}))

    drop = g.drop_to_trap if g.drop_to_trap is not None else unit.drain.fill_head
    if g.drop_vented is False and drop >= LONG_DROP:
        out.append(Finding("drop-not-vented", "warning" if hot else "info", ("",), {"drop": drop}))

    if g.drip_before_valve is False:
        out.append(Finding("valve-not-dripped", "warning"))

    if g.tubes == "horizontal" and g.pitched_to_return is False:
        out.append(Finding("tubes-not-pitched", "danger" if hot else "warning", ("", "near", "fix") if hot else ("", "fix")))
    return out
