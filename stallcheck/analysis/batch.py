"""Run the physics in order for many units at once, apply the rules and gather a
:class:`~stallcheck.result.Result` for each.

unit → design point (properties) → coil model → stall threshold and stall point
(closed form) → points across the load range → drainage verdict → valve → drain
devices → remedies → findings.

Every step works on arrays with one row per unit, so the steam tables are called a
handful of times for a whole survey rather than thousands of times per unit; a single
``check`` is a survey of one, so the two give the same numbers. The rules' facts are
gathered unit by unit; no words are built here (:mod:`stallcheck.render.words`).
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass

import numpy as np

from stallcheck.analysis import findings, remedies
from stallcheck.analysis import lines as linesmod
from stallcheck.analysis import year as yearmod
from stallcheck.errors import InputError, StallcheckError
from stallcheck.files import quantities as q
from stallcheck.files import display, refusals
from stallcheck.inputs import Unit
from stallcheck.physics import coil as coilmod
from stallcheck.analysis import devices
from stallcheck.physics import drainage, properties
from stallcheck.physics import valve as valvemod
from stallcheck.physics.solve import illinois
from stallcheck.result import (Basis, DesignPoint, Drainage, Points, Remedy, Result, caution_codes,
                               StallPoint, ValveResult)

#: Specific heat of air [J/(kg·K)] (the unit-file conventions).
AIR_CP = 1006.0
#: Load fractions at which the result tabulates the unit.
LOAD_GRID = np.linspace(0.0, 1.0, 101)
#: The valve's solves stop within these: load fraction [-], coil pressure [Pa].
LOAD_TOLERANCE = 1e-10
SOLVE_TOLERANCE = 1e-4


def analyse(unit: Unit, system: str | None = None, method: str | None = None) -> Result:
    """Analyse one unit.

    Parameters
    ----------
    unit : Unit
        Validated input.
    system : str, optional
        ``"si"`` or ``"us"`` for the words inside reasons and findings; default the
        file's own.
    method : str, optional
        Override the file's heat-transfer method.

    Returns
    -------
    Result

    Raises
    ------
    InputError
        Where the set point is not below the design steam temperature, a pressure is
        outside the steam tables, or a pump-trap's motive pressure is not above the back
        pressure.
    """
    out = analyse_many([unit], system=system, method=method)[0]
    if isinstance(out, StallcheckError):
        raise out
    return out


def analyse_many(units: list[Unit], system: str | None = None, method: str | None = None,
                 points: bool = True, complete: bool = True) -> list[Result | StallcheckError]:
    """Analyse many units together.

    Parameters
    ----------
    units : list of Unit
    system : str, optional
        Display units for the words; default each file's own.
    method : str, optional
        Override every file's heat-transfer method.
    points : bool
        Tabulate each unit across the load range (``Result.points``, for the chart and
        the JSON contract). A survey table needs none of it and skips the cost (about
        half of each unit's steam-table calls); every other figure is the same.
    complete : bool
        The whole result. Without it a result holds the verdict, the findings and the
        figures they rest on, and no more: no remedies or basis of the assumptions, and no
        drainage limit for a trap selected by the usual rule (a figure shown, never
        judged). That is what a survey table shows; the survey makes such results for
        it and gives none of them out.

    Returns
    -------
    list
        For each unit in order, its :class:`Result`, or the :class:`InputError` that
        stops it (the others are analysed all the same).
    """
    if not units:
        return []
    if method:
        units = [u.with_method(method) for u in units]
    out: list = [None] * len(units)
    good = []
    for i, error in enumerate(_screen(units)):
        if error is None:
            good.append(i)
        else:
            out[i] = error
    if good:
        batch = [units[i] for i in good]
        # a numeric warning (an overflow, a division by nothing) means a value far outside
        # any plant got past the ranges: a refusal, never a warning on stderr
        with warnings.catch_warnings():
            warnings.simplefilter("error", RuntimeWarning)
            try:
                results = _analyse(batch, [system or u.system for u in batch], points, complete)
            except RuntimeWarning as exc:
                raise refusals.not_computable(str(exc), batch[0].source if len(batch) == 1 else None) from None
        for i, result in zip(good, results):
            out[i] = result
    return out


# --- screening: what stops a unit before the physics ---------------------------------


def _screen(units: list[Unit]) -> list[InputError | None]:
    """Per-unit input errors that need steam properties (vectorised)."""
    n = len(units)
    errors: list[InputError | None] = [None] * n
    p_design = np.array([u.design.steam_pressure for u in units])
    t_steam = properties.saturation_temperature(np.clip(p_design, properties.P_MIN, properties.P_CRIT))
    for i, u in enumerate(units):
        d = u.design
        if d.outlet_temperature >= t_steam[i] - 0.5:
            errors[i] = refusals.set_point_above_steam(u, float(t_steam[i]))
        elif d.medium.endswith("glycol") and d.inlet_temperature <= (t_freeze := _freezing(d)) + 0.5:
            errors[i] = refusals.glycol_frozen(u, t_freeze)
        elif (u.drain.return_temperature is not None and u.drain.return_temperature
              > (t_sat := float(properties.saturation_temperature(u.drain.return_pressure))) + 0.5):
            errors[i] = refusals.return_above_boiling(u, t_sat)
        elif d.medium != "air" and 0.5 * (d.inlet_temperature + d.outlet_temperature) >= refusals.HOTTEST_LIQUID:
            errors[i] = refusals.liquid_too_hot(u)
    motive = [i for i in range(n) if errors[i] is None and units[i].drain.motive_pressure is not None]
    if motive:
        ret = np.array([units[i].drain.return_pressure for i in motive])
        lift = np.array([units[i].drain.lift for i in motive])
        back = drainage.back_pressure(ret, lift, properties.liquid_density(ret))
        for i, b in zip(motive, back):
            if units[i].drain.motive_pressure <= b:
                errors[i] = refusals.motive_below_back(units[i], float(b))
    return errors


def _freezing(design) -> float:
    """Freezing point [K] of a glycol solution, from CoolProp's mixture data."""
    return float(properties.freezing_temperature(design.medium, design.concentration))


# --- the batch ------------------------------------------------------------------------


@dataclass
class Batch:
    """Units as columns: one array element per unit, SI. Built by :func:`columns`.

    Attributes
    ----------
    condensate_design : ndarray
        Steam condensed at full load. [kg/s] (``coil.steam_design`` is the steam's
        temperature there [K].)
    fill_height, fill_pressure : ndarray
        The fill head as a height [m] and as the pressure its water gives [Pa].
    stall_pressure : ndarray
        Coil pressure at or below which the trap cannot discharge: the back pressure
        plus the trap's least differential, less the fill head. [Pa] absolute
    """

    units: list
    atm: np.ndarray
    coil: coilmod.CoilModel
    design_pressure: np.ndarray
    load_design: np.ndarray
    condensate_design: np.ndarray
    mass_flow: np.ndarray
    cp: np.ndarray
    supply: np.ndarray
    return_pressure: np.ndarray
    lift: np.ndarray
    fill_height: np.ndarray
    trap_min: np.ndarray
    minimum: np.ndarray
    density: np.ndarray
    back: np.ndarray
    fill_pressure: np.ndarray
    stall_pressure: np.ndarray

    def state(self, load, index=slice(None)):
        """Steam temperature [K], coil pressure [Pa] and condensate [kg/s] at load
        fractions: ``load`` of shape (n,) (one load per unit) or (n, m) (m loads per
        unit), for the units at ``index``."""
        load = np.asarray(load, dtype=float)
        coil = self.coil.take(index)
        if load.ndim == 2:
            coil = coil.column()
            design = self.load_design[index][:, None]
        else:
            design = self.load_design[index]
        return _steam_at(coil, load, design)


    def one(self, i: int):
        """The state of unit ``i`` alone: loads (m,) → (coil pressure [Pa], condensate [kg/s])."""
        def state(load):
            _, p, w = self.state(np.atleast_1d(np.asarray(load, dtype=float))[None, :], [i])
            return p[0], w[0]
        return state


def columns(units: list[Unit]) -> Batch:
    """Gather units into a :class:`Batch` (the design point and heads included)."""
    def col(get):
        return np.array([get(u) for u in units], dtype=float)

    p_design = col(lambda u: u.design.steam_pressure)
    steam_t = properties.saturation_temperature(p_design)
    coil = coilmod.CoilModel(
        np.array([u.design.method for u in units]), np.array([u.load.varies for u in units]),
        col(lambda u: u.design.inlet_temperature), col(lambda u: u.design.outlet_temperature), steam_t,
        col(lambda u: u.design.ua_flow_exponent))
    mass_flow, cp = _medium_flow(units)
    load_design = mass_flow * cp * (coil.outlet - coil.inlet_design)
    ret = col(lambda u: u.drain.return_pressure)
    lift = col(lambda u: u.drain.lift)
    fill_h = col(lambda u: u.drain.fill_head)
    trap_min = col(lambda u: u.drain.trap_min_differential)
    rho = properties.liquid_density(ret)
    back = drainage.back_pressure(ret, lift, rho)
    fill = drainage.head(fill_h, rho)
    return Batch(units=units, atm=col(lambda u: u.site.atmospheric_pressure), coil=coil,
                 design_pressure=p_design, load_design=load_design,
                 condensate_design=load_design / properties.latent_heat(p_design), mass_flow=mass_flow, cp=cp,
                 supply=col(lambda u: u.supply_pressure), return_pressure=ret, lift=lift, fill_height=fill_h,
                 trap_min=trap_min, minimum=col(lambda u: u.load.minimum), density=rho, back=back,
                 fill_pressure=fill, stall_pressure=back + trap_min - fill)


def _medium_flow(units: list[Unit]) -> tuple[np.ndarray, np.ndarray]:
    """Mass flow [kg/s] and specific heat [J/(kg·K)] of each unit's heated medium;
    liquids' properties at the mean design temperature, one call per fluid."""
    n = len(units)
    mass = np.empty(n)
    cp = np.full(n, AIR_CP)
    groups: dict = {}
    for i, u in enumerate(units):
        d = u.design
        if d.medium == "air":
            mass[i] = d.flow if d.flow_is_mass else d.flow * q.STANDARD_AIR_DENSITY
        else:
            groups.setdefault((d.medium, d.concentration), []).append(i)
    for (medium, concentration), idx in groups.items():
        mean = np.array([0.5 * (units[i].design.inlet_temperature + units[i].design.outlet_temperature)
                         for i in idx])
        cps = properties.medium_cp(medium, concentration, mean)
        rho = properties.medium_density(medium, concentration, mean)
        for k, i in enumerate(idx):
            d = units[i].design
            cp[i] = cps[k]
            mass[i] = d.flow if d.flow_is_mass else d.flow * rho[k]
    return mass, cp


def coil_of(unit: Unit, steam_t_design: float | None = None) -> coilmod.CoilModel:
    """The coil model of one unit (its design steam temperature from the design pressure)."""
    d = unit.design
    if steam_t_design is None:
        steam_t_design = float(properties.saturation_temperature(d.steam_pressure))
    return coilmod.CoilModel(d.method, unit.load.varies, d.inlet_temperature, d.outlet_temperature,
                             steam_t_design, d.ua_flow_exponent)


def state_at(unit: Unit, result: Result, load):
    """Steam temperature [K], coil pressure [Pa] and condensate [kg/s] one unit needs at
    load fractions [-], as in its analysis."""
    coil = coil_of(unit.with_method(result.method), result.design.steam_temperature)
    return _steam_at(coil, np.asarray(load, dtype=float), result.design.load)


def _steam_at(coil, load, load_design):
    """Steam temperature [K], coil pressure [Pa] and steam flow [kg/s] at load fractions.

    Temperatures the coil model asks for below the triple point are held there.
    """
    steam_t = np.clip(coilmod.steam_temperature(coil, load), properties.T_MIN, properties.T_CRIT)
    coil_p = properties.saturation_pressure(steam_t)
    return steam_t, coil_p, load * load_design / properties.latent_heat_at(steam_t)


# --- the physics on the batch ---------------------------------------------------------


def _analyse(units: list[Unit], systems: list[str], tabulate: bool = True, complete: bool = True) -> list[Result]:
    b = columns(units)
    n = len(units)
    _, p_min, w_min = b.state(b.minimum)
    stall = _stall_points(b, p_min)
    # the steam temperature rises with load, so it is lowest at no load
    clipped = coilmod.steam_temperature(b.coil, np.zeros(n)) < properties.T_MIN
    floor_load = coilmod.set_point_floor_load(b.coil)

    grid = None
    if tabulate:
        f = LOAD_GRID[None, :]
        steam_t, coil_p, steam_flow = b.state(np.broadcast_to(f, (n, LOAD_GRID.size)))
        differential = coil_p + b.fill_pressure[:, None] - b.back[:, None]
        stalled = drainage.cannot_discharge(differential, b.trap_min[:, None])
        grid = (steam_t, coil_p, steam_flow, differential, stalled, coilmod.inlet_temperature(b.coil.column(), f))

    valves, opening = _valves(b, None if grid is None else grid[1], None if grid is None else grid[2])
    valve_load, drain_cv = _valve_stall_loads(b, valves)
    stall = [s if np.isnan(valve_load[i]) else _with_valve_stall(s, valves[i], float(valve_load[i]))
             for i, s in enumerate(stall)]
    valves = [v if v is None or np.isnan(drain_cv[i]) else _with_drain_cv(v, float(drain_cv[i]))
              for i, v in enumerate(valves)]
    needed = None
    if grid is not None:
        needed = grid[1]
        grid = _valve_limited_grid(b, valves, grid, opening)

    # drainage verdicts (per unit)
    drains, effective = [], []
    for i, u in enumerate(units):
        s = stall[i]
        need = drainage.required_arrangement(s.load_fraction or 0.0, s.floods_in_range, float(b.stall_pressure[i]),
                                             float(b.atm[i]))
        ok, why = drainage.installed_adequate(u.drain.arrangement, need.required)
        if s.valve_load_fraction is not None:
            need.facts.update(valve_load=s.valve_load_fraction, valve_pressure=s.valve_coil_pressure,
                              by_load=s.in_range)
        drains.append(Drainage(u.drain.arrangement, need.required, ok, need.reason, why, need.facts))
        effective.append(u.drain.arrangement if ok else need.required)

    traps = devices.trap_figures(b, effective, stall, p_min, w_min, selected_limits=complete)
    flashes = devices.flash_figures(b)
    if complete:
        rounders = [lambda value, kind, up, system=systems[i], atm=float(b.atm[i]):
                    display.rounded(value, kind, system, atm, up=up) for i in range(n)]
        p_low, floor = _valve_bound(b, valves, p_min)
        fixes = remedies.solve(b, p_low, [d.adequate for d in drains], rounders, floor)
        fixes = [f + _valve_remedy(valves[i], stall[i], drains[i].adequate) for i, f in enumerate(fixes)]
    else:
        fixes = [()] * n

    lines_all = linesmod.return_lines(units, b.condensate_design, b.design_pressure, stall, w_min, p_min)
    results = []
    for i, u in enumerate(units):
        d = DesignPoint(load=float(b.load_design[i]), steam_flow=float(b.condensate_design[i]),
                        coil_pressure=float(b.design_pressure[i]), steam_temperature=float(b.coil.steam_design[i]),
                        medium_mass_flow=float(b.mass_flow[i]), medium_cp=float(b.cp[i]))
        points = None
        if grid is not None:
            steam_t, coil_p, steam_flow, differential, stalled, inlet_t = grid
            points = Points(load_fraction=LOAD_GRID, inlet_temperature=inlet_t[i], coil_pressure=coil_p[i],
                            steam_temperature=steam_t[i], steam_flow=steam_flow[i],
                            drain_differential=differential[i], stalled=stalled[i],
                            valve_opening=None if opening is None or valves[i] is None else opening[i],
                            needed_coil_pressure=needed[i])
        s = stall[i]
        year = None
        if u.site.weather is not None:
            year, loads = yearmod.figures(u, b.coil.take(i), s.load_fraction or 0.0, s.valve_load_fraction)
            hours, hours_basis = np.ones(loads.size), "weather"
            stalled_hours, total_hours = float(year.stalled), float(year.operating)
        else:
            loads, hours = _bin_loads(u, b.coil, i)
            hours_basis = "bins"
            stalled_hours, total_hours = _hours(u, s.load_fraction or 0.0, loads, hours,
                                                s.valve_load_fraction)
        pump = devices.pump_trap_figures(u, drains[i].required, s, float(b.back[i]), float(b.supply[i]))
        line = lines_all[i]
        shock = devices.surge_figures(u, pump, float(b.back[i]), float(b.condensate_design[i]))
        purge = devices.purge_figures(u, b.one(i), float(b.back[i]), float(b.design_pressure[i]),
                                      float(p_min[i]), loads, hours, hours_basis)
        result = Result(
            name=u.name, tag=u.tag, source=u.source, system=systems[i], method=u.design.method,
            varies=u.load.varies, medium=u.design.medium, minimum_load=u.load.minimum,
            atmospheric_pressure=float(b.atm[i]), return_pressure=float(b.return_pressure[i]),
            back_pressure=float(b.back[i]), fill_head_pressure=float(b.fill_pressure[i]),
            trap_min_differential=float(b.trap_min[i]), lift=float(b.lift[i]), fill_head=float(b.fill_height[i]),
            supply_pressure=float(b.supply[i]), design=d, stall=s, points=points, stalled_hours=stalled_hours,
            total_hours=total_hours, drainage=drains[i], valve=valves[i], findings=(),
            basis=_basis(u, bool(clipped[i])) if complete else None, trap=traps[i],
            pump_trap=pump, purge=purge, flash=flashes[i], remedies=fixes[i], warnings=u.warnings, return_line=line,
            surge=shock, year=year, cautions=caution_codes(year is not None),
            set_point_floor_load=float(floor_load[i]))
        # The rules read the finished result; their findings complete it before anyone
        # else sees it (set in place: a copy of every result costs a survey 10 % more).
        object.__setattr__(result, "findings", findings.core(u, result))
        results.append(result)
    return results


def _stall_points(b: Batch, p_min) -> list[StallPoint]:
    """Exact stall points, from the closed-form inverse of the coil model.

    A stall counts only where the stall pressure is above the coil pressure at no load
    by more than :data:`drainage.PRESSURE_TOLERANCE`, and lies in the operating range
    only where it is that far above the coil pressure at the minimum load, ``p_min``
    [Pa], too.
    """
    thr = b.stall_pressure
    valid = thr > properties.P_MIN
    t_stall = properties.saturation_temperature(np.clip(thr, properties.P_MIN, properties.P_CRIT))
    f_stall = coilmod.load_at_steam_temperature(b.coil, t_stall)
    p_zero = b.state(np.zeros(len(thr)))[1]
    occurs = valid & (f_stall > 0.0) & (thr - p_zero > drainage.PRESSURE_TOLERANCE)
    full = occurs & (f_stall >= 1.0)
    f = np.where(full, 1.0, np.where(occurs, f_stall, 0.0))
    p = np.where(full, b.design_pressure, np.clip(thr, properties.P_MIN, properties.P_CRIT))
    t = np.where(full, b.coil.steam_design, t_stall)
    condensate = f * b.load_design / properties.latent_heat(p)
    inlet = coilmod.inlet_temperature(b.coil, f)
    in_range = occurs & drainage.stalls_in_range(f, b.minimum, thr, p_min)
    out = []
    for i in range(len(thr)):
        if not occurs[i]:
            out.append(StallPoint(occurs=False, threshold_pressure=float(thr[i])))
            continue
        by_inlet = b.units[i].load.varies == "inlet-temperature"
        out.append(StallPoint(True, float(thr[i]), float(f[i]), float(p[i]), float(t[i]), float(condensate[i]),
                              float(inlet[i]) if by_inlet else None, bool(in_range[i])))
    return out


def _valves(b: Batch, coil_p, steam_flow):
    """Valve figures for the units that have one, and the travel each load needs on the
    load grid (``coil_p`` and ``steam_flow`` there; None: no grid, no travel)."""
    n = len(b.units)
    has = np.array([u.valve is not None for u in b.units])
    results: list = [None] * n
    if not has.any():
        return results, None
    idx = np.flatnonzero(has)
    vs = [b.units[i].valve for i in idx]
    cv = np.array([v.cv for v in vs])
    xt = np.array([v.xt for v in vs])
    rangeability = np.array([v.rangeability for v in vs])
    characteristic = np.array([v.characteristic for v in vs])
    p1 = b.supply[idx]
    rho1 = properties.vapour_density(p1)
    opening = None
    if coil_p is not None:
        cv_need = valvemod.required_cv(steam_flow[idx], p1[:, None], coil_p[idx], rho1[:, None], xt[:, None])
        opening = np.full(coil_p.shape, np.nan)
        opening[idx] = valvemod.travel(cv_need / cv[:, None], characteristic[:, None], rangeability[:, None])
    cv_design = valvemod.required_cv(b.condensate_design[idx], p1, b.design_pressure[idx], rho1, xt)
    ok = cv_design <= cv

    # valve-limited point: the coil pressure where the open valve passes exactly what
    # the coil condenses at design flow and entering temperature
    limited_f = np.full(idx.size, np.nan)
    limited_p = np.full(idx.size, np.nan)
    short = np.flatnonzero(~ok)
    if short.size:
        units = idx[short]
        coil = b.coil.take(units)
        low = np.maximum(properties.saturation_pressure(np.maximum(coil.inlet_design, properties.T_MIN)),
                         properties.P_MIN)

        excess = _valve_excess(b, units, np.ones(units.size), cv[short], p1[short], rho1[short], xt[short])
        found = illinois(excess, low, b.design_pressure[units], SOLVE_TOLERANCE)
        solved = np.isfinite(found)
        p_lim = np.where(solved, found, low)
        f_solved = coilmod.delivered_fraction(coil, properties.saturation_temperature(p_lim))
        # Even with the coil at the bottom of the steam tables the open valve may pass
        # less than the coil would condense: it then delivers what its steam carries.
        passed = valvemod.steam_flow(cv[short], p1[short], low, rho1[short], xt[short])
        f_low = passed * properties.latent_heat(low) / b.load_design[units]
        limited_p[short] = p_lim
        limited_f[short] = np.where(solved, f_solved, f_low)

    # lowest controllable load: the needed Cv falls to Cv/rangeability
    cv_min = cv / rangeability

    def above_min(load, where):
        _, p, w = b.state(load, idx[where])
        return valvemod.required_cv(w, p1[where], p, rho1[where], xt[where]) - cv_min[where]

    min_load = illinois(above_min, np.full(idx.size, 1e-9), np.ones(idx.size), LOAD_TOLERANCE)
    min_load = np.where(np.isfinite(min_load), min_load, 1.0)
    open_design = valvemod.travel(cv_design / cv, characteristic, rangeability)
    choked = valvemod.is_choked(p1, b.design_pressure[idx], xt)
    for k, i in enumerate(idx):
        results[i] = ValveResult(
            cv=float(cv[k]), required_cv_design=float(cv_design[k]), opening_design=float(open_design[k]),
            capacity_ok=bool(ok[k]), choked_at_design=bool(choked[k]),
            limited_load_fraction=None if ok[k] else float(limited_f[k]),
            limited_coil_pressure=None if ok[k] else float(limited_p[k]),
            min_controllable_load=float(min_load[k]), rangeability=float(rangeability[k]),
            characteristic=str(characteristic[k]), given_as=b.units[i].valve.given_as)
    return results, opening


# --- the valve-limited coil -------------------------------------------------------------
#
# The coil runs at the lesser of the pressure its load needs and the pressure the open
# valve lets it have. Where the valve is too small, the open valve passes only what the
# coil condenses at some lower pressure: the coil floods there if that pressure is at or
# under the stall pressure. Colder air (or more flow) condenses more at a given pressure,
# so the pressure the open valve holds falls as the load rises: a too-small valve stalls
# the coil from some load up to full load.


def _valve_excess(b: Batch, units, loads, cv, p1, rho1, xt):
    """``excess(p, where)``: steam the open valve passes at coil pressure p less what the
    coil condenses there under the conditions of each load [kg/s] (rises as p falls)."""
    coil = b.coil.take(units)

    def excess(p, where):
        t = properties.saturation_temperature(p)
        condensed = (b.load_design[units[where]] * coilmod.delivered_fraction(coil.take(where), t, loads[where])
                     / properties.latent_heat(p))
        return valvemod.steam_flow(cv[where], p1[where], p, rho1[where], xt[where]) - condensed
    return excess


def _valve_terms(b: Batch, valves, units):
    """Cv, supply pressure, supply vapour density and x_T of the valves of ``units``."""
    cv = np.array([valves[i].cv for i in units])
    xt = np.array([b.units[i].valve.xt for i in units])
    p1 = b.supply[units]
    return cv, p1, properties.vapour_density(p1), xt


def _short_valves(valves) -> list[int]:
    """The units whose open valve cannot pass the design load."""
    return [i for i, v in enumerate(valves) if v is not None and not v.capacity_ok]


def _aim_ratio(b: Batch, units, cv, p1, rho1, xt):
    """For the valves of ``units``: what the coil condenses at full load with its
    pressure the remedies' margin above the stall pressure, over what the open valve
    passes there [-]; inf where that pressure is not below the supply. The Cv that
    holds the coil there is Cv times this (the valve's flow goes as its Cv), and so is
    the design steam temperature's span above the entering air (the coil condenses as
    T_s − T_in,d over T_s,d − T_in,d)."""
    aim = b.stall_pressure[units] + remedies.MARGIN
    ok = (aim > properties.P_MIN) & (aim < p1)
    aim = np.clip(aim, properties.P_MIN, p1)
    condensed = (b.load_design[units] * coilmod.delivered_fraction(b.coil.take(units),
                                                                   properties.saturation_temperature(aim))
                 / properties.latent_heat(aim))
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(ok, condensed / valvemod.steam_flow(cv, p1, aim, rho1, xt), np.inf)


def _valve_stall_loads(b: Batch, valves) -> tuple[np.ndarray, np.ndarray]:
    """For each unit, the load fraction from which up to full load its open valve holds
    the coil at or under the stall pressure (by more than the verdict's tolerance; NaN
    where it never does, 0 where it does at every load), and the least Cv that would
    hold the coil :data:`remedies.MARGIN` above it at full load (NaN where the valve does
    not stall it; inf where no valve can, the stall pressure being above the supply's)."""
    out = np.full(len(b.units), np.nan)
    fix = np.full(len(b.units), np.nan)
    short = np.array([v is not None and not v.capacity_ok
                      and b.stall_pressure[i] - v.limited_coil_pressure > drainage.PRESSURE_TOLERANCE
                      and b.stall_pressure[i] < b.supply[i]
                      for i, v in enumerate(valves)], dtype=bool)
    units = np.flatnonzero(short)
    if not units.size:
        return out, fix
    cv, p1, rho1, xt = _valve_terms(b, valves, units)
    thr = b.stall_pressure[units]
    t_thr = properties.saturation_temperature(thr)
    passed = valvemod.steam_flow(cv, p1, thr, rho1, xt)
    heat = passed * properties.latent_heat(thr)
    coil = b.coil.take(units)

    # with the coil at the stall pressure, what it condenses less what the open valve
    # passes: it rises with the load, and from its root up the valve cannot hold the
    # coil above the stall pressure
    def short_at(f, where):
        return b.load_design[units[where]] * coilmod.delivered_fraction(coil.take(where), t_thr[where], f) - heat[where]

    low = np.full(units.size, 1e-9)
    found = illinois(short_at, low, np.ones(units.size), LOAD_TOLERANCE)
    everywhere = short_at(low, np.arange(units.size)) >= 0.0
    fix[units] = cv * _aim_ratio(b, units, cv, p1, rho1, xt)
    out[units] = np.where(everywhere, 0.0, np.where(np.isfinite(found), found, 1.0))
    return out, fix


def _with_valve_stall(s: StallPoint, valve, load: float) -> StallPoint:
    """The stall point with the valve's stall added: the load from which it floods and
    the pressure the open valve holds at full load."""
    return StallPoint(s.occurs, s.threshold_pressure, s.load_fraction, s.coil_pressure, s.steam_temperature,
                      s.condensate, s.inlet_temperature, s.in_range, load,
                      float(valve.limited_coil_pressure))


def _valve_bound(b: Batch, valves, p_min):
    """The lowest coil pressure each unit runs at, the lesser of what its minimum load
    needs and what a too-small valve holds at full load [Pa]; and, where the valve is
    too small, the least design steam temperature at which it still holds the coil the
    remedies' margin above the stall pressure at full load [K] (NaN elsewhere).

    At full load the coil condenses Q_d·(T_s − T_in,d)/(T_s,d − T_in,d)/h_fg; a smaller
    coil (a higher design temperature) condenses less at the same pressure, so the open
    valve holds it at p_aim = p_stall + margin where
    T_s,d ≥ T_in,d + (T_s,d − T_in,d)·:func:`_aim_ratio`."""
    p_low = np.array(p_min, dtype=float)
    floor = np.full(len(b.units), np.nan)
    short = _short_valves(valves)
    if not short:
        return p_low, floor
    units = np.array(short)
    p_low[units] = np.minimum(p_low[units], [valves[i].limited_coil_pressure for i in short])
    t_in = b.coil.inlet_design[units]
    floor[units] = t_in + (b.coil.steam_design[units] - t_in) * _aim_ratio(b, units, *_valve_terms(b, valves, units))
    return p_low, floor


def _valve_remedy(v: ValveResult | None, s: StallPoint, adequate: bool) -> tuple[Remedy, ...]:
    """Where a too-small valve floods a coil its drainage cannot handle: the valve that
    stops it, its Cv rounded up to the three figures printed. A change on its own where
    the load alone never stalls the coil in its operating range; else it does not do
    it alone (the load's own stall remains)."""
    if adequate or v is None or v.drain_cv is None or s.valve_load_fraction is None:
        return ()
    alone = not s.in_range
    return (Remedy(key="valve.cv", kind="cv", current=v.cv, value=display.up_to_figures(v.drain_cv, 3),
                   reason="change" if alone else "not-alone", status="change", achievable=alone,
                   facts={"load": s.load_fraction, "given_as": v.given_as}),)


def _with_drain_cv(v: ValveResult, cv: float) -> ValveResult:
    """The valve's figures with the least Cv that keeps the coil draining at full load."""
    return ValveResult(v.cv, v.required_cv_design, v.opening_design, v.capacity_ok, v.choked_at_design,
                       v.limited_load_fraction, v.limited_coil_pressure, v.min_controllable_load, v.rangeability,
                       v.characteristic, cv if np.isfinite(cv) else None, v.given_as)


def _valve_limited_grid(b: Batch, valves, grid, opening):
    """The load grid with the coil held to what the open valve gives wherever the valve
    cannot pass what the load needs: coil pressure, steam temperature and flow, the
    differential at the trap and the stall, and the valve wide open there."""
    steam_t, coil_p, steam_flow, differential, stalled, inlet_t = (np.array(a) for a in grid)
    short = _short_valves(valves)
    if not short or opening is None:
        return steam_t, coil_p, steam_flow, differential, stalled, inlet_t
    rows = np.array(short)
    limited = np.zeros(coil_p.shape, dtype=bool)
    limited[rows] = opening[rows] > 1.0
    unit_of, load_of = np.nonzero(limited)
    if unit_of.size:
        cv, p1, rho1, xt = _valve_terms(b, valves, unit_of)
        loads = LOAD_GRID[load_of]
        excess = _valve_excess(b, unit_of, loads, cv, p1, rho1, xt)
        coil = b.coil.take(unit_of)
        low = np.maximum(properties.saturation_pressure(
            np.maximum(coilmod.inlet_temperature(coil, loads), properties.T_MIN)), properties.P_MIN)
        p = illinois(excess, low, coil_p[unit_of, load_of], SOLVE_TOLERANCE)
        p = np.where(np.isfinite(p), p, low)
        coil_p[unit_of, load_of] = p
        steam_t[unit_of, load_of] = properties.saturation_temperature(p)
        steam_flow[unit_of, load_of] = valvemod.steam_flow(cv, p1, p, rho1, xt)
        opening[unit_of, load_of] = 1.0
        differential = coil_p + b.fill_pressure[:, None] - b.back[:, None]
        stalled = drainage.cannot_discharge(differential, b.trap_min[:, None])
    return steam_t, coil_p, steam_flow, differential, stalled, inlet_t


def _bin_loads(unit: Unit, coils, i: int) -> tuple[np.ndarray | None, np.ndarray | None]:
    """Load fraction [-] and hours [h] of each load bin of the unit whose coil is
    ``coils``'s ``i``-th (None without bins)."""
    bins = unit.load.bins
    if not bins:
        return None, None
    hours = np.array([b.hours for b in bins])
    if unit.load.varies == "inlet-temperature":
        load = coilmod.load_at_inlet_temperature(coils.take(i), np.array([b.inlet_temperature for b in bins]))
    else:
        load = np.array([b.load for b in bins])
    return load, hours


def _hours(unit: Unit, stall_fraction: float, load, hours,
           valve_load: float | None = None) -> tuple[float | None, float | None]:
    """Hours stalled and total hours from the load bins (None without bins), by the rule
    a weather year's hours follow too (:func:`stallcheck.analysis.year.stalled_hours`)."""
    if load is None:
        return None, None
    _, stalled = yearmod.stalled_hours(load, unit.load.minimum, stall_fraction, valve_load)
    return float(hours[stalled].sum()), float(hours.sum())


def _basis(unit: Unit, clipped: bool) -> Basis:
    """What the analysis of ``unit`` took as given (the Assumptions' facts)."""
    site, ld, w = unit.site, unit.load, unit.site.weather
    return Basis(
        ua_exponent=unit.design.ua_flow_exponent,
        atmosphere="given" if site.pressure_given else "elevation" if site.elevation is not None else "standard",
        elevation=site.elevation, valve=unit.valve is not None, clipped=clipped, defaults=unit.defaults,
        weather=None if w is None else w.path, outdoor_air=ld.outdoor_air_minimum,
        return_air=ld.return_air_temperature, mixed_air=ld.mixed_air_temperature,
        scheduled=bool(ld.season) or ld.daily_hours is not None, bins_unused=w is not None and bool(ld.bins))
