"""Steam properties against IAPWS-IF97's own verification values and against the
independent `iapws` package."""

import numpy as np
import pytest
from iapws import IAPWS97

from stallcheck import properties
from stallcheck.errors import PropertyRangeError


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
