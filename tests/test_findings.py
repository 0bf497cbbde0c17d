"""Every finding code, held by a scenario of its own (``analysis/findings.py`` and
``analysis/layout.py``): the code appears with its severity and the facts its message
quotes, and a case on the other side of its rule does not raise it. Removing any code
from the analysis fails at least one test here.

Each scenario is an invented air coil (5,000 cfm, 0 °F to 55 °F, 5 psig at full load,
15 psig supply) changed in one table; the expected figures are worked by hand beside the
check from outside values: IAPWS-IF97 through the independent ``iapws`` package, exact
unit definitions (1 ft = 0.3048 m, 1 psi = 6,894.757 Pa), published formulas, and facts
of the trade marked "common practice".
"""

from __future__ import annotations

import copy
import math
from pathlib import Path

import pytest
from iapws import IAPWS97

from stallcheck import analysis
from stallcheck.files import unitfile

PSI = 6894.757293168
ATM = 101325.0
FT = 0.3048
INCH = 0.0254
G = 9.80665

BASE = {
    "format": 1, "unit": {"name": "Wrenfield test coil"},
    "design": {"medium": "air", "flow": "5000 cfm", "inlet_temperature": "0 degF",
               "outlet_temperature": "55 degF", "steam_pressure": "5 psig"},
    "steam": {"supply_pressure": "15 psig"},
    "valve": {"cv": 12, "characteristic": "equal-percentage"},
    "load": {"minimum": 0.2},
    "drain": {"arrangement": "trap", "trap": "float-thermostatic", "fill_head": "18 in", "lift": "0 ft",
              "return_pressure": "0 psig"},
}

#: A pump-trap lifting 8 ft on 50 psig motive steam.
PUMP = {"lift": "8 ft", "arrangement": "pump-trap", "motive_pressure": "50 psig"}

#: Every layout fault at once (``[geometry]``).
BAD_LAYOUT = {"tubes": "horizontal", "supply_feed": "center", "distributing_tubes": False,
              "pitched_to_return": False, "coils_per_trap": 2, "drop_to_trap": "4 ft",
              "drop_vented": False, "drip_before_valve": False}


def analyse(**tables):
    """The base coil with each named table updated (``None`` removes the table)."""
    data = copy.deepcopy(BASE)
    for name, values in tables.items():
        if values is None:
            data.pop(name, None)
        else:
            data.setdefault(name, {}).update(values)
    return analysis.analyse(unitfile.from_data(data, "wrenfield.toml"))


def found(r, code):
    """The one finding of ``code`` in a result, or None. Every finding of the result is
    also put in words, in both systems, as every output does: a part or a fact its
    template needs that a rule left out fails here."""
    from stallcheck.render import words

    for f in r.findings:
        for system in ("us", "si"):
            assert words.finding(f, r, system).strip(), (f.code, system)
    hits = [f for f in r.findings if f.code == code]
    assert len(hits) <= 1, hits
    return hits[0] if hits else None


def rho_liquid(p):
    """Saturated liquid density [kg/m³] at ``p`` [Pa] (IAPWS-IF97, ``iapws``)."""
    return IAPWS97(P=p / 1e6, x=0).rho


def f_to_k(t):
    return (t - 32.0) / 1.8 + 273.15


# --- the stall and the verdict ---------------------------------------------------------

def test_stall_at_full_load_where_the_return_is_above_the_design_coil_pressure():
    # Common practice: a back pressure above the coil's full-load pressure floods the coil
    # at every load. 8 psig return against a 5 psig coil; gauge + 14.696 psi = absolute.
    r = analyse(drain={"return_pressure": "8 psig"})
    f = found(r, "stall-at-full-load")
    assert f is not None and f.severity == "danger" and f.parts == ("", "fit")   # what to fit, not "handled"
    assert f.facts["back"] == pytest.approx(ATM + 8 * PSI, rel=1e-9)
    assert f.facts["design"] == pytest.approx(ATM + 5 * PSI, rel=1e-9)
    inadequate = found(r, "drainage-inadequate")
    assert inadequate is not None and inadequate.severity == "danger"
    # 4 psig return, below the 5 psig coil: no full-load stall
    assert found(analyse(drain={"return_pressure": "4 psig"}), "stall-at-full-load") is None
    # with a pump-trap installed the same stall is the pump-trap's to handle: said as
    # information, and it prescribes nothing already fitted (one story with drainage)
    from stallcheck.render import words

    pumped = analyse(drain={**PUMP, "return_pressure": "8 psig", "motive_pressure": "60 psig"})
    f = found(pumped, "stall-at-full-load")
    assert pumped.drainage.adequate and f.severity == "info" and "handled" in f.parts
    assert "Fit a pump-trap" not in words.finding(f, pumped, "us")
    assert found(pumped, "drainage-inadequate") is None


def test_stall_in_operating_range_sits_where_coil_and_fill_head_meet_the_back_pressure():
    # The stall rule (common practice): the trap discharges while
    # p_coil + ρ·g·fill > p_return + ρ·g·lift. 8 ft of lift, 18 in of fill head, return
    # open to atmosphere: the coil stalls at p = 101.325 kPa + ρ·g·(2.4384 − 0.4572) m,
    # ρ of saturated water at the return pressure (IF97).
    r = analyse(drain={"lift": "8 ft"})
    f = found(r, "stall-in-operating-range")
    assert f is not None and f.severity == "warning" and f.parts[-1] == "drain"
    stall = ATM + rho_liquid(ATM) * G * (8 * FT - 18 * INCH)
    assert f.facts["coil"] == pytest.approx(stall, rel=1e-6)
    assert f.facts["installed"] == "trap" and f.facts["required"] == "pump-trap"
    assert 0.2 < f.facts["load"] < 1.0
    # condensate at the stall point: the load there over h_fg (IF97, iapws)
    h_fg = (IAPWS97(P=stall / 1e6, x=1).h - IAPWS97(P=stall / 1e6, x=0).h) * 1e3
    assert f.facts["condensate"] == pytest.approx(f.facts["load"] * r.design.load / h_fg, rel=1e-6)
    # a pump-trap installed handles it: the same stall, told as information
    handled = found(analyse(drain=PUMP), "stall-in-operating-range")
    assert handled is not None and handled.severity == "info" and "handled" in handled.parts
    # running only above the stall load: nothing in range
    assert found(analyse(drain={"lift": "8 ft"}, load={"minimum": 0.99}), "stall-in-operating-range") is None


