"""Coil heat transfer: ε-NTU against the `ht` library, inverses by round trip, and the
method's straight line for fixed flow written out by hand."""

import numpy as np
import pytest
import ht

from stallcheck import coil


def _model(method="ntu", varies="inlet-temperature", n=0.0):
    return coil.CoilModel(method, varies, inlet_design=250.0, outlet=283.15, steam_design=380.0, ua_exponent=n)


# Independent: ht.effectiveness_from_NTU with Cr = 0 (condensing on one side).
@pytest.mark.parametrize("ntu", [0.1, 0.5, 1.0, 2.0, 4.0])
def test_effectiveness_matches_ht_for_condensing(ntu):
    m = coil.CoilModel("ntu", "flow", 280.0, 280.0 + (1 - np.exp(-ntu)) * 100.0, 380.0, 0.0)
    assert m.ntu_design == pytest.approx(ntu, rel=1e-12)
    assert m.effectiveness_design == pytest.approx(ht.effectiveness_from_NTU(ntu, 0.0, "counterflow"), rel=1e-12)


def test_fixed_flow_is_a_straight_line_by_hand():
    # Hand calculation: with flow and UA fixed, ε is fixed, Q = m·cp·ε·(Ts − Tin) and
    # Tout = Tin + ε(Ts − Tin). Eliminating Tin with f = (Tout − Tin)/(Tout − Tin,d):
    # Ts = Tout + f·(Ts,d − Tout). At f = 0.5: 283.15 + 0.5·(380 − 283.15) = 331.575 K.
    for method in ("ntu", "mean-temperature"):
        assert coil.steam_temperature(_model(method), 0.5) == pytest.approx(331.575, abs=1e-9)


@pytest.mark.parametrize("method", ["ntu", "mean-temperature"])
@pytest.mark.parametrize("varies, n", [("inlet-temperature", 0.0), ("flow", 0.0), ("flow", 0.5), ("flow", 0.8)])
def test_inverse_round_trip(method, varies, n):
    m = _model(method, varies, n)
    f = np.linspace(0.05, 1.0, 20)
    t = coil.steam_temperature(m, f)
    assert coil.load_at_steam_temperature(m, t) == pytest.approx(f, rel=1e-9)
    assert coil.steam_temperature(m, 1.0) == pytest.approx(380.0)


def test_flow_varying_ntu_by_hand():
    # Hand calculation: NTU_d = −ln(1 − 33.15/130) = 0.294 4...; at half flow with n = 0,
    # NTU = 2·NTU_d, ε = 1 − exp(−2·NTU_d) = 1 − (1 − 0.255)² = 0.4450, so
    # Ts = 250 + 33.15/0.4450.
    m = _model("ntu", "flow", 0.0)
    eps_d = 33.15 / 130.0
    eps = 1 - (1 - eps_d) ** 2
    assert coil.steam_temperature(m, 0.5) == pytest.approx(250 + 33.15 / eps, rel=1e-12)


def test_steam_temperature_rises_with_load():
    for method in ("ntu", "mean-temperature"):
        for varies in ("inlet-temperature", "flow"):
            t = coil.steam_temperature(_model(method, varies, 0.3), np.linspace(0.01, 1, 50))
            assert np.all(np.diff(t) > 0)
