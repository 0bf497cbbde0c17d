"""Hourly weather files → a year of dry-bulb temperatures (:class:`~stallcheck.inputs.WeatherYear`).

Two open formats that building energy models use:

- **EPW** (EnergyPlus weather): eight header lines, the first ``LOCATION,city,state,
  country,source,WMO,latitude,longitude,time zone,elevation``, then one line an hour,
  ``year,month,day,hour,minute,flags,dry bulb [°C],...``, hour 1 to 24 ending the hour;
  a dry bulb of 99.9 is missing. Where the ``DESIGN CONDITIONS`` line carries the
  ASHRAE heating design dry bulbs they are read too.
- **TMY3** (NREL's typical meteorological year, CSV): a first line
  ``USAF,"name",state,time zone,latitude,longitude,elevation``, a header line naming
  the columns, then ``MM/DD/YYYY,HH:MM,...`` an hour, ending 01:00 to 24:00; the dry
  bulb is the column headed ``Dry-bulb (C)`` (other columns may be left out).

A year is 8,760 hours (8,784 in a leap year), in the file's order; hours are local
standard time. Every problem is an :class:`~stallcheck.errors.InputError` naming the
file and the line. A file is read once per process however many units name it.

References
----------
.. [1] EnergyPlus, *Auxiliary Programs*, "EnergyPlus Weather File (EPW) Data
   Dictionary", U.S. Department of Energy.
.. [2] Wilcox, S. and Marion, W., *Users Manual for TMY3 Data Sets*, NREL/TP-581-43156,
   2008.
"""

from __future__ import annotations

import csv
import io
import math
import re
from functools import lru_cache
from pathlib import Path

from stallcheck.errors import InputError
from stallcheck.inputs import WeatherYear

#: Largest weather file read [bytes]: a full TMY3 or EPW year is under 2 MB.
MAX_WEATHER_BYTES = 20_000_000
#: Hours a weather year holds: a common year and a leap year.
YEAR_HOURS = (8760, 8784)
#: Dry bulbs a weather file may hold [°C]: the coldest and hottest air recorded at any
#: station (−89.2 °C at Vostok, 56.7 °C at Death Valley, WMO archive), rounded out.
DRY_BULB_RANGE = (-90.0, 60.0)
#: EPW's mark for a missing dry bulb [°C] (EPW data dictionary [1]).
EPW_MISSING = 99.9

_TMY3_ROW = re.compile(r"^(\d\d)/(\d\d)/(\d{4}),(\d\d):(\d\d),", re.MULTILINE)
_TMY3_DRY_BULB = "Dry-bulb (C)"


def read(path: str | Path, as_written: str | None = None) -> WeatherYear:
    """Read an EPW or TMY3 weather file (the format is told from its first line).

    Parameters
    ----------
    path : str or Path
        Where the file is.
    as_written : str, optional
        The path as the unit file wrote it (kept for messages and when the unit is
        written out again); default ``path``.

    Returns
    -------
    WeatherYear

    Raises
    ------
    InputError
        For a file that cannot be read, is neither format, or is truncated or damaged.
    """
    path = Path(path)
    resolved = path.resolve()
    try:
        info = resolved.stat()
    except OSError as exc:
        _text(path)   # the reader says what is wrong (no such file, a folder, permission)
        raise InputError("", f"cannot be read ({exc.strerror or exc}).", file=str(path)) from None
    year = _cached(str(resolved), info.st_mtime_ns, info.st_size)
    written = str(path) if as_written is None else as_written
    return year if year.path == written else _renamed(year, written)


def is_weather(path: str | Path) -> bool:
    """True where a file's first lines are those of an EPW or TMY3 weather file (a folder
    of units may hold the weather files they name; a survey passes them by)."""
    try:
        with open(path, "rb") as handle:
            head = handle.read(4096).decode("latin-1")
    except OSError:
        return False
    return _form(head) is not None


def _form(head: str) -> str | None:
    """``"epw"`` or ``"tmy3"`` from a file's first few thousand characters, else None."""
    if head.startswith("LOCATION,"):
        return "epw"
    lines = head.splitlines()
    if len(lines) > 1 and lines[1].startswith("Date (MM/DD/YYYY),Time (HH:MM)"):
        return "tmy3"
    return None


