"""The command line: exit status, the JSON contract, plain output, fast start."""

import json
import os
import subprocess
import sys

import pytest
from conftest import BASE_UNIT, SAMPLES
from typer.testing import CliRunner

from stallcheck.cli import app

runner = CliRunner()

CONTRACT = ["format", "unit", "method", "back_pressure_kpa", "design", "stall", "stalled_hours", "points",
            "drainage", "valve", "findings"]


def test_help_does_not_import_heavy_modules():
    code = ("import sys\nfrom stallcheck.cli import app\n"
            "from typer.testing import CliRunner\n"
            "r = CliRunner().invoke(app, ['--help'])\nassert r.exit_code == 0, r.output\n"
            "heavy = [m for m in ('CoolProp', 'scipy', 'pint') if m in sys.modules]\n"
            "print(','.join(heavy))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.name)
def test_every_sample_checks_with_contract_json(sample):
    result = runner.invoke(app, ["check", str(sample), "--json"])
    assert result.exit_code in (0, 1), result.output
    data = json.loads(result.stdout)
    for key in CONTRACT:
        assert key in data
    for key in ("load_kw", "steam_kg_h", "coil_pressure_kpa"):
        assert key in data["design"]
    for key in ("occurs", "load_fraction", "coil_pressure_kpa", "steam_temperature_c", "condensate_kg_h",
                "inlet_temperature_c"):
        assert key in data["stall"]
    for key in ("installed", "required", "adequate", "reasons"):
        assert key in data["drainage"]
    for key in ("required_cv_design", "opening_design", "capacity_ok", "limited_load_fraction",
                "limited_coil_pressure_kpa"):
        assert key in data["valve"]
    point = data["points"][50]
    for key in ("load_fraction", "coil_pressure_kpa", "steam_temperature_c", "steam_kg_h",
                "drain_differential_kpa", "stalled", "valve_opening"):
        assert key in point
    assert all(f["severity"] in ("info", "warning", "danger") for f in data["findings"])
    # exit status follows the contract
    worst_bad = any(f["severity"] != "info" for f in data["findings"])
    assert result.exit_code == (1 if worst_bad or not data["drainage"]["adequate"] else 0)


def test_check_prints_plain_text_at_80_columns(tmp_path):
    env = dict(os.environ, NO_COLOR="1", COLUMNS="80")
    out = subprocess.run([sys.executable, "-m", "stallcheck", "check", str(SAMPLES[0])],
                         capture_output=True, text=True, env=env)
    assert out.returncode in (0, 1)
    assert "\x1b[" not in out.stdout
    assert max(len(line) for line in out.stdout.splitlines()) <= 80
    for heading in ("STALL POINT", "DRAINAGE", "FINDINGS", "STALL CHART", "CAUTION"):
        assert heading in out.stdout
    assert "local codes" in " ".join(out.stdout.split())


def test_bad_file_exits_2_without_traceback(tmp_path):
    path = tmp_path / "bad.toml"
    path.write_text(BASE_UNIT.replace('"5 psig"', '"5 psi"'))
    result = runner.invoke(app, ["check", str(path)])
    assert result.exit_code == 2
    assert "bad.toml" in result.stderr and "design.steam_pressure" in result.stderr
    assert "Traceback" not in result.output


def test_missing_file_exits_2():
    result = runner.invoke(app, ["check", "no/such/unit.toml"])
    assert result.exit_code == 2 and "no such file" in result.stderr


def test_units_option_switches_display(tmp_path):
    path = tmp_path / "u.toml"
    path.write_text(BASE_UNIT)
    us = runner.invoke(app, ["check", str(path)])
    si = runner.invoke(app, ["check", str(path), "--units", "si"])
    assert "psig" in us.stdout and "barg" in si.stdout and "psig" not in si.stdout


def test_chart_command_uses_entering_temperature_axis(tmp_path):
    path = tmp_path / "u.toml"
    path.write_text(BASE_UNIT)
    result = runner.invoke(app, ["chart", str(path)])
    assert "entering temperature" in result.stdout and "X" in result.stdout
    loads = runner.invoke(app, ["chart", str(path), "--x", "load"])
    assert "load, % of design" in loads.stdout


def test_demo_runs():
    result = runner.invoke(app, ["demo", "--json"])
    assert result.exit_code in (0, 1)
    assert json.loads(result.stdout)["unit"].startswith("Harrow Street")


def test_motive_pressure_below_back_pressure_exits_2(write_unit):
    text = BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "pump-trap"').replace(
        'lift = "0 ft"', 'lift = "20 ft"') + 'motive_pressure = "3 psig"\n'
    result = runner.invoke(app, ["check", str(write_unit(text))])
    assert result.exit_code == 2
    assert "drain.motive_pressure" in result.stderr and "back pressure" in result.stderr
    assert "Traceback" not in result.output


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.name)
def test_check_shows_drain_devices_and_remedies(sample):
    result = runner.invoke(app, ["check", str(sample)], env={"NO_COLOR": "1", "COLUMNS": "80"})
    out = result.stdout
    assert "drainage limit:" in out
    assert "FLASH STEAM AT THE TRAP OUTLET" in out
    data = json.loads(runner.invoke(app, ["check", str(sample), "--json"]).stdout)
    assert {"trap", "pump_trap", "purge", "flash", "remedies", "advice"} <= set(data)
    if data["drainage"]["installed"] == "pump-trap":
        # a pump-trap drains at every load: nothing to change, nothing prescribed
        assert data["remedies"] == [] and data["advice"]["mode"] == "none"
        assert "WHAT TO DO" in out and "Nothing to change in the drainage" in out
        return
    assert "WHAT TO DO" in out or "MARGINS" in out
    for key in ("drain.lift", "drain.return_pressure", "drain.trap_min_differential", "drain.fill_head",
                "design.steam_pressure"):
        assert key in out
    assert len(data["remedies"]) == 5


