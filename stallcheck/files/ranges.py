"""The physical ranges every reader of what people type holds values to: pressures of
steam and condensate between the triple point and 90 % of the critical pressure,
entering air no colder than any outdoor air, and quantities that must be positive.
Shared by unit files, CSV tables and gauge readings."""

from __future__ import annotations

from stallcheck.errors import InputError

#: Critical pressure of water [Pa] (IAPWS-IF97): no saturated steam above it.
CRITICAL_PRESSURE = 22.064e6


#: Lowest absolute pressure of any steam or condensate state [Pa]: the triple point of
#: water, 611.657 Pa (IAPWS-IF97).
TRIPLE_POINT_PRESSURE = 611.657
#: Coldest entering air taken [K]: -70 °C, below the coldest outdoor air where plant is
#: built (from memory: about -68 °C on record in inhabited places).
COLDEST_AIR = 203.15
#: Hottest air or water read at a unit in service [K]: 250 °C, above the saturation
#: temperature of the highest design pressure a unit file takes (2 MPa, 212 °C; IF97).
HOTTEST_READING = 523.15
#: Largest differential a trap needs to open [Pa]: 2 bar (29 psi), more than any trap
#: asks (a thermodynamic trap wants a few tenths of a bar; common practice).
TRAP_DIFFERENTIAL_LIMIT = 2.0e5
#: Narrowest line from a trap [m]: 5 mm, below a 1/4 in tube (common practice).
NARROWEST_LINE = 0.005
#: Site elevations taken [m]: from the shore of the Dead Sea (about -430 m) to above
#: any inhabited place (common practice, from memory); the standard atmosphere (ISO
#: 2533) holds throughout.
ELEVATION_RANGE = (-500.0, 9000.0)
#: Return air a unit mixes with outdoor air [K]: 5 °C to 40 °C, the air of a heated
#: space (common practice: 18 to 27 °C is usual; the range leaves room for warehouses
#: and process rooms).
RETURN_AIR_RANGE = (278.15, 313.15)
#: Hours in a year, a leap year's [h]: the most the load bins can hold in all.
HOURS_A_YEAR = 8784.0


def check_pressure_range(key: str, value: float, text) -> None:
    """A pressure of steam or condensate: above absolute zero, at or above the triple
    point of water, and below 90 % of its critical pressure (IAPWS-IF97)."""
    if value <= 0:
        raise InputError(key, f"\"{text}\" is at or below absolute zero pressure; "
                              "check the gauge/absolute spelling and the sign.")
    if value < TRIPLE_POINT_PRESSURE:
        raise InputError(key, f"\"{text}\" is below the triple point of water (0.61 kPa(abs), 0.089 psia): no "
                              f"steam or condensate exists there. Check the gauge/absolute spelling and the sign.")
    if value > 0.9 * CRITICAL_PRESSURE:
        raise InputError(key, f"\"{text}\" is near or above the critical pressure of water (22.06 MPa, "
                              f"IAPWS-IF97); accepted: below 19.9 MPa. Check the units.")


def check_entering(key: str, value: float, text, medium: str) -> float:
    """An entering temperature [K] of ``medium``: water above freezing, air no colder
    than :data:`COLDEST_AIR` (a glycol's freezing point needs its mixture data: the
    analysis holds it there). The unit file's reader and ``new`` both ask here."""
    if medium == "water" and value <= 273.15:
        raise InputError(key, f"\"{text}\" is at or below freezing for water; accepted: above 0 °C (32 °F).")
    if medium == "air" and value < COLDEST_AIR:
        raise InputError(key, f"\"{text}\" is colder than any outdoor air a coil meets; accepted: -70 °C (-94 °F) "
                              f"and warmer.")
    return value


def require_positive(key: str, value: float, text: str = "") -> float:
    """``value``, where it is above zero; else the error naming ``key``."""
    if value <= 0:
        raise InputError(key, f"must be greater than zero{text}.")
    return value