def test_drainage_inadequate_where_a_plain_trap_serves_a_coil_that_stalls_in_range():
    r = analyse(drain={"lift": "8 ft"})
    f = found(r, "drainage-inadequate")
    assert f is not None and f.severity == "warning"
    assert f.facts == {"installed": "trap", "required": "pump-trap"}
    # the pump-trap the rule asks for drains it
    assert found(analyse(drain=PUMP), "drainage-inadequate") is None


def test_freeze_risk_where_the_coil_stalls_with_air_below_freezing():
    # Fixed air flow: the load fraction is (T_out − T_in)/(T_out − T_in,design), so the
    # air entering at the stall load f is 55 °F − f·55 °F. Below 32 °F with a plain
    # trap: a coil that floods with freezing air across it (common practice: freeze
    # damage of preheat coils).
    r = analyse(drain={"lift": "8 ft"})
    f = found(r, "freeze-risk")
    load = r.stall.load_fraction
    assert f is not None and f.severity == "danger"
    assert f.facts["inlet"] == pytest.approx(f_to_k(55.0 - load * 55.0), abs=1e-6)
    assert f.facts["freezing"] == pytest.approx(273.15)
    # drained by a pump-trap: information, not danger
    drained = found(analyse(drain=PUMP), "freeze-risk")
    assert drained is not None and drained.severity == "info"
    # a reheat coil (50 °F to 90 °F): the air at the stall is well above freezing
    warm = analyse(drain={"lift": "8 ft"}, design={"inlet_temperature": "50 degF", "outlet_temperature": "90 degF"})
    assert warm.stall.in_range and found(warm, "freeze-risk") is None


def test_freeze_risk_where_a_too_small_valve_floods_the_coil_in_cold_air():
    # Cv 5 where about 7 is needed: the open valve holds the coil under its stall
    # pressure from about half load up, that is, in the coldest air. At fixed air flow
    # the entering temperature at load f is T_out − f·(T_out − T_in,design) (the load
    # definition); the finding spans from the design entering air up to that temperature
    # at the valve's load (or freezing, if lower), and counts the bins' hours below it.
    bins = [{"inlet_temperature": f"{t} degF", "hours": h} for t, h in ((5, 100), (15, 200), (25, 300), (45, 400))]
    r = analyse(valve={"cv": 5}, load={"minimum": 0.2, "bins": bins})
    f = found(r, "freeze-risk")
    assert f is not None and f.severity == "danger" and "valve" in f.parts and "hours" in f.parts
    load = r.stall.valve_load_fraction
    upper = min(f_to_k(55 - load * 55), 273.15)
    assert f.facts["inlet"] == pytest.approx(f_to_k(0.0)) and f.facts["upper"] == pytest.approx(upper, rel=1e-9)
    assert f.facts["hours"] == sum(h for t, h in ((5, 100), (15, 200), (25, 300), (45, 400)) if f_to_k(t) < upper)
    # a valve large enough: the needs-based stall alone, and no valve part
    assert "valve" not in found(analyse(valve={"cv": 12}, load={"minimum": 0.2, "bins": bins}), "freeze-risk").parts


def test_lift_after_a_plain_trap_in_range_and_not_after_a_pump_trap():
    r = analyse(drain={"lift": "8 ft"})
    f = found(r, "lift-after-trap")
    assert f is not None and f.severity == "warning"
    # any lift counts, however short (common practice: never lift directly after the
    # trap of a modulating coil): 2 ft (0.61 m) on a coil that floods in range
    short = analyse(drain={"lift": "2 ft"})
    assert short.stall.floods_in_range and found(short, "lift-after-trap") is not None
    assert f.facts["lift"] == pytest.approx(8 * FT, rel=1e-12)  # 1 ft = 0.3048 m exactly
    assert found(analyse(drain=PUMP), "lift-after-trap") is None
    assert found(analyse(drain={"lift": "0 ft"}), "lift-after-trap") is None


def test_trap_type_poor_at_low_differential_on_a_modulating_coil():
    # Common practice (VA HVAC Design Manual): float-and-thermostatic traps on modulating
    # steam coils; thermodynamic traps need a differential to close and reopen.
    f = found(analyse(drain={"lift": "8 ft", "trap": "thermodynamic"}), "trap-type-modulating")
    assert f is not None and f.severity == "warning" and f.facts["trap"] == "thermodynamic"
    assert found(analyse(drain={"lift": "8 ft"}), "trap-type-modulating") is None


# --- the control valve -------------------------------------------------------------------

def _required_cv(r):
    return r.valve.required_cv_design


