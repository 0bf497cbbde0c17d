"""Findings from the computed operating state: each a code, a severity and a message
that says what is wrong, why it matters and what to do.

Codes are stable (scripts filter on them); the README lists them with their sources.
"""

from __future__ import annotations

from stallcheck import layout
from stallcheck import quantities as q
from stallcheck.devices import MOTIVE_MARGIN
from stallcheck.constants import VELOCITY_LIMIT
from stallcheck.inputs import Unit
from stallcheck.result import Finding, Result

FREEZING = 273.15
#: Temperatures this close to freezing count as at it, not below [K]: the same unit
#: written in °F and in °C differs by rounding in the last digits.
_AT = 1e-6
#: Trap types that do poorly on modulating service at low or fluctuating differential
#: (common practice; VA HVAC Design Manual asks for float-and-thermostatic traps there).
POOR_AT_LOW_DIFFERENTIAL = {
    "thermodynamic": "a thermodynamic (disc) trap needs a working differential to snap shut and open, "
                     "and backs up condensate when the coil pressure falls",
    "thermostatic": "a thermostatic trap holds condensate back until it subcools, which floods "
                    "a modulating coil",
    "bimetallic": "a bimetallic trap holds condensate back until it subcools, which floods "
                  "a modulating coil",
    "inverted-bucket": "an inverted-bucket trap can lose its prime when the coil pressure swings, "
                       "and then blows steam or stalls",
}


#: A working differential below this is low for traps that need one to operate [Pa]
#: (1 psi; common practice, from memory).
LOW_DIFFERENTIAL = 6894.757


def core(unit: Unit, r: Result, system: str) -> tuple[Finding, ...]:
    """The findings of the core analysis, worst first.

    Parameters
    ----------
    unit : Unit
    r : Result
        The analysed result (its ``findings`` are ignored).
    system : str
        ``"si"`` or ``"us"``, for the numbers in the messages.
    """
    atm = r.atmospheric_pressure

    def p(pa):
        return q.show(pa, "pressure", system, atm)

    def t(k):
        return q.show(k, "temperature", system)

    out: list[Finding] = []
    s = r.stall
    in_range = s.in_range
    if s.occurs and s.load_fraction >= 1.0:
        out.append(Finding("stall-at-full-load", "danger",
                           f"The back pressure on the trap ({p(r.back_pressure)} with the lift) is at or above "
                           f"what the coil has at full load ({p(r.design.coil_pressure)} plus the fill head): "
                           f"the coil floods at every load. Fit a pump-trap, or remove the lift and return "
                           f"pressure behind the trap."))
    elif in_range:
        where = ""
        if s.inlet_temperature is not None:
            where = f" (entering {t(s.inlet_temperature)} and warmer)"
        handled = r.drainage.adequate
        out.append(Finding("stall-in-operating-range", "info" if handled else "warning",
                           f"The coil stalls below {s.load_fraction:.0%} load{where}: the coil pressure falls to "
                           f"{p(s.coil_pressure)} and the trap can no longer discharge "
                           f"{q.show(s.condensate, 'mass_flow', system)} of condensate. Condensate backs up, "
                           f"which brings water hammer and corrosion. "
                           + (f"The installed {r.drainage.installed} handles this; keep it working."
                              if handled else f"Drain it with a {r.drainage.required} (see drainage).")))
    if not r.drainage.adequate:
        out.append(Finding("drainage-inadequate", "danger" if s.load_fraction and s.load_fraction >= 1 else "warning",
                           f"The installed {r.drainage.installed} is not enough: {r.drainage.reasons[0]}. "
                           f"Install a {r.drainage.required}."))
    if in_range and r.medium == "air":
        freezing = _freeze_exposure(unit, r)
        if freezing:
            out.append(Finding("freeze-risk", "danger" if not r.drainage.adequate else "info", freezing))
    if in_range and unit.drain.lift > 0 and unit.drain.arrangement != "pump-trap":
        out.append(Finding("lift-after-trap", "warning",
                           f"Condensate is lifted {q.show(unit.drain.lift, 'length', system)} straight after the trap "
                           f"of a coil that stalls: the lift adds to the back pressure and floods the coil at low "
                           f"load (common practice: never lift directly after the trap of a modulating coil). "
                           f"Drain by gravity to a vented receiver and pump from there, or use a pump-trap."))
    low_working = r.trap is not None and r.trap.working_differential < LOW_DIFFERENTIAL
    if (in_range or low_working) and unit.drain.trap in POOR_AT_LOW_DIFFERENTIAL:
        where = ("The coil runs at low differential" if in_range else
                 f"At its lowest working point the trap has only "
                 f"{q.show(r.trap.working_differential, 'differential', system)} across it")
        out.append(Finding("trap-type-modulating", "warning",
                           f"{where}, and {POOR_AT_LOW_DIFFERENTIAL[unit.drain.trap]}. "
                           f"Use a float-and-thermostatic trap on modulating coils (common practice; "
                           f"VA HVAC Design Manual)."))
    v = r.valve
    if v is not None:
        if not v.capacity_ok:
            out.append(Finding("valve-too-small", "warning",
                               f"The valve needs Cv {v.required_cv_design:.3g} at design but has Cv {v.cv:.3g}: "
                               f"wide open it holds the coil at {p(v.limited_coil_pressure)} and delivers "
                               f"{v.limited_load_fraction:.0%} of the design load. Fit a larger valve or raise "
                               f"the supply pressure."))
        elif v.opening_design < 0.5:
            out.append(Finding("valve-oversized", "info",
                               f"At design the valve is only {v.opening_design:.0%} open (Cv {v.required_cv_design:.3g} "
                               f"needed of {v.cv:.3g}): it works near its seat at low load, where it hunts and cycles "
                               f"the coil pressure. A smaller valve controls better."))
        floor = max(r.minimum_load, 0.10)
        if v.min_controllable_load > floor:
            out.append(Finding("valve-low-load-control", "warning",
                               f"Below about {v.min_controllable_load:.0%} load the valve needs less than its smallest "
                               f"controllable Cv (Cv/rangeability = {v.cv / v.rangeability:.2g}): it opens and shuts "
                               f"instead of modulating, and each opening can drive condensate as a slug. Use a "
                               f"smaller valve, or two valves in sequence (1/3 and 2/3)."))
        elif v.min_controllable_load > r.minimum_load:
            out.append(Finding("valve-low-load-control", "info",
                               f"Below about {v.min_controllable_load:.0%} load the valve cannot modulate "
                               f"(Cv/rangeability = {v.cv / v.rangeability:.2g}) and will cycle."))
    if r.set_point_floor_load > 0:
        out.append(Finding(
            "method-below-set-point", "info",
            f"Below {r.set_point_floor_load:.0%} load the mean-temperature method would need steam colder than "
            f"the leaving set point ({t(unit.design.outlet_temperature)}), which cannot heat to it; there the "
            f"set point's saturation temperature is used instead, a lower bound on what the coil needs, so the "
            f"stall point and the remedies are on the safe side. The NTU method (design.method = \"ntu\") "
            f"models a coil whose flow varies without this limit."))
    out.extend(_devices(unit, r, system))
    out.extend(layout.rules(unit, r, system))
    order = {"danger": 0, "warning": 1, "info": 2}
    return tuple(sorted(out, key=lambda f: order[f.severity]))


