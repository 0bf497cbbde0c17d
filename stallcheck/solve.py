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


def illinois(function, low, high, tolerance: float = 1e-12, iterations: int = 60):
    """Roots of ``function`` in [low, high], element by element, by the Illinois
    (modified regula falsi) method: bracketed like bisection, but converging
    superlinearly, so a solve that costs steam-table calls needs a handful of them.

    Parameters
    ----------
    function : callable
        Vectorised: takes an array of x, returns an array of the same shape.
    low, high : float or ndarray
        Brackets with a sign change; NaN where there is none.
    tolerance : float
        Stop once every bracket is narrower than this (in x).
    iterations : int
        Most function calls after the first two.

    References
    ----------
    .. [1] Dowell, M., Jarratt, P. (1971). A modified regula falsi method for computing
       the root of an equation. BIT 11, 168–174.
    """
    a, b = (np.array(x, dtype=float) for x in np.broadcast_arrays(low, high))
    fa = np.asarray(function(a), dtype=float)
    fb = np.asarray(function(b), dtype=float)
    valid = np.sign(fa) * np.sign(fb) <= 0
    side = np.zeros(a.shape, dtype=int)
    for _ in range(iterations):
        # Each element stops on its own tolerance, so its answer never depends on the
        # others solved beside it (a survey and a single check agree exactly).
        active = valid & (np.abs(b - a) > tolerance)
        if not active.any():
            break
        with np.errstate(invalid="ignore", divide="ignore"):
            c = (a * fb - b * fa) / (fb - fa)
        c = np.where(np.isfinite(c) & (c > np.minimum(a, b)) & (c < np.maximum(a, b)), c, 0.5 * (a + b))
        fc = np.asarray(function(c), dtype=float)
        left = (np.sign(fc) * np.sign(fa) <= 0) & active  # root in [a, c]: replace b
        right = ~left & active
        exact = (fc == 0) & active
        # Illinois: halve the value kept at the end that stays, when it stays twice
        fa = np.where(left & (side == -1), 0.5 * fa, fa)
        fb = np.where(right & (side == 1), 0.5 * fb, fb)
        b, fb = np.where(left, c, b), np.where(left, fc, fb)
        a, fa = np.where(right, c, a), np.where(right, fc, fa)
        side = np.where(left, -1, np.where(right, 1, side))
        a = np.where(exact, c, a)
        b = np.where(exact, c, b)
    return np.where(valid, 0.5 * (a + b), np.nan)