def test_valve_too_small_where_the_open_valve_cannot_pass_the_design_steam():
    # Cv 6: short of the design load, but wide open it still holds the coil above the
    # stall pressure (test_valve_limited.py solves both by hand)
    r = analyse(valve={"cv": 6})
    f = found(r, "valve-too-small")
    assert f is not None and f.severity == "warning" and "floods" not in f.parts
    assert f.facts["cv"] == 6.0 and f.facts["required_cv"] > 6.0
    assert 0.0 < f.facts["limited_load"] < 1.0
    # Cv 2: it holds the coil under the stall pressure at full load, and the coil floods
    r = analyse(valve={"cv": 2})
    f = found(r, "valve-too-small")
    assert f is not None and f.severity == "danger" and "floods" in f.parts
    assert f.facts["limited_pressure"] < f.facts["stall_pressure"] < f.facts["drain_cv"] * 1e9
    assert found(analyse(valve={"cv": 12}), "valve-too-small") is None


def test_valve_oversized_where_it_runs_less_than_half_open_at_design():
    # An equal-percentage valve (IEC 60534-1 inherent characteristic C/Cmax = R^(h−1),
    # R = 50) is half open where Cmax = C_needed·√50 = 7.07·C_needed. Common practice: a
    # valve well under half open at full load controls poorly at part load.
    need = _required_cv(analyse())
    over = analyse(valve={"cv": math.ceil(need * math.sqrt(50) * 1.05)})
    f = found(over, "valve-oversized")
    assert f is not None and f.severity == "info"
    assert f.facts["opening"] == pytest.approx(1 + math.log(need / f.facts["cv"]) / math.log(50), rel=1e-6)
    assert f.facts["opening"] < 0.5
    assert found(analyse(valve={"cv": math.floor(need * math.sqrt(50) * 0.95)}), "valve-oversized") is None


def test_valve_low_load_control_from_the_smallest_controllable_cv():
    # Rangeability R: the smallest controllable flow coefficient is Cv/R (IEC 60534-1's
    # definition of inherent rangeability). With R = 5 the valve cannot throttle to the
    # 5 % minimum load.
    r = analyse(valve={"cv": 12, "rangeability": 5}, load={"minimum": 0.05})
    f = found(r, "valve-low-load-control")
    assert f is not None and f.severity == "warning"
    assert f.facts["smallest_cv"] == pytest.approx(12 / 5)
    assert f.facts["load"] > 0.10
    assert found(analyse(valve={"cv": 12, "rangeability": 50}, load={"minimum": 0.2}), "valve-low-load-control") is None


def test_method_below_set_point_for_the_mean_temperature_method_with_flow_varying():
    r = analyse(design={"medium": "water", "flow": "20 gpm", "inlet_temperature": "40 degF",
                        "outlet_temperature": "140 degF", "method": "mean-temperature"},
                load={"varies": "flow", "minimum": 0.0})
    f = found(r, "method-below-set-point")
    assert f is not None and f.severity == "info"
    assert f.facts["set_point"] == pytest.approx(f_to_k(140.0))
    assert 0.0 < f.facts["load"] < 1.0


# --- the trap, pump-trap and purge ------------------------------------------------------------

#: A rated table far too small for this coil (invented maker's data).
SMALL_TABLE = [{"differential": "0.25 psi", "flow": "60 lb/h"}, {"differential": "1 psi", "flow": "120 lb/h"},
               {"differential": "5 psi", "flow": "260 lb/h"}]


def test_trap_undersized_and_capacity_short_from_a_rated_table():
    # Common practice for modulating coils: select the trap for twice the full-load
    # condensate at the differential it has when the coil pressure has fallen away.
    r = analyse(drain={"arrangement": "trap-vacuum-breaker", "capacity": SMALL_TABLE})
    under = found(r, "trap-undersized")
    assert under is not None and under.severity == "warning"
    assert under.facts["required"] == pytest.approx(2.0 * r.design.steam_flow, rel=1e-9)
    # with a vacuum breaker the coil sits at atmospheric at the stall and the 18 in of
    # fill head alone drives the trap: ρ·g·0.4572 m, ρ saturated at 1 atm (IF97)
    assert under.facts["selection"] == pytest.approx(rho_liquid(ATM) * G * 18 * INCH, rel=1e-6)
    # the table read between its rows on log-log axes (a seat's flow goes as a power of
    # the differential; between 1/4 and 1 psi this table doubles: flow ∝ √Δp)
    dp_psi = under.facts["selection"] / PSI
    assert under.facts["installed"] == pytest.approx(60 * math.sqrt(dp_psi / 0.25) * 0.45359237 / 3600, rel=1e-6)
    short = found(r, "trap-capacity-short")
    assert short is not None and short.severity == "warning"
    assert short.facts["load"] > r.stall.load_fraction + 0.02
    big = [{"differential": "0.25 psi", "flow": "6000 lb/h"}, {"differential": "5 psi", "flow": "26000 lb/h"}]
    fine = analyse(drain={"arrangement": "trap-vacuum-breaker", "capacity": big})
    assert found(fine, "trap-undersized") is None and found(fine, "trap-capacity-short") is None


def test_a_trap_rated_for_less_differential_than_its_inlet_can_see():
    # Common practice: a trap is rated (its maker's maximum operating differential) for
    # the most its inlet can see against the least its outlet can: here the 15 psig
    # supply with the control valve wide open, plus 18 in of fill head, against the
    # open return with the line after it empty. At full load it sees the 5 psig coil
    # plus the fill head against the back pressure (no lift: the same open return).
    head = rho_liquid(ATM) * G * 18 * INCH
    working, widest = 5 * PSI + head, 15 * PSI + head
    f = found(analyse(drain={"trap_max_differential": "10 psi"}), "trap-differential-over-rating")
    assert f is not None and f.severity == "warning" and f.parts[1] == "open"
    assert f.facts["rated"] == pytest.approx(10 * PSI, rel=1e-9)
    assert f.facts["working"] == pytest.approx(working, rel=1e-6)
    assert f.facts["widest"] == pytest.approx(widest, rel=1e-6)
    # rated under the full-load differential: it cannot open in normal running
    f = found(analyse(drain={"trap_max_differential": "5 psi"}), "trap-differential-over-rating")
    assert f is not None and f.severity == "danger" and f.parts[1] == "full"
    # rated for the widest differential: nothing to say (nor without a rating)
    assert found(analyse(drain={"trap_max_differential": f"{widest / PSI + 0.01:.2f} psi"}),
                 "trap-differential-over-rating") is None
    assert found(analyse(), "trap-differential-over-rating") is None


