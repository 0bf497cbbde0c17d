"""Weather files: the reading held to pvlib's readers on real NREL typical years, the
heating design dry bulbs and the stalled hours counted by hand from those hours, and bad
files refused with the file and the line.

Outside sources: NREL's TMY3 files for Greensboro NC (USAF 723170) and Sand Point AK
(703165) as pvlib ships them in its package data; pvlib's ``iotools.read_tmy3`` and
``read_epw`` (the reference readers); the ASHRAE Handbook—Fundamentals definition of
the 99.6 % and 99 % heating dry bulbs; adiabatic mixing of two air streams (ASHRAE
Handbook—Fundamentals, ch. 1).
"""

from __future__ import annotations

import csv
import io
import json
import math
from pathlib import Path

import numpy as np
import pytest

pvlib = pytest.importorskip("pvlib")
from pvlib import iotools  # noqa: E402
from typer.testing import CliRunner  # noqa: E402

from stallcheck import analysis  # noqa: E402
from stallcheck.analysis import survey  # noqa: E402
from stallcheck.cli import app  # noqa: E402
from stallcheck.errors import InputError  # noqa: E402
from stallcheck.files import unitfile, weather  # noqa: E402
from stallcheck.physics import coil  # noqa: E402
from stallcheck.render import words  # noqa: E402

ROOT = Path(__file__).resolve().parent.parent
DATA = Path(pvlib.__file__).parent / "data"
GREENSBORO = DATA / "723170TYA.CSV"
SAND_POINT = DATA / "703165TY.csv"
SHIPPED = ROOT / "sample_units" / "weather" / "greensboro_723170_tmy3_drybulb.csv"


def _pvlib_tmy3(path):
    data, meta = iotools.read_tmy3(str(path), map_variables=True)
    return data, meta


def _by_hand(path) -> dict:
    """The TMY3 file read with the csv module: dry bulb [°C], month and hour-ending."""
    with open(path, newline="", encoding="utf-8") as handle:
        rows = list(csv.reader(handle))
    column = rows[1].index("Dry-bulb (C)")
    body = rows[2:]
    return {"dry": [float(row[column]) for row in body], "month": [int(row[0][:2]) for row in body],
            "hour": [int(row[1][:2]) for row in body], "elevation": float(rows[0][6])}


# --- reading ----------------------------------------------------------------------------

@pytest.mark.parametrize("path", [GREENSBORO, SAND_POINT], ids=lambda p: p.name)
def test_every_hour_of_a_tmy3_file_reads_as_pvlib_reads_it(path):
    data, meta = _pvlib_tmy3(path)
    year = weather.read(path)
    assert year.form == "tmy3" and year.dry_bulb.size == 8760
    np.testing.assert_array_equal(np.round(year.dry_bulb - 273.15, 6), np.round(data["temp_air"].to_numpy(), 6))
    assert year.elevation == meta["altitude"]
    assert meta["Name"].strip('"') in year.station and meta["State"] in year.station
    # months and hours as the file writes them (hour ending 01:00 to 24:00 → beginning 0 to 23)
    hand = _by_hand(path)
    assert year.month.tolist() == hand["month"]
    assert year.hour.tolist() == [h - 1 for h in hand["hour"]]


def test_the_shipped_year_is_greensboros_dry_bulb_as_pvlib_reads_it():
    # the sample's compact file keeps the header and the date, time and dry-bulb columns
    data, meta = _pvlib_tmy3(GREENSBORO)
    year = weather.read(SHIPPED)
    np.testing.assert_array_equal(np.round(year.dry_bulb - 273.15, 6), np.round(data["temp_air"].to_numpy(), 6))
    assert year.elevation == meta["altitude"] == 273
    assert SHIPPED.stat().st_size < 1_000_000


