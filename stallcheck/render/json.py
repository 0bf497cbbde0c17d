"""The result contract (``--json``): SI throughout, whatever the display units.

Pressures absolute kPa (``_kpa``), temperatures °C (``_c``), flows kg/h (``_kg_h``),
power kW (``_kw``). The keys of ``shared/unit-file.md`` keep their names and meaning;
keys added beyond it are documented in the README.
"""

from __future__ import annotations

import json
import math
import re

from stallcheck.analysis.remedies import MARGIN
from stallcheck.files import display
from stallcheck.render import advice, words
from stallcheck.result import Result


def _clean(value):
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


#: Where the contract holds sentences, as (field, key): a field's own key, each item's key
#: of a list field, or a top-level key (field None). ``to_dict(..., sentences=False)``
#: (``survey --json`` without ``--words``) leaves them out, the figures and codes kept.
SENTENCES = (("findings", "message"), ("remedies", "note"), ("drainage", "reasons"), ("advice", "text"),
             (None, "assumptions"), (None, "cautions"))


def to_dict(r: Result, sentences: bool = True) -> dict:
    """The result as plain JSON-ready data (the contract); without ``sentences``, the
    figures and codes only: none of the :data:`SENTENCES`."""
    pts = r.points
    limited = pts.valve_limited if pts is not None else ()
    points = []
    for i, f in enumerate(pts.load_fraction if pts is not None else ()):
        point = {
            "load_fraction": float(f),
            "inlet_temperature_c": float(display.celsius(pts.inlet_temperature[i])),
            "coil_pressure_kpa": float(display.kpa(pts.coil_pressure[i])),
            "steam_temperature_c": float(display.celsius(pts.steam_temperature[i])),
            "steam_kg_h": float(display.kg_h(pts.steam_flow[i])),
            "drain_differential_kpa": float(display.kpa(pts.drain_differential[i])),
            "stalled": bool(pts.stalled[i]),
        }
        if pts.valve_opening is not None:
            point["valve_opening"] = _clean(float(pts.valve_opening[i]))
            point["valve_limited"] = bool(limited[i])
            point["needed_coil_pressure_kpa"] = float(display.kpa(pts.needed_coil_pressure[i]))
        points.append(point)
    s = r.stall
    v = r.valve
    out = {
        "format": r.format,
        "unit": r.name,
        "tag": r.tag,
        "source": r.source,
        "method": r.method,
        "load_varies": r.varies,
        "minimum_load_fraction": r.minimum_load,
        "set_point_floor_load_fraction": r.set_point_floor_load,
        "atmospheric_pressure_kpa": display.kpa(r.atmospheric_pressure),
        "return_pressure_kpa": display.kpa(r.return_pressure),
        "back_pressure_kpa": display.kpa(r.back_pressure),
        "fill_head_kpa": display.kpa(r.fill_head_pressure),
        "trap_min_differential_kpa": display.kpa(r.trap_min_differential),
        "supply_pressure_kpa": display.kpa(r.supply_pressure),
        "design": {
            "load_kw": display.kw(r.design.load),
            "steam_kg_h": display.kg_h(r.design.steam_flow),
            "coil_pressure_kpa": display.kpa(r.design.coil_pressure),
            "steam_temperature_c": display.celsius(r.design.steam_temperature),
            "medium_kg_h": display.kg_h(r.design.medium_mass_flow),
        },
        "stall": {
            "occurs": s.floods,
            "load_fraction": s.load_fraction,
            "coil_pressure_kpa": display.kpa(s.coil_pressure),
            "steam_temperature_c": display.celsius(s.steam_temperature),
            "condensate_kg_h": display.kg_h(s.condensate),
            "inlet_temperature_c": display.celsius(s.inlet_temperature),
            "threshold_pressure_kpa": display.kpa(s.threshold_pressure),
            "in_operating_range": s.floods_in_range,
            "valve_load_fraction": s.valve_load_fraction,
            "valve_coil_pressure_kpa": display.kpa(s.valve_coil_pressure),
            "ranges": [list(pair) for pair in s.ranges],
        },
        "stalled_hours": r.stalled_hours,
        "total_hours": r.total_hours,
        "hours_from": _hours_from(r),
        "weather": _weather(r),
        "points": points,
        "drainage": {
            "installed": r.drainage.installed,
            "required": r.drainage.required,
            "adequate": r.drainage.adequate,
            **({"reasons": list(words.drainage_reasons(r.drainage, r.system, r.atmospheric_pressure))}
               if sentences else {}),
        },
        "valve": None if v is None else {
            "cv": v.cv,
            "required_cv_design": v.required_cv_design,
            "opening_design": _clean(v.opening_design),
            "capacity_ok": v.capacity_ok,
            "choked_at_design": v.choked_at_design,
            "limited_load_fraction": v.limited_load_fraction,
            "limited_coil_pressure_kpa": display.kpa(v.limited_coil_pressure),
            "min_controllable_load_fraction": v.min_controllable_load,
            "characteristic": v.characteristic,
            "rangeability": v.rangeability,
            "drain_cv": v.drain_cv,
        },
        "trap": _trap(r),
        "pump_trap": _pump_trap(r),
        "purge": _purge(r),
        "flash": _flash(r),
        "return_line": _return_line(r),
        "surge": _surge(r),
        "remedies": [{"key": m.key, "status": m.remedy.status, "current_si": m.remedy.current,
                      "value_si": m.remedy.value, "unit_si": _SI_UNIT[m.remedy.kind],
                      "achievable": m.remedy.achievable, **({"note": m.note} if sentences else {})}
                     for m in advice.lines(r, r.system)],
        "advice": _advice(r, sentences),
        "findings": [{"code": f.code, "severity": f.severity,
                      **({"message": words.finding(f, r, r.system)} if sentences else {})} for f in r.findings],
        **({"assumptions": list(words.assumptions(r, r.system))} if sentences else {}),
        "warnings": list(r.warnings),
        **({"cautions": words.cautions(r.cautions)} if sentences else {}),
        "exit_status": r.exit_status,
    }
    return out


