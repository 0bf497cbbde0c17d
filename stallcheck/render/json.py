"""The result contract (``--json``): SI throughout, whatever the display units.

Pressures absolute kPa (``_kpa``), temperatures °C (``_c``), flows kg/h (``_kg_h``),
power kW (``_kw``). The keys of ``shared/unit-file.md`` keep their names and meaning;
keys added beyond it are documented in the README.
"""

from __future__ import annotations

import json
import math

from stallcheck import quantities as q
from stallcheck.result import Result


def _clean(value):
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def to_dict(r: Result) -> dict:
    """The result as plain JSON-ready data (the contract)."""
    pts = r.points
    points = []
    for i, f in enumerate(pts.load_fraction):
        point = {
            "load_fraction": float(f),
            "inlet_temperature_c": float(q.celsius(pts.inlet_temperature[i])),
            "coil_pressure_kpa": float(q.kpa(pts.coil_pressure[i])),
            "steam_temperature_c": float(q.celsius(pts.steam_temperature[i])),
            "steam_kg_h": float(q.kg_h(pts.steam_flow[i])),
            "drain_differential_kpa": float(q.kpa(pts.drain_differential[i])),
            "stalled": bool(pts.stalled[i]),
        }
        if pts.valve_opening is not None:
            point["valve_opening"] = _clean(float(pts.valve_opening[i]))
        points.append(point)
    s = r.stall
    v = r.valve
    out = {
        "format": r.format,
        "unit": r.unit,
        "tag": r.tag,
        "source": r.source,
        "method": r.method,
        "load_varies": r.varies,
        "minimum_load_fraction": r.minimum_load,
        "atmospheric_pressure_kpa": q.kpa(r.atmospheric_pressure),
        "return_pressure_kpa": q.kpa(r.return_pressure),
        "back_pressure_kpa": q.kpa(r.back_pressure),
        "fill_head_kpa": q.kpa(r.fill_head_pressure),
        "trap_min_differential_kpa": q.kpa(r.trap_min_differential),
        "supply_pressure_kpa": q.kpa(r.supply_pressure),
        "design": {
            "load_kw": q.kw(r.design.load),
            "steam_kg_h": q.kg_h(r.design.steam_flow),
            "coil_pressure_kpa": q.kpa(r.design.coil_pressure),
            "steam_temperature_c": q.celsius(r.design.steam_temperature),
            "medium_kg_h": q.kg_h(r.design.medium_mass_flow),
        },
        "stall": {
            "occurs": s.occurs,
            "load_fraction": s.load_fraction,
            "coil_pressure_kpa": q.kpa(s.coil_pressure),
            "steam_temperature_c": q.celsius(s.steam_temperature),
            "condensate_kg_h": q.kg_h(s.condensate),
            "inlet_temperature_c": q.celsius(s.inlet_temperature),
            "threshold_pressure_kpa": q.kpa(s.threshold_pressure),
        },
        "stalled_hours": r.stalled_hours,
        "total_hours": r.total_hours,
        "points": points,
        "drainage": {
            "installed": r.drainage.installed,
            "required": r.drainage.required,
            "adequate": r.drainage.adequate,
            "reasons": list(r.drainage.reasons),
        },
        "valve": None if v is None else {
            "cv": v.cv,
            "required_cv_design": v.required_cv_design,
            "opening_design": _clean(v.opening_design),
            "capacity_ok": v.capacity_ok,
            "choked_at_design": v.choked_at_design,
            "limited_load_fraction": v.limited_load_fraction,
            "limited_coil_pressure_kpa": q.kpa(v.limited_coil_pressure),
            "min_controllable_load_fraction": v.min_controllable_load,
            "characteristic": v.characteristic,
            "rangeability": v.rangeability,
        },
        "findings": [{"code": f.code, "severity": f.severity, "message": f.message} for f in r.findings],
        "assumptions": list(r.assumptions),
        "warnings": list(r.warnings),
        "cautions": list(r.cautions),
        "exit_status": r.exit_status,
    }
    return out


def dumps(r: Result) -> str:
    """The contract as indented JSON text."""
    return json.dumps(to_dict(r), indent=2, ensure_ascii=False)
