"""The ``diagnose`` report for people, and its JSON: the words of every fact and cause
(what it means, how to confirm it, the remedy), filled from the check."""

from __future__ import annotations

from dataclasses import dataclass

from stallcheck.analysis.diagnosis import Diagnosis
from stallcheck.files import display
from stallcheck.render import advice, words
from stallcheck.render import json as json_out
from stallcheck.render.page import BLANK, Para, bullets, runs
from stallcheck.render.page import heading as _heading
from stallcheck.render.page import para as _para
from stallcheck.render.terminal import heading
from stallcheck.render.words import FIT
from stallcheck.result import Result

#: The caution every remedy of work on a steam system carries.
WORK_CAUTION = ("Make the system safe first (isolate, drain and cool it) and follow local codes, the "
                "equipment makers' data and licensed practice.")

#: Each cause in words: (title, how to confirm it, remedy). A remedy's placeholders
#: are filled from the check (:func:`drain_context`), and every remedy ends with
#: :data:`WORK_CAUTION`.
CAUSE_WORDS = {
    "stall": (
        "The coil stalls: its pressure falls to the back pressure and condensate backs up",
        ("Read the coil gauge and the return gauge together at low load: the coil at or below the "
         "return pressure plus the lift head confirms it."),
        "{drain_advice}",
    ),
    "tube-fill-pattern": (
        "Tubes fill from both ends and shut in steam pockets",
        ("At low load, feel or thermograph the tubes along the coil: hot middle tubes with cold outer "
         "tubes show steam arriving from both ends."),
        ("Hold a positive differential at every load (a constant purge) so tubes fill from the supply "
         "end; or an end-fed coil, or one with steam-distributing tubes."),
    ),
    "group-trapping": (
        "Several coils on one trap short-circuit",
        ("Shut one coil at a time and watch the others' outlet temperatures and the trap: a coil fed "
         "backwards from its return side runs cold at its outlet."),
        "Give each coil its own trap (and vacuum breaker or pump-trap as required).",
    ),
    "unvented-drop": (
        "A condensate slug seals the drop to the trap",
        ("Listen at the drop and the trap while the load falls; a contact thermometer on the drop "
         "shows cold water standing in it."),
        "Vent the drop back to the coil's steam side above the water line.",
    ),
    "undripped-valve": (
        "Condensate pooled ahead of the valve is driven through as a slug",
        ("Listen just upstream of the valve as it opens after standing shut; look for a low point in "
         "the supply without a drip trap."),
        "Fit a drip leg with its own trap just upstream of the control valve.",
    ),
    "trap-blowing-steam": (
        "A trap failed open blows live steam into the return",
        ("Test the trap (ultrasonic, or temperatures either side): live steam at the outlet means it "
         "has failed open; bubbles collapsing in a cool return hammer continuously."),
        ("Repair or replace the trap; where it discharges into a cool or pumped return, do so along "
         "the direction of flow through a sparging fitting."),
    ),
    "trap-flooding": (
        "The trap is too small for the condensate at the differential it has",
        ("With the coil pressure well above the back pressure, a cold trap outlet means the trap is "
         "blocked, failed shut or too small; compare its rated hot-condensate capacity at this "
         "differential with the condensate."),
        ("Clean or replace the trap; select it on hot-condensate capacity with the usual margin at its"
         " working differential (see the trap figures)."),
    ),
    "valve-hunting": (
        "The valve is too large to control at low load and hunts",
        ("Watch the valve stem and the coil gauge at low load: a regular open-shut cycle with the "
         "pressure swinging is hunting."),
        "A smaller valve, or two valves in sequence (1/3 and 2/3); retune the control loop.",
    ),
    "freeze-damage": (
        "Condensate held in the coil can freeze and split the tubes",
        ("Check the leaving-air low-limit and the condensate outlet temperature; look for split tubes "
         "or leaks at the return header."),
        ("{freeze_advice} Keep a low-limit on the leaving air; in freezing air, consider holding the steam "
         "valve open and controlling the leaving air with face-and-bypass dampers (common practice)."),
    ),
    "vacuum-breaker-stuck": (
        "The vacuum breaker is stuck shut, or fitted where it cannot let air in",
        ("With the coil gauge reading a vacuum, listen and feel at the vacuum breaker: it should be "
         "drawing air in. One that stays shut is stuck or fouled, or fitted on the trap outlet or "
         "below the water line instead of on the coil side above its condensate outlet."),
        ("Free, clean or replace the vacuum breaker, fitted on the coil side above the condensate "
         "outlet; then read the coil gauge at low load again: it should no longer hold a vacuum."),
    ),
    "vacuum-breaker-cannot-act": (
        ("The vacuum breaker cannot drain this coil: gravity has too little differential against the "
         "back pressure"),
        ("Read the coil gauge and the return gauge together at low load: with the breaker open the "
         "coil sits at atmospheric pressure, and where the return pressure plus the lift head, less "
         "the fill head, is not well below that, the condensate cannot leave by gravity."),
        ("Fit {required_words} as the check requires: a vacuum breaker alone cannot drain against this"
         " back pressure (see the check's drainage section)."),
    ),
    "pump-trap-not-pumping": (
        ("The pump-trap is not moving the condensate: motive steam off or too low, a stuck check "
         "valve, or more condensate than it is rated for"),
        ("Check that the motive steam valve is open and its gauge reads well above the back pressure; "
         "listen for the pump's cycle (a regular exhaust at load). A body that stays full without "
         "cycling, or cycles without discharging, points to the inlet or outlet check valve: test "
         "each. Compare its rated capacity at this back pressure with the condensate (the check's "
         "pump-trap figures)."),
        ("Test the installed pump-trap first; then restore the motive steam, free or replace a stuck "
         "check valve, or select one rated for the condensate at this back pressure."),
    ),
    "trap-failed-closed": (
        "The trap has failed shut, or its strainer is blocked",
        ("With the coil gauge above the back pressure the trap should discharge: a cold trap with a "
         "cold pipe ahead of it means it is not opening. Test it (ultrasonic, or temperatures either "
         "side), then isolate it and look at the strainer and the trap's internals."),
        "Clean the strainer, or repair or replace the trap {trap_replacement}.",
    ),
    "return-line-slugging": (
        "Flash steam drives condensate as slugs along the line from the trap (differential shock)",
        ("Listen along the line from the trap at high load: banging that travels along the line, "
         "loudest at bends, risers and the receiver, not at the coil, is slug flow."),
        ("Enlarge the line to the bore the check gives (its return-line section), pitch it down with "
         "the flow, or flash the condensate in a vented receiver next to the trap."),
    ),
    "check-valve-slam": (
        "The pump-trap's check valve slams as each discharge stroke ends (hydraulic shock)",
        ("Listen at the check valve on the pump-trap's discharge as each pumping stroke ends: one sharp "
         "knock a stroke is a slam."),
        ("Fit a non-slam (spring-loaded, centre-guided) check valve, or slow the closure (the check's "
         "surge figure gives a closing time where the line's rating and length are known)."),
    ),
    "lift-column-shock": (
        "The trap shuts on the condensate rising in the lift after it (hydraulic shock)",
        ("Listen at the trap and the foot of the lift as the load falls: a sharp knock as the trap "
         "shuts is the column stopping; crackling up the riser is flash steam collapsing."),
        ("Do not lift straight after the trap of a modulating coil: drain by gravity to a vented "
         "receiver and pump from there, or fit a non-slam check valve after the trap."),
    ),
    "flash-into-cool-return": (
        "Flash steam collapses in a cool return and hammers",
        ("Feel or measure the return at the trap's connection: a return well below boiling with hot "
         "condensate entering it crackles and knocks at the joint."),
        "Discharge along the direction of flow through a sparging fitting, or into a vented receiver.",
    ),
}

