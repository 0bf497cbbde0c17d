"""A page of styled text, wrapped once and printed plain or in colour.

The reports for people (``check``, ``diagnose``) are built as a list of blocks: headings,
paragraphs with an indent (and a first-line prefix such as a bullet), preformatted lines
(the chart) and blank lines, each a sequence of runs of text with a style name. This
module wraps them to the width asked for, and prints them:

* to a pipe or a file, as plain text, without importing rich (a check then starts
  faster, and its output is the same on every machine);
* to a terminal, through rich, which only colours the lines already wrapped here (and
  honours ``NO_COLOR``).

Wrapping follows rich's own rule (``rich._wrap.divide_line``: a word with its trailing
spaces moves to the next line when it does not fit; a word longer than a line is cut),
so a page reads the same both ways.
"""

from __future__ import annotations

import os
import re
import shutil
import sys
from dataclasses import dataclass
from typing import Iterable, TextIO

#: A run of text and its style (a rich style string, or None for none).
Run = tuple[str, "str | None"]

#: Widest page printed unless a width is asked for [columns].
MAX_WIDTH = 100
#: Narrowest page printed: what a chart and the survey's table need [columns].
MIN_WIDTH = 50

_WORD = re.compile(r"\s*\S+\s*")

from stallcheck.errors import printable


@dataclass(frozen=True)
class Para:
    """Text wrapped with every line indented ``indent`` columns; the first line starts
    with ``prefix`` instead of the indent where one is given (a bullet, a number, a
    label; it should be ``indent`` columns wide)."""

    runs: tuple[Run, ...]
    indent: int = 2
    prefix: tuple[Run, ...] = ()


@dataclass(frozen=True)
class Pre:
    """Lines printed as they are (each a sequence of runs), never wrapped."""

    lines: tuple[tuple[Run, ...], ...]


BLANK = Para((), 0)


def runs(*parts) -> tuple[Run, ...]:
    """Runs from plain strings and ``(text, style)`` pairs."""
    return tuple((p, None) if isinstance(p, str) else p for p in parts)


def heading(text: str) -> Para:
    """A section heading, in capitals."""
    return Para(((text.upper(), "bold"),), 0)


def para(text: str | tuple, indent: int = 2, style: str | None = None) -> Para:
    """A paragraph indented ``indent`` columns (text, or runs)."""
    return Para(((text, style),) if isinstance(text, str) else tuple(text), indent)


def bullets(items: Iterable[str], style: str | None = None) -> list[Para]:
    """Items after a dash, wrapped lines kept under their text."""
    return [Para(((item, style),), 4, (("  - ", None),)) for item in items]


def _breaks(text: str, width: int) -> list[int]:
    """Offsets at which to break ``text`` to fit ``width`` columns (rich's rule)."""
    out: list[int] = []
    offset = 0
    for match in _WORD.finditer(text):
        start, word = match.start(), match.group(0)
        length = len(word.rstrip())
        if width - offset >= length:
            offset += len(word)
        elif length > width:
            # a word longer than a line: cut it into pieces of the width
            pieces = [word[i:i + width] for i in range(0, len(word), width)]
            for k, piece in enumerate(pieces):
                if start:
                    out.append(start)
                if k == len(pieces) - 1:
                    offset = len(piece)
                else:
                    start += len(piece)
        elif offset and start:
            out.append(start)
            offset = len(word)
    return out


def _spans(runs_: tuple[Run, ...], start: int, end: int) -> list[Run]:
    """The runs covering ``text[start:end]`` of the runs' joined text."""
    out, at = [], 0
    for text, style in runs_:
        lo, hi = max(start, at), min(end, at + len(text))
        if lo < hi:
            out.append((text[lo - at:hi - at], style))
        at += len(text)
    return out


def lines(blocks: Iterable, width: int) -> list[list[Run]]:
    """Every block wrapped to ``width`` columns: a list of lines, each a list of runs."""
    out: list[list[Run]] = []
    for block in blocks:
        if isinstance(block, Pre):
            out.extend(list(line) for line in block.lines)
            continue
        text = "".join(t for t, _ in block.runs)
        if not text:
            out.append(list(block.prefix))
            continue
        for paragraph_start, paragraph in _paragraphs(text):
            cuts = [0, *_breaks(paragraph, max(width - block.indent, 1)), len(paragraph)]
            for k in range(len(cuts) - 1):
                lo, hi = cuts[k], cuts[k + 1]
                hi = lo + len(paragraph[lo:hi].rstrip())
                lead = list(block.prefix) if (k == 0 and paragraph_start == 0 and block.prefix) else \
                    [(" " * block.indent, None)] if block.indent else []
                out.append(lead + _spans(block.runs, paragraph_start + lo, paragraph_start + hi))
    return out


def _paragraphs(text: str):
    """(offset, text) of each line of a text with newlines in it."""
    at = 0
    for piece in text.split("\n"):
        yield at, piece
        at += len(piece) + 1


def plain(blocks: Iterable, width: int) -> str:
    """The page as plain text, each line without trailing spaces."""
    return "".join("".join(t for t, _ in line).rstrip() + "\n" for line in lines(blocks, width))


def width_for(stream: TextIO, width: int | None = None) -> int:
    """The width to print in: as asked, else the terminal's (or ``COLUMNS``, else 80)
    at most :data:`MAX_WIDTH`."""
    if width is not None:
        return width
    if _is_terminal(stream):
        columns = shutil.get_terminal_size((80, 24)).columns
    else:
        given = os.environ.get("COLUMNS", "")
        columns = int(given) if given.isdigit() else 80
    # a width of nothing (COLUMNS=0, a terminal that reports none) is not known: 80;
    # a page narrower than MIN_WIDTH cannot hold a chart or a table, so it gets that
    return 80 if columns <= 0 else max(MIN_WIDTH, min(columns, MAX_WIDTH))


def _is_terminal(stream: TextIO) -> bool:
    try:
        return stream.isatty()
    except (AttributeError, ValueError):
        return False


def emit(blocks: Iterable, width: int | None = None, stream: TextIO | None = None) -> None:
    """Print a page: plain to a pipe or file, coloured by rich on a terminal."""
    stream = stream or sys.stdout
    columns = width_for(stream, width)
    if not _is_terminal(stream):
        stream.write(printable(plain(blocks, columns)))
        return
    from rich.console import Console
    from rich.text import Text

    console = Console(file=stream, highlight=False, width=columns, soft_wrap=True)
    for line in lines(blocks, columns):
        console.print(Text.assemble(*((printable(text), style) for text, style in line)) if line else Text(""))
