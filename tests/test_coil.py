"""Coil heat transfer: ε-NTU against the `ht` library, inverses by round trip, and the
method's straight line for fixed flow written out by hand."""

import ht
import numpy as np
import pytest

from stallcheck.physics import coil


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
    # above the load where the mean-temperature line is held at the set point
    f = np.linspace(max(0.05, 1.01 * float(coil.set_point_floor_load(m))), 1.0, 20)
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
            m = _model(method, varies, 0.3)
            t = coil.steam_temperature(m, np.linspace(0.01, 1, 50))
            assert np.all(np.diff(t) >= 0)
            above = coil.steam_temperature(m, np.linspace(float(coil.set_point_floor_load(m)) + 0.01, 1, 50))
            assert np.all(np.diff(above) > 0)


def test_mean_temperature_line_held_at_the_set_point_by_hand():
    # Hand calculation, mean-temperature method with the flow varying, n = 0:
    # T_s(f) = T_mean + f·(T_s,d − T_mean), T_mean = (250 + 283.15)/2 = 266.575 K. It
    # reaches the set point 283.15 K at f* = 16.575/113.425 = 0.146133...; below that
    # the coil cannot heat with steam colder than the air it must deliver, so the
    # steam is held at the set point (a lower bound: the stall is then on the safe side).
    m = _model("mean-temperature", "flow", 0.0)
    assert float(coil.set_point_floor_load(m)) == pytest.approx(16.575 / 113.425, rel=1e-12)
    assert coil.steam_temperature(m, 0.05) == pytest.approx(283.15, abs=1e-12)
    assert coil.steam_temperature(m, 0.5) == pytest.approx(266.575 + 0.5 * 113.425, rel=1e-12)
    # every steam temperature below the set point is needed at no load; at it, below f*
    assert coil.load_at_steam_temperature(m, 280.0) == 0.0
    assert float(coil.set_point_floor_load(_model("ntu", "flow", 0.0))) == 0.0
