"""A year of the site's weather run through the unit: hours stalled, freeze exposure and
the heating design condition (:class:`~stallcheck.result.YearFigures`).

Each hour's outdoor dry bulb gives the air entering the coil (mixed where the unit
mixes, :func:`stallcheck.physics.coil.entering_air`) and so its load fraction, as the
load bins do; an hour is stalled by the same rule as a bin. Everything is counted with
numpy over the 8,760 hours at once.
"""

from __future__ import annotations

import numpy as np

from stallcheck.inputs import Unit
from stallcheck.physics import coil as coilmod
from stallcheck.physics.constants import FREEZING
from stallcheck.result import YearFigures

#: The heating design conditions' shares of the year's hours at or below them [-]: the
#: 99.6 % and 99 % annual heating dry bulbs (ASHRAE Handbook—Fundamentals, ch. 14,
#: "Climatic design information": 0.4 % and 1 % of the hours are colder).
DESIGN_SHARES = (0.004, 0.01)
#: Width of a load band in the year's table [-].
BAND = 0.1


def design_dry_bulb(dry_bulb, share: float) -> float:
    """The temperature at or below which ``share`` of the hours lie [K].

    The ⌈share·N⌉-th coldest of the N hours: the least temperature that at least that
    share of the hours do not exceed. (The Handbook interpolates in a frequency
    distribution of 0.1 K bins; with dry bulbs recorded to 0.1 K the two agree to
    within a step between neighbouring hours.)

    Parameters
    ----------
    dry_bulb : ndarray
        Every hour's dry bulb. [K]
    share : float
        Share of the hours, such as 0.004 for the 99.6 % condition. [-]

    References
    ----------
    .. [1] ASHRAE Handbook—Fundamentals (2017), ch. 14, "Climatic design information".
    """
    t = np.asarray(dry_bulb, dtype=float)
    k = int(np.ceil(share * t.size - 1e-9))
    return float(np.partition(t, k - 1)[k - 1])


def stalled_hours(load, minimum: float, stall_fraction: float, valve_load: float | None):
    """Which hours (or load bins) run, and which run stalled: the one rule for load bins
    and a weather year. An hour runs where its load is above 0; asked for less than the
    minimum it runs at the minimum, for more than full load at full load; it is stalled
    at or below the stall load, and at or above the load from which the open valve
    holds the coil under its stall pressure (``valve_load``, None where it never does).

    Parameters
    ----------
    load : ndarray
        Each hour's load fraction. [-]
    minimum, stall_fraction : float  [-]
    valve_load : float or None  [-]

    Returns
    -------
    running, stalled : ndarray of bool
    """
    load = np.asarray(load, dtype=float)
    running = load > 0
    at = np.clip(load, minimum, 1.0)
    stalled = running & (at <= stall_fraction) & (stall_fraction > 0)
    if valve_load is not None:
        stalled |= running & (at >= valve_load)
    return running, stalled


def scheduled(unit: Unit) -> np.ndarray:
    """Which hours of the weather year fall in the unit's season and daily hours."""
    w = unit.site.weather
    ld = unit.load
    mask = np.ones(w.dry_bulb.shape, dtype=bool)
    if ld.season:
        mask &= np.isin(w.month, ld.season)
    if ld.daily_hours is not None:
        start, stop = ld.daily_hours
        hour = w.hour
        mask &= ((hour >= start) & (hour < stop)) if start < stop else ((hour >= start) | (hour < stop))
    return mask


def figures(unit: Unit, coil: coilmod.CoilModel, stall_fraction: float,
            valve_load: float | None) -> tuple[YearFigures, np.ndarray]:
    """The year's figures for one unit, and its operating hours' load fractions.

    Parameters
    ----------
    unit : Unit
        With a weather year.
    coil : CoilModel
        The unit's coil.
    stall_fraction : float
        Load at and below which it stalls (0: never). [-]
    valve_load : float or None
        Load from which the open valve holds the coil under its stall pressure. [-]

    Returns
    -------
    YearFigures, ndarray
        The figures, and each operating hour's load fraction (for the purge's steam).
    """
    w = unit.site.weather
    ld = unit.load
    entering = coilmod.entering_air(w.dry_bulb, ld.outdoor_air_minimum, ld.return_air_temperature,
                                    ld.mixed_air_temperature)
    load = coilmod.load_at_inlet_temperature(coil, entering)
    on = scheduled(unit)
    running, stalled = stalled_hours(load, ld.minimum, stall_fraction, valve_load)
    running &= on
    stalled &= on
    freezing = stalled & (entering < FREEZING)
    low, high = (design_dry_bulb(w.dry_bulb, share) for share in DESIGN_SHARES)
    last = round(1 / BAND)   # the band of the hours at or above full load
    index = np.minimum(np.floor(np.clip(load[running], 0.0, None) / BAND + 1e-9), last).astype(int)
    bands_all = np.bincount(index, minlength=last + 1)
    bands_stalled = np.bincount(index[stalled[running]], minlength=last + 1)
    bands = tuple((round(k * BAND, 10), None if k == last else round((k + 1) * BAND, 10), int(bands_all[k]),
                   int(bands_stalled[k])) for k in range(last + 1))
    year = YearFigures(
        file=w.path, form=w.form, station=w.station, station_elevation=w.elevation, hours=int(w.dry_bulb.size),
        scheduled=int(on.sum()), no_load=int((on & ~running).sum()), operating=int(running.sum()),
        below_minimum=int((running & (load < ld.minimum)).sum()), above_full=int((running & (load > 1.0)).sum()),
        stalled=int(stalled.sum()), stalled_freezing=int(freezing.sum()),
        longest_freezing_run=longest_run(freezing), dry_bulb_996=low, dry_bulb_990=high,
        entering_996=float(coilmod.entering_air(low, ld.outdoor_air_minimum, ld.return_air_temperature,
                                                ld.mixed_air_temperature)),
        design_inlet=unit.design.inlet_temperature,
        coldest_entering=float(entering[on].min()) if on.any() else float(entering.min()), stated_996=w.design_996, stated_990=w.design_990, bands=bands,
        entering=entering, running=running, stalled_hours=stalled, month=w.month)
    return year, load[running]


def longest_run(mask) -> int:
    """The longest run of consecutive true values [-] (in order, not wrapping)."""
    m = np.concatenate(([False], np.asarray(mask, dtype=bool), [False])).astype(np.int8)
    edges = np.diff(m)
    starts, ends = np.flatnonzero(edges == 1), np.flatnonzero(edges == -1)
    return int((ends - starts).max()) if starts.size else 0
