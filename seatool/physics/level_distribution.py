"""The distribution assumed for an ensemble of band energies with a given mean and relative
variance: level quantiles and random draws (log-normal by default, Gamma available).

The evidence for the choice (random-matrix Monte Carlo quantiles) is in
:func:`level_quantiles` and docs/theory/variance.md, section 3.
"""

from __future__ import annotations

from typing import Literal

import numpy as np
import numpy.typing as npt
from scipy import special

from ._checks import nonnegative as _nonnegative

__all__ = ["DISTRIBUTION", "energy_ratio_samples", "level_quantiles"]

FloatArray = npt.NDArray[np.float64]

_RATIO_FLOOR = 1e-30

#: Distribution assumed for a band energy with a given mean and relative variance when it is
#: turned into level quantiles or drawn: log-normal (the evidence is in
#: :func:`level_quantiles` and docs/theory/variance.md, section 3).
DISTRIBUTION: Literal["lognormal"] = "lognormal"


def level_quantiles(
    relative_variance: npt.ArrayLike,
    probabilities: npt.ArrayLike,
    *,
    distribution: Literal["gamma", "lognormal"] = DISTRIBUTION,
) -> FloatArray:
    """Level quantiles relative to the level of the mean energy [dB].

    Parameters
    ----------
    relative_variance : float or array_like
        r^2 = Var[E] / E[E]^2 [-], >= 0.
    probabilities : float or array_like
        Probabilities in (0, 1); a new trailing axis is added when it is an array (the
        result has shape ``r2.shape + p.shape``).
    distribution : {'lognormal', 'gamma'}, optional
        Distribution of the energy with mean E[E] and relative variance r^2: log-normal
        (default, :data:`DISTRIBUTION`) or Gamma with shape 1 / r^2.

    Returns
    -------
    numpy.ndarray
        10 lg(E_p / E[E]) [dB]: add to the SEA (mean) level to get the level that the
        energy of a fraction p of the ensemble stays below. 0 where r^2 = 0; floored
        at -300 dB.

    Notes
    -----
    Log-normal: E_p / E[E] = exp(-s^2 / 2 + s z_p), s^2 = ln(1 + r^2), z_p the standard
    normal quantile; Gamma: E_p / E[E] = r^2 P^-1(1 / r^2, p) (regularised incomplete
    gamma function inverse). Both have the given mean and variance; they differ in the
    tails. Against the random-matrix Monte Carlo of point-driven band energies and of a
    subsystem driven through a point junction (docs/theory/variance.md, section 3;
    tests/test_confidence_distribution.py) the upper 95 % quantile of either is within
    about 1 dB, but where r^2 >= 1 the Gamma lower 5 % quantile is far too low (at
    r^2 = 3 for one subsystem -36 dB against -15 dB simulated, 6-65 dB low for subsystems
    driven through a junction; its shape 1 / r^2 < 1 puts a large probability at almost
    zero energy), while the log-normal one is within 0.4-1.7 dB for the driven-through
    subsystems and 2-4 dB too high for one subsystem with few modes; at r^2 = 0.3 the
    log-normal band is 0.8 dB narrow on the low side. A
    band energy of a built-up system is a product of factors along the path (source
    response, junction, receiver response), whose logarithm is a sum: the log-normal
    form is the limit of that product. The log-normal is therefore the default.

    References
    ----------
    .. [1] Johnson, N.L., Kotz, S., Balakrishnan, N. (1994). Continuous Univariate
       Distributions, vol. 1, 2nd ed., Wiley, ch. 14 (log-normal) and ch. 17 (gamma).
    .. [2] Langley, R.S., Cotoni, V. (2004). J. Acoust. Soc. Am. 115(2), 706-718
       (confidence bounds from the predicted mean and variance).
    """
    r2 = _nonnegative("relative_variance", relative_variance)
    p = np.asarray(probabilities, dtype=np.float64)
    if np.any((p <= 0) | (p >= 1)) or not np.all(np.isfinite(p)):
        msg = "probabilities must lie strictly between 0 and 1"
        raise ValueError(msg)
    _check_distribution(distribution)
    r2e = r2.reshape(r2.shape + (1,) * p.ndim)
    pos = r2e > 0
    safe = np.where(pos, r2e, 1.0)
    if distribution == "gamma":
        ratio = special.gammaincinv(1.0 / safe, p) * safe
    else:
        s2 = np.log1p(safe)
        ratio = np.exp(-0.5 * s2 + np.sqrt(s2) * special.ndtri(p))
    out = np.where(pos, 10.0 * np.log10(np.maximum(ratio, _RATIO_FLOOR)), 0.0)
    return np.asarray(out, dtype=np.float64)


def energy_ratio_samples(
    relative_variance: npt.ArrayLike,
    size: int,
    rng: np.random.Generator,
    *,
    distribution: Literal["gamma", "lognormal"] = DISTRIBUTION,
) -> FloatArray:
    """Random draws of E / E[E] for energies of the given relative variance [-].

    Parameters
    ----------
    relative_variance : float or array_like
        r^2 [-], >= 0 (shape S).
    size : int
        Number of draws (a new leading axis: the result has shape (size, *S)).
    rng : numpy.random.Generator
    distribution : {'lognormal', 'gamma'}, optional
        As :func:`level_quantiles` (default :data:`DISTRIBUTION`).

    Returns
    -------
    numpy.ndarray
        Draws with mean 1 and relative variance r^2 (1 where r^2 = 0).

    References
    ----------
    .. [1] Johnson, N.L., Kotz, S., Balakrishnan, N. (1994). Continuous Univariate
       Distributions, vol. 1, 2nd ed., Wiley, ch. 14 and ch. 17.
    """
    r2 = _nonnegative("relative_variance", relative_variance)
    _check_distribution(distribution)
    pos = r2 > 0
    safe = np.where(pos, r2, 1.0)
    shape = (int(size), *r2.shape)
    if distribution == "gamma":
        k = 1.0 / safe
        draws = rng.gamma(k, 1.0 / k, size=shape)
    else:
        s2 = np.log1p(safe)
        draws = np.exp(-0.5 * s2 + np.sqrt(s2) * rng.standard_normal(shape))
    return np.asarray(np.where(pos, draws, 1.0), dtype=np.float64)


def _check_distribution(distribution: str) -> None:
    if distribution not in ("gamma", "lognormal"):
        msg = f"distribution must be 'gamma' or 'lognormal', got {distribution!r}"
        raise ValueError(msg)
