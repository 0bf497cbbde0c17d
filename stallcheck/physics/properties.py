"""Fluid properties: the only module that talks to a property library.

Steam and condensate are saturated water by IAPWS-IF97, from ``seuif97`` (a compiled
implementation of IF97 that imports in about a millisecond; it agrees with CoolProp's
IF97 backend to 1e-11 over the whole saturation line, a test holds it to that).
Liquids being heated come from CoolProp (HEOS water, and its incompressible-mixture
backend for glycol solutions), imported only when a unit heats a liquid: CoolProp's
import costs seconds, ten times everything else a check of a steam-and-air unit needs.
Every function takes and returns NumPy arrays (scalars work too) in SI units.

References
----------
.. [1] IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for
   the Thermodynamic Properties of Water and Steam.
.. [2] Bell, I. H., Wronski, J., Quoilin, S., Lemort, V. (2014). Pure and pseudo-pure
   fluid thermophysical property evaluation and the open-source thermophysical
   property library CoolProp. Ind. Eng. Chem. Res. 53(6), 2498–2508.
"""

from __future__ import annotations

import numpy as np
import seuif97

from stallcheck.errors import PropertyRangeError

#: Lowest saturation state used: the triple point, 273.16 K, 611.65 Pa (IF97's region 4
#: starts at 273.15 K, 611.213 Pa; we keep to the triple point).
T_MIN = 273.16
P_MIN = 611.65
#: Critical point, the top of the saturation line [K], [Pa].
T_CRIT = 647.096
P_CRIT = 22.064e6
#: Kelvin at 0 °C: seuif97 takes °C, MPa and kJ/kg.
_ZERO_C = 273.15

# seuif97 property codes (its documented output ids)
_P, _T, _D, _H, _CP, _W, _MU, _SIGMA = 0, 1, 2, 4, 8, 10, 24, 29
_px = np.frompyfunc(seuif97.px, 3, 1)
_tx = np.frompyfunc(seuif97.tx, 3, 1)


def _sat(function, value, quality: float, code: int):
    """A saturation property from seuif97 on an array (or a scalar)."""
    v = np.asarray(value, dtype=float)
    if v.ndim == 0:
        return np.float64((seuif97.px if function is _px else seuif97.tx)(float(v), quality, code))
    return function(v, quality, code).astype(float)


def _check_p(p):
    p = np.asarray(p, dtype=float)
    inside = (p >= P_MIN) & (p <= P_CRIT)  # false for NaN and the infinities too
    if not inside.all():
        bad = p[~inside]
        raise PropertyRangeError(
            f"saturation pressure {bad.flat[0] / 1000:.3g} kPa(abs) is outside IAPWS-IF97's "
            f"saturation line ({P_MIN / 1000:.4g} kPa to {P_CRIT / 1e6:.4g} MPa)")
    return p


def _check_t(t):
    t = np.asarray(t, dtype=float)
    if not ((t >= T_MIN) & (t <= T_CRIT)).all():  # false for NaN and the infinities too
        raise PropertyRangeError(f"temperature outside IAPWS-IF97's saturation line ({T_MIN} K to {T_CRIT} K)")
    return t


def saturation_temperature(pressure):
    """Saturation temperature of water [K] at an absolute pressure [Pa] (IAPWS-IF97)."""
    return _sat(_px, _check_p(pressure) / 1e6, 0.0, _T) + _ZERO_C


def saturation_pressure(temperature):
    """Saturation pressure of water [Pa] at a temperature [K] (IAPWS-IF97)."""
    return _sat(_tx, _check_t(temperature) - _ZERO_C, 0.0, _P) * 1e6


def latent_heat(pressure):
    """Latent heat of condensation h_g − h_f [J/kg] at an absolute pressure [Pa]."""
    mpa = _check_p(pressure) / 1e6
    return (_sat(_px, mpa, 1.0, _H) - _sat(_px, mpa, 0.0, _H)) * 1e3


def latent_heat_at(temperature):
    """Latent heat of condensation h_g − h_f [J/kg] at a saturation temperature [K]
    (where the temperature is already known)."""
    c = _check_t(temperature) - _ZERO_C
    return (_sat(_tx, c, 1.0, _H) - _sat(_tx, c, 0.0, _H)) * 1e3


def liquid_enthalpy(pressure):
    """Enthalpy of saturated liquid h_f [J/kg] at an absolute pressure [Pa]."""
    return _sat(_px, _check_p(pressure) / 1e6, 0.0, _H) * 1e3


def liquid_density(pressure):
    """Density of saturated liquid water [kg/m³] at an absolute pressure [Pa]."""
    return _sat(_px, _check_p(pressure) / 1e6, 0.0, _D)


def vapour_density(pressure):
    """Density of saturated steam [kg/m³] at an absolute pressure [Pa]."""
    return _sat(_px, _check_p(pressure) / 1e6, 1.0, _D)


