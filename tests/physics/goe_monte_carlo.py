"""Random-matrix Monte Carlo used as the independent reference of the variance checks.

Natural frequencies: eigenvalues of the Gaussian orthogonal ensemble from the tridiagonal
model of Dumitriu & Edelman (2002, J. Math. Phys. 43(11), 5830-5847, beta = 1), unfolded to
unit mean spacing with the Wigner semicircle (Mehta 2004, Random Matrices, ch. 3). Poisson
natural frequencies: a uniform point process of unit density. Modal response of light
damping: a Lorentzian of half-width m/2 in units of the mean spacing. Energies are
evaluated exactly (band averages by the arctangent integral of the Lorentzian); modes
beyond the kept window add their ensemble mean (their variance contribution is below
1e-4 of the result for the overlaps used).

Nothing here calls seatool: it is the outside reference.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np
import numpy.typing as npt
from scipy.linalg import eigvalsh_tridiagonal

Array = npt.NDArray[np.float64]

SIZE = 300  # GOE matrix size
HALF_WINDOW = 100.0  # eigenvalues kept within +-HALF_WINDOW of the centre (unfolded)
EVAL_HALF = 50.0  # evaluation points within +-EVAL_HALF


@lru_cache(maxsize=4)
def goe_spectra(draws: int, seed: int) -> tuple[Array, ...]:
    """``draws`` unfolded GOE spectra (unit mean spacing), centred, within the window."""
    rng = np.random.default_rng(seed)
    radius = np.sqrt(2.0 * SIZE)
    out = []
    for _ in range(draws):
        diag = rng.normal(0.0, 1.0, SIZE)
        off = np.sqrt(rng.chisquare(np.arange(SIZE - 1, 0, -1))) / np.sqrt(2.0)
        lam = np.clip(eigvalsh_tridiagonal(diag, off) / radius, -1.0, 1.0)
        u = SIZE * (lam * np.sqrt(1.0 - lam**2) + np.arcsin(lam)) / np.pi  # centred
        out.append(u[np.abs(u) <= HALF_WINDOW])
    return tuple(out)


@lru_cache(maxsize=4)
def poisson_spectra(draws: int, seed: int) -> tuple[Array, ...]:
    """``draws`` uniform (Poisson) spectra of unit density on the window."""
    rng = np.random.default_rng(seed)
    out = []
    for _ in range(draws):
        count = rng.poisson(2 * HALF_WINDOW)
        out.append(np.sort(rng.uniform(-HALF_WINDOW, HALF_WINDOW, count)))
    return tuple(out)


def modal_coefficients(rng: np.random.Generator, size: int, kind: str) -> Array:
    """Modal excitation coefficients a_j with E[a] = 1.

    ``point``: a = g^2, g standard normal (a point force on Gaussian mode shapes,
    E[a^2] = 3); ``two_points``: mean of two independent g^2 (two uncorrelated point
    forces, E[a^2] = 2); ``plate``: product of two 2 sin^2 with uniform phases (a point
    force on sin x sin plate modes, E[a^2] = 9/4); ``rain``: a = 1 (rain-on-the-roof).
    """
    if kind == "point":
        return rng.standard_normal(size) ** 2
    if kind == "two_points":
        return (rng.standard_normal(size) ** 2 + rng.standard_normal(size) ** 2) / 2.0
    if kind == "plate":
        t = rng.uniform(0, np.pi, (2, size))
        return np.asarray(4.0 * np.sin(t[0]) ** 2 * np.sin(t[1]) ** 2)
    if kind == "rain":
        return np.ones(size)
    raise ValueError(kind)


def _f(z: Array, g: float) -> Array:
    """Antiderivative of arctan(z / g) in z."""
    return np.asarray(z * np.arctan(z / g) - 0.5 * g * np.log(z**2 + g**2))


def band_energy(x: Array, u: Array, a: Array, m: float, width: float) -> Array:
    """Energy averaged over [x, x + width] (width 0: at x) of modes at u with coefficients a,
    normalised so that its ensemble mean is 1; the modes outside the window add their mean."""
    g = m / 2.0
    lo, hi, far = -HALF_WINDOW, HALF_WINDOW, 1e7
    d = x[:, None] - u[None, :]
    if width == 0.0:
        e = (a / (d**2 + g**2)).sum(axis=1)
        tail = (np.arctan((far - x) / g) - np.arctan((hi - x) / g)) / g + (
            np.arctan((x - lo) / g) * -1 + np.arctan((x + far) / g)
        ) / g
        return np.asarray((e + tail) * g / np.pi)
    e = ((np.arctan((d + width) / g) - np.arctan(d / g)) * a).sum(axis=1) / (g * width)

    def outside(y1: float, y2: float) -> Array:
        # int_{y1}^{y2} [arctan((x + w - y) / g) - arctan((x - y) / g)] dy
        return np.asarray(
            _f(x + width - y1, g) - _f(x + width - y2, g) - _f(x - y1, g) + _f(x - y2, g)
        )

    tail = (outside(-far, lo) + outside(hi, far)) / (g * width)
    return np.asarray((e + tail) * g / np.pi)


@dataclass(frozen=True)
class Estimate:
    """Relative variance from the Monte Carlo with its standard error (delta method over
    independent draws; points of one draw are correlated and are kept together)."""

    value: float
    stderr: float
    samples: Array  # pooled samples (normalised energies)


def relative_variance(
    m: float,
    width: float,
    kind: str,
    *,
    spacing: str = "goe",
    draws: int = 1500,
    seed: int = 7,
) -> Estimate:
    """Ensemble relative variance Var[E] / E[E]^2 of the (band-averaged) energy."""
    spectra = goe_spectra(draws, seed) if spacing == "goe" else poisson_spectra(draws, seed)
    rng = np.random.default_rng(seed + 1000)
    step = max(4.0, 2.0 * m, width + 4.0)
    x = np.arange(-EVAL_HALF, EVAL_HALF - width + 1e-9, step)
    s1 = np.empty(draws)
    s2 = np.empty(draws)
    pooled = []
    for i, u in enumerate(spectra):
        e = band_energy(x, u, modal_coefficients(rng, u.size, kind), m, width)
        s1[i], s2[i] = e.mean(), (e**2).mean()
        pooled.append(e)
    mu1, mu2 = s1.mean(), s2.mean()
    r2 = mu2 / mu1**2 - 1.0
    grad = np.array([-2.0 * mu2 / mu1**3, 1.0 / mu1**2])
    cov = np.cov(np.vstack([s1, s2])) / draws
    return Estimate(float(r2), float(np.sqrt(grad @ cov @ grad)), np.concatenate(pooled))
