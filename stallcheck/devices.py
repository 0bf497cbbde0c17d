"""Sizing the drain devices of one unit: the trap (capacity against differential and
the drainage limit), a pump-trap, a constant purge, and the flash steam at the trap
outlet.

Called by :mod:`stallcheck.analysis` with the unit's computed state; returns the
figure dataclasses of :mod:`stallcheck.result`. Pressures absolute [Pa], flows [kg/s].
"""

from __future__ import annotations

from typing import Callable

import numpy as np

from stallcheck import flash as flashmod
from stallcheck import properties, purge as purgemod, traps
from stallcheck import quantities as q
from stallcheck.errors import InputError
from stallcheck.inputs import Unit
from stallcheck.result import FlashFigures, PumpTrapFigures, PurgeFigures, StallPoint, TrapFigures

#: Loads at which the drainage limit is searched before interpolation.
FINE_GRID = np.linspace(0.0, 1.0, 1001)
#: Filling head a pump-trap needs where its maker's figure is not given [m]
#: (common practice: of the order of a foot; check the device's own data).
PUMP_FILL_HEAD = 0.3
#: Motive pressure a pump-trap wants above the back pressure [Pa] (common practice,
#: from memory: about 1 bar, 15 psi; the maker's capacity table governs).
MOTIVE_MARGIN = 100e3

#: State of the unit at load fractions: (coil pressure [Pa], condensate [kg/s]).
State = Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]


class TrapCapacity:
    """What the installed (or selected) trap passes at a differential.

    Parameters
    ----------
    unit : Unit
    back_pressure : float
        [Pa]
    bore : float or None
        Seat bore for the orifice model [m]; None where a table is given.
    """

    def __init__(self, unit: Unit, back_pressure: float, bore: float | None):
        self.drain = unit.drain
        self.back = back_pressure
        self.bore = bore

    def __call__(self, differential, inlet_pressure):
        """Capacity [kg/s] at differentials [Pa] with the trap inlet at ``inlet_pressure`` [Pa].
        Zero at or below the trap's minimum opening differential."""
        dp = np.asarray(differential, dtype=float)
        if self.drain.capacity:
            cap = traps.table_capacity(dp, [c.differential for c in self.drain.capacity],
                                       [c.flow for c in self.drain.capacity])
        else:
            cap = traps.orifice_capacity(self.bore, np.maximum(inlet_pressure, self.back), self.back)
        return np.where(dp > max(self.drain.trap_min_differential, 0.0), cap, 0.0)


def working_point(effective: str, unit: Unit, state: State, stall: StallPoint, back: float,
                  fill: float, atm: float) -> tuple[float, float, float]:
    """The lowest differential the trap must still drain at, as arranged: (load [-],
    condensate [kg/s], differential [Pa]).

    * a trap (or a purge) alone: the minimum load, where the coil pressure is lowest;
    * with a vacuum breaker: the coil is held at atmospheric pressure below the load
      that brings it there, so the trap works on atmospheric pressure plus the fill
      head against the back pressure, with the condensate at that load;
    * a pump-trap: at the stall point, the fill head alone drives condensate into it.
    """
    f_min = unit.load.minimum
    p_min, w_min = (float(a[0]) for a in state(np.array([f_min])))
    if effective == "pump-trap" and stall.occurs:
        return stall.load_fraction, stall.condensate, fill
    if effective == "trap-vacuum-breaker" and p_min < atm:
        p, w = state(FINE_GRID)
        above = p >= atm
        f_atm = float(FINE_GRID[np.argmax(above)]) if np.any(above) else 1.0
        w_atm = float(np.interp(f_atm, FINE_GRID, w))
        return max(f_atm, f_min), max(w_atm, w_min), atm + fill - back
    return f_min, w_min, p_min + fill - back


