"""Steam properties against IAPWS-IF97's own verification values and against the
independent `iapws` package."""

import numpy as np
import pytest
from iapws import IAPWS97

from stallcheck.errors import PropertyRangeError
from stallcheck.physics import properties


# Published: IAPWS R7-97(2012), Table 35 (saturation temperature, region 4),
# values printed to 9 significant figures.
@pytest.mark.parametrize("p_mpa, t_k", [(0.1, 372.755919), (1.0, 453.035632), (10.0, 584.149488)])
def test_saturation_temperature_if97_table35(p_mpa, t_k):
    assert properties.saturation_temperature(p_mpa * 1e6) == pytest.approx(t_k, abs=5e-6)


# Published: IAPWS R7-97(2012), Table 35 (saturation pressure, region 4).
@pytest.mark.parametrize("t_k, p_mpa", [(300.0, 0.00353658941), (500.0, 2.63889776), (600.0, 12.3443146)])
def test_saturation_pressure_if97_table35(t_k, p_mpa):
    assert properties.saturation_pressure(t_k) / 1e6 == pytest.approx(p_mpa, rel=5e-9)


def test_arrays_in_arrays_out():
    p = np.array([[50e3, 101.325e3], [200e3, 500e3]])
    t = properties.saturation_temperature(p)
    assert t.shape == p.shape
    assert np.all(np.diff(t.ravel()) > 0)


# Independent: the `iapws` package implements IF97 separately from CoolProp.
@pytest.mark.parametrize("p_kpa", [5.0, 20.0, 70.0, 101.325, 150.0, 300.0, 800.0, 1500.0])
def test_against_iapws_package(p_kpa):
    ref_f = IAPWS97(P=p_kpa / 1000, x=0)
    ref_g = IAPWS97(P=p_kpa / 1000, x=1)
    p = p_kpa * 1000
    assert properties.saturation_temperature(p) == pytest.approx(ref_f.T, rel=1e-7)
    assert properties.latent_heat(p) == pytest.approx((ref_g.h - ref_f.h) * 1000, rel=1e-6)
    assert properties.liquid_density(p) == pytest.approx(ref_f.rho, rel=1e-6)
    assert properties.vapour_density(p) == pytest.approx(ref_g.rho, rel=1e-6)
    assert properties.liquid_enthalpy(p) == pytest.approx(ref_f.h * 1000, rel=1e-6)


def test_latent_heat_at_one_atmosphere_steam_table():
    # Published (handbook steam tables, e.g. Cengel & Boles Table A-5): h_fg at
    # 101.325 kPa is 2256.5 kJ/kg (printed to 0.1 kJ/kg, from memory of the table).
    assert properties.latent_heat(101325.0) / 1000 == pytest.approx(2256.5, abs=0.3)


def test_below_triple_point_is_refused():
    with pytest.raises(PropertyRangeError, match="outside IAPWS-IF97"):
        properties.saturation_temperature(500.0)


@pytest.mark.parametrize("bad", [float("nan"), float("inf"), -float("inf"), 0.0, 611.0, 22.1e6])
def test_every_value_off_the_saturation_line_is_refused_alone_or_in_an_array(bad):
    # IF97's region 4 runs from the triple point (611.657 Pa, 273.16 K) to the critical
    # point (22.064 MPa, 647.096 K) (IAPWS R7-97, section 8); nothing outside it, nor a
    # NaN or an infinity, is ever passed on, whether alone or among good values.
    for value in (bad, [101325.0, bad, 2e5]):
        with pytest.raises(PropertyRangeError, match="outside IAPWS-IF97"):
            properties.saturation_temperature(value)
        with pytest.raises(PropertyRangeError, match="outside IAPWS-IF97"):
            properties.latent_heat(value)
    t_bad = {0.0: 273.0, 611.0: 273.15, 22.1e6: 648.0}.get(bad, bad)
    for value in (t_bad, [373.15, t_bad]):
        with pytest.raises(PropertyRangeError, match="outside IAPWS-IF97"):
            properties.saturation_pressure(value)


# Independent: CoolProp's own IF97 backend, over the whole saturation line from the
# triple point to just below the critical point, to 1e-9 relative.
def test_whole_saturation_line_against_coolprop_if97():
    import CoolProp.CoolProp as CP

    p = np.geomspace(properties.P_MIN, 0.999 * properties.P_CRIT, 1500)
    t = np.linspace(properties.T_MIN, 0.999 * properties.T_CRIT, 1500)

    def ref(output, name, value, quality):
        return CP.PropsSI(output, name, value, "Q", quality, "IF97::Water")

    checks = [
        (properties.saturation_temperature(p), ref("T", "P", p, 0)),
        (properties.saturation_pressure(t), ref("P", "T", t, 0)),
        (properties.latent_heat(p), ref("H", "P", p, 1) - ref("H", "P", p, 0)),
        (properties.latent_heat_at(t), ref("H", "T", t, 1) - ref("H", "T", t, 0)),
        (properties.liquid_enthalpy(p[p > 1e3]), ref("H", "P", p[p > 1e3], 0)),
        (properties.liquid_density(p), ref("D", "P", p, 0)),
        (properties.vapour_density(p), ref("D", "P", p, 1)),
        (properties.liquid_cp(p), ref("C", "P", p, 0)),
    ]
    for ours, theirs in checks:
        assert np.max(np.abs(ours / theirs - 1.0)) < 1e-9


# Independent: CoolProp's HEOS (IAPWS-95) liquid water at 500 kPa, which the shipped
# Chebyshev series stands for, checked between the fit's nodes over 0 °C to 150 °C.
def test_liquid_water_series_against_coolprop_heos():
    import CoolProp.CoolProp as CP

    t = np.linspace(273.15, 423.15, 3001)
    for output, ours in (("C", properties.medium_cp("water", None, t)),
                         ("D", properties.medium_density("water", None, t))):
        theirs = CP.PropsSI(output, "T", t, "P", properties.LIQUID_PRESSURE, "HEOS::Water")
        assert np.max(np.abs(ours / theirs - 1.0)) < 1e-10


def test_a_steam_and_air_or_water_check_does_not_import_coolprop():
    # CoolProp's import costs seconds; saturated steam and liquid water need none of it.
    import subprocess
    import sys

    code = ("import sys\nfrom stallcheck import analysis\nfrom stallcheck.files import unitfile\n"
            "for f in ('sample_units/us_vacuum_breaker_gravity.toml', 'sample_units/si_water_heater.toml'):\n"
            "    analysis.analyse(unitfile.load(f))\n"
            "print('CoolProp' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                         cwd=str(__import__("conftest").ROOT))
    assert out.stdout.strip() == "False"
