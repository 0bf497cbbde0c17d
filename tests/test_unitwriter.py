"""Units written back to unit-file text read back as the same units."""

import math
from dataclasses import asdict
from pathlib import Path

import pytest
from conftest import SAMPLES

from stallcheck.files import unitfile, unitwriter


def _close(a, b, path=""):
    if isinstance(a, dict):
        assert set(a) == set(b), path
        for k in a:
            _close(a[k], b[k], f"{path}.{k}")
    elif isinstance(a, (list, tuple)):
        assert len(a) == len(b), path
        for x, y in zip(a, b):
            _close(x, y, path)
    elif isinstance(a, float):
        assert math.isclose(a, b, rel_tol=1e-8, abs_tol=1e-8), (path, a, b)
    else:
        assert a == b, (path, a, b)


@pytest.mark.parametrize("system", ["us", "si"])
@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.stem)
def test_every_sample_round_trips_in_both_unit_systems(sample, system):
    unit = unitfile.load(sample)
    again = unitfile.parse(unitwriter.dumps(unit, system), "written.toml")
    a, b = asdict(unit), asdict(again)
    for key in ("source", "defaults", "warnings", "system"):
        a.pop(key), b.pop(key)
    weather = a["site"].pop("weather"), b["site"].pop("weather")
    _close(a, b)
    if unit.site.weather is not None:
        # the same file, named by its absolute path
        assert again.site.weather.resolved == unit.site.weather.resolved
        assert (again.site.weather.dry_bulb == unit.site.weather.dry_bulb).all()
    else:
        assert weather == (None, None)
    assert again.system == system


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.name)
def test_editing_a_sample_changes_only_the_changed_lines(sample):
    # Every value explore changes, changed at once: the file written back differs from
    # the user's only on those lines, in the user's own units, at the precision shown
    # on screen, with comments kept; and it reads back to the changed values.
    import difflib

    from stallcheck import tui
    from stallcheck.files import unitwriter

    text = sample.read_text(encoding="utf-8")
    original = unitfile.parse(text, str(sample))
    changed = original
    for knob in ("lift", "return", "fill", "design", "minimum"):
        changed = tui.nudged(changed, knob, +1, original.system)
    edited = unitwriter.edit(text, original, changed, original.system, folder=sample.parent)
    diff = [line for line in difflib.unified_diff(text.splitlines(), edited.splitlines(), lineterm="", n=0)
            if line[:1] in "+-" and not line.startswith(("+++", "---"))]
    removed = [line[1:] for line in diff if line.startswith("-")]
    changed_keys = ("lift", "return_pressure", "fill_head", "steam_pressure", "minimum")
    assert all(line.split("=")[0].strip() in changed_keys for line in removed), removed
    assert len(removed) <= 5
    again = unitfile.parse(edited, str(sample.parent / "edited.toml"))
    # within the precision shown on screen
    assert again.drain.lift == pytest.approx(changed.drain.lift, abs=0.005 * 0.3048 * 10)
    assert again.drain.fill_head == pytest.approx(changed.drain.fill_head, abs=0.005 * 0.3048 * 10)
    assert again.load.minimum == pytest.approx(changed.load.minimum, abs=0.005)
    assert again.drain.return_pressure == pytest.approx(changed.drain.return_pressure, abs=350.0)
    # the user's comments are all still there
    comments = [line.split("#", 1)[1] for line in text.splitlines() if "#" in line]
    assert all(c in edited for c in comments)


def test_a_changed_value_keeps_the_file_s_own_unit_and_shown_precision():
    from dataclasses import replace

    from stallcheck.files import unitwriter

    text = ('format = 1\n[unit]\nname = "t"\n[site]\nelevation = "850 ft"   # the plant\n[design]\nmedium = "air"\n'
            'flow = "6000 cfm"\ninlet_temperature = "0 degF"\noutlet_temperature = "55 degF"\n'
            'steam_pressure = "5 psig"\n[steam]\nsupply_pressure = "15 psig"\n[drain]\narrangement = "trap"\n'
            'fill_head = "18 in"   # to the trap inlet\nlift = "0 ft"\nreturn_pressure = "0 psig"\n')
    unit = unitfile.parse(text, "t.toml")
    changed = replace(unit, drain=replace(unit.drain, return_pressure=unit.drain.return_pressure + 0.475072189 * 6894.757,
                                          fill_head=unit.drain.fill_head + 0.3048))
    edited = unitwriter.edit(text, unit, changed, "us")
    assert 'return_pressure = "0.5 psig"' in edited
    assert 'fill_head = "30 in"   # to the trap inlet' in edited
    assert 'elevation = "850 ft"   # the plant' in edited and "atmospheric_pressure" not in edited


@pytest.mark.parametrize("system", ["us", "si"])
def test_the_return_line_keys_round_trip(system):
    from conftest import BASE_UNIT

    text = BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "pump-trap"') + (
        'return_line = "1 in"\nreturn_length = "100 ft"\nreturn_pitch = "-0.5 %"\nreturn_material = "copper"\n'
        'return_wall = "0.065 in"\nreturn_rating = "125 psig"\npump_rate = "2500 lb/h"\ncheck_closing_time = "0.4 s"\n')
    unit = unitfile.parse(text, "line.toml")
    again = unitfile.parse(unitwriter.dumps(unit, system), "written.toml")
    a, b = asdict(unit)["drain"], asdict(again)["drain"]
    _close(a, b)
    assert b["return_material"] == "copper" and b["check_closing_time"] == pytest.approx(0.4)


