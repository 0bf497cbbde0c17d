"""Drain devices: trap capacity, flash steam, purge steam, pump-trap duty, and the
single changes that move the stall point. Each check names its source."""

import math
from dataclasses import replace

import numpy as np
import pytest
from conftest import BASE_UNIT, said
from iapws import IAPWS97

from stallcheck import analysis
from stallcheck.errors import InputError
from stallcheck.files import unitfile
from stallcheck.physics import flash, properties, purge, traps

PSI = 6894.757293168
ATM = 101325.0
LB_H = 0.45359237 / 3600.0
INCH = 0.0254
FT = 0.3048


def unit(text=BASE_UNIT, extra="", **replace_):
    for old, new in replace_.items():
        text = text.replace(old, new)
    return unitfile.parse(text + extra, "test.toml")


# --- trap seat as an orifice ----------------------------------------------------------


def test_seat_without_flashing_is_the_liquid_orifice_of_fluids():
    # Independent: fluids.flow_meter.flow_meter_discharge (ISO 5167 orifice equation,
    # m = C/√(1-β⁴)·π/4·d²·√(2ρΔp)) for a 5 mm bore in a line so large that β → 0.
    fluids_flow_meter = pytest.importorskip("fluids.flow_meter")
    p0, p1 = 2.0e5, 2.0e5 - 7.0e3
    rho = IAPWS97(P=p0 / 1e6, x=0).rho
    expected = fluids_flow_meter.flow_meter_discharge(D=1.0, Do=0.005, P1=p0, P2=p1, rho=rho, C=0.6)
    got = 0.25 * math.pi * 0.005 ** 2 * float(traps.seat_mass_flux(p0, p1, seat_length=0.0))
    assert got == pytest.approx(expected, rel=1e-4)


@pytest.mark.parametrize("p0, p_out", [(2.0e5, 1.931e5), (2.0e5, ATM), (5.0e5, ATM), (1.1e5, ATM)])
def test_equilibrium_flux_matches_homogeneous_flashing_from_iapws(p0, p_out):
    # Independent hand calculation: homogeneous equilibrium flow of saturated water,
    # G = max over p of ρ(p, s₀)·√(2·(h₀ − h(p, s₀))), isentropic expansion in the iapws
    # package's IAPWS-IF97. The omega method approximates it (API 520 Annex C expects
    # a few per cent).
    inlet = IAPWS97(P=p0 / 1e6, x=0)
    best = 0.0
    for p in np.linspace(p_out, p0, 300)[:-1]:
        st = IAPWS97(P=p / 1e6, s=inlet.s)
        best = max(best, st.rho * math.sqrt(2e3 * (inlet.h - st.h)))
    assert float(traps.flashing_mass_flux(p0, p_out)) == pytest.approx(best, rel=0.03)


def test_omega_by_hand_at_one_atmosphere():
    # Independent hand calculation from the IAPWS-IF97 saturation values at 101.325 kPa
    # (iapws): ω = cp·T·p·ρ_l·(v_lg/h_lg)², Leung (1986).
    s_l, s_g = IAPWS97(P=0.101325, x=0), IAPWS97(P=0.101325, x=1)
    v_lg = 1 / s_g.rho - 1 / s_l.rho
    expected = s_l.cp * 1e3 * s_l.T * ATM * s_l.rho * (v_lg / ((s_g.h - s_l.h) * 1e3)) ** 2
    assert float(traps.omega(ATM)) == pytest.approx(expected, rel=2e-3)


def test_hot_condensate_passes_less_than_cold_water_more_so_at_higher_differential():
    # Fact of the trade (common practice): a trap's hot-condensate capacity is below its
    # cold-water capacity, the more so the higher the differential.
    dps = np.array([0.1, 1.0, 10.0, 50.0]) * PSI
    ratio = [float(traps.seat_mass_flux(ATM + dp, ATM)) / (0.6 * math.sqrt(2 * properties.liquid_density(ATM + dp) * dp))
             for dp in dps]
    assert all(r <= 1.0 for r in ratio)
    assert ratio == sorted(ratio, reverse=True)
    assert ratio[0] > 0.95 and ratio[-1] < 0.8


