"""What single change moves the stall point down to the minimum load.

The unit drains at load f while p_coil(f) + ρ·g·fill_head > p_return + ρ·g·lift + Δp_trap.
Holding that with equality at the minimum load f_min, where the coil pressure is
p_min, and solving it for one term at a time gives the limit of each: the largest
lift, return pressure and trap differential, the smallest fill head, and the smallest
design steam pressure (a smaller coil run hotter at full load, which keeps the coil
pressure up at part load). Each is exact, not a search: the density ρ depends only
on the return pressure, and the coil model has a closed-form inverse.
"""

from __future__ import annotations

import numpy as np

from stallcheck import coil as coilmod
from stallcheck import properties
from stallcheck import quantities as q
from stallcheck.drainage import head
from stallcheck.inputs import Unit
from stallcheck.quantities import GRAVITY
from stallcheck.result import Remedy

#: Highest design steam pressure proposed [Pa] (the unit file's own limit).
DESIGN_PRESSURE_LIMIT = 2.0e6


def solve(unit: Unit, coil: coilmod.CoilModel, p_min: float, system: str) -> tuple[Remedy, ...]:
    """The limit of each single change (see the module docstring).

    Parameters
    ----------
    unit : Unit
    coil : CoilModel
    p_min : float
        Coil pressure the minimum load needs. [Pa]
    system : str
        ``"si"`` or ``"us"``, for the words.

    Returns
    -------
    tuple of Remedy
        Lift, return pressure, trap minimum differential, fill head, design steam
        pressure, in that order.
    """
    dr = unit.drain
    atm = unit.site.atmospheric_pressure
    f_min = unit.load.minimum
    rho = float(properties.liquid_density(dr.return_pressure))
    fill_p = head(dr.fill_head, rho)
    back = dr.return_pressure + head(dr.lift, rho)
    below = f"below {f_min:.0%} load" if f_min > 0 else "at every load"
    down_to = f"down to {f_min:.0%} load" if f_min > 0 else "at every load"

    def p(pa, kind="pressure"):
        return q.show(pa, kind, system, atm)

    def length(m):
        return q.show(m, "length", system)

    out = []
    # Lift: p_min + fill = return + ρ·g·lift + Δp_trap
    lift = (p_min + fill_p - dr.return_pressure - dr.trap_min_differential) / (rho * GRAVITY)
    if lift < 0:
        out.append(Remedy("drain.lift", "length", dr.lift, None,
                          f"no lift keeps this unit draining {below}: even with none, the coil pressure "
                          f"there ({p(p_min)}) falls below the return pressure ({p(dr.return_pressure)}) "
                          f"and the trap's own differential first"))
    else:
        out.append(Remedy("drain.lift", "length", dr.lift, lift,
                          f"a lift of at most {length(lift)} after the trap keeps it draining {down_to} "
                          f"(now {length(dr.lift)})"))

    # Return pressure: r + ρ(r)·g·(lift − fill) + Δp_trap = p_min, ρ at r (a few passes).
    r = dr.return_pressure
    for _ in range(4):
        dens = float(properties.liquid_density(min(max(r, properties.P_MIN), properties.P_CRIT)))
        r = p_min - dr.trap_min_differential - dens * GRAVITY * (dr.lift - dr.fill_head)
    if r < properties.P_MIN:
        out.append(Remedy("drain.return_pressure", "pressure", dr.return_pressure, None,
                          f"no return pressure keeps it draining {below}: the lift needs more than the coil "
                          f"has there ({p(p_min)}) even against a full vacuum"))
    else:
        vacuum = " (below atmospheric: only a vacuum return holds that)" if r < atm else ""
        out.append(Remedy("drain.return_pressure", "pressure", dr.return_pressure, r,
                          f"a return pressure of at most {p(r)}{vacuum} keeps it draining {down_to} "
                          f"(now {p(dr.return_pressure)})"))

    # Trap minimum differential: Δp = p_min + fill − back
    dp = p_min + fill_p - back
    if dp <= 0:
        out.append(Remedy("drain.trap_min_differential", "differential", dr.trap_min_differential, None,
                          f"no trap keeps it draining {below}: there the coil pressure plus the fill head "
                          f"({p(p_min + fill_p)}) is already at or below the back pressure ({p(back)})"))
    else:
        out.append(Remedy("drain.trap_min_differential", "differential", dr.trap_min_differential, dp,
                          f"a trap that opens at {p(dp, 'differential')} or less keeps it draining {down_to} "
                          f"(now {p(dr.trap_min_differential, 'differential')})"))

    # Fill head: ρ·g·fill = back + Δp_trap − p_min
    fill = max((back + dr.trap_min_differential - p_min) / (rho * GRAVITY), 0.0)
    if fill > dr.fill_head:
        note = (f"a fill head of {length(fill)} ({length(fill - dr.fill_head)} more than now) keeps it "
                f"draining {down_to}")
        if fill > 3.0:
            note += "; that much height is seldom available, so a pump-trap is the practical fix"
    else:
        note = f"a fill head of {length(fill)} is enough to drain {down_to} (now {length(dr.fill_head)})"
    out.append(Remedy("drain.fill_head", "length", dr.fill_head, fill, note))

    out.append(_design_pressure(unit, coil, back + dr.trap_min_differential - fill_p, below, down_to, p))
    return tuple(out)


def _design_pressure(unit: Unit, coil: coilmod.CoilModel, threshold: float, below: str, down_to: str,
                     p) -> Remedy:
    """Design steam pressure at which the coil needs exactly the stall pressure at f_min."""
    current = unit.design.steam_pressure
    key = "design.steam_pressure"
    if threshold <= properties.P_MIN:
        return Remedy(key, "pressure", current, properties.P_MIN,
                      "any design pressure: the trap drains even with the coil at the bottom of the steam tables")
    t_threshold = float(properties.saturation_temperature(min(threshold, properties.P_CRIT)))
    t_design = coilmod.design_steam_temperature_for(coil, unit.load.minimum, t_threshold)
    if not np.isfinite(t_design):
        if t_threshold <= coil.outlet:
            return Remedy(key, "pressure", current, properties.P_MIN,
                          "any design pressure: the stall pressure is below the set point's saturation pressure")
        return Remedy(key, "pressure", current, None,
                      f"no design pressure keeps it draining {below}: at no load the coil needs only the "
                      f"set point's saturation pressure, below the stall pressure ({p(threshold)})")
    if t_design >= properties.T_CRIT or float(properties.saturation_pressure(t_design)) > DESIGN_PRESSURE_LIMIT:
        return Remedy(key, "pressure", current, None,
                      f"no practical design pressure keeps it draining {below}: it would take more than "
                      f"{p(DESIGN_PRESSURE_LIMIT)} at full load")
    value = float(properties.saturation_pressure(max(t_design, properties.T_MIN)))
    if value > current:
        note = (f"a smaller coil selected for {p(value)} at full load (now {p(current)}) keeps the coil "
                f"pressure up and drains {down_to}")
        if value >= unit.supply_pressure:
            note += f"; that is above the supply pressure ({p(unit.supply_pressure)}), so the supply must rise too"
    else:
        note = f"a design pressure down to {p(value)} still drains {down_to} (now {p(current)})"
    return Remedy(key, "pressure", current, value, note)
