"""Single-degree-of-freedom resonators: natural frequency, band fraction, modal density.

All functions are pure and vectorised: array arguments broadcast against each other and
the result has the broadcast shape. SI units throughout. Modal densities are in modes per
hertz, ``n(f) = 2*pi*n(omega)``.

The formulas and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive

__all__ = [
    "resonator_band_fraction",
    "resonator_modal_density",
    "resonator_natural_frequency",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


# ---------------------------------------------------------------------------------------
# single-degree-of-freedom resonator
# ---------------------------------------------------------------------------------------
def resonator_natural_frequency(mass: npt.ArrayLike, stiffness: npt.ArrayLike) -> FloatArray:
    """Natural frequency of a mass-spring resonator, f0 = sqrt(k / m) / (2 pi) [Hz].

    Parameters
    ----------
    mass : float or array_like
        Mass [kg].
    stiffness : float or array_like
        Spring stiffness [N/m].

    Returns
    -------
    numpy.ndarray
        f0 [Hz].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 3 (resonators).
    """
    m = _positive("mass", mass)
    k = _positive("stiffness", stiffness)
    return np.asarray(np.sqrt(k / m) / (2.0 * np.pi), dtype=np.float64)


def resonator_band_fraction(
    f_lower: npt.ArrayLike,
    f_upper: npt.ArrayLike,
    natural_frequency: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
) -> FloatArray:
    """Fraction of one damped mode that falls in a frequency band (Lorentzian).

    Parameters
    ----------
    f_lower, f_upper : float or array_like
        Band edges [Hz], f_lower < f_upper.
    natural_frequency : float or array_like
        Natural frequency f0 [Hz].
    loss_factor : float or array_like
        Damping loss factor eta [-], > 0.

    Returns
    -------
    numpy.ndarray
        (1/pi) [atan(2 (f_u - f0) / (eta f0)) - atan(2 (f_l - f0) / (eta f0))], between 0
        and 1.

    Notes
    -----
    A lightly damped mode spreads its response over a Lorentzian (Cauchy) line of
    half-power bandwidth eta f0 around f0: the smoothed modal density of one mode is
    n(f) = (1/pi) (eta f0 / 2) / ((f - f0)^2 + (eta f0 / 2)^2), which integrates to one
    mode. The band fraction is its integral over the band. Close to the peak it equals
    the normalised band-integrated mean-square response of the resonator to a white
    force spectrum; far from the peak the true response tail decays faster.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 3 (single
       resonators as SEA elements; half-power bandwidth of a mode; from memory).
    """
    fl = _nonnegative("f_lower", f_lower)
    fu = _positive("f_upper", f_upper)
    if np.any(fu <= fl):
        msg = "f_upper must be larger than f_lower"
        raise ValueError(msg)
    f0 = _positive("natural_frequency", natural_frequency)
    eta = _positive("loss_factor", loss_factor)
    half = 0.5 * eta * f0
    frac = (np.arctan((fu - f0) / half) - np.arctan((fl - f0) / half)) / np.pi
    return np.asarray(frac, dtype=np.float64)


def resonator_modal_density(
    f_lower: npt.ArrayLike,
    f_upper: npt.ArrayLike,
    natural_frequency: npt.ArrayLike,
    *,
    loss_factor: npt.ArrayLike | None = None,
) -> FloatArray:
    """Band-averaged modal density of a single resonator [modes/Hz].

    Parameters
    ----------
    f_lower, f_upper : float or array_like
        Band edges [Hz].
    natural_frequency : float or array_like
        Natural frequency f0 [Hz].
    loss_factor : float or array_like, optional
        If given, the smooth Lorentzian option: n = :func:`resonator_band_fraction` /
        (f_upper - f_lower). If omitted, the sharp option: n = 1 / (f_upper - f_lower)
        when f_lower <= f0 < f_upper, else 0.

    Returns
    -------
    numpy.ndarray
        Modal density per band [modes/Hz]; summed times bandwidth over contiguous bands
        it gives one mode (sharp option) or slightly less than one (the Lorentzian tails
        beyond the outer bands).

    Notes
    -----
    A resonator holds energy only around f0. Treating it as an SEA subsystem needs a
    modal density in every band; the sharp option puts its single mode in the band
    holding f0. The smooth option avoids a jump when f0 sits near a band edge.
    Zero modal density means no SEA energy can be stored: the caller must drop the
    resonator from the power balance in those bands (or use the smooth option).

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 3 (from memory).
    """
    fl = _nonnegative("f_lower", f_lower)
    fu = _positive("f_upper", f_upper)
    if np.any(fu <= fl):
        msg = "f_upper must be larger than f_lower"
        raise ValueError(msg)
    f0 = _positive("natural_frequency", natural_frequency)
    bw = fu - fl
    if loss_factor is None:
        inside = (f0 >= fl) & (f0 < fu)
        return np.asarray(np.where(inside, 1.0 / bw, 0.0), dtype=np.float64)
    frac = resonator_band_fraction(fl, fu, f0, loss_factor)
    return np.asarray(frac / bw, dtype=np.float64)
