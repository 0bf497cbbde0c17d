"""stallcheck new: scripted answers, wrong ones asked again, the file compared with the
same unit written by hand."""


import pytest
from typer.testing import CliRunner

from stallcheck import wizard
from stallcheck.cli import app
from stallcheck.errors import InputError
from stallcheck.files import unitfile

runner = CliRunner()

BY_HAND = """
format = 1
[unit]
name = "Quarry Lane AHU-9 preheat"
tag = "AHU-9 PH"
[design]
medium = "air"
flow = "7500 cfm"
inlet_temperature = "-5 degF"
outlet_temperature = "52 degF"
steam_pressure = "6 psig"
[steam]
supply_pressure = "20 psig"
[valve]
cv = 18
characteristic = "equal-percentage"
[load]
minimum = 0.25
[drain]
arrangement = "trap-vacuum-breaker"
trap = "float-thermostatic"
fill_head = "20 in"
lift = "0 ft"
return_pressure = "0 psig"
"""

# (answer, and why), in the order asked; the wrong ones must be asked again.
ANSWERS = [
    ("us", "units"),
    ("Quarry Lane AHU-9 preheat", "name"),
    ("AHU-9 PH", "tag"),
    ("", "elevation: blank for sea level"),
    ("steam", "medium: not one of the media -> asked again"),
    ("air", "medium"),
    ("7500 ft", "flow: a length -> asked again"),
    ("7500 cfm", "flow"),
    ("-5 degF", "entering"),
    ("-10 degF", "set point below the entering temperature -> asked again"),
    ("52 degF", "set point"),
    ("6 psi", "coil pressure: neither gauge nor absolute -> asked again"),
    ("6 psig", "coil pressure"),
    ("4 psig", "supply below the coil pressure -> asked again"),
    ("20 psig", "supply"),
    ("-3", "Cv out of range -> asked again"),
    ("18", "Cv"),
    ("", "characteristic: the default, equal-percentage"),
    ("1.5", "minimum load out of range -> asked again"),
    ("0.25", "minimum load"),
    ("trap-vacuum-breaker", "arrangement"),
    ("", "trap: the default, float-thermostatic"),
    ("20 in", "fill head"),
    ("0 ft", "lift"),
    ("0 psig", "return pressure"),
]


def _run(tmp_path, answers, args=()):
    text = "\n".join(a for a, _ in answers) + "\n"
    return runner.invoke(app, ["new", *args], input=text)


def _same_unit(a, b):
    for part in ("design", "drain", "load", "valve", "site"):
        assert getattr(a, part) == getattr(b, part), part
    assert (a.name, a.tag, a.supply_pressure) == (b.name, b.tag, b.supply_pressure)


def test_scripted_answers_write_the_unit_written_by_hand(tmp_path):
    out = tmp_path / "ahu9.toml"
    result = _run(tmp_path, ANSWERS, [str(out)])
    assert result.exit_code == 0, result.output
    for fragment in ("is not one of: air", "not a mass flow",
                     "must be above the entering temperature", "does not say gauge or absolute",
                     "must be above the coil pressure", "out of range"):
        assert fragment in result.stderr, fragment
    written = unitfile.load(out)
    _same_unit(written, unitfile.parse(BY_HAND, "by-hand.toml"))
    assert "# " in out.read_text(encoding="utf-8")  # commented
    assert "stalls below" in result.stdout and "load, % of design" in result.stdout


