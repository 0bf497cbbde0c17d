"""What single change lets the installed drainage drain the unit, or how far each
value can go before it no longer does.

The installed trap (or constant purge) drains the unit wherever it runs while the stall
pressure p_stall = p_return + ρ·g·(lift − fill_head) + Δp_trap stays below the coil
pressure at the minimum load, p_min. A trap with a vacuum breaker also drains it where
the vacuum breaker acts, p_stall ≤ p_atm − margin (:func:`drainage.vacuum_breaker_acts`).
Holding the more lenient of the two with equality and solving it for one term at a time
gives the limit of each: the largest lift, return pressure and trap differential, the
smallest fill head, and the smallest design steam pressure (a smaller coil run hotter at
full load, which keeps the coil pressure up at part load; it moves p_min, not p_stall).
Each is exact, not a search: ρ depends only on the return pressure, and the coil model
has a closed-form inverse.

Advice must survive being followed, so every limit is moved :data:`MARGIN` beyond the
exact one, and the figure is then rounded at the precision it is printed in, in the safe
direction (a largest value down, a smallest value up): the figure as printed, put in the
unit file, gives an adequate verdict. The precision is the caller's (``rounders``: the
unit system the figure will be printed in); this module builds no words: each remedy
carries a reason code and its SI facts, and :mod:`stallcheck.render.words` says it. A
pump-trap drains at every load, so it has no remedies here.
"""

from __future__ import annotations

from typing import Callable

import numpy as np

from stallcheck.inputs import Unit
from stallcheck.physics import coil as coilmod
from stallcheck.physics import drainage, properties
from stallcheck.physics.constants import GRAVITY
from stallcheck.result import Remedy

#: ``round(value, kind, up)``: an SI value [Pa or m] rounded at the precision it is
#: printed in, down (or up), returning the SI value of the printed figure.
Rounder = Callable[[float, str, bool], float]

#: Differential every remedy figure leaves across the trap beyond its exact limit [Pa]
#: (1 kPa: 0.15 psi, about 10 cm of water), before rounding in the safe direction.
MARGIN = 1000.0
#: Highest design steam pressure proposed [Pa] (the unit file's own limit).
DESIGN_PRESSURE_LIMIT = 2.0e6
#: More fill head than this is seldom found under a coil [m] (common practice, from
#: memory: about 10 ft).
PRACTICAL_FILL_HEAD = 3.0


def targets(b, p_min):
    """The stall pressure [Pa] each unit's installed drainage can live with, less the
    margin: the coil pressure at the minimum load, or with a vacuum breaker installed
    atmospheric less the gravity margin where that is higher."""
    arrangement = np.array([u.drain.arrangement for u in b.units])
    breaker = np.where(arrangement == "trap-vacuum-breaker", b.atm - drainage.GRAVITY_MARGIN, -np.inf)
    return np.maximum(p_min, breaker) - MARGIN


