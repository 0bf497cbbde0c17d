"""Constant purge: the steam bled past the trap to hold a positive differential.

A small orifice from the coil outlet to the return keeps steam moving through the
coil at every load, so the tubes fill from the supply end and the trap always sees
some differential. It costs the steam it bleeds, and it can only bleed while the coil
pressure is above the pressure it discharges into.

Pressures absolute [Pa], flows [kg/s], diameters [m].
"""

from __future__ import annotations

import numpy as np

#: Napier's constant for saturated steam through an orifice at critical flow, in SI:
#: W = A·p₁/70 with W [lb/s], A [in²], p₁ [psia], i.e. 1.45674e-3 s/m with
#: W [kg/s], A [m²], p₁ [Pa].
NAPIER = 0.45359237 / (0.0254 ** 2 * 6894.757293168) / 70.0
#: Discharge coefficient of a purge orifice [-]: 0.6, the value behind the US DOE
#: steam-leak formula W = 24.24·p·d² (lb/h, psia, in) = 0.6 × Napier.
DISCHARGE_COEFFICIENT = 0.6
#: Isentropic exponent of saturated steam for the nozzle flow function [-]
#: (Zeuner's 1.135; critical pressure ratio 0.577).
GAMMA = 1.135


def _flow_function(ratio):
    """Nozzle flow function ψ(p₂/p₁) for an ideal gas of exponent GAMMA [-]."""
    g = GAMMA
    r = np.asarray(ratio, dtype=float)
    return np.sqrt(np.maximum(2.0 * g / (g - 1.0) * (r ** (2.0 / g) - r ** ((g + 1.0) / g)), 0.0))


CRITICAL_RATIO = (2.0 / (GAMMA + 1.0)) ** (GAMMA / (GAMMA - 1.0))


def steam_orifice_flow(diameter: float, upstream, downstream,
                       discharge_coefficient: float = DISCHARGE_COEFFICIENT):
    """Saturated steam through an orifice [kg/s].

    At or below the critical pressure ratio, Napier's formula W = C_d·A·p₁/70 (lb/s,
    in², psia). Above it, Napier's flow scaled by the nozzle flow function
    ψ(p₂/p₁)/ψ(critical) (Saint-Venant–Wantzel), which falls to zero as p₂ → p₁.

    Parameters
    ----------
    diameter : float
        Bore of the orifice. [m]
    upstream, downstream : float or ndarray
        Absolute pressures either side. [Pa]
    discharge_coefficient : float
        [-], default :data:`DISCHARGE_COEFFICIENT`.

    References
    ----------
    .. [1] Napier's rule for steam flow through orifices, as in API Standard 520
       Part I (steam relief sizing, W = 51.5·A·P₁·K_d in lb/h, in², psia).
    .. [2] US DOE, Steam Tip Sheet #1, inspect and repair steam traps: steam loss
       W = 24.24·P·D² (lb/h, psia, in).
    """
    p1 = np.asarray(upstream, dtype=float)
    ratio = np.clip(np.asarray(downstream, dtype=float) / p1, CRITICAL_RATIO, 1.0)
    scale = _flow_function(ratio) / _flow_function(CRITICAL_RATIO)
    area = 0.25 * np.pi * diameter ** 2
    return discharge_coefficient * area * NAPIER * p1 * scale


def bled(rate_or_diameter: tuple[str, float], upstream, downstream):
    """Purge steam at given coil pressures [kg/s]: from an orifice bore, or a stated
    rate that flows wherever the coil pressure is above the downstream pressure.

    Parameters
    ----------
    rate_or_diameter : (str, float)
        ``("orifice", bore [m])`` or ``("rate", flow [kg/s])``.
    upstream, downstream : float or ndarray
        Coil pressure and the pressure the purge discharges into. [Pa]
    """
    basis, value = rate_or_diameter
    up = np.asarray(upstream, dtype=float)
    if basis == "orifice":
        return steam_orifice_flow(value, up, downstream)
    return np.where(up > downstream, value, 0.0)
