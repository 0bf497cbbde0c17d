"""Hostile and careless input through every command: no raw control character reaches
a terminal, a pipe, a report or a JSON document; the JSON is strict (RFC 8259: no NaN,
no Infinity); a spreadsheet cannot be made to run a cell (OWASP, "CSV Injection"); and
values outside any plant are refused with their accepted range, never turned into
advice or a Python warning."""

from __future__ import annotations

import csv
import io
import json
import os
import re
import subprocess
import sys

import pytest
from conftest import BASE_UNIT
from typer.testing import CliRunner

from stallcheck.cli import app
from stallcheck.errors import printable

runner = CliRunner()

#: C0 controls other than tab and newline, DEL and C1 (ECMA-48): what a terminal acts on.
RAW_CONTROL = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f]")
#: A name and a tag that would clear the screen, retitle the window and recolour text.
EVIL_NAME = "Coil \x1b[2J\x1b]0;owned\x07 \x9b31m one"
EVIL_TAG = "=HYPERLINK(\"http://x\")\x1b[5m"


def _unit(tmp_path, name=EVIL_NAME, tag=EVIL_TAG, filename="coil.toml"):
    text = BASE_UNIT.replace('name = "Test coil"', f'name = {json.dumps(name)}\ntag = {json.dumps(tag)}')
    path = tmp_path / filename
    path.write_text(text, encoding="utf-8")
    return path


def test_printable_escapes_exactly_the_controls():
    assert printable("a\x1bb\x9bc\x7fd\te\nf°é") == "a\\x1bb\\x9bc\\x7fd\te\nf°é"


@pytest.mark.parametrize("args", [["check"], ["chart"], ["survey"], ["diagnose", "--no-ask", "--load", "0.5"]])
def test_no_raw_control_character_reaches_the_output(tmp_path, args):
    path = _unit(tmp_path)
    result = runner.invoke(app, [*args, str(path)])
    assert result.exit_code in (0, 1), result.output
    assert not RAW_CONTROL.search(result.output), repr(result.output[:400])
    if args[0] in ("check", "survey"):
        assert "\\x1b" in result.output   # the name is shown, escaped


def test_a_file_name_with_controls_is_escaped_in_messages(tmp_path):
    path = tmp_path / "bad\x1b[31m.toml"
    path.write_text("format = 1\n[unit]\n", encoding="utf-8")
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2
    assert not RAW_CONTROL.search(result.output) and "\\x1b[31m" in result.output


@pytest.mark.parametrize("args", [["check", "--json"], ["diagnose", "--no-ask", "--load", "0.5", "--json"],
                                  ["survey", "--json"]])
def test_json_is_strict_and_holds_no_raw_control_character(tmp_path, args):
    path = _unit(tmp_path)
    result = runner.invoke(app, [args[0], str(path), *args[1:]])
    assert result.exit_code in (0, 1), result.output
    assert not RAW_CONTROL.search(result.output)

    def no_constant(name):
        raise ValueError(f"not JSON: {name}")

    if args[0] == "survey":   # JSON Lines: the first line is the unit's result
        data = json.loads(result.output.splitlines()[0], parse_constant=no_constant)
    else:
        data = json.loads(result.output, parse_constant=no_constant)
    unit = data
    assert unit["unit"] == EVIL_NAME   # the name itself travels, escaped in the JSON text


def test_survey_csv_cells_cannot_run_in_a_spreadsheet(tmp_path):
    # OWASP: a cell beginning = + - @ (or tab, carriage return) is prefixed with a quote.
    _unit(tmp_path, name="-cmd|' /C calc'!A0", tag="@SUM(1+1)")
    table = tmp_path / "out.csv"
    result = runner.invoke(app, ["survey", str(tmp_path / "coil.toml"), "--csv", str(table)])
    assert result.exit_code in (0, 1), result.output
    rows = list(csv.DictReader(io.StringIO(table.read_text(encoding="utf-8"))))
    assert rows[0]["name"] == "'-cmd|' /C calc'!A0" and rows[0]["tag"] == "'@SUM(1+1)"
    # numbers stay numbers: a negative figure is not quoted
    assert all(not v.startswith("'") for k, v in rows[0].items() if k not in ("name", "tag"))


@pytest.mark.parametrize("change, key", [
    ('trap_min_differential = "50 psi"\n', "drain.trap_min_differential"),       # beyond any trap (2 bar)
    ('return_line = "0.001 mm"\n', "drain.return_line"),                        # no line is that narrow
])
def test_values_beyond_any_plant_are_refused_with_their_range(tmp_path, change, key):
    path = tmp_path / "u.toml"
    path.write_text(BASE_UNIT + change, encoding="utf-8")
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2 and f"'{key}'" in result.output and "accepted" in result.output, result.output


def test_load_bins_cannot_hold_more_hours_than_a_year(tmp_path):
    # 8,784 h in a leap year (366 x 24).
    bins = "".join(f'[[load.bins]]\ninlet_temperature = "{t} degF"\nhours = 3000\n' for t in (0, 20, 40))
    path = tmp_path / "u.toml"
    path.write_text(BASE_UNIT.replace("[drain]", bins + "[drain]"), encoding="utf-8")
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2 and "9,000 h" in result.output and "8,784" in result.output, result.output