def _devices(unit: Unit, r: Result, system: str) -> list[Finding]:
    """Findings on the trap, pump-trap, purge and return line."""
    atm = r.atmospheric_pressure

    def p(pa, kind="pressure"):
        return q.show(pa, kind, system, atm)

    def w(kg_s):
        return q.show(kg_s, "mass_flow", system)

    out: list[Finding] = []
    trap = r.trap
    if trap is not None and trap.basis != "selected":
        # A trap's capacity goes to zero with the differential, so every trap falls short
        # a little above the stall point; report it where that reaches 2 points of load.
        if trap.limit_load is not None and trap.limit_load > max(r.minimum_load, r.stall.load_fraction or 0.0) + 0.02:
            out.append(Finding(
                "trap-capacity-short", "warning",
                f"Below {trap.limit_load:.0%} load the trap cannot pass the condensate at the differential "
                f"it has there ({p(trap.limit_differential, 'differential')} for "
                f"{w(trap.limit_condensate)}), before the stall proper"
                + (f" at {r.stall.load_fraction:.0%}" if r.stall.occurs else "")
                + ": condensate backs into the coil from there down. Fit a trap rated for "
                  f"{w(trap.required_capacity)} at {p(trap.selection_differential, 'differential')}, "
                  f"or give it more fill head."))
        if trap.capacity_ok is False:
            out.append(Finding(
                "trap-undersized", "warning",
                f"At the differential it is selected at ({p(trap.selection_differential, 'differential')}) the trap passes "
                f"{w(trap.installed_capacity)}; common practice for modulating coils asks "
                f"{trap.margin:g} x the full-load condensate, {w(trap.required_capacity)} (VA HVAC Design "
                f"Manual: 1.5-2 x; NAVFAC MO-209: 2-4 x). Select a larger trap on its hot-condensate rating."))
    pt = r.pump_trap
    if pt is not None and pt.installed:
        margin = pt.motive_pressure - pt.back_pressure
        if margin < MOTIVE_MARGIN:
            source = "" if pt.motive_given else " (the supply pressure; drain.motive_pressure not given)"
            out.append(Finding(
                "pump-trap-motive-low", "danger" if margin <= 0 else "warning",
                f"The pump-trap's motive pressure {p(pt.motive_pressure)}{source} is only "
                f"{p(max(margin, 0.0), 'differential')} above the back pressure it pumps against "
                f"({p(pt.back_pressure)}); it wants about {p(MOTIVE_MARGIN, 'differential')} more "
                f"(common practice; the maker's table governs). Raise the motive pressure or cut the lift."))
        if pt.fill_head < pt.required_fill_head - 1e-9:
            source = "its maker asks" if pt.fill_head_given else "common practice asks about"
            out.append(Finding(
                "pump-trap-fill-head-low", "warning",
                f"The pump-trap has {q.show(pt.fill_head, 'length', system)} of fill head; {source} "
                f"{q.show(pt.required_fill_head, 'length', system)}. With less, condensate cannot run into "
                f"its body fast enough and backs into the coil. Set it lower below the coil."))
        if pt.outside_table:
            out.append(Finding(
                "pump-trap-outside-table", "warning",
                f"The back pressure ({p(pt.back_pressure)}) is above the highest row of the pump-trap's capacity "
                f"table: the maker does not rate it for this duty. Check with the maker, or cut the lift or "
                f"return pressure."))
        if pt.capacity is not None and pt.capacity < pt.condensate:
            out.append(Finding(
                "pump-trap-undersized", "warning",
                f"The pump-trap is rated for {w(pt.capacity)} at this duty, but must move {w(pt.condensate)} "
                f"at the stall point ({pt.load_fraction:.0%} load). Select a larger one, or two in parallel."))
    if r.drainage.installed == "constant-purge":
        if r.purge is None:
            out.append(Finding(
                "purge-size-unknown", "info",
                "A constant purge is installed but neither drain.purge_orifice nor drain.purge_rate is "
                "given, so its steam and cost are not worked out."))
    if r.purge is not None and not r.purge.holds_differential:
        out.append(Finding(
            "purge-cannot-hold", "warning",
            f"At the minimum load the coil pressure falls to the back pressure ({p(r.back_pressure)}) or "
            f"below: the purge stops bleeding there and cannot hold a differential on its own. Lower the "
            f"back pressure, or drain with a vacuum breaker or pump-trap as required."))
    fl = r.flash
    if fl is not None:
        if fl.velocity is not None and fl.velocity > VELOCITY_LIMIT:
            out.append(Finding(
                "return-velocity-high", "warning",
                f"Flash steam ({fl.fraction:.1%} of the condensate at full load) moves at "
                f"{q.show(fl.velocity, 'velocity', system)} in the {q.show(fl.line_diameter, 'diameter', system)} "
                f"return line, above about {q.show_about(VELOCITY_LIMIT, 'velocity', system)} (common practice): it can "
                f"drive condensate waves into slugs that hammer. Enlarge the line or flash the condensate "
                f"in a vented receiver first."))
        if (fl.return_temperature is not None and fl.fraction > 0
                and fl.return_temperature < fl.return_saturation_temperature - 5.0):
            out.append(Finding(
                "flash-into-cool-return", "warning",
                f"The trap discharges hot condensate that flashes ({fl.fraction:.1%} at full load) into a return "
                f"at {q.show(fl.return_temperature, 'temperature', system)}, below its saturation "
                f"{q.show(fl.return_saturation_temperature, 'temperature', system)}: steam bubbles collapse in "
                f"the cooler water and hammer. Discharge along the direction of flow through a sparging "
                f"fitting, or into a vented receiver."))
    return out