def test_pump_trap_motive_low_against_the_back_pressure():
    # 6 psig motive against 8 ft of lift to an open return: the margin is the motive's
    # absolute pressure less 101.325 kPa + ρ·g·2.4384 m, well under the 15 psi wanted.
    r = analyse(drain={**PUMP, "motive_pressure": "6 psig"})
    f = found(r, "pump-trap-motive-low")
    back = ATM + rho_liquid(ATM) * G * 8 * FT
    assert f is not None and f.severity == "warning"
    assert f.facts["back"] == pytest.approx(back, rel=1e-6)
    assert f.facts["margin"] == pytest.approx(ATM + 6 * PSI - back, rel=1e-6)
    # (a motive pressure at or below the back pressure is refused as bad input)
    assert found(analyse(drain=PUMP), "pump-trap-motive-low") is None


def test_pump_trap_fill_head_low_against_the_practice_of_about_a_foot():
    # Common practice: a pump-trap wants about 12 in (0.3 m) of filling head.
    f = found(analyse(drain={**PUMP, "fill_head": "6 in"}), "pump-trap-fill-head-low")
    assert f is not None and f.severity == "warning"
    assert f.facts["fill"] == pytest.approx(6 * INCH) and f.facts["required"] == pytest.approx(0.3)
    assert found(analyse(drain={**PUMP, "fill_head": "14 in"}), "pump-trap-fill-head-low") is None


def test_pump_trap_outside_its_table_and_undersized():
    table = [{"back_pressure": "0 psig", "flow": "500 lb/h"}, {"back_pressure": "2 psig", "flow": "400 lb/h"}]
    # 8 ft of lift is 3.4 psi of back pressure: beyond the table's 2 psig
    f = found(analyse(drain={**PUMP, "pump_capacity": table}), "pump-trap-outside-table")
    assert f is not None and f.severity == "warning"
    assert f.facts["back"] > ATM + 2 * PSI
    covered = [{"back_pressure": "0 psig", "flow": "500 lb/h"}, {"back_pressure": "10 psig", "flow": "400 lb/h"}]
    assert found(analyse(drain={**PUMP, "pump_capacity": covered}), "pump-trap-outside-table") is None
    small = found(analyse(drain={**PUMP, "pump_capacity": "50 lb/h"}), "pump-trap-undersized")
    assert small is not None and small.severity == "warning"
    assert small.facts["capacity"] == pytest.approx(50 * 0.45359237 / 3600, rel=1e-9)
    assert small.facts["capacity"] < small.facts["condensate"]
    assert found(analyse(drain={**PUMP, "pump_capacity": "2000 lb/h"}), "pump-trap-undersized") is None


def test_purge_size_unknown_and_purge_that_cannot_hold_the_differential():
    unknown = found(analyse(drain={"arrangement": "constant-purge"}), "purge-size-unknown")
    assert unknown is not None and unknown.severity == "info"
    # a 0.5 mm bore bleeds a few pounds an hour: far less than the stall-point condensate
    r = analyse(drain={"arrangement": "constant-purge", "purge_orifice": "0.5 mm", "lift": "8 ft"})
    f = found(r, "purge-cannot-hold")
    assert f is not None and f.severity == "warning"
    assert f.facts["back"] == pytest.approx(ATM + rho_liquid(ATM) * G * 8 * FT, rel=1e-6)
    assert found(analyse(drain={"arrangement": "constant-purge", "purge_orifice": "0.5 mm"}), "purge-size-unknown") is None


# --- the return line -------------------------------------------------------------------------

def test_return_velocity_high_from_the_flash_steam_in_a_small_line():
    # Flash at the trap outlet (no lift, so at the return pressure): x = (h_f(p_coil) −
    # h_f(p_ret)) / h_fg(p_ret) (IF97, iapws).
    # Common practice keeps condensate-return velocities with flash to about 15 m/s.
    tables = dict(drain={"return_line": "0.75 in"}, steam={"supply_pressure": "60 psig"},
                  design={"steam_pressure": "50 psig", "flow": "10000 cfm"}, valve={"cv": 30})
    r = analyse(**tables)
    f = found(r, "return-velocity-high")
    assert f is not None and f.severity == "warning"
    coil, ret = IAPWS97(P=(ATM + 50 * PSI) / 1e6, x=0), (IAPWS97(P=ATM / 1e6, x=0), IAPWS97(P=ATM / 1e6, x=1))
    x = (coil.h - ret[0].h) / (ret[1].h - ret[0].h)
    # homogeneous flow: both phases' volume over the bore, W·(x/ρ_g + (1 − x)/ρ_f)/(π d²/4)
    volume = r.design.steam_flow * (x / ret[1].rho + (1 - x) / ret[0].rho)
    velocity = volume / (math.pi / 4 * (0.75 * INCH) ** 2)
    assert f.facts["fraction"] == pytest.approx(x, rel=1e-6)
    assert f.facts["velocity"] == pytest.approx(velocity, rel=1e-6)
    assert f.facts["limit"] == 15.0
    tables["drain"] = {"return_line": "4 in"}
    assert found(analyse(**tables), "return-velocity-high") is None


