"""The vectorised Illinois root finder against roots known in closed form."""

import math

import numpy as np

from stallcheck.physics.solve import illinois


def test_roots_known_in_closed_form():
    # x³ = a has the root a^(1/3); cos x = x has the Dottie number 0.7390851332151607
    # (a published constant, from memory).
    a = np.array([0.2, 2.0, 7.0])
    roots = illinois(lambda x, where: x ** 3 - a[where], np.zeros(3), np.full(3, 2.0), 1e-14)
    assert np.allclose(roots, a ** (1 / 3), rtol=0, atol=1e-12)
    dottie = illinois(lambda x, where: np.cos(x) - x, np.array([0.0]), np.array([1.0]), 1e-15)
    assert math.isclose(dottie[0], 0.7390851332151607, abs_tol=1e-13)


def test_no_sign_change_gives_nan_and_others_still_solve():
    roots = illinois(lambda x, where: x ** 2 - np.array([2.0, -1.0])[where], np.zeros(2), np.full(2, 3.0), 1e-12)
    assert math.isclose(roots[0], math.sqrt(2), abs_tol=1e-10) and np.isnan(roots[1])


def test_an_element_solves_the_same_alone_and_in_a_batch():
    # each element stops on its own tolerance: a check and a survey agree exactly
    k = np.array([1.0, 50.0, 3.0, 1000.0])

    def f(x, where):
        return np.sqrt(np.maximum(x - 0.3, 0.0)) * k[where] - x

    together = illinois(f, np.full(4, 0.3001), np.full(4, 0.9), 1e-10)
    for i in range(4):
        alone = illinois(lambda x, where: np.sqrt(np.maximum(x - 0.3, 0.0)) * k[i] - x,
                         np.array([0.3001]), np.array([0.9]), 1e-10)
        assert alone[0] == together[i] or (np.isnan(alone[0]) and np.isnan(together[i]))
