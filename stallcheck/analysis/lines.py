"""The line from the trap, for a batch of units at once: its flow pattern at full load,
at the stall point and at the minimum load, up the riser where a plain trap lifts, and
the smallest standard bore that keeps a slugging line stratified
(:class:`~stallcheck.result.ReturnLineFigures`).

Every state of every unit (and every trial bore) goes through the Taitel–Dukler map in
one array call (:func:`stallcheck.physics.hammer.taitel_dukler_many`), with the steam
properties of all of them in one call each; only Mandhane's map (``fluids``, a scalar
function) and the vertical map are taken state by state.
"""

from __future__ import annotations

import math

import numpy as np

from stallcheck.inputs import Unit
from stallcheck.physics import flash as flashmod
from stallcheck.physics import hammer, properties
from stallcheck.physics.constants import GRAVITY
from stallcheck.result import LinePoint, ReturnLineFigures, StallPoint

#: Vertical-upflow patterns in a riser, worst first: slugs and churn hammer.
RISER_PATTERNS = ("churn", "slug", "annular", "dispersed bubble", "bubbly", hammer.LIQUID)
#: A trial bore is judged this much smaller than the standard bore: the bore is printed
#: to three figures, and a line built from the printed figure must hold it too [-].
BORE_ALLOWANCE = 0.995


def _states(u: Unit, design_flow: float, design_pressure: float, stall: StallPoint, minimum_flow: float,
            minimum_pressure: float) -> list[tuple[str, float, float, float]]:
    """(where, load, condensate [kg/s], coil pressure [Pa]) at each load reported."""
    states = [("full load", 1.0, design_flow, design_pressure)]
    if stall.occurs and stall.in_range and stall.load_fraction < 1.0:
        states.append(("stall point", stall.load_fraction, stall.condensate, stall.coil_pressure))
    if u.load.minimum > 0 and minimum_flow > 0:
        states.append(("minimum load", u.load.minimum, minimum_flow, minimum_pressure))
    return states


class _Rows:
    """States as arrays: the flash at the return and the properties there."""

    def __init__(self, condensate, coil, p_ret):
        self.condensate, self.coil, self.p_ret = condensate, coil, p_ret
        self.flash = np.where(coil > p_ret, flashmod.flash_fraction(np.maximum(coil, p_ret), p_ret), 0.0)
        self.flows = (self.flash > hammer.NO_FLASH) & (condensate > 0)
        self.rho_l, self.rho_g = properties.liquid_density(p_ret), properties.vapour_density(p_ret)
        self.mu_l, self.mu_g = properties.liquid_viscosity(p_ret), properties.vapour_viscosity(p_ret)

    def taitel_dukler(self, bore, inclination, pick=None):
        """The run's pattern in each row (``pick``: those rows only) at ``bore`` [m]."""
        rows = np.arange(len(self.coil)) if pick is None else np.asarray(pick)
        out = np.full(len(rows), hammer.LIQUID, dtype=object)
        live = self.flows[rows]
        if live.any():
            r = rows[live]
            x = np.minimum(self.flash[r], 1.0 - 1e-6)
            area = math.pi * np.asarray(bore, dtype=float)[live] ** 2 / 4.0
            w = self.condensate[r]
            out[live] = hammer.taitel_dukler_many(w * (1.0 - x) / (self.rho_l[r] * area),
                                                  w * x / (self.rho_g[r] * area), self.rho_l[r], self.rho_g[r],
                                                  self.mu_l[r], self.mu_g[r], np.asarray(bore, dtype=float)[live],
                                                  np.asarray(inclination, dtype=float)[live])
        return out


