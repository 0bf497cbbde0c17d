"""stallcheck explore, driven headless with Textual's own test driver: keys move the
stall point exactly as the analysis says, saving never overwrites unasked."""

import asyncio
import math
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
        assert app.result.name == unitfile.load(sample).name


# --- the layout at 80x24 and 120x40 ---------------------------------------------------

def _screen_text(app) -> list[str]:
    """The screen as plain text, one string per row."""
    import io

    from rich.console import Console

    width, height = app.size
    console = Console(width=width, height=height, file=io.StringIO(), record=True, color_system=None)
    console.print(app.screen._compositor.render_update(full=True, screen_stack=app._background_screens))
    return console.export_text().splitlines()


@pytest.mark.parametrize("size", [(80, 24), (120, 40)], ids=["80x24", "120x40"])
def test_the_whole_what_if_loop_fits_the_terminal(size):
    # Everything a user needs is on the screen at once: the chart with its whole x axis,
    # the stall point, the verdict, every nudge key with its value, the was -> now line,
    # and the footer's keys (? for the rest).
    for sample in SAMPLES:
        app = tui.Explorer(unitfile.load(sample))
        seen = {}

        async def script(pilot):
            await pilot.press("L", "L", "m")
            await pilot.pause()
            seen["rows"] = _screen_text(app)

        async def go():
            async with app.run_test(size=size) as pilot:
                await script(pilot)
        asyncio.run(go())
        rows = seen["rows"]
        text = "\n".join(rows)
        assert len(rows) == size[1]
        assert any(r.rstrip().endswith("100") for r in rows), sample.name   # the x axis is whole
        assert "load, % of design" in text
        assert "stall point:" in text and "drainage: needs" in text, sample.name
        for key in ("l/L", "r/R", "f/F", "p/P", "c/C", "m/M"):
            assert key in text, (sample.name, key)
        assert "was -> now: lift" in text, sample.name
        assert "? keys" in rows[-1] and "q quit" in rows[-1]
        assert all(len(r.rstrip()) <= size[0] for r in rows)


def test_the_chart_follows_a_resized_window():
    unit = unitfile.load(SAMPLES[0])
    app = tui.Explorer(unit)
    seen = {}

    async def go():
        async with app.run_test(size=(80, 24)) as pilot:
            seen["small"] = app.query_one("#chart").content.plain.splitlines()
            await pilot.resize_terminal(120, 40)
            await pilot.pause()
            seen["large"] = app.query_one("#chart").content.plain.splitlines()
    asyncio.run(go())
    assert len(seen["large"]) > len(seen["small"])
    assert max(map(len, seen["large"])) > max(map(len, seen["small"]))


def test_help_lists_every_key(tmp_path):
    unit, _ = _unit(tmp_path)
    app = tui.Explorer(unit)
    seen = {}

    async def script(pilot):
        await pilot.press("question_mark")
        seen["page"] = str(app.screen.query_one("#page").content)
        await pilot.press("escape")
        seen["back"] = app.screen is app.screen_stack[0]

    _run(app, script)
    for keys in ("l L", "r R", "f F", "p P", "c C", "m M", "d ", "s ", "q "):
        assert f"  {keys}" in seen["page"], keys
    assert seen["back"]


def test_quitting_with_changes_not_saved_asks_first(tmp_path):
    unit, _ = _unit(tmp_path)
    app = tui.Explorer(unit)
    seen = {}

    async def script(pilot):
        await pilot.press("L", "q")
        seen["asked"] = isinstance(app.screen, tui.AskScreen)
        await pilot.press("enter")                  # the default answer: no
        seen["still"] = app.is_running and not isinstance(app.screen, tui.AskScreen)
        await pilot.press("q")
        app.screen.query_one("#answer").value = "yes"
        await pilot.press("enter")
        await pilot.pause()

    _run(app, script)
    assert seen["asked"] and seen["still"]
    assert "not quit" in app.message
    assert app.return_code == 0


def test_quitting_with_nothing_changed_or_everything_saved_does_not_ask(tmp_path):
    unit, _ = _unit(tmp_path)
    app = tui.Explorer(unit)

    async def script(pilot):
        await pilot.press("q")
        await pilot.pause()
    _run(app, script)
    assert app.return_code == 0

    app = tui.Explorer(unit)
    seen = {}

    async def saved(pilot):
        await pilot.press("L", "s", "enter", "q")
        await pilot.pause()
        seen["asked"] = isinstance(app.screen, tui.AskScreen)
    _run(app, saved)
    assert app.saved is not None and not seen["asked"] and app.return_code == 0


