"""The survey table for people, its CSV, and its JSON (streamed a result at a time)."""

from __future__ import annotations

import csv
import io
import textwrap

from stallcheck.analysis.survey import Failure, Summary
from stallcheck.errors import printable
from stallcheck.files import display
from stallcheck.render import json as json_out
from stallcheck.render import words
from stallcheck.result import CAUTIONS, caution_codes

SEVERITY_STYLE = {"danger": "bold red", "warning": "yellow", "info": "cyan"}


#: Columns of the first line of each unit: (heading, width, right-aligned).
COLUMNS = (("unit", 18, False), ("stalls", 9, True), ("entering", 9, True), ("needs", 19, False),
           ("ok", 3, False), ("stalled", 10, True))
#: How the columns give way, in turn, where the width asked for is less than they take
#: (a year has at most 8,760 h, seven characters):
#: (heading, narrowest width).
GIVE_WAY = (("unit", 8), ("stalled", 7), ("entering", 8), ("unit", 6))


def _columns(width: int) -> tuple:
    """:data:`COLUMNS` fitted to ``width`` columns where they can be."""
    widths = {h: w for h, w, _ in COLUMNS}
    for heading, narrowest in GIVE_WAY:
        over = sum(widths.values()) + len(widths) - 1 - width
        if over <= 0:
            break
        widths[heading] = max(narrowest, widths[heading] - over)
    return tuple((h, widths[h], right) for h, _, right in COLUMNS)


def _cell(text: str, width: int, right: bool) -> str:
    if len(text) > width:
        text = text[: width - 1] + "…"
    return text.rjust(width) if right else text.ljust(width)


def _rows(summaries: list[Summary], system: str | None, width: int = 80):
    """Each unit's two lines, as runs of (text, style): the figures, then the details
    (name, what is installed where it differs, the worst finding)."""
    columns = _columns(width)
    yield [(" ".join(_cell(h, w, r) for h, w, r in columns), "bold")], None
    # one column, one unit: the units most of the files are written in, unless --units
    sys_ = display_system(summaries, system)
    (_, unit_w, unit_r), (_, stall_w, stall_r), (_, inlet_w, inlet_r), (_, needs_w, needs_r), \
        (_, ok_w, ok_r), (_, hours_w, hours_r) = columns
    for s in summaries:
        stall = "never" if s.stall_fraction is None else (
            "all loads" if s.stall_fraction >= 1.0 else f"<{words.percent(s.stall_fraction)}")
        inlet = "" if s.stall_inlet_temperature is None else display.show(s.stall_inlet_temperature, "temperature", sys_)
        hours = "" if s.stalled_hours is None else f"{s.stalled_hours:,.0f} h"
        line = [(" ".join((_cell(printable(s.tag or s.name), unit_w, unit_r), _cell(stall, stall_w, stall_r),
                           _cell(inlet, inlet_w, inlet_r), _cell(s.required, needs_w, needs_r))) + " ", None),
                (_cell("yes" if s.adequate else "NO", ok_w, ok_r) + " ", "green" if s.adequate else "bold red"),
                (_cell(hours, hours_w, hours_r) + " ", None)]
        detail = [(printable(s.name if s.tag else s.source), "dim")]
        if s.required != s.installed:
            detail.append((f"; has {s.installed}", "dim"))
        if s.freezing_hours:
            detail.append((f"; {s.freezing_hours:,} h stalled below freezing", "red"))
        if s.return_pattern:
            detail.append((f"; return line {s.return_pattern}",
                           "yellow" if s.return_pattern == "intermittent" else "dim"))
        if s.top_code:
            detail += [("; ", None), (s.top_code, SEVERITY_STYLE.get(s.top_severity)),
                       (f" ({s.top_severity})", "dim")]
        yield line, detail


def display_system(summaries: list[Summary], system: str | None) -> str:
    """One column, one unit: ``system`` where given, else the units most files use."""
    systems = [s.system for s in summaries]
    return system or max(("us", "si"), key=systems.count)


def _count(summaries: list[Summary], failures: list[Failure], system: str | None = None) -> list[tuple[str, str]]:
    inadequate = sum(1 for s in summaries if not s.adequate)
    flagged = sum(1 for s in summaries if s.exit_status)
    out = [(f"{len(summaries) + len(failures):,} units: {len(summaries) - flagged:,} fine, "
            f"{flagged:,} to look at ({inadequate:,} with drainage not adequate)", "bold")]
    shown = display_system(summaries, system)
    if system is None and len({s.system for s in summaries}) > 1:
        other = "si" if shown == "us" else "us"
        out.append((f"Temperatures in {display.label('temperature', shown)}, as most of the files are written "
                    f"(--units {other} for {display.label('temperature', other)}).", "dim"))
    if failures:
        out.append((f"{len(failures):,} could not be read: see the messages on stderr", "bold red"))
    # the cautions every page carries, and a typical year's where any unit's hours come from one
    codes = caution_codes(any(s.hours_from == "weather" for s in summaries))
    out.extend((f"Caution: {text}", "dim") for text in words.cautions(codes))
    return out


