"""Surveys: many units from unit files, folders of them and CSV tables, analysed in
batches, with a one-line summary of each kept for the table.

Nothing here prints. Units are read and analysed a batch at a time, and a caller that
wants every full result (``--json``) takes each batch's results as they come, so the
memory held does not grow with the number of units beyond the summaries.
"""

from __future__ import annotations

import os
import sys
from dataclasses import dataclass, fields
from pathlib import Path
from typing import Callable, Iterable, Iterator

from stallcheck import analysis
from stallcheck.errors import InputError, StallcheckError
from stallcheck.files import csvunits, unitfile, weather
from stallcheck.result import SEVERITIES, Result

#: Units analysed together: enough to spread the steam-table calls, few enough to keep
#: memory flat and the progress bar moving.
BATCH = 500
#: A survey of this many units or more is shared among processes, one per processor
#: (below it, starting them costs more than they save).
PARALLEL_FROM = 2000
#: At most this many worker processes.
MAX_JOBS = 8


@dataclass(frozen=True)
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
    hours_from : str or None
        ``"weather"`` or ``"bins"``: where ``stalled_hours`` comes from.
    freezing_hours : int or None
        With a weather file: stalled hours with the air entering below freezing. [h]
    dry_bulb_996 : float or None
        With a weather file: its 99.6 % heating dry bulb. [K]
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
    hours_from: str | None = None
    freezing_hours: int | None = None
    dry_bulb_996: float | None = None

    @classmethod
    def of(cls, r: Result) -> "Summary":
        top = r.findings[0] if r.findings else None
        s = r.stall
        return cls(r.source, r.name, r.tag, r.system, s.load_fraction if s.occurs else None,
                   s.inlet_temperature if s.occurs else None, r.drainage.required, r.drainage.installed,
                   r.drainage.adequate, r.stalled_hours, top.code if top else None,
                   top.severity if top else None, r.exit_status, r.warnings, _worst_pattern(r),
                   "weather" if r.year is not None else "bins" if r.stalled_hours is not None else None,
                   None if r.year is None else r.year.stalled_freezing,
                   None if r.year is None else r.year.dry_bulb_996)

    def badness(self) -> tuple:
        """Sort key, worst first: failing units, then the worst finding, inadequate
        drainage, and the highest stall load."""
        severity = SEVERITIES.index(self.top_severity) if self.top_severity else -1
        return (-self.exit_status, -severity, self.adequate, -(self.stall_fraction or 0.0), self.source)


def _worst_pattern(r: Result) -> str | None:
    return None if r.return_line is None else r.return_line.worst.taitel_dukler


@dataclass(frozen=True)
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
        found = _search(str(path)) if path.is_dir() else [(str(path), _real(str(path)))]
        for name, key in found:
            if key not in seen:
                seen.add(key)
                out.append(Path(name))
    return out


def _real(name: str) -> str:
    """The file a path names, for telling the same file given twice."""
    try:
        return os.path.realpath(name) if os.path.exists(name) else name
    except OSError:
        return name


def _search(folder: str) -> list[tuple[str, str]]:
    """The unit files and CSV tables under a folder, sorted as paths (part by part),
    each with the file it names (resolved once a folder, not once a file)."""
    found: list[tuple[str, str]] = []

    def unreadable(error: OSError) -> None:
        found.append((error.filename, error.filename))

    for root, folders, files in os.walk(folder, onerror=unreadable):
        folders.sort()
        real_root = _real(root)
        for name in files:
            if name.lower().endswith((".toml", ".csv")):
                full = os.path.join(root, name)
                if name.lower().endswith(".csv") and weather.is_weather(full):
                    continue  # a weather file the units name, not a table of units
                found.append((full, _real(full) if os.path.islink(full) else os.path.join(real_root, name)))
    found.sort(key=lambda entry: os.path.normcase(entry[0]).split(os.sep))
    return found


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


