"""The corpus of bad unit files (tests/bad_units): every command refuses each one with
exit status 2 and one message naming the file and the key, never a traceback."""

import json
import tomllib
from pathlib import Path

import pytest
from conftest import BASE_UNIT
from typer.testing import CliRunner

from stallcheck.cli import app
from stallcheck.errors import InputError
from stallcheck.files import unitfile

runner = CliRunner()
FOLDER = Path(__file__).parent / "bad_units"
EXPECTED = tomllib.loads((FOLDER / "expected.txt").read_text(encoding="utf-8"))
FILES = sorted(FOLDER.glob("*.toml"))


def test_corpus_is_complete():
    assert len(FILES) >= 40
    assert {f.name for f in FILES} == set(EXPECTED)


def _refused(result, path: Path, key: str, says: str, line=None):
    assert result.exit_code == 2, result.output
    assert result.stdout == ""
    assert result.stderr.count("stallcheck:") == 1, result.stderr
    message = result.stderr
    assert str(path) in message
    if key:
        assert f"'{key}'" in message, message
    assert says in message.replace(str(path), ""), message   # not in the file's own name
    if line is not None:
        assert f"line {line}" in message
    assert "Traceback" not in result.output


@pytest.mark.parametrize("path", FILES, ids=lambda p: p.stem)
@pytest.mark.parametrize("command", [["check"], ["check", "--json"], ["chart"], ["diagnose", "--no-ask"]])
def test_every_command_refuses_every_bad_file(command, path):
    e = EXPECTED[path.name]
    result = runner.invoke(app, [*command, str(path)])
    _refused(result, path, e["key"], e["says"], e.get("line"))


def test_survey_names_every_bad_file_and_goes_on(tmp_path):
    good = tmp_path / "good.toml"
    good.write_text(BASE_UNIT, encoding="utf-8")
    result = runner.invoke(app, ["survey", str(FOLDER), str(good), "--json"])
    assert result.exit_code == 2
    lines = [json.loads(line) for line in result.stdout.splitlines()]
    results = [line for line in lines if line["record"] == "result"]
    errors = [line for line in lines if line["record"] == "error"]
    assert len(results) == 1 and results[0]["unit"] == "Test coil"
    named = {Path(e["source"]).name for e in errors}
    assert named == {f.name for f in FILES}
    for e in errors:
        expected = EXPECTED[Path(e["source"]).name]
        assert expected["says"] in e["message"].replace(e["source"], "")
    assert "Traceback" not in result.output


def test_folder_missing_file_and_unreadable_file(tmp_path, monkeypatch):
    result = runner.invoke(app, ["check", str(tmp_path)])
    _refused(result, tmp_path, "", "is a folder")
    missing = tmp_path / "nowhere.toml"
    _refused(runner.invoke(app, ["check", str(missing)]), missing, "", "no such file")
    locked = tmp_path / "locked.toml"
    locked.write_text(BASE_UNIT, encoding="utf-8")

    # Permission is simulated: the tests may run as a user who can read anything.
    def refuse(*args, **kwargs):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr("stallcheck.files.unitfile.open", refuse, raising=False)
    _refused(runner.invoke(app, ["check", str(locked)]), locked, "", "permission denied")


def test_very_large_file_is_refused_without_reading_it(tmp_path, monkeypatch):
    big = tmp_path / "huge.toml"
    with open(big, "wb") as f:
        f.truncate(50 * 1024 * 1024)  # sparse: 50 MB on paper, nothing on disk

    def never(*args, **kwargs):
        raise AssertionError("a 50 MB file must not be read")

    monkeypatch.setattr("stallcheck.files.unitfile.open", never, raising=False)
    _refused(runner.invoke(app, ["check", str(big)]), big, "", "52.4 MB")


@pytest.mark.parametrize("text, key, nearest", [
    (BASE_UNIT.replace('lift = "0 ft"', 'lift = "0 ft"\nretrun_pressure = "0 psig"'), "drain.retrun_pressure",
     "return_pressure"),
    (BASE_UNIT.replace("[valve]", "[vlave]\nx = 1\n[valve]"), "vlave", "valve"),
])
def test_unknown_keys_are_refused_with_the_nearest_known_key(write_unit, text, key, nearest):
    # A misspelt key would leave its default in force and change the verdict silently:
    # it is bad input (exit 2), named with its line and the nearest known key.
    path = write_unit(text)
    for command in (["check", str(path), "--json"], ["check", str(path)], ["survey", str(path)]):
        result = runner.invoke(app, command)
        assert result.exit_code == 2, command
        assert result.stdout == "" or command[0] == "survey"
        assert f"key '{key}'" in result.stderr and f"did you mean '{nearest}'" in result.stderr
        line = text.splitlines().index(next(l for l in text.splitlines() if l.strip().startswith(
            key.rpartition(".")[2]) or l.strip() == f"[{key}]")) + 1
        assert f"line {line}" in result.stderr


