"""Checks of the ensemble variance formulas against a random-matrix Monte Carlo.

Reference: :mod:`goe_monte_carlo` (GOE natural frequencies from the Dumitriu & Edelman 2002
tridiagonal model, unfolded with the Wigner semicircle; random modal coefficients; exact
Lorentzian modal sums), 1500 draws. Every tolerance is 3 Monte Carlo standard errors
(delta method over independent draws) plus 0.5 % for the finite window and the unfolding;
each standard error is itself required to be below 3 %, so the checks resolve a few
percent.
"""

from __future__ import annotations

import goe_monte_carlo as mc
import numpy as np
import pytest
from scipy import integrate, special

from seatool.physics import validity as va
from seatool.physics import variance as v

ALPHA = {"point": 3.0, "two_points": 2.0, "plate": 9.0 / 4.0, "rain": 1.0}
BIAS = 0.005  # window and unfolding allowance (relative)


def _check(predicted: float, est: mc.Estimate) -> None:
    assert est.stderr / est.value < 0.03, "Monte Carlo too noisy to be a check"
    tol = 3.0 * est.stderr + BIAS * est.value
    assert abs(predicted - est.value) <= tol, (predicted, est.value, est.stderr)


@pytest.mark.parametrize("m", [0.3, 1.0, 3.0, 10.0])
@pytest.mark.parametrize("kind", ["point", "two_points", "plate", "rain"])
def test_single_frequency_goe_vs_monte_carlo(m: float, kind: str) -> None:
    # Langley & Brown (2004a) GOE formula against the random-matrix Monte Carlo.
    # Observed: |deviation| <= 1.8 % with standard errors 0.6-2.2 %.
    est = mc.relative_variance(m, 0.0, kind)
    _check(float(va.relative_variance_goe(m, alpha=ALPHA[kind])), est)


def test_monte_carlo_resolves_the_missing_term() -> None:
    # Without the E_1 term (the unitary-ensemble formula, used before) the rain-on-the-roof
    # variance at m = 1 is 35 % low and at m = 1 for a point force 4 % low: both are more
    # than 3 standard errors away, so the check above can fail on a missing term.
    for kind, m in (("rain", 1.0), ("point", 1.0)):
        est = mc.relative_variance(m, 0.0, kind)
        x = np.pi * m
        gue = (ALPHA[kind] - 1 + -np.expm1(-2 * x) / (2 * x)) / x
        assert abs(gue - est.value) > 3 * est.stderr


@pytest.mark.parametrize(
    ("m", "width"),
    [(0.3, 1.0), (0.3, 5.0), (1.0, 3.0), (1.0, 20.0), (3.0, 10.0), (10.0, 30.0)],
)
@pytest.mark.parametrize("kind", ["point", "rain"])
def test_band_average_goe_vs_monte_carlo(m: float, width: float, kind: str) -> None:
    # Band-averaged energy (Langley & Brown 2004b formulation), point-driven and
    # rain-on-the-roof. Observed: |deviation| <= 2.5 % with standard errors 0.9-2.3 %.
    est = mc.relative_variance(m, width, kind)
    _check(float(v.relative_variance_band(m, width, alpha=ALPHA[kind])), est)


@pytest.mark.parametrize(("m", "width"), [(0.3, 0.0), (1.0, 0.0), (0.3, 5.0), (1.0, 20.0)])
def test_poisson_spacing_vs_monte_carlo(m: float, width: float) -> None:
    # Poisson natural frequencies (Lyon 1969): single frequency alpha / (pi m).
    est = mc.relative_variance(m, width, "point", spacing="poisson")
    pred = float(v.relative_variance_band(m, width, alpha=3.0, spacing="poisson"))
    _check(pred, est)
    if width == 0.0:
        assert pred == pytest.approx(3.0 / (np.pi * m), rel=1e-12)


def test_poisson_resolved_modes_limit() -> None:
    # Poisson, m -> 0: the band energy counts a Poisson number of modes with coefficients a:
    # Var = B E[a^2], mean = B E[a]  ->  r^2 = alpha / B (compound Poisson; Feller 1968,
    # An Introduction to Probability Theory, vol. 1, XII.2).
    for width in (0.5, 4.0):
        r2 = v.relative_variance_band(1e-7, width, alpha=3.0, spacing="poisson")
        assert r2 == pytest.approx(3.0 / width, rel=1e-5)


