"""Trap capacity against differential, the drainage limit, and trap selection figures.

A trap passes condensate in proportion to roughly the square root of the differential
across it, and hot condensate less than cold water because it starts to flash in the
seat. Where the maker's rated table is given (``[[drain.capacity]]``) it is used;
otherwise the trap seat is a short orifice passing saturated condensate
(:func:`orifice_capacity`): liquid orifice flow reduced for flashing by Fauske's
non-equilibrium model, with the equilibrium flux from the omega method.

Pressures are absolute [Pa], differentials [Pa], flows [kg/s], diameters [m].
"""

from __future__ import annotations

import numpy as np

from stallcheck.physics import properties

#: Discharge coefficient of a trap seat taken as a sharp-edged orifice [-]: the
#: textbook value for sharp-edged orifices at high Reynolds number (about 0.6, as in
#: ISO 5167-2 orifice plates); a maker's rated table is better where one is given.
DISCHARGE_COEFFICIENT = 0.6
#: Length of a trap seat taken for the flashing reduction [m] (a few millimetres:
#: an assumption, stated in the results).
SEAT_LENGTH = 0.005
#: Fauske's relaxation length: the flow reaches equilibrium flashing over about 0.1 m.
RELAXATION_LENGTH = 0.1
#: Differential at which a trap is selected when nothing is known of it [Pa]: 1/4 psi
#: (VA HVAC Design Manual, steam section: size traps on modulating equipment at 1/4 psi).
SELECTION_DIFFERENTIAL = 0.25 * 6894.757293168


def _saturated(pressure):
    """Saturated-liquid properties the omega method needs, each evaluated once:
    (T [K], ρ_l [kg/m³], ρ_g [kg/m³], c_p,l [J/(kg·K)], h_fg [J/kg])."""
    p = np.asarray(pressure, dtype=float)
    return (properties.saturation_temperature(p), properties.liquid_density(p), properties.vapour_density(p),
            properties.liquid_cp(p), properties.latent_heat(p))


def omega(pressure, saturated=None):
    r"""Leung's ω for saturated liquid water at an absolute pressure [Pa] [-].

    .. math:: \omega = \frac{c_{p,l} T_0 p_0}{v_{l,0}}\left(\frac{v_{lg,0}}{h_{lg,0}}\right)^2

    The larger ω, the more the liquid flashes as its pressure falls.

    References
    ----------
    .. [1] Leung, J. C. (1986). A generalized correlation for one-component homogeneous
       equilibrium flashing choked flow. AIChE Journal 32(10), 1743–1746.
    .. [2] API Standard 520 Part I, Annex C (the omega method for two-phase flow).
    """
    p = np.asarray(pressure, dtype=float)
    t, rho_l, rho_g, cp, h_fg = saturated if saturated is not None else _saturated(p)
    v_lg = 1.0 / rho_g - 1.0 / rho_l
    return cp * t * p * rho_l * (v_lg / h_fg) ** 2


def critical_ratio(omega_):
    r"""Critical (choking) pressure ratio η_c of the omega method [-].

    .. math:: \eta_c = [1 + (1.0446 - 0.0093431\,\omega^{0.5})\,\omega^{-0.56261}]^{(-0.70356 + 0.014685 \ln \omega)}

    References
    ----------
    .. [1] API Standard 520 Part I, Annex C, the explicit fit for η_c (Leung 1996).
    """
    w = np.asarray(omega_, dtype=float)
    return (1.0 + (1.0446 - 0.0093431 * np.sqrt(w)) * w ** -0.56261) ** (-0.70356 + 0.014685 * np.log(w))


def flashing_mass_flux(inlet_pressure, outlet_pressure, saturated=None):
    r"""Mass flux of saturated water through an ideal nozzle as it flashes [kg/(m²·s)]:
    homogeneous equilibrium flow by the omega method.

    .. math::
        G = \frac{\sqrt{-2[\omega\ln\eta + (\omega - 1)(1 - \eta)]}}{\omega(1/\eta - 1) + 1}\sqrt{p_0\rho_0},
        \quad \eta = \max(p_{out}/p_0, \eta_c)

    Where the outlet is below the critical ratio the flow is choked at η_c, where
    G = η_c·√(p_0·ρ_0/ω). As the differential goes to zero G tends to the liquid
    orifice flux √(2·ρ_0·Δp); the ratio of the two is the *flashing reduction*.

    Parameters
    ----------
    inlet_pressure : float or ndarray
        Absolute pressure of the saturated condensate ahead of the seat. [Pa]
    outlet_pressure : float or ndarray
        Absolute pressure after the seat. [Pa]

    Returns
    -------
    ndarray
        [kg/(m²·s)], zero where the outlet is at or above the inlet.

    References
    ----------
    .. [1] API Standard 520 Part I, Annex C, equations for saturated liquid inlet.
    .. [2] Leung, J. C. (1986), AIChE Journal 32(10), 1743–1746.
    """
    p0 = np.asarray(inlet_pressure, dtype=float)
    saturated = saturated if saturated is not None else _saturated(p0)
    w = omega(p0, saturated)
    rho0 = saturated[1]
    eta_c = critical_ratio(w)
    eta = np.clip(np.asarray(outlet_pressure, dtype=float) / p0, eta_c, 1.0)
    with np.errstate(invalid="ignore", divide="ignore"):
        inner = -2.0 * (w * np.log(eta) + (w - 1.0) * (1.0 - eta))
        g = np.sqrt(np.maximum(inner, 0.0)) / (w * (1.0 / eta - 1.0) + 1.0) * np.sqrt(p0 * rho0)
    return np.where(eta < 1.0, g, 0.0)


