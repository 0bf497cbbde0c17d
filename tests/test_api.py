"""The Python interface: the README's example runs as printed, and the interface gives
what the command line gives."""

import json
import re
import subprocess
import sys

import pytest
from conftest import ROOT, SAMPLES
from typer.testing import CliRunner

import stallcheck
from stallcheck.cli import app


def test_the_readme_python_example_runs(tmp_path):
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    code = re.search(r"### From Python.*?```python\n(.*?)```", text, re.S).group(1)
    run = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True)
    assert run.returncode == 0, run.stderr
    assert "trap-vacuum-breaker True" in run.stdout and "stalls below 84% load" in run.stdout


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.name)
def test_the_interface_gives_what_check_json_gives(sample):
    cli = json.loads(CliRunner().invoke(app, ["check", str(sample), "--json"]).stdout)
    assert stallcheck.to_dict(stallcheck.analyse(str(sample))) == cli


def test_a_dict_of_tables_is_a_unit_and_bad_input_names_the_key():
    import tomllib

    data = tomllib.loads(SAMPLES[0].read_text(encoding="utf-8"))
    assert stallcheck.analyse(data).name == data["unit"]["name"]
    data["drain"]["lift"] = "ten feet"
    with pytest.raises(stallcheck.InputError) as err:
        stallcheck.read_unit(data, name="notebook")
    assert err.value.key == "drain.lift"


def test_survey_rows_and_frame():
    rows = stallcheck.survey_rows(ROOT / "sample_units")
    assert rows and {"name", "required", "adequate", "exit_status"} <= set(rows[0])
    try:
        import pandas  # noqa: F401
    except ImportError:
        with pytest.raises(ImportError, match="needs pandas"):
            stallcheck.survey_frame(ROOT / "sample_units")
    else:
        assert len(stallcheck.survey_frame(ROOT / "sample_units")) == len(rows)


def test_importing_the_package_stays_light():
    code = "import stallcheck, sys; print(sorted(m for m in ('numpy', 'CoolProp', 'pint', 'scipy') if m in sys.modules))"
    assert subprocess.run([sys.executable, "-c", code], capture_output=True, text=True).stdout.strip() == "[]"


def test_the_interface_docstring_example_runs(monkeypatch):
    import doctest

    from stallcheck import api

    monkeypatch.chdir(ROOT)
    assert doctest.testmod(api).failed == 0


def test_the_package_lists_its_public_names_and_analyse_many_takes_paths():
    names = {n for n in dir(stallcheck) if not n.startswith("_")}
    assert names == {"read_unit", "analyse", "analyse_many", "to_dict", "survey_rows", "survey_frame", "InputError",
                     "StallcheckError"}
    got = stallcheck.analyse_many([ROOT / "sample_units" / "si_water_heater.toml", "no-such-unit.toml",
                                   stallcheck.read_unit(ROOT / "sample_units" / "si_glycol_exchanger.toml")])
    assert isinstance(got[0], stallcheck.api.Result) and isinstance(got[2], stallcheck.api.Result)
    assert isinstance(got[1], stallcheck.InputError) and "no-such-unit.toml" in str(got[1])
    assert got[0].name == stallcheck.analyse(ROOT / "sample_units" / "si_water_heater.toml").name


def test_analyse_names_the_display_units_as_analyse_many_does():
    sample = ROOT / "sample_units" / "si_water_heater.toml"
    us = stallcheck.analyse(sample, system="us")
    assert us.system == "us" and stallcheck.analyse(sample, units="us").system == "us"
    assert stallcheck.analyse_many([sample], system="us")[0].system == "us"
