"""The one place that converts units: unit-file strings in, SI out, and back for display.

Every dimensional value in a unit file is a string ``"<number> <unit>"``. This
module parses it with pint's registry (extended once here with gauge and absolute
pressure spellings and a few trade abbreviations), checks its dimension, and
returns a float in SI: Pa (absolute), K, m, kg/s, m³/s.

Gauge pressures need the site's atmospheric pressure, so they come back as a
:class:`Pressure` that remembers whether it was gauge; :mod:`stallcheck.files.unitfile`
resolves it once the site is known.

pint is imported on first use, not with the package: ``stallcheck --help`` must stay
fast. Its answers (what a unit spelling means, and the factors that convert it) are
kept in the user's cache folder, so a later run that meets only spellings seen before
does not import pint at all (see :class:`_Answers`).
"""

from __future__ import annotations

import atexit
import hashlib
import importlib.util
import json
import math
import os
import re
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from stallcheck.errors import InputError
from stallcheck.physics.constants import GRAVITY, STANDARD_AIR_DENSITY, STANDARD_ATMOSPHERE  # noqa: F401 (re-exported)

# Pressure spellings. Gauge and absolute are separate units in the registry so the
# parsed unit tells which was written.
_GAUGE = {"psig": "psi", "barg": "bar", "kPag": "kPa"}
_ABSOLUTE = {"psia": "psi", "bara": "bar", "kPaa": "kPa"}
_SPELLINGS = {"kPa(g)": "kPag", "kPa(abs)": "kPaa", "kpa(g)": "kPag", "kpa(abs)": "kPaa", "kPa(a)": "kPaa",
              "kpa(a)": "kPaa", "bar(g)": "barg", "bar(a)": "bara", "bar(abs)": "bara", "psi(g)": "psig",
              "psi(a)": "psia"}
#: Unit spellings that mark a file as written in US customary units.
_US_UNITS = {"psig", "psia", "psi", "degF", "in", "ft", "lb/h", "cfm", "gpm", "inH2O"}

#: Longest unit text looked up [characters]: every unit spelling a unit file needs is a
#: few characters; anything longer is refused unparsed.
MAX_UNIT_TEXT = 40
#: Longest quantity string read [characters].
MAX_QUANTITY_TEXT = 120

_NUMBER_UNIT = re.compile(
    r"^\s*([-+]?(?:\d{1,3}(?:,\d{3})+(?:\.\d*)?|\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S.*?)\s*$")

#: Units as engineers type them, compared without case (``15C``, ``0 deg F``,
#: ``12000 CFM``, ``15 PSIG``): the one grammar of unit files, CSV cells, ``new`` and
#: ``diagnose``. A spelling not here is looked up as written.
TYPED_UNITS = {
    "c": "degC", "°c": "degC", "degc": "degC", "deg c": "degC", "deg. c": "degC", "celsius": "degC",
    "f": "degF", "°f": "degF", "degf": "degF", "deg f": "degF", "deg. f": "degF", "fahrenheit": "degF",
    "k": "K", "kelvin": "K",
    "cfm": "cfm", "scfm": "cfm", "gpm": "gpm", "lb/h": "lb/h", "lb/hr": "lb/h", "lbs/h": "lb/h",
    "lbs/hr": "lb/h", "pph": "lb/h", "kg/h": "kg/h", "kg/hr": "kg/h", "kg/s": "kg/s", "m3/h": "m3/h",
    "m³/h": "m3/h", "m3/s": "m3/s", "m³/s": "m3/s", "l/s": "L/s",
    "psig": "psig", "psia": "psia", "barg": "barg", "bara": "bara", "kpag": "kPag", "kpaa": "kPaa",
    "kpa(g)": "kPa(g)", "kpa(abs)": "kPa(abs)", "kpa(a)": "kPa(a)", "bar(g)": "bar(g)", "bar(a)": "bar(a)",
    "bar(abs)": "bar(abs)", "psi(g)": "psi(g)", "psi(a)": "psi(a)",
    "psi": "psi", "kpa": "kPa", "bar": "bar", "inh2o": "inH2O", "in h2o": "inH2O", "in. w.c.": "inH2O", "in wc": "inH2O",
    "in": "in", '"': "in", "inch": "in", "inches": "in", "ft": "ft", "'": "ft", "feet": "ft", "foot": "ft",
    "m": "m", "mm": "mm",
}


