"""Findings from the computed operating state: each a code, a severity, and the SI
facts its message quotes (what is wrong, why it matters and what to do): the words
are made in :mod:`stallcheck.render.words`, one template per code.

Codes are stable (scripts filter on them); the README lists them with their sources.
"""

from __future__ import annotations

from stallcheck.analysis import layout, remedies
from stallcheck.inputs import Unit
from stallcheck.physics import atmosphere
from stallcheck.physics import coil as coilmod
from stallcheck.physics.constants import FREEZING, VELOCITY_LIMIT
from stallcheck.analysis.devices import MOTIVE_MARGIN, RATING_SHARE
from stallcheck.result import Finding, Result

#: Temperatures this close to freezing count as at it, not below [K]: the same unit
#: written in °F and in °C differs by rounding in the last digits.
_AT = 1e-6
#: Trap types that do poorly on modulating service at low or fluctuating differential
#: (common practice; VA HVAC Design Manual asks for float-and-thermostatic traps there).
POOR_AT_LOW_DIFFERENTIAL = frozenset({"thermodynamic", "thermostatic", "bimetallic", "inverted-bucket"})


#: A return line pitched less than this in the direction of flow is flatter than common
#: practice (1 in in 40 ft, about 0.2 %; from memory) [-].
LEAST_PITCH = 1.0 / 480.0
#: Flash meeting condensate more than this below its saturation temperature collapses
#: (condensation-induced hammer) [K] (5 K; common practice, from memory).
SUBCOOLING = 5.0

#: A working differential below this is low for traps that need one to operate [Pa]
#: (1 psi; common practice, from memory).
LOW_DIFFERENTIAL = 6894.757
#: A trap falling short this many points of load above the stall point (or the
#: minimum load) is reported [-]: every trap falls short just above the stall, where
#: its differential goes to zero; two points is past the resolution of a load schedule
#: (a judgement of ours, not a published figure).
SHORT_BEFORE_STALL = 0.02
#: A control valve less open than this at design is oversized: it works near its seat
#: at part load, where it hunts [-] (common practice, from memory: select for about
#: 60-90 % open at design, and no less than half).
VALVE_LEAST_OPENING = 0.5
#: The load below which a valve cannot modulate is a warning above this, whatever the
#: unit's minimum load: below about a tenth of design it cycles for many hours a year
#: [-] (common practice, from memory: a single valve is expected to control down to
#: about 10 % load; below that, two valves in sequence).
CONTROL_FLOOR = 0.10
#: A weather station this far above or below the site's stated elevation (or, with none
#: stated, sea level) is reported [m]: 50 m moves the standard atmosphere by about
#: 0.6 kPa (0.09 psi, ISO 2533), as much as a low-pressure gauge's smallest division
#: (1/10 psi; common practice).
ELEVATION_AGREEMENT = 50.0


