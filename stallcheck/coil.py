"""Coil heat transfer: the steam temperature each load needs, and its inverse.

Pure NumPy; no properties are needed once the design point is known. Load fraction
``f`` is Q/Q_design.

Two ways the load moves (``load.varies``):

* ``inlet-temperature``: flow fixed, entering temperature rises as load falls,
  f = (T_out − T_in)/(T_out − T_in,design).
* ``flow``: temperatures fixed, f = flow/flow_design, UA = UA_design·fⁿ.

Two methods:

* ``ntu``: the steam side condenses at one temperature, so the heat-capacity ratio is
  zero and ε = 1 − exp(−NTU) [1]_. UA is fixed by the design point.
* ``mean-temperature``: load ∝ UA·(T_steam − (T_in + T_out)/2), the straight-line
  method of many coil catalogues.

With the flow fixed both methods give the same straight line
T_steam(f) = T_out + f·(T_steam,design − T_out); they differ where the flow varies.

References
----------
.. [1] Incropera, F. P., DeWitt, D. P., Fundamentals of Heat and Mass Transfer, 6th ed.,
   eq. 11.35a: ε = 1 − exp(−NTU) for C_r = 0.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class CoilModel:
    """Design point of a coil, enough to find the steam temperature at any load.

    Attributes
    ----------
    method : str
        ``"ntu"`` or ``"mean-temperature"``.
    varies : str
        ``"inlet-temperature"`` or ``"flow"``.
    inlet_design : float
        Entering temperature at full load. [K]
    outlet : float
        Leaving temperature held by the control (set point). [K]
    steam_design : float
        Saturation temperature in the coil at full load. [K]
    ua_exponent : float
        n in UA ∝ flowⁿ, 0 ≤ n ≤ 1. [-]
    """

    method: str
    varies: str
    inlet_design: float
    outlet: float
    steam_design: float
    ua_exponent: float = 0.0

    @property
    def effectiveness_design(self) -> float:
        """ε at design = (T_out − T_in)/(T_steam − T_in). [-]"""
        return (self.outlet - self.inlet_design) / (self.steam_design - self.inlet_design)

    @property
    def ntu_design(self) -> float:
        """NTU at design = −ln(1 − ε). [-]"""
        return float(-np.log1p(-self.effectiveness_design))

    @property
    def mean_design(self) -> float:
        """Mean of entering and leaving temperature at design. [K]"""
        return 0.5 * (self.inlet_design + self.outlet)


def steam_temperature(coil: CoilModel, load):
    """Steam saturation temperature the coil needs to carry a load [K].

    Parameters
    ----------
    coil : CoilModel
    load : float or ndarray
        Load fraction Q/Q_design, 0 ≤ f. [-]

    Returns
    -------
    ndarray
        T_steam(f) [K].
    """
    f = np.asarray(load, dtype=float)
    if coil.varies == "inlet-temperature":
        return coil.outlet + f * (coil.steam_design - coil.outlet)
    n = coil.ua_exponent
    dt = coil.outlet - coil.inlet_design
    if coil.method == "ntu":
        with np.errstate(divide="ignore", over="ignore"):
            ntu = coil.ntu_design * np.power(f, n - 1.0)
        eps = -np.expm1(-ntu)
        return coil.inlet_design + dt / eps
    with np.errstate(divide="ignore"):
        return coil.mean_design + np.power(f, 1.0 - n) * (coil.steam_design - coil.mean_design)


def load_at_steam_temperature(coil: CoilModel, temperature):
    """Load fraction at which the coil needs a given steam temperature: the inverse of
    :func:`steam_temperature` [-].

    The steam temperature rises with load, so the unit needs less than ``temperature``
    at every load below the returned fraction. Returns 0 where even no load needs more
    than ``temperature`` and ``inf`` where every load does (a constant-NTU coil whose
    design steam temperature is below it).

    Parameters
    ----------
    coil : CoilModel
    temperature : float or ndarray
        Steam saturation temperature. [K]
    """
    t = np.asarray(temperature, dtype=float)
    if coil.varies == "inlet-temperature":
        f = (t - coil.outlet) / (coil.steam_design - coil.outlet)
        return np.maximum(f, 0.0)
    n = coil.ua_exponent
    if n >= 1.0:
        return np.where(t >= coil.steam_design, np.inf, 0.0)
    if coil.method == "ntu":
        with np.errstate(divide="ignore", invalid="ignore"):
            eps = (coil.outlet - coil.inlet_design) / (t - coil.inlet_design)
            ntu = -np.log1p(-np.clip(eps, 0.0, 1.0))
            f = np.power(ntu / coil.ntu_design, 1.0 / (n - 1.0))
        return np.where(t <= coil.outlet, 0.0, f)
    with np.errstate(invalid="ignore"):
        ratio = (t - coil.mean_design) / (coil.steam_design - coil.mean_design)
        f = np.power(np.maximum(ratio, 0.0), 1.0 / (1.0 - n))
    return f


def inlet_temperature(coil: CoilModel, load):
    """Entering temperature at a load fraction [K] (the design inlet where flow varies)."""
    f = np.asarray(load, dtype=float)
    if coil.varies == "inlet-temperature":
        return coil.outlet - f * (coil.outlet - coil.inlet_design)
    return np.full_like(f, coil.inlet_design)


def load_at_inlet_temperature(coil: CoilModel, temperature):
    """Load fraction at an entering temperature [K] where the load follows it (≤ 0: off)."""
    t = np.asarray(temperature, dtype=float)
    return (coil.outlet - t) / (coil.outlet - coil.inlet_design)


def delivered_fraction(coil: CoilModel, temperature):
    """Fraction of design load delivered at design flow and design entering temperature
    when the steam is held at ``temperature`` [K] (the valve-limited case).

    At design flow and entering temperature both methods give a load proportional to
    T_steam − T_in,design:  Q/Q_design = (T_s − T_in,d)/(T_s,d − T_in,d).
    """
    t = np.asarray(temperature, dtype=float)
    return (t - coil.inlet_design) / (coil.steam_design - coil.inlet_design)


def design_steam_temperature_for(coil: CoilModel, load: float, temperature: float) -> float:
    """Design steam temperature [K] at which the coil needs exactly ``temperature`` [K]
    at ``load`` [-]: a coil of the same duty, larger or smaller, run at another design
    pressure. The inverse of :func:`steam_temperature` in its design temperature.

    NaN where no design temperature does it (a zero load, or a steam temperature at or
    below what the load needs with an infinitely large coil).
    """
    f = float(load)
    if f <= 0.0 or temperature <= coil.outlet:
        return float("nan")
    if coil.varies == "inlet-temperature":
        return coil.outlet + (temperature - coil.outlet) / f
    n = coil.ua_exponent
    if coil.method == "ntu":
        dt = coil.outlet - coil.inlet_design
        eps = dt / (temperature - coil.inlet_design)
        ntu_design = -np.log1p(-eps) * f ** (1.0 - n)
        return float(coil.inlet_design + dt / -np.expm1(-ntu_design))
    return float(coil.mean_design + (temperature - coil.mean_design) / f ** (1.0 - n))
