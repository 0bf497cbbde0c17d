"""A bracketed root finder that works on whole arrays at once.

Bisection halves every bracket each step, so 60 steps pin a root to 2⁻⁶⁰ of its
bracket whatever the function; it never leaves the bracket and needs no derivative.
Working on arrays lets a survey solve thousands of units in one call, and keeps
scipy's import (about two seconds here) off the path of a single check.
"""

from __future__ import annotations

import numpy as np


def bisect(function, low, high, iterations: int = 60):
    """Roots of ``function`` in [low, high], element by element.

    Parameters
    ----------
    function : callable
        Vectorised: takes an array of x, returns an array of the same shape.
    low, high : float or ndarray
        Brackets. Where ``function`` has the same sign at both ends the result is
        NaN (no root in the bracket).
    iterations : int
        Halvings; the bracket shrinks by 2**iterations.

    Returns
    -------
    ndarray
        x with function(x) ≈ 0, NaN where the bracket holds no sign change.
    """
    lo, hi = (np.array(a, dtype=float) for a in np.broadcast_arrays(low, high))
    f_lo = np.asarray(function(lo), dtype=float)
    f_hi = np.asarray(function(hi), dtype=float)
    valid = np.sign(f_lo) * np.sign(f_hi) <= 0
    for _ in range(iterations):
        mid = 0.5 * (lo + hi)
        f_mid = np.asarray(function(mid), dtype=float)
        left = np.sign(f_mid) * np.sign(f_lo) <= 0
        hi = np.where(left, mid, hi)
        lo = np.where(left, lo, mid)
        f_lo = np.where(left, f_lo, f_mid)
    return np.where(valid, 0.5 * (lo + hi), np.nan)