def test_capacity_table_reading_by_hand():
    # Hand calculation: rows (1 psi, 900 lb/h) and (4 psi, 1800 lb/h). On log-log axes,
    # 2 psi lies half-way, so 900·√2 = 1272.8 lb/h; below the table, orifice scaling,
    # 0.25 psi → 900·√0.25 = 450 lb/h; above it, held at 1800 lb/h.
    dp = [1 * PSI, 4 * PSI]
    w = [900 * LB_H, 1800 * LB_H]
    got = traps.table_capacity_rows(np.array([[2, 0.25, 10, 0]]) * PSI, np.array([dp]), np.array([w]))[0] / LB_H
    assert got == pytest.approx([900 * math.sqrt(2), 450, 1800, 0], rel=1e-9)


def test_capacity_table_of_three_rows_by_hand():
    # Hand calculation on log-log axes: rows (1 psi, 1000), (4 psi, 1500), (16 psi, 3000)
    # lb/h. At 2 psi, half-way between the first two: 1000·√1.5 = 1224.74; at 8 psi,
    # half-way between the last two: 1500·√2 = 2121.32; on a row, the row; below the
    # table 1000·√0.5 = 707.11; above it, held at 3000.
    dp = np.array([[1.0, 4.0, 16.0]]) * PSI
    w = np.array([[1000.0, 1500.0, 3000.0]]) * LB_H
    at = np.array([[2.0, 8.0, 4.0, 0.5, 20.0, 16.0]]) * PSI
    got = traps.table_capacity_rows(at, dp, w)[0] / LB_H
    expected = [1000 * math.sqrt(1.5), 1500 * math.sqrt(2), 1500, 1000 * math.sqrt(0.5), 3000, 3000]
    assert got == pytest.approx(expected, rel=1e-9)


# --- flash steam ------------------------------------------------------------------------


def test_flash_fraction_published_doe_tip_sheet_12():
    # Published: US DOE Steam Tip Sheet #12, 150 psig to 30 psig: 10.3 % flashes.
    x = flash.flash_fraction(150 * PSI + ATM, 30 * PSI + ATM)
    assert float(x) == pytest.approx(0.103, abs=0.002)


def test_flash_fraction_by_hand_from_if97_tables():
    # Independent: the enthalpy balance by hand with the iapws package's IF97 (REFERENCES:
    # 13.3 % from 100 psig to 0 psig, computed).
    hi, lo = IAPWS97(P=(100 * PSI + ATM) / 1e6, x=0), IAPWS97(P=ATM / 1e6, x=0)
    lo_g = IAPWS97(P=ATM / 1e6, x=1)
    expected = (hi.h - lo.h) / (lo_g.h - lo.h)
    got = float(flash.flash_fraction(100 * PSI + ATM, ATM))
    assert got == pytest.approx(expected, rel=1e-4)
    assert got == pytest.approx(0.133, abs=0.001)


def test_return_velocity_by_hand():
    # Hand calculation: 1000 lb/h of condensate flashing 10 % into a 1.5 in bore at
    # 0 psig; volume = W·(x/ρ_g + (1−x)/ρ_f) from IF97 (iapws), over the bore area.
    w = 1000 * LB_H
    rho_g, rho_f = IAPWS97(P=ATM / 1e6, x=1).rho, IAPWS97(P=ATM / 1e6, x=0).rho
    expected = w * (0.1 / rho_g + 0.9 / rho_f) / (math.pi / 4 * (1.5 * INCH) ** 2)
    assert float(flash.mixture_velocity(w, 0.1, ATM, 1.5 * INCH)) == pytest.approx(expected, rel=1e-4)


# --- purge steam ------------------------------------------------------------------------