def test_never_overwrites_without_confirmation(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    existing = tmp_path / "ahu9.toml"
    existing.write_text("keep\n", encoding="utf-8")
    answers = ANSWERS + [("ahu9.toml", "save as"), ("n", "do not replace"), ("other.toml", "save as")]
    result = _run(tmp_path, answers)
    assert result.exit_code == 0, result.output
    assert existing.read_text(encoding="utf-8") == "keep\n"
    _same_unit(unitfile.load(tmp_path / "other.toml"), unitfile.parse(BY_HAND, "x"))


def test_answers_that_end_early_write_nothing(tmp_path):
    out = tmp_path / "half.toml"
    result = _run(tmp_path, ANSWERS[:8], [str(out)])
    assert result.exit_code == 2 and "nothing written" in result.stderr
    assert list(tmp_path.iterdir()) == []


def test_ctrl_c_writes_nothing(tmp_path, monkeypatch):
    from rich.prompt import Prompt

    calls = {"n": 0}
    real = Prompt.ask

    def interrupt(*args, **kwargs):
        calls["n"] += 1
        if calls["n"] == 6:
            raise KeyboardInterrupt
        return real(*args, **kwargs)

    monkeypatch.setattr(Prompt, "ask", interrupt)
    out = tmp_path / "x.toml"
    result = _run(tmp_path, ANSWERS, [str(out)])
    assert result.exit_code == 130 and "nothing written" in result.stderr
    assert list(tmp_path.iterdir()) == []


def test_every_question_names_a_key_the_unit_file_knows():
    from stallcheck.files.unitfile import _KNOWN

    for x in wizard.QUESTIONS:
        section, name = x.key.split(".")
        assert name in _KNOWN[section], x.key
    with pytest.raises(InputError, match="needs an answer"):
        wizard.accept(wizard.QUESTIONS[0], "", {})


def test_a_missing_folder_is_a_clear_message(tmp_path):
    result = _run(tmp_path, ANSWERS, [str(tmp_path / "no" / "unit.toml")])
    # the message may wrap at the terminal's width wherever the path puts it
    assert result.exit_code == 2 and "does not exist" in " ".join(result.stderr.split())
    assert list(tmp_path.iterdir()) == []


@pytest.mark.parametrize("key, typed_text, written", [
    ("design.inlet_temperature", "15C", "15 degC"), ("design.inlet_temperature", "15 C", "15 degC"),
    ("design.inlet_temperature", "15 degc", "15 degC"), ("design.outlet_temperature", "50F", "50 degF"),
    ("design.inlet_temperature", "0 deg F", "0 degF"), ("design.inlet_temperature", "-5.5 °C", "-5.5 degC"),
    ("design.flow", "12,000 cfm", "12000 cfm"), ("design.flow", "12000 CFM", "12000 cfm"),
    ("design.steam_pressure", "2 bar(g)", "2 bar(g)"), ("design.medium", "Air", "air"),
    ("drain.trap", "F&T", "float-thermostatic"), ("load.minimum", "10%", 0.1),
    ("drain.fill_head", '18"', "18 in"), ("design.concentration", "30%", "30 %"),
])
def test_answers_as_engineers_type_them(key, typed_text, written):
    # Common practice in how the trade writes values; each is written in the unit file's
    # own spelling, which the unit file then reads.
    question = next(x for x in wizard.QUESTIONS if x.key == key)
    answers = {"design.medium": "propylene-glycol"} if key == "design.concentration" else {}
    assert wizard.accept(question, typed_text, answers) == written


def test_defaults_follow_earlier_answers_and_back_changes_the_answer_before(tmp_path):
    answers = list(ANSWERS)
    # "back" at the elevation question returns to the tag, which is then answered anew
    i = next(k for k, (_, what) in enumerate(answers) if what.startswith("elevation"))
    answers[i:i] = [("back", "back to the tag"), ("AHU-9 PHC", "tag, changed")]
    # elevation given; a coil at 30 psig, and the supply left at its default, which
    # follows the coil pressure (the example, 15 psig, would be below it)
    answers[i + 2] = ("1200 ft", "elevation")
    k = next(k for k, (_, what) in enumerate(answers) if what == "coil pressure")
    answers[k] = ("30 psig", "coil pressure")
    answers = [a for a in answers if not a[1].startswith("supply")]
    answers.insert(k + 1, ("", "supply: the default, which follows the coil pressure"))
    out = tmp_path / "ahu9.toml"
    result = _run(tmp_path, answers, [str(out)])
    assert result.exit_code == 0, result.output
    written = unitfile.load(out)
    assert written.tag == "AHU-9 PHC"
    assert written.supply_pressure > written.design.steam_pressure
    assert 'supply_pressure = "40 psig"' in out.read_text(encoding="utf-8")
    assert 'elevation = "1200 ft"' in out.read_text(encoding="utf-8")


def test_a_missing_answer_gives_an_example_in_the_chosen_units():
    question = next(x for x in wizard.QUESTIONS if x.key == "design.flow")
    with pytest.raises(InputError, match='such as "10000 m3/h"'):
        wizard.accept(question, "", {}, system="si")


def test_a_kv_is_written_as_kv_and_read_as_the_same_valve(tmp_path):
    # IEC 60534-1: Kv (m³/h, bar) = 0.865 Cv (US gpm, psi), i.e. Cv = 1.156 Kv.
    answers = [(a, why) if why != "Cv" else ("Kv 15.6", "Kv") for a, why in ANSWERS]
    assert any(why == "Kv" for _, why in answers)
    out = tmp_path / "ahu9.toml"
    result = _run(tmp_path, answers, [str(out)])
    assert result.exit_code == 0, result.output
    text = out.read_text(encoding="utf-8")
    assert "kv = 15.6" in text and "\ncv = " not in text
    assert unitfile.load(out).valve.cv == pytest.approx(15.6 * 1.156, rel=2e-3)


@pytest.mark.parametrize("typed_text, cv, kv", [("12", 12.0, False), ("Cv 12", 12.0, False), ("12 cv", 12.0, False),
                                                ("Kv 10.4", 10.4, True), ("10.4 KV", 10.4, True)])
def test_a_valve_coefficient_as_typed(typed_text, cv, kv):
    question = next(x for x in wizard.QUESTIONS if x.key == "valve.cv")
    value = wizard.accept(question, typed_text, {})
    assert value == cv and isinstance(value, wizard.Kv) is kv


def test_the_summary_before_writing_lists_every_answer(tmp_path):
    out = tmp_path / "ahu9.toml"
    result = _run(tmp_path, ANSWERS, [str(out)])
    assert result.exit_code == 0, result.output
    shown = result.stdout.split("The unit file will hold:", 1)[1]
    written = unitfile.parse(out.read_text(encoding="utf-8"), "x.toml")
    assert written.name in shown
    for key in ("unit.name", "unit.tag", "design.medium", "design.flow", "design.inlet_temperature",
                "design.outlet_temperature", "design.steam_pressure", "steam.supply_pressure", "valve.cv",
                "valve.characteristic", "load.minimum", "drain.arrangement", "drain.trap", "drain.fill_head",
                "drain.lift", "drain.return_pressure"):
        assert f"  {key} = " in shown, key


def test_a_liquid_gets_liquid_defaults_that_are_accepted_and_analyse_sensibly():
    # After "water" the offered flow and temperatures are a heating-water converter's,
    # not the air coil's (6,000 cfm of water at 0 °F would be refused, or a load of
    # over a gigawatt): taking every default gives a unit of a sensible size.
    from stallcheck import analysis

    answers = {"unit.name": "Converter", "design.medium": "water"}
    for x in wizard.asked(answers):
        if x.key in answers or x.optional:
            continue
        answers[x.key] = wizard.accept(x, wizard.suggestion(x, "us", answers), answers, system="us")
    r = analysis.analyse(unitfile.parse(wizard.to_toml(answers), "new.toml"))
    # 90 gpm heated 20 degF: about 0.9 MMBtu/h, 264 kW (water 8.34 lb/gal, cp 1 Btu/(lb·degF))
    assert 200e3 < r.design.load < 350e3


def test_typed_answers_of_nothing_and_spaced_choices_and_the_elevation_range_agree_with_the_file():
    q = {x.key: x for x in wizard.QUESTIONS}
    assert wizard.accept(q["drain.lift"], "0", {}, system="si") == "0 m"        # "(0 if none)"
    assert wizard.accept(q["drain.lift"], "0", {}, system="us") == "0 ft"
    assert wizard.accept(q["drain.arrangement"], "trap vacuum breaker", {}) == "trap-vacuum-breaker"
    # the same elevation range as a unit file's: 7,000 m taken by both, 9,500 m by neither
    assert wizard.accept(q["site.elevation"], "7000 m", {}) == "7000 m"
    with pytest.raises(InputError):
        wizard.accept(q["site.elevation"], "9500 m", {})
    from conftest import BASE_UNIT

    unitfile.parse(BASE_UNIT.replace("[design]", '[site]\nelevation = "7000 m"\n[design]'), "u.toml")
    with pytest.raises(InputError, match="site.elevation"):
        unitfile.parse(BASE_UNIT.replace("[design]", '[site]\nelevation = "9500 m"\n[design]'), "u.toml")