#: SI unit of each remedy's value: pressures absolute Pa, differentials Pa, heights m;
#: a valve's flow coefficient as Cv (US gpm at 1 psi; no SI unit).
_SI_UNIT = {"length": "m", "pressure": "Pa", "differential": "Pa", "cv": "Cv"}


def _advice(r: Result, sentences: bool = True):
    a = advice.advise(r, r.system)
    out = {"mode": a.mode, "fit": a.fit, "margin_kpa": display.kpa(MARGIN)}
    if sentences:
        out["text"] = (list(a.lead) + [f"{m.key}: {m.note}" for m in a.changes]
                       + [f"{m.key}: {m.note}" for m in a.cannot] + list(a.notes))
    return out


def _hours_from(r: Result) -> str | None:
    """Where ``stalled_hours`` and ``total_hours`` come from: ``"weather"`` (the weather
    file's operating hours), ``"bins"`` (the load bins), or None (no hours)."""
    if r.year is not None:
        return "weather"
    return "bins" if r.stalled_hours is not None else None


def _weather(r: Result):
    y = r.year
    if y is None:
        return None
    return {
        "file": y.file, "format": y.form, "station": y.station, "station_elevation_m": y.station_elevation,
        "hours_in_file": y.hours, "hours_scheduled": y.scheduled, "hours_no_load": y.no_load,
        "hours_operating": y.operating, "hours_below_minimum_load": y.below_minimum,
        "hours_above_full_load": y.above_full, "hours_stalled": y.stalled,
        "hours_stalled_freezing": y.stalled_freezing, "longest_stalled_freezing_run_h": y.longest_freezing_run,
        "heating_dry_bulb_996_c": display.celsius(y.dry_bulb_996), "heating_dry_bulb_990_c": display.celsius(y.dry_bulb_990),
        "entering_at_996_c": display.celsius(y.entering_996),
        "coldest_entering_c": display.celsius(y.coldest_entering),
        "stated_dry_bulb_996_c": display.celsius(y.stated_996), "stated_dry_bulb_990_c": display.celsius(y.stated_990),
        "load_bands": [{"load_from": lower, "load_to": upper, "hours": hours, "stalled_hours": stalled}
                       for lower, upper, hours, stalled in y.bands],
    }


def _trap(r: Result):
    t = r.trap
    if t is None:
        return None
    return {
        "capacity_basis": t.basis,
        "bore_mm": None if t.bore is None else t.bore * 1000.0,
        "margin": t.margin,
        "design_condensate_kg_h": display.kg_h(t.design_condensate),
        "design_differential_kpa": display.kpa(t.design_differential),
        "working_load_fraction": t.working_load,
        "working_condensate_kg_h": display.kg_h(t.working_condensate),
        "working_differential_kpa": display.kpa(t.working_differential),
        "selection_differential_kpa": display.kpa(t.selection_differential),
        "required_capacity_kg_h": display.kg_h(t.required_capacity),
        "installed_capacity_kg_h": display.kg_h(t.installed_capacity),
        "capacity_ok": t.capacity_ok,
        "widest_differential_kpa": display.kpa(t.widest_differential),
        "rated_differential_kpa": None if t.rated_differential is None else display.kpa(t.rated_differential),
        "drainage_limit": None if t.limit_load is None else {
            "load_fraction": t.limit_load,
            "coil_pressure_kpa": display.kpa(t.limit_coil_pressure),
            "differential_kpa": display.kpa(t.limit_differential),
            "condensate_kg_h": display.kg_h(t.limit_condensate),
            "inlet_temperature_c": display.celsius(t.limit_inlet_temperature),
        },
    }


