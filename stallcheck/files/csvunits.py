"""CSV tables of units, one unit per row, for surveys.

The header names the unit file's keys in dotted form (``design.flow``, ``drain.lift``).
A column's unit may sit in its header, ``drain.lift [ft]``, and its cells are then bare
numbers; otherwise each cell carries its own, as in a unit file (``"8 ft"``). The unit
of a header is checked once per column. Each row becomes the same nested tables as a
unit file and is validated by :func:`stallcheck.files.unitfile.from_data`, so a CSV row is
accepted or refused exactly as the same unit written in TOML. Load bins and capacity
tables (arrays of tables) need a TOML unit file.
"""

from __future__ import annotations

import csv
import re
from pathlib import Path
from typing import Iterator

from stallcheck.errors import InputError
from stallcheck.files import keys
from stallcheck.files import quantities as q
from stallcheck.files.unitfile import MAX_FILE_BYTES, known_key, read_text, unknown_key

#: Largest CSV read [bytes]: a table of many thousands of units.
MAX_CSV_BYTES = 100 * MAX_FILE_BYTES

#: Keys whose values are plain numbers, whole numbers, true/false, or words (the key
#: table's kinds); every other column is a quantity.
NUMBERS = keys.of_kind("number")
WHOLE = keys.of_kind("whole")
FLAGS = keys.of_kind("flag")
WORDS = keys.of_kind("words")
_TRUE = {"true", "yes", "1"}
_FALSE = {"false", "no", "0"}

_HEADER = re.compile(r"^\s*([A-Za-z_]+(?:\.[A-Za-z_]+)?)\s*(?:\[\s*(.+?)\s*\])?\s*$")


class _Column:
    """One column: its key, the unit its header gives, and how to read its cells."""

    __slots__ = ("section", "name", "key", "unit", "kind", "as_written")

    def __init__(self, key: str, unit: str | None):
        self.key = key
        self.section, _, self.name = key.rpartition(".")
        self.unit = unit
        self.kind = ("number" if key in NUMBERS else "whole" if key in WHOLE else "flag" if key in FLAGS
                     else "words" if key in WORDS else "quantity")
        #: A cell of this column is the value as written (words, or a quantity with its unit).
        self.as_written = self.kind == "words" or (self.kind == "quantity" and unit is None)

    def value(self, cell: str, source: str, line: int):
        if self.kind == "words":
            return cell
        if self.kind == "flag":
            low = cell.lower()
            return True if low in _TRUE else False if low in _FALSE else cell
        if self.kind in ("number", "whole"):
            try:
                number = float(cell)
            except ValueError:
                return cell  # the unit-file check names the key and what it takes
            return int(number) if self.kind == "whole" and number.is_integer() else number
        if self.unit is None:
            return cell
        try:
            float(cell)
        except ValueError:
            raise InputError(self.key, f"the header gives the unit [{self.unit}], so the cells are bare "
                                       f"numbers; got \"{cell}\".", file=source, line=line) from None
        return f"{cell} {self.unit}"


def _columns(header: list[str], source: str) -> list[_Column]:
    columns = []
    seen = set()
    for text in header:
        match = _HEADER.match(text)
        if not match:
            raise InputError(text.strip(), "is not a column name; write the unit file's dotted key, such as "
                                           "\"drain.lift\" or \"drain.lift [ft]\".", file=source, line=1)
        key, unit = match.group(1), match.group(2)
        if not known_key(key):
            section, _, name = key.rpartition(".")
            error = unknown_key(section, name).in_file(source)
            error.line = 1
            raise error
        if key in seen:
            raise InputError(key, "appears in two columns.", file=source, line=1)
        seen.add(key)
        column = _Column(key, unit)
        if unit is not None:
            if column.kind != "quantity":
                raise InputError(key, f"takes no unit, but the header gives [{unit}].", file=source, line=1)
            if not q.unit_known(unit):
                raise InputError(key, f"unknown unit [{unit}] in the header.", file=source, line=1)
        columns.append(column)
    if "unit.name" not in seen:
        raise InputError("unit.name", "is missing: a CSV of units needs a unit.name column.", file=source, line=1)
    return columns