def core(unit: Unit, r: Result) -> tuple[Finding, ...]:
    """The findings of the core analysis, worst first.

    Parameters
    ----------
    unit : Unit
    r : Result
        The analysed result (its ``findings`` are ignored).
    """
    out: list[Finding] = []
    s = r.stall
    in_range = s.in_range
    floods = s.floods_in_range
    if s.occurs and s.load_fraction >= 1.0:
        handled = r.drainage.adequate   # a pump-trap installed: the finding says so, and is no danger
        out.append(Finding("stall-at-full-load", "info" if handled else "danger", ("", "handled" if handled else "fit"),
                           {"back": r.back_pressure, "design": r.design.coil_pressure,
                            "installed": r.drainage.installed}))
    elif in_range:
        handled = r.drainage.adequate
        parts = ("", "inlet", "why") if s.inlet_temperature is not None else ("", "why")
        out.append(Finding("stall-in-operating-range", "info" if handled else "warning",
                           parts + ("handled" if handled else "drain",),
                           {"load": s.load_fraction, "inlet": s.inlet_temperature, "coil": s.coil_pressure,
                            "condensate": s.condensate, "installed": r.drainage.installed,
                            "required": r.drainage.required}))
    if not r.drainage.adequate:
        out.append(Finding("drainage-inadequate", "danger" if s.load_fraction and s.load_fraction >= 1 else "warning",
                           ("",), {"installed": r.drainage.installed, "required": r.drainage.required}))
    if floods and r.medium == "air":
        freezing = _freeze_exposure(unit, r)
        if freezing:
            out.append(freezing)
    if floods and unit.drain.lift > 0 and unit.drain.arrangement != "pump-trap":
        out.append(Finding("lift-after-trap", "warning", ("",), {"lift": unit.drain.lift}))
    low_working = r.trap is not None and r.trap.working_differential < LOW_DIFFERENTIAL
    if (floods or low_working) and unit.drain.trap in POOR_AT_LOW_DIFFERENTIAL:
        out.append(Finding("trap-type-modulating", "warning", ("" if floods else "low", "why"),
                           {"working": r.trap.working_differential if r.trap is not None else None,
                            "trap": unit.drain.trap}))
    v = r.valve
    if v is not None:
        if not v.capacity_ok:
            facts = {"required_cv": v.required_cv_design, "cv": v.cv, "limited_pressure": v.limited_coil_pressure,
                     "limited_load": v.limited_load_fraction}
            parts: tuple[str, ...] = ("",)
            if s.valve_load_fraction is not None:
                # the one sentence of a valve that floods the coil, and the valve that stops it
                parts = ("", "floods", "fix" if v.drain_cv is not None else "no-fix")
                facts.update(stall_pressure=s.threshold_pressure, from_load=s.valve_load_fraction,
                             drain_cv=v.drain_cv, fit_cv=max(v.drain_cv or 0.0, v.required_cv_design),
                             margin=remedies.MARGIN)
            else:
                parts = ("", "fit")
            out.append(Finding("valve-too-small", "danger" if parts[1] == "floods" and not r.drainage.adequate
                               else "warning", parts, facts))
        elif v.opening_design < VALVE_LEAST_OPENING:
            out.append(Finding("valve-oversized", "info", ("",),
                               {"opening": v.opening_design, "required_cv": v.required_cv_design, "cv": v.cv}))
        floor = max(r.minimum_load, CONTROL_FLOOR)
        facts = {"load": v.min_controllable_load, "smallest_cv": v.cv / v.rangeability}
        if v.min_controllable_load > floor:
            out.append(Finding("valve-low-load-control", "warning", ("",), facts))
        elif v.min_controllable_load > r.minimum_load:
            out.append(Finding("valve-low-load-control", "info", ("minor",), facts))
    if r.set_point_floor_load > 0:
        out.append(Finding("method-below-set-point", "info", ("",),
                           {"load": r.set_point_floor_load, "set_point": unit.design.outlet_temperature}))
    out.extend(_devices(r))
    out.extend(_return_line(unit, r))
    out.extend(layout.rules(unit, r))
    out.extend(_climate(unit, r))
    order = {"danger": 0, "warning": 1, "info": 2}
    return tuple(sorted(out, key=lambda f: order[f.severity]))