def test_single_mode_limit() -> None:
    # m -> 0 and B -> 0: a GOE band holds at most one mode (level repulsion), with probability
    # B; the energy is a single a_j or nothing: E = B E[a], E[E^2] = B E[a^2], so
    # r^2 = alpha / B - 1 (Bernoulli count; Mehta 2004: Sigma_2(B) = B - B^2 + O(B^3)).
    # (m must be far below B^2: the Lorentzian tails add about alpha m ln(B / m) / B^2.)
    for width in (0.01, 0.05):
        r2 = float(v.relative_variance_band(1e-10, width, alpha=3.0))
        assert r2 == pytest.approx(3.0 / width - 1.0, abs=0.05)
    # Monte Carlo at small overlap and a narrow band: the same estimate to its error
    est = mc.relative_variance(0.05, 0.5, "point")
    _check(float(v.relative_variance_band(0.05, 0.5, alpha=3.0)), est)


def test_resolved_modes_limit_is_number_variance() -> None:
    # m -> 0: r^2 = (alpha - 1) / B + Sigma_2(B) / B^2 with the GOE number variance, large-B
    # form Sigma_2(B) = (2 / pi^2) (ln(2 pi B) + gamma + 1 - pi^2 / 8) (Mehta 2004, ch. 16;
    # Dyson & Mehta 1963; from memory, corrections O(1/B)).
    width = 40.0
    sigma2 = 2 / np.pi**2 * (np.log(2 * np.pi * width) + np.euler_gamma + 1 - np.pi**2 / 8)
    r2 = float(v.relative_variance_band(1e-6, width, alpha=1.0))
    assert r2 == pytest.approx(sigma2 / width**2, rel=0.02)


def test_high_overlap_variance_vanishes() -> None:
    # m -> infinity: r^2 -> (alpha - 1) / (pi m) + 1 / (pi m)^2 (single frequency,
    # asymptotic form of Langley & Brown 2004a; the unitary-ensemble value would be
    # 1 / (2 (pi m)^2) in the second term) -> 0; band averaging lowers it further.
    m = np.array([30.0, 100.0, 1000.0])
    r2 = va.relative_variance_goe(m, alpha=3.0)
    np.testing.assert_allclose(r2, 2 / (np.pi * m) + 1 / (np.pi * m) ** 2, rtol=1e-4)
    band = v.relative_variance_band(m, 50.0, alpha=3.0)
    assert np.all(band < r2) and np.all(np.diff(band) < 0) and band[-1] < 1e-3


def test_band_zero_width_equals_single_frequency() -> None:
    # the numerical band form at B = 0 against the closed form (independent evaluation)
    m = np.geomspace(0.01, 1000.0, 25)
    for alpha in (1.0, 3.0):
        np.testing.assert_allclose(
            v.relative_variance_band(m, 0.0, alpha=alpha),
            va.relative_variance_goe(m, alpha=alpha),
            rtol=1e-9,
        )


def test_band_quadrature_against_adaptive_integration() -> None:
    # numerical accuracy of the composite rule: scipy's adaptive quad on the same integrand
    for m, width in ((0.1, 0.5), (1.0, 10.0), (0.5, 100.0)):

        def f(k: float, m: float = m, width: float = width) -> float:
            return float(
                (3.0 - v.goe_form_factor(k)) * np.exp(-2 * np.pi * m * k) * np.sinc(k * width) ** 2
            )

        edges = np.concatenate([[0.0], np.geomspace(1e-4, 1e4, 300)])
        ref = 2 * sum(
            integrate.quad(f, a, b, limit=200)[0]
            for a, b in zip(edges[:-1], edges[1:], strict=True)
        )
        assert float(v.relative_variance_band(m, width)) == pytest.approx(ref, rel=1e-6)