def return_lines(units: list[Unit], design_flow, design_pressure, stalls: list[StallPoint], minimum_flow,
                 minimum_pressure) -> list[ReturnLineFigures | None]:
    """The return-line figures of each unit (None where its bore is not given).

    Parameters
    ----------
    units : list of Unit
    design_flow, design_pressure : sequence of float
        Each unit's condensate [kg/s] and coil pressure [Pa] at full load.
    stalls : list of StallPoint
    minimum_flow, minimum_pressure : sequence of float
        Each unit's condensate [kg/s] and coil pressure [Pa] at its minimum load.

    References
    ----------
    .. [1] Taitel, Y., Dukler, A. E. (1976). AIChE J. 22(1), 47-55.
    .. [2] Mandhane, J. M., Gregory, G. A., Aziz, K. (1974). Int. J. Multiphase Flow 1,
       537-553 (``fluids.two_phase``).
    .. [3] Taitel, Y., Barnea, D., Dukler, A. E. (1980). AIChE J. 26(3), 345-354.
    """
    out: list[ReturnLineFigures | None] = [None] * len(units)
    rows: list[tuple[int, str, float, float, float]] = []
    for i, u in enumerate(units):
        if u.drain.return_line is not None:
            rows += [(i, *state) for state in _states(u, float(design_flow[i]), float(design_pressure[i]), stalls[i],
                                                     float(minimum_flow[i]), float(minimum_pressure[i]))]
    if not rows:
        return out
    owner = np.array([row[0] for row in rows])
    drains = [units[i].drain for i in owner]
    st = _Rows(np.array([row[3] for row in rows]), np.array([row[4] for row in rows]),
               np.array([d.return_pressure for d in drains]))
    bore = np.array([d.return_line for d in drains])
    inclination = np.array([math.atan(d.return_pitch) if d.return_pitch is not None else 0.0 for d in drains])
    runs = st.taitel_dukler(bore, inclination)
    risers = _risers(units, owner, st, bore)
    from fluids.two_phase import Mandhane_Gregory_Aziz_regime

    sigma = properties.surface_tension(st.p_ret)
    points: dict[int, list[LinePoint]] = {}
    for k, (i, where, load, condensate, _) in enumerate(rows):
        mga = hammer.LIQUID
        if st.flows[k]:
            mga = Mandhane_Gregory_Aziz_regime(
                m=condensate, x=min(float(st.flash[k]), 1.0 - 1e-6), rhol=float(st.rho_l[k]),
                rhog=float(st.rho_g[k]), mul=float(st.mu_l[k]), mug=float(st.mu_g[k]), sigma=float(sigma[k]),
                D=float(bore[k]))[0]
        points.setdefault(int(i), []).append(LinePoint(where, load, condensate, float(st.flash[k]), str(runs[k]),
                                                       mga, runs[k] == "intermittent", risers[k]))
    sizes = _stratified_bores(units, owner, st, inclination, {i: any(p.slugging for p in pts)
                                                             for i, pts in points.items()})
    for i, pts in points.items():
        d = units[i].drain
        slugging = any(p.slugging for p in pts)
        size = sizes.get(i)
        out[i] = ReturnLineFigures(d.return_line, d.return_pitch, tuple(pts), slugging,
                                   size[0] if size else None, size[1] if size else None)
    return out


def _risers(units, owner, st: _Rows, bore) -> list[str | None]:
    """Where a plain trap lifts: the worse of the vertical-upflow patterns at the riser's
    foot (the trap outlet's pressure, the return's plus the lift's head) and its head
    (the return's), as the flash grows between them; None elsewhere."""
    out: list[str | None] = [None] * len(owner)
    lifted = [k for k, i in enumerate(owner) if units[i].drain.lift > 0 and units[i].drain.arrangement != "pump-trap"]
    if not lifted:
        return out
    k = np.array(lifted)
    lift = np.array([units[owner[j]].drain.lift for j in lifted])
    p_ret = st.p_ret[k]
    p_foot = p_ret + st.rho_l[k] * GRAVITY * lift
    coil = st.coil[k]
    x_foot = np.where(coil > p_foot, flashmod.flash_fraction(np.maximum(coil, p_foot), p_foot), 0.0)
    w, area = st.condensate[k], math.pi * bore[k] ** 2 / 4.0
    ends = []
    for pressure, x in ((p_foot, x_foot), (p_ret, st.flash[k])):
        rho_l, rho_g = properties.liquid_density(pressure), properties.vapour_density(pressure)
        mu_l, sigma = properties.liquid_viscosity(pressure), properties.surface_tension(pressure)
        flows = (x > hammer.NO_FLASH) & (w > 0)
        end = np.full(len(lifted), hammer.LIQUID, dtype=object)
        if flows.any():
            f = flows   # the rows with flash steam to rise
            end[f] = hammer.vertical_regime_many(w[f] * (1.0 - x[f]) / (rho_l[f] * area[f]),
                                                 w[f] * x[f] / (rho_g[f] * area[f]), rho_l[f], rho_g[f], mu_l[f],
                                                 sigma[f], bore[k][f], lift[f])
        ends.append(end)
    for j, row in enumerate(lifted):
        out[row] = min(ends[0][j], ends[1][j], key=RISER_PATTERNS.index)
    return out


def _stratified_bores(units, owner, st: _Rows, inclination, slugging: dict) -> dict[int, tuple[float, str]]:
    """For each slugging unit, the smallest Schedule 40 bore, not below its own, that
    keeps its line stratified at every load reported (judged at :data:`BORE_ALLOWANCE`
    of the bore): its inside diameter [m] and nominal size. Every size of every such
    unit is tried in one call of the map (the call, not the rows, is what costs)."""
    rows, trial, size_of = [], [], []
    for i, slugs in slugging.items():
        if not slugs:
            continue
        mine = np.flatnonzero(owner == i)
        for c, (_, inside, _) in enumerate(hammer.SCHEDULE_40):
            if inside + 1e-9 >= units[i].drain.return_line:
                rows.append(mine)
                trial.append(np.full(len(mine), inside * BORE_ALLOWANCE))
                size_of += [(i, c)] * len(mine)
    if not rows:
        return {}
    picked = np.concatenate(rows)
    patterns = st.taitel_dukler(np.concatenate(trial), inclination[picked], pick=picked)
    held: dict[tuple[int, int], bool] = {}
    for key, pattern in zip(size_of, patterns):
        held[key] = held.get(key, True) and pattern in hammer.STRATIFIED
    out: dict[int, tuple[float, str]] = {}
    for (i, c), ok in sorted(held.items()):
        if ok and i not in out:
            name, inside, _ = hammer.SCHEDULE_40[c]
            out[i] = (inside, name)
    return out