def rows(path: str | Path) -> Iterator[tuple[int, dict | InputError]]:
    """The units of a CSV file as unit-file tables, with the line each starts on; a row
    that cannot be read comes as the InputError naming its line and key.

    Raises
    ------
    InputError
        For a file that cannot be read or a header that cannot be used (the whole file
        is refused). Most bad cells are left for :func:`stallcheck.files.unitfile.from_data`,
        which names their key.
    """
    source = str(path)
    for line, columns, cells in records(path):
        yield line, cells if isinstance(cells, InputError) else tables(columns, cells, source, line)


def records(path: str | Path) -> Iterator[tuple[int, list, list[str] | InputError]]:
    """The rows of a CSV file as their cells, not yet read: the line each starts on,
    the columns (from the header) and the cells, or the InputError of a row whose cells
    cannot be told apart. :func:`tables` reads the cells (see :func:`rows`).

    Raises
    ------
    InputError
        As :func:`rows`.
    """
    source = str(path)
    text = _read(Path(path))
    reader = csv.reader(_lines(text))
    try:
        header = next(reader)
    except StopIteration:
        raise InputError("", "is empty; a CSV of units needs a header row of dotted keys.", file=source) from None
    columns = _columns(header, source)
    units = 0
    end = reader.line_num
    for record in reader:
        line = end + 1  # where the record starts, not where it ends
        end = reader.line_num
        joined = "".join(record)
        if not joined.strip():
            continue
        units += 1
        if end > line or "\n" in joined or "\r" in joined:
            what = ("a quoted cell is not closed: every later line was read into it" if _unclosed(text)
                    else "a cell runs over more than one line")
            yield line, columns, InputError("", f"{what}; close each quoted cell on its own line.", file=source,
                                            line=line)
            continue
        if len(record) != len(columns):
            yield line, columns, InputError(
                "", f"has {len(record)} cells but the header names {len(columns)} columns; a missing cell would "
                    f"silently take its default. Leave a cell empty with an empty field between commas.",
                file=source, line=line)
            continue
        yield line, columns, record
    if units == 0:
        raise InputError("", "has a header but no units; give one unit per row below the header.", file=source)


def tables(columns: list, cells: list[str], source: str, line: int) -> dict | InputError:
    """One row's cells (from :func:`records`) as unit-file tables, or the InputError of
    a cell the header's unit cannot go with."""
    data: dict = {"format": 1}
    try:
        for column, cell in zip(columns, cells):
            cell = cell.strip()
            if not cell:
                continue
            value = cell if column.as_written else column.value(cell, source, line)
            section = column.section
            if section:
                table = data.get(section)
                if table is None:
                    table = data[section] = {}
                table[column.name] = value
            else:
                data[column.name] = value
    except InputError as exc:
        return exc
    return data


def _lines(text: str) -> Iterator[str]:
    """The lines of a text, each with its newline, as ``io.StringIO(text)`` gives them,
    without the copy of the whole text it makes (four bytes a character: 64 MB for a
    table of 100,000 units)."""
    start = 0
    while start < len(text):
        end = text.find("\n", start)
        if end < 0:
            yield text[start:]
            return
        yield text[start:end + 1]
        start = end + 1


def _unclosed(text: str) -> bool:
    """True where the text ends inside a quoted cell (an odd number of quotes)."""
    return text.count('"') % 2 == 1


def count(path: str | Path) -> int:
    """Units in a CSV file (rows after the header), counted without validating them."""
    with open(path, encoding="utf-8", errors="replace", newline="") as handle:
        return max(sum(1 for _ in csv.reader(handle)) - 1, 0)


def _read(path: Path) -> str:
    return read_text(path, MAX_CSV_BYTES, "CSV table of units", ".csv")
