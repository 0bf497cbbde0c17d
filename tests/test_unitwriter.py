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
