"""The text stall chart: every tick label on the row that holds its value, no axis below
a perfect vacuum, and the pressure the load needs drawn beside the one a too-small valve
holds the coil at. Pressures read from the rows are checked against the result's own
points converted by exact unit definitions (1 psi = 6,894.757 Pa)."""

from __future__ import annotations

import re

import pytest
from test_findings import analyse

from stallcheck.render import chart

PSI = 6894.757293168


def _rows(lines):
    """The plot rows as plain text, and the tick label (a number) each carries."""
    text = chart.plain(lines).splitlines()
    plot = [t for t in text[1:] if re.match(r"^ {0,8}[-\d. ]{7} [+|]", t) and not t.strip().startswith("+")]
    labels = [float(t[:7]) if t[:7].strip() else None for t in plot]
    return plot, labels


@pytest.mark.parametrize("height", [7, 9, 12, 16, 24])
@pytest.mark.parametrize("elevation", ["0 ft", "5000 ft"])
def test_ticks_sit_on_evenly_spaced_rows_and_never_below_a_vacuum(height, elevation):
    # A coil that runs deep into vacuum at low load. The rows between two labels are
    # evenly spaced in pressure, and no label is below a perfect vacuum (the site's
    # atmosphere, gauge: -14.7 psig at sea level, -12.2 psig at 5,000 ft, ISO 2533).
    r = analyse(site={"elevation": elevation}, drain={"lift": "2 ft"})
    plot, labels = _rows(chart.render(r, "us", width=78, height=height))
    assert len(plot) <= height
    marked = [(i, v) for i, v in enumerate(labels) if v is not None]
    assert len(marked) >= 2
    (i0, v0), (i1, v1) = marked[0], marked[1]
    per_row = (v0 - v1) / (i1 - i0)
    for i, v in marked:
        assert v == pytest.approx(v0 - (i - i0) * per_row, abs=1e-9)
    vacuum = -r.atmospheric_pressure / PSI
    assert min(v for _, v in marked) >= vacuum
    # the lowest row holds the vacuum, at most half a row below it
    assert v0 - (len(plot) - 1 - i0) * per_row >= vacuum - per_row / 2 - 1e-9


def test_a_valve_held_coil_shows_what_the_load_needs_beside_it():
    # Cv 5 where about 7 is needed: the open valve holds the coil under what the load
    # needs from about half load up; the chart draws both, and says which is which.
    r = analyse(valve={"cv": 5})
    assert r.points.valve_limited.any()
    text = chart.plain(chart.render(r, "us"))
    assert "o what the load needs, where the open valve holds the coil lower" in text
    assert "* steam pressure the coil runs at" in text
    fine = chart.plain(chart.render(analyse(valve={"cv": 12}), "us"))
    assert "o what the load needs" not in fine and "* steam pressure the coil needs" in fine
