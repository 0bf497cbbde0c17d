"""Pages wrap as rich wraps (rich is the reference here: the terminal prints through it),
print plain to a pipe without loading rich, and in colour on a terminal."""

import io
import subprocess
import sys

from hypothesis import given, settings
from hypothesis import strategies as st
from rich.console import Console
from rich.padding import Padding
from rich.table import Table
from rich.text import Text

from stallcheck.render import page

WORDS = st.lists(st.text(alphabet="abcdefghij-.,()°/%", min_size=1, max_size=14), min_size=0, max_size=40)


def _rich(renderable, width: int) -> str:
    console = Console(width=width, file=io.StringIO(), color_system=None, highlight=False)
    with console.capture() as captured:
        console.print(renderable)
    return "".join(line.rstrip() + "\n" for line in captured.get().split("\n")[:-1])


@settings(max_examples=200, deadline=None)
@given(words=WORDS, width=st.integers(20, 120), indent=st.integers(0, 12))
def test_a_paragraph_wraps_as_rich_wraps_it(words, width, indent):
    text = " ".join(words)
    ours = page.plain([page.para(text, indent)], width)
    theirs = _rich(Padding(Text(text), (0, 0, 0, indent)), width)
    assert ours == theirs


@settings(max_examples=100, deadline=None)
@given(words=WORDS, width=st.integers(30, 120))
def test_a_bullet_wraps_as_a_rich_grid_wraps_it(words, width):
    text = " ".join(words)
    grid = Table.grid(padding=(0, 1))
    grid.add_column(width=3, justify="right")
    grid.add_column()
    grid.add_row("-", Text(text))
    assert page.plain(page.bullets([text]), width) == _rich(grid, width)


def test_a_terminal_gets_colour_and_the_same_words(monkeypatch):
    monkeypatch.delenv("NO_COLOR", raising=False)
    monkeypatch.setenv("TERM", "xterm-256color")

    class Tty(io.StringIO):
        def isatty(self):
            return True

    blocks = [page.heading("Drainage"), page.Para(page.runs("  installed trap: ", ("NOT ADEQUATE", "bold red")), 0)]
    tty = Tty()
    page.emit(blocks, 80, tty)
    coloured = tty.getvalue()
    assert "\x1b[" in coloured
    import re

    assert re.sub(r"\x1b\[[0-9;]*m", "", coloured) == page.plain(blocks, 80)


def test_a_check_to_a_pipe_does_not_load_rich():
    code = ("import sys, io, contextlib\nfrom stallcheck.cli import main\nsys.argv = ['stallcheck', 'check', "
            "'sample_units/us_outdoor_air_preheat.toml']\nbuf = io.StringIO()\n"
            "try:\n    with contextlib.redirect_stdout(buf):\n        main()\nexcept SystemExit:\n    pass\n"
            "assert 'STALL CHART' in buf.getvalue()\nprint([m for m in sys.modules if m.split('.')[0] == 'rich'])")
    from conftest import ROOT

    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT, check=True)
    assert out.stdout.strip() == "[]"


def test_a_long_path_is_folded_after_a_folder_not_inside_a_name():
    # Common practice of terminals and editors: a path too long for a line breaks at a
    # separator, so every folder and file name reads whole.
    from stallcheck.render import terminal

    path = "/srv/plant-records/" + "north-boiler-house-air-handlers/" * 2 + "ahu-12-preheat-coil.toml"
    for width in (40, 60, 80):
        lines = terminal.fold_path(path, width)
        assert "".join(lines) == path and all(len(line) <= width for line in lines)
        assert all(line.endswith("/") for line in lines[:-1])
    assert terminal.fold_path("air; load varies with flow", 80) == ["air; load varies with flow"]
    # a name with no separator longer than the line is cut at the width
    assert terminal.fold_path("x" * 90, 40) == ["x" * 40, "x" * 40, "x" * 10]