def table(summaries: list[Summary], failures: list[Failure], system: str | None, width: int = 80):
    """The survey, worst first, two lines a unit, and a count (for a terminal: rich)."""
    from rich.console import Group
    from rich.padding import Padding
    from rich.text import Text

    parts: list = []
    for line, detail in _rows(summaries, system, width):
        parts.append(Text.assemble(*line))
        if detail is not None:
            parts.append(Padding(Text.assemble(*detail), (0, 0, 0, 4)))
    return Group(*parts, Text(""), *(Text(text, style=style) for text, style in _count(summaries, failures, system)))


#: Whitespace that :func:`textwrap.fill` would change.
_ODD_SPACE = frozenset("\t\n\x0b\x0c\r")


def _indented(text: str, width: int) -> str:
    """``textwrap.fill(text, width, initial_indent="    ", subsequent_indent="    ")``,
    without textwrap where the text fits on one line as it is."""
    if len(text) + 4 <= width and text.strip() == text and _ODD_SPACE.isdisjoint(text):
        return "    " + text
    return textwrap.fill(text, width, initial_indent="    ", subsequent_indent="    ")


def plain(summaries: list[Summary], failures: list[Failure], system: str | None, width: int = 80) -> str:
    """:func:`table` as plain text, for pipes and files: the same lines, written
    directly (a survey of thousands prints far faster this way), without rich."""
    out = []
    for line, detail in _rows(summaries, system, width):
        out.append("".join(text for text, _ in line).rstrip())
        if detail is not None:
            out.append(_indented("".join(text for text, _ in detail), width))
    out.append("")
    out.extend(textwrap.fill(text, width) for text, _ in _count(summaries, failures, system))
    return "\n".join(out) + "\n"


CSV_COLUMNS = ("source", "name", "tag", "stall_load_fraction", "stall_inlet_temperature_c", "required",
               "installed", "adequate", "stalled_hours", "top_finding", "top_severity", "exit_status", "error",
               "return_line_pattern", "hours_from", "stalled_freezing_hours", "heating_dry_bulb_996_c")


def records(summaries: list[Summary], failures: list[Failure]) -> list[dict]:
    """One record per unit with the :data:`CSV_COLUMNS` as keys (SI: °C; None where not
    known), the failures last with their messages under ``error``."""
    out = [dict(zip(CSV_COLUMNS, (s.source, s.name, s.tag, s.stall_fraction, display.celsius(s.stall_inlet_temperature),
                                  s.required, s.installed, s.adequate, s.stalled_hours, s.top_code,
                                  s.top_severity, s.exit_status, None, s.return_pattern, s.hours_from,
                                  s.freezing_hours, display.celsius(s.dry_bulb_996))))
           for s in summaries]
    out += [dict.fromkeys(CSV_COLUMNS) | {"source": f.source, "exit_status": 2, "error": f.message} for f in failures]
    return out


def csv_text(summaries: list[Summary], failures: list[Failure]) -> str:
    """:func:`records` as CSV: numbers to six figures, yes/no, blanks for unknowns."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(CSV_COLUMNS)
    for row in records(summaries, failures):
        writer.writerow(["yes" if v is True else "no" if v is False else _num(v) if isinstance(v, float)
                         else "" if v is None else _inert(v) if isinstance(v, str) else v for v in row.values()])
    return buffer.getvalue()


#: First characters that make a spreadsheet read a cell as a formula (OWASP, "CSV
#: Injection"): = + - @, and tab and carriage return.
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def _inert(text: str) -> str:
    """A text cell a spreadsheet will not run: a leading formula character is preceded
    by a single quote, OWASP's neutralising prefix (numbers are written as numbers)."""
    return "'" + text if text.startswith(_FORMULA_START) else text


def _num(value) -> str:
    return "" if value is None else f"{value:.6g}"


#: The format of ``survey --json``: JSON Lines of figures and codes (3; 2 carried every
#: sentence in every line; 1 was one JSON document).
SURVEY_FORMAT = 3


class JsonStream:
    """``survey --json``: JSON Lines, one object a line, each written (and flushed) as
    its unit is done, in order: ``{"record": "result", ...}`` with the fields of
    ``check --json``, figures to eight significant figures and null fields left out,
    without the chart's ``points`` and the sentences (finding messages, reasons, notes,
    advice text, assumptions, cautions) unless asked for; then one
    ``{"record": "error", "source", "message"}`` per unit that could not be read, then
    ``{"record": "end", "units", "errors", "exit_status", "cautions"}``. Every line
    carries ``"format": 3``."""

    def __init__(self, out, points: bool = False, words: bool = False):
        self.out = out
        self.points = points
        self.words = words
        self.count = 0
        #: The cautions of every result streamed (codes): the end line says them once.
        self.cautions: set[str] = set(CAUTIONS)

    def _line(self, record: str, fields: dict) -> None:
        self.out.write(json_out.text({**fields, "format": SURVEY_FORMAT, "record": record}, compact=True) + "\n")
        self.out.flush()

    def __call__(self, result) -> None:
        contract = json_out.to_dict(result, sentences=self.words)
        if not self.points:
            contract.pop("points", None)
        self._line("result", json_out.figures(contract))
        self.count += 1
        self.cautions.update(result.cautions)

    def close(self, failures: list[Failure], status: int) -> None:
        for f in failures:
            self._line("error", {"source": f.source, "message": f.message})
        self._line("end", {"units": self.count + len(failures), "errors": len(failures), "exit_status": status,
                           "cautions": words.cautions(self.cautions)})