def test_goe_form_factor_properties() -> None:
    # Mehta (2004), ch. 6: b(0) = 1, integral of b = Y_2(0) = 1, continuous at |k| = 1,
    # b(k) ~ 1 / (12 k^2) for large k.
    assert float(v.goe_form_factor(0.0)) == 1.0
    total = 2 * (
        integrate.quad(lambda k: float(v.goe_form_factor(k)), 0, 1)[0]
        + integrate.quad(lambda k: float(v.goe_form_factor(k)), 1, np.inf, limit=200)[0]
    )
    assert total == pytest.approx(1.0, abs=1e-8)
    assert float(v.goe_form_factor(1 - 1e-12)) == pytest.approx(
        float(v.goe_form_factor(1 + 1e-12)), abs=1e-9
    )
    assert float(v.goe_form_factor(1e3)) == pytest.approx(1 / 12e6, rel=1e-3)


def test_alpha_of_several_inputs() -> None:
    # P uncorrelated unit point forces on Gaussian mode shapes: a_j = chi^2_P / P,
    # E[a^2] / E[a]^2 = 1 + 2 / P (chi-square moments; Johnson, Kotz & Balakrishnan 1994,
    # ch. 18)
    np.testing.assert_allclose(v.alpha_point_forces([1, 2, 10]), [3.0, 2.0, 1.2])
    rng = np.random.default_rng(3)
    a = rng.chisquare(4, 400_000) / 4
    assert float(v.alpha_point_forces(4)) == pytest.approx(np.mean(a**2), rel=0.01)
    # sum of independent inputs: two equal point forces combine to two_points
    assert float(v.combined_alpha([1.0, 1.0], [3.0, 3.0])) == pytest.approx(2.0)
    assert float(v.combined_alpha([1.0, 0.0], [3.0, 1.0])) == pytest.approx(3.0)


@pytest.mark.parametrize(("m", "width"), [(0.3, 5.0), (1.0, 20.0), (3.0, 10.0), (10.0, 30.0)])
def test_gamma_quantiles_vs_monte_carlo(m: float, width: float) -> None:
    # The Gamma distribution with the predicted mean and variance against the Monte Carlo
    # quantiles of the band energy (point force). Observed: upper 95 % within 0.1 dB,
    # lower 5 % within 0.2 dB at these overlaps (within 0.9 dB at m = 1, B = 3; the Gamma
    # lower bound is conservative at large r^2; docs/theory/variance.md).
    est = mc.relative_variance(m, width, "point")
    q = 10 * np.log10(np.quantile(est.samples, [0.05, 0.95]) / est.samples.mean())
    pred = v.level_quantiles(
        v.relative_variance_band(m, width), [0.05, 0.95], distribution="gamma"
    )
    np.testing.assert_allclose(pred, q, atol=0.3)


def test_quantiles_of_known_distributions() -> None:
    # exponential (r^2 = 1): E_p = -ln(1 - p) E[E]; log-normal: closed form (JKB 1994)
    p = np.array([0.05, 0.5, 0.95])
    np.testing.assert_allclose(
        v.level_quantiles(1.0, p, distribution="gamma"), 10 * np.log10(-np.log1p(-p)), rtol=1e-10
    )
    s2 = np.log1p(0.5)
    np.testing.assert_allclose(
        v.level_quantiles(0.5, p, distribution="lognormal"),
        10 * np.log10(np.exp(-s2 / 2 + np.sqrt(s2) * special.ndtri(p))),
        rtol=1e-10,
    )
    assert np.all(v.level_quantiles(0.0, p) == 0.0)


def test_bad_input() -> None:
    for call, word in (
        (lambda: v.relative_variance_band(0.0, 1.0), "modal_overlap"),
        (lambda: v.relative_variance_band(1.0, -1.0), "modes_in_band"),
        (lambda: v.relative_variance_band(1.0, 1.0, alpha=0.5), "alpha"),
        (lambda: v.relative_variance_band(1.0, 1.0, spacing="gue"), "spacing"),  # type: ignore[arg-type]
        (lambda: v.level_quantiles(0.1, 1.0), "probabilities"),
        (lambda: v.alpha_point_forces(0.5), "count"),
    ):
        with pytest.raises(ValueError, match=word):
            call()


