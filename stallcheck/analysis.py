"""Run the physics in order for one unit and gather a :class:`~stallcheck.result.Result`.

unit → design point (properties) → coil model → stall threshold and stall point
(closed form) → points across the load range → drainage verdict → valve → findings.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from stallcheck import coil as coilmod
from stallcheck import devices, drainage, findings, properties, remedies, valve as valvemod
from stallcheck import quantities as q
from stallcheck.errors import InputError
from stallcheck.inputs import Unit
from stallcheck.result import DesignPoint, Drainage, Points, Result, StallPoint, ValveResult
from stallcheck.solve import bisect

#: Specific heat of air [J/(kg·K)] (the unit-file conventions).
AIR_CP = 1006.0
#: Load fractions at which the result tabulates the unit.
LOAD_GRID = np.linspace(0.0, 1.0, 101)


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
        Where the set point is not below the design steam temperature, or a pressure
        is below the range of the steam tables.
    """
    if method:
        unit = unit.with_method(method)
    system = system or unit.system
    atm = unit.site.atmospheric_pressure
    d = unit.design

    def words_p(pa: float) -> str:
        return q.show(pa, "pressure", system, atm)

    # --- design point -------------------------------------------------------------
    steam_t_design = float(properties.saturation_temperature(d.steam_pressure))
    if d.outlet_temperature >= steam_t_design - 0.5:
        raise InputError("design.outlet_temperature",
                         f"the set point {q.show(d.outlet_temperature, 'temperature', system)} is not below "
                         f"the steam temperature at design.steam_pressure "
                         f"({q.show(steam_t_design, 'temperature', system)}); the coil cannot heat to it. "
                         f"Raise the design steam pressure or lower the set point.", file=unit.source)
    if unit.drain.return_pressure < properties.P_MIN:
        raise InputError("drain.return_pressure", "is below 0.61 kPa(abs), under the triple point of water; "
                                                  "check the gauge/absolute spelling.", file=unit.source)
    mass_flow, cp = _medium_flow(unit)
    load_design = mass_flow * cp * (d.outlet_temperature - d.inlet_temperature)
    h_fg_design = float(properties.latent_heat(d.steam_pressure))
    design = DesignPoint(load=load_design, steam_flow=load_design / h_fg_design,
                         coil_pressure=d.steam_pressure, steam_temperature=steam_t_design,
                         medium_mass_flow=mass_flow, medium_cp=cp)
    coil = coil_of(unit, steam_t_design)

    # --- stall threshold and stall point -------------------------------------------
    dr = unit.drain
    rho = float(properties.liquid_density(dr.return_pressure))
    back = float(drainage.back_pressure(dr.return_pressure, dr.lift, rho))
    fill = float(drainage.head(dr.fill_head, rho))
    threshold = back + dr.trap_min_differential - fill
    stall = _stall_point(coil, threshold, load_design, d.steam_pressure)

    # --- the load range ------------------------------------------------------------
    f = LOAD_GRID
    clipped = bool(np.any(coilmod.steam_temperature(coil, f) < properties.T_MIN))
    steam_t, coil_p, steam_flow = _steam_at(coil, f, load_design)
    differential = coil_p + fill - back
    stalled = differential <= dr.trap_min_differential

    valve_result, opening = (None, None)
    if unit.valve is not None:
        valve_result, opening = _valve(unit, coil, design, f, coil_p, steam_flow)

    stall_fraction = stall.load_fraction or 0.0
    need = drainage.requirement(stall_fraction, unit.load.minimum, threshold, atm, words_p)
    ok, why = drainage.adequacy(dr.arrangement, need.required)
    drain = Drainage(dr.arrangement, need.required, ok, (need.reason, why))

    # --- drain devices -------------------------------------------------------------
    def state(load):
        _, p, w = _steam_at(coil, load, load_design)
        return p, w

    effective = dr.arrangement if ok else need.required
    trap, capacity = devices.trap_figures(
        unit, effective, state, stall, lambda load: coilmod.inlet_temperature(coil, load), back, fill, atm,
        design.steam_flow, d.steam_pressure)
    bin_loads, bin_hours = _bin_loads(unit, coil)
    pump = devices.pump_trap_figures(unit, need.required, stall, back, unit.supply_pressure, unit.source)
    purge = devices.purge_figures(unit, state, back, d.steam_pressure, bin_loads, bin_hours)
    flash = devices.flash_figures(unit, d.steam_pressure, design.steam_flow)
    p_min = float(state(np.array([unit.load.minimum]))[0][0])
    fixes = remedies.solve(unit, coil, p_min, system)

    points = Points(load_fraction=f, inlet_temperature=coilmod.inlet_temperature(coil, f),
                    coil_pressure=coil_p, steam_temperature=steam_t, steam_flow=steam_flow,
                    drain_differential=differential, stalled=stalled, valve_opening=opening,
                    trap_capacity=capacity(differential, coil_p + fill))

    stalled_hours, total_hours = _hours(unit, stall_fraction, bin_loads, bin_hours)

    result = Result(
        unit=unit.name, tag=unit.tag, source=unit.source, system=system, method=d.method,
        varies=unit.load.varies, medium=d.medium, minimum_load=unit.load.minimum,
        atmospheric_pressure=atm, return_pressure=dr.return_pressure, back_pressure=back,
        fill_head_pressure=fill, trap_min_differential=dr.trap_min_differential,
        lift=dr.lift, fill_head=dr.fill_head, supply_pressure=unit.supply_pressure, design=design,
        stall=stall, points=points,
        stalled_hours=stalled_hours, total_hours=total_hours, drainage=drain, valve=valve_result,
        findings=(), assumptions=_assumptions(unit, clipped, trap), trap=trap, pump_trap=pump, purge=purge,
        flash=flash, remedies=fixes, warnings=unit.warnings)
    return replace(result, findings=findings.core(unit, result, system))