def test_unknown_csv_column_is_refused(tmp_path):
    table = tmp_path / "units.csv"
    table.write_text("unit.name,drain.retrun_pressure\nA,0 psig\n", encoding="utf-8")
    result = runner.invoke(app, ["survey", str(table)])
    assert result.exit_code == 2
    assert "drain.retrun_pressure" in result.stderr and "did you mean 'return_pressure'" in result.stderr


def test_nothing_in_a_unit_file_is_run_as_code(write_unit, tmp_path):
    # TOML is data; a value that looks like code is only ever a (bad) string.
    marker = tmp_path / "ran"
    text = BASE_UNIT.replace('flow = "6000 cfm"', f'flow = "__import__(\'os\').mknod(\'{marker}\') cfm"')
    result = runner.invoke(app, ["check", str(write_unit(text))])
    assert result.exit_code == 2 and not marker.exists()
    with pytest.raises(InputError, match="is not '<number> <unit>'"):
        unitfile.parse(text, "x.toml")


def test_pipes_and_devices_are_refused_not_read(tmp_path):
    # A named pipe would block every command forever, and a link to an endless device
    # would read until memory runs out: only regular files are read.
    import os
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)
    for command in (["check", str(fifo)], ["chart", str(fifo)], ["survey", str(fifo)]):
        result = runner.invoke(app, command)
        assert result.exit_code == 2 and "not a regular file" in result.stderr, command
    endless = tmp_path / "endless.toml"
    endless.symlink_to("/dev/zero")
    result = runner.invoke(app, ["check", str(endless)])
    assert result.exit_code == 2 and "not a regular file" in result.stderr


@pytest.mark.parametrize("text, says", [
    ("format = 1\nx = " + "[" * 5000 + "]" * 5000 + "\n", "nested too deeply"),
    ("format = 1\nx = " + "{a = " * 3000 + "1" + "}" * 3000 + "\n", "nested too deeply"),
    (BASE_UNIT.replace('flow = "6000 cfm"', 'flow = "6000 \U0001F525"'), "unknown unit"),
    (BASE_UNIT.replace('flow = "6000 cfm"', 'flow = "6000 ' + "(" * 3000 + "cfm" + ")" * 3000 + '"'),
     "characters long"),
    (BASE_UNIT.replace('inlet_temperature = "-10 degF"', 'inlet_temperature = "10 delta_degC"'),
     "temperature difference"),
])
def test_hostile_text_is_refused_without_a_traceback(write_unit, text, says):
    path = write_unit(text)
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2, result.output
    assert says in result.stderr and "Traceback" not in result.output


def test_a_folder_that_cannot_be_searched_is_named_not_a_traceback(tmp_path, monkeypatch):
    # Permission is simulated (the tests may run as a user who can read anything): the
    # walk meets a sub-folder it cannot list, as os.walk reports it.
    import os as os_module

    from stallcheck.analysis import survey

    (tmp_path / "good.toml").write_text(BASE_UNIT, encoding="utf-8")
    locked = tmp_path / "locked"
    locked.mkdir()
    real_walk = os_module.walk

    def walk(top, onerror=None, **kw):
        if "locked" in str(top):  # os.walk cannot list it: it tells onerror and yields nothing
            onerror(PermissionError(13, "Permission denied", str(top)))
            return
        for root, folders, files in real_walk(top, onerror=onerror, **kw):
            if "locked" in folders:
                folders.remove("locked")
                onerror(PermissionError(13, "Permission denied", str(locked)))
            yield root, folders, files

    monkeypatch.setattr(survey.os, "walk", walk)
    monkeypatch.setattr("stallcheck.files.unitfile.os.access", lambda path, mode: "locked" not in str(path))
    result = runner.invoke(app, ["survey", str(tmp_path)])
    assert result.exit_code == 2 and "Traceback" not in result.output
    assert f"{locked}: is a folder that cannot be read (permission denied)" in result.stderr
    assert "Test coil" in result.stdout


def test_input_warnings_reach_every_command(write_unit, tmp_path):
    text = BASE_UNIT.replace('medium = "air"', 'medium = "air"\nconcentration = "30 %"')
    path = write_unit(text)
    for command in (["chart", str(path)], ["survey", str(path)], ["check", str(path), "--json"],
                    ["report", str(path), "-o", str(tmp_path / "r.md")],
                    ["diagnose", str(path), "--no-ask", "--load", "0.5"]):
        result = runner.invoke(app, command)
        assert result.exit_code in (0, 1), command
        assert "design.concentration ignored" in result.stderr, command
