"""Surveys: the same numbers as single checks, mixed good and bad inputs, CSV tables
with units in the header or in the cells, and safe writing of the CSV output."""

import json
import math
import os
import shutil

import pytest
from conftest import BASE_UNIT, ROOT, SAMPLES
from hypothesis import given, settings
from hypothesis import strategies as st
from test_properties_of_units import si_text
from test_properties_of_units import units as generated_units
from typer.testing import CliRunner

from stallcheck import analysis
from stallcheck.analysis import survey
from stallcheck.cli import app
from stallcheck.errors import InputError, StallcheckError
from stallcheck.files import atomic, csvunits, unitfile
from stallcheck.render import json as json_out

runner = CliRunner()


def _same(a, b, path=""):
    """Every number equal to 1e-9 relative, everything else equal."""
    if isinstance(a, dict):
        assert set(a) == set(b), path
        for k in a:
            _same(a[k], b[k], f"{path}.{k}")
    elif isinstance(a, list):
        assert len(a) == len(b), path
        for i, (x, y) in enumerate(zip(a, b)):
            _same(x, y, f"{path}[{i}]")
    elif isinstance(a, float) and isinstance(b, float):
        assert math.isclose(a, b, rel_tol=1e-9, abs_tol=1e-12), (path, a, b)
    else:
        assert a == b, (path, a, b)


def test_survey_gives_the_single_check_numbers_for_every_sample():
    got = {}
    summaries, failures = survey.run([ROOT / "sample_units"], each=lambda r: got.setdefault(r.source, r))
    assert not failures
    assert {p.name for p in SAMPLES} <= {os.path.basename(s.split(":")[0]) for s in got}
    for path in SAMPLES:
        single = analysis.analyse(unitfile.load(path))
        batched = got[str(path)]
        _same(json_out.to_dict(single), json_out.to_dict(batched))


def test_survey_table_figures_equal_single_checks_without_the_load_table():
    # The table path skips tabulating the load range; every summary figure must still
    # be exactly what a full check gives.
    summaries, failures = survey.run([ROOT / "sample_units"])
    assert not failures
    by_source = {s.source: s for s in summaries}
    for path in SAMPLES:
        assert by_source[str(path)] == survey.Summary.of(analysis.analyse(unitfile.load(path)))


HEADER_UNITS = ("unit.name,design.medium,design.flow [cfm],design.inlet_temperature [degF],"
                "design.outlet_temperature [degF],design.steam_pressure [psig],steam.supply_pressure [psig],"
                "valve.cv,valve.characteristic,drain.arrangement,drain.fill_head [in],drain.lift [ft],"
                "drain.return_pressure [psig],load.minimum\n"
                "Test coil,air,6000,-10,50,5,15,10,equal-percentage,trap,18,4,1,0.2\n")
CELL_UNITS = ("unit.name,design.medium,design.flow,design.inlet_temperature,design.outlet_temperature,"
              "design.steam_pressure,steam.supply_pressure,valve.cv,valve.characteristic,drain.arrangement,"
              "drain.fill_head,drain.lift,drain.return_pressure,load.minimum\n"
              "Test coil,air,6000 cfm,-10 degF,50 degF,5 psig,15 psig,10,equal-percentage,trap,18 in,4 ft,"
              "1 psig,0.2\n")
SAME_IN_TOML = BASE_UNIT.replace('lift = "0 ft"', 'lift = "4 ft"').replace(
    'return_pressure = "0 psig"', 'return_pressure = "1 psig"') + "[load]\nminimum = 0.2\n"


def _csv_unit(tmp_path, text, name):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    (line, data), = list(csvunits.rows(path))
    return unitfile.from_data(data, str(path), line)


def test_units_in_the_header_and_in_the_cells_read_the_same(tmp_path):
    a = _csv_unit(tmp_path, HEADER_UNITS, "header.csv")
    b = _csv_unit(tmp_path, CELL_UNITS, "cells.csv")
    c = unitfile.parse(SAME_IN_TOML, "same.toml")
    for u in (b, c):
        for part in ("design", "drain", "load", "valve", "site"):
            _close(getattr(a, part), getattr(u, part))
        assert a.supply_pressure == pytest.approx(u.supply_pressure, rel=1e-12)
    _same(json_out.to_dict(analysis.analyse(a)) | {"source": ""}, json_out.to_dict(analysis.analyse(c)) | {"source": ""})


