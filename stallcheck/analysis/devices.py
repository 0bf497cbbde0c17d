"""Sizing the drain devices: the trap (capacity against differential and the
drainage limit), a pump-trap, a constant purge, the flash steam at the trap outlet, and
and the surge where a column of condensate is stopped (the return line's flow pattern is
:mod:`stallcheck.analysis.lines`).

Called by :mod:`stallcheck.analysis.batch` with the computed state of a batch of units
(arrays, one row per unit); runs the physics (:mod:`stallcheck.physics`, numbers in and
out) and assembles the figure records of :mod:`stallcheck.result`. Pressures absolute
[Pa], flows [kg/s].
"""

from __future__ import annotations

import math
from typing import Callable

import numpy as np

from stallcheck.inputs import Unit
from stallcheck.physics import coil as coilmod
from stallcheck.physics import flash as flashmod
from stallcheck.physics import hammer, properties, traps
from stallcheck.physics import purge as purgemod
from stallcheck.physics.solve import illinois
from stallcheck.result import (
    FlashFigures,
    PumpTrapFigures,
    PurgeFigures,
    StallPoint,
    SurgeFigures,
    TrapFigures,
)

#: The drainage limit is solved to this fraction of design load [-].
LIMIT_TOLERANCE = 1e-10
#: Lowest load searched where the unit never stalls [-].
LOWEST_LOAD = 1e-6
#: Loads at which a trap behind a vacuum breaker is first tried for a shortfall [-].
LIMIT_GRID = np.linspace(0.01, 0.99, 99)
#: Filling head a pump-trap needs where its maker's figure is not given [m]
#: (common practice: of the order of a foot; check the device's own data).
PUMP_FILL_HEAD = 0.3
#: Motive pressure a pump-trap wants above the back pressure [Pa] (common practice,
#: from memory: about 1 bar, 15 psi; the maker's capacity table governs).
MOTIVE_MARGIN = 100e3

#: State of one unit at load fractions: (coil pressure [Pa], condensate [kg/s]).
State = Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]


class Capacities:
    """What each unit's trap passes at a differential: from its rated table, or its
    seat bore as an orifice.

    Parameters
    ----------
    drains : list of Drain
    back : ndarray
        Back pressure of each unit. [Pa]
    bores : ndarray
        Seat bore of each unit's orifice model (NaN where a table is given). [m]
    """

    def __init__(self, drains, back, bores):
        self.back = np.asarray(back, dtype=float)
        self.bores = np.asarray(bores, dtype=float)
        self.trap_min = np.maximum(np.array([d.trap_min_differential for d in drains], dtype=float), 0.0)
        self.table = np.array([bool(d.capacity) for d in drains])
        rows = max([len(d.capacity) for d in drains] + [2])
        self.table_dp = np.ones((len(drains), rows))
        self.table_w = np.ones((len(drains), rows))
        for i, d in enumerate(drains):
            if d.capacity:
                dp = [c.differential for c in d.capacity]
                w = [c.flow for c in d.capacity]
                self.table_dp[i] = dp + [dp[-1]] * (rows - len(dp))
                self.table_w[i] = w + [w[-1]] * (rows - len(w))

    def __call__(self, differential, inlet_pressure, index=slice(None)):
        """Capacity [kg/s] at differentials [Pa] with the trap inlet at ``inlet_pressure``
        [Pa], for the units at ``index``; shapes (n,) or (n, m). Zero at or below the
        trap's minimum opening differential."""
        dp = np.asarray(differential, dtype=float)
        inlet = np.broadcast_to(np.asarray(inlet_pressure, dtype=float), dp.shape)
        back, bores, trap_min, table = (a[index] for a in (self.back, self.bores, self.trap_min, self.table))
        column = (slice(None), None) if dp.ndim == 2 else slice(None)
        out = np.zeros(dp.shape)
        # each row by its own model: steam-table calls only for the rows that need them
        if table.any():
            rows = np.flatnonzero(table)
            out[rows] = traps.table_capacity_rows(dp[rows], self.table_dp[index][rows], self.table_w[index][rows])
        if (~table).any():
            rows = np.flatnonzero(~table)
            b = back[rows][column]
            out[rows] = traps.orifice_capacity(bores[rows][column], np.maximum(inlet[rows], b), b)
        return np.where(dp > trap_min[column], out, 0.0)