def test_flash_into_a_cool_return():
    # Flash steam meeting condensate well below its saturation temperature collapses
    # (condensation-induced hammer; common practice). 120 °F against 212 °F.
    f = found(analyse(drain={"return_line": "1 in", "return_temperature": "120 degF"}), "flash-into-cool-return")
    assert f is not None and f.severity == "warning"
    assert f.facts["return_temperature"] == pytest.approx(f_to_k(120.0))
    assert f.facts["saturation"] == pytest.approx(IAPWS97(P=ATM / 1e6, x=0).T, abs=1e-6)
    assert found(analyse(drain={"return_line": "1 in", "return_temperature": "210 degF"}),
                 "flash-into-cool-return") is None


def test_return_line_pitch_against_the_flow_and_flatter_than_practice():
    against = found(analyse(drain={"return_line": "1 in", "return_pitch": "-1 %"}), "return-line-pitch")
    assert against is not None and against.severity == "warning" and against.facts["pitch"] == pytest.approx(0.01)
    # Common practice (from memory): at least 1 in in 40 ft, 1/480 = 0.21 %
    flat = found(analyse(drain={"return_line": "1 in", "return_pitch": "0.1 %"}), "return-line-pitch")
    assert flat is not None and flat.severity == "info" and flat.facts["pitch"] == pytest.approx(0.001)
    assert found(analyse(drain={"return_line": "1 in", "return_pitch": "0.5 %"}), "return-line-pitch") is None


def test_return_line_slug_flow_in_a_small_pumped_line():
    r = analyse(drain={**PUMP, "pump_capacity": "2000 lb/h", "return_line": "0.5 in", "return_length": "100 ft"})
    f = found(r, "return-line-slug-flow")
    assert f is not None and f.severity == "warning"
    assert f.facts["bore"] == pytest.approx(0.5 * INCH)
    assert f.facts["stratified"] > f.facts["bore"] and f.parts == ("", "size")   # with the bore that stratifies


def test_lift_slug_flow_up_a_riser_after_a_plain_trap():
    # Taitel, Barnea & Dukler (1980) for vertical upflow: 8 ft of lift in a 2 in line,
    # the flash at the riser's head (x at 1 atm from 5 psig, IF97: about 2 %) carried at
    # well under the ~15 m/s annular boundary with little liquid: slug flow. A pump-trap
    # lifting the same height moves liquid, and no riser is judged.
    r = analyse(drain={"lift": "8 ft", "return_line": "2 in"})
    f = found(r, "lift-slug-flow")
    assert f is not None and f.severity == "warning"
    assert f.facts["lift"] == pytest.approx(8 * FT) and f.facts["pattern"] in ("slug", "churn")
    assert "full load" in f.facts["where"]
    assert found(analyse(drain={**PUMP, "return_line": "2 in"}), "lift-slug-flow") is None


def test_hydraulic_shock_of_a_pump_trap_discharge_by_joukowsky():
    # Joukowsky: Δp = ρ·a·v, v the pump-trap's delivery (2,000 lb/h through a 1/2 in
    # bore) and a the line's wave speed; danger where the peak passes the rating.
    tables = {**PUMP, "pump_capacity": "2000 lb/h", "return_line": "0.5 in", "return_length": "100 ft"}
    r = analyse(drain={**tables, "return_rating": "50 psig"})
    f = found(r, "hydraulic-shock")
    assert f is not None and f.severity == "danger" and "pump" in f.parts
    rho = f.facts["surge"] / (f.facts["speed"] * f.facts["velocity"])
    assert 940.0 < rho < 1000.0  # liquid water near 100 °C (common practice)
    area = math.pi / 4 * (0.5 * INCH) ** 2
    assert f.facts["velocity"] == pytest.approx(2000 * 0.45359237 / 3600 / (rho * area), rel=1e-6)
    assert f.facts["rating"] == pytest.approx(ATM + 50 * PSI)
    # no rating given: told as information, with no rating cited
    unrated = found(analyse(drain=tables), "hydraulic-shock")
    assert unrated is not None and unrated.severity == "info" and unrated.facts["rating"] is None
    # a rating well above the peak: nothing to say
    assert found(analyse(drain={**tables, "return_rating": "600 psig"}), "hydraulic-shock") is None


# --- layout ----------------------------------------------------------------------------------

LAYOUT = ["tube-fill-both-ends", "group-trapping", "drop-not-vented", "valve-not-dripped", "tubes-not-pitched"]


def test_every_layout_fault_is_found_and_none_on_a_good_layout():
    # Common practice: feed steam at one end (or through distributing tubes), one trap
    # a coil, a long drop to the trap vented back, a drip before the valve, tubes pitched
    # to the return.
    r = analyse(geometry=BAD_LAYOUT)
    assert r.stall.in_range
    severities = {code: found(r, code).severity for code in LAYOUT}
    # a coil that runs near its stall point makes the steam-pocket faults live
    assert severities == {"tube-fill-both-ends": "danger", "group-trapping": "danger", "drop-not-vented": "warning",
                          "valve-not-dripped": "warning", "tubes-not-pitched": "danger"}
    assert found(r, "group-trapping").facts["coils"] == 2
    assert found(r, "drop-not-vented").facts["drop"] == pytest.approx(4 * FT)
    good = {"tubes": "horizontal", "supply_feed": "end", "distributing_tubes": False, "pitched_to_return": True,
            "coils_per_trap": 1, "drop_to_trap": "4 ft", "drop_vented": True, "drip_before_valve": True}
    assert not {f.code for f in analyse(geometry=good).findings} & set(LAYOUT)