def _devices(r: Result) -> list[Finding]:
    """Findings on the trap, pump-trap, purge and return line."""
    out: list[Finding] = []
    trap = r.trap
    if trap is not None and trap.basis != "selected":
        # A trap's capacity goes to zero with the differential, so every trap falls short
        # a little above the stall point; report it where that reaches SHORT_BEFORE_STALL.
        if (trap.limit_load is not None
                and trap.limit_load > max(r.minimum_load, r.stall.load_fraction or 0.0) + SHORT_BEFORE_STALL):
            out.append(Finding(
                "trap-capacity-short", "warning", ("", "stall", "fix") if r.stall.occurs else ("", "fix"),
                {"load": trap.limit_load, "differential": trap.limit_differential,
                 "condensate": trap.limit_condensate, "stall": r.stall.load_fraction,
                 "required": trap.required_capacity, "selection": trap.selection_differential}))
        if trap.capacity_ok is False:
            out.append(Finding(
                "trap-undersized", "warning", ("",),
                {"selection": trap.selection_differential, "installed": trap.installed_capacity,
                 "margin": trap.margin, "required": trap.required_capacity}))
    if trap is not None and trap.rated_differential is not None and trap.rated_differential < trap.widest_differential:
        # rated under the most its inlet can see: it stays shut when the valve opens wide,
        # and under its full-load differential, in normal running
        full = trap.rated_differential < trap.design_differential
        out.append(Finding("trap-differential-over-rating", "danger" if full else "warning",
                           ("", "full" if full else "open", "fix"),
                           {"rated": trap.rated_differential, "working": trap.design_differential,
                            "widest": trap.widest_differential}))
    pt = r.pump_trap
    if pt is not None and pt.installed:
        margin = pt.motive_pressure - pt.back_pressure
        if margin < MOTIVE_MARGIN:
            out.append(Finding(
                "pump-trap-motive-low", "danger" if margin <= 0 else "warning",
                ("", "why") if pt.motive_given else ("", "supply", "why"),
                {"motive": pt.motive_pressure, "margin": max(margin, 0.0), "back": pt.back_pressure,
                 "wanted": MOTIVE_MARGIN, "target": pt.back_pressure + MOTIVE_MARGIN}))
        if pt.fill_head < pt.required_fill_head - 1e-9:
            out.append(Finding(
                "pump-trap-fill-head-low", "warning", ("", "maker" if pt.fill_head_given else "practice", "why"),
                {"fill": pt.fill_head, "required": pt.required_fill_head}))
        if pt.outside_table:
            out.append(Finding("pump-trap-outside-table", "warning", ("",), {"back": pt.back_pressure}))
        if pt.capacity is not None and pt.capacity < pt.condensate:
            out.append(Finding(
                "pump-trap-undersized", "warning", ("",),
                {"capacity": pt.capacity, "condensate": pt.condensate, "load": pt.load_fraction}))
    if r.drainage.installed == "constant-purge" and r.purge is None:
        out.append(Finding("purge-size-unknown", "info"))
    if r.purge is not None and not r.purge.holds_differential:
        out.append(Finding("purge-cannot-hold", "warning", ("",), {"back": r.back_pressure}))
    fl = r.flash
    if fl is not None:
        if fl.velocity is not None and fl.velocity > VELOCITY_LIMIT:
            out.append(Finding(
                "return-velocity-high", "warning", ("",),
                {"fraction": fl.return_fraction, "velocity": fl.velocity, "bore": fl.line_diameter,
                 "limit": VELOCITY_LIMIT}))
        if (fl.return_temperature is not None and fl.return_fraction > 0
                and fl.return_temperature < fl.return_saturation_temperature - SUBCOOLING):
            out.append(Finding(
                "flash-into-cool-return", "warning", ("",),
                {"fraction": fl.return_fraction, "return_temperature": fl.return_temperature,
                 "saturation": fl.return_saturation_temperature}))
    return out


def _return_line(unit: Unit, r: Result) -> list[Finding]:
    """Differential shock (slug flow in the line from the trap, and up a lift after a
    plain trap), the line's pitch, and hydraulic shock (a column of condensate
    stopped)."""
    out: list[Finding] = []
    line = r.return_line
    if line is not None and line.riser_slugging:
        where = [p for p in line.points if p.riser_slugging]
        out.append(Finding("lift-slug-flow", "warning", ("",),
                           {"lift": unit.drain.lift, "pattern": where[0].riser, "bore": line.bore,
                            "where": ", ".join(p.where for p in where)}))
    if line is not None:
        if line.slugging:
            where = [p for p in line.points if p.slugging]
            out.append(Finding(
                "return-line-slug-flow", "warning", ("", "size" if line.stratified_bore else "none"),
                {"where": ", ".join(p.where for p in where), "second": where[0].mandhane, "bore": line.bore,
                 "stratified": line.stratified_bore, "size": line.stratified_size}))
        if line.pitch is not None and line.pitch < 0:
            out.append(Finding("return-line-pitch", "warning", ("against",), {"pitch": -line.pitch}))
        elif line.pitch is not None and line.pitch < LEAST_PITCH:
            out.append(Finding("return-line-pitch", "info", ("flat",), {"pitch": line.pitch, "least": LEAST_PITCH}))
    sh = r.surge
    if sh is None:
        return out
    if sh.rating is None:
        severity, level = "info", "unrated"
    elif sh.peak >= sh.rating:
        severity, level = "danger", "over"
    elif sh.peak >= RATING_SHARE * sh.rating:
        severity, level = "warning", "near"
    else:
        return out
    cause, fix, flash = ("pump", "fix-pump", ()) if sh.basis == "pump-trap" else ("column", "fix-column", ("flash",))
    slow = ("slow",) if sh.slow_closing_time is not None else ()
    out.append(Finding("hydraulic-shock", severity, (cause, level, fix, *slow, *flash, "end"),
                       {"surge": sh.surge, "velocity": sh.velocity, "speed": sh.wave_speed, "peak": sh.peak,
                        "rating": sh.rating, "slow": sh.slow_closing_time, "share": RATING_SHARE}))
    return out