def trap_figures(unit: Unit, effective: str, state: State, stall: StallPoint, coil_inlet: Callable,
                 back: float, fill: float, atm: float, design_condensate: float,
                 design_pressure: float) -> tuple[TrapFigures, TrapCapacity]:
    """Trap selection figures and the drainage limit.

    Parameters
    ----------
    unit : Unit
    effective : str
        The arrangement the trap works in: the installed one where it is adequate,
        else the required one.
    state : callable
        Load fractions → (coil pressure [Pa], condensate [kg/s]).
    stall : StallPoint
    coil_inlet : callable
        Load fractions → entering temperature [K].
    back, fill, atm : float
        Back pressure, fill-head pressure and atmospheric pressure. [Pa]
    design_condensate : float  [kg/s]
    design_pressure : float  [Pa]

    References
    ----------
    .. [1] US Department of Veterans Affairs, HVAC Design Manual, steam section: size
       traps on modulating equipment for 1.5–2 × the condensing rate at 1/4 psi.
    .. [2] NAVFAC MO-209: trap safety factors 2:1 to 4:1, on hot-condensate ratings.
    """
    dr = unit.drain
    margin = dr.capacity_margin
    w_load, w_flow, w_dp = working_point(effective, unit, state, stall, back, fill, atm)
    required = margin * design_condensate
    if dr.capacity:
        basis, bore = "table", None
    elif dr.trap_orifice is not None:
        basis, bore = "orifice", dr.trap_orifice
    else:
        basis = "selected"
        sizing = max(w_dp, traps.SELECTION_DIFFERENTIAL)
        bore = traps.equivalent_bore(required, back + sizing, back)
    capacity = TrapCapacity(unit, back, bore)
    installed = None if basis == "selected" else float(capacity(w_dp, back + w_dp))

    p, w = state(FINE_GRID)
    inlet = p + fill
    cap = capacity(inlet - back, inlet)
    limit, _ = traps.drainage_limit(FINE_GRID, w, cap)
    figures = dict(basis=basis, bore=bore, margin=margin, design_condensate=design_condensate,
                   design_differential=design_pressure + fill - back, working_load=w_load,
                   working_condensate=w_flow, working_differential=w_dp, required_capacity=required,
                   installed_capacity=installed, limit_load=None)
    if limit > 0.0:
        p_l, w_l = (float(a[0]) for a in state(np.array([limit])))
        inlet_t = float(coil_inlet(limit)) if unit.load.varies == "inlet-temperature" else None
        figures.update(limit_load=limit, limit_coil_pressure=p_l, limit_differential=p_l + fill - back,
                       limit_condensate=w_l, limit_inlet_temperature=inlet_t)
    return TrapFigures(**figures), capacity


def pump_trap_figures(unit: Unit, required: str, stall: StallPoint, back: float,
                      supply: float, source: str) -> PumpTrapFigures | None:
    """A pump-trap's duty where one is installed or required (None otherwise).

    Raises
    ------
    InputError
        Where ``drain.motive_pressure`` is given at or below the back pressure.
    """
    dr = unit.drain
    if dr.motive_pressure is not None and dr.motive_pressure <= back:
        raise InputError("drain.motive_pressure",
                         f"{q.show(dr.motive_pressure, 'pressure', unit.system, unit.site.atmospheric_pressure)} "
                         f"is not above the back pressure on the drain "
                         f"({q.show(back, 'pressure', unit.system, unit.site.atmospheric_pressure)}: return "
                         f"pressure plus lift); a pump-trap cannot push against it. Give the motive steam or "
                         f"air pressure at the pump-trap inlet.", file=source)
    installed = dr.arrangement == "pump-trap"
    if not installed and required != "pump-trap":
        return None
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
        capacity=dr.pump_capacity)


def purge_figures(unit: Unit, state: State, back: float, design_pressure: float,
                  bin_loads: np.ndarray | None, bin_hours: np.ndarray | None) -> PurgeFigures | None:
    """Steam a constant purge bleeds, and its yearly cost (None without a purge size).

    The purge discharges with the condensate, against the back pressure. Yearly steam:
    from the load bins where given (each bin at its own coil pressure), else from
    ``site.hours_per_year`` at the full-load rate (an upper bound).
    """
    dr = unit.drain
    if dr.purge_orifice is not None:
        size = ("orifice", dr.purge_orifice)
    elif dr.purge_rate is not None:
        size = ("rate", dr.purge_rate)
    else:
        return None
    p_min = float(state(np.array([unit.load.minimum]))[0][0])
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
        basis = "bins"
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


def flash_figures(unit: Unit, design_pressure: float, design_condensate: float) -> FlashFigures:
    """Flash steam at full load as the condensate drops to the return pressure."""
    dr = unit.drain
    x = float(flashmod.flash_fraction(design_pressure, dr.return_pressure))
    velocity = None
    if dr.return_line is not None:
        velocity = float(flashmod.mixture_velocity(design_condensate, x, dr.return_pressure, dr.return_line))
    return FlashFigures(fraction=x, flow=x * design_condensate,
                        volume_flow=float(flashmod.flash_volume(design_condensate, x, dr.return_pressure)),
                        line_diameter=dr.return_line, velocity=velocity,
                        return_temperature=dr.return_temperature,
                        return_saturation_temperature=float(properties.saturation_temperature(dr.return_pressure)))