def _items(files: list[Path]) -> Iterator:
    """What each unit is read from, in order, without reading it: a unit file's path, a
    CSV row as ``(file, line, columns, cells)``, or the Failure of a file or row that
    cannot be read at all. Cheap to send to another process."""
    for f in files:
        if f.suffix.lower() == ".csv":
            source = str(f)
            try:
                for line, columns, cells in csvunits.records(f):
                    yield (Failure(f"{source}:{line}", str(cells)) if isinstance(cells, InputError)
                           else (source, line, columns, cells))
            except InputError as exc:
                yield Failure(source, str(exc))
        else:
            yield f


def _unit(item):
    """The Unit an item of :func:`_items` holds, or its Failure."""
    if isinstance(item, Failure):
        return item
    if isinstance(item, tuple):
        source, line, columns, cells = item
        data = csvunits.tables(columns, cells, source, line)
        try:
            if isinstance(data, InputError):
                raise data
            return unitfile.from_data(data, source, line, folder=Path(source).parent)
        except InputError as exc:
            return Failure(f"{source}:{line}", str(exc))
    try:
        return unitfile.load(item)
    except InputError as exc:
        return Failure(str(item), str(exc))


def _chunks(items: Iterator, size: int) -> Iterator[list]:
    chunk: list = []
    for item in items:
        chunk.append(item)
        if len(chunk) >= size:
            yield chunk
            chunk = []
    if chunk:
        yield chunk


def _work(chunk: list, system: str | None, method: str | None, keep: bool, points: bool) -> list:
    """Read and analyse a chunk of items: for each, in order, its Failure, or its
    Summary and (where ``keep``) its full Result. Runs in a worker process too."""
    read = [_unit(item) for item in chunk]
    batch = [u for u in read if not isinstance(u, Failure)]
    # Results that are not kept only make summaries: they need not be complete.
    done = iter(_analyse(batch, system, method, points, complete=keep) if batch else [])
    out: list = []
    for unit in read:
        if isinstance(unit, Failure):
            out.append(unit)
            continue
        result = next(done)
        if isinstance(result, StallcheckError):
            out.append(Failure(unit.source, str(result if not isinstance(result, InputError) or result.file
                                                 else result.in_file(unit.source))))
        else:
            out.append((Summary.of(result), result if keep else None))
    return out


def jobs_for(units: int, jobs: int | None = None) -> int:
    """Worker processes for a survey of ``units``: ``jobs`` where given (1: none, all in
    this process), else one per processor this process may use, for a survey of at
    least :data:`PARALLEL_FROM` units."""
    if jobs is not None:
        return max(1, jobs)
    if units < PARALLEL_FROM:
        return 1
    try:
        cores = len(os.sched_getaffinity(0))
    except AttributeError:  # not on Linux
        cores = os.cpu_count() or 1
    return max(1, min(cores, MAX_JOBS))


def run(paths: Iterable[str | Path], system: str | None = None, method: str | None = None,
        each: Callable[[Result], None] | None = None,
        advance: Callable[[int], None] | None = None, jobs: int | None = None,
        searched: bool = False, points: bool = True) -> tuple[list[Summary], list[Failure]]:
    """Survey every unit the paths hold.

    Parameters
    ----------
    paths : iterable of str or Path
        Unit files, folders (searched recursively) and CSV tables.
    system, method : str, optional
        Display units and heat-transfer method, as for ``check``.
    each : callable, optional
        Called with every full result as its batch is done; where given, the results
        are tabulated across the load range (``Result.points``), as ``check`` does,
        and the survey runs in this process.
    advance : callable, optional
        Called with the number of units done in each batch (a progress bar).
    jobs : int, optional
        Processes to read and analyse in (see :func:`jobs_for`); the summaries are the
        same whatever the number.
    searched : bool
        The paths are already the files :func:`sources` found for the survey.
    points : bool
        Where ``each`` is given: tabulate each result across the load range (the chart's
        points); without, every other figure is the same and the work about halves.

    Returns
    -------
    summaries : list of Summary
        Worst first.
    failures : list of Failure
        Units that could not be read or analysed, in the order of the files and rows.
    """
    files = list(paths) if searched else sources(paths)
    summaries: list[Summary] = []
    failures: list[Failure] = []
    workers = 1 if each is not None else jobs_for(count(files) if jobs is None else 0, jobs)

    def take(out: list) -> None:
        for entry in out:
            if isinstance(entry, Failure):
                failures.append(entry)
            else:
                summaries.append(entry[0])
                if each is not None:
                    each(entry[1])
        if advance is not None:
            advance(len(out))

    chunks = _chunks(_items(files), BATCH)
    if workers == 1:
        for chunk in chunks:
            take(_work(chunk, system, method, each is not None, each is not None and points))
    else:
        _in_parallel(chunks, workers, system, method, take)
    summaries.sort(key=Summary.badness)
    return summaries, failures


