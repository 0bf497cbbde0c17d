"""Every figure a finding prints for the user to act on, applied as printed, does what
the sentence says: the finding goes. The figures are read back from the message (US and
SI display units) and written into the unit file as a user would type them; the rules
are judged again on the changed unit. The scenarios are the invented coil of
``test_findings.py``.

Rounding to the nearest would fail these where the exact figure sits just past a
printed step (a trap rated 0.4 % under what is needed, a minimum load half a percent
under the stall); the messages round each such figure the safe way (``render/words``).
"""

from __future__ import annotations

import math
import re

import pytest
from test_findings import PUMP, SMALL_TABLE, analyse, found

from stallcheck.render import words

SYSTEMS = ("us", "si")


def message(r, code, system):
    f = found(r, code)
    assert f is not None, (code, [g.code for g in r.findings])
    return words.finding(f, r, system)


def figure(text: str, before: str, units: str) -> str:
    """The number and unit printed right after ``before`` in ``text``, as a user would
    type it into a unit file (``"621 lb/h"``); ``units`` a regex of the units allowed."""
    m = re.search(re.escape(before) + r"\s*(-?[\d,]+(?:\.\d+)?)\s*(" + units + r")", text)
    assert m, (before, text)
    return f"{m.group(1).replace(',', '')} {m.group(2)}"


def percent(text: str, before: str) -> float:
    m = re.search(re.escape(before) + r"\s*(\d+(?:\.\d+)?)%", text)
    assert m, (before, text)
    return float(m.group(1)) / 100.0


@pytest.mark.parametrize("system", SYSTEMS)
def test_the_trap_rating_printed_drains_the_coil(system):
    # "Fit a trap rated for W at Δp": a trap whose table rates the flow printed at the
    # differential printed (and, as a seat does, √10 times it at ten times that
    # differential: orifice flow, common practice) clears both trap findings.
    tables = dict(drain={"arrangement": "trap-vacuum-breaker", "capacity": SMALL_TABLE})
    r = analyse(**tables)
    for code in ("trap-capacity-short", "trap-undersized"):
        text = message(r, code, system)
        before = "Fit a trap rated for" if code == "trap-capacity-short" else "full-load condensate,"
        flow = figure(text, before, "lb/h|kg/h")
        dp = figure(text, f"{flow} at" if code == "trap-capacity-short" else "selected at (", "psi|kPa")
        (w, w_unit), (d, d_unit) = flow.split(), dp.split()
        rows = [{"differential": dp, "flow": flow},
                {"differential": f"{float(d) * 10:g} {d_unit}", "flow": f"{float(w) * math.sqrt(10):.0f} {w_unit}"}]
        fitted = analyse(drain={**tables["drain"], "capacity": rows})
        assert found(fitted, "trap-capacity-short") is None and found(fitted, "trap-undersized") is None


@pytest.mark.parametrize("system", SYSTEMS)
def test_the_stall_load_printed_as_the_minimum_load_takes_the_stall_out_of_range(system):
    tables = dict(drain={"lift": "8 ft"})
    text = message(analyse(**tables), "stall-in-operating-range", system)
    minimum = percent(text, "stalls below")
    assert found(analyse(**tables, load={"minimum": minimum}), "stall-in-operating-range") is None


@pytest.mark.parametrize("system", SYSTEMS)
def test_the_load_printed_for_the_valve_s_control_is_where_it_controls(system):
    # A minimum load at the figure printed: the valve controls down to it.
    tables = dict(valve={"cv": 12, "rangeability": 5})
    text = message(analyse(**tables, load={"minimum": 0.05}), "valve-low-load-control", system)
    minimum = percent(text, "Below about")
    assert found(analyse(**tables, load={"minimum": minimum}), "valve-low-load-control") is None


@pytest.mark.parametrize("system", SYSTEMS)
@pytest.mark.parametrize("cv", [60, 5])
def test_the_cv_printed_as_needed_is_enough(cv, system):
    # valve-oversized quotes the Cv needed at design; valve-too-small the Cv it needs:
    # a valve of that Cv passes the design steam (no valve-too-small).
    r = analyse(valve={"cv": cv})
    code = "valve-oversized" if cv == 60 else "valve-too-small"
    text = message(r, code, system)
    needed = float(next(g for g in re.search(r"Cv (\d+(?:\.\d+)?) needed|needs Cv (\d+(?:\.\d+)?)", text).groups()
                        if g))
    assert needed >= r.valve.required_cv_design
    assert found(analyse(valve={"cv": needed}), "valve-too-small") is None


#: Pump-trap findings: (the change that raises it, its code, the words before the
#: figure, the units the figure may carry, the key the figure is written to).
PUMP_FIGURES = [
    ({"motive_pressure": "6 psig"}, "pump-trap-motive-low", "Raise the motive pressure to at least", "psig|barg",
     "motive_pressure"),
    ({"fill_head": "6 in"}, "pump-trap-fill-head-low", "asks about", "ft|m", "fill_head"),
    ({"pump_capacity": "50 lb/h"}, "pump-trap-undersized", "must move", "lb/h|kg/h", "pump_capacity"),
]


@pytest.mark.parametrize("system", SYSTEMS)
@pytest.mark.parametrize("change, code, before, units, key", PUMP_FIGURES, ids=[c[1] for c in PUMP_FIGURES])
def test_the_pump_trap_figure_printed_is_enough(change, code, before, units, key, system):
    drain = {**PUMP, **change}
    value = figure(message(analyse(drain=drain), code, system), before, units)
    assert found(analyse(drain={**drain, key: value}), code) is None


