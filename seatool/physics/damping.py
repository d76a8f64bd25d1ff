"""Damping of rooms and cavities: loss factor from decay, Sabine and Eyring, absorption.

All functions are pure and broadcast with numpy over frequency bands. Air absorption is in
:mod:`seatool.physics.air_absorption`, viscoelastic damping layers in
:mod:`seatool.physics.damping_layers`.

Contents
--------
* Loss factor <-> reverberation time (:func:`loss_factor_from_t60`, :func:`t60_from_loss_factor`).
* Sabine and Eyring reverberation time (:func:`sabine_t60`, :func:`eyring_t60`,
  :func:`reverberation_time` with the Sabine/Eyring switch).
* Cavity loss factor from absorption area or from per-surface absorption coefficients
  (:func:`cavity_loss_factor`, :func:`cavity_loss_factor_from_surfaces`), and the absorption
  area a cavity loss factor implies (:func:`absorption_area_from_loss_factor`).
"""

from __future__ import annotations

import math
from typing import Literal

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _non_negative
from ._checks import positive as _positive
from .air import AIR_SOUND_SPEED

__all__ = [
    "EYRING_THRESHOLD",
    "SABINE_CONSTANT",
    "absorption_area_from_loss_factor",
    "cavity_loss_factor",
    "cavity_loss_factor_from_surfaces",
    "eyring_t60",
    "loss_factor_from_t60",
    "reverberation_time",
    "sabine_t60",
    "t60_from_loss_factor",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

#: 24 ln(10) = 55.262 [-]: Sabine's constant in T60 = 24 ln(10) V / (c A).
SABINE_CONSTANT: float = 24.0 * math.log(10.0)

#: Mean absorption coefficient above which :func:`reverberation_time` uses Eyring's formula
#: (common practice; no single authoritative source).
EYRING_THRESHOLD: float = 0.2

_LN_1E6: float = math.log(1.0e6)


# ------------------------------------------------------------------------------------------
# input checks
# ------------------------------------------------------------------------------------------


def _fraction(name: str, value: npt.ArrayLike, *, upper_open: bool = False) -> FloatArray:
    arr = np.asarray(value, dtype=np.float64)
    bad_upper = arr >= 1.0 if upper_open else arr > 1.0
    if not np.all(np.isfinite(arr)) or np.any(arr < 0.0) or np.any(bad_upper):
        interval = "[0, 1)" if upper_open else "[0, 1]"
        msg = f"{name} must lie in {interval}, got {value!r}"
        raise ValueError(msg)
    return arr


# ------------------------------------------------------------------------------------------
# loss factor and reverberation time
# ------------------------------------------------------------------------------------------


def loss_factor_from_t60(
    f: npt.ArrayLike, t60: npt.ArrayLike, *, exact: bool = False
) -> FloatArray:
    """Loss factor from the 60 dB decay time of a resonant system.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    t60 : float or array_like
        Reverberation (60 dB decay) time [s].
    exact : bool, optional
        If True use ln(10^6)/(2 pi f T60) = 2.1988/(f T60); otherwise the rounded
        engineering form 2.2/(f T60) (default).

    Returns
    -------
    numpy.ndarray
        Loss factor eta [-].

    Notes
    -----
    Energy decays as exp(-eta omega t); a 60 dB fall (factor 10^6) takes
    T60 = ln(10^6)/(eta omega), hence eta = ln(10^6)/(2 pi f T60) ~= 2.2/(f T60).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005) Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 3 (loss factor and decay).
    .. [2] ISO 3382-2:2008, Acoustics -- Measurement of room acoustic parameters -- Part 2:
       Reverberation time in ordinary rooms (definition of T60 as the 60 dB decay time).
    """
    f_ = _positive("f", f)
    t = _positive("t60", t60)
    num = _LN_1E6 / (2.0 * math.pi) if exact else 2.2
    return np.asarray(num / (f_ * t), dtype=np.float64)


def t60_from_loss_factor(
    f: npt.ArrayLike, loss_factor: npt.ArrayLike, *, exact: bool = False
) -> FloatArray:
    """60 dB decay time of a resonant system with loss factor eta [s].

    Inverse of :func:`loss_factor_from_t60`: T60 = 2.2/(f eta) (or ln(10^6)/(2 pi f eta)).

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    loss_factor : float or array_like
        Loss factor eta [-].
    exact : bool, optional
        Use ln(10^6)/(2 pi) instead of 2.2.

    Returns
    -------
    numpy.ndarray
        Reverberation time [s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005) Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, ch. 3.
    """
    f_ = _positive("f", f)
    eta = _positive("loss_factor", loss_factor)
    num = _LN_1E6 / (2.0 * math.pi) if exact else 2.2
    return np.asarray(num / (f_ * eta), dtype=np.float64)


def sabine_t60(
    volume: npt.ArrayLike,
    absorption_area: npt.ArrayLike,
    *,
    air_attenuation: npt.ArrayLike = 0.0,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Sabine reverberation time.

    Parameters
    ----------
    volume : float or array_like
        Room or cavity volume V [m^3].
    absorption_area : float or array_like
        Equivalent absorption area A = sum S_i alpha_i of the boundaries [m^2].
    air_attenuation : float or array_like, optional
        Intensity attenuation constant of air m [1/m] (see :func:`air_attenuation_constant`);
        adds 4 m V to the absorption area. Default 0.
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        T60 [s].

    Notes
    -----
    T60 = 24 ln(10) V / (c0 (A + 4 m V)) = 55.26 V / (c0 (A + 4 m V)); with c0 = 343 m/s
    this is the familiar 0.161 V/A.

    References
    ----------
    .. [1] Sabine, W.C. (1900/1922) Collected Papers on Acoustics, Harvard University Press.
    .. [2] ISO 354:2003, Acoustics -- Measurement of sound absorption in a reverberation
       room, clause 8 (A = 55.3 V/(c T) - 4 V m).
    """
    v = _positive("volume", volume)
    a = _positive("absorption_area", absorption_area)
    m = _non_negative("air_attenuation", air_attenuation)
    _positive("c0", c0)
    return np.asarray(SABINE_CONSTANT * v / (c0 * (a + 4.0 * m * v)), dtype=np.float64)


def eyring_t60(
    volume: npt.ArrayLike,
    surface_area: npt.ArrayLike,
    mean_absorption: npt.ArrayLike,
    *,
    air_attenuation: npt.ArrayLike = 0.0,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Eyring (Norris–Eyring) reverberation time.

    Parameters
    ----------
    volume : float or array_like
        Volume V [m^3].
    surface_area : float or array_like
        Total boundary area S [m^2].
    mean_absorption : float or array_like
        Area-weighted mean absorption coefficient alpha_mean in [0, 1) [-].
    air_attenuation : float or array_like, optional
        Intensity attenuation constant of air m [1/m]. Default 0.
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        T60 [s].

    Notes
    -----
    T60 = 24 ln(10) V / (c0 (-S ln(1 - alpha_mean) + 4 m V)). For small alpha_mean,
    -ln(1 - alpha) ~= alpha and Sabine's formula is recovered.

    References
    ----------
    .. [1] Eyring, C.F. (1930) "Reverberation time in 'dead' rooms", J. Acoust. Soc. Am.
       1(2A), 217-241, doi:10.1121/1.1915175.
    """
    v = _positive("volume", volume)
    s = _positive("surface_area", surface_area)
    alpha = _fraction("mean_absorption", mean_absorption, upper_open=True)
    m = _non_negative("air_attenuation", air_attenuation)
    _positive("c0", c0)
    a_eff = -s * np.log1p(-alpha) + 4.0 * m * v
    with np.errstate(divide="ignore"):
        return np.asarray(SABINE_CONSTANT * v / (c0 * a_eff), dtype=np.float64)


def _mean_absorption(
    areas: npt.ArrayLike, alphas: npt.ArrayLike
) -> tuple[FloatArray, FloatArray, FloatArray]:
    s = _non_negative("areas", areas)
    a = _fraction("alphas", alphas)
    s, a = np.broadcast_arrays(s, a)
    total = np.sum(s, axis=-1)
    if np.any(total <= 0.0):
        msg = "areas must sum to a positive total surface area"
        raise ValueError(msg)
    absorption = np.sum(s * a, axis=-1)
    return total, absorption, absorption / total


def reverberation_time(
    volume: float,
    areas: npt.ArrayLike,
    alphas: npt.ArrayLike,
    *,
    method: Literal["auto", "sabine", "eyring"] = "auto",
    threshold: float = EYRING_THRESHOLD,
    air_attenuation: npt.ArrayLike = 0.0,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Reverberation time from per-surface areas and absorption coefficients.

    Parameters
    ----------
    volume : float
        Volume V [m^3].
    areas : array_like
        Surface areas S_i [m^2], last axis = surfaces.
    alphas : array_like
        Absorption coefficients alpha_i [-], broadcast against ``areas``; a 2-D array of
        shape (n_bands, n_surfaces) gives one T60 per band.
    method : {"auto", "sabine", "eyring"}, optional
        ``"auto"`` (default) uses Sabine when the mean absorption coefficient is at most
        ``threshold`` and Eyring above it.
    threshold : float, optional
        Switch value of the mean absorption coefficient (default 0.2, common practice).
    air_attenuation : float or array_like, optional
        Intensity attenuation constant of air m [1/m] per band.
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        T60 [s] per band (the surface axis is reduced).

    Notes
    -----
    Sabine's formula assumes a diffuse field and small absorption; for alpha_mean -> 1 it
    gives a finite T60 where Eyring's correctly tends to 0. Switching at alpha_mean = 0.2
    (where the two differ by ~11 %) is common practice, not a rule from a standard.

    References
    ----------
    .. [1] Sabine, W.C. (1922) Collected Papers on Acoustics, Harvard University Press.
    .. [2] Eyring, C.F. (1930) J. Acoust. Soc. Am. 1(2A), 217-241, doi:10.1121/1.1915175.
    """
    total, absorption, mean = _mean_absorption(areas, alphas)
    if method == "sabine":
        use_eyring = np.zeros_like(mean, dtype=bool)
    elif method == "eyring":
        use_eyring = np.ones_like(mean, dtype=bool)
    elif method == "auto":
        use_eyring = mean > threshold
    else:
        msg = f"method must be 'auto', 'sabine' or 'eyring', got {method!r}"
        raise ValueError(msg)
    t_sab = sabine_t60(volume, absorption, air_attenuation=air_attenuation, c0=c0)
    t_eyr = eyring_t60(volume, total, mean, air_attenuation=air_attenuation, c0=c0)
    return np.asarray(np.where(use_eyring, t_eyr, t_sab), dtype=np.float64)


def cavity_loss_factor(
    f: npt.ArrayLike,
    volume: npt.ArrayLike,
    absorption_area: npt.ArrayLike,
    *,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Damping loss factor of a diffuse acoustic cavity from its absorption area.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    volume : float or array_like
        Cavity volume V [m^3].
    absorption_area : float or array_like
        Equivalent absorption area A [m^2] (include 4 m V for air if wanted, or add
        :func:`air_absorption_loss_factor` separately).
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        eta_c = c0 A / (8 pi f V) = c0 A / (4 omega V) [-].

    Notes
    -----
    Power absorbed by the boundaries of a diffuse field, W = c0 A E / (4 V) (Sabine's
    theory), set equal to omega eta E.  Consistent with :func:`sabine_t60` and
    :func:`loss_factor_from_t60` with the exact constant: eta = ln(10^6)/(omega T60).

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995) Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5 (cavity loss factor).
    .. [2] Kuttruff, H. (2009) Room Acoustics, 5th ed., Spon Press, ISBN 978-0-415-48021-5,
       ch. 5 (energy balance of a diffuse field).
    """
    f_ = _positive("f", f)
    v = _positive("volume", volume)
    a = _non_negative("absorption_area", absorption_area)
    _positive("c0", c0)
    return np.asarray(c0 * a / (8.0 * math.pi * f_ * v), dtype=np.float64)


def absorption_area_from_loss_factor(
    f: npt.ArrayLike,
    volume: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
    *,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Equivalent absorption area implied by the loss factor of a diffuse cavity.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    volume : float or array_like
        Cavity volume V [m^3].
    loss_factor : float or array_like
        Damping loss factor of the cavity eta_c [-].
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        A = 8 pi f V eta_c / c0 [m^2]; divided by the boundary area S it is the mean
        absorption coefficient the loss factor implies (Sabine's picture).

    Notes
    -----
    The inverse of :func:`cavity_loss_factor`: the power absorbed by the boundaries of a
    diffuse field, W = c0 A E / (4 V), equals omega eta_c E, so

    .. math:: A = \\frac{4 \\omega V \\eta_c}{c_0} = \\frac{8 \\pi f V \\eta_c}{c_0}.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995) Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5 (cavity loss factor).
    .. [2] Kuttruff, H. (2009) Room Acoustics, 5th ed., Spon Press, ISBN 978-0-415-48021-5,
       ch. 5 (energy balance of a diffuse field).
    """
    f_ = _positive("f", f)
    v = _positive("volume", volume)
    eta = _non_negative("loss_factor", loss_factor)
    _positive("c0", c0)
    return np.asarray(8.0 * math.pi * f_ * v * eta / c0, dtype=np.float64)


def cavity_loss_factor_from_surfaces(
    f: npt.ArrayLike,
    volume: float,
    areas: npt.ArrayLike,
    alphas: npt.ArrayLike,
    *,
    method: Literal["auto", "sabine", "eyring"] = "sabine",
    threshold: float = EYRING_THRESHOLD,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Cavity loss factor from per-surface absorption coefficients.

    Parameters
    ----------
    f : float or array_like
        Band centre frequencies [Hz], shape (n_bands,) or scalar.
    volume : float
        Cavity volume [m^3].
    areas : array_like
        Surface areas S_i [m^2], shape (n_surfaces,).
    alphas : array_like
        Absorption coefficients, shape (n_surfaces,) or (n_bands, n_surfaces).
    method : {"sabine", "eyring", "auto"}, optional
        ``"sabine"`` (default): A = sum S_i alpha_i. ``"eyring"``: A_eff = -S ln(1 - alpha_mean),
        i.e. the absorption area that makes Sabine's decay equal to Eyring's. ``"auto"``:
        Eyring when alpha_mean > ``threshold``.
    threshold : float, optional
        Switch value for ``"auto"`` (default 0.2, common practice).
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        Loss factor per band [-].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995) Theory and Application of SEA, 2nd ed.,
       ISBN 0-7506-9111-5.
    .. [2] Eyring, C.F. (1930) J. Acoust. Soc. Am. 1(2A), 217-241, doi:10.1121/1.1915175.
    """
    total, absorption, mean = _mean_absorption(areas, alphas)
    if method not in ("auto", "sabine", "eyring"):
        msg = f"method must be 'auto', 'sabine' or 'eyring', got {method!r}"
        raise ValueError(msg)
    if method == "sabine":
        a_eff = absorption
    else:
        if np.any(mean >= 1.0):
            msg = "Eyring's formula needs a mean absorption coefficient < 1"
            raise ValueError(msg)
        eyr = -total * np.log1p(-mean)
        a_eff = eyr if method == "eyring" else np.where(mean > threshold, eyr, absorption)
    return cavity_loss_factor(f, volume, a_eff, c0=c0)