class TrapCapacity:
    """What one unit's trap passes at a differential (see :class:`Capacities`).

    Parameters
    ----------
    unit : Unit
    back_pressure : float
        [Pa]
    bore : float or None
        Seat bore for the orifice model [m]; None where a table is given.
    """

    def __init__(self, unit: Unit, back_pressure: float, bore: float | None):
        self._all = Capacities([unit.drain], [back_pressure], [np.nan if bore is None else bore])

    def __call__(self, differential, inlet_pressure):
        """Capacity [kg/s] at differentials [Pa] with the trap inlet at ``inlet_pressure`` [Pa]."""
        dp = np.asarray(differential, dtype=float)
        out = self._all(dp.reshape(1, -1), np.asarray(inlet_pressure, dtype=float).reshape(1, -1))
        return out.reshape(dp.shape)


def working_points(b, effective, stall, p_min, w_min):
    """The lowest differential each trap must still drain at, as arranged: (load [-],
    condensate [kg/s], differential [Pa]), arrays with one element per unit.

    * a trap (or a purge) alone: the minimum load, where the coil pressure is lowest;
    * with a vacuum breaker: the coil is held at atmospheric pressure below the load
      that brings it there, so the trap works on atmospheric pressure plus the fill
      head against the back pressure, with the condensate at that load;
    * a pump-trap: at the stall point, the fill head alone drives condensate into it.
    """
    f_min = b.minimum
    f_atm = np.clip(coilmod.load_at_steam_temperature(b.coil, properties.saturation_temperature(b.atm)), 0.0, 1.0)
    w_atm = b.state(f_atm)[2]
    effective = np.array(effective)
    occurs = np.array([s.occurs for s in stall])
    pump = (effective == "pump-trap") & occurs
    breaker = (effective == "trap-vacuum-breaker") & (p_min < b.atm) & ~pump
    f_stall = np.array([s.load_fraction if s.occurs else 0.0 for s in stall])
    w_stall = np.array([s.condensate if s.occurs else 0.0 for s in stall])
    load = np.where(pump, f_stall, np.where(breaker, np.maximum(f_atm, f_min), f_min))
    flow = np.where(pump, w_stall, np.where(breaker, np.maximum(w_atm, w_min), w_min))
    dp = np.where(pump, b.fill_pressure, np.where(breaker, b.atm + b.fill_pressure - b.back, p_min + b.fill_pressure - b.back))
    return load, flow, dp


def trap_figures(b, effective, stall, p_min, w_min, selected_limits: bool = True):
    """Trap selection figures and the drainage limit for every unit of a batch.

    Parameters
    ----------
    b : analysis.Batch
    effective : list of str
        The arrangement each trap works in: the installed one where it is adequate,
        else the required one.
    stall : list of StallPoint
    p_min, w_min : ndarray
        Coil pressure [Pa] and condensate [kg/s] at each unit's minimum load.
    selected_limits : bool
        Find the drainage limit of a trap selected by the usual rule too (shown with
        the figures; no rule judges it). Without, its ``limit_load`` is None.

    Returns
    -------
    list of TrapFigures

    References
    ----------
    .. [1] US Department of Veterans Affairs, HVAC Design Manual, steam section: size
       traps on modulating equipment for 1.5–2 × the condensing rate at 1/4 psi.
    .. [2] NAVFAC MO-209: trap safety factors 2:1 to 4:1, on hot-condensate ratings.
    """
    drains = [u.drain for u in b.units]
    margin = np.array([d.capacity_margin for d in drains])
    w_load, w_flow, w_dp = working_points(b, effective, stall, p_min, w_min)
    required = margin * b.condensate_design
    basis = np.array(["table" if d.capacity else "orifice" if d.trap_orifice is not None else "selected"
                      for d in drains])
    given = np.array([np.nan if d.trap_orifice is None else d.trap_orifice for d in drains])
    sizing = np.maximum(w_dp, traps.SELECTION_DIFFERENTIAL)
    selected = traps.equivalent_bore(required, b.back + sizing, b.back)
    bores = np.where(basis == "selected", selected, np.where(basis == "orifice", given, np.nan))
    capacity = Capacities(drains, b.back, bores)
    installed = capacity(sizing, b.back + sizing)

    breaker = np.array([e == "trap-vacuum-breaker" for e in effective])
    # into the lift at full load; where a pump-trap works, the trap drains into its body
    # by the fill head's gravity whenever the coil cannot discharge against the lift
    design_dp = b.design_pressure + b.fill_pressure - b.back
    design_dp = np.where([e == "pump-trap" for e in effective], np.maximum(design_dp, b.fill_pressure), design_dp)
    # the most a trap's inlet can see: the supply with the valve wide open (start-up, a
    # cold pull-down) and the fill head, against the return with the line after it empty
    widest = b.supply + b.fill_pressure - b.return_pressure
    limit = _limits(b, capacity, stall, None if selected_limits else basis != "selected", breaker)
    has = np.isfinite(limit)
    at = np.where(has, limit, 0.0)
    _, p_l, w_l = b.state(at)
    p_l = np.where(breaker, np.maximum(p_l, b.atm), p_l)   # a breaker holds the coil at atmospheric
    inlet_l = coilmod.inlet_temperature(b.coil, at)
    out = []
    for i, d in enumerate(drains):
        figures = dict(basis=str(basis[i]), bore=None if basis[i] == "table" else float(bores[i]),
                       margin=float(margin[i]), design_condensate=float(b.condensate_design[i]),
                       design_differential=float(design_dp[i]),
                       working_load=float(w_load[i]), working_condensate=float(w_flow[i]),
                       working_differential=float(w_dp[i]), selection_differential=float(sizing[i]),
                       required_capacity=float(required[i]),
                       installed_capacity=None if basis[i] == "selected" else float(installed[i]), limit_load=None,
                       widest_differential=float(widest[i]), rated_differential=d.trap_max_differential)
        if has[i]:
            by_inlet = b.units[i].load.varies == "inlet-temperature"
            figures.update(limit_load=float(limit[i]), limit_coil_pressure=float(p_l[i]),
                           limit_differential=float(p_l[i] + b.fill_pressure[i] - b.back[i]),
                           limit_condensate=float(w_l[i]),
                           limit_inlet_temperature=float(inlet_l[i]) if by_inlet else None)
        out.append(TrapFigures(**figures))
    return out