def _epw_text(path=GREENSBORO, design=(-9.2, -6.6), hours=None) -> str:
    """An EPW file of our construction from a real TMY3 year (EPW data dictionary: eight
    header lines, then year, month, day, hour, minute, flags and 29 more fields an hour;
    the dry bulb is the seventh)."""
    data, meta = _pvlib_tmy3(path)
    name = meta["Name"].strip('"')
    head = [f"LOCATION,{name},{meta['State']},USA,TMY3,{meta['USAF']},{meta['latitude']},{meta['longitude']},"
            f"{meta['TZ']},{meta['altitude']}",
            "DESIGN CONDITIONS,1,Climate Design Data 2009 ASHRAE Handbook,,Heating,1,"
            f"{design[0]},{design[1]},-16.1,0.9,-9.1",
            "TYPICAL/EXTREME PERIODS,0", "GROUND TEMPERATURES,0", "HOLIDAYS/DAYLIGHT SAVINGS,No,0,0,0",
            "COMMENTS 1,built in a test from NREL TMY3 data", "COMMENTS 2,", "DATA PERIODS,1,1,Data,Sunday, 1/ 1,12/31"]
    hand = _by_hand(path)
    days = [r[0] for r in csv.reader(open(path, encoding="utf-8"))][2:]
    rows = []
    for i, t in enumerate(hand["dry"][: hours or None]):
        month, day, year = days[i].split("/")
        rest = ",".join(["0"] * 28)
        rows.append(f"{year},{int(month)},{int(day)},{hand['hour'][i]},60,?9?9?9?9E0?9?9?9,{t:.1f},{rest}")
    return "\n".join(head + rows) + "\n"


def test_an_epw_year_reads_as_pvlib_reads_it(tmp_path):
    path = tmp_path / "greensboro.epw"
    path.write_text(_epw_text(), encoding="utf-8")
    data, meta = iotools.read_epw(str(path))
    year = weather.read(path)
    assert year.form == "epw" and year.dry_bulb.size == 8760
    np.testing.assert_array_equal(np.round(year.dry_bulb - 273.15, 6), np.round(data["temp_air"].to_numpy(), 6))
    # the header fields used: the station's city and state, its elevation
    assert year.elevation == pytest.approx(float(meta["altitude"]))
    assert meta["city"] in year.station and meta["state-prov"] in year.station
    assert year.month.tolist() == data["month"].tolist()
    assert year.hour.tolist() == (data["hour"] - 1).tolist()
    # the design conditions line's heating dry bulbs (the values we wrote into it)
    assert year.design_996 - 273.15 == pytest.approx(-9.2) and year.design_990 - 273.15 == pytest.approx(-6.6)


# --- the heating design condition --------------------------------------------------------

@pytest.mark.parametrize("path", [GREENSBORO, SAND_POINT], ids=lambda p: p.name)
def test_heating_design_dry_bulbs_are_the_hours_at_or_below_which_04_and_1_percent_lie(path):
    # ASHRAE Handbook—Fundamentals: the 99.6 % (99 %) heating dry bulb is not exceeded
    # (on the cold side) by 0.4 % (1 %) of the year's hours. By hand: sort the hours; the
    # k-th coldest with k = ceil(share x 8760), 36 and 88.
    hand = sorted(_by_hand(path)["dry"])
    assert math.ceil(0.004 * 8760) == 36 and math.ceil(0.01 * 8760) == 88
    year = weather.read(path)
    from stallcheck.analysis.year import design_dry_bulb

    assert design_dry_bulb(year.dry_bulb, 0.004) - 273.15 == pytest.approx(hand[35], abs=1e-9)
    assert design_dry_bulb(year.dry_bulb, 0.01) - 273.15 == pytest.approx(hand[87], abs=1e-9)
    # at least 0.4 % of the hours at or below it, fewer strictly below
    t = hand[35]
    assert sum(x <= t for x in hand) >= 0.004 * 8760 > sum(x < t for x in hand)


def test_greensboros_typical_year_is_near_its_published_design_condition():
    # From memory: the ASHRAE Handbook's heating design dry bulbs for Greensboro NC are
    # about -9 °C (99.6 %) and -7 °C (99 %). A typical year is made of typical months,
    # not the long record, so within 3 K.
    year = weather.read(GREENSBORO)
    from stallcheck.analysis.year import design_dry_bulb

    assert design_dry_bulb(year.dry_bulb, 0.004) - 273.15 == pytest.approx(-9.0, abs=3.0)
    assert design_dry_bulb(year.dry_bulb, 0.01) - 273.15 == pytest.approx(-7.0, abs=3.0)


