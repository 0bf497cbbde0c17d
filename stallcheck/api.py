"""The Python interface: what the command line does, for notebooks and scripts.

>>> import stallcheck
>>> unit = stallcheck.read_unit("sample_units/us_vacuum_breaker_gravity.toml")
>>> result = stallcheck.analyse(unit)
>>> result.drainage.required
'trap-vacuum-breaker'
>>> round(stallcheck.to_dict(result)["stall"]["load_fraction"], 2)
0.84

Everything is SI inside (pressures absolute in Pa, temperatures in K, flows in kg/s);
:func:`to_dict` gives the JSON contract of the README (kPa, °C, kg/h). Bad input raises
:class:`stallcheck.errors.InputError`, whose message names the file and the key.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any, Iterable, Mapping

from stallcheck.errors import InputError, StallcheckError
from stallcheck.inputs import Unit
from stallcheck.result import Result

__all__ = ["read_unit", "analyse", "analyse_many", "to_dict", "survey_rows", "survey_frame", "InputError",
           "StallcheckError", "Unit", "Result"]


def read_unit(source: str | Path | Mapping[str, Any], name: str = "unit") -> Unit:
    """A validated unit from a unit file, or from the same tables as a dict.

    Parameters
    ----------
    source : str, Path or mapping
        The path of a TOML unit file (format 1), or its tables as nested dicts
        (``{"format": 1, "unit": {"name": ...}, "design": {...}, ...}``).
    name : str
        What to call a dict's source in messages.

    Raises
    ------
    InputError
        For anything that cannot be accepted, naming the key.
    """
    from stallcheck.files import unitfile

    if isinstance(source, Mapping):
        return unitfile.from_data(dict(source), name)
    return unitfile.load(source)


def analyse(unit: Unit | str | Path | Mapping[str, Any], system: str | None = None,
            method: str | None = None, *, units: str | None = None) -> Result:
    """Analyse one unit (a :class:`Unit`, or anything :func:`read_unit` takes).

    Parameters
    ----------
    system : {"us", "si"}, optional
        Display units for the words in reasons and findings (default: the file's own),
        as :func:`analyse_many` names it.
    method : {"ntu", "mean-temperature"}, optional
        Override the file's heat-transfer method.
    units : {"us", "si"}, optional
        The former name of ``system``, still taken.
    """
    from stallcheck import analysis

    if not isinstance(unit, Unit):
        unit = read_unit(unit)
    return analysis.analyse(unit, system=system or units, method=method)


def analyse_many(units: Iterable[Unit | str | Path | Mapping[str, Any]], system: str | None = None,
                 method: str | None = None) -> list[Result | StallcheckError]:
    """Analyse many units at once (on arrays: thousands in seconds): each a :class:`Unit`
    or anything :func:`read_unit` takes. Each item of the answer is the unit's
    :class:`Result`, or the error that stopped it, in order (the others go on)."""
    from stallcheck import analysis

    read: list[Unit | StallcheckError] = []
    for i, item in enumerate(units):
        if isinstance(item, Unit):
            read.append(item)
            continue
        try:
            read.append(read_unit(item, name=f"unit {i + 1}"))
        except StallcheckError as exc:
            read.append(exc)
    ok = [u for u in read if isinstance(u, Unit)]
    done = iter(analysis.analyse_many(ok, system=system, method=method)) if ok else iter(())
    return [next(done) if isinstance(u, Unit) else u for u in read]


def to_dict(result: Result) -> dict:
    """A result as the JSON contract's data (the README's result contract)."""
    from stallcheck.render import json as contract

    return contract.to_dict(result)


def survey_rows(paths: str | Path | Iterable[str | Path], units: str | None = None,
                method: str | None = None, jobs: int = 1) -> list[dict]:
    """Survey unit files, folders of them and CSV tables: one row per unit, worst first
    (the columns of ``stallcheck survey --csv``), then a row per unit that could not be
    read, with its message under ``error``. ``jobs`` processes share the work (default
    1: all in this process; more are forked from it, or spawned where fork is not used)."""
    import importlib

    from stallcheck.render import survey as table

    surveymod = importlib.import_module("stallcheck.analysis.survey")

    if isinstance(paths, (str, Path)):
        paths = [paths]
    return table.records(*surveymod.run(list(paths), system=units, method=method, jobs=jobs))


def survey_frame(paths: str | Path | Iterable[str | Path], units: str | None = None,
                 method: str | None = None, jobs: int = 1):
    """:func:`survey_rows` as a pandas DataFrame (pandas is not a dependency: install it to
    use this)."""
    try:
        import pandas
    except ImportError:
        raise ImportError("survey_frame needs pandas (pip install pandas); survey_rows() gives the same rows "
                          "as a list of dicts") from None
    return pandas.DataFrame(survey_rows(paths, units=units, method=method, jobs=jobs))