def typed_unit(unit_text: str) -> str:
    """A unit as typed, in the unit file's spelling (:data:`TYPED_UNITS`), else as given."""
    return TYPED_UNITS.get(unit_text.lower(), unit_text)


@lru_cache(maxsize=1)
def registry():
    """The project's pint registry, built once.

    Returns
    -------
    pint.UnitRegistry
    """
    import pint

    try:
        # pint keeps its parsed definitions in the user's cache folder: a registry then
        # builds in a fifth of the time.
        ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True, cache_folder=":auto:")
    except Exception:  # an unwritable or broken cache folder: build without it
        ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    for definition in _DEFINITIONS:
        ureg.define(definition)
    return ureg


_DEFINITIONS = tuple(f"{name} = {base}" for name, base in {**_GAUGE, **_ABSOLUTE}.items()) + (
    # Trade abbreviations pint lacks or reads otherwise ("cfm" would be centi-fermi).
    "cfm = foot ** 3 / minute",
    "gpm = gallon / minute",
    "m3 = meter ** 3",
)


class _Answers:
    """pint's answers kept between runs: a small JSON file in the user's cache folder
    (``$XDG_CACHE_HOME/stallcheck`` or ``~/.cache/stallcheck``), named by a hash of the
    installed pint (its path and modification time) and of our definitions, so a new
    pint or a changed definition starts a fresh file. It is a memo of what pint said,
    never a table of our own: a spelling not in it goes to pint. Unreadable or
    unwritable cache folders are passed over silently.
    """

    def __init__(self):
        self.data: dict | None = None
        self.dirty = False
        self.file: Path | None = None

    def _load(self) -> dict:
        if self.data is None:
            self.data = {}
            try:
                spec = importlib.util.find_spec("pint")
                origin = spec.origin if spec else ""
                stamp = os.stat(origin).st_mtime_ns if origin else 0
                key = hashlib.sha1(f"{origin}|{stamp}|{_DEFINITIONS}".encode()).hexdigest()[:16]
                base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
                self.file = Path(base) / "stallcheck" / f"units-{key}.json"
                self.data = json.loads(self.file.read_text(encoding="utf-8"))
                if not isinstance(self.data, dict):
                    self.data = {}
            except (OSError, ValueError):
                pass
        return self.data

    def get(self, key: str, compute, valid=lambda value: True):
        """pint's answer for ``key``: from the file where it is there and of the shape
        ``valid`` accepts (a cache file damaged or written by something else is not
        trusted), else computed and kept."""
        data = self._load()
        if key in data and valid(data[key]):
            value = data[key]
            return tuple(value) if isinstance(value, list) else value
        value = compute()
        data[key] = value
        if not self.dirty:
            self.dirty = True
            atexit.register(self.save)
        return value

    def save(self) -> None:
        if not self.dirty or self.file is None:
            return
        import tempfile  # only when there is something new to keep

        try:
            self.file.parent.mkdir(parents=True, exist_ok=True)
            handle, temporary = tempfile.mkstemp(dir=self.file.parent, suffix=".part")
            with os.fdopen(handle, "w", encoding="utf-8") as out:
                json.dump(self.data, out)
            os.replace(temporary, self.file)
            self.dirty = False
        except OSError:
            pass


_answers = _Answers()


@dataclass(frozen=True)
class Pressure:
    """A pressure as written: its value in Pa and whether it was gauge.

    Attributes
    ----------
    pascal : float
        The number converted to pascal, before any atmospheric offset. [Pa]
    gauge : bool
        True where the file said gauge (``psig``, ``barg``, ``kPag``, ``kPa(g)``).
    """

    pascal: float
    gauge: bool

    def absolute(self, atmospheric: float) -> float:
        """Absolute pressure [Pa] given the site's atmospheric pressure [Pa]."""
        return self.pascal + atmospheric if self.gauge else self.pascal