def test_no_check_imports_pint_even_with_a_home_folder_it_cannot_write(tmp_path):
    # pint's answers for every spelling of the samples ship with the package: a first
    # check, with an empty cache folder that cannot be written, needs no pint.
    home = tmp_path / "home"
    home.mkdir()
    home.chmod(0o555)
    env = dict(os.environ, HOME=str(home), XDG_CACHE_HOME=str(home / "cache"), NO_COLOR="1")
    for sample in SAMPLES:
        code = ("import sys\nfrom stallcheck.cli import app\n"
                "from typer.testing import CliRunner\n"
                f"r = CliRunner().invoke(app, ['check', {str(sample)!r}])\nassert r.exit_code in (0, 1), r.output\n"
                "print('pint' in sys.modules)")
        run = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, env=env)
        assert run.stdout.strip() == "False", sample.name


def test_a_spelling_outside_the_grammar_is_refused_and_nothing_is_written_at_home(tmp_path):
    # A unit pint knows but the grammar does not (furlongs) is refused, without pint
    # being imported and without anything written to a cache folder.
    unit = tmp_path / "u.toml"
    unit.write_text(BASE_UNIT.replace('fill_head = "18 in"', 'fill_head = "0.00227 furlong"'), encoding="utf-8")
    env = dict(os.environ, XDG_CACHE_HOME=str(tmp_path / "cache"), HOME=str(tmp_path / "home"), NO_COLOR="1")
    code = ("import sys\nfrom stallcheck.cli import app\n"
            "from typer.testing import CliRunner\n"
            f"r = CliRunner().invoke(app, ['check', {str(unit)!r}])\nassert r.exit_code == 2, r.output\n"
            "assert 'furlong' in r.output and 'accepted: in, ft, mm, m' in r.output, r.output\n"
            "print('pint' in sys.modules)")
    run = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, env=env)
    assert run.stdout.strip() == "False"
    assert not (tmp_path / "cache").exists() and not (tmp_path / "home").exists()


def test_every_spelling_of_the_grammar_is_shipped():
    # So that no run needs pint: each accepted spelling's meaning and its factor to SI.
    import json

    from stallcheck.files import quantities as q

    shipped = json.loads(q.SHIPPED_ANSWERS.read_text(encoding="utf-8"))
    for kind, spellings in q.GRAMMAR.items():
        for spelling in spellings:
            assert f"unit|{spelling}" in shipped, spelling