def test_purge_orifice_against_doe_steam_leak_formula():
    # Published: US DOE Steam Tip Sheet #1, steam loss through an orifice
    # W = 24.24 · P · D² (lb/h, psia, in), choked flow into atmosphere.
    d, p1 = 0.125, 100.0
    expected = 24.24 * p1 * d ** 2
    got = float(purge.steam_orifice_flow(d * INCH, p1 * PSI, ATM)) / LB_H
    assert got == pytest.approx(expected, rel=0.003)


def test_purge_orifice_against_api520_steam_sizing_in_fluids():
    # Independent: fluids.safety_valve.API520_A_steam, API 520 Part I's Napier-based
    # steam sizing (51.5·A·P₁·K_d, lb/h, in², psia), with K_d = 0.6: the area it returns
    # for our flow must be our orifice's area. Choked flow: 50 psig into atmosphere.
    sv = pytest.importorskip("fluids.safety_valve")
    p1 = 50 * PSI + ATM
    d = 3.0e-3
    w = float(purge.steam_orifice_flow(d, p1, ATM))
    t1 = float(properties.saturation_temperature(p1))
    area = sv.API520_A_steam(m=w, T=t1, P1=p1, Kd=0.6)
    assert area == pytest.approx(math.pi / 4 * d ** 2, rel=0.003)


def test_purge_flow_falls_to_zero_as_the_differential_vanishes():
    # Saint-Venant–Wantzel: the flow function is zero at p₂ = p₁ and full below the
    # critical ratio (0.577 for γ = 1.135).
    p1 = 2.0e5
    assert float(purge.steam_orifice_flow(0.003, p1, p1)) == 0.0
    choked = float(purge.steam_orifice_flow(0.003, p1, 0.5 * p1))
    assert float(purge.steam_orifice_flow(0.003, p1, purge.CRITICAL_RATIO * p1)) == pytest.approx(choked)
    assert purge.CRITICAL_RATIO == pytest.approx(0.577, abs=0.001)
    assert 0 < float(purge.steam_orifice_flow(0.003, p1, 0.9 * p1)) < choked


PURGE_UNIT = BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "constant-purge"').replace(
    "[drain]", '[site]\nhours_per_year = 4000\nsteam_price = 15\ncurrency = "USD"\n[drain]')


def test_purge_yearly_cost_by_hand():
    # Hand calculation: hours × the full-load bleed (the stated basis without bins)
    # × price per 1000 lb.
    # The bleed itself by hand: US DOE Steam Tip Sheet #1, W = 24.24·p·d² (lb/h, psia,
    # in) for critical flow; from 5 psig (19.70 psia) into 0 psig the pressure ratio
    # 14.696/19.70 = 0.746 is above the critical 0.577, so the flow is scaled by the
    # nozzle flow function ψ(r) = √(2γ/(γ−1)·(r^(2/γ) − r^((γ+1)/γ))), γ = 1.135
    # (saturated steam), against its value at the critical ratio.
    r = analysis.analyse(unit(PURGE_UNIT, 'purge_orifice = "0.0625 in"\n'))
    pu = r.purge
    p1 = 5.0 + 14.696
    gamma = 1.135

    def psi(ratio):
        return math.sqrt(2 * gamma / (gamma - 1) * (ratio ** (2 / gamma) - ratio ** ((gamma + 1) / gamma)))

    critical = (2 / (gamma + 1)) ** (gamma / (gamma - 1))
    rate_lb_h = 24.24 * p1 * 0.0625 ** 2 * psi(14.696 / p1) / psi(critical)
    rate = rate_lb_h * 0.45359237 / 3600
    assert pu.design_rate == pytest.approx(rate, rel=2e-3)
    # then hours x the full-load bleed x the price per 1000 lb
    assert pu.yearly_mass == pytest.approx(rate * 4000 * 3600, rel=2e-3)
    assert pu.yearly_cost == pytest.approx(rate * 4000 * 3600 / (1000 * 0.45359237) * 15, rel=2e-3)
    assert pu.currency == "USD"


