"""The ``diagnose`` report for people, and its JSON."""

from __future__ import annotations

import json

from stallcheck.analysis.diagnosis import Diagnosis
from stallcheck.files import quantities as q
from stallcheck.render import json as json_out
from stallcheck.render.page import BLANK, Para, bullets, runs
from stallcheck.render.page import heading as _heading
from stallcheck.render.page import para as _para
from stallcheck.render.terminal import heading

AGREEMENT = {
    "agree": "the coil gauge agrees with what the model needs for this load",
    "high": ("the coil gauge reads well above what the model needs for this load: a fouled coil, a coil part "
             "full of condensate, or a set point higher than the file's"),
    "low": ("the coil gauge reads well below what the model needs for this load: the coil is not making its "
            "set point (a valve that cannot open, a low supply) or the load is lower than given"),
}


def report(d: Diagnosis, system: str) -> list:
    """Everything ``diagnose`` prints, in reading order: the page's blocks
    (:func:`stallcheck.render.page.emit`)."""
    r = d.result
    rd = d.readings
    atm = r.atmospheric_pressure

    def p(pa):
        return q.show(pa, "pressure", system, atm)

    def t(k):
        return q.show(k, "temperature", system)

    parts: list = heading(r, f"{r.source}: diagnosis from readings in service")

    read = []
    if rd.coil_pressure is not None:
        read.append(f"coil pressure {p(rd.coil_pressure)}")
    if rd.return_pressure is not None:
        read.append(f"return pressure {p(rd.return_pressure)}")
    if rd.load is not None:
        read.append(f"load {rd.load:.0%}")
    if rd.inlet_temperature is not None:
        read.append(f"entering {t(rd.inlet_temperature)}")
    if rd.outlet_temperature is not None:
        read.append(f"leaving {t(rd.outlet_temperature)} (set point {t(d.set_point)})")
    if rd.noise:
        read.append("bangs: " + ", ".join(rd.noise))
    if rd.trap_outlet:
        read.append(f"trap outlet: {rd.trap_outlet}")
    parts += [_heading("Readings"), *bullets(read or ["none given"]), BLANK]

    parts.append(_heading("Operating point"))
    if d.load is None:
        parts.append(_para("not known: give the load, the entering temperature or the coil pressure"))
    else:
        basis = {"given": "as given", "inlet temperature": "from the entering temperature",
                 "coil pressure": "from the coil gauge, through the model"}[d.load_basis]
        parts.append(_para(f"load {d.load:.0%} ({basis}); the coil needs {p(d.model_coil_pressure)} there; back "
                           f"pressure on the trap {p(d.back_pressure)}"))
    if d.stalled_model is not None:
        parts.append(_para("stalled now by the model: " + ("YES" if d.stalled_model else "no"),
                           style="bold red" if d.stalled_model else "green"))
    if d.stalled_gauges is not None:
        parts.append(_para("stalled now by the gauges: " + ("YES" if d.stalled_gauges else "no"),
                           style="bold red" if d.stalled_gauges else "green"))
    if d.agreement:
        parts.append(_para(AGREEMENT[d.agreement]))
    parts.append(BLANK)

    parts.append(_heading("Likely causes, most likely first"))
    if not d.causes:
        parts.append(_para("none stands out from these readings; give the symptoms (--noise, --trap-outlet) "
                           "and the gauges"))
    for i, c in enumerate(d.causes, start=1):
        parts.append(Para(runs((c.title, "bold"), (f"  ({c.code}, score {c.score})", "dim")), 5,
                          runs((f"{i}.".rjust(4), "bold"), " ")))
        rows = [("evidence", "; ".join(c.evidence), None)]
        if c.against:
            rows.append(("against", "; ".join(c.against), "dim"))
        rows += [("confirm", c.confirm, None), ("remedy", c.remedy, None)]
        parts += [Para(((text, style),), 12, runs(f"  {label}".ljust(12))) for label, text, style in rows]
        parts.append(BLANK)
    parts += [_heading("Caution"), *bullets(r.cautions)]
    return parts


def to_dict(d: Diagnosis) -> dict:
    """The diagnosis as JSON-ready data (SI: kPa absolute, °C)."""
    rd = d.readings
    return {
        "format": 1,
        "unit": d.result.unit,
        "readings": {
            "coil_pressure_kpa": q.kpa(rd.coil_pressure),
            "return_pressure_kpa": q.kpa(rd.return_pressure),
            "load_fraction": rd.load,
            "inlet_temperature_c": q.celsius(rd.inlet_temperature),
            "outlet_temperature_c": q.celsius(rd.outlet_temperature),
            "noise": list(rd.noise),
            "trap_outlet": rd.trap_outlet,
        },
        "operating_point": {
            "load_fraction": d.load,
            "load_basis": d.load_basis or None,
            "model_coil_pressure_kpa": q.kpa(d.model_coil_pressure),
            "back_pressure_kpa": q.kpa(d.back_pressure),
            "stalled_model": d.stalled_model,
            "stalled_gauges": d.stalled_gauges,
            "agreement": d.agreement or None,
        },
        "facts": {k: bool(v) for k, v in d.facts.items()},
        "causes": [{"code": c.code, "title": c.title, "score": c.score, "evidence": list(c.evidence),
                    "against": list(c.against), "confirm": c.confirm, "remedy": c.remedy} for c in d.causes],
        "check": json_out.to_dict(d.result),
        "cautions": list(d.result.cautions),
        "exit_status": d.exit_status,
    }


def dumps(d: Diagnosis) -> str:
    return json.dumps(to_dict(d), indent=2, ensure_ascii=False)