def test_layout_faults_are_milder_on_a_coil_that_runs_well_above_its_stall():
    # "near the stall" is within 10 points of load above it: a coil whose stall (76 %
    # here, on a vacuum return) lies more than that below the least load it runs at
    # keeps its differential, and the steam-pocket faults are warnings
    r = analyse(geometry=BAD_LAYOUT, drain={"fill_head": "36 in", "return_pressure": "-5 psig"},
                load={"minimum": 0.9})
    assert r.stall.load_fraction + 0.10 < 0.9
    assert {code: found(r, code).severity for code in LAYOUT} == {
        "tube-fill-both-ends": "warning", "group-trapping": "warning", "drop-not-vented": "info",
        "valve-not-dripped": "warning", "tubes-not-pitched": "warning"}
    # a drop shorter than 3 ft (common practice, from memory) holds no sealing slug
    short = analyse(geometry={**BAD_LAYOUT, "drop_to_trap": "2 ft"})
    assert found(short, "drop-not-vented") is None


def test_every_code_the_analysis_can_raise_has_its_scenario_here():
    # Regression guard on this file itself: a new code added to the rules without a
    # scenario above fails here (the codes are read from the rules' source).
    import re
    from pathlib import Path

    import stallcheck.analysis as pkg

    source = "".join((Path(pkg.__file__).parent / name).read_text(encoding="utf-8")
                     for name in ("findings.py", "layout.py"))
    codes = set(re.findall(r'Finding\(\s*"([a-z-]+)"', source))
    tested = set(re.findall(r'"([a-z]+(?:-[a-z]+)+)"', Path(__file__).read_text(encoding="utf-8")))
    assert len(codes) >= 28 and codes <= tested, codes - tested


# --- thresholds: a case on each side of the source's value ---------------------------------

def test_subcooling_of_5_k_before_flash_into_the_return_is_called_cool():
    # Common practice (from memory): condensate more than about 5 K below its boiling
    # point collapses the flash that meets it. Saturation at 1 atm: 373.124 K (IF97).
    t_sat = IAPWS97(P=ATM / 1e6, x=0).T
    for below, expected in ((4.75, False), (5.25, True)):
        r = analyse(drain={"return_line": "1 in", "return_temperature": f"{t_sat - below!r} K"})
        assert (found(r, "flash-into-cool-return") is not None) is expected, below


def test_least_pitch_of_one_inch_in_forty_feet():
    # Common practice (from memory): 1 in of fall in 40 ft, 1/480 = 0.2083 %.
    for pitch, expected in (("0.2 %", True), ("0.22 %", False)):
        r = analyse(drain={"return_line": "1 in", "return_pitch": pitch})
        assert (found(r, "return-line-pitch") is not None) is expected, pitch


def test_return_velocity_limit_of_15_m_s():
    # Common practice: about 15 m/s (3,000 ft/min) in a return carrying flash. The
    # homogeneous velocity goes as 1/d²: bores giving 14.25 and 15.75 m/s from the figure
    # at 3/4 in (worked by hand from IF97 in test_return_velocity_high_... above).
    tables = dict(steam={"supply_pressure": "60 psig"}, design={"steam_pressure": "50 psig", "flow": "10000 cfm"},
                  valve={"cv": 30})
    v0 = analyse(**tables, drain={"return_line": "0.75 in"}).flash.velocity
    for speed, expected in ((14.25, False), (15.75, True)):
        bore = 0.75 * INCH * math.sqrt(v0 / speed)
        r = analyse(**tables, drain={"return_line": f"{bore * 1000!r} mm"})
        assert r.flash.velocity == pytest.approx(speed, rel=1e-9)
        assert (found(r, "return-velocity-high") is not None) is expected, speed


def test_surge_near_the_rating_at_80_percent():
    # Common practice (from memory): hold a surge peak to about 80 % of the line's
    # rating. Ratings that put the peak at 75 % and at 85 % of them.
    tables = {**PUMP, "pump_capacity": "2000 lb/h", "return_line": "0.5 in", "return_length": "100 ft"}
    peak = analyse(drain=tables).surge.peak
    for share, expected in ((0.75, None), (0.85, "warning")):
        rating = peak / share
        f = found(analyse(drain={**tables, "return_rating": f"{rating / 1000!r} kPaa"}), "hydraulic-shock")
        assert (f.severity if f else None) == expected, share


# --- the site's weather year -------------------------------------------------------------------

#: NREL's TMY3 year for Greensboro NC (USAF 723170), dry bulb only, as the sample ships it.
GREENSBORO = str(Path(__file__).resolve().parent.parent / "sample_units" / "weather"
                 / "greensboro_723170_tmy3_drybulb.csv")


def greensboro_hours():
    """The year's dry bulbs [°C] and the station's elevation [m], read with the csv module."""
    import csv

    with open(GREENSBORO, newline="", encoding="utf-8") as handle:
        rows = list(csv.reader(handle))
    return [float(row[2]) for row in rows[2:]], float(rows[0][6])