def test_purge_cannot_hold_where_the_coil_falls_to_the_back_pressure():
    # Physics: a purge only bleeds while the coil is above what it discharges into.
    r = analysis.analyse(unit(PURGE_UNIT, 'purge_rate = "10 lb/h"\n[load]\nminimum = 0.3\n'))
    assert not r.purge.holds_differential and r.purge.minimum_rate == 0.0
    # at full load the coil is above the back pressure: the stated rate bleeds
    assert r.purge.design_rate == pytest.approx(10 * LB_H, rel=1e-12)
    assert "purge-cannot-hold" in {f.code for f in r.findings}


def test_purge_without_a_size_says_so():
    r = analysis.analyse(unit(PURGE_UNIT))
    assert r.purge is None
    assert "purge-size-unknown" in {f.code for f in r.findings}


# --- the drainage limit -------------------------------------------------------------------

TABLE = """
[[drain.capacity]]
differential = "0.25 psi"
flow = "150 lb/h"
[[drain.capacity]]
differential = "2 psi"
flow = "420 lb/h"
"""


def test_drainage_limit_balances_capacity_and_condensate_by_hand():
    # Hand calculation at the reported limit: condensate = f·Q_design/h_fg(p_coil) with
    # IF97 (iapws), differential = p_coil + ρ·g·fill − back, and the table read by hand on
    # log-log axes; the two must meet there.
    r = analysis.analyse(unit(extra=TABLE))
    t = r.trap
    assert t.basis == "table"
    assert t.limit_load >= r.stall.load_fraction
    sat = IAPWS97(P=t.limit_coil_pressure / 1e6, x=0)
    h_fg = (IAPWS97(P=t.limit_coil_pressure / 1e6, x=1).h - sat.h) * 1e3
    need = t.limit_load * r.design.load / h_fg
    dp = t.limit_differential / PSI
    slope = math.log(420 / 150) / math.log(2 / 0.25)
    cap = (150 * (dp / 0.25) ** slope if dp >= 0.25 else 150 * math.sqrt(dp / 0.25)) * LB_H
    assert need == pytest.approx(cap, rel=0.01)
    assert t.limit_condensate == pytest.approx(need, rel=0.01)


def _breaker_table(flow_lb_h: float) -> str:
    return (f'[[drain.capacity]]\ndifferential = "0.25 psi"\nflow = "{flow_lb_h} lb/h"\n'
            f'[[drain.capacity]]\ndifferential = "4 psi"\nflow = "{4 * flow_lb_h} lb/h"\n')


@pytest.mark.parametrize("flow", [130, 120])
def test_behind_a_vacuum_breaker_the_trap_is_judged_at_atmospheric_pressure(flow):
    # A vacuum breaker holds the coil at atmospheric pressure wherever the load alone
    # would pull it below: the trap then has the fill head's gravity across it,
    # ρ·g·5 ft (water at 1 atm, IF97 via iapws), 2.08 psi. Its shortfall is largest
    # where the coil first reaches atmospheric, at the load f_atm of the NTU model worked
    # by hand: with ε fixed by the design point and the set point held,
    # f = ε·(T_s − T_out)/((1 − ε)·ΔT_design), T_s = 100 °C.
    text = (BASE_UNIT.replace('fill_head = "18 in"', 'fill_head = "5 ft"')
            .replace('arrangement = "trap"', 'arrangement = "trap-vacuum-breaker"'))
    r = analysis.analyse(unit(text, extra=_breaker_table(flow)))
    t_in, t_out = (-10 - 32) / 1.8, (50 - 32) / 1.8
    t_sd = IAPWS97(P=(ATM + 5 * PSI) / 1e6, x=0).T - 273.15
    eps = (t_out - t_in) / (t_sd - t_in)
    t_atm = IAPWS97(P=ATM / 1e6, x=0).T - 273.15
    f_atm = eps * (t_atm - t_out) / ((1 - eps) * (t_out - t_in))
    h_fg = (IAPWS97(P=ATM / 1e6, x=1).h - IAPWS97(P=ATM / 1e6, x=0).h) * 1e3
    need = f_atm * r.design.load / h_fg
    gravity = IAPWS97(P=ATM / 1e6, x=0).rho * 9.80665 * 5 * 0.3048 / PSI
    slope = math.log(4) / math.log(4 / 0.25)
    cap = flow * (gravity / 0.25) ** slope * LB_H
    t = r.trap
    if cap >= need:   # 130 lb/h: keeps up behind the breaker at every load
        assert flow == 130 and t.limit_load is None
        assert "trap-capacity-short" not in {f.code for f in r.findings}
    else:             # 120 lb/h: short, and the limit lies where the coil is above atmospheric
        assert flow == 120 and t.limit_load > f_atm and t.limit_coil_pressure > ATM
        dp = t.limit_differential / PSI
        assert t.limit_condensate == pytest.approx(flow * (dp / 0.25) ** slope * LB_H, rel=0.01)


