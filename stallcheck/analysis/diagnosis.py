"""Diagnosing a unit in service: from gauge readings and symptoms to the operating
point and a ranked list of likely causes.

The rules are data: :data:`CAUSES` gives each cause the weight of every fact for or
against it, and :data:`REQUIRES` the facts it cannot do without. A cause's score is the
sum of the weights of the facts that hold; causes with no supporting fact are not
listed. The result is codes and numbers: what each fact and cause means in words, how
to confirm a cause and its remedy, are :mod:`stallcheck.render.diagnosis`'s.
The facts come from the readings *and* the computed state of the unit, so the same
symptoms on a different unit rank differently.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from stallcheck import analysis
from stallcheck.analysis.findings import POOR_AT_LOW_DIFFERENTIAL
from stallcheck.analysis.layout import NEAR_STALL
from stallcheck.files import refusals
from stallcheck.files.readings import Readings
from stallcheck.inputs import Unit
from stallcheck.physics import coil as coilmod
from stallcheck.physics import drainage, properties
from stallcheck.physics.constants import FREEZING, GRAVITY
from stallcheck.analysis.devices import RATING_SHARE, TrapCapacity
from stallcheck.result import Result

#: Gauge and model agree within the larger of this [Pa] (about 1.5 psi) ...
AGREE_ABSOLUTE = 10e3
#: ... and this fraction of the model's absolute pressure.
AGREE_RELATIVE = 0.10
#: An outlet this far below the set point is "not made" [K].
OUTLET_SHORTFALL = 3.0
@dataclass(frozen=True)
class Cause:
    """One likely cause and its weight on each fact."""

    code: str
    weights: dict


#: The rules, in one place: each cause's weight on every fact (3 strong evidence, 2
#: good, 1 weak, negative against). Their words are in :mod:`stallcheck.render.diagnosis`.
CAUSES = (
    Cause("stall", {"stalled_model": 3, "stalled_gauges": 3, "near_stall": 1, "stalls_in_range": 1,
          "noise_low_load": 2, "noise_mild_weather": 2, "trap_cold": 1, "outlet_low": 1, "lift_after_trap": 1,
          "trap_blowing": -3, "noise_all_the_time": -1, "drainage_covers_stall": -5}),
    Cause("tube-fill-pattern", {"centre_fed": 3, "noise_low_load": 1, "noise_valve_opens": 1,
          "noise_startup": 1, "stalled_model": 1, "stalls_in_range": 1, "trap_blowing": -2}),
    Cause("group-trapping", {"group_trapped": 4, "noise_low_load": 1, "stalls_in_range": 1, "outlet_low": 1,
          "trap_blowing": -2}),
    Cause("unvented-drop", {"drop_unvented": 3, "noise_low_load": 1, "noise_startup": 1, "trap_cold": 1,
          "trap_blowing": -2}),
    Cause("undripped-valve", {"no_drip": 3, "noise_valve_opens": 3, "noise_startup": 2,
          "noise_all_the_time": -1}),
    Cause("trap-blowing-steam", {"trap_blowing": 5, "cool_return": 2, "noise_all_the_time": 2, "trap_cold": -3,
          "stalled_model": -1}),
    Cause("trap-flooding", {"trap_short_now": 3, "trap_undersized": 2, "trap_cold": 2, "reading_high": 2,
          "outlet_low": 1, "poor_trap_type": 1, "noise_all_the_time": 1, "stalled_model": -2,
          "stalled_gauges": -1, "trap_blowing": -3}),
    Cause("valve-hunting", {"valve_cycling": 3, "valve_oversized": 2, "noise_valve_opens": 2,
          "noise_low_load": 1, "noise_mild_weather": 1}),
    Cause("freeze-damage", {"freezing_air": 2, "stalled_model": 3, "stalled_gauges": 2, "trap_cold": 2,
          "outlet_low": 1}),
    Cause("vacuum-breaker-stuck", {"breaker_holding_vacuum": 6, "stalled_gauges": 2, "trap_cold": 1,
          "outlet_low": 1, "noise_low_load": 1, "noise_mild_weather": 1, "trap_blowing": -3}),
    Cause("vacuum-breaker-cannot-act", {"breaker_cannot_act": 6, "stalled_gauges": 2, "stalled_model": 1,
          "trap_cold": 1, "noise_low_load": 1, "noise_mild_weather": 1, "trap_blowing": -3}),
    Cause("pump-trap-not-pumping", {"pump_flooding": 4, "pump_motive_low": 3, "pump_short": 3,
          "noise_low_load": 1, "noise_all_the_time": 1, "trap_blowing": -3}),
    Cause("trap-failed-closed", {"trap_cold_with_differential": 4, "trap_over_rating": 3, "outlet_low": 1, "reading_high": 1,
          "noise_all_the_time": 1, "trap_blowing": -5}),
    Cause("return-line-slugging", {"return_slugging": 4, "noise_all_the_time": 1, "noise_valve_opens": 1,
          "trap_hot": 1, "stalled_model": -1, "trap_cold": -1}),
    Cause("check-valve-slam", {"pump_surge_near_rating": 4, "pump_surge_large": 4, "noise_low_load": 1,
          "noise_all_the_time": 1, "trap_blowing": -2}),
    Cause("lift-column-shock", {"lift_surge_near_rating": 4, "lift_surge_large": 4, "lift_after_trap": 1,
          "noise_low_load": 1, "trap_blowing": -2}),
    Cause("flash-into-cool-return", {"cool_return": 4, "noise_all_the_time": 2, "trap_hot": 1, "trap_cold": -2}),
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
    "check-valve-slam": ("pump_surge_near_rating", "pump_surge_large"),
    "lift-column-shock": ("lift_surge_near_rating", "lift_surge_large"),
    "flash-into-cool-return": ("cool_return",),
    "trap-failed-closed": ("trap_cold_with_differential", "trap_over_rating"),
}

#: A vacuum breaker lets air in before the coil holds more vacuum than this [Pa]:
#: about 1 inHg (common practice, from memory; breakers open at a fraction of an inch).
BREAKER_VACUUM = 3386.389



@dataclass(frozen=True)
class RankedCause:
    """A cause with its score and the facts for and against it (the codes of
    ``Diagnosis.facts``, in the order of the cause's weights)."""

    code: str
    score: int
    evidence: tuple[str, ...]
    against: tuple[str, ...]


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
        raise refusals.outlet_above_steam(unit, readings.outlet_temperature, t_out_limit, r.system)

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
        stalled_model = bool(drainage.cannot_discharge(model_p + fill - back, dr.trap_min_differential))
    stalled_gauges = None
    if readings.coil_pressure is not None:
        stalled_gauges = bool(drainage.cannot_discharge(readings.coil_pressure + fill - back,
                                                        dr.trap_min_differential))
    agreement = ""
    if readings.coil_pressure is not None and model_p is not None and basis != "coil pressure":
        tolerance = max(AGREE_ABSOLUTE, AGREE_RELATIVE * model_p)
        diff = readings.coil_pressure - model_p
        agreement = "high" if diff > tolerance else ("low" if diff < -tolerance else "agree")

    facts = _facts(unit, r, readings, load, model_p, condensate, back, fill, stalled_model, stalled_gauges,
                   agreement)
    causes = rank(facts)
    return Diagnosis(readings, load, basis, model_p, back, stalled_model, stalled_gauges, agreement, facts,
                     causes, r, unit.design.outlet_temperature)


def _facts(unit, r, readings, load, model_p, condensate, back, fill, stalled_model, stalled_gauges,
           agreement) -> dict:
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
    found = {f.code for f in r.findings}
    return {
        "breaker_holding_vacuum": bool(installed == "trap-vacuum-breaker" and coil_reading is not None
                                       and coil_reading < atm - BREAKER_VACUUM),
        "breaker_cannot_act": bool(installed == "trap-vacuum-breaker" and r.drainage.required == "pump-trap"),
        "pump_flooding": bool(pump and flooding),
        "pump_motive_low": "pump-trap-motive-low" in found,
        "pump_short": "pump-trap-undersized" in found,
        "trap_cold_with_differential": bool(readings.trap_outlet == "cold" and coil_reading is not None
                                            and installed != "pump-trap" and not stalled_gauges),
        "trap_over_rating": "trap-differential-over-rating" in found,
        "drainage_covers_stall": bool(r.drainage.adequate and s.in_range),
        "stalled_model": bool(stalled_model),
        "stalled_gauges": bool(stalled_gauges),
        "stalls_in_range": s.in_range,
        "near_stall": bool(s.occurs and load is not None and s.load_fraction <= load <= s.load_fraction + NEAR_STALL),
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
        # the check's own findings: one rule, one place
        "centre_fed": "tube-fill-both-ends" in found,
        "group_trapped": "group-trapping" in found,
        "drop_unvented": "drop-not-vented" in found,
        "no_drip": "valve-not-dripped" in found,
        "not_pitched": "tubes-not-pitched" in found,
        "lift_after_trap": dr.lift > 0,
        "trap_short_now": trap_short,
        "trap_undersized": "trap-undersized" in found,
        "poor_trap_type": dr.trap in POOR_AT_LOW_DIFFERENTIAL,
        "valve_cycling": bool(v is not None and load is not None and load < v.min_controllable_load),
        "valve_oversized": "valve-oversized" in found,
        "freezing_air": bool(r.medium == "air" and inlet_now is not None and inlet_now < FREEZING),
        "cool_return": "flash-into-cool-return" in found,
        "return_slugging": "return-line-slug-flow" in found,
        **_surge_facts(r),
    }


#: Without a rating, a surge above this is large for the usual condensate piping [Pa]
#: (about 150 psi; common practice, from memory).
LARGE_SURGE = 1.0e6


def _surge_facts(r: Result) -> dict:
    """Where the computed surge is high, by what stops the column (a pump-trap's check
    valve, or the trap under a lift: only equipment the unit has) and by what it is
    high against: ``*_near_rating`` where the peak reaches :data:`devices.RATING_SHARE`
    of the line's given rating, ``*_large`` where no rating is given and the rise
    exceeds :data:`LARGE_SURGE`."""
    sh = r.surge
    if sh is None:
        return {}
    who = "pump" if sh.basis == "pump-trap" else "lift"
    if sh.rating is not None:
        return {f"{who}_surge_near_rating": sh.peak >= RATING_SHARE * sh.rating}
    return {f"{who}_surge_large": sh.surge >= LARGE_SURGE}


#: Causes that are consequences of another (a coil split by frost is the result of a
#: coil that held water): listed after every cause to act on, whatever their score.
CONSEQUENCES = frozenset({"freeze-damage"})


def rank(facts: dict) -> tuple[RankedCause, ...]:
    """Score every cause on the facts that hold; best first, unsupported causes left out.

    The order: causes to act on before consequences (:data:`CONSEQUENCES`); causes with
    no fact against them before those with one (a fact against a cause is evidence
    the engineer should look elsewhere first); then by score, then by the number of
    supporting facts, then by the code's alphabetical order (so the result never
    depends on the table's order alone).
    """
    out = []
    for cause in CAUSES:
        if not any(facts.get(f) for f in REQUIRES[cause.code]):
            continue
        held = [(f, w) for f, w in cause.weights.items() if facts.get(f)]
        score = sum(w for _, w in held)
        support = tuple(f for f, w in held if w > 0)
        if score <= 0 or not support:
            continue
        against = tuple(f for f, w in held if w < 0)
        out.append(RankedCause(cause.code, score, support, against))
    return tuple(sorted(out, key=lambda c: (c.code in CONSEQUENCES, bool(c.against), -c.score, -len(c.evidence),
                                            c.code)))