def test_the_shipped_unit_answers_are_what_pint_says():
    # Independent: pint itself, asked again for every answer the package ships.
    import json

    from stallcheck.files import quantities as q

    shipped = json.loads(q.SHIPPED_ANSWERS.read_text(encoding="utf-8"))
    assert len(shipped) > 50
    ureg = q.registry()
    for key, value in shipped.items():
        kind, *args = key.split("|")
        if kind == "unit":
            assert value == q._pint_unit(args[0]), key
        elif kind == "dimension":
            assert value == str(ureg.parse_units(args[0]).dimensionality), key
        else:
            zero = float(ureg.Quantity(0.0, args[0]).to(args[1]).magnitude)
            one = float(ureg.Quantity(1.0, args[0]).to(args[1]).magnitude)
            assert value == pytest.approx([zero, one - zero], rel=1e-12, abs=1e-12), key


def test_width_option_widens_the_report_and_the_chart():
    narrow = runner.invoke(app, ["check", str(SAMPLES[0])], env={"NO_COLOR": "1", "COLUMNS": "80"}).stdout
    wide = runner.invoke(app, ["check", str(SAMPLES[0]), "--width", "140"], env={"NO_COLOR": "1"}).stdout
    assert max(map(len, narrow.splitlines())) <= 80
    assert 100 < max(map(len, wide.splitlines())) <= 140
    assert runner.invoke(app, ["chart", str(SAMPLES[0]), "--width", "20"]).exit_code == 2


def test_chart_csv_writes_the_points_in_display_units(tmp_path):
    # The water heater's file: design steam pressure 2 barg, return 0 barg with no lift,
    # so at full load the coil column reads 2 barg and the back pressure 0 barg.
    import csv as csvmod

    sample = next(s for s in SAMPLES if s.name == "si_water_heater.toml")
    out = tmp_path / "points.csv"
    r = runner.invoke(app, ["chart", str(sample), "--csv", str(out)])
    assert r.exit_code in (0, 1), r.output
    rows = list(csvmod.DictReader(out.open(encoding="utf-8")))
    assert [float(row["load [%]"]) for row in rows] == [float(k) for k in range(101)]
    full = rows[-1]
    assert float(full["coil pressure [barg]"]) == pytest.approx(2.0, abs=1e-4)
    assert float(full["back pressure [barg]"]) == pytest.approx(0.0, abs=1e-4)
    assert full["stalled"] == "no" and rows[0]["stalled"] == "yes"
    # a stalled row is one where the drain differential is not above zero (no trap minimum here)
    assert all((float(row["drain differential [kPa]"]) <= 0.0) == (row["stalled"] == "yes") for row in rows)
    # and the file is never replaced unasked
    again = runner.invoke(app, ["chart", str(sample), "--csv", str(out)])
    assert again.exit_code == 2 and "--force" in again.stderr


@pytest.mark.parametrize("command", [["demo"], ["survey", "sample_units"], ["check", "sample_units/si_flooded_reheat.toml"],
                                     ["chart", "sample_units/si_flooded_reheat.toml"],
                                     ["diagnose", "sample_units/si_flooded_reheat.toml", "--no-ask"]])
def test_every_text_command_takes_a_width(command, monkeypatch):
    from conftest import ROOT

    monkeypatch.chdir(ROOT)
    narrow = runner.invoke(app, command + ["--width", "60"], env={"NO_COLOR": "1"})
    wide = runner.invoke(app, command + ["--width", "140"], env={"NO_COLOR": "1"})
    assert narrow.exit_code in (0, 1) and wide.exit_code == narrow.exit_code, narrow.output
    assert max(map(len, narrow.stdout.splitlines())) <= 60
    assert max(map(len, wide.stdout.splitlines())) > 60


def test_a_check_does_not_import_the_units_library():
    # Every spelling of the grammar is shipped with pint's answer: a check needs no pint.
    code = ("import sys, io, contextlib\nfrom stallcheck.cli import main\n"
            f"sys.argv = ['stallcheck', 'check', {str(SAMPLES[0])!r}]\n"
            "try:\n    with contextlib.redirect_stdout(io.StringIO()):\n        main()\nexcept SystemExit:\n    pass\n"
            "print('pint' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"