def _close(x, y):
    for k, v in x.__dict__.items():
        w = y.__dict__[k]
        if isinstance(v, float):
            assert v == pytest.approx(w, rel=1e-12), k
        else:
            assert v == w, k


def test_a_bare_number_cell_needs_the_header_unit(tmp_path):
    path = tmp_path / "bad.csv"
    path.write_text(HEADER_UNITS.replace(",18,4,1,", ",18 in,4,1,"), encoding="utf-8")
    (line, error), = list(csvunits.rows(path))
    assert isinstance(error, InputError) and error.key == "drain.fill_head" and line == 2


@pytest.mark.parametrize("header, fragment", [
    ("unit.name,drain.lift [wibbles]\nA,3\n", r"unknown unit \[wibbles\]"),
    ("unit.name,valve.cv [ft]\nA,3\n", "takes no unit"),
    ("design.medium\nair\n", "unit.name"),
    ("unit.name,unit.name\nA,B\n", "two columns"),
])
def test_bad_csv_headers_refuse_the_file(tmp_path, header, fragment):
    path = tmp_path / "bad.csv"
    path.write_text(header, encoding="utf-8")
    with pytest.raises(InputError, match=fragment):
        list(csvunits.rows(path))


def _mixed_folder(tmp_path):
    folder = tmp_path / "plant"
    (folder / "north").mkdir(parents=True)
    for sample in SAMPLES[:3]:
        shutil.copy(sample, folder / "north" / sample.name)
    (folder / "broken.toml").write_text("format = 1\n[unit\nname = 'x'\n", encoding="utf-8")
    bad_row = CELL_UNITS.splitlines()[1].replace("5 psig", "5 psi")
    (folder / "rows.csv").write_text(CELL_UNITS + bad_row + "\n", encoding="utf-8")
    return folder


def test_mixed_good_and_bad_inputs(tmp_path):
    folder = _mixed_folder(tmp_path)
    result = runner.invoke(app, ["survey", str(folder)], env={"NO_COLOR": "1", "COLUMNS": "80"})
    assert result.exit_code == 2
    for sample in SAMPLES[:3]:
        assert unitfile.load(sample).name.split()[0] in result.stdout
    assert "Test coil" in result.stdout
    assert "broken.toml" in result.stderr and "not valid TOML" in result.stderr
    assert "rows.csv, line 3" in result.stderr and "design.steam_pressure" in result.stderr
    assert "2 could not be read" in result.stdout
    assert "Traceback" not in result.output


def _lines(stdout: str) -> list[dict]:
    """survey --json: JSON Lines (https://jsonlines.org), one strict JSON object a line."""
    return [json.loads(line) for line in stdout.splitlines()]


def _figures(obj, digits=8):
    """A check --json value as a survey line holds it: floats to ``digits`` significant
    figures (Python's own formatting), fields that are null left out."""
    if isinstance(obj, float):
        return float(f"{obj:.{digits}g}")
    if isinstance(obj, dict):
        return {k: _figures(v, digits) for k, v in obj.items() if v is not None}
    if isinstance(obj, list):
        return [_figures(v, digits) for v in obj]
    return obj


