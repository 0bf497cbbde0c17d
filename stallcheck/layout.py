"""Layout rules: coil and piping arrangements that trap steam pockets or form
condensate slugs, from ``[geometry]`` and ``[drain]``.

Each rule gives a finding with a stable code, a severity and a message that says what
happens and what to do. Severity rises where the computed state makes the hazard
live: a coil that runs near or below its stall point has lost the differential that
would otherwise push condensate out ahead of the steam. The README lists every rule
with where it comes from.
"""

from __future__ import annotations

from stallcheck import quantities as q
from stallcheck.inputs import Unit
from stallcheck.result import Finding, Result

#: A vertical drop to the trap at least this long can hold a sealing slug [m]
#: (3 ft; common practice, from memory).
LONG_DROP = 0.9
#: "Near the stall": within this many points of load above the stall point [-].
NEAR_STALL = 0.10


def live(r: Result) -> bool:
    """True where the unit runs at or near its stall point within its operating range
    (and so runs with little or no differential across the coil)."""
    s = r.stall
    return bool(s.occurs and s.load_fraction + NEAR_STALL > r.minimum_load)


def rules(unit: Unit, r: Result, system: str) -> list[Finding]:
    """The layout findings for one unit (none without ``[geometry]``, except those
    that ``[drain]`` alone decides)."""
    g = unit.geometry
    out: list[Finding] = []
    hot = live(r)
    purge_holds = r.drainage.installed == "constant-purge" and (r.purge is None or r.purge.holds_differential)
    if g is None:
        return out

    if g.supply_feed == "center" and not g.distributing_tubes:
        if purge_holds and not r.stall.in_range:
            severity, tail = "info", ("The installed constant purge keeps steam moving from the supply end at "
                                      "every load; keep it open and clean.")
        elif r.drainage.installed == "constant-purge":
            severity = "danger" if hot else "warning"
            tail = ("The installed purge cannot hold the differential at low load (see purge-cannot-hold): drain "
                    "the coil so it does not stall, or use an end-fed coil or one with steam-distributing tubes.")
        else:
            severity = "danger" if hot else "warning"
            tail = ("Hold a positive differential at every load (a constant-purge drain) so the tubes fill only "
                    "from the supply end, or use an end-fed coil or one with steam-distributing inner tubes.")
        out.append(Finding(
            "tube-fill-both-ends", severity,
            "Steam enters the supply header at its centre and the coil has no steam-distributing tubes: "
            "steam reaches the return header through the middle tubes first and then enters the outer tubes "
            "from both ends. Condensate waves moving toward each other shut in a steam pocket, which collapses "
            "and hammers" + (", and this coil runs at or near its stall point, where the differential that "
                             "would clear the tubes is lost. " if hot else ". ") + tail))

    if g.coils_per_trap is not None and g.coils_per_trap > 1:
        out.append(Finding(
            "group-trapping", "danger" if hot else "warning",
            f"{g.coils_per_trap} coils drain through one trap: coils at different pressures short-circuit, and "
            f"the one at lower pressure is fed backwards from its return side, holding condensate that "
            f"hammers. Give each coil its own trap (common practice)."))

    drop = g.drop_to_trap if g.drop_to_trap is not None else unit.drain.fill_head
    if g.drop_vented is False and drop >= LONG_DROP:
        out.append(Finding(
            "drop-not-vented", "warning" if hot else "info",
            f"The {q.show(drop, 'length', system)} drop to the trap is not back-vented to the steam space: a "
            f"condensate slug can seal it, the steam below condenses and the slug is driven into the trap. "
            f"Vent the drop back to the coil's steam side above the water line (common practice)."))

    if g.drip_before_valve is False:
        out.append(Finding(
            "valve-not-dripped", "warning",
            "There is no drip leg and trap just ahead of the control valve: condensate pools there while the "
            "valve is shut and is driven through as a slug when it opens. Fit a drip leg with its own trap "
            "upstream of the valve (common practice)."))

    if g.tubes == "horizontal" and g.pitched_to_return is False:
        out.append(Finding(
            "tubes-not-pitched", "danger" if hot else "warning",
            "The horizontal tubes are not pitched toward the return: condensate lies in them, and steam "
            "driven over it raises waves that hammer" + (" - worse here, as the coil runs near its stall "
                                                          "point" if hot else "")
            + ". Pitch the coil toward its return header (common practice: as the coil maker directs)."))
    return out