# --- hours --------------------------------------------------------------------------------

def _unit(folder: Path, **load) -> dict:
    """A 100 % outdoor-air preheat coil at Greensboro whose 8 ft lift stalls it."""
    return {
        "format": 1, "unit": {"name": "Ledbetter Mill MAU-1"},
        "site": {"elevation": "273 m", "weather": str(GREENSBORO)},
        "design": {"medium": "air", "flow": "6000 cfm", "inlet_temperature": "10 degF",
                   "outlet_temperature": "55 degF", "steam_pressure": "5 psig"},
        "steam": {"supply_pressure": "15 psig"},
        "load": dict(load),
        "drain": {"arrangement": "trap", "trap": "float-thermostatic", "fill_head": "18 in", "lift": "3 ft",
                  "return_pressure": "0 psig"},
    }


def _analyse(data):
    return analysis.analyse(unitfile.from_data(data, "ledbetter.toml"))


def test_stalled_hours_are_the_hours_warmer_than_the_stall_point_and_colder_than_the_set_point(tmp_path):
    r = _analyse(_unit(tmp_path))
    y = r.year
    t_stall = r.stall.inlet_temperature - 273.15
    set_point = (55 - 32) / 1.8
    hand = _by_hand(GREENSBORO)["dry"]
    # counted independently: every hour the coil runs (air below the set point) and the
    # stall point's entering temperature or warmer (the load at or below the stall load)
    running = [t for t in hand if t < set_point]
    stalled = [t for t in running if t >= t_stall]
    assert 0 < len(stalled) < len(running)
    assert y.operating == len(running) and y.stalled == len(stalled) == r.stalled_hours
    assert y.stalled_freezing == sum(1 for t in stalled if t < 0.0)
    assert y.above_full == sum(1 for t in running if t < (10 - 32) / 1.8)
    # the longest run of stalled freezing hours, walked hour by hour
    best = run = 0
    for t in hand:
        run = run + 1 if t_stall <= t < 0.0 else 0
        best = max(best, run)
    assert y.longest_freezing_run == best
    # the load bands hold every operating hour once
    assert sum(hours for _, _, hours, _ in y.bands) == y.operating
    assert sum(stalled for _, _, _, stalled in y.bands) == y.stalled


def test_a_season_and_daily_hours_count_only_the_hours_in_them(tmp_path):
    r = _analyse(_unit(tmp_path, season="Nov-Mar", daily_hours="22:00-06:00"))
    hand = _by_hand(GREENSBORO)
    months = {11, 12, 1, 2, 3}
    # hour ending 23:00 to 06:00 is the hour beginning 22:00 to 05:00
    scheduled = [i for i in range(8760) if hand["month"][i] in months and (hand["hour"][i] - 1) % 24 in
                 {22, 23, 0, 1, 2, 3, 4, 5}]
    assert r.year.scheduled == len(scheduled) == 151 * 8
    assert r.year.operating == sum(1 for i in scheduled if hand["dry"][i] < (55 - 32) / 1.8)


def test_mixing_follows_the_adiabatic_mixing_rule():
    # ASHRAE Handbook—Fundamentals ch. 1, equal cp: 30 % outdoor air at -10 °C with
    # return air at 20 °C mixes to 0.3 x -10 + 0.7 x 20 = 11 °C. With an economiser
    # holding 13 °C: outdoor 5 °C mixes at least to 15.5 °C, so more outdoor air brings
    # it to 13 °C; outdoor 15 °C, all outdoor air, gives 15 °C.
    k = 273.15
    out = coil.entering_air(np.array([-10.0, 5.0, 15.0]) + k, 0.3, 20.0 + k)
    np.testing.assert_allclose(out - k, [11.0, 15.5, 18.5], atol=1e-12)
    out = coil.entering_air(np.array([-10.0, 5.0, 15.0]) + k, 0.3, 20.0 + k, 13.0 + k)
    np.testing.assert_allclose(out - k, [11.0, 13.0, 15.0], atol=1e-12)