def _limits(b, capacity, stall, only=None, breaker=None):
    """Drainage limit of each unit [-]: the load below which the trap passes less than
    the condensate; NaN where it keeps up at every load above zero, and for the units
    ``only`` (a boolean mask, where given) leaves out.

    The shortfall (condensate less capacity) is positive at the stall point, where the
    trap has no working differential, and falls as load and differential rise; its
    zero between the stall point (or no load) and full load is the limit, found by a
    bracketed solve. A trap short even at full load has its limit at full load.

    Where a vacuum breaker works (``breaker``, a boolean mask), the coil never falls
    below the atmospheric pressure the breaker lets in: the trap's differential is
    taken there, not at the sub-atmospheric pressure the load alone would give. The
    trap then still discharges at the stall point (by gravity), its shortfall is
    largest where the coil reaches atmospheric, and the limit is the highest load of
    :data:`LIMIT_GRID` with a shortfall, refined by the same solve.
    """
    breaker = np.zeros(len(b.units), dtype=bool) if breaker is None else np.asarray(breaker, dtype=bool)

    def gap(load, index):
        _, p, w = b.state(load, index)
        inlet = np.where(breaker[index], np.maximum(p, b.atm[index]), p) + b.fill_pressure[index]
        return w - capacity(inlet - b.back[index], inlet, index)

    n = len(b.units)
    limit = np.full(n, np.nan)
    units = np.arange(n) if only is None else np.flatnonzero(only)
    if not units.size:
        return limit
    low = np.array([s.load_fraction if s.occurs else LOWEST_LOAD for s in stall])[units]
    occurs = np.array([s.occurs for s in stall])[units] & ~breaker[units]
    by_grid = breaker[units]
    if by_grid.any():
        # the highest grid load short of capacity, below full load, starts the bracket
        grid = np.broadcast_to(LIMIT_GRID, (int(by_grid.sum()), LIMIT_GRID.size))
        rows = units[by_grid]
        short = np.array([gap(grid[k], np.full(LIMIT_GRID.size, i)) > 0 for k, i in enumerate(rows)])
        last = np.where(short.any(axis=1), LIMIT_GRID.size - 1 - np.argmax(short[:, ::-1], axis=1), -1)
        low[by_grid] = np.where(last >= 0, LIMIT_GRID[np.maximum(last, 0)], 1.0)
    full = gap(np.ones(units.size), units) > 0
    start = gap(low, units) > 0
    # At the stall point itself the trap cannot discharge, whatever the last bit of the
    # differential says: where the shortfall there already reads zero, the limit is the
    # stall point (not behind a vacuum breaker, where gravity still drives it).
    found = np.where(full, 1.0, np.where(occurs & ~start, low, np.nan))
    solve = np.flatnonzero(start & ~full & (low < 1.0))
    if solve.size:
        found[solve] = illinois(lambda load, where: gap(load, units[solve[where]]), low[solve],
                                np.ones(solve.size), LIMIT_TOLERANCE)
    limit[units] = found
    return limit