def test_survey_json_lists_results_and_errors_one_a_line(tmp_path):
    folder = _mixed_folder(tmp_path)
    result = runner.invoke(app, ["survey", str(folder), "--json"])
    lines = _lines(result.stdout)
    assert all(line["format"] == 3 for line in lines)
    results = [line for line in lines if line["record"] == "result"]
    errors = [line for line in lines if line["record"] == "error"]
    assert len(results) == 4 and len(errors) == 2 and lines[-1]["record"] == "end"
    assert {k: v for k, v in lines[-1].items() if k != "cautions"} == {"units": 6, "errors": 2, "exit_status": 2,
                                                                     "format": 3, "record": "end"}
    # the two cautions every page carries (no unit here has a weather year)
    assert len(lines[-1]["cautions"]) == 2 and "Screening aid" in lines[-1]["cautions"][0]
    assert "scald" in lines[-1]["cautions"][1]
    assert result.exit_code == 2
    assert all("stall" in r and "drainage" in r and "points" not in r for r in results)
    # figures and codes: the same as check --json gives them, to eight figures, without
    # its sentences unless asked for
    first = results[0]
    check = json.loads(runner.invoke(app, ["check", first["source"], "--json"]).stdout)
    assert first["stall"] == _figures(check["stall"]) and first["valve"] == _figures(check["valve"])
    assert [f["code"] for f in first["findings"]] == [f["code"] for f in check["findings"]]
    assert not any("message" in f for f in first["findings"]) and "assumptions" not in first
    worded = _lines(runner.invoke(app, ["survey", str(folder), "--json", "--words"]).stdout)[0]
    assert worded["findings"] == check["findings"] and worded["assumptions"] == check["assumptions"]
    # the chart's points only where asked
    with_points = _lines(runner.invoke(app, ["survey", str(folder), "--json", "--points"]).stdout)
    first = next(line for line in with_points if line["record"] == "result")
    assert len(first["points"]) == 101
    check = json.loads(runner.invoke(app, ["check", first["source"], "--json"]).stdout)
    assert first["points"] == _figures(check["points"])


def test_a_survey_line_is_under_3_kb_a_unit_without_points(tmp_path):
    # 200 generated units of the bench's kinds: the streaming contract's size target
    import sys

    sys.path.insert(0, str(ROOT / "bench"))
    try:
        import run as bench
    finally:
        sys.path.pop(0)
    table = tmp_path / "units.csv"
    table.write_text(bench.to_csv(bench.invented(200)), encoding="utf-8")
    lines = runner.invoke(app, ["survey", str(table), "--json"]).stdout.encode("utf-8").splitlines()
    results = lines[:-1]
    assert len(results) == 200
    assert sum(map(len, results)) / len(results) <= 3000


def test_survey_exit_status_all_fine(tmp_path):
    fine = ROOT / "sample_units" / "si_glycol_exchanger.toml"
    assert runner.invoke(app, ["survey", str(fine)]).exit_code == analysis.analyse(unitfile.load(fine)).exit_status == 0


def test_survey_csv_output_refuses_to_overwrite_and_writes_with_force(tmp_path):
    out = tmp_path / "survey.csv"
    out.write_text("keep me\n", encoding="utf-8")
    sample = str(SAMPLES[0])
    result = runner.invoke(app, ["survey", sample, "--csv", str(out)])
    assert result.exit_code == 2 and "--force" in result.stderr
    assert out.read_text(encoding="utf-8") == "keep me\n"
    result = runner.invoke(app, ["survey", sample, "--csv", str(out), "--force"])
    assert result.exit_code in (0, 1)
    rows = out.read_text(encoding="utf-8").splitlines()
    assert rows[0].startswith("source,name,tag,stall_load_fraction") and len(rows) == 2
    assert not [p for p in tmp_path.iterdir() if p.name.endswith(".part")]


def test_failed_write_leaves_the_old_file_whole(tmp_path, monkeypatch):
    out = tmp_path / "survey.csv"
    out.write_text("old contents\n", encoding="utf-8")

    def disk_full(src, dst):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(atomic.os, "replace", disk_full)
    with pytest.raises(InputError, match="No space left"):
        atomic.write_new(out, "new contents\n", "--csv", force=True)
    assert out.read_text(encoding="utf-8") == "old contents\n"
    assert [p.name for p in tmp_path.iterdir()] == ["survey.csv"]


def test_writing_into_a_missing_folder_is_refused(tmp_path):
    with pytest.raises(InputError, match="does not exist"):
        atomic.write_new(tmp_path / "nowhere" / "out.csv", "x", "--csv")


def test_input_files_are_never_modified(tmp_path):
    folder = _mixed_folder(tmp_path)
    before = {p: p.read_bytes() for p in folder.rglob("*") if p.is_file()}
    runner.invoke(app, ["survey", str(folder), "--csv", str(tmp_path / "out.csv")])
    assert {p: p.read_bytes() for p in folder.rglob("*") if p.is_file()} == before