def test_a_mixed_air_unit_counts_its_hours_on_the_mixed_air(tmp_path):
    data = _unit(tmp_path, outdoor_air_minimum=0.25, return_air_temperature="68 degF")
    data["design"]["inlet_temperature"] = "30 degF"
    r = _analyse(data)
    k = 273.15
    t_return = (68 - 32) / 1.8
    mixed = [0.25 * t + 0.75 * t_return for t in _by_hand(GREENSBORO)["dry"]]
    set_point = (55 - 32) / 1.8
    assert r.year.operating == sum(1 for t in mixed if t < set_point)
    assert r.year.entering_996 - k == pytest.approx(0.25 * sorted(_by_hand(GREENSBORO)["dry"])[35] + 0.75 * t_return)
    assert r.year.coldest_entering - k == pytest.approx(min(mixed))


def test_the_purge_steam_of_the_year_is_that_of_its_hours_as_load_bins(tmp_path):
    # The same hours typed as load bins (each operating hour's dry bulb, counted by hand
    # from the file, a bin of its hours) give the same yearly steam: the weather year
    # is the load-bin rule applied hour by hour.
    from collections import Counter

    data = _unit(tmp_path)
    data["drain"].update(arrangement="constant-purge", purge_rate="10 lb/h", lift="0 ft",
                         return_pressure="-5 psig")
    r = _analyse(data)
    set_point = (55 - 32) / 1.8
    hours = Counter(t for t in _by_hand(GREENSBORO)["dry"] if t < set_point)
    assert r.purge.hours_basis == "weather" and r.purge.hours == r.year.operating == sum(hours.values())
    binned = _unit(tmp_path)
    del binned["site"]["weather"]
    binned["drain"] = dict(data["drain"])
    binned["load"]["bins"] = [{"inlet_temperature": f"{t!r} degC", "hours": n} for t, n in sorted(hours.items())]
    b = _analyse(binned)
    assert b.purge.hours == r.purge.hours
    assert r.purge.yearly_mass == pytest.approx(b.purge.yearly_mass, rel=1e-9) and r.purge.yearly_mass > 0


def test_a_unit_file_with_bins_and_a_weather_file_says_which_it_used(tmp_path):
    data = _unit(tmp_path)
    data["load"]["bins"] = [{"inlet_temperature": "20 degF", "hours": 100}]
    r = _analyse(data)
    assert r.year is not None and r.total_hours == r.year.operating  # not the bins' 100 h
    assert any("weather file" in a and "load bins" in a for a in words.assumptions(r, r.system))


# --- the outputs ----------------------------------------------------------------------

SAMPLE = ROOT / "sample_units" / "us_makeup_air_greensboro.toml"


def test_the_weather_sample_shows_its_year_in_check_json_report_and_survey(tmp_path):
    runner = CliRunner()
    text = runner.invoke(app, ["check", str(SAMPLE)], env={"COLUMNS": "80", "NO_COLOR": "1"}).output
    assert "THE SITE'S YEAR" in text and "stalled below freezing" not in text
    assert all(len(line) <= 80 for line in text.splitlines())
    assert "typical, not a guarantee" in text
    out = json.loads(runner.invoke(app, ["check", str(SAMPLE), "--json"]).output)
    w = out["weather"]
    assert out["hours_from"] == "weather" and out["stalled_hours"] == w["hours_stalled"]
    assert w["heating_dry_bulb_996_c"] == pytest.approx(sorted(_by_hand(GREENSBORO)["dry"])[35])
    assert {f["code"] for f in out["findings"]} >= {"design-warmer-than-site", "freeze-risk"}
    report = tmp_path / "r.md"
    runner.invoke(app, ["report", str(SAMPLE), "-o", str(report)])
    assert "## The site's year" in report.read_text(encoding="utf-8")
    table = tmp_path / "s.csv"
    runner.invoke(app, ["survey", str(SAMPLE), "--csv", str(table)])
    row = next(csv.DictReader(io.StringIO(table.read_text(encoding="utf-8"))))
    assert row["hours_from"] == "weather" and int(row["stalled_freezing_hours"]) == w["hours_stalled_freezing"]
    # a survey's end line says the typical-year caution where any unit's hours come from a year
    lines = runner.invoke(app, ["survey", str(SAMPLE), str(ROOT / "sample_units" / "si_water_heater.toml"),
                                "--json"]).output.splitlines()
    end = json.loads(lines[-1])
    assert end["record"] == "end" and any("typical, not a guarantee" in c for c in end["cautions"])
    assert out["cautions"] == end["cautions"]
    # and the table says every caution, the typical year's among them
    text = runner.invoke(app, ["survey", str(SAMPLE)], env={"COLUMNS": "80", "NO_COLOR": "1"}).output
    said = " ".join(text.split())
    assert all(" ".join(c.split()) in said for c in out["cautions"]) and "Caution: Hours from a typical" in text