def _in_parallel(chunks: Iterator[list], workers: int, system: str | None, method: str | None,
                 take: Callable[[list], None]) -> None:
    """:func:`_work` on every chunk in ``workers`` processes, each chunk's output taken
    in order, with a few chunks in flight so memory stays flat."""
    import multiprocessing
    from collections import deque
    from concurrent.futures import ProcessPoolExecutor
    from concurrent.futures.process import BrokenProcessPool

    # fork starts a worker with the modules already imported; elsewhere (macOS,
    # Windows) a worker imports them itself.
    context = multiprocessing.get_context("fork" if sys.platform.startswith("linux") else "spawn")
    pool = ProcessPoolExecutor(workers, mp_context=context, initializer=_worker_start)
    pending: deque = deque()
    try:
        for chunk in chunks:
            pending.append(pool.submit(_shipped, chunk, system, method))
            if len(pending) >= 2 * workers:
                take(_received(pending.popleft().result()))
        while pending:
            take(_received(pending.popleft().result()))
    except BrokenProcessPool:
        raise StallcheckError("a survey process stopped before its units were done (short of memory?); "
                              "survey again with --jobs 1.") from None
    finally:
        pool.shutdown(wait=not pending, cancel_futures=True)


#: A summary's fields, in order; those whose words repeat from unit to unit.
_FIELDS = tuple(f.name for f in fields(Summary))
_REPEATED = frozenset({"system", "required", "installed", "top_code", "top_severity", "return_pattern"})
_SHARED = tuple(name in _REPEATED for name in _FIELDS)


def _shipped(chunk: list, system: str | None, method: str | None) -> list:
    """:func:`_work` in a worker process, each summary sent as the tuple of its fields
    (smaller to send than the object; :func:`_received` makes it a Summary again)."""
    return [entry if isinstance(entry, Failure) else tuple(getattr(entry[0], name) for name in _FIELDS)
            for entry in _work(chunk, system, method, False, False)]


def _received(out: list) -> list:
    """A worker's output as :func:`_work` gives it, each summary rebuilt with its
    repeated words held once: at 100,000 units the summaries are most of a survey's
    memory."""
    return [entry if isinstance(entry, Failure) else
            (Summary(*(sys.intern(v) if shared and isinstance(v, str) else v for v, shared in zip(entry, _SHARED))),
             None) for entry in out]


def _worker_start() -> None:
    """A worker leaves Ctrl-C to the survey that started it, which stops it."""
    import signal

    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _analyse(batch: list, system: str | None, method: str | None, points: bool, complete: bool = True) -> list:
    """A batch's results (tabulated across the load range only where ``points``); where
    the batch as a whole fails (a property call out of range that screening did not
    foresee), each unit again on its own, so one bad unit cannot sink the others."""
    try:
        return analysis.analyse_many(batch, system=system, method=method, points=points, complete=complete)
    except StallcheckError:
        out = []
        for unit in batch:
            try:
                out.extend(analysis.analyse_many([unit], system=system, method=method, points=points,
                                                    complete=complete))
            except StallcheckError as exc:
                out.append(exc)
        return out


def exit_status(summaries: list[Summary], failures: list[Failure]) -> int:
    """2 where any unit failed, 1 where any is inadequate or has a warning, else 0."""
    if failures:
        return 2
    return max((s.exit_status for s in summaries), default=0)
