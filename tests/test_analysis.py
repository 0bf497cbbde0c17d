"""Analysis of whole units: facts of the trade, invariants, and the valve-limited point."""

import numpy as np
import pytest
from conftest import BASE_UNIT
from iapws import IAPWS97

from stallcheck import analysis
from stallcheck.files import unitfile
from stallcheck.physics import atmosphere
from stallcheck.physics import drainage, properties

PSI = 6894.757
FT = 0.3048


def unit(text=BASE_UNIT, **replace):
    for old, new in replace.items():
        text = text.replace(old, new)
    return unitfile.parse(text, "test.toml")


def test_water_column_common_practice():
    # Common practice: 0.433 psi per foot of cold water (2.31 ft per psi).
    rho_cold = 999.0  # kg/m³ near 15 °C, from memory
    assert drainage.head(FT, rho_cold) / PSI == pytest.approx(0.433, abs=0.001)
    # Hot condensate is lighter: about 0.094 bar per metre near 100 °C (common practice).
    assert drainage.head(1.0, properties.liquid_density(101325.0)) / 1e5 == pytest.approx(0.094, abs=0.001)


def test_return_temperatures_below_atmospheric_boiling():
    # Common practice: condensate returns run 140-180 °F, well below 212 °F, the
    # saturation temperature at one standard atmosphere.
    t_atm = properties.saturation_temperature(101325.0)
    assert (t_atm - 273.15) * 1.8 + 32 == pytest.approx(212.0, abs=0.05)
    assert (180 - 32) / 1.8 + 273.15 < t_atm - 5


def test_standard_atmosphere_table():
    # Published: ICAO/ISO 2533 standard atmosphere table, 1500 m: 84.56 kPa; 3000 m: 70.12 kPa.
    assert atmosphere.pressure_at(1500.0) / 1000 == pytest.approx(84.56, abs=0.02)
    assert atmosphere.pressure_at(3000.0) / 1000 == pytest.approx(70.12, abs=0.02)


def test_back_pressure_above_design_pressure_stalls_everywhere():
    # Common practice: back pressure above the coil pressure at full load floods the coil.
    r = analysis.analyse(unit(**{'return_pressure = "0 psig"': 'return_pressure = "8 psig"'}))
    assert r.stall.occurs and r.stall.load_fraction == 1.0
    assert np.all(r.points.stalled)


def test_more_lift_never_lowers_the_stall_load():
    loads = [analysis.analyse(unit(**{'lift = "0 ft"': f'lift = "{h} ft"'})).stall.load_fraction or 0
             for h in (0, 2, 4, 8, 16)]
    assert loads == sorted(loads)
    assert loads[-1] == 1.0


def test_more_fill_head_never_raises_the_stall_load():
    loads = [analysis.analyse(unit(**{'fill_head = "18 in"': f'fill_head = "{h} in"'})).stall.load_fraction or 0
             for h in (0, 12, 24, 48, 96)]
    assert loads == sorted(loads, reverse=True)


def test_stall_point_sits_on_the_threshold():
    r = analysis.analyse(unit())
    s = r.stall
    # p_coil + fill = back + trap minimum differential at the stall point.
    assert s.coil_pressure + r.fill_head_pressure == pytest.approx(r.back_pressure + r.trap_min_differential)
    # Points below the stall load are stalled, above are not.
    f = r.points.load_fraction
    assert np.all(r.points.stalled[f < s.load_fraction - 1e-9])
    assert not np.any(r.points.stalled[f > s.load_fraction + 1e-9])
    # Condensate at the stall point: load / h_fg at that pressure, h_fg from the
    # independent `iapws` implementation of IF97.
    h_fg = (IAPWS97(P=s.coil_pressure / 1e6, x=1).h - IAPWS97(P=s.coil_pressure / 1e6, x=0).h) * 1000
    assert s.condensate == pytest.approx(s.load_fraction * r.design.load / h_fg, rel=1e-6)


def test_steam_and_valve_opening_grow_with_load():
    r = analysis.analyse(unit())
    assert np.all(np.diff(r.points.steam_flow) > 0)
    assert np.all(np.diff(r.points.valve_opening[r.points.valve_opening > 0]) > 0)