def test_the_year_picture_is_drawn(tmp_path):
    pytest.importorskip("matplotlib")
    png = tmp_path / "r.png"
    result = CliRunner().invoke(app, ["report", str(SAMPLE), "-o", str(tmp_path / "r.md"), "--png", str(png)])
    assert result.exit_code in (0, 1) and png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_a_survey_of_many_units_sharing_one_file_reads_it_once(tmp_path):
    header = ("unit.name,site.weather,design.medium,design.flow,design.inlet_temperature,design.outlet_temperature,"
              "design.steam_pressure,steam.supply_pressure,drain.arrangement,drain.trap")
    rows = [f"U{i},{GREENSBORO},air,{4000 + i} cfm,10 degF,55 degF,5 psig,15 psig,trap,float-thermostatic"
            for i in range(40)]
    table = tmp_path / "units.csv"
    table.write_text("\n".join([header] + rows) + "\n", encoding="utf-8")
    weather._cached.cache_clear()
    summaries, failures = survey.run([table], jobs=1)
    assert not failures and len(summaries) == 40
    assert weather._cached.cache_info().misses == 1


def test_a_folder_of_units_passes_by_the_weather_files_it_holds():
    summaries, failures = survey.run([ROOT / "sample_units"], jobs=1)
    assert not failures
    assert not any("greensboro_723170" in s.source for s in summaries)


# --- bad files and keys ---------------------------------------------------------------------

def _refused(data, *words_):
    with pytest.raises(InputError) as err:
        unitfile.from_data(data, "ledbetter.toml")
    text = str(err.value)
    assert "ledbetter.toml" in text and all(w in text for w in words_), text
    return text


def test_a_truncated_weather_file_is_refused_with_its_line(tmp_path):
    lines = GREENSBORO.read_text(encoding="utf-8").splitlines()
    cut = tmp_path / "cut.csv"
    cut.write_text("\n".join(lines[:5000]) + "\n", encoding="utf-8")
    data = _unit(tmp_path)
    data["site"]["weather"] = str(cut)
    _refused(data, "site.weather", "4,998 hours", "line 5000")
    damaged = tmp_path / "damaged.csv"
    damaged.write_text("\n".join(lines[:300] + [lines[300][:20]] + lines[301:]) + "\n", encoding="utf-8")
    data["site"]["weather"] = str(damaged)
    _refused(data, "site.weather", "line 301")


def test_a_weather_file_that_is_neither_format_or_missing_is_refused(tmp_path):
    other = tmp_path / "other.csv"
    other.write_text("a,b,c\n1,2,3\n", encoding="utf-8")
    data = _unit(tmp_path)
    data["site"]["weather"] = str(other)
    _refused(data, "site.weather", "LOCATION", "TMY3")
    data["site"]["weather"] = str(tmp_path / "none.epw")
    _refused(data, "site.weather", "no such file")