def solve(b, p_min, adequate, rounders: list[Rounder], valve_floor=None) -> list[tuple[Remedy, ...]]:
    """The limit of each single change (see the module docstring), for every unit of a
    batch.

    Parameters
    ----------
    b : analysis.Batch
    p_min : ndarray
        Coil pressure each unit needs at its minimum load. [Pa]
    adequate : list of bool
        Whether each unit's installed drainage is adequate now: its remedies are then
        margins (how far each value can go), else changes.
    rounders : list of callable
        For each unit, how its figures are rounded as printed (:data:`Rounder`).
    valve_floor : ndarray, optional
        Where a too-small valve holds the coil down: the least design steam temperature
        at which the open valve still holds the coil the margin above the stall pressure
        at full load [K] (NaN elsewhere). ``p_min`` is then already the lesser of the
        coil's need and what the valve gives.

    Returns
    -------
    list of tuple of Remedy
        For each unit: lift, return pressure, trap minimum differential, fill head and
        design steam pressure, in that order; empty where a pump-trap is installed.
    """
    target = targets(b, p_min)
    rho = b.density
    lift = (target + b.fill_pressure - b.return_pressure - b.trap_min) / (rho * GRAVITY)
    # return pressure r: r + ρ(r)·g·(lift − fill) + Δp_trap = target, ρ at r (a few passes)
    r = b.return_pressure.copy()
    for _ in range(6):
        dens = properties.liquid_density(np.clip(r, properties.P_MIN, properties.P_CRIT))
        r = target - b.trap_min - dens * GRAVITY * (b.lift - b.fill_height)
    dp = target + b.fill_pressure - b.back
    fill = np.maximum((b.back + b.trap_min - target) / (rho * GRAVITY), 0.0)
    design_t = _design_temperatures(b, valve_floor)
    # With a vacuum breaker that drains the coil by gravity (with the margin), the coil's
    # own pressure no longer matters: any design pressure does.
    arrangement = np.array([u.drain.arrangement for u in b.units])
    breaker_drains = (arrangement == "trap-vacuum-breaker") & (b.stall_pressure <= b.atm - drainage.GRAVITY_MARGIN - MARGIN)
    out = []
    for i, u in enumerate(b.units):
        if u.drain.arrangement == "pump-trap":
            out.append(())
            continue
        rule = _Limits(u, rounders[i], bool(adequate[i]))
        out.append((rule.lift(float(lift[i])), rule.return_pressure(float(r[i])),
                    rule.trap(float(dp[i]), float(b.back[i] - b.fill_pressure[i])), rule.fill(float(fill[i])),
                    rule.design(design_t[i], float(b.stall_pressure[i]), bool(breaker_drains[i]))))
    return out


def _design_temperatures(b, valve_floor=None) -> list:
    """Design steam pressure [Pa] at which each unit's coil pressure at its minimum
    load is the stall pressure plus the margin (and its valve, where too small, still
    holds the coil there at full load: ``valve_floor``), or a reason word where none is."""
    aim = b.stall_pressure + MARGIN
    valid = aim > properties.P_MIN
    t_aim = properties.saturation_temperature(np.clip(aim, properties.P_MIN, properties.P_CRIT))
    t_design = coilmod.design_steam_temperature_for(b.coil, b.minimum, t_aim)
    finite = np.isfinite(t_design) & valid
    t_safe = np.where(finite, np.clip(t_design, properties.T_MIN, properties.T_CRIT), properties.T_MIN)
    p_design = properties.saturation_pressure(t_safe)
    floor = np.full(len(aim), np.nan) if valve_floor is None else np.asarray(valve_floor, dtype=float)
    p_floor = properties.saturation_pressure(np.clip(np.nan_to_num(floor, nan=properties.T_MIN),
                                                     properties.T_MIN, properties.T_CRIT))
    out = []
    for i in range(len(aim)):
        if np.isfinite(floor[i]) and valid[i] and (t_aim[i] <= b.coil.outlet[i] or finite[i]):
            own = float(p_design[i]) if t_aim[i] > b.coil.outlet[i] else 0.0
            if floor[i] >= properties.T_CRIT or max(own, float(p_floor[i])) > DESIGN_PRESSURE_LIMIT:
                out.append("too-high")
            else:
                out.append(max(own, float(p_floor[i])))
        elif not valid[i] or t_aim[i] <= b.coil.outlet[i]:
            out.append("any")
        elif not finite[i]:
            out.append("none")
        elif t_design[i] >= properties.T_CRIT or p_design[i] > DESIGN_PRESSURE_LIMIT:
            out.append("too-high")
        else:
            out.append(float(p_design[i]))
    return out


