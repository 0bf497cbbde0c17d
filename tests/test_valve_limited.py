"""The valve-limited coil: the coil runs at the lesser of the pressure its load needs and
the pressure its open valve gives, and floods where that is under the stall pressure.

Independent tier: every expected figure is solved here from outside values: steam
properties from the ``iapws`` package (IAPWS-IF97), the valve's steam flow by
IEC 60534-2-1 (W = N6·Fp·C·Y·√(x·p1·ρ1), N6 = 27.3 for Cv in kg/h, bar, kg/m³;
Fγ = γ/1.40 with γ = 1.30; x limited to Fγ·xT; Y = 1 − x/(3·Fγ·xT)), the coil's heat at
full-load air flow going as T_s − T_in (a fixed flow: the heat-capacity rate and UA
fixed, ε fixed; Incropera & DeWitt eq. 11.35a), and roots by SciPy's ``brentq``.
"""

from __future__ import annotations

import copy
import itertools
import math

import numpy as np
import pytest
from iapws import IAPWS97
from scipy.optimize import brentq

from stallcheck import analysis
from stallcheck.files import unitfile

PSI = 6894.757293168
ATM = 101325.0
INCH = 0.0254
G = 9.80665
CFM = 0.028316846592 / 60.0
AIR_DENSITY = 1.204  # standard air (the unit-file conventions)
AIR_CP = 1006.0


def f_to_k(t):
    return (t - 32.0) / 1.8 + 273.15


def sat(p):
    """Saturated liquid and vapour at p [Pa] (IF97, iapws)."""
    return IAPWS97(P=p / 1e6, x=0), IAPWS97(P=p / 1e6, x=1)


def valve_flow(cv, p1, p2, xt=0.70):
    """IEC 60534-2-1 steam flow [kg/s] through a valve of Cv, saturated steam at p1."""
    f_gamma = 1.30 / 1.40
    x = min((p1 - p2) / p1, f_gamma * xt)
    y = 1.0 - x / (3.0 * f_gamma * xt)
    rho1 = sat(p1)[1].rho
    return 27.3 * cv * y * math.sqrt(x * (p1 / 1e5) * rho1) / 3600.0


class Coil:
    """An air coil at fixed flow worked by hand: design load, design steam temperature,
    the stall pressure, and the pressure the open valve holds it at."""

    def __init__(self, cfm, t_in_f, t_out_f, design_psig, supply_psig, return_psig, fill_in, cv):
        self.t_in, self.t_out = f_to_k(t_in_f), f_to_k(t_out_f)
        self.load = cfm * CFM * AIR_DENSITY * AIR_CP * (self.t_out - self.t_in)
        self.t_design = sat(ATM + design_psig * PSI)[0].T
        self.supply = ATM + supply_psig * PSI
        ret = ATM + return_psig * PSI
        self.threshold = ret - sat(ret)[0].rho * G * fill_in * INCH
        self.cv = cv

    def condensed(self, p, load=1.0):
        """Condensate [kg/s] with the coil at p under the conditions of a load fraction
        (entering air T_out − f·(T_out − T_in,d))."""
        liquid, vapour = sat(p)
        t_entering = self.t_out - load * (self.t_out - self.t_in)
        heat = self.load * (liquid.T - t_entering) / (self.t_design - self.t_in)
        return heat / ((vapour.h - liquid.h) * 1e3)

    def valve_pressure(self, load=1.0):
        """The coil pressure at which the open valve passes what the coil condenses."""
        t_entering = self.t_out - load * (self.t_out - self.t_in)
        low = IAPWS97(T=t_entering + 0.01, x=0).P * 1e6
        return brentq(lambda p: valve_flow(self.cv, self.supply, p) - self.condensed(p, load), low,
                      self.supply * 0.999, xtol=1e-6)

    def flooding_from(self):
        """The load from which the open valve holds the coil at the stall pressure: the
        coil condenses, at that pressure, what the valve passes there (linear in f)."""
        liquid, vapour = sat(self.threshold)
        heat = valve_flow(self.cv, self.supply, self.threshold) * (vapour.h - liquid.h) * 1e3
        t_entering = liquid.T - heat * (self.t_design - self.t_in) / self.load
        return (self.t_out - t_entering) / (self.t_out - self.t_in)


def unit_data(cfm, t_in_f, t_out_f, design_psig, supply_psig, return_psig, fill_in, cv, minimum):
    return {
        "format": 1, "unit": {"name": "Ostler Yard reheat"},
        "design": {"medium": "air", "flow": f"{cfm} cfm", "inlet_temperature": f"{t_in_f} degF",
                   "outlet_temperature": f"{t_out_f} degF", "steam_pressure": f"{design_psig} psig"},
        "steam": {"supply_pressure": f"{supply_psig} psig"},
        "valve": {"cv": cv, "characteristic": "equal-percentage"},
        "load": {"minimum": minimum},
        "drain": {"arrangement": "trap", "trap": "float-thermostatic", "fill_head": f"{fill_in} in",
                  "lift": "0 ft", "return_pressure": f"{return_psig} psig"},
    }


# Cv as a share of what the design load needs (about); supply and design coil pressure,
# psig; return pressure, psig, below the design coil pressure (a return above it stalls
# the coil at full load whatever the valve: test_findings.py holds that case)
CASES = [(share, pressures, ret) for share, pressures, ret in itertools.product(
    [0.3, 0.5, 0.7, 0.9, 1.2], [(25, 15), (40, 30), (15, 5)], [0, 2, 5]) if ret < pressures[1]]