def _split(key: str, text, example: str) -> tuple[float, str]:
    if isinstance(text, bool) or not isinstance(text, str):
        kind = {bool: "true/false", int: "bare number", float: "bare number", list: "list",
                dict: "table"}.get(type(text), type(text).__name__)
        raise InputError(key, f"expected a quantity string such as \"{example}\", got a {kind} ({text!r}); "
                              "write the number and its unit inside quotes.")
    if len(text) > MAX_QUANTITY_TEXT:
        raise InputError(key, f"is {len(text):,} characters long; a quantity is a number and a unit, such as "
                              f"\"{example}\".")
    read = _read(text)
    if isinstance(read, tuple):
        return read
    if read == "comma":
        raise InputError(key, f"'{text}': write the decimal point as a point (1.5, not 1,5); a comma only "
                              f"separates thousands (12,000).")
    if read == "finite" or any(word in text.strip().lower() for word in ("nan", "inf")):
        raise InputError(key, f"'{text}' is not a finite number; write a value such as \"{example}\".")
    raise InputError(key, f"'{text}' is not '<number> <unit>'; write it as \"{example}\".")


@lru_cache(maxsize=4096)
def _read(text: str) -> tuple[float, str] | str:
    """The number and the unit (in the unit file's spelling) of a quantity string, or
    why it cannot be read: ``"form"``, ``"comma"`` (a decimal comma) or ``"finite"``.
    Cached: a file is read once to choose its units and once for its values."""
    match = _NUMBER_UNIT.match(text)
    if not match:
        return "form"
    unit_text = match.group(2)
    if unit_text[:1] == "," and unit_text[1:2].isdigit():
        return "comma"
    value = float(match.group(1).replace(",", ""))
    if not math.isfinite(value):
        return "finite"
    unit = typed_unit(unit_text)
    return value, _SPELLINGS.get(unit, unit)


class _Parsed:
    """A parsed quantity: its number, its unit's canonical name, and its dimension."""

    __slots__ = ("value", "unit", "dimension")

    def __init__(self, value: float, unit: str, dimension: str):
        self.value = value
        self.unit = unit
        self.dimension = dimension


@lru_cache(maxsize=1024)
def _unit_info(unit_text: str) -> tuple[str, str] | None:
    """(canonical unit name, dimensionality) of a unit as written; None if pint does not
    know it. Cached: a survey meets the same few spellings thousands of times."""
    if len(unit_text) > MAX_UNIT_TEXT:
        return None
    return _answers.get(f"unit|{unit_text}", lambda: _pint_unit(unit_text),
                        lambda v: v is None or (isinstance(v, list) and len(v) == 2
                                                and all(isinstance(x, str) for x in v)))


def _pint_unit(unit_text: str):
    ureg = registry()
    import pint

    try:
        units = ureg.parse_units(unit_text)
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError, AttributeError,
            TypeError, ValueError, SyntaxError, AssertionError, RecursionError, KeyError, IndexError):
        # pint's parser fails in several ways on text that is no unit at all (characters
        # it cannot tokenise, thousands of nested parentheses): all mean "not a unit"
        return None
    return [str(units), str(units.dimensionality)]


def unit_known(unit_text: str) -> bool:
    """True where the units library knows this unit spelling."""
    return _unit_info(unit_text) is not None


@lru_cache(maxsize=64)
def _dimension(si: str) -> str:
    return _answers.get(f"dimension|{si}", lambda: str(registry().parse_units(si).dimensionality),
                        lambda v: isinstance(v, str))


@lru_cache(maxsize=1024)
def _line(unit: str, si: str) -> tuple[float, float]:
    """Offset and scale taking a value in ``unit`` to ``si`` (every unit here converts
    linearly, temperatures with an offset)."""
    def compute():
        ureg = registry()
        zero = float(ureg.Quantity(0.0, unit).to(si).magnitude)
        one = float(ureg.Quantity(1.0, unit).to(si).magnitude)
        return [zero, one - zero]

    return _answers.get(f"line|{unit}|{si}", compute,
                        lambda v: isinstance(v, list) and len(v) == 2
                        and all(isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)
                                for x in v))