def test_a_coil_selected_warmer_than_the_sites_996_condition_is_told_so():
    # ASHRAE Handbook—Fundamentals: the 99.6 % heating dry bulb has 0.4 % of the hours
    # at or below it; by hand, the 36th coldest of 8,760 hours.
    hours, _ = greensboro_hours()
    t996 = sorted(hours)[35] + 273.15
    r = analyse(site={"weather": GREENSBORO, "elevation": "273 m"}, design={"inlet_temperature": "20 degF"})
    f = found(r, "design-warmer-than-site")
    assert f is not None and f.severity == "warning" and f.parts == ("", "outdoor", "why")
    assert f.facts["dry_bulb"] == pytest.approx(t996) and f.facts["entering"] == pytest.approx(t996)
    assert f.facts["design"] == pytest.approx(f_to_k(20.0))
    # the hours colder than the design, counted by hand (the unit runs all year)
    assert f.facts["hours"] == sum(1 for t in hours if t + 273.15 < f_to_k(20.0))
    # a selection colder than the 99.6 % condition: nothing to say
    assert found(analyse(site={"weather": GREENSBORO, "elevation": "273 m"},
                         design={"inlet_temperature": "10 degF"}), "design-warmer-than-site") is None
    # mixed air: the condition is the air entering the coil, 30 % outdoor air at the 99.6 %
    # dry bulb with return air at 20 °C (adiabatic mixing, ASHRAE Fundamentals ch. 1)
    mixed = analyse(site={"weather": GREENSBORO, "elevation": "273 m"}, design={"inlet_temperature": "53 degF"},
                    load={"outdoor_air_minimum": 0.3, "return_air_temperature": "20 degC"})
    g = found(mixed, "design-warmer-than-site")
    assert g is not None and g.parts[1] == "mixed"
    assert g.facts["entering"] == pytest.approx(0.3 * t996 + 0.7 * 293.15)


@pytest.mark.parametrize("side", (0.95, 1.05))
def test_a_station_more_than_50_m_from_the_sites_elevation_is_noted(side):
    # 50 m moves the standard atmosphere about 0.6 kPa (ISO 2533: 101.325 kPa at 0 m,
    # 100.73 kPa at 50 m), the smallest division of a low-pressure gauge (1/10 psi =
    # 0.69 kPa; common practice). The station's elevation by hand from the file's header.
    _, station = greensboro_hours()
    assert station == 273.0
    r = analyse(site={"weather": GREENSBORO, "elevation": f"{station - side * 50.0!r} m"})
    f = found(r, "site-elevation-differs")
    assert (f is not None) == (side > 1)
    if f is not None:
        assert f.severity == "info" and f.parts[1] == "given" and f.facts["station"] == station
        # the pressure it moves, by the standard atmosphere by hand (ISO 2533:
        # p = 101325·(1 − 2.25577e-5·z)^5.25588 Pa)
        def iso(z):
            return 101325.0 * (1.0 - 2.25577e-5 * z) ** 5.25588
        assert f.facts["dp"] == pytest.approx(iso(station - side * 50.0) - iso(station), rel=1e-4)
    # no elevation given: sea level is taken, 273 m off
    bare = found(analyse(site={"weather": GREENSBORO}), "site-elevation-differs")
    assert bare is not None and bare.parts[1] == "none"
    # an atmospheric pressure given is the site's own: the station is not compared
    assert found(analyse(site={"weather": GREENSBORO, "atmospheric_pressure": "98 kPaa"}),
                 "site-elevation-differs") is None


def test_freeze_risk_with_a_weather_file_counts_the_years_stalled_freezing_hours():
    # a 3 ft lift stalls the base coil in its range; every hour the air is below freezing
    # and at or above the stall point's entering temperature counts (by hand)
    r = analyse(site={"weather": GREENSBORO, "elevation": "273 m"}, drain={"lift": "3 ft"}, load={"minimum": 0.0})
    f = found(r, "freeze-risk")
    assert f is not None and "year" in f.parts
    hours, _ = greensboro_hours()
    t_stall = r.stall.inlet_temperature - 273.15
    assert f.facts["hours"] == sum(1 for t in hours if t_stall <= t < 0.0) > 0


def test_a_warm_selection_the_schedule_keeps_from_the_cold_hours_is_information():
    # Run only April to October, the coil never meets air colder than its 20 °F design
    # in the Greensboro year (by hand: no such hour in those months), so the design
    # warmer than the annual 99.6 % condition is told as information, not a warning.
    import csv

    with open(GREENSBORO, newline="", encoding="utf-8") as handle:
        rows = list(csv.reader(handle))[2:]
    summer = [float(row[2]) for row in rows if 4 <= int(row[0][:2]) <= 10]
    assert min(summer) > (20 - 32) / 1.8
    r = analyse(site={"weather": GREENSBORO, "elevation": "273 m"}, design={"inlet_temperature": "20 degF"},
                load={"season": "Apr-Oct", "minimum": 0.0})
    f = found(r, "design-warmer-than-site")
    assert f is not None and f.severity == "info" and f.parts[-1] == "why-none" and f.facts["hours"] == 0


# --- branches a mutation run of findings.py found untested -------------------------------

def test_freeze_risk_of_an_air_coil_whose_flow_varies_quotes_its_design_air():
    # With the flow varying the entering air is the design's at every load (the load
    # definition), so a coil stalling in its range floods with 0 °F air across it:
    # danger with a plain trap; information, and the drained words, with a pump-trap.
    r = analyse(load={"varies": "flow", "minimum": 0.2}, drain={"lift": "8 ft"})
    f = found(r, "freeze-risk")
    assert f is not None and f.severity == "danger" and f.parts[:3] == ("", "design", "why")
    assert f.facts["inlet"] == pytest.approx(f_to_k(0.0)) and f.parts[-1] == "drain"
    drained = found(analyse(load={"varies": "flow", "minimum": 0.2}, drain=PUMP), "freeze-risk")
    assert drained is not None and drained.severity == "info" and drained.parts[-1] == "drained"
    # entering at 40 °F: no freezing air at any load
    assert found(analyse(load={"varies": "flow", "minimum": 0.2}, design={"inlet_temperature": "40 degF"},
                         drain={"lift": "8 ft"}), "freeze-risk") is None


