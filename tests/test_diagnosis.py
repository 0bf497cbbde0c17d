"""Diagnosing units in service, and the layout rules.

Scenarios are invented units and readings; each asserts the cause the evidence points
to ranks first (the trade's reading of those symptoms: common practice)."""

import json

import pytest
from conftest import BASE_UNIT, SAMPLES
from typer.testing import CliRunner

from stallcheck import analysis
from stallcheck.analysis import diagnosis
from stallcheck.cli import app
from stallcheck.errors import InputError
from stallcheck.files import readings, unitfile
from stallcheck.render import diagnosis as show

runner = CliRunner()

# A pressurised hot-water heater: its coil stays above atmospheric at every load, so it
# never stalls against a vented return (the set point's saturation pressure is 2.7 bar(abs)).
HOT_WATER = """
format = 1
[unit]
name = "Test heating-water converter"
[design]
medium = "water"
flow = "20 m3/h"
inlet_temperature = "100 degC"
outlet_temperature = "130 degC"
steam_pressure = "5 barg"
[steam]
supply_pressure = "8 barg"
[valve]
kv = 40
characteristic = "equal-percentage"
[load]
varies = "flow"
[drain]
arrangement = "trap"
fill_head = "0.3 m"
return_pressure = "0 barg"
"""


# A low-pressure water heater (0.15 barg in the shell at full load) on a vacuum breaker.
LOW_PRESSURE_HEATER = (HOT_WATER.replace('steam_pressure = "5 barg"', 'steam_pressure = "0.15 barg"')
                       .replace('supply_pressure = "8 barg"', 'supply_pressure = "1 barg"')
                       .replace('inlet_temperature = "100 degC"', 'inlet_temperature = "50 degC"')
                       .replace('outlet_temperature = "130 degC"', 'outlet_temperature = "70 degC"')
                       .replace('flow = "20 m3/h"', 'flow = "25 m3/h"')
                       .replace('arrangement = "trap"', 'arrangement = "trap-vacuum-breaker"'))


def _unit(text, extra=""):
    return unitfile.parse(text + extra, "scenario.toml")


def _diagnose(text, extra="", **given):
    u = _unit(text, extra)
    r = analysis.analyse(u)
    return diagnosis.diagnose(u, r, readings.parse(u, **given))


def _ranking(d):
    return [c.code for c in d.causes]


def test_hot_water_scenario_never_stalls():
    r = analysis.analyse(_unit(HOT_WATER))
    assert not r.stall.occurs