def test_a_reading_hotter_than_any_steam_unit_is_refused(tmp_path):
    path = _unit(tmp_path, name="Plain", tag="P")
    result = runner.invoke(app, ["diagnose", str(path), "--no-ask", "--inlet-temperature", "3000 degF"])
    assert result.exit_code == 2 and "250 °C" in result.output, result.output


def test_a_tiny_cv_is_refused_not_a_numeric_warning(tmp_path):
    path = tmp_path / "u.toml"
    path.write_text(BASE_UNIT.replace("cv = 10", "cv = 1e-300"), encoding="utf-8")
    run = subprocess.run([sys.executable, "-m", "stallcheck", "check", str(path)], capture_output=True, text=True)
    assert run.returncode == 2 and "valve.cv" in run.stderr and "Warning" not in run.stderr, run.stderr


@pytest.mark.parametrize("command", ["check", "survey"])
def test_a_width_of_nothing_is_not_a_page_of_one_character(tmp_path, command):
    path = _unit(tmp_path, name="Plain", tag="P")
    env = dict(os.environ, COLUMNS="0", NO_COLOR="1")
    run = subprocess.run([sys.executable, "-m", "stallcheck", command, str(path)], capture_output=True, text=True,
                         env=env)
    assert run.returncode in (0, 1) and "Traceback" not in run.stderr, run.stderr
    assert max(len(line) for line in run.stdout.splitlines()) > 40


def test_a_utf16_file_is_told_to_be_saved_as_utf8(tmp_path):
    path = tmp_path / "u.toml"
    path.write_bytes(BASE_UNIT.encode("utf-16"))
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2 and "save it as UTF-8" in result.output, result.output


@pytest.mark.parametrize("stdin, says", [("", "end of input"), ("zzz\n" * 50, "no answer accepted in 5 tries")])
def test_diagnose_questions_stop_with_status_2_not_a_verdict(tmp_path, stdin, says):
    # Run with a real stdin (not a terminal): the end of the answers, or the same bad
    # answer again and again, stops the questions with exit 2 and says why.
    path = _unit(tmp_path, name="Plain", tag="P")
    run = subprocess.run([sys.executable, "-m", "stallcheck", "diagnose", str(path), "--ask"], input=stdin,
                         capture_output=True, text=True, timeout=60)
    assert run.returncode == 2 and says in run.stderr and "Aborted" not in run.stderr, run.stderr
    assert "unit file, option" not in run.stderr


def test_new_gives_up_after_repeated_refusals_and_writes_nothing(tmp_path):
    target = tmp_path / "w.toml"
    run = subprocess.run([sys.executable, "-m", "stallcheck", "new", str(target)], input="\n" * 500,
                         capture_output=True, text=True, timeout=60)
    assert run.returncode == 2 and "no answer accepted in 5 tries" in run.stderr, run.stderr
    assert not target.exists()


def test_a_name_with_backslashes_quotes_and_controls_reads_back_the_same():
    # TOML 1.0 basic strings (read back with the standard library's tomllib).
    import tomllib

    from stallcheck import wizard

    name = 'Plant\\Room "B" \x1b\x7f tab\there'
    assert tomllib.loads(wizard.to_toml({"unit.name": name}))["unit"]["name"] == name


def test_noise_words_read_with_spaces_or_hyphens(tmp_path):
    from stallcheck.files import readings, unitfile

    unit = unitfile.load(_unit(tmp_path, name="Plain", tag="P"))
    assert readings.parse(unit, noise="mild weather, Low_Load").noise == ("mild-weather", "low-load")


@pytest.mark.parametrize("args", [["check"], ["survey"], ["diagnose", "--no-ask", "--load", "0.5"]])
def test_on_a_terminal_the_name_s_escape_sequences_are_shown_not_obeyed(tmp_path, args):
    # A pseudo-terminal (POSIX pty): the colours are the program's own; the name's screen
    # clear, window title and C1 introducer arrive escaped as text.
    import pty

    path = _unit(tmp_path)
    leader, follower = pty.openpty()
    run = subprocess.Popen([sys.executable, "-m", "stallcheck", args[0], str(path), *args[1:]],
                           stdin=follower, stdout=follower, stderr=follower)
    os.close(follower)
    out = b""
    while True:
        try:
            chunk = os.read(leader, 65536)
        except OSError:
            break
        if not chunk:
            break
        out += chunk
    os.close(leader)
    assert run.wait(timeout=60) in (0, 1)
    assert b"\x1b[2J" not in out and b"\x1b]0;owned" not in out and "\x9b".encode() not in out
    assert b"\\x1b[2J" in out


def test_a_kv_file_reads_kv_in_every_figure_of_the_valve(tmp_path):
    # IEC 60534-1: Kv (m³/h of water at 1 bar) = Cv / 1.156. A unit file that gives kv
    # sees Kv in the valve section, the findings and what to do; never a Cv.
    text = BASE_UNIT.replace("cv = 10", "kv = 4")   # too small: floods the coil
    path = tmp_path / "kv.toml"
    path.write_text(text, encoding="utf-8")
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code in (0, 1), result.output
    assert "Kv 4 installed" in result.output and "Cv" not in result.output, result.output
