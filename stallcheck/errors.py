"""The one family of errors the core raises for bad input.

The CLI catches :class:`StallcheckError` in one place, prints its message and exits
with status 2. Anything else is a bug and keeps its traceback.
"""

from __future__ import annotations

import re

#: Characters no text from outside may put on a terminal or into a report: C0 controls
#: other than tab and newline (escape, carriage return, bell...), DEL and the C1
#: controls (ECMA-48), which move the cursor, clear the screen or retitle the window.
_CONTROL = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f]")


def printable(text: str) -> str:
    """Untrusted text (a unit's name or tag, a path, a value echoed in a message) made
    safe to print: each control character shown as its escape (``\\x1b``), all else kept."""
    return _CONTROL.sub(lambda m: f"\\x{ord(m.group()):02x}", text)



class StallcheckError(Exception):
    """Base of every error that is the user's input, not a bug."""


class InputError(StallcheckError):
    """A unit file, a key or a command-line value that cannot be accepted.

    Parameters
    ----------
    key : str
        Dotted key in the unit file (``"drain.lift"``), or ``""`` for the file itself.
    message : str
        What is wrong and what is accepted, in plain words.
    file : str, optional
        The file the key came from; the loader fills it in.
    line : int, optional
        Line number, where the TOML parser gives one.
    """

    def __init__(self, key: str, message: str, file: str | None = None, line: int | None = None):
        self.key = key
        self.message = message
        self.file = file
        self.line = line
        super().__init__(str(self))

    def __str__(self) -> str:
        where = self.file or "unit file"
        if self.line is not None:
            where += f", line {self.line}"
        if self.key.startswith("--"):
            where += f", option '{self.key}'"
        elif self.key:
            where += f", key '{self.key}'"
        return printable(f"{where}: {self.message}")

    def in_file(self, file: str) -> "InputError":
        """Return the same error tied to ``file``."""
        return InputError(self.key, self.message, file=file, line=self.line)


class PropertyRangeError(StallcheckError):
    """A state outside the range where the steam formulation is valid."""