SCENARIOS = {
    # cause: (unit text, extra TOML, readings)
    "stall": (BASE_UNIT, "", dict(inlet_temperature="35 degF", coil_pressure="-6 psig", noise="low-load,mild-weather",
                                  trap_outlet="cold")),
    "tube-fill-pattern": (HOT_WATER, '[geometry]\nsupply_feed = "center"\ndistributing_tubes = false\n',
                          dict(load="0.5", noise="start-up,valve-opens", trap_outlet="hot-passing")),
    "group-trapping": (HOT_WATER, "[geometry]\ncoils_per_trap = 3\n",
                       dict(load="0.4", noise="low-load", outlet_temperature="120 degC")),
    "unvented-drop": (HOT_WATER, '[geometry]\ndrop_to_trap = "1.5 m"\ndrop_vented = false\n',
                      dict(load="0.3", noise="start-up,low-load", trap_outlet="cold")),
    "undripped-valve": (HOT_WATER, "[geometry]\ndrip_before_valve = false\n",
                        dict(load="0.6", noise="valve-opens,start-up", trap_outlet="hot-passing")),
    "trap-blowing-steam": (HOT_WATER, 'return_temperature = "50 degC"\n',
                           dict(load="0.7", noise="all-the-time", trap_outlet="blowing-steam")),
    "trap-flooding": (HOT_WATER, '[[drain.capacity]]\ndifferential = "0.1 bar"\nflow = "50 kg/h"\n'
                                 '[[drain.capacity]]\ndifferential = "1 bar"\nflow = "150 kg/h"\n',
                      dict(load="0.6", coil_pressure="4.5 barg", outlet_temperature="118 degC",
                           trap_outlet="cold")),
    "valve-hunting": (HOT_WATER.replace("kv = 40", "kv = 400"), "",
                      dict(load="0.03", noise="valve-opens,low-load", trap_outlet="hot-passing")),
    "freeze-damage": (BASE_UNIT, "", dict(inlet_temperature="5 degF", outlet_temperature="38 degF",
                                          trap_outlet="cold")),
    # a vacuum breaker fitted where it can act (18 in of fill head against a vented
    # return), yet the coil reads a vacuum: the breaker is not letting air in
    "vacuum-breaker-stuck": (BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "trap-vacuum-breaker"'), "",
                             dict(inlet_temperature="40 degF", coil_pressure="5 inHg vacuum",
                                  noise="low-load,mild-weather", trap_outlet="cold")),
    # a vacuum breaker with 6 in of fill head: about 0.2 psi, under the 1/4 psi a trap is
    # sized at, so it cannot drain the coil by gravity (common practice)
    "vacuum-breaker-cannot-act": (BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "trap-vacuum-breaker"')
                                  .replace('fill_head = "18 in"', 'fill_head = "6 in"'), "",
                                  dict(inlet_temperature="40 degF", noise="low-load", trap_outlet="cold")),
    # a pump-trap whose motive steam is barely above the back pressure of a 10 ft lift
    "pump-trap-not-pumping": (BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "pump-trap"')
                              .replace('lift = "0 ft"', 'lift = "10 ft"'), 'motive_pressure = "6 psig"\n',
                              dict(inlet_temperature="40 degF", coil_pressure="2 psig", noise="low-load",
                                   trap_outlet="cold")),
    # 900 kg/h of condensate from a 0.15 barg heater, 0.7 % of it flashing, in a 25 mm
    # line to a vented receiver: intermittent (slug) flow by the Taitel-Dukler map
    "return-line-slugging": (LOW_PRESSURE_HEATER, 'return_line = "25 mm"\nreturn_pitch = "1 %"\n',
                             dict(load="0.97", noise="all-the-time", trap_outlet="hot-passing")),
    # a pump-trap lifting 10 ft through 100 ft of 1 in line rated 50 psig, its check
    # valve slamming: the computed surge passes the rating
    "check-valve-slam": (BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "pump-trap"')
                         .replace('lift = "0 ft"', 'lift = "10 ft"'),
                         'motive_pressure = "60 psig"\npump_rate = "3000 lb/h"\nreturn_line = "1 in"\n'
                         'return_length = "100 ft"\nreturn_rating = "50 psig"\n',
                         dict(inlet_temperature="40 degF", noise="all-the-time", trap_outlet="hot-passing")),
    # a plain trap lifting 3 m through a 25 mm line rated only 1 barg: the trap's
    # full-load discharge (about 1,200 kg/h), stopped when it shuts, passes the rating
    "lift-column-shock": (HOT_WATER.replace('return_pressure = "0 barg"', 'return_pressure = "0 barg"\nlift = "3 m"'),
                          'return_line = "25 mm"\nreturn_rating = "1 barg"\n',
                          dict(load="0.9", noise="low-load", trap_outlet="hot-passing")),
    # hot condensate flashing into a pumped return at 50 °C, the trap working
    "flash-into-cool-return": (HOT_WATER, 'return_temperature = "50 degC"\n',
                               dict(load="0.7", noise="all-the-time", trap_outlet="hot-passing")),
    # a coil that never stalls, its gauge well above the return, and a cold trap
    "trap-failed-closed": (HOT_WATER, "", dict(load="0.6", coil_pressure="4 barg", trap_outlet="cold",
                                               outlet_temperature="115 degC")),
}


def test_a_trap_over_its_rating_is_evidence_it_stays_shut_and_is_replaced_by_one_rated_for_it():
    # a trap rated for 1 bar on a coil whose supply can put far more across it: the
    # cold trap with the coil gauge high is then most likely shut by its differential,
    # and the remedy does not ask for another of the same rating
    text, extra, given = SCENARIOS["trap-failed-closed"]
    d = _diagnose(text, 'trap_max_differential = "1 bar"\n', **given)
    first = d.causes[0]
    assert first.code == "trap-failed-closed" and "trap_over_rating" in first.evidence
    from stallcheck.render.diagnosis import said

    remedy = said(d)[0].remedy
    assert "rated for the differential it can see" in remedy and "same rating" not in remedy
    plain = _diagnose(text, extra, **given)
    assert "same rating" in said(plain)[0].remedy


@pytest.mark.parametrize("cause", sorted(SCENARIOS))
def test_each_cause_ranks_first_on_its_evidence(cause):
    # A consequence (a coil split by frost) ranks after the cause to act on (the stall
    # that left water in it): its scenario lists it, below the stall.
    text, extra, given = SCENARIOS[cause]
    d = _diagnose(text, extra, **given)
    if cause in diagnosis.CONSEQUENCES:
        ranking = _ranking(d)
        assert cause in ranking and ranking[0] == "stall" and ranking.index(cause) > 0, ranking
        return
    assert _ranking(d)[0] == cause, _ranking(d)