def test_csv_rows_that_would_take_defaults_silently_are_refused(tmp_path):
    # A row with too few cells would leave the rest at their defaults (a unit that
    # stalls reported fine); a header alone has no units; an unclosed quote would
    # swallow every later row. Each is bad input named with the line the record starts on.
    from typer.testing import CliRunner

    from stallcheck.cli import app

    runner = CliRunner()
    sample = (ROOT / "sample_units" / "ashgrove_campus_survey.csv").read_text(encoding="utf-8").splitlines()
    header, first, second = sample[0], sample[1], sample[2]
    short = tmp_path / "short.csv"
    short.write_text("\n".join([header, first, ",".join(second.split(",")[:8])]) + "\n", encoding="utf-8")
    result = runner.invoke(app, ["survey", str(short)])
    assert result.exit_code == 2 and "line 3" in result.stderr and "cells but the header names" in result.stderr
    empty = tmp_path / "empty.csv"
    empty.write_text(header + "\n\n", encoding="utf-8")
    result = runner.invoke(app, ["survey", str(empty)])
    assert result.exit_code == 2 and "no units" in result.stderr
    unclosed = tmp_path / "unclosed.csv"
    unclosed.write_text("\n".join([header, '"' + first, second, second]) + "\n", encoding="utf-8")
    result = runner.invoke(app, ["survey", str(unclosed)])
    assert result.exit_code == 2 and "line 2" in result.stderr and "not closed" in result.stderr


def _many_folder(tmp_path):
    """Every sample, bad unit files, and a CSV table whose rows are good and bad, mixed."""
    folder = _mixed_folder(tmp_path)
    for sample in SAMPLES:
        shutil.copy(sample, folder / f"copy_{sample.name}")
    for bad in sorted((ROOT / "tests" / "bad_units").glob("*.toml"))[:12]:
        shutil.copy(bad, folder / bad.name)
    lines = CELL_UNITS.splitlines()
    rows = [lines[0]] + [lines[1].replace("5 psig", f"{3 + k % 7} psig") if k % 5 else
                         lines[1].replace("5 psig", "5 psi") for k in range(40)]
    (folder / "many.csv").write_text("\n".join(rows) + "\n", encoding="utf-8")
    return folder


def test_a_survey_shared_among_processes_gives_what_one_process_gives(tmp_path, monkeypatch):
    # Small chunks, so that many are in flight at once and come back out of turn.
    folder = _many_folder(tmp_path)
    monkeypatch.setattr(survey, "BATCH", 3)
    alone = survey.run([folder], jobs=1)
    shared = survey.run([folder], jobs=2)
    assert len(alone[0]) > 40 and len(alone[1]) > 12
    assert shared == alone
    # and the failures keep the order of the files and rows
    files = [str(f) for f in survey.sources([folder])]
    order = [(files.index(f.source.rsplit(":", 1)[0] if f.source not in files else f.source),
              int(f.source.rsplit(":", 1)[1]) if f.source not in files else 0) for f in alone[1]]
    assert order == sorted(order)


def test_the_command_gives_the_same_table_in_one_process_or_two(tmp_path):
    folder = _many_folder(tmp_path)
    env = {"NO_COLOR": "1", "COLUMNS": "80"}
    one = runner.invoke(app, ["survey", str(folder), "--jobs", "1"], env=env)
    two = runner.invoke(app, ["survey", str(folder), "--jobs", "2"], env=env)
    assert one.exit_code == two.exit_code == 2
    assert one.stdout == two.stdout and one.stderr == two.stderr
    assert runner.invoke(app, ["survey", str(folder), "--jobs", "0"]).exit_code == 2


def test_processes_are_used_from_a_size_and_as_asked():
    assert survey.jobs_for(survey.PARALLEL_FROM - 1) == 1
    assert survey.jobs_for(10, jobs=3) == 3
    assert 1 <= survey.jobs_for(10**6) <= survey.MAX_JOBS


def _dies(*args):
    os._exit(3)


def test_a_worker_that_dies_stops_the_survey_with_a_message(tmp_path, monkeypatch):
    folder = _many_folder(tmp_path)
    monkeypatch.setattr(survey, "_work", _dies)
    with pytest.raises(StallcheckError, match="--jobs 1"):
        survey.run([folder], jobs=2)


