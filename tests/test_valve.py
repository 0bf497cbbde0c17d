"""Valve equation against the IEC 60534-2-1 implementation in the `fluids` library,
against the published simplified steam formula of UFC 3-410-02A, and the
characteristic against its defining formula."""

import math

import numpy as np
import pytest
from fluids.control_valve import Kv_to_Cv, size_control_valve_g

from stallcheck.physics import properties, valve

R = 8.314462618
MW_WATER = 18.01528  # g/mol


def _fluids_cv(w_kg_s, p1, p2, xt):
    """Cv from fluids' gas sizing, with steam made to match IF97's density at the inlet."""
    rho1 = float(properties.vapour_density(p1))
    t1 = float(properties.saturation_temperature(p1))
    z = p1 * MW_WATER * 1e-3 / (rho1 * R * t1)
    rho_std = 101325.0 * MW_WATER * 1e-3 / (R * 273.15)  # fluids' Q is at 0 °C, 1 atm
    kv = size_control_valve_g(T=t1, MW=MW_WATER, mu=1.2e-5, gamma=1.30, Z=z, P1=p1, P2=p2,
                              Q=w_kg_s / rho_std, xT=xt)
    return Kv_to_Cv(kv), rho1


# Independent: fluids.control_valve.size_control_valve_g (IEC 60534-2-1), steam as a gas.
@pytest.mark.parametrize("p1, p2, xt", [
    (205e3, 170e3, 0.70),   # small drop, not choked
    (205e3, 135e3, 0.70),   # moderate drop
    (205e3, 60e3, 0.70),    # choked: x = 0.71 > Fγ·xT = 0.65
    (800e3, 150e3, 0.50),   # choked, low xT
    (500e3, 420e3, 0.80),
])
def test_required_cv_matches_fluids(p1, p2, xt):
    w = 0.05
    ref, rho1 = _fluids_cv(w, p1, p2, xt)
    # N6 (mass form) and N9 (volume form) are rounded constants: agree within 0.5 %.
    assert valve.required_cv(w, p1, p2, rho1, xt) == pytest.approx(ref, rel=5e-3)


def test_flow_and_cv_are_inverse():
    rho1 = float(properties.vapour_density(300e3))
    p2 = np.linspace(50e3, 290e3, 30)
    w = valve.steam_flow(12.0, 300e3, p2, rho1, 0.7)
    assert valve.required_cv(w, 300e3, p2, rho1, 0.7) == pytest.approx(np.full(30, 12.0), rel=1e-12)


def test_choked_flow_does_not_grow():
    rho1 = float(properties.vapour_density(300e3))
    limit = 300e3 * (1 - 1.3 / 1.4 * 0.7)
    w = valve.steam_flow(10.0, 300e3, np.array([limit, limit - 50e3, 10e3]), rho1, 0.7)
    assert np.ptp(w) == pytest.approx(0.0, abs=1e-12)
    assert valve.is_choked(300e3, limit - 1.0, 0.7)


def test_ufc_simplified_steam_formula_within_ten_percent():
    # Published: UFC 3-410-02A, simplified steam valve sizing for saturated steam:
    # Cv = W / (2.11·√(Δp·(p_e + p_o))), W lb/h, pressures psia. REFERENCES.md expects it
    # within about 10 % of IEC 60534-2-1 for sub-critical drops.
    w_lb_h = 500.0
    p_e, p_o = 29.7, 22.0  # psia: 15 psig supply, about 7 psig in the coil
    ufc = w_lb_h / (2.11 * np.sqrt((p_e - p_o) * (p_e + p_o)))
    p1, p2 = p_e * 6894.757, p_o * 6894.757
    rho1 = float(properties.vapour_density(p1))
    ours = valve.required_cv(w_lb_h * 0.45359237 / 3600, p1, p2, rho1, 0.7)
    assert ours == pytest.approx(ufc, rel=0.10)


def test_equal_percentage_half_travel():
    # Computed (REFERENCES.md): with R = 50, C/Cmax = 50^(0.5 − 1) = 0.1414 at half travel.
    assert 50 ** (0.5 - 1) == pytest.approx(0.14142, rel=1e-4)
    assert valve.travel(0.14142136, "equal-percentage", 50) == pytest.approx(0.5, rel=1e-6)
    # below the smallest controllable fraction (1/R) the valve is shut
    assert valve.travel(0.01, "equal-percentage", 50) == 0.0
    # hand calculation: h = 1 + ln(0.03)/ln(50) = 0.10364 (just above 1/R = 0.02)
    assert valve.travel(0.03, "equal-percentage", 50) == pytest.approx(1 + math.log(0.03) / math.log(50), rel=1e-12)
    assert valve.travel(0.3, "linear", 50) == pytest.approx(0.3)


def test_n6_constant_in_lb_units():
    # Published: IEC 60534-2-1 Table 1 gives N6 = 63.3 for Cv with lb/h, psia, lb/ft³ and
    # 2.73 with kg/h, kPa, kg/m³. The two must describe the same valve.
    lb, psi, lbft3 = 0.45359237, 6.894757, 16.018463
    assert 63.3 * lb / np.sqrt(psi * lbft3) == pytest.approx(valve.N6_CV_KPA, rel=2e-3)
