"""Diagnosing a unit in service: from gauge readings and symptoms to the operating
point and a ranked list of likely causes.

The rules are data: :data:`FACTS` says in words what each piece of evidence means, and
:data:`CAUSES` gives each cause the weight of every fact for or against it, the one
look or measurement that would confirm it, and the remedy. A cause's score is the sum
of the weights of the facts that hold; causes with no supporting fact are not listed.
The facts come from the readings *and* the computed state of the unit, so the same
symptoms on a different unit rank differently.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from stallcheck import analysis
from stallcheck.analysis import layout
from stallcheck.analysis.findings import POOR_AT_LOW_DIFFERENTIAL
from stallcheck.errors import InputError
from stallcheck.files import quantities as q
from stallcheck.files.readings import Readings
from stallcheck.inputs import Unit
from stallcheck.physics import coil as coilmod
from stallcheck.physics import properties
from stallcheck.physics.constants import GRAVITY
from stallcheck.physics.devices import MOTIVE_MARGIN, TrapCapacity
from stallcheck.render.words import FIT as FIT_WORDS
from stallcheck.result import Result

#: Gauge and model agree within the larger of this [Pa] (about 1.5 psi) ...
AGREE_ABSOLUTE = 10e3
#: ... and this fraction of the model's absolute pressure.
AGREE_RELATIVE = 0.10
#: An outlet this far below the set point is "not made" [K].
OUTLET_SHORTFALL = 3.0
#: The caution every remedy of work on a steam system carries.
WORK_CAUTION = ("Make the system safe first (isolate, drain and cool it) and follow local codes, the "
                "equipment makers' data and licensed practice.")

#: What each fact means, in words, for the evidence lists.
FACTS = {
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
    "breaker_cannot_act": "a vacuum breaker is fitted where gravity has too little differential for it to drain "
                          "the coil (the check requires a pump-trap)",
    "pump_flooding": "a pump-trap is fitted, yet the coil floods (the gauges, a cold trap or a low outlet say so)",
    "pump_motive_low": "the pump-trap's motive pressure is not well above the back pressure",
    "pump_short": "the condensate at the stall point is more than the pump-trap is rated for",
    "trap_cold_with_differential": "the trap outlet is cold although the coil gauge is above the back pressure",
    "drainage_covers_stall": "the installed drainage is the one the check requires for its stall, so a stall "
                             "floods the coil only where that equipment fails",
    "return_slugging": "by the flow-pattern map the line from the trap runs in slug flow (see the return line)",
    "surge_high": "the computed surge, where the column in the line is stopped, is near or past the line's "
                  "rating (see the surge)",
}


@dataclass(frozen=True)
class Cause:
    """One likely cause: its weights on the facts, how to confirm it, and the remedy."""

    code: str
    title: str
    weights: dict
    confirm: str
    remedy: str


#: The rules, in one place. Weights: 3 strong evidence, 2 good, 1 weak, negative against.
CAUSES = (
    Cause("stall", "The coil stalls: its pressure falls to the back pressure and condensate backs up",
          {"stalled_model": 3, "stalled_gauges": 3, "near_stall": 1, "stalls_in_range": 1, "noise_low_load": 2,
           "noise_mild_weather": 2, "trap_cold": 1, "outlet_low": 1, "lift_after_trap": 1,
           "trap_blowing": -3, "noise_all_the_time": -1, "drainage_covers_stall": -5},
          "Read the coil gauge and the return gauge together at low load: the coil at or below the return "
          "pressure plus the lift head confirms it.",
          "{drain_advice}"),
    Cause("tube-fill-pattern", "Tubes fill from both ends and shut in steam pockets",
          {"centre_fed": 3, "noise_low_load": 1, "noise_valve_opens": 1, "noise_startup": 1,
           "stalled_model": 1, "stalls_in_range": 1, "trap_blowing": -2},
          "At low load, feel or thermograph the tubes along the coil: hot middle tubes with cold outer tubes "
          "show steam arriving from both ends.",
          "Hold a positive differential at every load (a constant purge) so tubes fill from the supply end; or "
          "an end-fed coil, or one with steam-distributing tubes."),
    Cause("group-trapping", "Several coils on one trap short-circuit",
          {"group_trapped": 4, "noise_low_load": 1, "stalls_in_range": 1, "outlet_low": 1, "trap_blowing": -2},
          "Shut one coil at a time and watch the others' outlet temperatures and the trap: a coil fed "
          "backwards from its return side runs cold at its outlet.",
          "Give each coil its own trap (and vacuum breaker or pump-trap as required)."),
    Cause("unvented-drop", "A condensate slug seals the drop to the trap",
          {"drop_unvented": 3, "noise_low_load": 1, "noise_startup": 1, "trap_cold": 1, "trap_blowing": -2},
          "Listen at the drop and the trap while the load falls; a contact thermometer on the drop shows "
          "cold water standing in it.",
          "Vent the drop back to the coil's steam side above the water line."),
    Cause("undripped-valve", "Condensate pooled ahead of the valve is driven through as a slug",
          {"no_drip": 3, "noise_valve_opens": 3, "noise_startup": 2, "noise_all_the_time": -1},
          "Listen just upstream of the valve as it opens after standing shut; look for a low point in the "
          "supply without a drip trap.",
          "Fit a drip leg with its own trap just upstream of the control valve."),
    Cause("trap-blowing-steam", "A trap failed open blows live steam into the return",
          {"trap_blowing": 5, "cool_return": 2, "noise_all_the_time": 2, "trap_cold": -3, "stalled_model": -1},
          "Test the trap (ultrasonic, or temperatures either side): live steam at the outlet means it has "
          "failed open; bubbles collapsing in a cool return hammer continuously.",
          "Repair or replace the trap; where it discharges into a cool or pumped return, do so along the "
          "direction of flow through a sparging fitting."),
    Cause("trap-flooding", "The trap is too small for the condensate at the differential it has",
          {"trap_short_now": 3, "trap_undersized": 2, "trap_cold": 2, "reading_high": 2, "outlet_low": 1,
           "poor_trap_type": 1, "noise_all_the_time": 1, "stalled_model": -2, "stalled_gauges": -1,
           "trap_blowing": -3},
          "With the coil pressure well above the back pressure, a cold trap outlet means the trap is blocked, "
          "failed shut or too small; compare its rated hot-condensate capacity at this differential with the "
          "condensate.",
          "Clean or replace the trap; select it on hot-condensate capacity with the usual margin at its "
          "working differential (see the trap figures)."),
    Cause("valve-hunting", "The valve is too large to control at low load and hunts",
          {"valve_cycling": 3, "valve_oversized": 2, "noise_valve_opens": 2, "noise_low_load": 1,
           "noise_mild_weather": 1},
          "Watch the valve stem and the coil gauge at low load: a regular open-shut cycle with the pressure "
          "swinging is hunting.",
          "A smaller valve, or two valves in sequence (1/3 and 2/3); retune the control loop."),
    Cause("freeze-damage", "Condensate held in the coil can freeze and split the tubes",
          {"freezing_air": 2, "stalled_model": 3, "stalled_gauges": 2, "trap_cold": 2, "outlet_low": 1},
          "Check the leaving-air low-limit and the condensate outlet temperature; look for split tubes or "
          "leaks at the return header.",
          "{freeze_advice} Keep a low-limit on the leaving air; consider preheat or face-and-bypass control with "
          "the steam valve held open."),
    Cause("vacuum-breaker-stuck", "The vacuum breaker is stuck shut, or fitted where it cannot let air in",
          {"breaker_holding_vacuum": 6, "stalled_gauges": 2, "trap_cold": 1, "outlet_low": 1, "noise_low_load": 1,
           "noise_mild_weather": 1, "trap_blowing": -3},
          "With the coil gauge reading a vacuum, listen and feel at the vacuum breaker: it should be drawing air "
          "in. One that stays shut is stuck or fouled, or fitted on the trap outlet or below the water line "
          "instead of on the coil side above its condensate outlet.",
          "Free, clean or replace the vacuum breaker, fitted on the coil side above the condensate outlet; then "
          "read the coil gauge at low load again: it should no longer hold a vacuum."),
    Cause("vacuum-breaker-cannot-act", "The vacuum breaker cannot drain this coil: gravity has too little "
                                       "differential against the back pressure",
          {"breaker_cannot_act": 6, "stalled_gauges": 2, "stalled_model": 1, "trap_cold": 1, "noise_low_load": 1,
           "noise_mild_weather": 1, "trap_blowing": -3},
          "Read the coil gauge and the return gauge together at low load: with the breaker open the coil sits at "
          "atmospheric pressure, and where the return pressure plus the lift head, less the fill head, is not "
          "well below that, the condensate cannot leave by gravity.",
          "Fit {required_words} as the check requires: a vacuum breaker alone cannot drain against this back "
          "pressure (see the check's drainage section)."),
    Cause("pump-trap-not-pumping", "The pump-trap is not moving the condensate: motive steam off or too low, a "
                                   "stuck check valve, or more condensate than it is rated for",
          {"pump_flooding": 4, "pump_motive_low": 3, "pump_short": 3, "noise_low_load": 1,
           "noise_all_the_time": 1, "trap_blowing": -3},
          "Check that the motive steam valve is open and its gauge reads well above the back pressure; listen "
          "for the pump's cycle (a regular exhaust at load). A body that stays full without cycling, or cycles "
          "without discharging, points to the inlet or outlet check valve: test each. Compare its rated "
          "capacity at this back pressure with the condensate (the check's pump-trap figures).",
          "Test the installed pump-trap first; then restore the motive steam, free or replace a stuck check "
          "valve, or select one rated for the condensate at this back pressure."),
    Cause("trap-failed-closed", "The trap has failed shut, or its strainer is blocked",
          {"trap_cold_with_differential": 4, "outlet_low": 1, "reading_high": 1, "noise_all_the_time": 1,
           "trap_blowing": -5},
          "With the coil gauge above the back pressure the trap should discharge: a cold trap with a cold pipe "
          "ahead of it means it is not opening. Test it (ultrasonic, or temperatures either side), then isolate "
          "it and look at the strainer and the trap's internals.",
          "Clean the strainer, or repair or replace the trap with one of the same rating."),
)

CAUSES += (
    Cause("return-line-slugging", "Flash steam drives condensate as slugs along the line from the trap "
                                  "(differential shock)",
          {"return_slugging": 4, "noise_all_the_time": 1, "noise_valve_opens": 1, "trap_hot": 1,
           "stalled_model": -1, "trap_cold": -1},
          "Listen along the line from the trap at high load: banging that travels along the line, loudest at "
          "bends, risers and the receiver, not at the coil, is slug flow.",
          "Enlarge the line to the bore the check gives (its return-line section), pitch it down with the "
          "flow, or flash the condensate in a vented receiver next to the trap."),
    Cause("check-valve-slam", "A moving column of condensate is stopped at once: a check valve slamming on the "
                              "discharge, or a column falling back down the lift (hydraulic shock)",
          {"surge_high": 4, "lift_after_trap": 1, "noise_low_load": 1, "noise_all_the_time": 1,
           "trap_blowing": -2},
          "Listen at the check valve on the discharge as each pumping stroke ends, or at the trap as the load "
          "falls: one sharp knock a cycle is a slam.",
          "Fit a non-slam (spring-loaded, centre-guided) check valve, or slow the closure (the check's surge "
          "figure); do not lift straight after the trap of a modulating coil."),
    Cause("flash-into-cool-return", "Flash steam collapses in a cool return and hammers",
          {"cool_return": 4, "noise_all_the_time": 2, "trap_hot": 1, "trap_cold": -2},
          "Feel or measure the return at the trap's connection: a return well below boiling with hot condensate "
          "entering it crackles and knocks at the joint.",
          "Discharge along the direction of flow through a sparging fitting, or into a vented receiver."),
)

#: Facts a cause cannot do without: it is listed only where at least one of these holds
#: (symptoms alone, such as the time it bangs, never make a cause).
REQUIRES = {
    "stall": ("stalled_model", "stalled_gauges", "stalls_in_range", "near_stall"),
    "tube-fill-pattern": ("centre_fed",),
    "group-trapping": ("group_trapped",),
    "unvented-drop": ("drop_unvented",),
    "undripped-valve": ("no_drip",),
    "trap-blowing-steam": ("trap_blowing", "cool_return"),
    "trap-flooding": ("trap_short_now", "trap_undersized", "trap_cold", "reading_high", "outlet_low"),
    "valve-hunting": ("valve_cycling", "valve_oversized"),
    "freeze-damage": ("freezing_air",),
    "vacuum-breaker-stuck": ("breaker_holding_vacuum",),
    "vacuum-breaker-cannot-act": ("breaker_cannot_act",),
    "pump-trap-not-pumping": ("pump_flooding", "pump_motive_low", "pump_short"),
    "return-line-slugging": ("return_slugging",),
    "check-valve-slam": ("surge_high",),
    "flash-into-cool-return": ("cool_return",),
    "trap-failed-closed": ("trap_cold_with_differential",),
}

#: A vacuum breaker lets air in before the coil holds more vacuum than this [Pa]:
#: about 1 inHg (common practice, from memory; breakers open at a fraction of an inch).
BREAKER_VACUUM = 3386.389



def drain_context(r: Result) -> dict:
    """The words the remedies fill in from the check: never prescribe what is fitted."""
    dr = r.drainage
    required = FIT_WORDS[dr.required]
    if dr.adequate and dr.required != "trap":
        drain = (f"The installed {dr.installed} should drain it at this load: test it before adding anything "
                 f"(see the causes on the installed equipment below, if listed).")
        freeze = f"Test the installed {dr.installed} before each winter: it must drain the coil at every load."
    elif dr.adequate:
        drain = ("By the check a trap alone drains it wherever it runs: test the trap and compare the gauges "
                 "with the check's figures (a return or lift higher than the unit file says would explain it).")
        freeze = "Test the trap before each winter, so the coil cannot hold water at any load."
    else:
        drain = (f"Fit {required} as the check requires (the installed {dr.installed} cannot drain it), or make one "
                 f"of the changes under 'what to do'.")
        freeze = f"Drain the coil so it cannot hold water at any load: fit {required} as the check requires."
    return {"drain_advice": drain, "freeze_advice": freeze, "required_words": required}


@dataclass(frozen=True)
class RankedCause:
    """A cause with its score and the evidence for it."""

    code: str
    title: str
    score: int
    evidence: tuple[str, ...]
    against: tuple[str, ...]
    confirm: str
    remedy: str


@dataclass(frozen=True)
class Diagnosis:
    """The operating point the readings imply, and the ranked causes.

    Attributes
    ----------
    readings : Readings
    load : float or None
        Present load fraction. [-]
    load_basis : str
        How the load was found: ``"given"``, ``"inlet temperature"``, ``"coil pressure"``
        or ``""`` (not known).
    model_coil_pressure : float or None
        What the coil needs at that load. [Pa]
    back_pressure : float
        With the return reading where given. [Pa]
    stalled_model, stalled_gauges : bool or None
    agreement : str
        ``"agree"``, ``"high"``, ``"low"`` or ``""`` (not compared).
    facts : dict
        Every fact and whether it holds.
    causes : tuple of RankedCause
        Best first.
    result : Result
        The unit's ``check`` result.
    set_point : float
        The unit's controlled leaving temperature. [K]
    """

    readings: Readings
    load: float | None
    load_basis: str
    model_coil_pressure: float | None
    back_pressure: float
    stalled_model: bool | None
    stalled_gauges: bool | None
    agreement: str
    facts: dict
    causes: tuple[RankedCause, ...]
    result: Result
    set_point: float = 0.0

    @property
    def exit_status(self) -> int:
        """As for ``check``, and 1 where the unit is stalled now."""
        return max(self.result.exit_status, 1 if (self.stalled_model or self.stalled_gauges) else 0)


def diagnose(unit: Unit, result: Result, readings: Readings) -> Diagnosis:
    """Work out the operating point and rank the causes.

    Raises
    ------
    InputError
        Where the readings cannot be: an outlet at or above the steam temperature.
    """
    r = result
    dr = unit.drain
    coil = analysis.coil_of(unit.with_method(r.method), r.design.steam_temperature)
    t_out_limit = float(properties.saturation_temperature(
        readings.coil_pressure if readings.coil_pressure is not None else r.supply_pressure))
    if readings.outlet_temperature is not None and readings.outlet_temperature >= t_out_limit:
        raise InputError("--outlet-temperature",
                         f"{q.show(readings.outlet_temperature, 'temperature', r.system)} is at or above the steam "
                         f"temperature ({q.show(t_out_limit, 'temperature', r.system)}); the coil cannot heat "
                         f"above it. Check the thermometer and the units.", file=unit.source)

    # --- the operating point --------------------------------------------------------
    load, basis = readings.load, "given" if readings.load is not None else ""
    if load is None and readings.inlet_temperature is not None and unit.load.varies == "inlet-temperature":
        load = float(np.clip(coilmod.load_at_inlet_temperature(coil, readings.inlet_temperature), 0.0, 1.2))
        basis = "inlet temperature"
    if load is None and readings.coil_pressure is not None and readings.coil_pressure > properties.P_MIN:
        t = float(properties.saturation_temperature(readings.coil_pressure))
        load = float(np.clip(coilmod.load_at_steam_temperature(coil, t), 0.0, 1.2))
        basis = "coil pressure"
    ret = readings.return_pressure if readings.return_pressure is not None else dr.return_pressure
    rho = float(properties.liquid_density(ret))
    back = ret + rho * GRAVITY * dr.lift
    fill = rho * GRAVITY * dr.fill_head
    model_p = stalled_model = None
    condensate = None
    if load is not None:
        _, p_arr, w_arr = analysis.state_at(unit, r, np.array([load]))
        model_p, condensate = float(p_arr[0]), float(w_arr[0])
        stalled_model = model_p + fill <= back + dr.trap_min_differential
    stalled_gauges = None
    if readings.coil_pressure is not None:
        stalled_gauges = readings.coil_pressure + fill <= back + dr.trap_min_differential
    agreement = ""
    if readings.coil_pressure is not None and model_p is not None and basis != "coil pressure":
        tolerance = max(AGREE_ABSOLUTE, AGREE_RELATIVE * model_p)
        diff = readings.coil_pressure - model_p
        agreement = "high" if diff > tolerance else ("low" if diff < -tolerance else "agree")

    facts = _facts(unit, r, readings, load, model_p, condensate, back, fill, stalled_model, stalled_gauges,
                   agreement)
    causes = rank(facts, **drain_context(r))
    return Diagnosis(readings, load, basis, model_p, back, stalled_model, stalled_gauges, agreement, facts,
                     causes, r, unit.design.outlet_temperature)


def _facts(unit, r, readings, load, model_p, condensate, back, fill, stalled_model, stalled_gauges,
           agreement) -> dict:
    g = unit.geometry
    dr = unit.drain
    s = r.stall
    noise = set(readings.noise)
    inlet_now = readings.inlet_temperature
    if inlet_now is None and load is not None and unit.load.varies == "inlet-temperature":
        inlet_now = float(coilmod.inlet_temperature(analysis.coil_of(unit, r.design.steam_temperature), load))
    trap_short = False
    if load is not None and model_p is not None and condensate and r.trap is not None and not stalled_model:
        capacity = TrapCapacity(unit, back, r.trap.bore)
        trap_short = bool(capacity(model_p + fill - back, model_p + fill) < condensate)
    v = r.valve
    installed = dr.arrangement
    atm = unit.site.atmospheric_pressure
    coil_reading = readings.coil_pressure
    flooding = bool(stalled_gauges or readings.trap_outlet == "cold" or agreement == "high" or (
        readings.outlet_temperature is not None
        and readings.outlet_temperature < unit.design.outlet_temperature - OUTLET_SHORTFALL))
    pt = r.pump_trap
    pump = installed == "pump-trap" and pt is not None
    return {
        "breaker_holding_vacuum": bool(installed == "trap-vacuum-breaker" and coil_reading is not None
                                       and coil_reading < atm - BREAKER_VACUUM),
        "breaker_cannot_act": bool(installed == "trap-vacuum-breaker" and r.drainage.required == "pump-trap"),
        "pump_flooding": bool(pump and flooding),
        "pump_motive_low": bool(pump and pt.motive_pressure - pt.back_pressure < MOTIVE_MARGIN),
        "pump_short": bool(pump and pt.capacity is not None and pt.capacity < pt.condensate),
        "trap_cold_with_differential": bool(readings.trap_outlet == "cold" and coil_reading is not None
                                            and installed != "pump-trap" and not stalled_gauges),
        "drainage_covers_stall": bool(r.drainage.adequate and s.in_range),
        "stalled_model": bool(stalled_model),
        "stalled_gauges": bool(stalled_gauges),
        "stalls_in_range": s.in_range,
        "near_stall": bool(s.occurs and load is not None and s.load_fraction <= load <= s.load_fraction + 0.1),
        "noise_startup": "start-up" in noise,
        "noise_low_load": "low-load" in noise,
        "noise_mild_weather": "mild-weather" in noise,
        "noise_valve_opens": "valve-opens" in noise,
        "noise_all_the_time": "all-the-time" in noise,
        "trap_cold": readings.trap_outlet == "cold",
        "trap_hot": readings.trap_outlet == "hot-passing",
        "trap_blowing": readings.trap_outlet == "blowing-steam",
        "reading_high": agreement == "high",
        "reading_low": agreement == "low",
        "outlet_low": bool(readings.outlet_temperature is not None
                           and readings.outlet_temperature < unit.design.outlet_temperature - OUTLET_SHORTFALL),
        "centre_fed": bool(g and g.supply_feed == "center" and not g.distributing_tubes),
        "group_trapped": bool(g and g.coils_per_trap and g.coils_per_trap > 1),
        "drop_unvented": bool(g and g.drop_vented is False and (
            g.drop_to_trap if g.drop_to_trap is not None else dr.fill_head) >= layout.LONG_DROP),
        "no_drip": bool(g and g.drip_before_valve is False),
        "not_pitched": bool(g and g.tubes == "horizontal" and g.pitched_to_return is False),
        "lift_after_trap": dr.lift > 0,
        "trap_short_now": trap_short,
        "trap_undersized": bool(r.trap is not None and r.trap.capacity_ok is False),
        "poor_trap_type": dr.trap in POOR_AT_LOW_DIFFERENTIAL,
        "valve_cycling": bool(v is not None and load is not None and load < v.min_controllable_load),
        "valve_oversized": bool(v is not None and v.capacity_ok and v.opening_design < 0.5),
        "freezing_air": bool(r.medium == "air" and inlet_now is not None and inlet_now < 273.15),
        "cool_return": bool(dr.return_temperature is not None and r.flash is not None
                            and dr.return_temperature < r.flash.return_saturation_temperature - 5.0
                            and r.flash.fraction > 0),
        "return_slugging": bool(r.return_line is not None and r.return_line.slugging),
        "surge_high": _surge_high(r),
    }


#: Without a rating, a surge above this is large for the usual condensate piping [Pa]
#: (about 150 psi; common practice, from memory).
LARGE_SURGE = 1.0e6


def _surge_high(r: Result) -> bool:
    """True where the computed surge takes the line near or past its rating (80 %), or,
    with no rating given, above :data:`LARGE_SURGE`."""
    sh = r.surge
    if sh is None:
        return False
    if sh.rating is not None:
        return sh.peak >= 0.8 * sh.rating
    return sh.surge >= LARGE_SURGE


def rank(facts: dict, **context) -> tuple[RankedCause, ...]:
    """Score every cause on the facts that hold; best first, unsupported causes left out.

    ``context`` fills the placeholders of the remedies (:func:`drain_context`).

    Ties go to the cause with more supporting facts, then to the code's alphabetical
    order (so the result never depends on the table's order alone).
    """
    out = []
    for cause in CAUSES:
        if not any(facts.get(f) for f in REQUIRES[cause.code]):
            continue
        held = [(f, w) for f, w in cause.weights.items() if facts.get(f)]
        score = sum(w for _, w in held)
        support = tuple(FACTS[f] for f, w in held if w > 0)
        if score <= 0 or not support:
            continue
        against = tuple(FACTS[f] for f, w in held if w < 0)
        out.append(RankedCause(cause.code, cause.title, score, support, against, cause.confirm,
                               f"{cause.remedy.format(**context)} {WORK_CAUTION}"))
    return tuple(sorted(out, key=lambda c: (-c.score, -len(c.evidence), c.code)))