def _covariance(u: np.ndarray, m: float, alpha: float, spacing: float) -> np.ndarray:
    """Normalised covariance over a frequency lag u of a GOE modal response (the Fourier
    transform of [alpha - b(k)] exp(-2 pi m |k|), whose band average is equation (1) of
    relative_variance_band), by direct quadrature in k."""
    k = np.linspace(0.0, 12.0 / m, 6001)
    wk = np.full(k.size, k[1] - k[0])
    wk[[0, -1]] *= 0.5
    x = u / spacing
    b_part = 2.0 * (
        np.cos(2 * np.pi * np.outer(x, k))
        @ (v.goe_form_factor(k) * np.exp(-2 * np.pi * m * k) * wk)
    )
    return alpha * m / (np.pi * (m**2 + x**2)) - b_part


@pytest.mark.parametrize(
    ("modes", "overlap", "tol"),
    [
        ((10.0, 20.0), (1.0, 2.0), 0.15),
        ((10.0, 20.0), (0.5, 4.0), 0.15),
        ((30.0, 10.0), (1.0, 2.0), 0.15),
        ((10.0, 20.0), (0.5, 0.5), 0.15),
        ((5.0, 5.0), (1.0, 2.0), 0.15),
    ],
)
def test_product_term_against_covariance_integral(
    modes: tuple[float, float], overlap: tuple[float, float], tol: float
) -> None:
    # Independent numerical method: T = (1/D^2) int int c_X(f - f') c_Y(f - f') df df'
    # with both covariance functions computed by quadrature from the GOE form factor; the
    # closed form assumes a band wider than both half-power bandwidths (stated accuracy
    # 15 %; docs/theory/variance.md).
    width = 1.0
    u = np.linspace(-width, width, 1601)
    tri = np.clip(width - np.abs(u), 0.0, None) / width**2
    cx = _covariance(u, overlap[0], 9.0, width / modes[0])
    cy = _covariance(u, overlap[1], 3.0, width / modes[1])
    # the quadrature reproduces the band formula (checks the covariance functions)
    assert np.trapezoid(cx * tri, u) == pytest.approx(
        float(v.relative_variance_band(overlap[0], modes[0], alpha=9.0)), rel=1e-3
    )
    numeric = float(np.trapezoid(cx * cy * tri, u))
    n1, n2 = modes[0] / width, modes[1] / width
    f = 1.0
    closed = float(
        v.product_variance_band(f, width, n1, overlap[0] / (f * n1), n2, overlap[1] / (f * n2))
    )
    assert closed == pytest.approx(numeric, rel=tol)


def test_product_term_narrow_band_limit() -> None:
    # Goodman (1960): for independent X, Y at one frequency the product's relative variance
    # has the term r_X^2 r_Y^2; the closed form is capped there as the band narrows
    f, n1, n2, eta1, eta2 = 1000.0, 0.01, 0.02, 1e-4, 1e-4
    t = v.product_variance_band(f, np.array([1e-6, 1.0, 100.0]), n1, eta1, n2, eta2)
    single = va.relative_variance_goe(f * n1 * eta1, alpha=9.0) * va.relative_variance_goe(
        f * n2 * eta2, alpha=3.0
    )
    assert t[0] == pytest.approx(float(single)) and np.all(np.diff(t) <= 0)


def test_remembered_values_are_the_computed_ones() -> None:
    # relative_variance_band remembers the form-factor integral by (overlap, modes in band):
    # a repeated call, alone or mixed with new values, returns the same numbers bit for bit
    # as the integral computed afresh
    m = np.array([0.3, 1.0, 3.0])
    width = np.array([2.0, 10.0, 40.0])
    first = v.relative_variance_band(m, width)
    again = v.relative_variance_band(np.append(m, 0.7), np.append(width, 5.0))
    assert np.array_equal(again[:3], first)
    fresh = 2.0 * 3.0 * v._sinc2_exp_integral(2 * np.pi * m, np.pi * width) - 2.0 * (
        v._form_factor_integral(2 * np.pi * m, width)
    )
    assert np.array_equal(first, np.maximum(fresh, 0.0))