def _quantity(key: str, text, dimension: str, example: str, accepted: str, also: str | None = None):
    value, unit_text = _split(key, text, example)
    info = _unit_info(unit_text)
    if info is None:
        raise InputError(key, f"unknown unit '{unit_text}' in '{text}'; accepted: {accepted}.")
    unit, dim = info
    if dim not in [_dimension(d) for d in (dimension, also) if d]:
        what = _DIMENSION_WORDS[dimension] + (f" or {_DIMENSION_WORDS[also]}" if also else "")
        raise InputError(key, f"'{text}' is not a {what}; accepted: {accepted}.")
    return _Parsed(value, unit, dim), unit


_DIMENSION_WORDS = {
    "Pa": "pressure", "K": "temperature", "m": "length", "kg/s": "mass flow",
    "m**3/s": "volume flow", "dimensionless": "fraction", "kg": "mass",
}


def _magnitude(key: str, text: str, q: _Parsed, si: str) -> float:
    offset, scale = _line(q.unit, si)
    value = offset + scale * q.value
    if not math.isfinite(value) or abs(value) > 1e15:
        raise InputError(key, f"'{text}' is out of any sensible range.")
    return value


def pressure(key: str, text, absolute_only: bool = False) -> Pressure:
    """Parse a gauge or absolute pressure.

    Parameters
    ----------
    key : str
        Dotted unit-file key, for messages.
    text : str
        ``"<number> <unit>"`` with one of psig psia barg bara kPag kPaa kPa(g) kPa(abs).
    absolute_only : bool
        The key takes absolute pressures only: hints offer only those spellings.

    Returns
    -------
    Pressure
        Value in Pa and whether it was gauge.
    """
    accepted = "psia, bara, kPaa, kPa(abs)" if absolute_only else \
        "psig, psia, barg, bara, kPag, kPaa, kPa(g), kPa(abs)"
    q, unit = _quantity(key, text, "Pa", "15 psig", accepted)
    if unit not in _GAUGE and unit not in _ABSOLUTE:
        raise InputError(key, _gauge_hint(key, text, unit, absolute_only, accepted))
    return Pressure(_magnitude(key, text, q, "Pa"), unit in _GAUGE)


def _gauge_hint(key: str, text: str, unit: str, absolute_only: bool, accepted: str) -> str:
    """What to write for a pressure that says neither gauge nor absolute: the user's
    own psi, bar or kPa with g or a added; any other pressure unit converted to psi
    (inch units) or kPa."""
    number, _ = _split(key, text, "15 psig")
    base = {"pound_force_per_square_inch": "psi", "bar": "bar", "kilopascal": "kPa"}.get(unit)
    mercury = "Hg" in unit or "mercury" in unit
    if base is None:  # another pressure unit: in psi where it is an inch unit, else kPa
        base = "psi" if "inch" in unit else "kPa"
        offset, scale = _line(unit, "psi" if base == "psi" else "kPa")
        number = offset + scale * number
    figure = f"{number:.4g}"
    gauge = f"\"{figure} {base}g\" (gauge)"
    absolute = f"\"{figure} {base}a\" (absolute)"
    if absolute_only:
        offer = f"write {absolute}"
    else:
        offer = f"write {gauge} or {absolute}"
    vacuum = (" A vacuum gauge's reading is a gauge pressure below zero: "
              f"\"-{abs(float(figure)):g} {base}g\"." if mercury and not absolute_only else "")
    return f"'{text}' does not say gauge or absolute; {offer}; accepted: {accepted}.{vacuum}"


#: Units a vacuum or compound gauge reads in, below atmospheric (``"10 inHg vacuum"``).
_VACUUM_UNITS = {"inhg": "inHg", "in hg": "inHg", '"hg': "inHg", "mmhg": "mmHg", "kpa": "kPa", "bar": "bar",
                 "psi": "psi"}