def liquid_viscosity(pressure):
    """Dynamic viscosity of saturated liquid water [Pa·s] at an absolute pressure [Pa]
    (IAPWS R12-08, as seuif97 gives it)."""
    return _sat(_px, _check_p(pressure) / 1e6, 0.0, _MU)


def vapour_viscosity(pressure):
    """Dynamic viscosity of saturated steam [Pa·s] at an absolute pressure [Pa]
    (IAPWS R12-08, as seuif97 gives it)."""
    return _sat(_px, _check_p(pressure) / 1e6, 1.0, _MU)


def surface_tension(pressure):
    """Surface tension of water against its vapour [N/m] at saturation, at an absolute
    pressure [Pa] (IAPWS R1-76, as seuif97 gives it)."""
    return _sat(_px, _check_p(pressure) / 1e6, 0.0, _SIGMA)


def liquid_sound_speed(pressure):
    """Speed of sound in saturated liquid water [m/s] at an absolute pressure [Pa]
    (IAPWS-IF97 region 1)."""
    return _sat(_px, _check_p(pressure) / 1e6, 0.0, _W)


def liquid_cp(pressure):
    """Isobaric specific heat of saturated liquid water [J/(kg·K)] at an absolute pressure [Pa]."""
    return _sat(_px, _check_p(pressure) / 1e6, 0.0, _CP) * 1e3


def _props(output: str, name1: str, value1, name2: str, value2, fluid: str):
    """A property from CoolProp (imported here, on first use: liquids only)."""
    import CoolProp.CoolProp as CP

    v1 = np.asarray(value1, dtype=float)
    v2 = np.broadcast_to(np.asarray(value2, dtype=float), v1.shape)
    try:
        if v1.ndim == 0:
            return np.float64(CP.PropsSI(output, name1, float(v1), name2, float(v2), fluid))
        flat = CP.PropsSI(output, name1, v1.ravel(), name2, np.ascontiguousarray(v2).ravel(), fluid)
    except ValueError as exc:
        raise PropertyRangeError(f"{fluid} has no property {output} at {name1}={v1}, {name2}={v2}: {exc}") from None
    return np.asarray(flat, dtype=float).reshape(v1.shape)


def _medium_fluid(medium: str, concentration: float | None) -> str:
    if medium == "water":
        return "HEOS::Water"
    code = {"ethylene-glycol": "MEG", "propylene-glycol": "MPG"}[medium]
    return f"INCOMP::{code}[{concentration:.4f}]"


#: Pressure at which liquid media are evaluated: enough to keep water liquid to 150 °C. [Pa]
LIQUID_PRESSURE = 500e3


def _water(coefficients, temperature):
    """Liquid water at 500 kPa from the Chebyshev series of CoolProp's HEOS values
    (:mod:`stallcheck.physics.water_liquid`, within 1e-11 of CoolProp: a test holds it)."""
    from numpy.polynomial import chebyshev

    from stallcheck.physics import water_liquid as w

    t = np.asarray(temperature, dtype=float)
    if np.any(~np.isfinite(t)) or np.any(t < w.LOW) or np.any(t > w.HIGH):
        raise PropertyRangeError(f"liquid water is evaluated from {w.LOW} K to {w.HIGH} K")
    return chebyshev.chebval((2.0 * t - w.LOW - w.HIGH) / (w.HIGH - w.LOW), coefficients)


def medium_cp(medium: str, concentration: float | None, temperature):
    """Specific heat [J/(kg·K)] of a heated liquid at a temperature [K].

    Parameters
    ----------
    medium : str
        ``"water"``, ``"ethylene-glycol"`` or ``"propylene-glycol"``.
    concentration : float or None
        Glycol mass fraction [-].
    temperature : float or ndarray
        Usually the mean design temperature. [K]
    """
    if medium == "water":
        from stallcheck.physics import water_liquid

        return _water(water_liquid.CP, temperature)
    return _props("C", "T", temperature, "P", LIQUID_PRESSURE, _medium_fluid(medium, concentration))


def medium_density(medium: str, concentration: float | None, temperature):
    """Density [kg/m³] of a heated liquid at a temperature [K] (see :func:`medium_cp`)."""
    if medium == "water":
        from stallcheck.physics import water_liquid

        return _water(water_liquid.DENSITY, temperature)
    return _props("D", "T", temperature, "P", LIQUID_PRESSURE, _medium_fluid(medium, concentration))


def freezing_temperature(medium: str, concentration: float | None) -> float:
    """Freezing point [K] of a glycol solution at its mass fraction [-], from CoolProp's
    incompressible-mixture data (273.15 K for water)."""
    if medium == "water":
        return 273.15
    return float(_props("T_freeze", "T", 300.0, "P", LIQUID_PRESSURE, _medium_fluid(medium, concentration)))