def test_was_and_now_name_the_inputs_and_results_that_changed(tmp_path):
    unit, _ = _unit(tmp_path)
    app = tui.Explorer(unit)
    seen = {}

    async def script(pilot):
        await pilot.press("L", "L")
        seen["status"] = str(app.query_one("#status").content)
    _run(app, script)
    before = analysis.analyse(unit).stall.load_fraction
    after = analysis.analyse(replace(unit, drain=replace(unit.drain, lift=2 * FT))).stall.load_fraction
    status = " ".join(seen["status"].split())
    assert "lift 0.0 ft -> 2.0 ft" in status
    # the stall load rounded up (the safe way), as every section prints it
    up = [math.ceil(x * 100 - 1e-9) for x in (before, after)]
    assert f"coil stalls below {up[0]}% load -> stalls below {up[1]}% load" in status


def test_without_a_terminal_explore_refuses_with_exit_2():
    from typer.testing import CliRunner

    from stallcheck.cli import app

    run = CliRunner().invoke(app, ["explore", str(SAMPLES[0])], input="")
    assert run.exit_code == 2
    assert "interactive terminal" in run.stderr and not run.stdout


@pytest.mark.parametrize("size", [(80, 24), (120, 40)], ids=["80x24", "120x40"])
def test_screens_match_their_snapshots(snap_compare, size):
    # Regression pins of the layout (pytest-textual-snapshot): after two steps of lift
    # on the vacuum-breaker sample, and with the key page open.
    sample = next(s for s in SAMPLES if s.name == "us_vacuum_breaker_gravity.toml")
    assert snap_compare(tui.Explorer(unitfile.load(sample)), terminal_size=size, press=["L", "L"])
    assert snap_compare(tui.Explorer(unitfile.load(sample)), terminal_size=size, press=["question_mark"])


def _in_a_terminal(keys: list[bytes], seconds: float = 20.0) -> tuple[int | None, str]:
    """Run ``stallcheck explore`` on a sample in a pseudo-terminal (80x24), send
    ``keys`` one by one once the first screen is up, and return its exit status (None
    where it did not end) and what it drew."""
    import fcntl
    import os
    import pty
    import select
    import signal
    import struct
    import sys
    import termios
    import time

    pid, fd = pty.fork()
    if pid == 0:
        os.environ.update(COLUMNS="80", LINES="24", TERM="xterm-256color")
        os.execv(sys.executable, [sys.executable, "-m", "stallcheck", "explore", str(SAMPLES[0])])
    fcntl.ioctl(fd, termios.TIOCSWINSZ, struct.pack("HHHH", 24, 80, 0, 0))
    seen, sent, start, status = b"", 0, time.monotonic(), None
    next_at = None
    while time.monotonic() - start < seconds and status is None:
        ready, _, _ = select.select([fd], [], [], 0.05)
        if ready:
            try:
                seen += os.read(fd, 65536)
            except OSError:
                pass
        if next_at is None and b"stall point" in seen:
            next_at = time.monotonic() + 0.5
        if next_at is not None and sent < len(keys) and time.monotonic() >= next_at:
            os.write(fd, keys[sent])
            sent, next_at = sent + 1, time.monotonic() + 0.5
        done, code = os.waitpid(pid, os.WNOHANG)
        if done:
            status = os.waitstatus_to_exitcode(code)
    if status is None:
        os.kill(pid, signal.SIGKILL)
        os.waitpid(pid, 0)
    os.close(fd)
    return status, seen.decode("utf-8", "replace")


@pytest.mark.skipif(__import__("sys").platform == "win32", reason="a pseudo-terminal")
def test_a_byte_that_is_not_utf8_typed_into_explore_is_passed_over():
    # A stray byte from a terminal set to another encoding: the keys after it still
    # work (l lowers the lift, so q asks about the unsaved change), and n then q quits
    # cleanly: no traceback, no hang.
    status, drawn = _in_a_terminal([b"\xff", b"l", b"q", b"n\r", b"q", b"yes\r"])
    assert "Traceback" not in drawn and "UnicodeDecodeError" not in drawn
    assert "not saved" in drawn
    assert status == 0
