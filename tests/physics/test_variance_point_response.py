"""The cross-modal variance of a band-averaged squared point response
(:func:`seatool.physics.variance.point_response_cross_variance`) against a random-matrix
Monte Carlo (:func:`coupled_monte_carlo.point_response`: GOE natural frequencies, Gaussian
mode shapes at two points) and against direct quadrature of its defining integral."""

from __future__ import annotations

import coupled_monte_carlo as cmc
import numpy as np
import pytest
from scipy import integrate

from seatool.physics import variance as v


def _paired_difference(x: np.ndarray, y: np.ndarray) -> tuple[float, float]:
    """(E[x^2] - E[y^2]) / E[y]^2 for paired draws with E[x] = E[y], and its delta-method
    standard error: the heavy tails common to x and y cancel in the difference."""
    d, mu = x**2 - y**2, 0.5 * (x + y)
    md, mm = d.mean(), mu.mean()
    grad = np.array([1 / mm**2, -2 * md / mm**3])
    cov = np.cov(np.vstack([d, mu])) / x.size
    return float(md / mm**2), float(np.sqrt(grad @ cov @ grad))


@pytest.mark.parametrize(("m", "modes", "seed"), [(0.5, 10.0, 1), (1.0, 10.0, 2), (4.0, 10.0, 3)])
def test_cross_modal_variance_vs_monte_carlo(m: float, modes: float, seed: int) -> None:
    # The squared transfer receptance X has the modal-sum variance of equation (1) with
    # alpha = 9 (c_j = phi_j(x1) phi_j(x2), E[c^4] = 9) plus the cross-modal part; its
    # modal energy sum Y (the same draw without cross terms) has the same mean, so the
    # cross-modal part is the paired difference (E[X^2] - E[Y^2]) / E[Y]^2.
    mc = cmc.point_response(1500, seed, m=m, modes=modes)
    assert mc["cross"].mean() == pytest.approx(mc["energy"].mean(), rel=0.05)
    diff, se = _paired_difference(mc["cross"], mc["energy"])
    pred = float(v.point_response_cross_variance(m, modes))
    # Tolerance: 3 standard errors + 0.01 (the sampled band average)
    assert abs(pred - diff) <= 3 * se + 0.01, (pred, diff, se)
    if m >= 1.0:  # the cross-modal part is resolved: not zero
        assert diff > 3 * se


def test_cross_modal_variance_against_its_integral() -> None:
    # Independent numerical evaluation of the band average of c_x(u) (scipy.integrate.quad
    # over the lag u of the covariance, itself by quad in k), against the closed forms in u
    # used by point_response_cross_variance.
    for m, width in ((1.0, 10.0), (0.3, 3.0), (3.0, 30.0)):

        def b_e(k: float, m: float = m) -> float:
            return float(v.goe_form_factor(k)) * np.exp(-2 * np.pi * m * k)

        beta = 2 * sum(integrate.quad(b_e, a, c, limit=200)[0] for a, c in ((0, 1), (1, np.inf)))

        def c_x(u: float, m: float = m, beta: float = beta) -> float:
            inner = integrate.quad(
                lambda k: b_e(k) * np.sin(np.pi * k * u) ** 2, 0, 40 / (2 * np.pi * m), limit=400
            )[0]
            return (1 - beta) * m**2 / (u**2 + m**2) - 4 * m**2 / u**2 * inner

        ref = 2 / width * integrate.quad(
            lambda u, width=width: (1 - u / width) * c_x(u), 1e-9, width, limit=200
        )[0]
        got = float(v.point_response_cross_variance(m, width))
        assert got == pytest.approx(ref, rel=1e-4, abs=1e-7)


def test_cross_modal_variance_limits() -> None:
    # m -> 0: one mode at a time, no cross terms; large m with B >> m: pi m / B (the
    # Rayleigh correlation of a complex Gaussian sum, half-width m, averaged over the band)
    assert float(v.point_response_cross_variance(1e-3, 10.0)) < 1e-3
    # (corrections O(1 / (pi m)) and O((m / B) ln(B / m)): 1 % here)
    m, width = np.array([100.0, 300.0]), np.array([1e5, 3e5])
    np.testing.assert_allclose(v.point_response_cross_variance(m, width), np.pi * m / width, rtol=0.02)
