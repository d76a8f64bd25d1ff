"""Random-matrix Monte Carlo of coupled subsystems: the outside reference of the built-up
variance and distribution checks (tests/test_confidence*.py).

Natural frequencies: Gaussian orthogonal ensemble from the tridiagonal model of Dumitriu &
Edelman (2002, J. Math. Phys. 43(11), 5830-5847, beta = 1), unfolded to unit mean spacing
with the Wigner semicircle (Mehta 2004, Random Matrices, ch. 3). Mode shapes at points:
independent standard normal values (mass-normalised, Gaussian mode shapes). Coupled modal
equations are solved exactly per frequency line and the energies averaged over the band.

Nothing here calls seatool.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt
from scipy.linalg import eigvalsh_tridiagonal

Array = npt.NDArray[np.float64]


def goe(rng: np.random.Generator, half: float, size: int = 200) -> Array:
    """GOE eigenvalues unfolded to unit mean spacing with the semicircle, centred, within
    +-half (``half`` at most 0.35 ``size``: the unfolding stays away from the edges)."""
    radius = np.sqrt(2.0 * size)
    diag = rng.normal(0.0, 1.0, size)
    off = np.sqrt(rng.chisquare(np.arange(size - 1, 0, -1))) / np.sqrt(2.0)
    lam = np.clip(eigvalsh_tridiagonal(diag, off) / radius, -1.0, 1.0)
    u = size * (lam * np.sqrt(1.0 - lam**2) + np.arcsin(lam)) / np.pi
    return np.asarray(u[np.abs(u) <= half])


def point_junction(
    draws: int,
    seed: int,
    *,
    m: tuple[float, float],
    modes: tuple[float, float],
    spring: float,
    half: float = 70.0,
) -> dict[str, Array]:
    """Two random subsystems (GOE natural frequencies, Gaussian mass-normalised mode shapes)
    joined by a point spring, unit point force on subsystem 1. Receptances are modal sums
    with hysteretic damping; the spring force follows exactly from the two point
    receptances (a rank-one coupling). Band energies E = (omega^2 / 2) sum |q_j|^2 are
    averaged over a narrow band (2 % of the 1 kHz centre) holding ``modes`` natural
    frequencies of each subsystem, sampled at a third of the half-power bandwidth; modes
    within ``half`` mean spacings of the centre are kept."""
    rng = np.random.default_rng(seed)
    wc = 2 * np.pi * 1000.0
    dw = 0.02 * wc
    d1, d2 = dw / modes[0], dw / modes[1]
    eta1, eta2 = m[0] * d1 / wc, m[1] * d2 / wc
    half_bw = min(m[0] * d1, m[1] * d2) / 2
    w = np.linspace(wc - dw / 2, wc + dw / 2, int(np.ceil(3 * dw / half_bw)))[:, None]
    e1, e2, p_in = np.empty(draws), np.empty(draws), np.empty(draws)
    for t in range(draws):
        w1, w2 = wc + d1 * goe(rng, half), wc + d2 * goe(rng, half)
        p0, pc1 = rng.standard_normal((2, w1.size))
        pc2 = rng.standard_normal(w2.size)
        den1 = w1**2 - w**2 + 1j * eta1 * w * w1
        den2 = w2**2 - w**2 + 1j * eta2 * w * w2
        g10 = (pc1 * p0 / den1).sum(1)
        fs = spring * g10 / (1 + spring * ((pc1**2 / den1).sum(1) + (pc2**2 / den2).sum(1)))
        q1 = (p0 - pc1 * fs[:, None]) / den1
        q2 = pc2 * fs[:, None] / den2
        u0 = (p0 * q1).sum(1)
        e1[t] = np.mean(0.5 * w[:, 0] ** 2 * (np.abs(q1) ** 2).sum(1))
        e2[t] = np.mean(0.5 * w[:, 0] ** 2 * (np.abs(q2) ** 2).sum(1))
        p_in[t] = np.mean(0.5 * np.real(1j * w[:, 0] * u0))
    return {
        "E1": e1,
        "E2": e2,
        "P": p_in,
        "eta": np.array([eta1, eta2]),
        "n": np.array([1 / d1, 1 / d2]) * 2 * np.pi,
        "wc": np.array(wc),
        "dw": np.array(dw),
    }


def rel_var(x: Array) -> tuple[float, float]:
    """Relative variance and its delta-method standard error over independent draws."""
    mu1, mu2 = x.mean(), (x**2).mean()
    grad = np.array([-2 * mu2 / mu1**3, 1 / mu1**2])
    cov = np.cov(np.vstack([x, x**2])) / x.size
    return float(mu2 / mu1**2 - 1), float(np.sqrt(grad @ cov @ grad))


def level_quantiles(
    x: Array, probabilities: tuple[float, ...], *, groups: int = 1, boot: int = 400, seed: int = 0
) -> tuple[Array, Array]:
    """Quantiles of 10 lg(x / mean x) [dB] and their bootstrap standard errors.

    ``x`` holds ``groups`` consecutive samples per independent draw (points of one draw are
    correlated): the bootstrap resamples whole draws (Efron & Tibshirani 1993, An
    Introduction to the Bootstrap, ch. 6; from memory)."""
    p = np.asarray(probabilities)
    xs = x.reshape(-1, groups)

    def q(sample: Array) -> Array:
        flat = sample.ravel()
        return np.asarray(10 * np.log10(np.quantile(flat, p) / flat.mean()))

    rng = np.random.default_rng(seed)
    reps = np.array([q(xs[rng.integers(0, xs.shape[0], xs.shape[0])]) for _ in range(boot)])
    return q(xs), reps.std(axis=0, ddof=1)
