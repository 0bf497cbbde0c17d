"""The standard atmosphere: atmospheric pressure from a site's elevation."""

from __future__ import annotations

from stallcheck.physics.constants import STANDARD_ATMOSPHERE


def pressure_at(elevation):
    """Atmospheric pressure at an elevation, standard atmosphere [Pa].

    .. math:: p = 101325\\,(1 - 2.25577\\times10^{-5} z)^{5.25588}

    Parameters
    ----------
    elevation : float or ndarray
        Height above sea level [m], valid in the troposphere (below 11 000 m).

    References
    ----------
    .. [1] ISO 2533:1975, Standard Atmosphere (troposphere, lapse rate 6.5 K/km).
    """
    return STANDARD_ATMOSPHERE * (1.0 - 2.25577e-5 * elevation) ** 5.25588