@pytest.mark.parametrize("bore, short", [("0.5 in", False), ("0.15 in", True)])
def test_small_seat_falls_short_above_the_stall(bore, short):
    # Physics: a seat too small for the condensate at low differential drains only down to
    # a load well above the stall point. This coil needs a vacuum breaker, and the trap
    # is judged behind it: the breaker holds the coil at atmospheric pressure, so a
    # generous seat, driven by the fill head's gravity, keeps up at every load.
    r = analysis.analyse(unit(extra=f'trap_orifice = "{bore}"\n'))
    assert r.trap.basis == "orifice" and r.drainage.required == "trap-vacuum-breaker"
    if short:
        assert r.trap.limit_load - r.stall.load_fraction > 0.02
    else:
        assert r.trap.limit_load is None
    assert ("trap-capacity-short" in {f.code for f in r.findings}) == short


def test_selection_rule_va_design_manual():
    # VA HVAC Design Manual (common practice): size for 1.5-2 × the condensing rate; the
    # default margin is 2 and the user may override it.
    r = analysis.analyse(unit())
    assert r.trap.required_capacity == pytest.approx(2.0 * r.design.steam_flow)
    r = analysis.analyse(unit(extra="capacity_margin = 1.5\n"))
    assert r.trap.required_capacity == pytest.approx(1.5 * r.design.steam_flow)
    r = analysis.analyse(unit(extra=TABLE))
    assert r.trap.capacity_ok is False and "trap-undersized" in {f.code for f in r.findings}


# --- pump-trap ----------------------------------------------------------------------------

PUMP_UNIT = BASE_UNIT.replace('arrangement = "trap"', 'arrangement = "pump-trap"').replace(
    'lift = "0 ft"', 'lift = "12 ft"')


def test_pump_trap_duty_is_the_condensate_at_the_stall_point():
    r = analysis.analyse(unit(PUMP_UNIT, 'motive_pressure = "50 psig"\npump_fill_head = "12 in"\n'
                                         'pump_capacity = "2000 lb/h"\n'))
    pt = r.pump_trap
    assert pt.installed and pt.condensate == pytest.approx(r.stall.condensate)
    assert pt.back_pressure == pytest.approx(r.back_pressure)
    codes = {f.code for f in r.findings}
    assert not codes & {"pump-trap-motive-low", "pump-trap-fill-head-low", "pump-trap-undersized"}


def test_pump_trap_shortfalls_each_give_a_finding():
    r = analysis.analyse(unit(PUMP_UNIT, 'motive_pressure = "8 psig"\npump_fill_head = "24 in"\n'
                                         'pump_capacity = "100 lb/h"\n'))
    codes = {f.code for f in r.findings}
    assert {"pump-trap-motive-low", "pump-trap-fill-head-low", "pump-trap-undersized"} <= codes


def test_pump_trap_motive_defaults_to_the_supply():
    r = analysis.analyse(unit(PUMP_UNIT))
    assert r.pump_trap.motive_pressure == pytest.approx(r.supply_pressure)
    assert not r.pump_trap.motive_given
    assert r.pump_trap.required_fill_head == pytest.approx(0.3)