#: What each fact means, in words, for the evidence lists.
FACT_WORDS = {
    "stalled_model": "by the model the coil is stalled at this load",
    "stalled_gauges": "the gauges put the coil at or below the back pressure on the trap",
    "stalls_in_range": "the unit stalls within its operating range",
    "near_stall": "the present load is at or just above the stall point",
    "noise_startup": "it bangs at start-up",
    "noise_low_load": "it bangs at low load",
    "noise_mild_weather": "it bangs in mild weather",
    "noise_valve_opens": "it bangs when the valve opens",
    "noise_all_the_time": "it bangs all the time",
    "trap_cold": "the trap outlet is cold",
    "trap_hot": "the trap outlet is hot and passing",
    "trap_blowing": "the trap outlet blows live steam",
    "reading_high": "the coil gauge reads well above what the model needs for this load",
    "reading_low": "the coil gauge reads well below what the model needs for this load",
    "outlet_low": "the leaving temperature is below the set point",
    "centre_fed": "the supply header is fed at its centre, without distributing tubes",
    "group_trapped": "several coils drain through one trap",
    "drop_unvented": "a long drop to the trap is not back-vented",
    "no_drip": "no drip leg ahead of the control valve",
    "not_pitched": "horizontal tubes not pitched to the return",
    "lift_after_trap": "condensate is lifted after the trap",
    "trap_short_now": "at this load the trap cannot pass the condensate at the differential it has",
    "trap_undersized": "the trap is below the usual selection margin",
    "poor_trap_type": "the trap type does poorly at low or swinging differential",
    "valve_cycling": "the present load is below what the valve can control",
    "valve_oversized": "the valve is oversized (under half open at design)",
    "freezing_air": "the entering air is below freezing",
    "cool_return": "the trap discharges into a return running below boiling",
    "breaker_holding_vacuum": "a vacuum breaker is fitted, yet the coil gauge reads a vacuum",
    "breaker_cannot_act": ("a vacuum breaker is fitted where gravity has too little differential for it to drain the "
     "coil (the check requires a pump-trap)"),
    "pump_flooding": "a pump-trap is fitted, yet the coil floods (the gauges, a cold trap or a low outlet say so)",
    "pump_motive_low": "the pump-trap's motive pressure is not well above the back pressure",
    "pump_short": "the condensate at the stall point is more than the pump-trap is rated for",
    "trap_cold_with_differential": "the trap outlet is cold although the coil gauge is above the back pressure",
    "trap_over_rating": "the trap is rated for less differential than it can see (drain.trap_max_differential)",
    "drainage_covers_stall": ("the installed drainage is the one the check requires for its stall, so a stall floods the "
     "coil only where that equipment fails"),
    "return_slugging": "by the flow-pattern map the line from the trap runs in slug flow (see the return line)",
    "pump_surge_near_rating": ("the computed surge where the check valve stops the pump-trap's discharge is near or "
     "past the line's rating (see the surge)"),
    "pump_surge_large": ("the computed surge where the check valve stops the pump-trap's discharge is large for "
     "condensate piping (over about 150 psi; no rating was given to compare it with)"),
    "lift_surge_near_rating": ("the computed surge where the trap shuts on the column in the lift is near or past "
     "the line's rating (see the surge)"),
    "lift_surge_large": ("the computed surge where the trap shuts on the column in the lift is large for "
     "condensate piping (over about 150 psi; no rating was given to compare it with)"),
}