@pytest.mark.parametrize("system", SYSTEMS)
def test_the_pitch_printed_is_steep_enough(system):
    # Common practice (from memory): 1 in in 40 ft is 1/480 = 0.2083 %; printed to two
    # decimals it must read 0.21 %, not 0.2 % or 0.208 % rounded down.
    drain = {"return_line": "1 in", "return_pitch": "0.1 %"}
    text = message(analyse(drain=drain), "return-line-pitch", system)
    least = percent(text, "flatter than")
    assert least >= 1 / 480 and least == pytest.approx(0.0021)
    assert found(analyse(drain={**drain, "return_pitch": f"{least * 100:g} %"}), "return-line-pitch") is None


@pytest.mark.parametrize("system", SYSTEMS)
def test_the_entering_temperature_printed_for_the_stall_is_on_the_cold_side(system):
    # "stalls ... entering T and warmer": T printed no warmer than the exact boundary,
    # so every entering temperature the sentence calls safe is.
    r = analyse(drain={"lift": "8 ft"})
    text = message(r, "stall-in-operating-range", system)
    printed = float(re.search(r"entering (-?\d+(?:\.\d+)?) °", text).group(1))
    exact = r.stall.inlet_temperature - 273.15
    exact = exact * 1.8 + 32 if system == "us" else exact
    assert printed <= exact + 1e-9 and exact - printed < 1.0


def test_safe_rounding_steps_at_the_printed_precision():
    # The two directions at each kind of precision the messages print: fixed decimals
    # (psi to two places), three significant figures (flows of 100 lb/h and more), and
    # percent to whole and hundredths.
    fill = words._Fill("us", 101325.0)
    psi, lb_h = 6894.757293168, 0.45359237 / 3600
    assert fill.format_field(3.759 * 1000, "differential-") == "0.54 psi"   # 0.5452 psi
    assert fill.format_field(3.759 * 1000, "differential+") == "0.55 psi"
    assert fill.format_field(1263.4 * lb_h, "mass_flow+") == "1,270 lb/h"
    assert fill.format_field(1263.4 * lb_h, "mass_flow-") == "1,260 lb/h"
    assert fill.format_field(2.0 * psi, "differential+") == "2.00 psi"       # on a step: stays
    assert fill.format_field(0.6555, ".0%+") == "66%" and fill.format_field(0.6555, ".0%-") == "65%"
    assert fill.format_field(1 / 480, ".2%+") == "0.21%" and fill.format_field(0.66, ".0%+") == "66%"
    assert words.percent(0.6501) == "66%" and words.percent(0.6599, up=False) == "65%"
    assert fill.format_field(0.123, ".1f+") == "0.2" and fill.format_field(0.129, ".1f-") == "0.1"


@pytest.mark.parametrize("cv", [3, 5])
def test_the_valve_printed_under_what_to_do_drains_a_valve_flooded_coil(cv):
    # A valve too small for a coil whose load alone never stalls it above its 90 %
    # minimum: the open valve holds it under the stall pressure, and the one change is
    # the valve. The Cv printed (rounded up), fitted, leaves the installed trap adequate.
    from stallcheck.render import advice

    r = analyse(valve={"cv": cv}, load={"minimum": 0.9})
    assert not r.drainage.adequate and r.stall.valve_load_fraction is not None
    line = next(m for m in advice.advise(r, "us").changes if m.key == "valve.cv")
    printed = float(re.search(r"Cv (\d+(?:\.\d+)?) or more", line.note).group(1))
    assert printed == line.remedy.value   # the JSON's value_si is the figure printed
    fitted = analyse(valve={"cv": printed}, load={"minimum": 0.9})
    assert fitted.drainage.adequate and fitted.stall.valve_load_fraction is None


@pytest.mark.parametrize("system", SYSTEMS)
def test_the_entering_temperature_a_warm_selection_is_told_to_check_removes_the_finding(system):
    from test_findings import GREENSBORO

    site = {"weather": GREENSBORO, "elevation": "273 m"}
    r = analyse(site=site, design={"inlet_temperature": "20 degF"})
    text = message(r, "design-warmer-than-site", system)
    printed = figure(text, "Check the selection with air entering at", "°F|°C").replace("°F", "degF").replace(
        "°C", "degC")
    assert found(analyse(site=site, design={"inlet_temperature": printed}), "design-warmer-than-site") is None


@pytest.mark.parametrize("system", SYSTEMS)
def test_the_station_elevation_printed_removes_the_elevation_note(system):
    from test_findings import GREENSBORO

    r = analyse(site={"weather": GREENSBORO})
    text = message(r, "site-elevation-differs", system)
    printed = figure(text, "the station's,", "ft|m")
    assert found(analyse(site={"weather": GREENSBORO, "elevation": printed}), "site-elevation-differs") is None


@pytest.mark.parametrize("system", SYSTEMS)
def test_the_trap_rating_a_trap_over_its_rating_is_told_to_fit_is_enough(system):
    # the differential printed, written as the new trap's rating, clears the finding
    for rated in ("5 psi", "10 psi", "14.9 psi"):
        text = message(analyse(drain={"trap_max_differential": rated}), "trap-differential-over-rating", system)
        printed = figure(text, "Fit a trap rated for at least", "psi|kPa|bar")
        assert found(analyse(drain={"trap_max_differential": printed}), "trap-differential-over-rating") is None
    # one story: the trap's figures say the same most-it-can-see, SHORT, and enough once applied
    from stallcheck.render import page, terminal

    r = analyse(drain={"trap_max_differential": "10 psi"})
    section = " ".join(page.plain(terminal.report(r, system, width=80), 80).split())
    assert figure(section, "the most it can see", "psi|kPa|bar") == printed and "return): SHORT" in section
    fixed = analyse(drain={"trap_max_differential": printed})
    section = " ".join(page.plain(terminal.report(fixed, system, width=80), 80).split())
    assert "return): enough" in section
