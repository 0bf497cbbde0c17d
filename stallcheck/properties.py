"""Fluid properties: the only module that imports CoolProp.

Steam and condensate are saturated water on CoolProp's IAPWS-IF97 backend. Liquids
being heated (water, ethylene and propylene glycol solutions) come from CoolProp's
HEOS water and incompressible-mixture backends. Every function takes and returns
NumPy arrays (scalars work too) in SI units.

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
import CoolProp.CoolProp as CP

from stallcheck.errors import PropertyRangeError

_IF97 = "IF97::Water"
#: Lowest saturation state used: the triple point, 273.16 K, 611.65 Pa (CoolProp's IF97
#: refuses the very bottom of region 4, 611.213 Pa).
T_MIN = 273.16
P_MIN = 611.65
#: Critical point, the top of the saturation line [K], [Pa].
T_CRIT = 647.096
P_CRIT = 22.064e6


def _check_p(p):
    p = np.asarray(p, dtype=float)
    if np.any(~np.isfinite(p)) or np.any(p < P_MIN) or np.any(p > P_CRIT):
        bad = p[~((p >= P_MIN) & (p <= P_CRIT))]
        raise PropertyRangeError(
            f"saturation pressure {bad.flat[0] / 1000:.3g} kPa(abs) is outside IAPWS-IF97's "
            f"saturation line ({P_MIN / 1000:.4g} kPa to {P_CRIT / 1e6:.4g} MPa)")
    return p


def _props(output: str, name1: str, value1, name2: str, value2, fluid: str = _IF97):
    v1 = np.asarray(value1, dtype=float)
    v2 = np.broadcast_to(np.asarray(value2, dtype=float), v1.shape)
    try:
        if v1.ndim == 0:
            return np.float64(CP.PropsSI(output, name1, float(v1), name2, float(v2), fluid))
        flat = CP.PropsSI(output, name1, v1.ravel(), name2, np.ascontiguousarray(v2).ravel(), fluid)
    except ValueError as exc:
        raise PropertyRangeError(f"{fluid} has no property {output} at {name1}={v1}, {name2}={v2}: {exc}") from None
    return np.asarray(flat, dtype=float).reshape(v1.shape)


def saturation_temperature(pressure):
    """Saturation temperature of water [K] at an absolute pressure [Pa] (IAPWS-IF97)."""
    return _props("T", "P", _check_p(pressure), "Q", 0.0)


def saturation_pressure(temperature):
    """Saturation pressure of water [Pa] at a temperature [K] (IAPWS-IF97)."""
    t = np.asarray(temperature, dtype=float)
    if np.any(~np.isfinite(t)) or np.any(t < T_MIN) or np.any(t > T_CRIT):
        raise PropertyRangeError(
            f"temperature outside IAPWS-IF97's saturation line ({T_MIN} K to {T_CRIT} K)")
    return _props("P", "T", t, "Q", 0.0)


def latent_heat(pressure):
    """Latent heat of condensation h_g − h_f [J/kg] at an absolute pressure [Pa]."""
    p = _check_p(pressure)
    return _props("H", "P", p, "Q", 1.0) - _props("H", "P", p, "Q", 0.0)


def latent_heat_at(temperature):
    """Latent heat of condensation h_g − h_f [J/kg] at a saturation temperature [K]
    (cheaper than :func:`latent_heat` where the temperature is already known)."""
    t = np.asarray(temperature, dtype=float)
    if np.any(~np.isfinite(t)) or np.any(t < T_MIN) or np.any(t > T_CRIT):
        raise PropertyRangeError(f"temperature outside IAPWS-IF97's saturation line ({T_MIN} K to {T_CRIT} K)")
    return _props("H", "T", t, "Q", 1.0) - _props("H", "T", t, "Q", 0.0)


def liquid_enthalpy(pressure):
    """Enthalpy of saturated liquid h_f [J/kg] at an absolute pressure [Pa]."""
    return _props("H", "P", _check_p(pressure), "Q", 0.0)


def liquid_density(pressure):
    """Density of saturated liquid water [kg/m³] at an absolute pressure [Pa]."""
    return _props("D", "P", _check_p(pressure), "Q", 0.0)


def vapour_density(pressure):
    """Density of saturated steam [kg/m³] at an absolute pressure [Pa]."""
    return _props("D", "P", _check_p(pressure), "Q", 1.0)


def liquid_cp(pressure):
    """Isobaric specific heat of saturated liquid water [J/(kg·K)] at an absolute pressure [Pa]."""
    return _props("C", "P", _check_p(pressure), "Q", 0.0)


def _medium_fluid(medium: str, concentration: float | None) -> str:
    if medium == "water":
        return "HEOS::Water"
    code = {"ethylene-glycol": "MEG", "propylene-glycol": "MPG"}[medium]
    return f"INCOMP::{code}[{concentration:.4f}]"


#: Pressure at which liquid media are evaluated: enough to keep water liquid to 150 °C. [Pa]
LIQUID_PRESSURE = 500e3


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
    return _props("C", "T", temperature, "P", LIQUID_PRESSURE, _medium_fluid(medium, concentration))


def medium_density(medium: str, concentration: float | None, temperature):
    """Density [kg/m³] of a heated liquid at a temperature [K] (see :func:`medium_cp`)."""
    return _props("D", "T", temperature, "P", LIQUID_PRESSURE, _medium_fluid(medium, concentration))
