"""Surveys: many units from unit files, folders of them and CSV tables, analysed in
batches, with a one-line summary of each kept for the table.

Nothing here prints. Units are read and analysed a batch at a time, and a caller that
wants every full result (``--json``) takes each batch's results as they come, so the
memory held does not grow with the number of units beyond the summaries.
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import Callable, Iterable, Iterator

from stallcheck import analysis
from stallcheck.errors import InputError, StallcheckError
from stallcheck.files import csvunits, unitfile
from stallcheck.record import record
from stallcheck.result import SEVERITIES, Result

#: Units analysed together: enough to spread the steam-table calls, few enough to keep
#: memory flat and the progress bar moving.
BATCH = 500


@record
class Summary:
    """One unit's line in the survey table (SI units, as in the result).

    Attributes
    ----------
    source, name, tag : str
    system : str
        The units the file is written in.
    atmospheric_pressure : float  [Pa]
    stall_fraction : float or None
        Load below which it stalls [-]; None where it never stalls.
    stall_inlet_temperature : float or None
        Entering temperature at the stall point, where the load follows it. [K]
    required, installed : str
    adequate : bool
    stalled_hours : float or None  [h]
    top_code, top_severity : str or None
        The worst finding.
    exit_status : int
    warnings : tuple of str
        The unit file's input warnings (shown on stderr).
    return_pattern : str or None
        The worst flow pattern in the line from the trap (Taitel & Dukler), where the
        line is described.
    """

    source: str
    name: str
    tag: str
    system: str
    stall_fraction: float | None
    stall_inlet_temperature: float | None
    required: str
    installed: str
    adequate: bool
    stalled_hours: float | None
    top_code: str | None
    top_severity: str | None
    exit_status: int
    warnings: tuple[str, ...] = ()
    return_pattern: str | None = None

    @classmethod
    def of(cls, r: Result) -> "Summary":
        top = r.findings[0] if r.findings else None
        s = r.stall
        return cls(r.source, r.unit, r.tag, r.system, s.load_fraction if s.occurs else None,
                   s.inlet_temperature if s.occurs else None, r.drainage.required, r.drainage.installed,
                   r.drainage.adequate, r.stalled_hours, top.code if top else None,
                   top.severity if top else None, r.exit_status, r.warnings, _worst_pattern(r))

    def badness(self) -> tuple:
        """Sort key, worst first: failing units, then the worst finding, inadequate
        drainage, and the highest stall load."""
        severity = SEVERITIES.index(self.top_severity) if self.top_severity else -1
        return (-self.exit_status, -severity, self.adequate, -(self.stall_fraction or 0.0), self.source)


def _worst_pattern(r: Result) -> str | None:
    return None if r.return_line is None else r.return_line.worst.taitel_dukler


@record
class Failure:
    """A unit that could not be read or analysed, with the message naming its key."""

    source: str
    message: str


def sources(paths: Iterable[str | Path]) -> list[Path]:
    """The files a survey reads: files as given, folders searched recursively for
    ``.toml`` and ``.csv`` files (sorted), each once. A folder that cannot be searched
    is kept as a source of its own, so that reading it names it as unreadable."""
    out: list[Path] = []
    seen = set()
    for p in paths:
        path = Path(p)
        found = _search(path) if path.is_dir() else [path]
        for f in found:
            try:
                key = str(f.resolve()) if f.exists() else str(f)
            except OSError:
                key = str(f)
            if key not in seen:
                seen.add(key)
                out.append(f)
    return out


def _search(folder: Path) -> list[Path]:
    found: list[Path] = []

    def unreadable(error: OSError) -> None:
        found.append(Path(error.filename))

    for root, folders, files in os.walk(folder, onerror=unreadable):
        folders.sort()
        found += [Path(root) / f for f in files if f.lower().endswith((".toml", ".csv"))]
    return sorted(found)


def count(files: list[Path]) -> int:
    """How many units the files hold (CSV rows counted, not validated)."""
    total = 0
    for f in files:
        if f.suffix.lower() == ".csv":
            try:
                total += csvunits.count(f) if f.is_file() else 1
            except OSError:
                total += 1
        else:
            total += 1
    return total


def units(files: list[Path]) -> Iterator:
    """Each unit read from the files, as a Unit or, where it cannot be read, a Failure."""
    for f in files:
        if f.suffix.lower() == ".csv":
            try:
                for line, data in csvunits.rows(f):
                    if isinstance(data, InputError):
                        yield Failure(f"{f}:{line}", str(data))
                        continue
                    try:
                        yield unitfile.from_data(data, str(f), line)
                    except InputError as exc:
                        yield Failure(f"{f}:{line}", str(exc))
            except InputError as exc:
                yield Failure(str(f), str(exc))
        else:
            try:
                yield unitfile.load(f)
            except InputError as exc:
                yield Failure(str(f), str(exc))


def run(paths: Iterable[str | Path], system: str | None = None, method: str | None = None,
        each: Callable[[Result], None] | None = None,
        advance: Callable[[int], None] | None = None) -> tuple[list[Summary], list[Failure]]:
    """Survey every unit the paths hold.

    Parameters
    ----------
    paths : iterable of str or Path
        Unit files, folders (searched recursively) and CSV tables.
    system, method : str, optional
        Display units and heat-transfer method, as for ``check``.
    each : callable, optional
        Called with every full result as its batch is done; where given, the results
        are tabulated across the load range (``Result.points``), as ``check`` does.
    advance : callable, optional
        Called with the number of units done in each batch (a progress bar).

    Returns
    -------
    summaries : list of Summary
        Worst first.
    failures : list of Failure
        Units that could not be read or analysed, in the order met.
    """
    summaries: list[Summary] = []
    failures: list[Failure] = []
    batch: list = []

    def flush():
        if not batch:
            return
        for unit, out in zip(batch, _analyse(batch, system, method, points=each is not None)):
            if isinstance(out, StallcheckError):
                failures.append(Failure(unit.source, str(out if not isinstance(out, InputError) or out.file
                                                         else out.in_file(unit.source))))
            else:
                summaries.append(Summary.of(out))
                if each is not None:
                    each(out)
        if advance is not None:
            advance(len(batch))
        batch.clear()

    for item in units(sources(paths)):
        if isinstance(item, Failure):
            failures.append(item)
            if advance is not None:
                advance(1)
            continue
        batch.append(item)
        if len(batch) >= BATCH:
            flush()
    flush()
    summaries.sort(key=Summary.badness)
    return summaries, failures


def _analyse(batch: list, system: str | None, method: str | None, points: bool) -> list:
    """A batch's results (tabulated across the load range only where ``points``); where
    the batch as a whole fails (a property call out of range that screening did not
    foresee), each unit again on its own, so one bad unit cannot sink the others."""
    try:
        return analysis.analyse_many(batch, system=system, method=method, points=points)
    except StallcheckError:
        out = []
        for unit in batch:
            try:
                out.extend(analysis.analyse_many([unit], system=system, method=method, points=points))
            except StallcheckError as exc:
                out.append(exc)
        return out


def exit_status(summaries: list[Summary], failures: list[Failure]) -> int:
    """2 where any unit failed, 1 where any is inadequate or has a warning, else 0."""
    if failures:
        return 2
    return max((s.exit_status for s in summaries), default=0)