def coil_of(unit: Unit, steam_t_design: float | None = None) -> coilmod.CoilModel:
    """The coil model of a unit (its design steam temperature from the design pressure)."""
    d = unit.design
    if steam_t_design is None:
        steam_t_design = float(properties.saturation_temperature(d.steam_pressure))
    return coilmod.CoilModel(d.method, unit.load.varies, d.inlet_temperature, d.outlet_temperature,
                             steam_t_design, d.ua_flow_exponent)


def state_at(unit: Unit, result: Result, load):
    """Steam temperature [K], coil pressure [Pa] and condensate [kg/s] the unit needs at
    load fractions [-], as in the analysis."""
    coil = coil_of(unit.with_method(result.method), result.design.steam_temperature)
    return _steam_at(coil, np.asarray(load, dtype=float), result.design.load)


def _medium_flow(unit: Unit) -> tuple[float, float]:
    """Mass flow [kg/s] and specific heat [J/(kg·K)] of the heated medium."""
    d = unit.design
    if d.medium == "air":
        mass = d.flow if d.flow_is_mass else d.flow * q.STANDARD_AIR_DENSITY
        return mass, AIR_CP
    mean = 0.5 * (d.inlet_temperature + d.outlet_temperature)
    if mean >= 423.15:
        raise InputError("design.outlet_temperature", "liquid media are evaluated up to a mean "
                         "temperature of 150 °C; this unit's mean design temperature is higher.",
                         file=unit.source)
    cp = properties.medium_cp(d.medium, d.concentration, mean)
    if d.flow_is_mass:
        return d.flow, cp
    return d.flow * properties.medium_density(d.medium, d.concentration, mean), cp


def _steam_at(coil, load, load_design: float):
    """Steam temperature [K], coil pressure [Pa] and steam flow [kg/s] at load fractions.

    Temperatures the coil model asks for below the triple point are held there.
    """
    steam_t = np.clip(coilmod.steam_temperature(coil, load), properties.T_MIN, None)
    coil_p = properties.saturation_pressure(steam_t)
    return steam_t, coil_p, load * load_design / properties.latent_heat(coil_p)


def _stall_point(coil, threshold: float, load_design: float, design_pressure: float) -> StallPoint:
    """Exact stall point, from the closed-form inverse of the coil model."""
    if threshold <= properties.P_MIN:
        return StallPoint(occurs=False, threshold_pressure=threshold)
    t_stall = float(properties.saturation_temperature(min(threshold, properties.P_CRIT)))
    f_stall = float(coilmod.load_at_steam_temperature(coil, t_stall))
    if not f_stall > 0.0:
        return StallPoint(occurs=False, threshold_pressure=threshold)
    if f_stall >= 1.0:
        f_stall, p, t = 1.0, design_pressure, coil.steam_design
    else:
        p, t = threshold, t_stall
    condensate = f_stall * load_design / float(properties.latent_heat(p))
    inlet = float(coilmod.inlet_temperature(coil, f_stall)) if coil.varies == "inlet-temperature" else None
    return StallPoint(True, threshold, f_stall, p, t, condensate, inlet)