def pump_trap_figures(unit: Unit, required: str, stall: StallPoint, back: float,
                      supply: float) -> PumpTrapFigures | None:
    """A pump-trap's duty where one is installed or required (None otherwise). A motive
    pressure at or below the back pressure is refused before the analysis."""
    dr = unit.drain
    installed = dr.arrangement == "pump-trap"
    if not installed and required != "pump-trap":
        return None
    capacity, outside = dr.pump_capacity, False
    if dr.pump_table:
        backs = np.array([row[0] for row in dr.pump_table])
        flows = np.array([row[1] for row in dr.pump_table])
        # Capacity falls as the back pressure rises: below the table's lowest row its
        # first figure is kept (on the safe side); above its highest there is no figure.
        outside = back > backs[-1]
        capacity = None if outside else float(np.interp(back, backs, flows))
    return PumpTrapFigures(
        installed=installed,
        condensate=stall.condensate if stall.occurs else 0.0,
        load_fraction=stall.load_fraction if stall.occurs else 0.0,
        back_pressure=back,
        motive_pressure=dr.motive_pressure if dr.motive_pressure is not None else supply,
        motive_given=dr.motive_pressure is not None,
        fill_head=dr.fill_head,
        required_fill_head=dr.pump_fill_head if dr.pump_fill_head is not None else PUMP_FILL_HEAD,
        fill_head_given=dr.pump_fill_head is not None,
        capacity=capacity, outside_table=bool(outside),
        capacity_basis="table" if dr.pump_table else "given" if dr.pump_capacity is not None else "")


def purge_figures(unit: Unit, state: State, back: float, design_pressure: float, p_min: float,
                  bin_loads: np.ndarray | None, bin_hours: np.ndarray | None,
                  hours_basis: str = "bins") -> PurgeFigures | None:
    """Steam a constant purge bleeds, and its yearly cost (None without a purge size).

    ``state`` gives the unit's coil pressure and condensate at loads; ``p_min`` [Pa] is
    its coil pressure at the minimum load. The purge discharges with the condensate,
    against the back pressure. Yearly steam:
    from the load bins where given (each bin at its own coil pressure; the hours of a
    weather year are bins of an hour each, ``hours_basis`` ``"weather"``), else from
    ``site.hours_per_year`` at the full-load rate (an upper bound).
    """
    dr = unit.drain
    if dr.purge_orifice is not None:
        size = ("orifice", dr.purge_orifice)
    elif dr.purge_rate is not None:
        size = ("rate", dr.purge_rate)
    else:
        return None
    design_rate = float(purgemod.bled(size, design_pressure, back))
    minimum_rate = float(purgemod.bled(size, p_min, back))
    hours = yearly = None
    basis = ""
    if bin_loads is not None and len(bin_loads):
        running = bin_loads > 0
        at = np.clip(bin_loads, unit.load.minimum, 1.0)
        p_bins = state(at)[0]
        rates = purgemod.bled(size, p_bins, back)
        hours = float(bin_hours[running].sum())
        yearly = float((rates * bin_hours * 3600.0)[running].sum())
        basis = hours_basis
    elif unit.site.hours_per_year is not None:
        hours = unit.site.hours_per_year
        yearly = design_rate * hours * 3600.0
        basis = "site"
    cost = None
    if yearly is not None and unit.site.steam_price is not None:
        cost = yearly / unit.site.steam_price_per * unit.site.steam_price
    return PurgeFigures(basis=size[0], bore=dr.purge_orifice, design_rate=design_rate,
                        minimum_rate=minimum_rate, holds_differential=p_min > back, hours=hours,
                        yearly_mass=yearly, yearly_cost=cost, hours_basis=basis,
                        currency=unit.site.currency)


