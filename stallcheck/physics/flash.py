"""Flash steam at the trap outlet, and the velocity it drives in the return line.

Saturated condensate at the coil pressure that drops to the return pressure must give
up its excess enthalpy: part of it boils off as flash steam. The flash is a small part
of the mass but nearly all of the volume, so it sets the return line's velocity.

Pressures absolute [Pa], flows [kg/s], volumes [m³/s], diameters [m], velocities [m/s].
"""

from __future__ import annotations

import numpy as np

from stallcheck.physics import properties


def flash_fraction(high_pressure, low_pressure):
    """Fraction of saturated condensate that flashes to steam when its pressure drops [-].

    .. math:: x = (h_f(p_{high}) - h_f(p_{low})) / h_{fg}(p_{low})

    Parameters
    ----------
    high_pressure : float or ndarray
        Absolute pressure upstream of the trap (the condensate is saturated there). [Pa]
    low_pressure : float or ndarray
        Absolute pressure downstream (return line or receiver). [Pa]

    Returns
    -------
    ndarray
        Zero where the condensate does not drop in pressure.

    References
    ----------
    .. [1] IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997.
    .. [2] US DOE, Steam Tip Sheet #12: flash high-pressure condensate to regenerate
       low-pressure steam (the same balance, worked for 150 psig to 30 psig).
    """
    hi = np.asarray(high_pressure, dtype=float)
    lo = np.broadcast_to(np.asarray(low_pressure, dtype=float), hi.shape)
    x = (properties.liquid_enthalpy(hi) - properties.liquid_enthalpy(lo)) / properties.latent_heat(lo)
    return np.maximum(x, 0.0)


def flash_volume(condensate, fraction, low_pressure):
    """Volume flow of the flash steam [m³/s]: x·W / ρ_g(p_low)."""
    return np.asarray(condensate) * np.asarray(fraction) / properties.vapour_density(low_pressure)


def mixture_velocity(condensate, fraction, low_pressure, diameter: float):
    """Mean velocity of flash steam and condensate in a return line [m/s].

    Homogeneous flow: the volume of both phases over the bore,
    u = W·(x/ρ_g + (1 − x)/ρ_f) / (π d²/4).

    Parameters
    ----------
    condensate : float or ndarray
        Trap discharge. [kg/s]
    fraction : float or ndarray
        Flash fraction. [-]
    low_pressure : float
        Return pressure. [Pa]
    diameter : float
        Inside diameter of the return line. [m]
    """
    x = np.asarray(fraction, dtype=float)
    volume = np.asarray(condensate) * (x / properties.vapour_density(low_pressure)
                                       + (1.0 - x) / properties.liquid_density(low_pressure))
    return volume / (0.25 * np.pi * diameter ** 2)
