"""Unit file (TOML, format 1) → a validated :class:`~stallcheck.inputs.Unit`.

Every input error is raised here, before any physics, as an
:class:`~stallcheck.errors.InputError` that names the file, the key and what is
accepted. Checks that need steam properties (the set point against the steam
temperature) are made in :mod:`stallcheck.analysis`, still as ``InputError``, worded in
:mod:`stallcheck.files.refusals`.
The format is fixed in the README's "Unit file" section.
"""

from __future__ import annotations

import difflib
import os
import re
import stat
from dataclasses import replace
from pathlib import Path

import tomli

from stallcheck.errors import InputError
from stallcheck.files import drainkeys, keys
from stallcheck.files import quantities as q
from stallcheck.files.ranges import (COLDEST_AIR, HOURS_A_YEAR, RETURN_AIR_RANGE, check_entering,
                                     require_positive)
from stallcheck.inputs import (
    MEDIA,
    VARIES,
    Design,
    Geometry,
    Load,
    LoadBin,
    Site,
    Unit,
    Valve,
)
from stallcheck.physics.atmosphere import pressure_at

#: Largest unit file read [bytes]. A unit file is a page of text.
MAX_FILE_BYTES = 1_000_000
CV_PER_KV = q.CV_PER_KV

#: The keys each section takes (the key table, :mod:`stallcheck.files.keys`).
_KNOWN = keys.known()


#: The TOML parser's messages, in plainer words where they puzzle.
_TOML_WORDS = {
    "Cannot overwrite a value": "a key or table is given twice",
    "Illegal character '\\n'": "a line ends inside a quoted string (a closing quote is missing)",
}