def _renamed(year: WeatherYear, written: str) -> WeatherYear:
    from dataclasses import replace

    return replace(year, path=written)


@lru_cache(maxsize=8)
def _cached(resolved: str, mtime_ns: int, size: int) -> WeatherYear:
    """One reading per file and version (a survey of many units sharing a file reads it once)."""
    text = _text(Path(resolved))
    form = _form(text[:4096])
    if form == "epw":
        return _epw(text, resolved)
    if form == "tmy3":
        return _tmy3(text, resolved)
    raise InputError("", "is not a weather file this program reads: an EnergyPlus EPW file begins "
                         "\"LOCATION,\" and an NREL TMY3 CSV has a \"Date (MM/DD/YYYY)\" header line.",
                     file=resolved, line=1)


def _text(path: Path) -> str:
    """The file's text. Weather files are ASCII but for a station's name, which some
    sources write in Latin-1 (a "São Paulo" EPW): where the file is not UTF-8 it is read
    as Latin-1, in which every byte is a character (the figures are ASCII either way)."""
    from stallcheck.files.unitfile import read_text

    try:
        return read_text(path, max_bytes=MAX_WEATHER_BYTES, kind="weather file (EPW or TMY3 CSV)",
                         suffix=".epw or .csv")
    except InputError as exc:
        if "not UTF-8" not in exc.message:
            raise
    with open(path, "rb") as handle:
        return handle.read(MAX_WEATHER_BYTES + 1).decode("latin-1")


