"""Tests of seatool.physics.resonators against independent methods and published tables."""

from __future__ import annotations

import numpy as np
import pytest
from scipy import integrate

from seatool.physics import resonators


def third_octave_bands(k_lo: int, k_hi: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Exact base-10 1/3-octave mid-band frequencies 10^(k/10) and edges (IEC 61260-1)."""
    k = np.arange(k_lo, k_hi + 1)
    fm = 10.0 ** (k / 10.0)
    return fm, fm * 10.0**-0.05, fm * 10.0**0.05


# ---------------------------------------------------------------------------------------
# resonator
# ---------------------------------------------------------------------------------------
def test_resonator_natural_frequency() -> None:
    # independent: eigenvalue of the 1-DOF system K x = omega^2 M x via numpy.linalg
    m, k = 2.5, 4.0e6
    w2 = np.linalg.eigvals(np.array([[k / m]]))[0]
    assert resonators.resonator_natural_frequency(m, k) == pytest.approx(np.sqrt(w2) / (2 * np.pi))


def test_resonator_sharp_modal_density_holds_one_mode() -> None:
    fm, lo, hi = third_octave_bands(20, 30)
    n = resonators.resonator_modal_density(lo, hi, 333.0)
    assert np.sum(n * (hi - lo)) == pytest.approx(1.0)
    assert np.count_nonzero(n) == 1
    assert lo[n > 0][0] <= 333.0 < hi[n > 0][0]


def test_resonator_lorentzian_fraction_vs_numerical_response_integral() -> None:
    # independent: band integral of the mean-square velocity of a viscously damped SDOF
    # under a white force spectrum, |Y|^2 = w^2 / ((k - m w^2)^2 + (c w)^2), normalised
    # by its integral over all frequencies; c = eta sqrt(k m) gives loss factor eta at f0.
    m, k, eta = 1.0, (2 * np.pi * 500.0) ** 2, 0.02
    f0 = float(resonators.resonator_natural_frequency(m, k))
    c = eta * np.sqrt(k * m)

    def y2(f: float) -> float:
        w = 2 * np.pi * f
        return w**2 / ((k - m * w**2) ** 2 + (c * w) ** 2)

    total = integrate.quad(y2, 0, np.inf, points=None, limit=500)[0]
    fm, lo, hi = third_octave_bands(25, 29)  # 316 ... 794 Hz; f0 in the 500 Hz band
    for x, y in zip(lo, hi, strict=True):
        num = integrate.quad(y2, x, y, points=[f0] if x < f0 < y else None, limit=200)[0] / total
        frac = float(resonators.resonator_band_fraction(x, y, f0, eta))
        assert frac == pytest.approx(num, abs=0.01, rel=0.2)
    # adjacent bands: smooth option sums to (almost) one mode
    fm, lo, hi = third_octave_bands(10, 40)
    n = resonators.resonator_modal_density(lo, hi, f0, loss_factor=eta)
    # missing Lorentzian tails outside 10 Hz ... 10 kHz: (eta f0 / 2 pi) (1/490 + 1/9500)
    assert np.sum(n * (hi - lo)) == pytest.approx(1.0, abs=4e-3)
    assert np.sum(n * (hi - lo)) < 1.0


def test_resonator_smooth_option_continuous_at_band_edge() -> None:
    # f0 just below / above a band edge: sharp option jumps, smooth option does not
    lo, hi = 891.25, 1122.0
    n_lo = resonators.resonator_modal_density(lo, hi, lo * (1 - 1e-6), loss_factor=0.05)
    n_hi = resonators.resonator_modal_density(lo, hi, lo * (1 + 1e-6), loss_factor=0.05)
    assert n_lo == pytest.approx(n_hi, rel=1e-4)
    assert resonators.resonator_modal_density(lo, hi, lo * (1 - 1e-6)) == 0.0
