"""Shared helpers for the tests.

Tiers, as DEVELOPERS.md explains: *published* (a standard's table or a handbook's worked
example, named beside the check), *independent* (a reference library from the package
registry, or a hand calculation written out), *regression* (marked as such).
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest
from hypothesis import settings

# Property tests are derandomised (a fixed seed, no example database) so that CI gives
# the same verdict on the same code: a clean submission cannot fail by chance. For the
# wide, random runs locally: HYPOTHESIS_PROFILE=random (with STALLCHECK_EXAMPLES=1000).
settings.register_profile("fixed", derandomize=True, database=None, print_blob=True)
settings.register_profile("random", derandomize=False, print_blob=True)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "fixed"))

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = sorted((ROOT / "sample_units").glob("*.toml"))


@pytest.fixture
def write_unit(tmp_path):
    """Write unit-file text to a temporary file and return its path."""

    def _write(text: str, name: str = "unit.toml") -> Path:
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        return path

    return _write


BASE_UNIT = """
format = 1
[unit]
name = "Test coil"
[design]
medium = "air"
flow = "6000 cfm"
inlet_temperature = "-10 degF"
outlet_temperature = "50 degF"
steam_pressure = "5 psig"
[steam]
supply_pressure = "15 psig"
[valve]
cv = 10
characteristic = "equal-percentage"
[drain]
arrangement = "trap"
fill_head = "18 in"
lift = "0 ft"
return_pressure = "0 psig"
"""


def said(r):
    """Each remedy of a result with the note printed for it (``.note``) beside its
    fields, as the terminal, report and JSON say it."""
    from types import SimpleNamespace

    from stallcheck.render import advice

    return [SimpleNamespace(**vars(line.remedy), note=line.note) for line in advice.lines(r, r.system)]


def reasons(r):
    """The drainage reasons of a result, as printed."""
    from stallcheck.render import words

    return words.drainage_reasons(r.drainage, r.system, r.atmospheric_pressure)
