"""Units written back to unit-file text read back as the same units."""

import math
from dataclasses import asdict

import pytest

from stallcheck import unitfile, unitwriter
from conftest import SAMPLES


def _close(a, b, path=""):
    if isinstance(a, dict):
        assert set(a) == set(b), path
        for k in a:
            _close(a[k], b[k], f"{path}.{k}")
    elif isinstance(a, (list, tuple)):
        assert len(a) == len(b), path
        for x, y in zip(a, b):
            _close(x, y, path)
    elif isinstance(a, float):
        assert math.isclose(a, b, rel_tol=1e-8, abs_tol=1e-8), (path, a, b)
    else:
        assert a == b, (path, a, b)


@pytest.mark.parametrize("system", ["us", "si"])
@pytest.mark.parametrize("sample", SAMPLES, ids=lambda p: p.stem)
def test_every_sample_round_trips_in_both_unit_systems(sample, system):
    unit = unitfile.load(sample)
    again = unitfile.parse(unitwriter.dumps(unit, system), "written.toml")
    a, b = asdict(unit), asdict(again)
    for key in ("source", "defaults", "warnings", "system"):
        a.pop(key), b.pop(key)
    a["site"].pop("basis"), b["site"].pop("basis")
    _close(a, b)
    assert again.system == system
