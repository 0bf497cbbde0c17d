"""A bracketed root finder that works on whole arrays at once.

The Illinois method (modified regula falsi) never leaves its bracket, needs no
derivative, and converges superlinearly, so a solve whose function costs steam-table
calls needs a handful of calls for a whole survey. Working on arrays keeps scipy's
import (about two seconds here) off the path of a single check.
"""

from __future__ import annotations

import numpy as np


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