class _Limits:
    """One unit's remedies: the safe rounding of each figure, its status and the reason
    its note gives."""

    def __init__(self, unit: Unit, rounder: Rounder, adequate: bool):
        self.unit = unit
        self.rounder = rounder
        self.adequate = adequate
        self.status = "margin" if adequate else "change"

    def safe(self, value, kind, up=False):
        return self.rounder(value, kind, up)

    def tight(self, key: str, kind: str, current: float) -> Remedy:
        """A unit that drains now, but closer to its limit than the margin."""
        return Remedy(key, kind, current, None, "tight", "margin", False)

    def lift(self, limit: float) -> Remedy:
        dr = self.unit.drain
        if self.adequate and limit < dr.lift:
            return self.tight("drain.lift", "length", dr.lift)
        if limit < 0:
            return Remedy("drain.lift", "length", dr.lift, None, "impossible", "impossible", False,
                          {"return_pressure": dr.return_pressure})
        value = max(self.safe(limit, "length"), 0.0)
        return Remedy("drain.lift", "length", dr.lift, value, self.status, self.status, True)

    def return_pressure(self, limit: float) -> Remedy:
        dr = self.unit.drain
        key = "drain.return_pressure"
        value = self.safe(limit, "pressure") if limit > properties.P_MIN else limit
        if self.adequate and value < dr.return_pressure:
            return self.tight(key, "pressure", dr.return_pressure)
        if value <= properties.P_MIN:
            return Remedy(key, "pressure", dr.return_pressure, None, "impossible", "impossible", False)
        return Remedy(key, "pressure", dr.return_pressure, value, self.status, self.status, True,
                      {"vacuum": bool(value < self.unit.site.atmospheric_pressure)})

    def trap(self, limit: float, back_less_fill: float) -> Remedy:
        dr = self.unit.drain
        key = "drain.trap_min_differential"
        value = self.safe(limit, "differential") if limit > 0 else 0.0
        if self.adequate and (value <= 0 or value < dr.trap_min_differential):
            return self.tight(key, "differential", dr.trap_min_differential)
        if value <= 0:
            return Remedy(key, "differential", dr.trap_min_differential, None, "impossible", "impossible", False,
                          {"back_less_fill": back_less_fill})
        return Remedy(key, "differential", dr.trap_min_differential, value, self.status, self.status, True)

    def fill(self, limit: float) -> Remedy:
        dr = self.unit.drain
        key = "drain.fill_head"
        value = self.safe(limit, "length", up=True) if limit > 0 else 0.0
        if self.adequate and value > dr.fill_head:
            return self.tight(key, "length", dr.fill_head)
        if self.adequate:
            return Remedy(key, "length", dr.fill_head, value, "margin-none" if value == 0 else "margin",
                          "margin", True)
        if value > PRACTICAL_FILL_HEAD:
            return Remedy(key, "length", dr.fill_head, value, "impractical", "change", False,
                          {"practical": PRACTICAL_FILL_HEAD})
        return Remedy(key, "length", dr.fill_head, value, "change", "change", True,
                      {"more": value - dr.fill_head})

    def design(self, design, threshold: float, breaker_drains: bool) -> Remedy:
        unit = self.unit
        current = unit.design.steam_pressure
        key = "design.steam_pressure"
        if breaker_drains and self.adequate:
            return Remedy(key, "pressure", current, None, "breaker", "any", False)
        if self.adequate and design in ("none", "too-high"):
            # it drains now (its vacuum breaker acts, with less than the margin), and no
            # design pressure would give the margin through the coil: no change, no margin
            return self.tight(key, "pressure", current)
        if design == "any":
            return Remedy(key, "pressure", current, None, "any", "any", False, {"threshold": threshold})
        if design == "none":
            return Remedy(key, "pressure", current, None, "none", "impossible", False, {"threshold": threshold})
        if design == "too-high":
            return Remedy(key, "pressure", current, None, "too-high", "impossible", False,
                          {"limit": DESIGN_PRESSURE_LIMIT})
        value = self.safe(design, "pressure", up=True)
        if self.adequate and value > current:
            return self.tight(key, "pressure", current)
        if self.adequate:
            return Remedy(key, "pressure", current, value, "margin", "margin", True)
        if value >= unit.supply_pressure:
            return Remedy(key, "pressure", current, value, "above-supply", "change", False,
                          {"supply": unit.supply_pressure})
        return Remedy(key, "pressure", current, value, "change", "change", True)