_VACUUM = re.compile(r"^\s*([-+]?(?:\d+(?:\.\d*)?|\.\d+))\s*(inhg|in hg|\"hg|mmhg|kpa|bar|psi)\s*(vac|vacuum)?\s*$",
                     re.IGNORECASE)


def gauge_reading(key: str, text, atmospheric: float) -> float:
    """A gauge reading as typed at a unit [Pa, absolute]: what :func:`pressure` reads,
    and what vacuum and compound gauges show below atmospheric: ``"10 inHg vacuum"``,
    ``"10 inHg vac"``, ``"-10 inHg"``, ``"25 kPa vacuum"``, ``"-0.3 barg"``.

    Parameters
    ----------
    key : str
        The option or key, for messages.
    text : str
    atmospheric : float
        The site's atmospheric pressure [Pa], which gauge and vacuum readings are
        relative to.
    """
    match = _VACUUM.match(str(text))
    if match:
        number, unit, vacuum = float(match.group(1)), _VACUUM_UNITS[match.group(2).lower()], match.group(3)
        mercury = unit in ("inHg", "mmHg")
        if vacuum or (mercury and number < 0):
            if vacuum and number < 0:
                raise InputError(key, f"'{text}' gives a vacuum with a minus sign; write \"{-number:g} {unit} vacuum\" "
                                      f"or \"{number:g} {unit}\".")
            offset, scale = _line(_unit_info(unit)[0], "Pa")
            below = offset + scale * abs(number)
            if below >= atmospheric:
                raise InputError(key, f"'{text}' is more vacuum than the atmosphere here "
                                      f"({show(atmospheric, 'pressure_abs', 'us' if unit in ('inHg', 'psi') else 'si')}) "
                                      f"allows; check the gauge and its units.")
            return atmospheric - below
        if mercury:
            raise InputError(key, f"'{text}' does not say it is a vacuum: a compound gauge reads inches or "
                                  f"millimetres of mercury below atmospheric; write \"{number:g} {unit} vacuum\" or "
                                  f"\"-{number:g} {unit}\".")
    return pressure(key, text).absolute(atmospheric)


def differential(key: str, text) -> float:
    """Parse a pressure difference [Pa]: plain ``psi``, ``bar``, ``kPa`` or ``inH2O``."""
    accepted = "psi, bar, kPa, inH2O"
    q, unit = _quantity(key, text, "Pa", "0.25 psi", accepted)
    if unit in _GAUGE or unit in _ABSOLUTE:
        base = _GAUGE.get(unit) or _ABSOLUTE[unit]
        raise InputError(key, f"'{text}' is a difference of pressures, so it is neither gauge "
                              f"nor absolute; write it in plain {base}.")
    return _magnitude(key, text, q, "Pa")


def temperature(key: str, text) -> float:
    """Parse a temperature [K]: ``degC``, ``degF`` or ``K``; a temperature difference
    (``delta_degC``) is not a temperature."""
    q, unit = _quantity(key, text, "K", "50 degF", "degC, degF, K")
    if "delta" in unit:
        raise InputError(key, f"'{text}' is a temperature difference, not a temperature; accepted: degC, degF, K.")
    return _magnitude(key, text, q, "K")


def length(key: str, text) -> float:
    """Parse a length [m]: ``in``, ``ft``, ``mm`` or ``m``."""
    q, _ = _quantity(key, text, "m", "18 in", "in, ft, mm, m")
    return _magnitude(key, text, q, "m")


def mass(key: str, text) -> float:
    """Parse a mass [kg]: ``kg``, ``t``, ``lb`` (for prices per quantity of steam)."""
    q, _ = _quantity(key, text, "kg", "1000 lb", "kg, t, lb")
    return _magnitude(key, text, q, "kg")


def fraction(key: str, text) -> float:
    """Parse a fraction written with ``%`` [-], e.g. ``"30 %"`` → 0.30."""
    q, _ = _quantity(key, text, "dimensionless", "30 %", "% (for example \"30 %\")")
    return _magnitude(key, text, q, "dimensionless")


@dataclass(frozen=True)
class Flow:
    """A flow as written: mass [kg/s] or volume [m³/s]."""

    value: float
    is_mass: bool