def test_the_cause_to_act_on_leads_a_consequence_and_a_cause_with_a_fact_against_it():
    # A pump-trap lifting 10 ft, the coil gauge under the back pressure, a cold trap and
    # freezing air: the installed pump-trap not pumping is the cause to act on; the
    # generic stall (its drainage covers the stall: a fact against it) and the frost
    # damage (a consequence) follow.
    text = BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "pump-trap"').replace('lift = "0 ft"',
                                                                                         'lift = "10 ft"')
    d = _diagnose(text, 'motive_pressure = "50 psig"\n', inlet_temperature="20 degF", coil_pressure="2 psig",
                  trap_outlet="cold", noise="low-load")
    ranking = _ranking(d)
    assert ranking[0] == "pump-trap-not-pumping", ranking
    assert ranking.index("stall") < ranking.index("freeze-damage") == len(ranking) - 1


def test_every_cause_has_a_scenario():
    assert set(SCENARIOS) == {c.code for c in diagnosis.CAUSES}


def test_a_shock_names_only_equipment_the_unit_has_and_a_rating_only_where_given():
    # The lift scenario has no pump-trap: no check-valve slam is ranked; its surge is
    # cited against the rating it was given. Without a rating, a surge over about 150
    # psi is "large" (common practice, from memory) and no rating is cited.
    from stallcheck.render import diagnosis as said

    text, extra, given = SCENARIOS["lift-column-shock"]
    d = _diagnose(text, extra, **given)
    assert "check-valve-slam" not in _ranking(d)
    lift = next(c for c in said.said(d) if c.code == "lift-column-shock")
    assert any("rating" in e for e in lift.evidence)
    slim = _diagnose(text, 'return_line = "12 mm"\n', **given)   # a rise over 1,000 kPa, no rating
    assert slim.result.surge.rating is None and slim.result.surge.surge > 1.0e6
    lift = next(c for c in said.said(slim) if c.code == "lift-column-shock")
    assert not any("past the line's rating" in e for e in lift.evidence)
    assert any("no rating was given" in e for e in lift.evidence)
    small = _diagnose(text, 'return_line = "50 mm"\n', **given)    # unrated, under 150 psi
    assert "lift-column-shock" not in _ranking(small)


def test_same_symptoms_rank_by_the_unit_file():
    # Banging when the valve opens and at start-up: an undripped valve on one unit,
    # tube filling from both ends on another.
    symptoms = dict(load="0.5", noise="valve-opens,start-up", trap_outlet="hot-passing")
    a = _diagnose(HOT_WATER, "[geometry]\ndrip_before_valve = false\n", **symptoms)
    b = _diagnose(HOT_WATER, '[geometry]\nsupply_feed = "center"\n', **symptoms)
    assert _ranking(a)[0] == "undripped-valve"
    assert _ranking(b)[0] == "tube-fill-pattern"


def test_two_causes_compete_and_the_evidence_decides():
    # A stalled air coil with a centre feed: with the gauges showing the stall, the stall
    # leads; with a hot, passing trap at high load and bangs as the valve opens, the
    # tube-fill pattern does.
    extra = '[geometry]\nsupply_feed = "center"\n'
    stalled = _diagnose(BASE_UNIT, extra, inlet_temperature="40 degF", coil_pressure="-8 psig",
                        noise="low-load", trap_outlet="cold")
    assert _ranking(stalled)[:2] == ["stall", "tube-fill-pattern"]
    opening = _diagnose(BASE_UNIT, extra, inlet_temperature="-8 degF", noise="valve-opens,start-up",
                        trap_outlet="hot-passing")
    assert _ranking(opening)[0] == "tube-fill-pattern"
    assert "stall" in _ranking(opening)


def test_readings_in_si_and_us_rank_the_same():
    us = _diagnose(BASE_UNIT, "", inlet_temperature="35 degF", coil_pressure="-6 psig", noise="low-load",
                   trap_outlet="cold", outlet_temperature="45 degF")
    si = _diagnose(BASE_UNIT, "", inlet_temperature="1.6667 degC", coil_pressure="-0.41369 barg",
                   noise="low-load", trap_outlet="cold", outlet_temperature="7.2222 degC")
    assert _ranking(us) == _ranking(si)
    assert [c.score for c in us.causes] == [c.score for c in si.causes]