def test_an_epw_with_a_missing_dry_bulb_is_refused(tmp_path):
    text = _epw_text().splitlines()
    fields = text[8 + 100].split(",")
    fields[6] = "99.9"
    text[8 + 100] = ",".join(fields)
    path = tmp_path / "gap.epw"
    path.write_text("\n".join(text) + "\n", encoding="utf-8")
    data = _unit(tmp_path)
    data["site"]["weather"] = str(path)
    _refused(data, "site.weather", "missing", "line 109")


def test_year_keys_without_a_weather_file_and_a_weather_file_on_a_water_heater_are_refused(tmp_path):
    data = _unit(tmp_path, season="Oct-Apr")
    del data["site"]["weather"]
    _refused(data, "load.season", "site.weather")
    data = _unit(tmp_path)
    data["design"].update(medium="water", flow="50 gpm", inlet_temperature="140 degF", outlet_temperature="180 degF")
    _refused(data, "site.weather", "inlet-temperature")
    _refused(_unit(tmp_path, outdoor_air_minimum=0.3), "load.return_air_temperature", "required")
    _refused(_unit(tmp_path, return_air_temperature="70 degF"), "load.return_air_temperature", "below 1")
    _refused(_unit(tmp_path, outdoor_air_minimum=0.3, return_air_temperature="70 degF",
                   mixed_air_temperature="75 degF"), "load.mixed_air_temperature", "below the return air")
    _refused(_unit(tmp_path, season="Octember"), "load.season", "Oct-Apr")
    _refused(_unit(tmp_path, daily_hours="6 to 18"), "load.daily_hours", "06:00-18:00")
    _refused(_unit(tmp_path, daily_hours="25:00-06:00"), "load.daily_hours")
    # the same hour at both ends, however written, is no span
    for same in ("06:00-6:00", "24:00-00:00", "00:00-00:00"):
        _refused(_unit(tmp_path, daily_hours=same), "load.daily_hours")


def test_a_season_may_wrap_the_new_year_and_be_a_list():
    from stallcheck.files.unitfile import _daily_hours, _season

    assert _season("Oct-Apr") == (1, 2, 3, 4, 10, 11, 12)
    assert _season("nov-mar, Jul") == (1, 2, 3, 7, 11, 12)
    assert _season("January") == (1,)
    assert _daily_hours("06:00-18:00") == (6, 18) and _daily_hours("22:00-06:00") == (22, 6)
    assert _daily_hours("00:00-24:00") == (0, 24)


def test_the_check_cli_refuses_a_bad_weather_file_with_status_2(tmp_path):
    unit = tmp_path / "u.toml"
    (tmp_path / "w.csv").write_text("LOCATION,x\n", encoding="utf-8")
    unit.write_text(SAMPLE.read_text(encoding="utf-8").replace("weather/greensboro_723170_tmy3_drybulb.csv",
                                                                "w.csv"), encoding="utf-8")
    result = CliRunner().invoke(app, ["check", str(unit)])
    assert result.exit_code == 2 and "Traceback" not in result.output
    assert "site.weather" in result.output and "w.csv" in result.output


def test_a_station_name_in_latin1_and_a_leap_year_are_read(tmp_path):
    # Some EPW sources write the station's name in Latin-1 ("São Paulo"); an actual
    # (not typical) leap year holds 8,784 hours: here Greensboro's year with a 29
    # February made of the 28th's hours (EPW data dictionary: hours in file order).
    lines = _epw_text().splitlines()
    lines[0] = lines[0].replace("GREENSBORO PIEDMONT TRIAD INT", "São Paulo Congonhas")
    feb28 = [line for line in lines[8:] if line.split(",")[1:3] == ["2", "28"]]
    feb29 = [line.replace(",2,28,", ",2,29,", 1) for line in feb28]
    at = lines.index(feb28[-1]) + 1
    leap = lines[:at] + feb29 + lines[at:]
    path = tmp_path / "leap.epw"
    path.write_bytes(("\n".join(leap) + "\n").encode("latin-1"))
    year = weather.read(path)
    assert year.dry_bulb.size == 8784 and "São Paulo" in year.station
    assert int((year.month == 2).sum()) == 29 * 24