def flow(key: str, text) -> Flow:
    """Parse a mass flow (``kg/h kg/s lb/h``) or volume flow (``m3/h m3/s L/s gpm cfm``)."""
    accepted = "kg/h, kg/s, lb/h (mass) or m3/h, m3/s, L/s, gpm, cfm (volume)"
    q, _ = _quantity(key, text, "kg/s", "6000 cfm", accepted, also="m**3/s")
    if q.dimension == _dimension("kg/s"):
        return Flow(_magnitude(key, text, q, "kg/s"), True)
    return Flow(_magnitude(key, text, q, "m**3/s"), False)


def mass_flow(key: str, text) -> float:
    """Parse a mass flow [kg/s]: ``kg/h kg/s lb/h``."""
    q, _ = _quantity(key, text, "kg/s", "900 lb/h", "kg/h, kg/s, lb/h")
    return _magnitude(key, text, q, "kg/s")


def is_us(text) -> bool:
    """True where a quantity string is written in US customary units."""
    if not isinstance(text, str):
        return False
    try:
        _, unit = _split("", text, "")
    except InputError:
        return False
    return unit in _US_UNITS


def atmosphere_at(elevation: float) -> float:
    """Atmospheric pressure at an elevation, standard atmosphere [Pa].

    .. math:: p = 101325\\,(1 - 2.25577\\times10^{-5} z)^{5.25588}

    Parameters
    ----------
    elevation : float
        Height above sea level [m], valid in the troposphere (below 11 000 m).

    References
    ----------
    .. [1] ISO 2533:1975, Standard Atmosphere (troposphere, lapse rate 6.5 K/km).
    """
    return STANDARD_ATMOSPHERE * (1.0 - 2.25577e-5 * elevation) ** 5.25588


# --- display ---------------------------------------------------------------------

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
    offset, scale = _line(_SI_UNIT[kind], DISPLAY[system][kind][0])
    return offset + scale * value


def from_display(number: float, kind: str, system: str, atmospheric: float = STANDARD_ATMOSPHERE) -> float:
    """The inverse of :func:`convert`: a number in the display unit of ``kind`` back to SI."""
    offset, scale = _line(_SI_UNIT[kind], DISPLAY[system][kind][0])
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
        A display kind of :data:`DISPLAY` with fixed decimals (pressures, lengths...).
    up : bool
        Round up (towards +inf in the display unit) instead of down.
    """
    number = convert(value, kind, system, atmospheric)
    step = 10.0 ** -DISPLAY[system][kind][2]
    steps = number / step
    # a figure already on a printed step stays there (no step lost to the last bit)
    nearest = round(steps)
    if abs(steps - nearest) < 1e-9:
        steps = nearest
    figure = (math.ceil(steps) if up else math.floor(steps)) * step
    return from_display(figure, kind, system, atmospheric)


def express(value: float, si: str, unit: str) -> float:
    """An SI value in another unit of the same dimension (``express(0.3048, "m", "ft")``)."""
    offset, scale = _line(si, unit)
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


def show(value: float | None, kind: str, system: str, atmospheric: float = STANDARD_ATMOSPHERE,
         decimals: int | None = None) -> str:
    """Format an SI value for people: converted, rounded as a gauge is read, with its unit."""
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "—"
    number = convert(value, kind, system, atmospheric)
    places = DISPLAY[system][kind][2] if decimals is None else decimals
    if kind in ("mass_flow", "power", "mass", "volume_flow") and abs(number) >= 100:
        number = float(f"{number:.3g}")
        places = 0
    # bores read as a drawing gives them: three significant figures (1/16 in is 0.0625 in)
    text = f"{number:.3g}" if kind == "diameter" and decimals is None else f"{number:,.{places}f}"
    if text.startswith("-") and float(text.replace(",", "")) == 0:
        text = text[1:]
    if kind == "pressure" and system == "us" and decimals is None and text.startswith("-"):
        # below atmospheric, as a US compound gauge reads it: inches of mercury vacuum
        offset, scale = _line("Pa", "inch_Hg")
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