# --- remedies -----------------------------------------------------------------------------

REMEDY_UNITS = [
    # stalls in its operating range
    dict(lift="6 ft", ret="0 psig", steam="10 psig", minimum=0.7),
    dict(lift="6 ft", ret="1 psig", steam="5 psig", minimum=0.9),
    # drains down to its minimum load: the figures are its margins
    dict(lift="10 ft", ret="0 psig", steam="12 psig", minimum=0.95),
]


def _remedy_unit(lift, ret, steam, minimum):
    return unit(BASE_UNIT.replace('lift = "0 ft"', f'lift = "{lift}"')
                .replace('return_pressure = "0 psig"', f'return_pressure = "{ret}"')
                .replace('steam_pressure = "5 psig"', f'steam_pressure = "{steam}"')
                .replace('supply_pressure = "15 psig"', 'supply_pressure = "100 psig"'),
                f"\n[load]\nminimum = {minimum}\n")


def _with(u, key, value):
    section, name = key.split(".")
    if section == "drain":
        return replace(u, drain=replace(u.drain, **{name: value}))
    return replace(u, design=replace(u.design, **{name: value}))


def test_each_remedy_puts_the_stall_point_at_or_below_the_minimum_load():
    # Independent of the closed forms: re-run the whole analysis with each proposed
    # value; the stall point must land at or a little below load.minimum (the figures
    # keep a 1 kPa margin and are rounded in the safe direction), and the installed
    # trap is then adequate.
    achieved = set()
    for spec in REMEDY_UNITS:
        u = _remedy_unit(**spec)
        for m in analysis.analyse(u).remedies:
            if m.value is None:
                continue
            again = analysis.analyse(_with(u, m.key, m.value))
            assert again.drainage.adequate, m.key
            assert not again.stall.in_range, m.key
            if m.key == "drain.fill_head" and m.value == 0.0:
                continue
            achieved.add(m.key)
            assert (again.stall.load_fraction or 0.0) <= spec["minimum"], m.key
            if again.stall.occurs:
                assert again.stall.load_fraction > spec["minimum"] - 0.15, m.key
    assert achieved == {"drain.lift", "drain.return_pressure", "drain.trap_min_differential",
                        "drain.fill_head", "design.steam_pressure"}


def test_lift_remedy_by_hand():
    # Hand calculation with IF97 (iapws): for a fixed-flow air coil the steam temperature
    # is T_out + f·(T_s,design − T_out); at f = 0.95 the coil pressure is p_sat of that;
    # the largest lift is (p + ρ·g·fill − p_return)/(ρ·g), ρ of saturated water at the return.
    u = _remedy_unit(**REMEDY_UNITS[2])
    t_out = (50 - 32) / 1.8 + 273.15
    p_design = 12 * PSI + ATM
    t_design = IAPWS97(P=p_design / 1e6, x=0).T
    t = t_out + 0.95 * (t_design - t_out)
    p = IAPWS97(T=t, x=0).P * 1e6
    rho = IAPWS97(P=ATM / 1e6, x=0).rho
    # less the stated 1 kPa margin, then rounded down to the 0.1 ft it is printed in
    exact = (p - 1000.0 + rho * 9.80665 * 18 * INCH - ATM) / (rho * 9.80665)
    expected = math.floor(exact / 0.3048 * 10) / 10 * 0.3048
    lift = next(m for m in said(analysis.analyse(u)) if m.key == "drain.lift")
    assert lift.value == pytest.approx(expected, rel=1e-9)
    assert f"{expected / 0.3048:.1f} ft" in lift.note


def test_impossible_remedy_says_so_in_words():
    u = _remedy_unit(lift="6 ft", ret="1 psig", steam="5 psig", minimum=0.9)
    lift = next(m for m in said(analysis.analyse(u)) if m.key == "drain.lift")
    assert lift.value is None and lift.status == "impossible" and not lift.achievable
    assert lift.note.startswith("even with no lift the trap cannot drain it down to 90% load")