def _valve(unit: Unit, coil, design: DesignPoint, f, coil_p, steam_flow):
    """Valve figures and the travel needed at each load."""
    v = unit.valve
    p1 = unit.supply_pressure
    rho1 = float(properties.vapour_density(p1))
    cv_need = valvemod.required_cv(steam_flow, p1, coil_p, rho1, v.xt)
    opening = valvemod.travel(cv_need / v.cv, v.characteristic, v.rangeability)
    cv_design = float(valvemod.required_cv(design.steam_flow, p1, design.coil_pressure, rho1, v.xt))
    ok = cv_design <= v.cv
    limited_f = limited_p = None
    if not ok:
        # Coil pressure where the open valve passes exactly the steam the coil condenses
        # at design flow and entering temperature.
        def excess(p):
            t = properties.saturation_temperature(p)
            need = design.load * coilmod.delivered_fraction(coil, t) / properties.latent_heat(p)
            return valvemod.steam_flow(v.cv, p1, p, rho1, v.xt) - need

        low = max(float(properties.saturation_pressure(max(coil.inlet_design, properties.T_MIN))),
                  properties.P_MIN)
        limited_p = float(bisect(excess, low, design.coil_pressure))
        if np.isfinite(limited_p):
            limited_f = float(coilmod.delivered_fraction(coil, properties.saturation_temperature(limited_p)))
        else:
            # Even with the coil at the bottom of the steam tables the open valve passes
            # less than the coil would condense: it delivers what its steam carries.
            limited_p = low
            passed = float(valvemod.steam_flow(v.cv, p1, low, rho1, v.xt))
            limited_f = passed * float(properties.latent_heat(low)) / design.load

    cv_min = v.cv / v.rangeability

    def above_min(load):
        _, p, w = _steam_at(coil, load, design.load)
        return valvemod.required_cv(w, p1, p, rho1, v.xt) - cv_min

    min_load = float(bisect(above_min, 1e-9, 1.0))
    if not np.isfinite(min_load):
        min_load = 1.0
    result = ValveResult(cv=v.cv, required_cv_design=cv_design, opening_design=float(
        valvemod.travel(cv_design / v.cv, v.characteristic, v.rangeability)), capacity_ok=ok,
        choked_at_design=bool(valvemod.is_choked(p1, design.coil_pressure, v.xt)),
        limited_load_fraction=limited_f, limited_coil_pressure=limited_p,
        min_controllable_load=min_load, rangeability=v.rangeability, characteristic=v.characteristic)
    return result, opening


def _bin_loads(unit: Unit, coil) -> tuple[np.ndarray | None, np.ndarray | None]:
    """Load fraction [-] and hours [h] of each load bin (None without bins)."""
    bins = unit.load.bins
    if not bins:
        return None, None
    hours = np.array([b.hours for b in bins])
    if unit.load.varies == "inlet-temperature":
        load = coilmod.load_at_inlet_temperature(coil, np.array([b.inlet_temperature for b in bins]))
    else:
        load = np.array([b.load for b in bins])
    return load, hours


def _hours(unit: Unit, stall_fraction: float, load, hours) -> tuple[float | None, float | None]:
    """Hours stalled and total hours from the load bins (None without bins)."""
    if load is None:
        return None, None
    running = load > 0
    # A unit asked for less than its minimum load runs at the minimum; more than full
    # load, at full load.
    at = np.clip(load, unit.load.minimum, 1.0)
    stalled = running & (at <= stall_fraction) & (stall_fraction > 0)
    return float(hours[stalled].sum()), float(hours.sum())


def _assumptions(unit: Unit, clipped: bool, trap) -> tuple[str, ...]:
    d = unit.design
    method = ("NTU: condensing steam, ε = 1 − exp(−NTU), UA fixed by the design point"
              if d.method == "ntu" else
              "mean temperature: load ∝ (T_steam − mean of entering and leaving temperature)")
    if unit.load.varies == "flow":
        method += f"; UA ∝ flow^{d.ua_flow_exponent:g}"
    out = [
        f"Method: {method}.",
        f"Load varies with {'entering temperature at fixed flow' if unit.load.varies == 'inlet-temperature' else 'flow at fixed temperatures'}.",
        f"Atmospheric pressure {unit.site.basis}; gauge values are relative to it.",
        "Steam saturated (IAPWS-IF97); condensate leaves at saturation; "
        "heads use saturated water density at the return pressure.",
    ]
    if d.medium == "air":
        out.append("Air cp 1.006 kJ/(kg·K); air volumes are standard air, 1.204 kg/m³.")
    else:
        out.append("Liquid cp (and density, for volume flows) at the mean design temperature (CoolProp).")
    if unit.valve is not None:
        out.append("Valve: IEC 60534-2-1 with γ = 1.30 for steam, F_P = 1, inherent characteristic.")
    out.append(_trap_basis(unit, trap))
    if clipped:
        out.append("At the lowest loads the steam temperature the model asks for is below 0 °C; "
                   "those points are held at the bottom of the steam tables (0 °C, 0.61 kPa(abs)).")
    out.extend(f"Default: {text}." for text in unit.defaults)
    return tuple(out)


def _trap_basis(unit: Unit, trap) -> str:
    """Where the trap's capacity comes from, in words."""
    if trap.basis == "table":
        return ("Trap capacity: the [[drain.capacity]] table, read on log-log axes, scaled as the square "
                "root of differential below its lowest row and never extrapolated above its highest.")
    model = ("a sharp-edged orifice, C_d 0.6, passing saturated condensate, reduced for flashing by "
             "Fauske's non-equilibrium model (5 mm seat) with the omega method's equilibrium flux")
    if trap.basis == "orifice":
        return f"Trap capacity: the seat bore given, as {model}."
    return (f"Trap capacity: none given, so a trap selected by the usual rule ({trap.margin:g} x full-load "
            f"condensate at the working differential, at least 1/4 psi), modelled as {model}.")