def test_a_kv_file_edited_keeps_kv_and_reads_back():
    # Kv = Cv / 1.156 (IEC 60534-1: Kv in m³/h at 1 bar, Cv in US gpm at 1 psi). A file
    # that gives kv, its valve changed, keeps kv (never kv and cv together, which is refused).
    from dataclasses import replace

    from test_diagnosis import HOT_WATER

    unit = unitfile.parse(HOT_WATER, "heater.toml")
    changed = replace(unit, valve=replace(unit.valve, cv=unit.valve.cv * 1.1))
    text = unitwriter.edit(HOT_WATER, unit, changed)
    assert "kv = 44" in text and "cv =" not in text
    assert unitfile.parse(text, "heater.toml").valve.cv == pytest.approx(44 * 1.156, rel=1e-12)


def test_a_unit_saved_in_another_folder_still_names_its_weather_file(tmp_path):
    # explore saves a copy where the user says: the weather file's relative path is
    # rewritten from there, and the copy reads the same year
    from conftest import ROOT

    sample = ROOT / "sample_units" / "us_makeup_air_greensboro.toml"
    original = unitfile.load(sample)
    for text in (unitwriter.edit(sample.read_text(encoding="utf-8"), original, original, folder=tmp_path),
                 unitwriter.dumps(original, folder=tmp_path)):
        saved = tmp_path / "copy.toml"
        saved.write_text(text, encoding="utf-8")
        again = unitfile.load(saved)
        assert again.site.weather.resolved == original.site.weather.resolved
        assert not Path(again.site.weather.path).is_absolute()


#: Two units that give, between them, every key the samples leave out: an atmospheric
#: pressure, a steam price, a Kv, mixed air on a weather year with a season and hours,
#: a capacity table, a pump-trap table; a mass flow whose flow varies, bins by load, a
#: purge's rate, every layout key.
EVERY_KEY = ['''
format = 1
[unit]
name = "Quarry Lane AHU-3 preheat"
tag = "AHU-3"
[site]
atmospheric_pressure = "98.5 kPaa"
weather = "{weather}"
hours_per_year = 4000
steam_price = 18.5
steam_price_per = "1000 lb"
currency = "USD"
[design]
medium = "air"
flow = "9000 cfm"
inlet_temperature = "10 degF"
outlet_temperature = "55 degF"
steam_pressure = "6 psig"
ua_flow_exponent = 0.8
method = "mean-temperature"
[steam]
supply_pressure = "15 psig"
[valve]
kv = 15
characteristic = "linear"
rangeability = 30
xt = 0.6
[load]
minimum = 0.1
outdoor_air_minimum = 0.3
return_air_temperature = "68 degF"
mixed_air_temperature = "50 degF"
season = "Oct-Apr"
daily_hours = "06:00-22:00"
[drain]
arrangement = "pump-trap"
trap = "inverted-bucket"
fill_head = "20 in"
lift = "10 ft"
return_pressure = "2 psig"
trap_min_differential = "0.25 psi"
trap_max_differential = "30 psi"
capacity_margin = 2.5
motive_pressure = "60 psig"
pump_fill_head = "12 in"
[[drain.capacity]]
differential = "0.25 psi"
flow = "700 lb/h"
[[drain.capacity]]
differential = "5 psi"
flow = "2400 lb/h"
[[drain.pump_capacity]]
back_pressure = "5 psig"
flow = "3000 lb/h"
[[drain.pump_capacity]]
back_pressure = "15 psig"
flow = "2200 lb/h"
''', '''
format = 1
[unit]
name = "Quarry Lane HX-2"
[site]
elevation = "300 m"
[design]
medium = "ethylene-glycol"
concentration = "35 %"
flow = "9000 kg/h"
inlet_temperature = "40 degC"
outlet_temperature = "70 degC"
steam_pressure = "1.5 barg"
[steam]
supply_pressure = "4 barg"
[valve]
cv = 9.5
characteristic = "equal-percentage"
[load]
varies = "flow"
minimum = 0.2
[[load.bins]]
load = 0.4
hours = 3000
[[load.bins]]
load = 0.9
hours = 1200
[drain]
arrangement = "constant-purge"
trap = "float-thermostatic"
fill_head = "0.4 m"
purge_rate = "6 kg/h"
trap_orifice = "9 mm"
[geometry]
tubes = "vertical"
supply_feed = "end"
distributing_tubes = true
pitched_to_return = true
coils_per_trap = 1
drop_to_trap = "0.6 m"
drop_vented = true
drip_before_valve = true
''']


@pytest.mark.parametrize("system", ["us", "si"])
@pytest.mark.parametrize("which", [0, 1])
def test_a_unit_giving_every_key_reads_back_the_same(which, system):
    from conftest import ROOT

    weather = ROOT / "sample_units" / "weather" / "greensboro_723170_tmy3_drybulb.csv"
    unit = unitfile.parse(EVERY_KEY[which].replace("{weather}", str(weather)), "quarry.toml")
    again = unitfile.parse(unitwriter.dumps(unit, system), "written.toml")
    a, b = asdict(unit), asdict(again)
    for key in ("source", "defaults", "warnings", "system"):
        a.pop(key), b.pop(key)
    a["site"].pop("weather"), b["site"].pop("weather")
    _close(a, b)
    # the keys the file gave are the written file's too, none left to a default
    assert not [d for d in again.defaults if d.split(" =")[0] not in {x.split(" =")[0] for x in unit.defaults}]
