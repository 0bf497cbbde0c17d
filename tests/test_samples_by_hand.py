"""Each sample unit's stall load against a hand calculation written out here.

Steam-table values come from the `iapws` package (IAPWS-IF97, independent of
CoolProp), or from printed steam tables where the test says so. The coil relations
are those of the unit-file conventions, worked by hand:

* fixed flow (load follows entering temperature): Ts(f) = Tout + f·(Ts,d − Tout), so
  f_stall = (Ts,stall − Tout)/(Ts,d − Tout);
* flow-varying ε-NTU with UA ∝ flowⁿ: NTU(f) = NTU_d·f^(n−1), so
  f_stall = (NTU_stall/NTU_d)^(1/(n−1)), NTU = −ln(1 − ΔT/(Ts − Tin)).
"""

import math

import pytest
from conftest import ROOT
from iapws import IAPWS97

from stallcheck import analysis
from stallcheck.files import unitfile

G = 9.80665
PSI = 6894.757
INCH = 0.0254
FT = 0.3048


def tsat(p_pa):
    return IAPWS97(P=p_pa / 1e6, x=0).T


def rho_f(p_pa):
    return IAPWS97(P=p_pa / 1e6, x=0).rho


def f_to_k(f):
    return (f - 32) / 1.8 + 273.15


def run(name):
    return analysis.analyse(unitfile.load(ROOT / "sample_units" / name))


def test_vacuum_breaker_sample_from_printed_steam_tables():
    # Printed steam tables (values from memory of the ASME/Keenan tables, so the
    # tolerance is loose): Tsat at 24.70 psia (10 psig) ≈ 239.4 °F; saturated water at
    # 212 °F ≈ 59.8 lb/ft³, so 24 in of fill head ≈ 2 ft × 59.8/144 = 0.831 psi; stall at
    # 14.696 − 0.831 = 13.865 psia, where Tsat ≈ 209.2 °F.
    # f = (209.2 − 55)/(239.4 − 55) = 154.2/184.4 = 0.836.
    r = run("us_vacuum_breaker_gravity.toml")
    assert r.stall.load_fraction == pytest.approx(0.836, abs=0.01)
    assert r.drainage.required == "trap-vacuum-breaker"  # stall pressure below atmospheric
    assert r.drainage.adequate


def test_vacuum_breaker_sample_with_iapws():
    atm = 101325.0
    fill = rho_f(atm) * G * 24 * INCH
    t_stall = tsat(atm - fill)
    t_design = tsat(atm + 10 * PSI)
    f = (t_stall - f_to_k(55)) / (t_design - f_to_k(55))
    assert run("us_vacuum_breaker_gravity.toml").stall.load_fraction == pytest.approx(f, rel=1e-6)


def test_outdoor_air_preheat_sample():
    # Standard atmosphere at 850 ft = 259.08 m: 101325·(1 − 2.25577e-5·259.08)^5.25588.
    atm = 101325.0 * (1 - 2.25577e-5 * 850 * FT) ** 5.25588
    p_ret = atm + 1 * PSI
    rho = rho_f(p_ret)
    p_stall = p_ret + rho * G * (10 * FT - 12 * INCH) + 0.25 * PSI
    f = (tsat(p_stall) - f_to_k(55)) / (tsat(atm + 8 * PSI) - f_to_k(55))
    r = run("us_outdoor_air_preheat.toml")
    assert r.stall.load_fraction == pytest.approx(f, rel=1e-6)
    # Entering air at stall: Tin = Tout − f·(Tout − Tin,d) = 55 − f·60 °F.
    assert r.stall.inlet_temperature == pytest.approx(f_to_k(55 - f * 60), abs=1e-6)
    assert r.drainage.required == "pump-trap"  # stall pressure above atmospheric


def test_water_heater_sample():
    atm = 101325.0
    p_stall = atm - rho_f(atm) * G * 0.6
    t_in, t_out = 283.15, 333.15
    def ntu(ts):
        return -math.log(1 - (t_out - t_in) / (ts - t_in))
    ntu_d = ntu(tsat(atm + 2e5))
    ntu_s = ntu(tsat(p_stall))
    f = (ntu_s / ntu_d) ** (1 / (0.0 - 1))
    r = run("si_water_heater.toml")
    assert r.stall.load_fraction == pytest.approx(f, rel=1e-6)
    assert r.drainage.required == "trap-vacuum-breaker"
    assert r.drainage.adequate  # a pump-trap is installed


def test_glycol_exchanger_sample():
    atm = 101325.0
    p_stall = atm - rho_f(atm) * G * 0.5
    t_in, t_out, n = 298.15, 318.15, 0.3
    def ntu(ts):
        return -math.log(1 - (t_out - t_in) / (ts - t_in))
    f = (ntu(tsat(p_stall)) / ntu(tsat(atm + 5e5))) ** (1 / (n - 1))
    r = run("si_glycol_exchanger.toml")
    assert r.stall.load_fraction == pytest.approx(f, rel=1e-6)
    assert r.stall.load_fraction < 0.4  # under its minimum load: a plain trap serves
    assert r.drainage.required == "trap" and r.exit_status == 0


def test_flooded_sample_stalls_at_full_load():
    # Common practice: a unit whose back pressure exceeds its coil pressure at design
    # load stalls at every load. Here: return 0.35 barg plus 4 m of lift against a coil
    # at 0.30 barg with 0.3 m of fill.
    atm = 101325.0
    p_ret = atm + 0.35e5
    back = p_ret + rho_f(p_ret) * G * 4.0
    assert back - rho_f(p_ret) * G * 0.3 > atm + 0.30e5
    r = run("si_flooded_reheat.toml")
    assert r.stall.occurs and r.stall.load_fraction == 1.0
    assert r.drainage.required == "pump-trap" and not r.drainage.adequate
    assert r.exit_status == 1
