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


def point_response(draws: int, seed: int, *, m: float, modes: float) -> dict[str, Array]:
    """Band averages of the squared transfer receptance between two points of one random
    subsystem, |sum_j phi_j(x_1) phi_j(x_2) / (w_j^2 - w^2 + i eta w w_j)|^2, and of its
    modal energy sum (the same with the cross-modal terms left out), for GOE natural
    frequencies and Gaussian mode shapes; band 2 % of 1 kHz holding ``modes`` natural
    frequencies, sampled at a sixth of the half-power bandwidth."""
    rng = np.random.default_rng(seed)
    wc = 2 * np.pi * 1000.0
    dw = 0.02 * wc
    d = dw / modes
    eta = m * d / wc
    w = np.linspace(wc - dw / 2, wc + dw / 2, int(np.ceil(6 * dw / (m * d / 2))))[:, None]
    cross, energy = np.empty(draws), np.empty(draws)
    for t in range(draws):
        wj = wc + d * goe(rng, 70.0)
        c = rng.standard_normal(wj.size) * rng.standard_normal(wj.size)
        h = 1.0 / (wj**2 - w**2 + 1j * eta * w * wj)
        cross[t] = np.mean(np.abs((c * h).sum(1)) ** 2)
        energy[t] = np.mean((c**2 * np.abs(h) ** 2).sum(1))
    return {"cross": cross, "energy": energy}


def plate_cavity(
    draws: int,
    seed: int,
    *,
    overlap: tuple[float, float] = (1.0, 1.0),
    modes: tuple[float, float] = (6.0, 10.0),
    coupling: float = 0.002,
    pad: float = 15.0,
) -> dict[str, Array]:
    """Band energies of a point-driven plate (1) coupled over its surface to a cavity (2).

    Both have GOE natural frequencies and random mode shapes; the coupling coefficient of
    plate mode j and cavity mode k (the overlap integral of the two shapes over the plate)
    is taken as a zero-mean Gaussian variable, independent between pairs of modes (a sum
    over many uncorrelated wavelength-sized patches; common practice in random-matrix
    models of coupled systems). Mass-normalised modal equations with viscous-type damping
    and a stiffness-type coupling matrix ``coupling * omega_c^2 * G``; modes within ``pad``
    mean spacings of the band are kept. The band is 2 % of the 1 kHz centre wide, sampled
    at a third of the half-power bandwidth. Per frequency the cavity is eliminated exactly
    (its block is diagonal): (D1 - C D2^-1 C^T) q1 = phi, q2 = -D2^-1 C^T q1.

    Also returned: ``alpha_within``, the mean over draws of E_k[a_k^2] / E_k[a_k]^2 of the
    modal loadings a_k of the cavity modes resonant in the inner 60 % of the band (|F_k|^2
    averaged over the mode's resonance, F = C^T q1): the cavity's loading statistics
    (rain-on-the-roof would give 1).
    """
    rng = np.random.default_rng(seed)
    wc = 2 * np.pi * 1000.0
    dw = 0.02 * wc
    d1, d2 = dw / modes[0], dw / modes[1]
    eta1, eta2 = overlap[0] * d1 / wc, overlap[1] * d2 / wc
    half_bw = min(overlap[0] * d1, overlap[1] * d2) / 2
    w = np.linspace(wc - dw / 2, wc + dw / 2, int(np.ceil(3 * dw / half_bw)))
    e1, e2, p_in = np.empty(draws), np.empty(draws), np.empty(draws)
    a_ratio = np.full(draws, np.nan)
    for t in range(draws):
        w1 = wc + d1 * goe(rng, modes[0] / 2 + pad)
        w2 = wc + d2 * goe(rng, modes[1] / 2 + pad)
        phi = rng.standard_normal(w1.size)
        c = rng.standard_normal((w1.size, w2.size)) * coupling * wc**2
        den1 = w1**2 - w[:, None] ** 2 + 1j * eta1 * w[:, None] * w1
        den2 = w2**2 - w[:, None] ** 2 + 1j * eta2 * w[:, None] * w2
        schur = -(c[None] / den2[:, None, :]) @ c.T
        schur[:, np.arange(w1.size), np.arange(w1.size)] += den1
        rhs = np.broadcast_to(phi, (w.size, w1.size))[..., None]
        q1 = np.linalg.solve(schur, rhs)[..., 0]
        q2 = -(q1 @ c) / den2
        inner = np.abs(w2 - wc) < 0.3 * dw
        if np.count_nonzero(inner) > 1:
            wt = 1.0 / np.abs(den2[:, inner]) ** 2
            ak = (np.abs(q1 @ c[:, inner]) ** 2 * wt).sum(0) / wt.sum(0)
            a_ratio[t] = (ak**2).mean() / ak.mean() ** 2
        e1[t] = np.mean(0.5 * w**2 * (np.abs(q1) ** 2).sum(1))
        e2[t] = np.mean(0.5 * w**2 * (np.abs(q2) ** 2).sum(1))
        p_in[t] = np.mean(0.5 * np.real(1j * w * (phi * q1).sum(1)))
    return {
        "E1": e1,
        "E2": e2,
        "P": p_in,
        "eta": np.array([eta1, eta2]),
        "n": np.array([1 / d1, 1 / d2]) * 2 * np.pi,
        "wc": np.array(wc),
        "dw": np.array(dw),
        "alpha_within": np.array(np.nanmean(a_ratio)),
    }