def test_more_lift_never_lowers_the_largest_lift_remedy_below_zero_margin():
    # Physics: the lift remedy is the same whatever lift is installed now (it depends on
    # the coil, the return and the fill head only).
    a = _remedy_unit(**REMEDY_UNITS[2])
    b = _with(a, "drain.lift", 0.0)
    la = next(m for m in analysis.analyse(a).remedies if m.key == "drain.lift").value
    lb = next(m for m in analysis.analyse(b).remedies if m.key == "drain.lift").value
    assert la == pytest.approx(lb)


PUMP_TABLE = """
[[drain.pump_capacity]]
back_pressure = "0 psig"
flow = "3000 lb/h"
[[drain.pump_capacity]]
back_pressure = "10 psig"
flow = "1800 lb/h"
"""


def test_pump_trap_capacity_read_from_the_makers_table_by_hand():
    # Hand calculation: the back pressure is 0 psig plus the 12 ft lift head, ρ·g·h with
    # saturated water at 1 atm (iapws); capacity straight-line between the two rows.
    r = analysis.analyse(unit(PUMP_UNIT, PUMP_TABLE))
    rho = IAPWS97(P=ATM / 1e6, x=0).rho
    back_psig = rho * 9.80665 * 12 * FT / PSI
    expected = 3000 + (1800 - 3000) * back_psig / 10
    assert r.pump_trap.capacity_basis == "table"
    assert r.pump_trap.capacity / LB_H == pytest.approx(expected, rel=1e-6)


def test_pump_trap_beyond_its_table_is_flagged():
    r = analysis.analyse(unit(PUMP_UNIT.replace('lift = "12 ft"', 'lift = "40 ft"'), PUMP_TABLE))
    assert r.pump_trap.outside_table and r.pump_trap.capacity is None
    assert "pump-trap-outside-table" in {f.code for f in r.findings}


def test_pump_table_rows_must_rise_in_back_pressure():
    rows = PUMP_TABLE.replace('"10 psig"', '"-1 psig"')
    with pytest.raises(InputError, match="back pressures must increase"):
        unit(PUMP_UNIT, rows)


def test_poor_trap_type_at_low_working_differential_without_a_stall():
    # A unit that never stalls in its range but whose trap works below 1 psi: an
    # inverted-bucket trap there is flagged (common practice); a float-thermostatic one is not.
    text = BASE_UNIT.replace('steam_pressure = "5 psig"', 'steam_pressure = "12 psig"').replace(
        'supply_pressure = "15 psig"', 'supply_pressure = "30 psig"')
    extra = "[load]\nminimum = 0.83\n"
    bucket = analysis.analyse(unit(text.replace('arrangement = "trap"', 'arrangement = "trap"\ntrap = "inverted-bucket"'), extra))
    assert bucket.stall.load_fraction < 0.83 and bucket.trap.working_differential < PSI
    assert "trap-type-modulating" in {f.code for f in bucket.findings}
    ft = analysis.analyse(unit(text, extra))
    assert "trap-type-modulating" not in {f.code for f in ft.findings}


def test_trap_selected_at_a_quarter_psi_where_it_works_below_that():
    # Published rule: US Department of Veterans Affairs, HVAC Design Manual, steam
    # section: size traps on modulating equipment at 1/4 psi differential. A coil that
    # stalls at its minimum load has almost no differential there, so the trap is
    # selected at 1/4 psi (1.724 kPa), and the figures say so.
    u = unit(BASE_UNIT.replace("[drain]", "[load]\nminimum = 0.4\n[drain]").replace(
        'fill_head = "18 in"', 'fill_head = "2 in"'))
    r = analysis.analyse(u)
    assert r.trap.working_differential < 0.25 * PSI
    assert r.trap.selection_differential == pytest.approx(0.25 * PSI, rel=1e-9)
    from stallcheck.render import json as contract
    assert contract.to_dict(r)["trap"]["selection_differential_kpa"] == pytest.approx(1.7237, abs=1e-4)
