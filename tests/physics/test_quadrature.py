"""Tests for seatool.physics.quadrature (sources beside each check)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from seatool.physics.quadrature import gauss_legendre


def test_two_and_three_point_rules_against_abramowitz_stegun_table_25_4():
    # Abramowitz & Stegun (1964) table 25.4: n = 2: x = +-1/sqrt(3), w = 1;
    # n = 3: x = 0, +-sqrt(3/5), w = 8/9, 5/9.
    x, w = gauss_legendre(2)
    np.testing.assert_allclose(x, [-1 / math.sqrt(3), 1 / math.sqrt(3)], rtol=1e-15)
    np.testing.assert_allclose(w, [1.0, 1.0], rtol=1e-15)
    x, w = gauss_legendre(3)
    np.testing.assert_allclose(x, [-math.sqrt(0.6), 0.0, math.sqrt(0.6)], atol=1e-15)
    np.testing.assert_allclose(w, [5 / 9, 8 / 9, 5 / 9], rtol=1e-14)


def test_exact_for_degree_2n_minus_1_and_remembered_read_only():
    # integral_{-1}^{1} x^k dx = 2/(k + 1) for even k, 0 for odd k (elementary)
    x, w = gauss_legendre(24)
    for k in range(48):
        exact = 2.0 / (k + 1) if k % 2 == 0 else 0.0
        assert float(np.sum(w * x**k)) == pytest.approx(exact, abs=1e-13)
    assert gauss_legendre(24)[0] is x
    with pytest.raises(ValueError, match="read-only"):
        x[0] = 0.0
    with pytest.raises(ValueError, match="n must be"):
        gauss_legendre(0)