def _number(text: str, file: str, line: int, what: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise InputError("", f"{what} \"{text.strip()}\" is not a number.", file=file, line=line) from None
    if not math.isfinite(value):
        raise InputError("", f"{what} \"{text.strip()}\" is not a number.", file=file, line=line)
    return value


def _epw(text: str, file: str) -> WeatherYear:
    import numpy as np

    lines = text.split("\n", 8)
    if len(lines) < 9:
        raise InputError("", "ends inside the EPW header: an EPW file has eight header lines, then one line "
                             "an hour.", file=file, line=len(lines))
    location = lines[0].rstrip("\r").split(",")
    if len(location) < 10:
        raise InputError("", "has a LOCATION line with fewer than ten fields (city, state, country, source, "
                             "WMO, latitude, longitude, time zone, elevation).", file=file, line=1)
    station = ", ".join(part.strip() for part in location[1:4] if part.strip() and part.strip() != "-")
    elevation = _number(location[9], file, 1, "the LOCATION line's elevation")
    design = _epw_design(lines[1].rstrip("\r"), file)
    body = lines[8]
    table = _columns(body, file, 9, usecols=(1, 3, 6), what="month, hour and dry bulb (fields 2, 4 and 7)")
    month, hour, dry = table[:, 0], table[:, 1], table[:, 2]
    _check_hours(len(dry), file, 9, body)
    bad = np.flatnonzero((month < 1) | (month > 12) | (hour < 1) | (hour > 24) | (month != np.round(month))
                         | (hour != np.round(hour)))
    if bad.size:
        raise InputError("", "has a month outside 1 to 12 or an hour outside 1 to 24.", file=file,
                         line=9 + int(bad[0]))
    missing = np.flatnonzero(dry >= EPW_MISSING - 1e-9)
    if missing.size:
        raise InputError("", f"has {missing.size:,} hours whose dry bulb is missing (99.9); fill the gaps (a "
                             f"typical-year file has none) and try again.", file=file, line=9 + int(missing[0]))
    _check_range(dry, file, 9)
    return WeatherYear(path=file, resolved=file, form="epw", station=station, elevation=elevation,
                       dry_bulb=dry + 273.15, month=month.astype(np.int8), hour=(hour - 1).astype(np.int8),
                       design_996=design[0], design_990=design[1])


def _epw_design(line: str, file: str) -> tuple[float | None, float | None]:
    """The heating 99.6 % and 99 % dry bulbs [K] of an EPW ``DESIGN CONDITIONS`` line
    (``...,Heating,coldest month,DB 99.6 %,DB 99 %,...``), None where it has none."""
    fields = [part.strip() for part in line.split(",")]
    if not fields or fields[0] != "DESIGN CONDITIONS" or "Heating" not in fields:
        return None, None
    at = fields.index("Heating")
    try:
        return float(fields[at + 2]) + 273.15, float(fields[at + 3]) + 273.15
    except (IndexError, ValueError):
        return None, None


def _tmy3(text: str, file: str) -> WeatherYear:
    import numpy as np

    lines = text.split("\n", 2)
    if len(lines) < 3:
        raise InputError("", "ends inside the TMY3 header: a TMY3 file has a station line and a column "
                             "header line, then one line an hour.", file=file, line=len(lines))
    head = next(csv.reader([lines[0]]), [])
    if len(head) < 7:
        raise InputError("", "has a first line with fewer than seven fields (USAF number, name, state, time "
                             "zone, latitude, longitude, elevation).", file=file, line=1)
    station = ", ".join(part.strip() for part in head[1:3] if part.strip())
    elevation = _number(head[6], file, 1, "the station line's elevation")
    columns = [part.strip() for part in lines[1].rstrip("\r").split(",")]
    if _TMY3_DRY_BULB not in columns or columns[:2] != ["Date (MM/DD/YYYY)", "Time (HH:MM)"]:
        raise InputError("", f"has no \"{_TMY3_DRY_BULB}\" column after \"Date (MM/DD/YYYY)\" and "
                             f"\"Time (HH:MM)\" in its header line.", file=file, line=2)
    body = lines[2]
    dry = _columns(body, file, 3, usecols=(columns.index(_TMY3_DRY_BULB),), what="dry bulb")[:, 0]
    _check_hours(len(dry), file, 3, body)
    stamps = np.array(_TMY3_ROW.findall(body), dtype=np.int16).reshape(-1, 5)
    if len(stamps) != len(dry):
        row = _first_unmatched(body)
        raise InputError("", "has a line whose date and time are not written MM/DD/YYYY,HH:MM.", file=file,
                         line=3 + row)
    month, hour = stamps[:, 0], stamps[:, 3]
    bad = np.flatnonzero((month < 1) | (month > 12) | (hour < 1) | (hour > 24))
    if bad.size:
        raise InputError("", "has a month outside 1 to 12 or an hour outside 01:00 to 24:00.", file=file,
                         line=3 + int(bad[0]))
    _check_range(dry, file, 3)
    return WeatherYear(path=file, resolved=file, form="tmy3", station=station, elevation=elevation,
                       dry_bulb=dry + 273.15, month=month.astype(np.int8), hour=(hour - 1).astype(np.int8))


def _columns(body: str, file: str, first_line: int, usecols: tuple[int, ...], what: str):
    """The numeric columns ``usecols`` of every data line (one C-level parse)."""
    import numpy as np

    try:
        table = np.loadtxt(io.StringIO(body), delimiter=",", usecols=usecols, ndmin=2, dtype=float,
                           comments=None, quotechar='"')
    except ValueError as exc:
        found = re.search(r"(?:at row|line) (\d+)", str(exc))
        line = first_line + int(found.group(1)) - 1 if found else None   # numpy counts rows from 1
        raise InputError("", f"has a line whose {what} cannot be read as numbers (a truncated or damaged "
                             f"line, or too few fields).", file=file, line=line) from None
    if not np.isfinite(table).all():
        row = int(np.flatnonzero(~np.isfinite(table).all(axis=1))[0])
        raise InputError("", f"has a {what} that is not a finite number.", file=file, line=first_line + row)
    return table


def _check_hours(count: int, file: str, first_line: int, body: str) -> None:
    if count not in YEAR_HOURS:
        lines = body.rstrip("\r\n").count("\n") + 1
        raise InputError("", f"holds {count:,} hours; a weather year holds 8,760 (8,784 in a leap year). A "
                             f"truncated or partial file cannot give hours a year.", file=file,
                         line=first_line + lines - 1)


def _check_range(dry, file: str, first_line: int) -> None:
    import numpy as np

    low, high = DRY_BULB_RANGE
    bad = np.flatnonzero((dry < low) | (dry > high))
    if bad.size:
        raise InputError("", f"has a dry bulb of {dry[bad[0]]:g} °C, outside any air on record ({low:g} to "
                             f"{high:g} °C).", file=file, line=first_line + int(bad[0]))


def _first_unmatched(body: str) -> int:
    """Index of the first data line whose date and time are malformed (the error path only)."""
    for i, line in enumerate(body.splitlines()):
        if line.strip() and not _TMY3_ROW.match(line + "\n"):
            return i
    return 0
