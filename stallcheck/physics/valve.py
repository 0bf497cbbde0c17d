"""Steam control valve: IEC 60534-2-1 compressible flow, travel, and the valve-limited point.

.. math::

    W = N_6\\,C\\,Y\\,\\sqrt{x\\,p_1\\,\\rho_1},\\qquad
    Y = 1 - \\frac{x}{3 F_\\gamma x_T},\\qquad F_\\gamma = \\gamma/1.40,

with x = (p₁ − p₂)/p₁ limited to F_γ·x_T (choked flow). γ = 1.30 for steam. C is the
US flow coefficient Cv with N₆ = 2.73 for W in kg/h, p₁ in kPa and ρ₁ in kg/m³ (the same
constant as 63.3 for lb/h, psia and lb/ft³). For Kv, N₆ = 3.16 in the same units, and
Cv = 1.156·Kv.

Piping geometry factor F_P is taken as 1 (valve the size of its line).

References
----------
.. [1] IEC 60534-2-1:2011, Industrial-process control valves — Part 2-1: Flow capacity —
   Sizing equations for fluid flow under installed conditions, eqs. (9)–(11), Table 1.
.. [2] ANSI/ISA-75.01.01-2012, the same equations and constants.
"""

from __future__ import annotations

import numpy as np

#: N6 for Cv with W in kg/h, p1 in kPa, rho1 in kg/m³ (IEC 60534-2-1 Table 1).
N6_CV_KPA = 2.73
#: Ratio of specific heats taken for steam.
GAMMA_STEAM = 1.30
#: Specific heat ratio factor F_γ = γ/1.40.
F_GAMMA = GAMMA_STEAM / 1.40


def _terms(upstream, downstream, xt):
    p1 = np.asarray(upstream, dtype=float)
    x = np.clip((p1 - np.asarray(downstream, dtype=float)) / p1, 0.0, None)
    x_choked = F_GAMMA * xt
    x_eff = np.minimum(x, x_choked)
    y = 1.0 - x_eff / (3.0 * x_choked)
    return p1, x_eff, y


def steam_flow(cv, upstream, downstream, upstream_density, xt):
    """Steam mass flow through a valve [kg/s].

    Parameters
    ----------
    cv : float or ndarray
        Flow coefficient in use (Cv at the present travel). [-]
    upstream, downstream : float or ndarray
        Absolute pressures p₁ and p₂. [Pa]
    upstream_density : float or ndarray
        Steam density at the inlet, ρ₁. [kg/m³]
    xt : float
        Pressure-differential ratio factor. [-]
    """
    p1, x, y = _terms(upstream, downstream, xt)
    w_kg_h = N6_CV_KPA * np.asarray(cv) * y * np.sqrt(x * (p1 / 1000.0) * upstream_density)
    return w_kg_h / 3600.0


def required_cv(mass_flow, upstream, downstream, upstream_density, xt):
    """Cv that passes a steam mass flow [-] (inverse of :func:`steam_flow`).

    Parameters
    ----------
    mass_flow : float or ndarray
        Steam flow. [kg/s]
    upstream, downstream : float or ndarray
        Absolute pressures. [Pa]
    upstream_density : float or ndarray
        ρ₁. [kg/m³]
    xt : float
    """
    p1, x, y = _terms(upstream, downstream, xt)
    with np.errstate(divide="ignore", invalid="ignore"):
        cv = np.asarray(mass_flow) * 3600.0 / (N6_CV_KPA * y * np.sqrt(x * (p1 / 1000.0) * upstream_density))
    return np.where(np.asarray(mass_flow) <= 0, 0.0, cv)


def is_choked(upstream, downstream, xt):
    """True where x ≥ F_γ·x_T, so the flow no longer grows as p₂ falls."""
    p1 = np.asarray(upstream, dtype=float)
    return (p1 - np.asarray(downstream)) / p1 >= F_GAMMA * xt


def travel(cv_ratio, characteristic, rangeability):
    """Valve travel h (0 shut, 1 fully open) that gives a fraction of full Cv [-].

    Equal percentage: C/C_max = R^(h − 1), so h = 1 + ln(C/C_max)/ln R; linear: h = C/C_max.
    Below C_max/R an equal-percentage valve is at its controllable limit; the returned
    travel there is 0 (the inherent curve no longer holds). Values above 1 mean the
    open valve cannot pass the flow.
    """
    r = np.asarray(cv_ratio, dtype=float)
    rangeability = np.asarray(rangeability, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        h = 1.0 + np.log(r) / np.log(rangeability)
    equal = np.where(r <= 1.0 / rangeability, 0.0, h)
    return np.where(np.asarray(characteristic) == "linear", r, equal)
