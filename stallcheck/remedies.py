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
from stallcheck.inputs import Unit
from stallcheck.quantities import GRAVITY
from stallcheck.result import Remedy

#: Highest design steam pressure proposed [Pa] (the unit file's own limit).
DESIGN_PRESSURE_LIMIT = 2.0e6


def solve(b, p_min, systems) -> list[tuple[Remedy, ...]]:
    """The limit of each single change (see the module docstring), for every unit of a
    batch.

    Parameters
    ----------
    b : analysis.Batch
    p_min : ndarray
        Coil pressure each unit needs at its minimum load. [Pa]
    systems : list of str
        ``"si"`` or ``"us"`` for each unit's words.

    Returns
    -------
    list of tuple of Remedy
        For each unit: lift, return pressure, trap minimum differential, fill head and
        design steam pressure, in that order.
    """
    rho, back, fill_p = b.density, b.back, b.fill
    lift = (p_min + fill_p - b.return_pressure - b.trap_min) / (rho * GRAVITY)
    # return pressure r: r + ρ(r)·g·(lift − fill) + Δp_trap = p_min, ρ at r (a few passes)
    r = b.return_pressure.copy()
    for _ in range(4):
        dens = properties.liquid_density(np.clip(r, properties.P_MIN, properties.P_CRIT))
        r = p_min - b.trap_min - dens * GRAVITY * (b.lift - b.fill_height)
    dp = p_min + fill_p - back
    fill = np.maximum((back + b.trap_min - p_min) / (rho * GRAVITY), 0.0)
    design_t = _design_temperatures(b)
    return [_words(b.units[i], systems[i], float(p_min[i]), float(lift[i]), float(r[i]), float(dp[i]),
                   float(fill[i]), float(back[i]), float(fill_p[i]), float(b.threshold[i]), design_t[i])
            for i in range(len(b.units))]


def _design_temperatures(b) -> list:
    """Design steam temperature [K] putting each unit's stall at its minimum load, or a
    reason word where none does (see :func:`_design_pressure`)."""
    thr = b.threshold
    valid = thr > properties.P_MIN
    t_thr = properties.saturation_temperature(np.clip(thr, properties.P_MIN, properties.P_CRIT))
    t_design = coilmod.design_steam_temperature_for(b.coil, b.minimum, t_thr)
    finite = np.isfinite(t_design) & valid
    t_safe = np.where(finite, np.clip(t_design, properties.T_MIN, properties.T_CRIT), properties.T_MIN)
    p_design = properties.saturation_pressure(t_safe)
    out = []
    for i in range(len(thr)):
        if not valid[i]:
            out.append("below-tables")
        elif not finite[i]:
            out.append("set-point" if t_thr[i] <= b.coil.outlet[i] else "none")
        elif t_design[i] >= properties.T_CRIT or p_design[i] > DESIGN_PRESSURE_LIMIT:
            out.append("too-high")
        else:
            out.append(float(p_design[i]))
    return out


def _words(unit: Unit, system: str, p_min: float, lift: float, ret: float, dp: float, fill: float,
           back: float, fill_p: float, threshold: float, design) -> tuple[Remedy, ...]:
    """The remedies of one unit with their notes."""
    dr = unit.drain
    atm = unit.site.atmospheric_pressure
    f_min = unit.load.minimum
    below = f"below {f_min:.0%} load" if f_min > 0 else "at every load"
    down_to = f"down to {f_min:.0%} load" if f_min > 0 else "at every load"

    def p(pa, kind="pressure"):
        return q.show(pa, kind, system, atm)

    def length(m):
        return q.show(m, "length", system)

    out = []
    if lift < 0:
        out.append(Remedy("drain.lift", "length", dr.lift, None,
                          f"no lift keeps this unit draining {below}: even with none, the coil pressure "
                          f"there ({p(p_min)}) falls below the return pressure ({p(dr.return_pressure)}) "
                          f"and the trap's own differential first"))
    else:
        out.append(Remedy("drain.lift", "length", dr.lift, lift,
                          f"a lift of at most {length(lift)} after the trap keeps it draining {down_to} "
                          f"(now {length(dr.lift)})"))

    if ret < properties.P_MIN:
        out.append(Remedy("drain.return_pressure", "pressure", dr.return_pressure, None,
                          f"no return pressure keeps it draining {below}: the lift needs more than the coil "
                          f"has there ({p(p_min)}) even against a full vacuum"))
    else:
        vacuum = " (below atmospheric: only a vacuum return holds that)" if ret < atm else ""
        out.append(Remedy("drain.return_pressure", "pressure", dr.return_pressure, ret,
                          f"a return pressure of at most {p(ret)}{vacuum} keeps it draining {down_to} "
                          f"(now {p(dr.return_pressure)})"))

    if dp <= 0:
        out.append(Remedy("drain.trap_min_differential", "differential", dr.trap_min_differential, None,
                          f"no trap keeps it draining {below}: there the coil pressure plus the fill head "
                          f"({p(p_min + fill_p)}) is already at or below the back pressure ({p(back)})"))
    else:
        out.append(Remedy("drain.trap_min_differential", "differential", dr.trap_min_differential, dp,
                          f"a trap that opens at {p(dp, 'differential')} or less keeps it draining {down_to} "
                          f"(now {p(dr.trap_min_differential, 'differential')})"))

    if fill > dr.fill_head:
        note = (f"a fill head of {length(fill)} ({length(fill - dr.fill_head)} more than now) keeps it "
                f"draining {down_to}")
        if fill > 3.0:
            note += "; that much height is seldom available, so a pump-trap is the practical fix"
    elif fill == 0.0:
        note = f"no fill head is needed to drain {down_to} (now {length(dr.fill_head)})"
    else:
        note = f"a fill head of {length(fill)} is enough to drain {down_to} (now {length(dr.fill_head)})"
    out.append(Remedy("drain.fill_head", "length", dr.fill_head, fill, note))
    out.append(_design_pressure(unit, design, threshold, below, down_to, p))
    return tuple(out)


def _design_pressure(unit: Unit, design, threshold: float, below: str, down_to: str, p) -> Remedy:
    """The design steam pressure remedy from its solved value or the reason none works."""
    current = unit.design.steam_pressure
    key = "design.steam_pressure"
    if design == "below-tables":
        return Remedy(key, "pressure", current, properties.P_MIN,
                      "any design pressure: the trap drains even with the coil at the bottom of the steam tables")
    if design == "set-point":
        return Remedy(key, "pressure", current, properties.P_MIN,
                      "any design pressure: the stall pressure is below the set point's saturation pressure")
    if design == "none":
        return Remedy(key, "pressure", current, None,
                      f"no design pressure keeps it draining {below}: at no load the coil needs only the "
                      f"set point's saturation pressure, below the stall pressure ({p(threshold)})")
    if design == "too-high":
        return Remedy(key, "pressure", current, None,
                      f"no practical design pressure keeps it draining {below}: it would take more than "
                      f"{p(DESIGN_PRESSURE_LIMIT)} at full load")
    value = design
    if value > current:
        note = (f"a smaller coil selected for {p(value)} at full load (now {p(current)}) keeps the coil "
                f"pressure up and drains {down_to}")
        if value >= unit.supply_pressure:
            note += f"; that is above the supply pressure ({p(unit.supply_pressure)}), so the supply must rise too"
    else:
        note = f"a design pressure down to {p(value)} still drains {down_to} (now {p(current)})"
    return Remedy(key, "pressure", current, value, note)