def _freeze_exposure(unit: Unit, r: Result) -> str | None:
    """The freeze-risk message where the coil stalls with entering air below freezing."""
    s = r.stall
    system = r.system
    if r.varies == "inlet-temperature":
        if s.inlet_temperature is None or s.inlet_temperature >= FREEZING - _AT:
            return None
        span = (f"from {q.show(s.inlet_temperature, 'temperature', system)} up to "
                f"{q.show(FREEZING, 'temperature', system)}")
    else:
        if unit.design.inlet_temperature >= FREEZING - _AT:
            return None
        span = f"at {q.show(unit.design.inlet_temperature, 'temperature', system)}"
    hours = ""
    if unit.load.bins and r.varies == "inlet-temperature":
        at_risk = sum(b.hours for b in unit.load.bins
                      if b.inlet_temperature is not None and s.inlet_temperature <= b.inlet_temperature < FREEZING - _AT)
        hours = f" The load bins put {at_risk:,.0f} h a year in that band."
    lead = (f"The coil stalls while the entering air is below freezing ({span}): condensate held in "
            f"the tubes can freeze and split them.{hours} ")
    if r.drainage.adequate:
        return lead + (f"The installed {r.drainage.installed} drains it; test it before each winter, and keep "
                       f"a low-limit (freezestat) on the leaving air.")
    return lead + ("Drain it so it cannot hold water at any load (a pump-trap, or a vacuum breaker "
                   "where gravity suffices), and consider a preheat coil or face-and-bypass control "
                   "with the steam valve held open.")