def seat_mass_flux(inlet_pressure, outlet_pressure, seat_length: float = SEAT_LENGTH,
                   discharge_coefficient: float = DISCHARGE_COEFFICIENT):
    r"""Mass flux of saturated condensate through a short seat [kg/(m²·s)], flashing
    reduction included (per unit of the seat's bore area).

    .. math:: \frac{1}{G^2} = \frac{1}{C_d^2\,2\rho_0\Delta p} + \frac{L/L_e}{G_{eq}^2}

    Fauske's non-equilibrium rate model: a seat much shorter than the relaxation length
    L_e = 0.1 m passes nearly the liquid orifice flow C_d·√(2ρΔp), because the water
    has no time to flash inside it; a long one tends to the equilibrium flux G_eq
    (:func:`flashing_mass_flux`, used here in place of Fauske's simpler equilibrium
    rate model). The reduction grows with the differential.

    Parameters
    ----------
    inlet_pressure, outlet_pressure : float or ndarray
        Absolute pressures either side of the seat. [Pa]
    seat_length : float
        [m], default :data:`SEAT_LENGTH`.
    discharge_coefficient : float
        [-], default :data:`DISCHARGE_COEFFICIENT`.

    References
    ----------
    .. [1] Fauske, H. K. (1985). Flashing flows or: some practical guidelines for
       emergency releases. Plant/Operations Progress 4(3), 132–134.
    """
    p0 = np.asarray(inlet_pressure, dtype=float)
    dp = np.maximum(p0 - np.asarray(outlet_pressure, dtype=float), 0.0)
    saturated = _saturated(p0)
    liquid_sq = discharge_coefficient ** 2 * 2.0 * saturated[1] * dp
    eq = flashing_mass_flux(p0, outlet_pressure, saturated)
    with np.errstate(divide="ignore", invalid="ignore"):
        inv = 1.0 / liquid_sq + (seat_length / RELAXATION_LENGTH) / eq ** 2
        g = 1.0 / np.sqrt(inv)
    return np.where(dp > 0, g, 0.0)


def orifice_capacity(diameter, inlet_pressure, outlet_pressure,
                     discharge_coefficient: float = DISCHARGE_COEFFICIENT):
    """Saturated condensate a trap seat of a given bore passes [kg/s].

    W = (π/4)·d²·G, with G from :func:`seat_mass_flux`.

    Parameters
    ----------
    diameter : float
        Bore of the seat. [m]
    inlet_pressure, outlet_pressure : float or ndarray
        Absolute pressures either side of the seat. [Pa]
    discharge_coefficient : float
        [-], default :data:`DISCHARGE_COEFFICIENT`.
    """
    area = 0.25 * np.pi * diameter ** 2
    return area * seat_mass_flux(inlet_pressure, outlet_pressure,
                                 discharge_coefficient=discharge_coefficient)


def table_capacity_rows(differential, table_differential, table_flow):
    """Capacity read from makers' rated tables, one table per row [kg/s].

    Between rows: straight lines on log–log axes. Below the lowest rated differential:
    the lowest row's flow scaled as √(Δp/Δp_lowest) (orifice flow). Above the highest:
    held at the highest row's flow, never extrapolated upward.

    Parameters
    ----------
    differential : ndarray, shape (n,) or (n, m)
        Differentials for each device. [Pa]
    table_differential, table_flow : ndarray, shape (n, k)
        Each device's rows; a shorter table is padded by repeating its last row. [Pa], [kg/s]
    """
    dp = np.asarray(differential, dtype=float)
    one = dp.ndim == 1
    if one:
        dp = dp[:, None]
    xs, ys = np.log(table_differential), np.log(table_flow)
    with np.errstate(divide="ignore", invalid="ignore"):
        x = np.log(np.where(dp > 0, dp, 1.0))
        seg = np.clip(np.sum(xs[:, None, :-1] <= x[:, :, None], axis=2) - 1, 0, xs.shape[1] - 2)
        x0, x1 = np.take_along_axis(xs, seg, 1), np.take_along_axis(xs, seg + 1, 1)
        y0, y1 = np.take_along_axis(ys, seg, 1), np.take_along_axis(ys, seg + 1, 1)
        inside = np.exp(y0 + (x - x0) / (x1 - x0) * (y1 - y0))
    lowest_dp, lowest_w = table_differential[:, :1], table_flow[:, :1]
    below = lowest_w * np.sqrt(np.maximum(dp, 0.0) / lowest_dp)
    out = np.where(x >= xs[:, -1:], table_flow[:, -1:], np.where(dp < lowest_dp, below, inside))
    out = np.where(dp > 0, out, 0.0)
    return out[:, 0] if one else out


def equivalent_bore(flow, inlet_pressure, outlet_pressure,
                    discharge_coefficient: float = DISCHARGE_COEFFICIENT):
    """Bore [m] of the seat that passes ``flow`` [kg/s] between two pressures [Pa]."""
    g = seat_mass_flux(inlet_pressure, outlet_pressure, discharge_coefficient=discharge_coefficient)
    return np.sqrt(np.asarray(flow) / g / (0.25 * np.pi))