def drain_context(r: Result) -> dict:
    """The words the remedies fill in from the check: never prescribe what is fitted."""
    drainage = r.drainage
    required = FIT[drainage.required]
    if drainage.adequate and drainage.required != "trap":
        drain = (f"The installed {drainage.installed} should drain it at this load: test it before adding anything "
                 f"(see the causes on the installed equipment below, if listed).")
        freeze = f"Test the installed {drainage.installed} before each winter: it must drain the coil at every load."
    elif drainage.adequate:
        drain = ("By the check a trap alone drains it wherever it runs: test the trap and compare the gauges "
                 "with the check's figures (a return or lift higher than the unit file says would explain it).")
        freeze = "Test the trap before each winter, so the coil cannot hold water at any load."
    else:
        # the single changes only where the check lists one that works (one story with 'what to do')
        changes = advice.advise(r, r.system).changes
        drain = (f"Fit {required} as the check requires (the installed {drainage.installed} cannot drain it)"
                 + (", or make one of the changes under 'what to do'." if changes else
                    "; by the check no single change lets the installed drainage do it."))
        freeze = f"Drain the coil so it cannot hold water at any load: fit {required} as the check requires."
    # a trap rated for less differential than it sees is replaced by one that is rated for it
    over = any(f.code == "trap-differential-over-rating" for f in r.findings)
    replacement = ("with one rated for the differential it can see (the check's trap-differential-over-rating)"
                   if over else "with one of the same rating")
    return {"drain_advice": drain, "freeze_advice": freeze, "required_words": required,
            "trap_replacement": replacement}


