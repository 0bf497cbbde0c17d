"""Physical edge cases give findings, not crashes; written files survive interruption;
input files are never changed."""

import shutil

import numpy as np
import pytest
from conftest import BASE_UNIT, SAMPLES
from typer.testing import CliRunner

from stallcheck import analysis
from stallcheck.analysis import diagnosis
from stallcheck.cli import app
from stallcheck.errors import InputError
from stallcheck.files import atomic, readings, unitfile
from stallcheck.physics import properties, valve
from stallcheck.render import words

runner = CliRunner()


def unit(text=BASE_UNIT, extra="", **replace):
    for old, new in replace.items():
        assert old in text, old
        text = text.replace(old, new)
    return unitfile.parse(text + extra, "edge.toml")


def test_coil_pressure_below_the_triple_point_at_low_load():
    # An air coil whose set point is below freezing asks, at low load, for steam below
    # 0 °C: those points are held at the bottom of the steam tables and said so.
    u = unit(**{'inlet_temperature = "-10 degF"': 'inlet_temperature = "-30 degF"',
                'outlet_temperature = "50 degF"': 'outlet_temperature = "25 degF"'})
    r = analysis.analyse(u)
    assert np.all(r.points.coil_pressure >= properties.P_MIN)
    assert any("bottom of the steam tables" in a for a in words.assumptions(r, r.system))
    assert r.stall.occurs


def test_steam_temperature_barely_above_the_set_point():
    # 5 psig saturates at 227.1 °F; a set point 1 °F below it is a very large coil.
    # Saturation temperature from the independent `iapws` package (IF97).
    from iapws import IAPWS97
    t_sat = IAPWS97(P=(101325 + 5 * 6894.757) / 1e6, x=0).T
    set_point = (t_sat - 273.15) * 1.8 + 32 - 1.0
    r = analysis.analyse(unit(**{'outlet_temperature = "50 degF"': f'outlet_temperature = "{set_point:.3f} degF"'}))
    assert r.design.steam_temperature - (set_point - 32) / 1.8 - 273.15 == pytest.approx(1 / 1.8, rel=1e-3)
    assert r.findings


def test_choked_valve():
    # 100 psig supply to a 5 psig coil: x far above F_gamma * xT, the flow is choked.
    r = analysis.analyse(unit(**{'supply_pressure = "15 psig"': 'supply_pressure = "100 psig"'}))
    assert r.valve.choked_at_design
    assert valve.is_choked(r.supply_pressure, r.design.coil_pressure, 0.7)
    assert np.all(np.isfinite(r.points.valve_opening))


def test_entering_air_at_the_set_point_is_no_load():
    # A load bin whose entering air is at the set point asks for no heat: it is not
    # counted as running, and a diagnosis at that temperature finds no load.
    bins = '\n[[load.bins]]\ninlet_temperature = "50 degF"\nhours = 400\n[[load.bins]]\ninlet_temperature = "0 degF"\nhours = 100\n'
    u = unit(**{"[drain]": bins + "[drain]"})
    r = analysis.analyse(u)
    assert r.total_hours == 500 and r.stalled_hours == 100
    d = diagnosis.diagnose(u, r, readings.parse(u, inlet_temperature="50 degF"))
    assert d.load == 0.0 and d.model_coil_pressure is not None


def test_stall_load_exactly_at_the_minimum_load():
    r = analysis.analyse(unit())
    at = r.stall.load_fraction
    r2 = analysis.analyse(unit(extra=f"[load]\nminimum = {at!r}\n"))
    assert r2.stall.load_fraction == pytest.approx(at, rel=1e-12)
    # it never runs below the stall point, so a plain trap serves
    assert r2.drainage.required == "trap" and r2.drainage.adequate
    assert "stall-in-operating-range" not in {f.code for f in r2.findings}


def test_interrupted_write_leaves_the_old_file_and_no_scraps(tmp_path, monkeypatch):
    out = tmp_path / "survey.csv"
    out.write_text("old\n", encoding="utf-8")

    def interrupted(fd):
        raise KeyboardInterrupt

    monkeypatch.setattr(atomic.os, "fsync", interrupted)
    with pytest.raises(KeyboardInterrupt):
        atomic.write_new(out, "new\n", "--csv", force=True)
    assert out.read_text(encoding="utf-8") == "old\n"
    assert [p.name for p in tmp_path.iterdir()] == ["survey.csv"]


def test_read_only_folder_is_a_clear_message(tmp_path, monkeypatch):
    def refuse(*args, **kwargs):
        raise PermissionError(13, "Permission denied")

    monkeypatch.setattr(atomic.tempfile, "mkstemp", refuse)
    with pytest.raises(InputError, match="cannot write"):
        atomic.write_new(tmp_path / "out.csv", "x", "--csv")


def test_commands_never_change_their_input_files(tmp_path):
    copies = []
    for sample in SAMPLES:
        copy = tmp_path / sample.name
        shutil.copy(sample, copy)
        copies.append(copy)
    before = {p: p.read_bytes() for p in copies}
    for copy in copies:
        runner.invoke(app, ["check", str(copy)])
        runner.invoke(app, ["check", str(copy), "--json"])
        runner.invoke(app, ["chart", str(copy)])
        runner.invoke(app, ["diagnose", str(copy), "--no-ask", "--load", "0.5"])
    runner.invoke(app, ["survey", str(tmp_path), "--csv", str(tmp_path / "out.csv")])
    assert {p: p.read_bytes() for p in copies} == before


def test_glycol_freezes_by_its_concentration():
    # 40 % propylene glycol by mass freezes near -21 °C (ASHRAE Handbook - Fundamentals,
    # glycol tables; from memory), so it may enter at -10 °C; at -25 °C it is refused
    # with the key named.
    from stallcheck.errors import InputError

    text = """
format = 1
[unit]
name = "Glycol test"
[design]
medium = "propylene-glycol"
concentration = "40 %"
flow = "10 m3/h"
inlet_temperature = "{t}"
outlet_temperature = "40 degC"
steam_pressure = "1 barg"
[steam]
supply_pressure = "3 barg"
[load]
varies = "flow"
[drain]
arrangement = "trap"
fill_head = "0.5 m"
"""
    r = analysis.analyse(unitfile.parse(text.format(t="-10 degC"), "glycol.toml"))
    assert r.design.load > 0
    with pytest.raises(InputError, match="freezing point of 40% propylene-glycol") as err:
        analysis.analyse(unitfile.parse(text.format(t="-25 degC"), "glycol.toml"))
    assert err.value.key == "design.inlet_temperature"
    assert "-21 °C" in str(err.value)