def test_sources_are_each_file_once_in_path_order(tmp_path):
    # Sorted part by part, as paths (pathlib's order), not as strings: "a/b.toml" comes
    # before "a-b/c.toml" though "-" sorts before "/".
    for name in ("a/b.toml", "a-b/c.toml", "a/b/c.csv", "a/B.toml", "a/notes.txt"):
        (tmp_path / name).parent.mkdir(parents=True, exist_ok=True)
        (tmp_path / name).write_text("format = 1\n", encoding="utf-8")
    (tmp_path / "a" / "link.toml").symlink_to(tmp_path / "a" / "b.toml")
    found = survey.sources([tmp_path, tmp_path / "a" / "b.toml", tmp_path / "a"])
    assert [p.relative_to(tmp_path).as_posix() for p in found] == ["a/B.toml", "a/b/c.csv", "a/b.toml",
                                                                   "a-b/c.toml"]
    # a path that does not exist is kept (reading it names it)
    assert survey.sources([tmp_path / "missing.toml"]) == [tmp_path / "missing.toml"]


@settings(max_examples=int(os.environ.get("STALLCHECK_EXAMPLES", "40")), deadline=None)
@given(st.lists(generated_units, min_size=1, max_size=6))
def test_a_table_s_summaries_are_those_of_the_full_results(ds):
    # The table is made from results that are not complete; every line of it must be
    # what the full result (check, --json) says.
    units = [unitfile.parse(si_text(d), f"u{k}.toml") for k, d in enumerate(ds)]
    full = survey._analyse(units, None, None, points=False)
    table = survey._analyse(units, None, None, points=False, complete=False)
    for a, b in zip(full, table):
        assert type(a) is type(b)
        if isinstance(a, StallcheckError):
            assert str(a) == str(b)
        else:
            assert survey.Summary.of(a) == survey.Summary.of(b)
            assert a.findings == b.findings and a.exit_status == b.exit_status


def test_the_samples_summaries_are_those_of_their_full_results():
    units = [unitfile.load(sample) for sample in SAMPLES]
    full = survey._analyse(units, None, None, points=False)
    table = survey._analyse(units, None, None, points=False, complete=False)
    assert {r.trap.basis for r in full} >= {"selected", "table"}
    for a, b in zip(full, table):
        assert survey.Summary.of(a) == survey.Summary.of(b)
        assert a.findings == b.findings


@settings(max_examples=300, deadline=None)
@given(st.text(alphabet=st.sampled_from(list('ab,"\n\r \u2028\x0c\x1c\u0085')), max_size=40))
def test_csv_lines_are_the_standard_library_s(text):
    # A table's text is cut into lines as io.StringIO (the reference) cuts it: at "\n"
    # alone, each line keeping its newline; csv then reads "\r\n" and quotes itself.
    import csv
    import io

    def rows(lines):
        try:
            return list(csv.reader(lines))
        except csv.Error as exc:
            return str(exc)

    assert list(csvunits._lines(text)) == list(io.StringIO(text))
    assert rows(csvunits._lines(text)) == rows(io.StringIO(text))


def test_a_survey_of_si_and_us_files_says_which_temperatures_it_shows():
    # one column, one unit: a mixed survey says which, and how to get the other
    mixed = CliRunner().invoke(app, ["survey", str(ROOT / "sample_units")], env={"NO_COLOR": "1"}).output
    assert "Temperatures in °F" in mixed and "--units si" in mixed
    forced = CliRunner().invoke(app, ["survey", str(ROOT / "sample_units"), "--units", "si"],
                                env={"NO_COLOR": "1"}).output
    assert "Temperatures in" not in forced and "°C" in forced
    one = CliRunner().invoke(app, ["survey", str(ROOT / "sample_units" / "si_water_heater.toml")]).output
    assert "Temperatures in" not in one


@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.name)
def test_the_contract_without_sentences_is_the_contract_less_its_listed_sentences(sample):
    # survey --json builds no sentence it drops: its contract is check --json's with the
    # places json.SENTENCES lists left out, and nothing else missing
    from stallcheck import analysis
    from stallcheck.files import unitfile
    from stallcheck.render import json as json_out

    r = analysis.analyse(unitfile.load(sample))
    full = json_out.to_dict(r)
    for field, key in json_out.SENTENCES:
        holder = full if field is None else full[field]
        for item in holder if isinstance(holder, list) else (holder,):
            item.pop(key)
    assert json_out.to_dict(r, sentences=False) == full