def _climate(unit: Unit, r: Result) -> list[Finding]:
    """Findings from the site's weather year: a design warmer than the site's heating
    design condition, and a station whose elevation disagrees with the site's."""
    y = r.year
    if y is None:
        return []
    out: list[Finding] = []
    design = unit.design.inlet_temperature
    if design > y.entering_996 + _AT:
        mixed = unit.load.outdoor_air_minimum < 1.0
        # short of heat in some hour the unit runs: a warning; its season and hours keep
        # it out of the cold hours of this year: information (a colder year may not)
        short = y.above_full > 0
        out.append(Finding("design-warmer-than-site", "warning" if short else "info",
                           ("", "mixed" if mixed else "outdoor", "why" if short else "why-none"),
                           {"design": design, "dry_bulb": y.dry_bulb_996, "entering": y.entering_996,
                            "hours": y.above_full, "file": y.file}))
    if y.station_elevation is not None and not unit.site.pressure_given:
        site = unit.site.elevation
        if abs(y.station_elevation - (site or 0.0)) > ELEVATION_AGREEMENT:
            out.append(Finding("site-elevation-differs", "info", ("", "given" if site is not None else "none", "fix"),
                               {"station": y.station_elevation, "site": site, "name": y.station,
                                "dp": abs(atmosphere.pressure_at(site or 0.0) - atmosphere.pressure_at(y.station_elevation))}))
    return out


def _freeze_exposure(unit: Unit, r: Result) -> Finding | None:
    """The freeze-risk finding where the coil stalls with entering air below freezing."""
    s = r.stall
    facts = {"freezing": FREEZING, "installed": r.drainage.installed}
    if s.valve_load_fraction is not None and unit.design.inlet_temperature < FREEZING - _AT:
        # the valve floods it from a load up to full load: in the coldest air it sees
        facts["inlet"] = unit.design.inlet_temperature
        parts = ["", "design" if r.varies != "inlet-temperature" else "valve", "why"]
        if r.varies == "inlet-temperature":
            upper = min(float(coilmod.inlet_temperature(coilmod.CoilModel(
                unit.design.method, r.varies, unit.design.inlet_temperature, unit.design.outlet_temperature,
                r.design.steam_temperature, unit.design.ua_flow_exponent), s.valve_load_fraction)), FREEZING)
            facts["upper"] = upper
            if r.year is not None:
                parts += _year_hours(r, facts)
            elif unit.load.bins:
                facts["hours"] = sum(b.hours for b in unit.load.bins if b.inlet_temperature is not None
                                     and b.inlet_temperature < upper - _AT)
                parts.append("hours")
        parts.append("drained" if r.drainage.adequate else "drain")
        return Finding("freeze-risk", "danger" if not r.drainage.adequate else "info", tuple(parts), facts)
    if not s.in_range:
        return None
    if r.varies == "inlet-temperature":
        if s.inlet_temperature is None or s.inlet_temperature >= FREEZING - _AT:
            return None
        parts = ["", "span", "why"]
        facts["inlet"] = s.inlet_temperature
    else:
        if unit.design.inlet_temperature >= FREEZING - _AT:
            return None
        parts = ["", "design", "why"]
        facts["inlet"] = unit.design.inlet_temperature
    if r.year is not None:
        parts += _year_hours(r, facts)
    elif unit.load.bins and r.varies == "inlet-temperature":
        facts["hours"] = sum(b.hours for b in unit.load.bins
                             if b.inlet_temperature is not None
                             and s.inlet_temperature <= b.inlet_temperature < FREEZING - _AT)
        parts.append("hours")
    parts.append("drained" if r.drainage.adequate else "drain")
    return Finding("freeze-risk", "danger" if not r.drainage.adequate else "info", tuple(parts), facts)


def _year_hours(r: Result, facts: dict) -> list[str]:
    """The weather year's stalled freezing hours and longest run, into ``facts``."""
    facts.update(hours=r.year.stalled_freezing, run=r.year.longest_freezing_run)
    return ["year"] if r.year.stalled_freezing else ["year-none"]