@dataclass(frozen=True)
class Said:
    """A ranked cause in words."""

    code: str
    title: str
    score: int
    evidence: tuple[str, ...]
    against: tuple[str, ...]
    confirm: str
    remedy: str


def said(d: Diagnosis) -> list[Said]:
    """Every ranked cause of a diagnosis in words, best first."""
    context = drain_context(d.result)
    out = []
    for c in d.causes:
        title, confirm, remedy = CAUSE_WORDS[c.code]
        out.append(Said(c.code, title, c.score, tuple(FACT_WORDS[f] for f in c.evidence),
                        tuple(FACT_WORDS[f] for f in c.against), confirm,
                        f"{remedy.format(**context)} {WORK_CAUTION}"))
    return out


AGREEMENT = {
    "agree": "the coil gauge agrees with what the model needs for this load",
    "high": ("the coil gauge reads well above what the model needs for this load: a fouled coil, a coil part "
             "full of condensate, or a set point higher than the file's"),
    "low": ("the coil gauge reads well below what the model needs for this load: the coil is not making its "
            "set point (a valve that cannot open, a low supply) or the load is lower than given"),
}


def report(d: Diagnosis, system: str, width: int = 80) -> list:
    """Everything ``diagnose`` prints, in reading order: the page's blocks
    (:func:`stallcheck.render.page.emit`) for ``width`` columns."""
    r = d.result
    rd = d.readings
    atm = r.atmospheric_pressure

    def p(pa):
        return display.show(pa, "pressure", system, atm)

    def t(k):
        return display.show(k, "temperature", system)

    parts: list = heading(r, f"{r.source}: diagnosis from readings in service", width=width)

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
    for i, c in enumerate(said(d), start=1):
        parts.append(Para(runs((c.title, "bold"), (f"  ({c.code}, score {c.score})", "dim")), 5,
                          runs((f"{i}.".rjust(4), "bold"), " ")))
        rows = [("evidence", "; ".join(c.evidence), None)]
        if c.against:
            rows.append(("against", "; ".join(c.against), "dim"))
        rows += [("confirm", c.confirm, None), ("remedy", c.remedy, None)]
        parts += [Para(((text, style),), 12, runs(f"  {label}".ljust(12))) for label, text, style in rows]
        parts.append(BLANK)
    parts += [_heading("Caution"), *bullets(words.cautions(r.cautions))]
    return parts


def to_dict(d: Diagnosis) -> dict:
    """The diagnosis as JSON-ready data (SI: kPa absolute, °C)."""
    rd = d.readings
    return {
        "format": 1,
        "unit": d.result.name,
        "readings": {
            "coil_pressure_kpa": display.kpa(rd.coil_pressure),
            "return_pressure_kpa": display.kpa(rd.return_pressure),
            "load_fraction": rd.load,
            "inlet_temperature_c": display.celsius(rd.inlet_temperature),
            "outlet_temperature_c": display.celsius(rd.outlet_temperature),
            "noise": list(rd.noise),
            "trap_outlet": rd.trap_outlet,
        },
        "operating_point": {
            "load_fraction": d.load,
            "load_basis": d.load_basis or None,
            "model_coil_pressure_kpa": display.kpa(d.model_coil_pressure),
            "back_pressure_kpa": display.kpa(d.back_pressure),
            "stalled_model": d.stalled_model,
            "stalled_gauges": d.stalled_gauges,
            "agreement": d.agreement or None,
        },
        "facts": {k: bool(v) for k, v in d.facts.items()},
        "causes": [{"code": c.code, "title": c.title, "score": c.score, "evidence": list(c.evidence),
                    "against": list(c.against), "confirm": c.confirm, "remedy": c.remedy} for c in said(d)],
        "check": json_out.to_dict(d.result),
        "cautions": words.cautions(d.result.cautions),
        "exit_status": d.exit_status,
    }


def dumps(d: Diagnosis) -> str:
    return json_out.text(to_dict(d), indent=2)
