"""The words of the refusals that need the physics to find: a set point at or above the
steam temperature, a glycol below its freezing point, a return hotter than water boils
there, a pump-trap's motive under the back pressure, a gauge reading the coil cannot
give. The analysis finds them (it holds the steam tables) and raises the error made
here, so every message about bad input is written in ``files/``, like the reader's own.

Each function takes the unit (its key's file, display system and atmosphere) and the SI
figures found, and returns the :class:`~stallcheck.errors.InputError` to raise.
"""

from __future__ import annotations

from stallcheck.errors import InputError
from stallcheck.files import display
from stallcheck.inputs import Unit

#: The highest mean design temperature a liquid medium is evaluated at [K]: 150 °C, the
#: top of the liquid property data used (CoolProp's water and glycol mixtures).
HOTTEST_LIQUID = 423.15


def _t(unit: Unit, value: float) -> str:
    return display.show(value, "temperature", unit.system)


def set_point_above_steam(unit: Unit, t_steam: float) -> InputError:
    """The set point is not below the steam temperature at the design pressure [K]."""
    return InputError("design.outlet_temperature",
                      f"the set point {_t(unit, unit.design.outlet_temperature)} is not below the steam temperature "
                      f"at design.steam_pressure ({_t(unit, t_steam)}); the coil cannot heat to it. Raise the design "
                      f"steam pressure or lower the set point.", file=unit.source)


def glycol_frozen(unit: Unit, t_freeze: float) -> InputError:
    """The entering glycol is at or below its freezing point [K] (CoolProp's data)."""
    d = unit.design
    return InputError("design.inlet_temperature",
                      f"{_t(unit, d.inlet_temperature)} is at or below the freezing point of {d.concentration:.0%} "
                      f"{d.medium} ({_t(unit, t_freeze)}, from CoolProp's mixture data); accepted: warmer than that.",
                      file=unit.source)


def return_above_boiling(unit: Unit, t_sat: float) -> InputError:
    """The condensate in the return is hotter than water boils at the return pressure [K]."""
    return InputError("drain.return_temperature",
                      f"{_t(unit, unit.drain.return_temperature)} is hotter than water boils at the return pressure "
                      f"({_t(unit, t_sat)}); condensate standing in the return cannot be. Accepted: at or below "
                      f"that.", file=unit.source)


def liquid_too_hot(unit: Unit) -> InputError:
    """A liquid medium's mean design temperature is above :data:`HOTTEST_LIQUID`."""
    return InputError("design.outlet_temperature",
                      "liquid media are evaluated up to a mean temperature of 150 °C; this unit's mean design "
                      "temperature is higher.", file=unit.source)


def motive_below_back(unit: Unit, back: float) -> InputError:
    """A pump-trap's motive pressure at or below the back pressure on the drain [Pa]."""
    atm = unit.site.atmospheric_pressure
    return InputError("drain.motive_pressure",
                      f"{display.show(unit.drain.motive_pressure, 'pressure', unit.system, atm)} is not above the back "
                      f"pressure on the drain ({display.show(back, 'pressure', unit.system, atm)}: return pressure "
                      f"plus lift); a pump-trap cannot push against it. Give the motive steam or air pressure at the "
                      f"pump-trap inlet.", file=unit.source)


def not_computable(detail: str, source: str | None) -> InputError:
    """Values that got past every range yet overflow a figure (a numeric warning)."""
    return InputError("", f"a figure cannot be computed from these values ({detail}); check them for one far "
                          f"outside any plant.", file=source)


def outlet_above_steam(unit: Unit, outlet: float, t_steam: float, system: str) -> InputError:
    """A leaving temperature read in service at or above the steam temperature [K]."""
    return InputError("--outlet-temperature",
                      f"{display.show(outlet, 'temperature', system)} is at or above the steam temperature "
                      f"({display.show(t_steam, 'temperature', system)}); the coil cannot heat above it. Check the "
                      f"thermometer and the units.", file=unit.source)