def _pump_trap(r: Result):
    pt = r.pump_trap
    if pt is None:
        return None
    return {
        "installed": pt.installed,
        "condensate_kg_h": display.kg_h(pt.condensate),
        "load_fraction": pt.load_fraction,
        "back_pressure_kpa": display.kpa(pt.back_pressure),
        "motive_pressure_kpa": display.kpa(pt.motive_pressure),
        "motive_given": pt.motive_given,
        "fill_head_m": pt.fill_head,
        "required_fill_head_m": pt.required_fill_head,
        "capacity_kg_h": display.kg_h(pt.capacity),
        "capacity_basis": pt.capacity_basis or None,
        "outside_table": pt.outside_table,
        "capacity_ok": None if pt.capacity is None else pt.capacity >= pt.condensate,
    }


def _purge(r: Result):
    pu = r.purge
    if pu is None:
        return None
    return {
        "basis": pu.basis,
        "bore_mm": None if pu.bore is None else pu.bore * 1000.0,
        "design_kg_h": display.kg_h(pu.design_rate),
        "minimum_load_kg_h": display.kg_h(pu.minimum_rate),
        "holds_differential": pu.holds_differential,
        "hours": pu.hours,
        "hours_basis": pu.hours_basis or None,
        "yearly_kg": pu.yearly_mass,
        "yearly_cost": pu.yearly_cost,
        "currency": pu.currency,
    }


def _flash(r: Result):
    f = r.flash
    if f is None:
        return None
    return {
        "fraction": f.fraction,
        "outlet_pressure_kpa": display.kpa(f.outlet_pressure),
        "return_fraction": f.return_fraction,
        "kg_h": display.kg_h(f.flow),
        "m3_h": f.volume_flow * 3600.0,
        "return_line_mm": None if f.line_diameter is None else f.line_diameter * 1000.0,
        "velocity_m_s": f.velocity,
        "return_temperature_c": display.celsius(f.return_temperature),
    }


def _return_line(r: Result):
    line = r.return_line
    if line is None:
        return None
    return {
        "bore_mm": line.bore * 1000.0,
        "pitch": line.pitch,
        "points": [{"where": p.where, "load_fraction": p.load_fraction, "condensate_kg_h": display.kg_h(p.condensate),
                    "flash_fraction": p.flash_fraction, "taitel_dukler": p.taitel_dukler, "mandhane": p.mandhane,
                    "slugging": p.slugging, "riser": p.riser, "riser_slugging": p.riser_slugging}
                   for p in line.points],
        "slugging": line.slugging,
        "riser_slugging": line.riser_slugging,
        "stratified_bore_mm": None if line.stratified_bore is None else line.stratified_bore * 1000.0,
        "stratified_size": line.stratified_size,
    }


def _surge(r: Result):
    sh = r.surge
    if sh is None:
        return None
    return {
        "basis": sh.basis,
        "velocity_m_s": sh.velocity,
        "wave_speed_m_s": sh.wave_speed,
        "length_m": sh.length,
        "closing_time_s": sh.closing_time,
        "surge_kpa": sh.surge / 1000.0,
        "peak_kpa": display.kpa(sh.peak),
        "rating_kpa": display.kpa(sh.rating),
        "slow_closing_time_s": sh.slow_closing_time,
    }


def figures(obj, digits: int = 8):
    """``obj`` as a survey's line holds it: every float to ``digits`` significant
    figures (1e-8 of each figure by default, where a float's repr writes 17 digits and a
    gauge reads three), and every field whose value is null left out."""
    if isinstance(obj, float):
        return float(f"{obj:.{digits}g}") if math.isfinite(obj) else None
    if isinstance(obj, dict):
        return {k: figures(v, digits) for k, v in obj.items() if v is not None}
    if isinstance(obj, (list, tuple)):
        return [figures(v, digits) for v in obj]
    return obj


def dumps(r: Result) -> str:
    """The contract as indented JSON text."""
    return text(to_dict(r), indent=2)


#: Characters JSON allows raw in a string that a terminal still acts on: DEL and the C1
#: controls (the C0 controls ``json`` escapes itself).
_RAW_CONTROL = re.compile("[\x7f-\x9f]")


def text(obj, indent: int | None = None, compact: bool = False) -> str:
    """Strict JSON (RFC 8259): never NaN or Infinity (a figure that is not finite is
    written as null, which the contract documents for figures not known), and no raw
    control character, the C1 and DEL escaped as ``\\u00XX`` like the C0. ``compact``:
    no spaces after separators (a survey's lines)."""
    out = json.dumps(_finite(obj), indent=indent, ensure_ascii=False, allow_nan=False,
                     separators=(",", ":") if compact else None)
    return _RAW_CONTROL.sub(lambda m: f"\\u{ord(m.group()):04x}", out)


def _finite(obj):
    """``obj`` with every float that is not finite replaced by None."""
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else None
    if isinstance(obj, dict):
        return {k: _finite(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_finite(v) for v in obj]
    return obj
