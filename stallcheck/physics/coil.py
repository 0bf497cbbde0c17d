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

Where the flow varies, the mean-temperature line falls towards the *mean* of the
entering and leaving temperatures as the load goes to zero, so below some load it asks
for steam colder than the leaving set point, which no coil can heat with. There the
steam temperature is held at the set point (:func:`set_point_floor_load` gives the load
below which this happens). The set point is a lower bound on what the real coil needs,
so the stall point found on the held curve is on the safe side (it stalls no later than
the real coil would).

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
    """Design point of one coil or of many (every field then an array of the same shape),
    enough to find the steam temperature at any load.

    Attributes
    ----------
    method : str or ndarray of str
        ``"ntu"`` or ``"mean-temperature"``.
    varies : str or ndarray of str
        ``"inlet-temperature"`` or ``"flow"``.
    inlet_design : float or ndarray
        Entering temperature at full load. [K]
    outlet : float or ndarray
        Leaving temperature held by the control (set point). [K]
    steam_design : float or ndarray
        Saturation temperature in the coil at full load. [K]
    ua_exponent : float or ndarray
        n in UA ∝ flowⁿ, 0 ≤ n ≤ 1. [-]
    """

    method: object
    varies: object
    inlet_design: object
    outlet: object
    steam_design: object
    ua_exponent: object = 0.0

    @property
    def by_inlet(self):
        """True where the load follows the entering temperature."""
        return np.asarray(self.varies) == "inlet-temperature"

    @property
    def by_ntu(self):
        """True where the method is NTU."""
        return np.asarray(self.method) == "ntu"

    @property
    def effectiveness_design(self):
        """ε at design = (T_out − T_in)/(T_steam − T_in). [-]"""
        return (np.asarray(self.outlet) - self.inlet_design) / (np.asarray(self.steam_design) - self.inlet_design)

    @property
    def ntu_design(self):
        """NTU at design = −ln(1 − ε). [-]"""
        return -np.log1p(-self.effectiveness_design)

    @property
    def mean_design(self):
        """Mean of entering and leaving temperature at design. [K]"""
        return 0.5 * (np.asarray(self.inlet_design) + self.outlet)

    def column(self) -> "CoilModel":
        """The same coils with every field as a column (shape (N, 1)), to broadcast
        against a row of loads."""
        return CoilModel(*(np.asarray(getattr(self, name))[:, None] for name in
                           ("method", "varies", "inlet_design", "outlet", "steam_design", "ua_exponent")))

    def take(self, index) -> "CoilModel":
        """The coils at ``index`` (an integer or an index array)."""
        return CoilModel(*(np.asarray(getattr(self, name))[index] for name in
                           ("method", "varies", "inlet_design", "outlet", "steam_design", "ua_exponent")))


def steam_temperature(coil: CoilModel, load):
    """Steam saturation temperature the coil needs to carry a load [K].

    Parameters
    ----------
    coil : CoilModel
    load : float or ndarray
        Load fraction Q/Q_design, 0 ≤ f; broadcasts against the coil's fields. [-]

    Returns
    -------
    ndarray
        T_steam(f) [K].
    """
    f = np.asarray(load, dtype=float)
    outlet, steam, t_in = (np.asarray(a, dtype=float) for a in (coil.outlet, coil.steam_design, coil.inlet_design))
    n = np.asarray(coil.ua_exponent, dtype=float)
    linear = outlet + f * (steam - outlet)
    with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
        ntu = coil.ntu_design * np.power(f, n - 1.0)
        by_ntu = t_in + (outlet - t_in) / -np.expm1(-ntu)
        mean = np.maximum(coil.mean_design + np.power(f, 1.0 - n) * (steam - coil.mean_design), outlet)
    return np.where(coil.by_inlet, linear, np.where(coil.by_ntu, by_ntu, mean))