def test_every_remedy_carries_the_safety_caution():
    for cause, (text, extra, given) in SCENARIOS.items():
        for c in show.said(_diagnose(text, extra, **given)):
            assert "Make the system safe first" in c.remedy
            assert "local codes" in c.remedy


def test_symptoms_alone_never_make_a_cause():
    d = _diagnose(HOT_WATER, "", load="0.6", noise="valve-opens,low-load,start-up")
    assert _ranking(d) == []


def test_gauge_far_from_the_model_is_flagged():
    d = _diagnose(HOT_WATER, "", load="0.5", coil_pressure="4.9 barg")
    assert d.agreement == "high"
    d = _diagnose(HOT_WATER, "", load="0.5", coil_pressure="1.6 barg")
    assert d.agreement == "low"


@pytest.mark.parametrize("given, option, fragment", [
    (dict(coil_pressure="20 barg"), "--coil-pressure", "above the supply"),
    (dict(coil_pressure="-30 psig"), "--coil-pressure", "absolute zero"),
    (dict(return_pressure="-2 bara"), "--return-pressure", "absolute zero"),
    (dict(coil_pressure="3 psi"), "--coil-pressure", "psig"),
    (dict(noise="at-night"), "--noise", "start-up, low-load"),
    (dict(trap_outlet="warm"), "--trap-outlet", "cold, hot-passing, blowing-steam"),
    (dict(load="150 %"), "--load", "out of range"),
])
def test_impossible_readings_name_the_option(given, option, fragment):
    u = _unit(HOT_WATER)
    with pytest.raises(InputError, match=fragment) as err:
        readings.parse(u, **given)
    assert err.value.key == option


def test_outlet_above_the_steam_temperature_is_refused():
    u = _unit(HOT_WATER)
    r = analysis.analyse(u)
    with pytest.raises(InputError, match="at or above the steam temperature"):
        diagnosis.diagnose(u, r, readings.parse(u, coil_pressure="1 barg", outlet_temperature="125 degC"))


def test_cli_diagnose_json_and_exit_status(write_unit):
    path = write_unit(BASE_UNIT)
    result = runner.invoke(app, ["diagnose", str(path), "--inlet-temperature", "35 degF", "--coil-pressure",
                                 "-6 psig", "--noise", "low-load", "--trap-outlet", "cold", "--json"])
    assert result.exit_code == 1
    data = json.loads(result.stdout)
    assert data["causes"][0]["code"] == "stall"
    assert data["operating_point"]["stalled_model"] is True
    assert "check" in data and data["check"]["unit"] == "Test coil"


def test_cli_diagnose_bad_reading_exits_2(write_unit):
    result = runner.invoke(app, ["diagnose", str(write_unit(BASE_UNIT)), "--noise", "sometimes", "--no-ask"])
    assert result.exit_code == 2
    assert "--noise" in result.stderr and "low-load" in result.stderr
    assert "Traceback" not in result.output


def test_cli_diagnose_asks_again_after_a_bad_answer(write_unit):
    # Answers: coil pressure first wrong (bare psi), then right; the rest skipped or given.
    answers = "\n".join(["3 psi", "-6 psig", "", "", "35 degF", "", "low-load", "cold"]) + "\n"
    result = runner.invoke(app, ["diagnose", str(write_unit(BASE_UNIT)), "--ask"], input=answers)
    assert result.exit_code == 1, result.output
    assert "psig" in result.stderr  # the re-ask message names the accepted spellings
    assert "1. The coil stalls" in result.stdout


# --- layout rules ------------------------------------------------------------------------


@pytest.mark.parametrize("geometry, code", [
    ('supply_feed = "center"\ndistributing_tubes = false', "tube-fill-both-ends"),
    ("coils_per_trap = 2", "group-trapping"),
    ('drop_to_trap = "4 ft"\ndrop_vented = false', "drop-not-vented"),
    ("drip_before_valve = false", "valve-not-dripped"),
    ('tubes = "horizontal"\npitched_to_return = false', "tubes-not-pitched"),
])
def test_layout_rules_fire_and_rise_where_the_coil_stalls(geometry, code):
    stalls = analysis.analyse(_unit(BASE_UNIT, f"[geometry]\n{geometry}\n"))
    drains = analysis.analyse(_unit(HOT_WATER, f"[geometry]\n{geometry}\n"))
    order = ["info", "warning", "danger"]
    f_stalls = next(f for f in stalls.findings if f.code == code)
    f_drains = next(f for f in drains.findings if f.code == code)
    if code == "valve-not-dripped":  # the slug comes with every opening, stall or not
        assert f_stalls.severity == f_drains.severity == "warning"
    else:
        assert order.index(f_stalls.severity) > order.index(f_drains.severity)


