"""Readings from a unit in service (``stallcheck diagnose``) → validated SI values.

The same quantity rules as the unit file: pressures say gauge or absolute, and gauge
values convert with the unit's site atmosphere. Checks that need steam properties (an
outlet reading above the steam temperature) are made in :mod:`stallcheck.analysis.diagnosis`.
"""

from __future__ import annotations

from dataclasses import dataclass

from stallcheck.errors import InputError
from stallcheck.files import quantities as q
from stallcheck.files import display
from stallcheck.files.ranges import COLDEST_AIR, HOTTEST_READING, check_pressure_range
from stallcheck.inputs import Unit

#: When the noise happens.
NOISE = ("start-up", "low-load", "mild-weather", "valve-opens", "all-the-time", "none")
#: What the trap outlet looks like.
TRAP_OUTLET = ("cold", "hot-passing", "blowing-steam")


@dataclass(frozen=True)
class Readings:
    """What the plant engineer saw; None where not read.

    Attributes
    ----------
    coil_pressure : float or None
        Gauge at the coil inlet, absolute. [Pa]
    return_pressure : float or None
        Return or receiver pressure, absolute. [Pa]
    load : float or None
        Present load fraction. [-]
    inlet_temperature : float or None
        Present entering temperature. [K]
    outlet_temperature : float or None
        Leaving temperature reached. [K]
    noise : tuple of str
        When it bangs, from :data:`NOISE`.
    trap_outlet : str or None
        One of :data:`TRAP_OUTLET`.
    """

    coil_pressure: float | None = None
    return_pressure: float | None = None
    load: float | None = None
    inlet_temperature: float | None = None
    outlet_temperature: float | None = None
    noise: tuple[str, ...] = ()
    trap_outlet: str | None = None


def _pressure(option: str, text, atm: float) -> float | None:
    if text is None or str(text).strip() == "":
        return None
    value = q.gauge_reading(option, str(text), atm)
    # the same physical range as the unit file's pressures (the steam tables' own)
    check_pressure_range(option, value, text)
    return value


def _temperature(option: str, text) -> float | None:
    if text is None or str(text).strip() == "":
        return None
    value = q.temperature(option, str(text))
    if value < COLDEST_AIR or value > HOTTEST_READING:
        raise InputError(option, f"\"{text}\" is out of range for air or water at a steam unit; accepted: "
                                 f"-70 °C to 250 °C (-94 °F to 482 °F).")
    return value


def _words(option: str, text, accepted) -> tuple[str, ...]:
    if text is None:
        return ()
    # "mild weather", "Mild_Weather" and "mild-weather" are one answer
    items = ["-".join(w.strip().lower().replace("_", " ").split()) for w in str(text).replace(";", ",").split(",")
             if w.strip()]
    for w in items:
        if w not in accepted:
            raise InputError(option, f"'{w}' is not one of: {', '.join(accepted)}.")
    return tuple(dict.fromkeys(items))


def parse(unit: Unit, coil_pressure=None, return_pressure=None, load=None, inlet_temperature=None,
          outlet_temperature=None, noise=None, trap_outlet=None) -> Readings:
    """Validate readings given as text (as typed at the command line).

    Parameters
    ----------
    unit : Unit
        For the site's atmospheric pressure and the supply pressure.
    coil_pressure, return_pressure : str, optional
        Gauge or absolute pressures, such as ``"3 psig"``.
    load : str or float, optional
        Load fraction, ``0.4`` or ``"40 %"``.
    inlet_temperature, outlet_temperature : str, optional
    noise : str, optional
        Comma-separated words from :data:`NOISE`.
    trap_outlet : str, optional
        One of :data:`TRAP_OUTLET`.

    Raises
    ------
    InputError
        Naming the option and what is accepted.
    """
    atm = unit.site.atmospheric_pressure
    coil = _pressure("--coil-pressure", coil_pressure, atm)
    if coil is not None and coil > unit.supply_pressure:
        raise InputError("--coil-pressure",
                         f"\"{coil_pressure}\" is above the supply pressure "
                         f"({display.show(unit.supply_pressure, 'pressure', unit.system, atm)}); the coil cannot "
                         f"run above what feeds it. Check the gauge and its units.")
    ret = _pressure("--return-pressure", return_pressure, atm)
    fraction = None
    if load is not None and str(load).strip() != "":
        text = str(load).strip()
        try:
            fraction = float(text)
        except ValueError:
            fraction = q.fraction("--load", text)
        if not 0.0 <= fraction <= 1.2:
            raise InputError("--load", f"\"{load}\" is out of range; accepted: 0 to 1.2 (or 0 % to 120 %).")
    t_in = _temperature("--inlet-temperature", inlet_temperature)
    t_out = _temperature("--outlet-temperature", outlet_temperature)
    if t_in is not None and t_out is not None and t_out < t_in:
        raise InputError("--outlet-temperature", f"\"{outlet_temperature}\" is below the entering temperature "
                                                 f"\"{inlet_temperature}\"; a steam coil heats.")
    outlet = None
    if trap_outlet is not None and str(trap_outlet).strip():
        outlet = _words("--trap-outlet", trap_outlet, TRAP_OUTLET)
        if len(outlet) != 1:
            raise InputError("--trap-outlet", f"give one of: {', '.join(TRAP_OUTLET)}.")
        outlet = outlet[0]
    words = _words("--noise", noise, NOISE)
    if "none" in words and len(words) > 1:
        raise InputError("--noise", "'none' cannot go with other times.")
    return Readings(coil, ret, fraction, t_in, t_out, tuple(w for w in words if w != "none"), outlet)