def test_valve_limited_point_balances_flow():
    r = analysis.analyse(unit(**{"cv = 10": "cv = 4"}))
    v = r.valve
    assert not v.capacity_ok and 0 < v.limited_load_fraction < 1
    # At the limited point the open valve passes exactly what the coil condenses.
    # Hand calculation, IEC 60534-2-1 compressible flow in kg/h, bar and kg/m³ with the
    # Cv constant N6 = 27.3 (Table 1): W = N6·Cv·Y·√(x·p1·ρ1), Fγ = 1.30/1.40, x limited
    # to Fγ·xT, Y = 1 − x/(3·Fγ·xT); steam properties from the `iapws` package.
    p = v.limited_coil_pressure
    p1 = r.supply_pressure
    rho1 = IAPWS97(P=p1 / 1e6, x=1).rho
    f_gamma, xt = 1.30 / 1.40, 0.70
    x = min((p1 - p) / p1, f_gamma * xt)
    y = 1 - x / (3 * f_gamma * xt)
    passed = 27.3 * 4.0 * y * np.sqrt(x * (p1 / 1e5) * rho1) / 3600.0
    h_fg = (IAPWS97(P=p / 1e6, x=1).h - IAPWS97(P=p / 1e6, x=0).h) * 1000
    condensed = v.limited_load_fraction * r.design.load / h_fg
    assert passed == pytest.approx(condensed, rel=1e-3)
    # and the load it delivers, by hand from the coil at design flow and entering
    # temperature: Q/Q_design = (T_s − T_in,d)/(T_s,d − T_in,d), temperatures from iapws
    t_in = (-10 - 32) / 1.8 + 273.15
    t_design = IAPWS97(P=(101325 + 5 * PSI) / 1e6, x=0).T
    delivered = (IAPWS97(P=p / 1e6, x=0).T - t_in) / (t_design - t_in)
    assert v.limited_load_fraction == pytest.approx(delivered, rel=1e-6)
    assert any(f.code == "valve-too-small" for f in r.findings)


def test_stalled_hours_from_bins():
    text = BASE_UNIT + """
[load]
varies = "inlet-temperature"
[[load.bins]]
inlet_temperature = "-8 degF"
hours = 100
[[load.bins]]
inlet_temperature = "40 degF"
hours = 300
[[load.bins]]
inlet_temperature = "60 degF"
hours = 500
"""
    r = analysis.analyse(unitfile.parse(text, "t.toml"))
    # Stall load from the threshold; -8 °F is 58/60 = 97 % load, 40 °F is 17 %, 60 °F is off.
    f_stall = r.stall.load_fraction
    expected = (100 if 58 / 60 <= f_stall else 0) + (300 if 10 / 60 <= f_stall else 0)
    assert r.stalled_hours == expected
    assert r.total_hours == 900


def test_methods_differ_only_where_flow_varies():
    text = BASE_UNIT + '[load]\nvaries = "flow"\n'
    a = analysis.analyse(unitfile.parse(text, "t.toml"), method="ntu")
    b = analysis.analyse(unitfile.parse(text, "t.toml"), method="mean-temperature")
    assert a.stall.load_fraction != pytest.approx(b.stall.load_fraction, rel=1e-3)
    c = analysis.analyse(unit(), method="ntu")
    d = analysis.analyse(unit(), method="mean-temperature")
    assert c.stall.load_fraction == pytest.approx(d.stall.load_fraction, rel=1e-12)


def test_set_point_at_steam_temperature_is_an_input_error():
    from stallcheck.errors import InputError
    with pytest.raises(InputError, match="design.outlet_temperature"):
        analysis.analyse(unit(**{'outlet_temperature = "50 degF"': 'outlet_temperature = "240 degF"'}))


def test_points_of_a_unit_whose_load_follows_its_flow_keep_the_design_inlet():
    # With the flow varying, the entering temperature is the design one at every load
    # (the unit-file conventions): 10 °C for the sample water heater, as its file says.
    from conftest import SAMPLES

    sample = next(p for p in SAMPLES if p.name == "si_water_heater.toml")
    r = analysis.analyse(unitfile.load(sample))
    assert r.varies == "flow"
    assert np.all(np.abs(r.points.inlet_temperature - 283.15) < 1e-9)