def set_point_floor_load(coil: CoilModel):
    """Load fraction below which the mean-temperature method, with the flow varying,
    would ask for steam colder than the set point, and the set point is used instead [-].

    Zero for every other coil (the NTU method, or a load that follows the entering
    temperature, never asks for less than the set point).

    .. math:: f_* = \\left(\\frac{T_{out} - T_{mean}}{T_{s,d} - T_{mean}}\\right)^{1/(1-n)}
    """
    outlet, steam = np.asarray(coil.outlet, dtype=float), np.asarray(coil.steam_design, dtype=float)
    n = np.asarray(coil.ua_exponent, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = (outlet - coil.mean_design) / (steam - coil.mean_design)
        f = np.power(np.clip(ratio, 0.0, 1.0), 1.0 / (1.0 - n))
    applies = ~coil.by_inlet & ~coil.by_ntu & (n < 1.0)
    return np.where(applies, np.nan_to_num(f), 0.0)


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
    outlet, steam, t_in = (np.asarray(a, dtype=float) for a in (coil.outlet, coil.steam_design, coil.inlet_design))
    n = np.asarray(coil.ua_exponent, dtype=float)
    linear = np.maximum((t - outlet) / (steam - outlet), 0.0)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        eps = (outlet - t_in) / (t - t_in)
        ntu = -np.log1p(-np.clip(eps, 0.0, 1.0))
        by_ntu = np.where(t <= outlet, 0.0, np.power(ntu / coil.ntu_design, 1.0 / (n - 1.0)))
        ratio = (t - coil.mean_design) / (steam - coil.mean_design)
        # held at the set point below the floor load: every load there needs the set point
        mean = np.where(t < outlet, 0.0, np.power(np.maximum(ratio, 0.0), 1.0 / (1.0 - n)))
    constant_ua = np.where(t >= steam, np.inf, 0.0)
    flow = np.where(n >= 1.0, constant_ua, np.where(coil.by_ntu, by_ntu, mean))
    return np.where(coil.by_inlet, linear, flow)


def inlet_temperature(coil: CoilModel, load):
    """Entering temperature at a load fraction [K] (the design inlet where flow varies)."""
    f = np.asarray(load, dtype=float)
    outlet, t_in = np.asarray(coil.outlet, dtype=float), np.asarray(coil.inlet_design, dtype=float)
    return np.where(coil.by_inlet, outlet - f * (outlet - t_in), t_in + 0.0 * f)


def load_at_inlet_temperature(coil: CoilModel, temperature):
    """Load fraction at an entering temperature [K] where the load follows it (≤ 0: off)."""
    t = np.asarray(temperature, dtype=float)
    return (np.asarray(coil.outlet) - t) / (np.asarray(coil.outlet) - coil.inlet_design)


def delivered_fraction(coil: CoilModel, temperature, load=1.0):
    """Fraction of design load the coil delivers when the steam in it is held at
    ``temperature`` [K] under the conditions of a load fraction ``load`` (its entering
    temperature, or its flow): the valve-limited case, where the leaving temperature
    falls short of the set point [-].

    The heat goes as T_s − T_in at a fixed flow for both methods. Where the load
    follows the entering temperature (flow fixed, UA fixed):

    .. math:: q = (T_s - T_{in}(f)) / (T_{s,d} - T_{in,d})

    Where the flow follows the load (f = flow/flow_design, UA = UA_d·fⁿ), NTU:
    q = f·(1 − e^{−NTU_d f^{n−1}})/ε_d · (T_s − T_in,d)/(T_s,d − T_in,d); mean
    temperature, with the leaving temperature free, Q = UA·(T_s − T_in)/(1 + UA/2C):
    q = fⁿ·(1 + k)/(1 + k·f^{n−1}) · (T_s − T_in,d)/(T_s,d − T_in,d), k = UA_d/(2C_d).
    At full load every form is (T_s − T_in,d)/(T_s,d − T_in,d); at the steam
    temperature the load needs (:func:`steam_temperature`) each gives ``load`` back.

    References
    ----------
    .. [1] Incropera, F. P., DeWitt, D. P., Fundamentals of Heat and Mass Transfer, 6th
       ed., eq. 11.35a (ε = 1 − exp(−NTU), C_r = 0).
    """
    t = np.asarray(temperature, dtype=float)
    f = np.asarray(load, dtype=float)
    outlet, steam, t_in = (np.asarray(a, dtype=float) for a in (coil.outlet, coil.steam_design, coil.inlet_design))
    n = np.asarray(coil.ua_exponent, dtype=float)
    span = steam - t_in
    by_inlet = (t - (outlet - f * (outlet - t_in))) / span
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        scale = np.power(f, n - 1.0)
        ntu = f * -np.expm1(-coil.ntu_design * scale) / coil.effectiveness_design
        k = (outlet - t_in) / (2.0 * (steam - coil.mean_design))
        mean = np.power(f, n) * (1.0 + k) / (1.0 + k * scale)
    flow = np.where(f > 0.0, np.where(coil.by_ntu, ntu, mean), 0.0) * (t - t_in) / span
    return np.where(coil.by_inlet, by_inlet, flow)


def design_steam_temperature_for(coil: CoilModel, load, temperature):
    """Design steam temperature [K] at which the coil needs exactly ``temperature`` [K]
    at ``load`` [-]: a coil of the same duty, larger or smaller, run at another design
    pressure. The inverse of :func:`steam_temperature` in its design temperature.

    NaN where no design temperature does it (a zero load, or a steam temperature at or
    below what the load needs with an infinitely large coil).
    """
    f = np.asarray(load, dtype=float)
    t = np.asarray(temperature, dtype=float)
    outlet, t_in = np.asarray(coil.outlet, dtype=float), np.asarray(coil.inlet_design, dtype=float)
    n = np.asarray(coil.ua_exponent, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        linear = outlet + (t - outlet) / f
        dt = outlet - t_in
        eps = dt / (t - t_in)
        ntu_design = -np.log1p(-eps) * f ** (1.0 - n)
        by_ntu = t_in + dt / -np.expm1(-ntu_design)
        mean = coil.mean_design + (t - coil.mean_design) / f ** (1.0 - n)
    out = np.where(coil.by_inlet, linear, np.where(coil.by_ntu, by_ntu, mean))
    return np.where((f <= 0.0) | (t <= outlet), np.nan, out)


def entering_air(outdoor, share: float = 1.0, return_air: float | None = None, mixed: float | None = None):
    """Temperature of the air entering a coil from the outdoor air [K].

    Parameters
    ----------
    outdoor : float or ndarray
        Outdoor dry bulb. [K]
    share : float
        Least outdoor-air share of the mixture (1: all outdoor air). [-]
    return_air : float, optional
        The air mixed with it (needed where ``share`` < 1). [K]
    mixed : float, optional
        The mixed temperature an economiser holds by opening the outdoor air beyond its
        least share, where it does. [K]

    Notes
    -----
    Adiabatic mixing of two air streams at one pressure, with cp taken equal:
    T_mix = s·T_outdoor + (1 − s)·T_return. With an economiser, where the least share
    leaves the mixture warmer than its set point, more outdoor air brings it to the set
    point, or, all outdoor air still being warmer, to the outdoor temperature.

    References
    ----------
    .. [1] ASHRAE Handbook—Fundamentals (2017), ch. 1, "Adiabatic mixing of two
       streams of moist air".
    """
    t = np.asarray(outdoor, dtype=float)
    if share >= 1.0 or return_air is None:
        return t
    least = share * t + (1.0 - share) * return_air
    if mixed is None:
        return least
    return np.where(least <= mixed, least, np.maximum(mixed, t))