def test_freeze_risk_of_a_valve_flooded_coil_drained_by_a_pump_trap_is_information():
    # the too-small valve floods the coil in the coldest air (the valve part), but the
    # pump-trap installed drains it whatever the coil pressure: information, drained
    r = analyse(valve={"cv": 5}, load={"minimum": 0.2}, drain=PUMP)
    f = found(r, "freeze-risk")
    assert f is not None and f.severity == "info" and "valve" in f.parts and f.parts[-1] == "drained"
    flooded = found(analyse(valve={"cv": 5}, load={"minimum": 0.2}), "freeze-risk")
    assert flooded.severity == "danger" and flooded.parts[-1] == "drain"


def test_trap_capacity_short_on_a_coil_that_never_stalls_says_no_stall():
    # water heated from 80 °C to 120 °C on 5 barg steam, the flow varying: at no flow
    # the coil still holds steam at 120 °C, about 1 bar gauge (IF97), above the open
    # return, so it never stalls; the small table falls short all the same: the finding
    # without the stall's words
    design = {"medium": "water", "flow": "20 gpm", "inlet_temperature": "80 degC", "outlet_temperature": "120 degC",
              "steam_pressure": "5 barg"}
    r = analyse(design=design, steam={"supply_pressure": "7 barg"}, load={"varies": "flow", "minimum": 0.0},
                drain={"capacity": SMALL_TABLE})
    assert IAPWS97(T=393.15, x=0).P * 1e6 > ATM and not r.stall.occurs
    f = found(r, "trap-capacity-short")
    assert f is not None and f.parts == ("", "fix")


def test_pump_trap_motive_from_the_supply_below_the_back_pressure_is_a_danger():
    # no motive pressure given: the 6 psig supply is taken, under the 20 ft lift's
    # 8.7 psi of water (ρ·g·h, IF97 at 1 atm): no margin at all
    r = analyse(steam={"supply_pressure": "6 psig"}, drain={"arrangement": "pump-trap", "lift": "20 ft"})
    f = found(r, "pump-trap-motive-low")
    assert 20 * FT * rho_liquid(ATM) * G > 6 * PSI
    assert f is not None and f.severity == "danger" and "supply" in f.parts and f.facts["margin"] == 0.0


def test_findings_are_listed_worst_first():
    # a unit with a danger, warnings and information at once
    r = analyse(drain={"lift": "8 ft"}, valve={"cv": 80})
    order = [f.severity for f in r.findings]
    assert {"danger", "warning", "info"} <= set(order)
    assert order == sorted(order, key=["danger", "warning", "info"].index)


def test_the_base_coil_raises_none_of_the_rules_for_other_coils():
    # the invented base coil (ntu, a valve sized for it, a plain trap with 18 in of fill
    # head into an open return): none of the findings its scenarios above raise by a change
    codes = {f.code for f in analyse().findings}
    assert not codes & {"method-below-set-point", "valve-oversized", "valve-too-small", "trap-capacity-short",
                        "pump-trap-motive-low", "hydraulic-shock", "trap-differential-over-rating"}, codes


def test_hydraulic_shock_of_a_column_stopped_up_a_lift_says_so_and_the_flash():
    # a 40 psig coil's plain trap lifting 8 ft through 100 ft of 1/2 in line rated
    # 15 psig: the column the trap stops (not a pump-trap's check valve, the case
    # above), with the flash that drives it
    r = analyse(steam={"supply_pressure": "60 psig"}, design={"steam_pressure": "40 psig"},
                drain={"lift": "8 ft", "return_line": "0.5 in", "return_length": "100 ft",
                       "return_rating": "15 psig"})
    column = found(r, "hydraulic-shock")
    assert column is not None and "column" in column.parts and "flash" in column.parts


def test_freeze_risk_counts_the_bins_hours_in_freezing_air_above_the_stall():
    # the load bins' hours with the air entering below freezing and at or above the stall
    # point's entering temperature (where the coil floods), by hand
    bins = [(-5, 100), (10, 200), (20, 300), (28, 250), (40, 400)]
    r = analyse(drain={"lift": "8 ft"}, load={"minimum": 0.0, "bins": [
        {"inlet_temperature": f"{t} degF", "hours": h} for t, h in bins]})
    f = found(r, "freeze-risk")
    assert f is not None and "hours" in f.parts
    t_stall = r.stall.inlet_temperature
    assert f.facts["hours"] == sum(h for t, h in bins if t_stall <= f_to_k(t) < 273.15) > 0


def test_freeze_risk_of_a_valve_flooded_coil_counts_the_weather_year_s_hours():
    # the too-small valve floods the coil from its load up, in the coldest air, and the
    # coil stalls by the stall rule in the mildest: with the Greensboro year (all year,
    # all day), the hours below freezing in either span, by hand from the file. At fixed
    # air flow the air entering at load f is 55 °F − f·55 °F (the load definition).
    site = {"weather": GREENSBORO, "elevation": "273 m"}
    r = analyse(site=site, valve={"cv": 5}, load={"minimum": 0.0})
    f = found(r, "freeze-risk")
    assert f is not None and "valve" in f.parts and "year" in f.parts
    hours, _ = greensboro_hours()
    mildest = r.stall.inlet_temperature - 273.15
    coldest = (55.0 - r.stall.valve_load_fraction * 55.0 - 32.0) / 1.8
    assert f.facts["hours"] == sum(1 for t in hours if t < 0.0 and (t >= mildest or t <= coldest)) > 0
