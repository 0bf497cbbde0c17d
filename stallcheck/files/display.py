"""Showing SI values to people, and in the JSON contract's units: the display unit of
each kind of figure in each unit system, the precision a practitioner reads it at, and
rounding in the safe direction at that precision. The conversion factors are those
:mod:`stallcheck.files.quantities` reads unit files with (one table for both ways).
"""

from __future__ import annotations

import math

from stallcheck.files.quantities import linear
from stallcheck.physics.constants import STANDARD_ATMOSPHERE

#: Display units per system: (pint unit, label, decimals).
DISPLAY = {
    "si": {
        "pressure": ("bar", "barg", 2),
        "pressure_abs": ("kPa", "kPa(abs)", 1),
        "differential": ("kPa", "kPa", 1),
        "temperature": ("degC", "°C", 0),
        "mass_flow": ("kg/h", "kg/h", 0),
        "length": ("m", "m", 2),
        "power": ("kW", "kW", 0),
        "diameter": ("mm", "mm", 1),
        "velocity": ("m/s", "m/s", 1),
        "volume_flow": ("m**3/h", "m³/h", 1),
        "mass": ("t", "t", 1),
    },
    "us": {
        "pressure": ("psi", "psig", 1),
        "pressure_abs": ("psi", "psia", 1),
        "differential": ("psi", "psi", 2),
        "temperature": ("degF", "°F", 0),
        "mass_flow": ("lb/h", "lb/h", 0),
        "length": ("ft", "ft", 1),
        "power": ("Btu/h", "Btu/h", 0),
        "diameter": ("in", "in", 2),
        "velocity": ("ft/s", "ft/s", 0),
        "volume_flow": ("ft**3/min", "cfm", 1),
        "mass": ("lb", "lb", 0),
    },
}

_SI_UNIT = {"pressure": "Pa", "pressure_abs": "Pa", "differential": "Pa", "temperature": "K",
            "mass_flow": "kg/s", "length": "m", "power": "W", "diameter": "m", "velocity": "m/s",
            "volume_flow": "m**3/s", "mass": "kg"}


def convert(value: float, kind: str, system: str, atmospheric: float = STANDARD_ATMOSPHERE) -> float:
    """Convert an SI value to the display unit of ``kind`` in ``system`` ("si" or "us").

    ``pressure`` is shown gauge: the site's ``atmospheric`` pressure [Pa] is taken off.
    """
    if kind == "pressure":
        value = value - atmospheric
    offset, scale = linear(_SI_UNIT[kind], DISPLAY[system][kind][0])
    return offset + scale * value


def from_display(number: float, kind: str, system: str, atmospheric: float = STANDARD_ATMOSPHERE) -> float:
    """The inverse of :func:`convert`: a number in the display unit of ``kind`` back to SI."""
    offset, scale = linear(_SI_UNIT[kind], DISPLAY[system][kind][0])
    value = (number - offset) / scale
    return value + atmospheric if kind == "pressure" else value


def rounded(value: float, kind: str, system: str, atmospheric: float = STANDARD_ATMOSPHERE,
            up: bool = False) -> float:
    """An SI value rounded, in its display unit and at the precision :func:`show` prints,
    down (or ``up``) rather than to the nearest: the figure a user reads and applies is
    then on the safe side of ``value``. Returns the SI value of the printed figure.

    Parameters
    ----------
    value : float
        SI value (absolute [Pa] for ``pressure``).
    kind : str
        A display kind of :data:`DISPLAY`.
    up : bool
        Round up (towards +inf in the display unit) instead of down.
    """
    number = convert(value, kind, system, atmospheric)
    step = _printed_step(number, kind, system)
    steps = number / step
    # a figure already on a printed step stays there (no step lost to the last bit)
    nearest = round(steps)
    if abs(steps - nearest) < 1e-9 * max(1.0, abs(nearest)):
        steps = nearest
    figure = (math.ceil(steps) if up else math.floor(steps)) * step
    return from_display(figure, kind, system, atmospheric)


#: Kinds read to three significant figures from 100 up (a flow of 1,260 lb/h, not 1,263).
_FIGURES_FROM_100 = ("mass_flow", "power", "mass", "volume_flow")