@pytest.mark.parametrize("share,pressures,return_psig", CASES)
def test_valve_limited_verdict_matches_an_independent_solve(share, pressures, return_psig):
    # A reheat coil, 50 °F to 90 °F, 8,000 cfm, 18 in of fill head, running from 70 %.
    supply, design = pressures
    probe = analysis.analyse(unitfile.from_data(
        unit_data(8000, 50, 90, design, supply, return_psig, 18, 100, 0.7), "ostler.toml"))
    cv = round(probe.valve.required_cv_design * share, 2)
    data = unit_data(8000, 50, 90, design, supply, return_psig, 18, cv, 0.7)
    r = analysis.analyse(unitfile.from_data(data, "ostler.toml"))
    hand = Coil(8000, 50, 90, design, supply, return_psig, 18, cv)
    assert r.stall.threshold_pressure == pytest.approx(hand.threshold, rel=1e-6)
    needs = bool(hand.condensed(ATM + design * PSI) > valve_flow(cv, hand.supply, ATM + design * PSI))
    assert (not r.valve.capacity_ok) is needs
    if not needs:
        # a valve large enough changes nothing: the coil has the pressure its load needs
        assert r.stall.valve_load_fraction is None
        assert np.array_equal(r.points.coil_pressure, r.points.needed_coil_pressure)
        return
    p_valve = hand.valve_pressure()
    assert r.valve.limited_coil_pressure == pytest.approx(p_valve, rel=1e-6)
    floods = bool(p_valve < hand.threshold)
    if abs(p_valve - hand.threshold) < 50.0:
        return  # within rounding of the verdict's 10 Pa tolerance
    assert (r.stall.valve_load_fraction is not None) is floods
    # the coil at full load, as tabulated: held to the valve's pressure, stalled or not
    assert r.points.coil_pressure[-1] == pytest.approx(p_valve, rel=1e-6)
    assert bool(r.points.stalled[-1]) is floods
    assert r.points.valve_opening[-1] == 1.0
    if floods:
        # no unit is called adequate while its valve holds it under its back pressure
        assert not r.drainage.adequate
        assert r.stall.floods_in_range
        start = max(hand.flooding_from(), 0.0)
        assert r.stall.valve_load_fraction == pytest.approx(start, abs=1e-6)
        codes = {f.code: f for f in r.findings}
        assert "floods" in codes["valve-too-small"].parts
        assert codes["drainage-inadequate"].severity in ("warning", "danger")
        # every tabulated load from there up is stalled, at the valve's pressure
        f = r.points.load_fraction
        assert np.all(r.points.stalled[f >= start + 0.005])  # half a grid step: the 10 Pa tolerance


def test_the_printed_valve_that_stops_the_flooding_does_when_fitted():
    # Advice that survives being followed: the Cv printed (rounded up to three figures)
    # put in the unit file leaves the coil the 1 kPa margin above the stall pressure at
    # full load; one printed step smaller does not.
    data = unit_data(8000, 50, 90, 30, 40, 5, 18, 3.0, 0.8)
    r = analysis.analyse(unitfile.from_data(data, "ostler.toml"))
    finding = next(f for f in r.findings if f.code == "valve-too-small")
    from stallcheck.render import words
    message = words.finding(finding, r, r.system)
    printed = float(message.split("A valve of Cv ")[1].split()[0])
    assert printed >= r.valve.drain_cv
    fitted = copy.deepcopy(data)
    fitted["valve"]["cv"] = printed
    hand = Coil(8000, 50, 90, 30, 40, 5, 18, printed)
    assert hand.valve_pressure() >= hand.threshold + 1000.0 * (1 - 1e-6)
    again = analysis.analyse(unitfile.from_data(fitted, "ostler.toml"))
    assert again.stall.valve_load_fraction is None and again.drainage.adequate
    step = 10.0 ** (math.floor(math.log10(printed)) - 2)
    assert Coil(8000, 50, 90, 30, 40, 5, 18, printed - step).valve_pressure() < hand.threshold + 1000.0


def test_a_coil_drained_at_middle_loads_floods_at_its_highest():
    # The case the stall point alone misses: from the minimum load the coil has the
    # pressure it needs, but near full load the open valve holds it under the stall
    # pressure. The stalled ranges say both.
    data = unit_data(8000, 50, 90, 30, 40, 5, 18, 2.6, 0.8)
    r = analysis.analyse(unitfile.from_data(data, "ostler.toml"))
    hand = Coil(8000, 50, 90, 30, 40, 5, 18, 2.6)
    assert not r.stall.in_range          # by its load alone, it stalls below its minimum
    assert r.stall.floods_in_range and not r.drainage.adequate
    start = hand.flooding_from()
    assert 0.0 < start < r.stall.load_fraction
    assert r.stall.ranges == ((0.0, 1.0),)  # the two stalls meet: it stalls at every load
    # a slightly larger valve separates them: the stall below, the valve's above
    data = unit_data(8000, 50, 90, 30, 40, 5, 18, 3.0, 0.8)
    r = analysis.analyse(unitfile.from_data(data, "ostler.toml"))
    hand = Coil(8000, 50, 90, 30, 40, 5, 18, 3.0)
    ranges = r.stall.ranges
    assert len(ranges) == 2 and ranges[0][1] < ranges[1][0]
    assert ranges[1] == pytest.approx((hand.flooding_from(), 1.0), abs=1e-6)
