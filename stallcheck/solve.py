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
        ``function(x, where)``: the values at x for the elements ``where`` (an index
        array into ``low``), so that elements already solved are not evaluated again.
    low, high : ndarray
        Brackets with a sign change; NaN where there is none.
    tolerance : float
        Each element stops once its bracket is narrower than this (in x), so its
        answer never depends on the others solved beside it.
    iterations : int
        Most function calls after the first two.

    References
    ----------
    .. [1] Dowell, M., Jarratt, P. (1971). A modified regula falsi method for computing
       the root of an equation. BIT 11, 168–174.
    """
    a, b = (np.array(x, dtype=float) for x in np.broadcast_arrays(low, high))
    everywhere = np.arange(a.size)
    fa = np.asarray(function(a, everywhere), dtype=float)
    fb = np.asarray(function(b, everywhere), dtype=float)
    valid = np.sign(fa) * np.sign(fb) <= 0
    side = np.zeros(a.shape, dtype=int)
    for _ in range(iterations):
        active = np.flatnonzero(valid & (np.abs(b - a) > tolerance))
        if not active.size:
            break
        A, B, FA, FB = a[active], b[active], fa[active], fb[active]
        with np.errstate(invalid="ignore", divide="ignore"):
            c = (A * FB - B * FA) / (FB - FA)
        c = np.where(np.isfinite(c) & (c > np.minimum(A, B)) & (c < np.maximum(A, B)), c, 0.5 * (A + B))
        fc = np.asarray(function(c, active), dtype=float)
        left = np.sign(fc) * np.sign(FA) <= 0            # root in [a, c]: c replaces b
        last = side[active]
        # Illinois: halve the value kept at an end that stays twice running
        FA = np.where(left & (last == -1), 0.5 * FA, FA)
        FB = np.where(~left & (last == 1), 0.5 * FB, FB)
        B, FB = np.where(left, c, B), np.where(left, fc, FB)
        A, FA = np.where(left, A, c), np.where(left, FA, fc)
        exact = fc == 0
        A, B = np.where(exact, c, A), np.where(exact, c, B)
        a[active], b[active], fa[active], fb[active] = A, B, FA, FB
        side[active] = np.where(left, -1, 1)
    return np.where(valid, 0.5 * (a + b), np.nan)