def _precision(number: float, kind: str, system: str) -> tuple[bool, int]:
    """How :func:`show` prints ``number`` (in its display unit): (True, n) to n
    significant figures, or (False, n) to n decimals. The one rule for the printed
    figure and for :func:`rounded`'s step."""
    if kind in _FIGURES_FROM_100 and abs(number) >= 100:
        return True, 3
    if kind == "diameter":      # bores read as a drawing gives them (1/16 in is 0.0625 in)
        return True, 3
    if kind == "velocity" and 0 < abs(number) < 9.95:
        return True, 2          # a slow column (under 10 ft/s) to two figures, not "1 ft/s"
    return False, DISPLAY[system][kind][2]


def _printed_step(number: float, kind: str, system: str) -> float:
    """The last printed digit's step of ``number`` in its display unit, as :func:`show`
    prints it (:func:`_precision`)."""
    figures, n = _precision(number, kind, system)
    if figures:
        magnitude = math.floor(math.log10(abs(number))) if number else 0
        return 10.0 ** (magnitude - (n - 1))
    return 10.0 ** -n


def up_to_figures(value: float, figures: int = 3) -> float:
    """``value`` rounded up to ``figures`` significant figures (a flow coefficient a
    valve is selected by: one of at least the figure does what the text says)."""
    step = 10.0 ** (math.floor(math.log10(value)) - (figures - 1))
    return float(f"{math.ceil(value / step - 1e-9) * step:.{figures + 1}g}")   # the figure, not its float noise


def express(value: float, si: str, unit: str) -> float:
    """An SI value in another unit of the same dimension (``express(0.3048, "m", "ft")``)."""
    offset, scale = linear(si, unit)
    return offset + scale * value


def convert_array(values, kind: str, system: str, atmospheric: float = STANDARD_ATMOSPHERE):
    """:func:`convert` for a sequence; returns a list of floats."""
    if not len(values):
        return []
    import numpy as np

    scale_zero = convert(0.0, kind, system, atmospheric)
    scale_one = convert(1.0, kind, system, atmospheric)
    arr = np.asarray(values, dtype=float)
    return list(scale_zero + (scale_one - scale_zero) * arr)


def label(kind: str, system: str) -> str:
    """The unit label shown after a number of ``kind``."""
    return DISPLAY[system][kind][1]


def show(value: float | None, kind: str, system: str, atmospheric: float = STANDARD_ATMOSPHERE) -> str:
    """Format an SI value for people: converted, rounded as a gauge is read
    (:func:`_precision`), with its unit."""
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "—"
    number = convert(value, kind, system, atmospheric)
    figures, n = _precision(number, kind, system)
    if not figures:
        text = f"{number:,.{n}f}"
    elif kind in _FIGURES_FROM_100:
        text = f"{float(f'{number:.{n}g}'):,.0f}"
    else:
        text = f"{number:.{n}g}"
    if text.startswith("-") and float(text.replace(",", "")) == 0:
        text = text[1:]
    if kind == "pressure" and system == "us" and text.startswith("-"):
        # below atmospheric, as a US compound gauge reads it: inches of mercury vacuum
        offset, scale = linear("Pa", "inch_Hg")
        return f"{text} {label(kind, system)} ({offset + scale * (atmospheric - value):.1f} inHg vac)"
    return f"{text} {label(kind, system)}"


def show_about(value: float, kind: str, system: str) -> str:
    """A limit of practice (a velocity, say) as practitioners quote it: converted, then
    rounded to the nearest 5 above 20 (15 m/s is "about 50 ft/s", not 49)."""
    number = convert(value, kind, system)
    number = round(number / 5.0) * 5.0 if abs(number) > 20 else round(number)
    return f"{number:,.0f} {label(kind, system)}"


# --- the JSON contract's units ------------------------------------------------------
# The result contract is SI with fixed units: kPa absolute, °C, kg/h, kW. These are
# exact scale factors, kept here with the other conversions.


def kpa(pascal):
    """Pa → kPa (absolute stays absolute)."""
    return None if pascal is None else pascal / 1000.0


def celsius(kelvin):
    """K → °C."""
    return None if kelvin is None else kelvin - 273.15


def kg_h(kg_s):
    """kg/s → kg/h."""
    return None if kg_s is None else kg_s * 3600.0


def kw(watt):
    """W → kW."""
    return None if watt is None else watt / 1000.0
