"""stallcheck explore, driven headless with Textual's own test driver: keys move the
stall point exactly as the analysis says, saving never overwrites unasked."""

import asyncio
from dataclasses import replace

import pytest
from conftest import BASE_UNIT, SAMPLES

from stallcheck import analysis, tui
from stallcheck.files import unitfile

FT = 0.3048
PSI = 6894.757293168


def _unit(tmp_path, text=BASE_UNIT):
    path = tmp_path / "coil.toml"
    path.write_text(text, encoding="utf-8")
    return unitfile.load(path), path


def _run(app, script):
    async def go():
        async with app.run_test(size=(100, 40)) as pilot:
            await script(pilot)
    asyncio.run(go())


def test_keys_move_the_stall_point_as_the_analysis_says(tmp_path):
    unit, _ = _unit(tmp_path)
    app = tui.Explorer(unit)
    seen = {}

    async def script(pilot):
        seen["before"] = app.result.stall.load_fraction
        await pilot.press("L", "L")          # two feet more lift
        seen["lift"] = app.result.stall.load_fraction
        seen["status"] = str(app.query_one("#status").content)
        await pilot.press("l", "l", "F")    # back, then three inches more fill head
        seen["fill"] = app.result.stall.load_fraction
        await pilot.press("P")              # a psi more design pressure
        seen["design"] = app.result.stall.load_fraction

    _run(app, script)
    more_lift = replace(unit, drain=replace(unit.drain, lift=2 * FT))
    assert seen["lift"] == pytest.approx(analysis.analyse(more_lift).stall.load_fraction, rel=1e-12)
    assert seen["lift"] > seen["before"]
    assert f"below {seen['lift']:.0%} load" in seen["status"]
    more_fill = replace(unit, drain=replace(unit.drain, fill_head=unit.drain.fill_head + 3 * 0.0254))
    assert seen["fill"] == pytest.approx(analysis.analyse(more_fill).stall.load_fraction, rel=1e-9)
    hotter = replace(more_fill, design=replace(more_fill.design, steam_pressure=unit.design.steam_pressure + PSI))
    assert seen["design"] == pytest.approx(analysis.analyse(hotter).stall.load_fraction, rel=1e-9)
    assert seen["design"] < seen["fill"]


def test_a_change_the_unit_cannot_take_is_refused_in_words(tmp_path):
    unit, _ = _unit(tmp_path)
    app = tui.Explorer(unit)

    async def script(pilot):
        await pilot.press(*["P"] * 12)       # the design pressure cannot pass the 15 psig supply

    _run(app, script)
    assert app.unit.design.steam_pressure < app.unit.supply_pressure
    assert "not changed" in app.message


def test_differences_and_save_as_a_new_file(tmp_path):
    unit, path = _unit(tmp_path)
    app = tui.Explorer(unit)
    variant = tmp_path / "coil-variant.toml"

    async def script(pilot):
        await pilot.press("R", "c", "d")
        page = str(app.screen.query_one("#page").content)
        assert "drain.return_pressure: 0.0 psig -> 1.0 psig" in page and "valve.cv: 10 -> 9.09" in page
        await pilot.press("escape", "s", "enter")

    _run(app, script)
    assert app.saved == variant
    saved = unitfile.load(variant)
    assert saved.drain.return_pressure == pytest.approx(unit.drain.return_pressure + PSI, rel=1e-8)
    # written as shown on screen (three figures), the rest of the user's file untouched
    assert saved.valve.cv == pytest.approx(9.09, rel=1e-12)
    assert path.read_text(encoding="utf-8") == BASE_UNIT
    original, written = BASE_UNIT.splitlines(), variant.read_text(encoding="utf-8").splitlines()
    assert sorted(a for a, b in zip(original, written) if a != b) == ['cv = 10', 'return_pressure = "0 psig"']
    assert 'return_pressure = "1 psig"' in written and "cv = 9.09" in written


def test_saving_over_a_file_needs_a_yes(tmp_path):
    unit, path = _unit(tmp_path)
    app = tui.Explorer(unit)

    async def script(pilot):
        await pilot.press("L", "s")
        app.screen.query_one("#answer").value = str(path)   # over the original ...
        await pilot.press("enter", "enter")                 # ... and the default answer, no
    _run(app, script)
    assert path.read_text(encoding="utf-8") == BASE_UNIT and app.saved is None
    assert "not saved" in app.message


def test_every_sample_opens(tmp_path):
    for sample in SAMPLES:
        app = tui.Explorer(unitfile.load(sample))

        async def script(pilot):
            await pilot.press("m", "M")
        _run(app, script)
        assert app.result.unit == unitfile.load(sample).name