def read_text(path: str | Path, max_bytes: int = MAX_FILE_BYTES, kind: str = "TOML unit file",
              suffix: str = ".toml") -> str:
    """Read a unit file's text (or a CSV table's, with its own ``kind``, ``suffix`` and
    size limit), turning every file-system problem into an InputError."""
    path = Path(path)
    name = str(path)
    try:
        if path.is_dir():
            if not os.access(path, os.R_OK | os.X_OK):
                raise InputError("", "is a folder that cannot be read (permission denied).", file=name)
            raise InputError("", f"is a folder, not a {kind}; give the path of a {suffix} file.", file=name)
        info = path.stat()
        if not stat.S_ISREG(info.st_mode):
            # a named pipe or a device would block, or never end
            raise InputError("", f"is not a regular file (a pipe, device or socket); give the path of a {suffix} "
                                 f"file.", file=name)
        if info.st_size > max_bytes:
            raise InputError("", f"is {info.st_size / 1e6:.1f} MB; a {kind} is read up to "
                                 f"{max_bytes / 1e6:.0f} MB.", file=name)
        with open(path, "rb") as handle:
            # a hard limit, whatever the size said (a file still growing, say)
            raw = handle.read(max_bytes + 1)
        if len(raw) > max_bytes:
            raise InputError("", f"is more than {max_bytes / 1e6:.0f} MB; a {kind} is read up to "
                                 f"{max_bytes / 1e6:.0f} MB.", file=name)
    except FileNotFoundError:
        raise InputError("", f"no such file; give the path of a {suffix} {kind}.", file=name) from None
    except PermissionError:
        raise InputError("", "cannot be read (permission denied).", file=name) from None
    except OSError as exc:
        raise InputError("", f"cannot be read ({exc.strerror or exc}).", file=name) from None
    if raw.startswith((b"\xff\xfe", b"\xfe\xff")) or (b"\x00" in raw and raw[1::2].count(0) > len(raw) // 4):
        raise InputError("", "is saved as UTF-16 (or UTF-32); save it as UTF-8 text and try again.", file=name)
    if b"\x00" in raw:
        raise InputError("", f"is a binary file, not a {kind}.", file=name)
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        raise InputError("", "is not UTF-8 text; save it as UTF-8.", file=name, line=line) from None


def load(path: str | Path) -> Unit:
    """Read and validate a unit file.

    Parameters
    ----------
    path : str or Path

    Returns
    -------
    Unit

    Raises
    ------
    InputError
        For anything in the file that cannot be accepted; names file and key.
    """
    text = read_text(path)
    return parse(text, source=str(path), folder=Path(path).parent)


def parse(text: str, source: str = "unit file", folder: str | Path | None = None) -> Unit:
    """Validate the text of a unit file (see :func:`load`); a weather file it names is
    found relative to ``folder`` (default: the folder of ``source``)."""
    try:
        data = tomli.loads(text)
    except RecursionError:
        raise InputError("", "is not valid TOML here: its arrays or tables are nested too deeply to read "
                             "(a unit file nests two levels at most).", file=source) from None
    except tomli.TOMLDecodeError as exc:
        msg = str(exc)
        match = re.search(r"line (\d+)", msg)
        detail = re.sub(r"\s*\(at line \d+, column \d+\)", "", msg)
        detail = re.sub(r"\s*\(at end of document\)", " (at the end of the file)", detail)
        for said, plain in _TOML_WORDS.items():
            detail = detail.replace(said, plain)
        raise InputError("", f"is not valid TOML: {detail}.", file=source,
                         line=int(match.group(1)) if match else None) from None
    try:
        return _build(data, source, Path(source).parent if folder is None else folder)
    except InputError as exc:
        exc = exc.in_file(source)
        if exc.line is None and exc.message.startswith("unknown key"):
            exc.line = _line_of(text, exc.key)
        raise exc from None


def from_data(data: dict, source: str, line: int | None = None, folder: str | Path | None = None) -> Unit:
    """Validate a unit already read into nested tables (a CSV row, say).

    Parameters
    ----------
    data : dict
        The same tables and keys as a unit file.
    source : str
        The file it came from, for messages.
    line : int, optional
        The line it came from; the unit's source is then ``"file:line"``.
    folder : str or Path, optional
        Where a weather file it names is found from; default the folder of ``source``
        (a CSV table's, for its rows).
    """
    try:
        return _build(data, source if line is None else f"{source}:{line}",
                      Path(source).parent if folder is None else folder)
    except InputError as exc:
        exc = exc.in_file(source)
        exc.line = line
        raise exc from None


# --- helpers -----------------------------------------------------------------------


def unknown_key(section: str, key: str) -> InputError:
    """The error for a key the format does not know, naming the nearest known key (or,
    for a section the format does not have, the sections it has)."""
    full = f"{section}.{key}" if section else key
    if section not in _KNOWN:
        return InputError(full, f"unknown key; a key of the unit file is written as \"drain.lift\"; sections: "
                                f"{', '.join(sorted(k for k in _KNOWN if k))}.")
    known = _KNOWN[section]
    near = difflib.get_close_matches(key, sorted(known), n=1, cutoff=0.6)
    where = f"[{section}]" if section else "the top level"
    hint = (f"did you mean '{near[0]}'?" if near else f"known keys in {where}: {', '.join(sorted(known))}.")
    return InputError(full, f"unknown key; {hint} Nothing is computed from a file with a key it does "
                            f"not know, since a misspelt key would leave its default in force.")


def known_key(dotted: str) -> bool:
    """True where ``dotted`` (``"drain.lift"``, ``"format"``) is a key of the format."""
    section, _, name = dotted.rpartition(".")
    return section in _KNOWN and name in _KNOWN[section]


def _line_of(text: str, key: str) -> int | None:
    """The line where a dotted key is written (its last part as a key, or as a table)."""
    name = key.rpartition(".")[2]
    pattern = re.compile(rf'^[ \t]*(?:"{re.escape(name)}"|{re.escape(name)})[ \t]*=|^[ \t]*\[+[ \t]*{re.escape(key)}'
                         rf'[ \t]*\]+', re.MULTILINE)
    match = pattern.search(text)
    return text.count("\n", 0, match.start()) + 1 if match else None


class _Reader:
    """Walks the TOML tables, recording unknown keys and defaults taken."""

    def __init__(self, data: dict):
        self.data = data
        self.warnings: list[str] = []
        #: Defaults taken, as said (a quantity's as its key and row, said once the
        #: file's system of units is known).
        self.defaults: list = []
        self.us_votes = 0
        self.si_votes = 0
        #: The site's atmospheric pressure [Pa], once read: gauge pressures are made
        #: absolute with it.
        self.atm = q.STANDARD_ATMOSPHERE

    def table(self, name: str, required: bool = True) -> dict | None:
        value = self.data.get(name)
        if value is None:
            if required:
                raise InputError(name, f"section [{name}] is missing; see the README's unit-file format.")
            return None
        if not isinstance(value, dict):
            raise InputError(name, f"must be a table [{name}], not a {_kind(value)}.")
        self.unknown(value, name)
        return value

    def unknown(self, table: dict, name: str) -> None:
        """Refuse a key the format does not know: a misspelt key would otherwise leave
        its default in force and change the answer without a word."""
        for key in table:
            if key not in _KNOWN[name]:
                raise unknown_key(name, key)

    def rows(self, table: dict, section: str, key: str, refused: str | None = None):
        """The rows of the array of tables ``[[section.key]]`` (none where absent), each
        as its name for messages (``"load.bins[2]"``) and its table, whose keys are
        checked as it is reached. ``refused``: what to say where the value is not an
        array of tables (default: that it must be one)."""
        name = f"{section}.{key}"
        rows = table.get(key, [])
        if not isinstance(rows, list) or not all(isinstance(row, dict) for row in rows):
            raise InputError(name, refused or f"must be an array of tables: [[{name}]] blocks.")
        for i, row in enumerate(rows, start=1):
            self.unknown(row, name)
            yield f"{name}[{i}]", row

    def vote(self, text) -> None:
        if q.is_us(text):
            self.us_votes += 1
        else:
            self.si_votes += 1

    def quantity(self, table: dict, section: str, key: str, parse):
        """A quantity the file must give, read by ``parse`` (plain keys, with their
        defaults, are read by :meth:`measured`)."""
        full = f"{section}.{key}"
        if key not in table:
            raise InputError(full, "is required; see the README for its units.")
        self.vote(table[key])
        return parse(full, table[key])

    def optional(self, table: dict, section: str, key: str, parse):
        """A quantity the file may leave out: None when absent."""
        if key not in table:
            return None
        self.vote(table[key])
        return parse(f"{section}.{key}", table[key])

    def choice(self, table: dict, section: str, key: str, choices, default=None):
        full = f"{section}.{key}"
        if key not in table:
            if default is None:
                raise InputError(full, f"is required; one of: {', '.join(choices)}.")
            self.defaults.append(f"{full} = \"{default}\" (not given)")
            return default
        value = table[key]
        if value not in choices:
            near = difflib.get_close_matches(str(value), choices, n=1)
            hint = f" Did you mean '{near[0]}'?" if near else ""
            raise InputError(full, f"'{value}' is not one of: {', '.join(choices)}.{hint}")
        return value

    def number(self, table: dict, section: str, key: str, row=None):
        """A plain number, held to its row's range in the key table (a row of an array of
        tables, ``load.bins[2]``, by the table's row ``load.bins.hours``; ``row``, where
        the caller has it); its default where the file leaves it out (required where
        the row has none)."""
        full = f"{section}.{key}"
        if row is None:
            row = keys.BY_NAME[keys.ROW_INDEX.sub("", section) + "." + key]
        if key not in table:
            if row.default is None:
                raise InputError(full, f"is required: a plain number {keys.accepted(row.key)}.")
            self.defaults.append(f"{full} = {row.default:g} (not given)")
            return float(row.default)
        value = table[key]
        if isinstance(value, str):
            raise InputError(full, f"takes a plain number with no unit, got \"{value}\".")
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise InputError(full, f"takes a plain number, got a {_kind(value)}.")
        try:
            return keys.check_number(row.key, float(value))
        except InputError as exc:
            raise InputError(full, exc.message) from None

    def flag(self, table: dict, section: str, key: str):
        if key not in table:
            return None
        value = table[key]
        if not isinstance(value, bool):
            raise InputError(f"{section}.{key}", f"takes true or false, got {value!r}.")
        return value

    def text(self, table: dict, row) -> str:
        """Free words, up to their row's length, the ends' spaces dropped."""
        value = table[row.name]
        if not isinstance(value, str) or len(value) > row.high:
            raise InputError(row.key, f"takes {row.words}.")
        return value.strip()

    def whole(self, table: dict, row) -> int:
        """A whole number, held to its row's range."""
        value = table[row.name]
        if isinstance(value, bool) or not isinstance(value, int) or not row.low <= value <= row.high:
            raise InputError(row.key, f"takes a whole number from {row.low:g} to {row.high:g}, got {value!r}.")
        return value

    def measured(self, table: dict, row):
        """A quantity read by its row's measure (a pressure made absolute) and held to its
        row's range; its row's default where the file leaves it out."""
        if row.name in table:
            text = table[row.name]
            self.vote(text)
        else:
            text = row.default[0]
            self.defaults.append((row.key, row))
        if row.measure == "pressure":
            value = q.pressure(row.key, text).absolute(self.atm)
        else:
            value = _MEASURES[row.measure](row.key, text)
        return keys.check_measured(row.key, value, text)

    def plain(self, table: dict, section: str) -> dict:
        """The plain keys of a section (:func:`stallcheck.files.keys.plain`), each read by
        its row into the record's field of its name: given, defaulted, or left out."""
        out: dict = {}
        for row in keys.plain(section):
            name, kind = row.name, row.kind
            if name not in table and not row.taken:
                continue
            if kind == "number":
                out[name] = self.number(table, section, name, row)
            elif kind == "quantity":
                out[name] = self.measured(table, row)
            elif kind == "words":
                out[name] = (self.choice(table, section, name, row.choices, default=row.default) if row.choices
                             else self.text(table, row))
            else:
                out[name] = self.flag(table, section, name) if kind == "flag" else self.whole(table, row)
        return out


#: How a quantity of each measure is read (a pressure: :meth:`_Reader.measured`).
_MEASURES = {"length": q.length, "diameter": q.length, "temperature": q.temperature,
             "differential": q.differential, "mass_flow": q.mass_flow, "fraction": q.fraction,
             "duration": q.duration, "mass": q.mass}


def _kind(value) -> str:
    return {dict: "table", list: "list", str: "string", bool: "true/false", int: "number",
            float: "number"}.get(type(value), type(value).__name__)


# --- the file ------------------------------------------------------------------------


def _build(data: dict, source: str, folder: str | Path | None = None) -> Unit:
    r = _Reader(data)
    r.unknown(data, "")
    fmt = data.get("format")
    if fmt is None:
        raise InputError("format", "is missing; write format = 1 at the top of the file.")
    if isinstance(fmt, bool) or fmt != 1:
        raise InputError("format", f"{fmt!r} is not a format this version reads; accepted: 1.")

    unit = r.table("unit")
    name = unit.get("name")
    if not isinstance(name, str) or not name.strip():
        raise InputError("unit.name", "is required: the unit's name as a string.")
    tag = unit.get("tag", "")
    if not isinstance(tag, str):
        raise InputError("unit.tag", "takes a string, such as \"AHU-2 PHC\".")

    site = _site(r, folder)
    atm = r.atm = site.atmospheric_pressure
    design = _design(r, atm)
    steam = r.table("steam")
    supply = r.quantity(steam, "steam", "supply_pressure", q.pressure).absolute(atm)
    keys.check_measured("steam.supply_pressure", supply, steam["supply_pressure"])   # as new holds it
    if supply <= design.steam_pressure:
        raise InputError("steam.supply_pressure",
                         f"\"{steam['supply_pressure']}\" is not above the design coil pressure "
                         f"design.steam_pressure; the valve needs a pressure drop to pass steam. "
                         f"Raise the supply or lower the design steam pressure.")
    valve = _valve(r)
    load = _load(r, design, site.weather is not None)
    drain = drainkeys.read(r, atm)
    geometry = _geometry(r)
    system = "us" if r.us_votes > r.si_votes else "si"
    # a quantity's default stated as the file's own system writes it
    r.defaults = [text if isinstance(text, str) else f"{text[0]} = \"{text[1].default[system == 'si']}\" (not given)"
                  for text in r.defaults]
    if site.steam_price is not None and site.steam_price_per is None:
        per = "1000 lb" if system == "us" else "1 t"
        site = replace(site, steam_price_per=q.mass("site.steam_price_per", per))
        r.defaults.append(f"site.steam_price_per = \"{per}\" (not given)")
    return Unit(name=name.strip(), tag=tag.strip(), site=site, design=design, supply_pressure=supply,
                load=load, drain=drain, valve=valve, geometry=geometry, source=source,
                system=system, defaults=tuple(r.defaults), warnings=tuple(r.warnings))


def _site(r: _Reader, folder: str | Path | None) -> Site:
    site = r.table("site", required=False)
    where = _where(r, site)
    return Site(where.atmospheric_pressure, **_costs(r, site or {}), elevation=where.elevation,
                pressure_given=where.pressure_given, weather=_weather(site or {}, folder))


def _weather(site: dict, folder: str | Path | None):
    """The weather year ``site.weather`` names (a path relative to the unit file), or None."""
    if "weather" not in site:
        return None
    text = site["weather"]
    if not isinstance(text, str) or not text.strip():
        raise InputError("site.weather", "takes the path of an EPW or TMY3 CSV weather file, relative to the "
                                         "unit file, such as \"weather/station.epw\".")
    from stallcheck.files import weather

    path = Path(folder or ".") / text
    try:
        return weather.read(path, as_written=text)
    except InputError as exc:
        where = f"\"{text}\"" + (f", line {exc.line}" if exc.line is not None else "")
        raise InputError("site.weather", f"{where}: {exc.message}") from None


def _costs(r: _Reader, site: dict) -> dict:
    """Hours and steam price, for yearly purge figures."""
    out = r.plain(site, "site")
    if "steam_price" in site:
        out["steam_price"] = r.number(site, "site", "steam_price")
        if "steam_price_per" in site:
            per = r.quantity(site, "site", "steam_price_per", q.mass)
            require_positive("site.steam_price_per", per, f", got \"{site['steam_price_per']}\"")
            out["steam_price_per"] = per
    elif "steam_price_per" in site:
        raise InputError("site.steam_price_per", "is given without site.steam_price; give both or neither.")
    return out


def _where(r: _Reader, site: dict | None) -> Site:
    if not site or not ({"elevation", "atmospheric_pressure"} & set(site)):
        r.defaults.append("atmospheric pressure 101.325 kPa (sea level; [site] gives no elevation "
                          "or atmospheric_pressure)")
        return Site(q.STANDARD_ATMOSPHERE)
    if "elevation" in site and "atmospheric_pressure" in site:
        raise InputError("site", "give either elevation or atmospheric_pressure, not both.")
    if "atmospheric_pressure" in site:
        r.vote(site["atmospheric_pressure"])
        p = q.pressure("site.atmospheric_pressure", site["atmospheric_pressure"], absolute_only=True)
        if p.gauge:
            raise InputError("site.atmospheric_pressure", "is an absolute pressure; write it in psia, bara or kPaa.")
        if not 30e3 <= p.pascal <= 110e3:
            raise InputError("site.atmospheric_pressure",
                             f"\"{site['atmospheric_pressure']}\" is out of range; accepted: 30 to 110 kPaa.")
        return Site(p.pascal, pressure_given=True)
    if "elevation" in site:
        r.vote(site["elevation"])
        z = keys.check_quantity("site.elevation", q.length("site.elevation", site["elevation"]), site["elevation"])
        p = pressure_at(z)
        return Site(p, elevation=z)


def _design(r: _Reader, atm: float) -> Design:
    d = r.table("design")
    medium = r.choice(d, "design", "medium", MEDIA)
    concentration = None
    if medium.endswith("glycol"):
        if "concentration" not in d:
            raise InputError("design.concentration", f"is required for {medium}: the mass fraction, such as \"30 %\".")
        concentration = keys.check_measured("design.concentration",
                                            q.fraction("design.concentration", d["concentration"]), d["concentration"])
    elif "concentration" in d:
        r.warnings.append(f"design.concentration ignored: {medium} is not a glycol")
    flow = r.quantity(d, "design", "flow", q.flow)
    keys.check_measured("design.flow", flow.value, d["flow"])
    t_in = r.quantity(d, "design", "inlet_temperature", q.temperature)
    t_out = r.quantity(d, "design", "outlet_temperature", q.temperature)
    for key, t in (("design.inlet_temperature", t_in), ("design.outlet_temperature", t_out)):
        if t <= 0:
            raise InputError(key, f"\"{d[key.split('.')[1]]}\" is below absolute zero.")
    if t_out <= t_in:
        raise InputError("design.outlet_temperature",
                         f"\"{d['outlet_temperature']}\" is not above the inlet temperature "
                         f"\"{d['inlet_temperature']}\"; a steam coil heats, so the set point must be higher.")
    check_entering("design.inlet_temperature", t_in, d["inlet_temperature"], medium)
    p = r.quantity(d, "design", "steam_pressure", q.pressure).absolute(atm)
    keys.check_measured("design.steam_pressure", p, d["steam_pressure"])
    return Design(medium, concentration, flow.value, flow.is_mass, t_in, t_out, p, **r.plain(d, "design"))


def _valve(r: _Reader) -> Valve | None:
    v = r.table("valve", required=False)
    if v is None:
        return None
    if ("cv" in v) == ("kv" in v):
        raise InputError("valve.cv", "give exactly one of cv or kv (a plain number).")
    if "cv" in v:
        cv = r.number(v, "valve", "cv")
    else:
        cv = CV_PER_KV * r.number(v, "valve", "kv")
    return Valve(cv=cv, given_as="cv" if "cv" in v else "kv", **r.plain(v, "valve"))


def _load(r: _Reader, design: Design, weather: bool) -> Load:
    table = r.table("load", required=False) or {}
    default_varies = "inlet-temperature" if design.medium == "air" else "flow"
    if "varies" not in table:
        r.defaults.append(f"load.varies = \"{default_varies}\" (not given; usual for {design.medium})")
        varies = default_varies
    else:
        varies = r.choice(table, "load", "varies", VARIES)
    plain = r.plain(table, "load")
    bins = []
    for section, b in r.rows(table, "load", "bins"):
        hours = r.number(b, section, "hours")
        if varies == "inlet-temperature":
            if "inlet_temperature" not in b:
                raise InputError(f"{section}.inlet_temperature",
                                 "is required: bins are by entering temperature where load.varies = \"inlet-temperature\".")
            t = r.quantity(b, section, "inlet_temperature", q.temperature)
            check_entering(f"{section}.inlet_temperature", t, b["inlet_temperature"], "air")
            bins.append(LoadBin(hours=hours, inlet_temperature=t))
        else:
            if "load" not in b:
                raise InputError(f"{section}.load", "is required: bins are by load fraction where load.varies = \"flow\".")
            bins.append(LoadBin(hours=hours, load=r.number(b, section, "load")))
    total = sum(b.hours for b in bins)
    if total > HOURS_A_YEAR:
        raise InputError("load.bins", f"hold {total:,.0f} h in all, more than a year has; accepted: at most "
                                      f"8,784 h (a leap year) across the bins.")
    year = _year_keys(r, table, design, varies, weather)
    return Load(varies, bins=tuple(bins), **plain, **year)


#: Keys of [load] that shape the weather year: they take effect only with site.weather.
_WEATHER_KEYS = ("outdoor_air_minimum", "return_air_temperature", "mixed_air_temperature", "season", "daily_hours")
#: The months, as a season names them (or by their first three letters).
MONTHS = ("january", "february", "march", "april", "may", "june", "july", "august", "september", "october",
           "november", "december")
_HOUR = re.compile(r"^\s*(\d{1,2}):00\s*-\s*(\d{1,2}):00\s*$")


def _year_keys(r: _Reader, table: dict, design: Design, varies: str, weather: bool) -> dict:
    """Outdoor-air share, mixing and schedule, for the hours of a weather year."""
    given = [key for key in _WEATHER_KEYS if key in table]
    if not weather:
        if given:
            raise InputError(f"load.{given[0]}", "takes effect only with a weather file (site.weather); load "
                                                 "bins give the coil's entering temperature itself.")
        return {}
    if design.medium != "air" or varies != "inlet-temperature":
        raise InputError("site.weather", "gives the outdoor air entering an air coil whose load varies with its "
                                         "entering temperature (medium = \"air\", load.varies = "
                                         "\"inlet-temperature\"); this unit's load does not.")
    out: dict = {}
    share = r.number(table, "load", "outdoor_air_minimum")
    out["outdoor_air_minimum"] = share
    if share < 1.0:
        if "return_air_temperature" not in table:
            raise InputError("load.return_air_temperature", "is required where load.outdoor_air_minimum is below "
                                                            "1: the temperature of the air mixed with the outdoor air.")
        t_return = r.quantity(table, "load", "return_air_temperature", q.temperature)
        low, high = RETURN_AIR_RANGE
        if not low <= t_return <= high:
            raise InputError("load.return_air_temperature",
                             f"\"{table['return_air_temperature']}\" is out of range; accepted: 5 °C to 40 °C "
                             f"(41 °F to 104 °F), air returned from a heated space.")
        out["return_air_temperature"] = t_return
        if "mixed_air_temperature" in table:
            t_mixed = r.quantity(table, "load", "mixed_air_temperature", q.temperature)
            if not COLDEST_AIR <= t_mixed < t_return:
                raise InputError("load.mixed_air_temperature",
                                 f"\"{table['mixed_air_temperature']}\" is not below the return air "
                                 f"(load.return_air_temperature); an economiser mixes outdoor air into it to "
                                 f"reach a colder set point.")
            out["mixed_air_temperature"] = t_mixed
    else:
        for key in ("return_air_temperature", "mixed_air_temperature"):
            if key in table:
                raise InputError(f"load.{key}", "takes effect only where load.outdoor_air_minimum is below 1 "
                                                "(the coil takes all outdoor air without it).")
    if "season" in table:
        out["season"] = _season(table["season"])
    if "daily_hours" in table:
        out["daily_hours"] = _daily_hours(table["daily_hours"])
    return out


def _season(text) -> tuple[int, ...]:
    """``"Oct-Apr"`` or ``"Nov-Mar, Jun"`` → the months, 1 to 12 (a range may wrap the new year)."""
    accepted = ("accepted: months by their first three letters, a range or a list, such as \"Oct-Apr\" or "
                "\"Nov-Mar, Jun\".")
    if not isinstance(text, str) or not text.strip():
        raise InputError("load.season", f"takes the months the unit runs as text; {accepted}")
    months: list[int] = []
    for part in text.split(","):
        ends = [_month(end) for end in part.split("-")]
        if len(ends) not in (1, 2) or None in ends:
            raise InputError("load.season", f"\"{text}\" is not a season; {accepted}")
        first, last = ends[0], ends[-1]
        span = (last - first) % 12
        months += [(first + k) % 12 + 1 for k in range(span + 1)]
    return tuple(sorted(set(months)))


def _month(word: str) -> int | None:
    """A month's index, 0 to 11, from its name or its first three letters or more."""
    word = word.strip().lower()
    found = [i for i, name in enumerate(MONTHS) if len(word) >= 3 and name.startswith(word)]
    return found[0] if len(found) == 1 else None


def _daily_hours(text) -> tuple[int, int]:
    """``"06:00-18:00"`` → (6, 18): the hours of the day the unit runs (whole hours)."""
    match = _HOUR.match(text) if isinstance(text, str) else None
    start, stop = (int(match.group(1)), int(match.group(2))) if match else (0, 0)
    # the same hour at both ends (compared as hours: "06:00-6:00", "24:00-00:00") is no
    # span; the whole day is written "00:00-24:00"
    if not match or start > 24 or stop > 24 or (start % 24 == stop % 24 and (start, stop) != (0, 24)):
        raise InputError("load.daily_hours", f"{text!r} is not a span of hours; accepted: whole hours, start "
                                             f"and stop, such as \"06:00-18:00\" or \"22:00-06:00\" (past "
                                             f"midnight); local standard time, as in the weather file.")
    return start % 24, stop % 24 or 24


def _geometry(r: _Reader) -> Geometry | None:
    g = r.table("geometry", required=False)
    return None if g is None else Geometry(**r.plain(g, "geometry"))