def flash_figures(b) -> list[FlashFigures]:
    """Flash steam at full load: at the trap outlet, whose pressure is the back pressure
    (the return plus the lift's head), and where the condensate arrives at the return
    pressure, the flash having grown up the lift; the flow, volume and line velocity
    are those at the return."""
    x_out = flashmod.flash_fraction(b.design_pressure, b.back)
    x = flashmod.flash_fraction(b.design_pressure, b.return_pressure)
    volume = flashmod.flash_volume(b.condensate_design, x, b.return_pressure)
    t_sat = properties.saturation_temperature(b.return_pressure)
    lines = np.array([np.nan if u.drain.return_line is None else u.drain.return_line for u in b.units])
    with np.errstate(invalid="ignore"):
        velocity = flashmod.mixture_velocity(b.condensate_design, x, b.return_pressure, lines)
    out = []
    for i, u in enumerate(b.units):
        dr = u.drain
        out.append(FlashFigures(fraction=float(x_out[i]), outlet_pressure=float(b.back[i]),
                                return_fraction=float(x[i]), flow=float(x[i] * b.condensate_design[i]),
                                volume_flow=float(volume[i]), line_diameter=dr.return_line,
                                velocity=None if dr.return_line is None else float(velocity[i]),
                                return_temperature=dr.return_temperature,
                                return_saturation_temperature=float(t_sat[i])))
    return out


#: Share of the rating a surge peak should stay below (a margin for the fittings and
#: for reflections the simple formula leaves out; common practice, from memory).
RATING_SHARE = 0.8


def surge_figures(u: Unit, pump: PumpTrapFigures | None, back_pressure: float,
                  design_condensate: float) -> SurgeFigures | None:
    """Hydraulic shock in the line from the trap where a moving column of condensate is
    stopped: a pump-trap's discharge stopped by its check valve, or, after a plain trap
    with a lift, the condensate rising in the lift stopped when the trap shuts.

    The velocity stopped is one the flow itself gives, never free fall: the pump-trap's
    discharge rate (the maker's, else its capacity) over the line's bore; for a lift,
    the trap's full-load discharge over the bore. A column thrown up a riser and left
    to fall back returns onto the shut trap no faster than it rose (the rigid-column
    model: gravity takes back the energy it gave; friction only slows it). The check
    valve's closing time is used in both cases (Michaud's rise where it is slower than
    the wave's round trip). Needs the line's bore.

    Parameters
    ----------
    u : Unit
    pump : PumpTrapFigures or None
    back_pressure : float
        Working pressure in the line. [Pa] absolute
    design_condensate : float
        Condensate at full load. [kg/s]

    References
    ----------
    .. [1] Wylie, E. B., Streeter, V. L. (1993). Fluid Transients in Systems, ch. 1
       (Joukowsky; the rigid-column model of a column's motion).
    .. [2] Thorley, A. R. D. (2004). Fluid Transients in Pipeline Systems, 2nd ed.,
       section 2.3 (Michaud's slow closure).
    """
    dr = u.drain
    if dr.return_line is None:
        return None
    area = math.pi * dr.return_line ** 2 / 4.0
    rho = float(properties.liquid_density(back_pressure))
    if pump is not None and pump.installed:
        rate = dr.pump_rate or (dr.pump_rate_volume * rho if dr.pump_rate_volume else None) or pump.capacity
        if not rate:
            return None
        basis = "pump-trap"
    elif dr.lift > 0 and dr.arrangement != "pump-trap" and design_condensate > 0:
        rate, basis = design_condensate, "lift"
    else:
        return None
    velocity, closing = rate / (rho * area), dr.check_closing_time
    c = float(properties.liquid_sound_speed(back_pressure))
    wall = dr.return_wall or hammer.standard_wall(dr.return_line)
    a = hammer.wave_speed(rho * c * c, rho, dr.return_line, wall, hammer.YOUNGS_MODULUS[dr.return_material])
    length = dr.return_length if dr.return_length is not None else (dr.lift if basis == "lift" else None)
    if length is None:
        rise = hammer.joukowsky(rho, a, velocity)
    else:
        rise = hammer.surge(rho, a, velocity, length, closing)
    slow = None
    if dr.return_rating is not None and length is not None:
        allowed = RATING_SHARE * dr.return_rating - back_pressure
        if allowed > 0 and back_pressure + rise > RATING_SHARE * dr.return_rating:
            exact = max(2.0 * rho * length * velocity / allowed, 2.0 * length / a)
            step = 10.0 ** (math.floor(math.log10(exact)) - 1)   # printed to two figures,
            slow = math.ceil(exact / step - 1e-9) * step          # rounded up: the safe way
    return SurgeFigures(basis, velocity, a, rho, length, closing, rise, back_pressure, back_pressure + rise,
                        dr.return_rating, slow)