def test_good_layout_gives_no_layout_finding():
    good = ('[geometry]\ntubes = "horizontal"\nsupply_feed = "end"\npitched_to_return = true\n'
            'coils_per_trap = 1\ndrop_to_trap = "4 ft"\ndrop_vented = true\ndrip_before_valve = true\n')
    codes = {f.code for f in analysis.analyse(_unit(BASE_UNIT, good)).findings}
    assert not codes & {"tube-fill-both-ends", "group-trapping", "drop-not-vented", "valve-not-dripped",
                        "tubes-not-pitched"}


@pytest.mark.parametrize("cause", sorted(SCENARIOS))
def test_diagnose_never_prescribes_what_is_installed(cause):
    text, extra, given = SCENARIOS[cause]
    d = _diagnose(text, extra, **given)
    installed = d.result.drainage.installed
    fitted = {"pump-trap": "fit a pump-trap", "trap-vacuum-breaker": "fit a vacuum breaker"}.get(installed)
    for c in show.said(d):
        if fitted and d.result.drainage.adequate:
            assert fitted not in c.remedy.lower(), (c.code, c.remedy)
        if installed == "pump-trap":
            assert "fit a pump-trap" not in c.remedy.lower(), (c.code, c.remedy)


def test_installed_pump_trap_that_floods_is_to_be_tested_not_fitted():
    text, extra, given = SCENARIOS["pump-trap-not-pumping"]
    d = _diagnose(text, extra, **given)
    stall = next(c for c in show.said(d) if c.code == "stall")
    assert "installed pump-trap should drain it" in stall.remedy and "test it" in stall.remedy


@pytest.mark.parametrize("reading", ["10 inHg vacuum", "10 inHg vac", "-10 inHg", "10 in Hg vacuum"])
def test_compound_gauge_readings_are_accepted(reading):
    # NIST SP 811, Appendix B: 1 inHg (32 °F) = 3.38638 kPa, so 10 inHg of vacuum at
    # sea level is 101.325 − 33.864 = 67.461 kPa(abs).
    u = _unit(BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "trap-vacuum-breaker"'))
    got = readings.parse(u, coil_pressure=reading)
    assert got.coil_pressure == pytest.approx(101325 - 33863.8, abs=1.0)


def test_negative_gauge_and_vacuum_in_kpa_are_accepted():
    u = _unit(BASE_UNIT)
    assert readings.parse(u, coil_pressure="-0.3 barg").coil_pressure == pytest.approx(71325.0)
    assert readings.parse(u, coil_pressure="25 kPa vacuum").coil_pressure == pytest.approx(76325.0)


@pytest.mark.parametrize("reading, fragment", [
    ("10 inHg", "does not say it is a vacuum"),
    ("35 inHg vacuum", "more vacuum than the atmosphere"),
    ("-5 inHg vacuum", "minus sign"),
])
def test_ambiguous_or_impossible_vacuum_readings_are_refused(reading, fragment):
    u = _unit(BASE_UNIT)
    with pytest.raises(InputError, match=fragment) as err:
        readings.parse(u, coil_pressure=reading)
    assert err.value.key == "--coil-pressure"


def test_us_output_shows_vacuum_as_a_compound_gauge_reads_it():
    # 10 inHg below 14.696 psia is 4.91 psi of vacuum (NIST SP 811: 1 inHg = 0.491154 psi).
    from stallcheck.files import display
    assert display.show(101325 - 33863.8, "pressure", "us") == "-4.9 psig (10.0 inHg vac)"
    assert display.show(101325 + 1000, "pressure", "us") == "0.1 psig"
    assert "inHg" not in display.show(101325 - 33863.8, "pressure", "si")


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.name)
def test_diagnose_points_to_what_to_do_only_where_the_check_lists_a_change(sample):
    # One story: diagnose's remedy sends the user to the changes under "what to do"
    # only where check lists one; where check says no single change helps, so does it.
    from stallcheck.render import advice
    from stallcheck.render.diagnosis import drain_context

    r = analysis.analyse(unitfile.load(sample))
    text = drain_context(r)["drain_advice"]
    listed = bool(advice.advise(r, r.system).changes)
    if not r.drainage.adequate:
        assert ("changes under 'what to do'" in text) == listed, text
        assert ("no single change" in text) == (not listed), text
