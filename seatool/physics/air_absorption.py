"""Atmospheric absorption of sound (ISO 9613-1) and the loss factor it gives a room or cavity.

:func:`air_attenuation_iso9613` (attenuation coefficient in dB/m), :func:`air_attenuation_constant`
(intensity attenuation constant m in 1/m) and :func:`air_absorption_loss_factor`.
All functions are pure and broadcast with numpy over frequency bands.
"""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from ._checks import positive as _positive
from .air import AIR_SOUND_SPEED

#: 10 lg(e) = 4.3429 [dB per neper of intensity]: converts dB/m to the intensity
#: attenuation constant m [1/m].
_DB_PER_NEPER_INTENSITY: float = 10.0 * math.log10(math.e)

__all__ = [
    "air_absorption_loss_factor",
    "air_attenuation_constant",
    "air_attenuation_iso9613",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

# ------------------------------------------------------------------------------------------
# air absorption (ISO 9613-1)
# ------------------------------------------------------------------------------------------

_P_REF = 101.325e3  # reference pressure [Pa]
_T_REF = 293.15  # reference temperature [K]
_T_01 = 273.16  # triple-point isotherm temperature [K]


def air_attenuation_iso9613(
    f: npt.ArrayLike,
    *,
    temperature: npt.ArrayLike = 20.0,
    relative_humidity: npt.ArrayLike = 50.0,
    pressure: npt.ArrayLike = 101.325e3,
) -> FloatArray:
    """Pure-tone atmospheric absorption coefficient of ISO 9613-1 [dB/m].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    temperature : float or array_like, optional
        Air temperature [deg C] (default 20).
    relative_humidity : float or array_like, optional
        Relative humidity [%] (default 50).
    pressure : float or array_like, optional
        Atmospheric pressure [Pa] (default 101 325).

    Returns
    -------
    numpy.ndarray
        Attenuation coefficient alpha [dB/m] (sound *pressure level* falls by alpha dB per
        metre of travel).

    Notes
    -----
    With T in K, T0 = 293.15 K, T01 = 273.16 K, p_r = 101.325 kPa, p_a the pressure:

    * saturation vapour pressure: p_sat/p_r = 10^C, C = -6.8346 (T01/T)^1.261 + 4.6151
    * molar concentration of water vapour [%]: h = h_r (p_sat/p_r) / (p_a/p_r)
    * oxygen relaxation frequency:
      f_rO = (p_a/p_r) (24 + 4.04e4 h (0.02 + h)/(0.391 + h))
    * nitrogen relaxation frequency:
      f_rN = (p_a/p_r) (T/T0)^(-1/2) (9 + 280 h exp(-4.170 ((T/T0)^(-1/3) - 1)))
    * alpha = 8.686 f^2 [1.84e-11 (p_a/p_r)^-1 (T/T0)^(1/2)
      + (T/T0)^(-5/2) (0.01275 exp(-2239.1/T)/(f_rO + f^2/f_rO)
      + 0.1068 exp(-3352.0/T)/(f_rN + f^2/f_rN))]

    The standard states an accuracy of about +-10 % for -20..50 deg C, 10..100 % RH,
    pressures below 200 kPa and 50 Hz..10 kHz (from memory); outside that the formula is
    still evaluated.

    References
    ----------
    .. [1] ISO 9613-1:1993, Acoustics -- Attenuation of sound during propagation outdoors --
       Part 1: Calculation of the absorption of sound by the atmosphere, clause 6 (relaxation
       frequencies and attenuation coefficient) and Annex B (water-vapour concentration).
    """
    f_ = _positive("f", f)
    t_c = np.asarray(temperature, dtype=np.float64)
    if not np.all(np.isfinite(t_c)) or np.any(t_c <= -273.15):
        msg = f"temperature must be above absolute zero [deg C], got {temperature!r}"
        raise ValueError(msg)
    hr = np.asarray(relative_humidity, dtype=np.float64)
    if not np.all(np.isfinite(hr)) or np.any(hr < 0.0) or np.any(hr > 100.0):
        msg = f"relative_humidity must lie in [0, 100] %, got {relative_humidity!r}"
        raise ValueError(msg)
    pa = _positive("pressure", pressure) / _P_REF
    t = t_c + 273.15
    tr = t / _T_REF
    c = -6.8346 * (_T_01 / t) ** 1.261 + 4.6151
    h = hr * 10.0**c / pa
    fro = pa * (24.0 + 4.04e4 * h * (0.02 + h) / (0.391 + h))
    frn = pa * tr**-0.5 * (9.0 + 280.0 * h * np.exp(-4.170 * (tr ** (-1.0 / 3.0) - 1.0)))
    alpha = (
        8.686
        * f_**2
        * (
            1.84e-11 / pa * tr**0.5
            + tr**-2.5
            * (
                0.01275 * np.exp(-2239.1 / t) / (fro + f_**2 / fro)
                + 0.1068 * np.exp(-3352.0 / t) / (frn + f_**2 / frn)
            )
        )
    )
    return np.asarray(alpha, dtype=np.float64)


def air_attenuation_constant(
    f: npt.ArrayLike,
    *,
    temperature: npt.ArrayLike = 20.0,
    relative_humidity: npt.ArrayLike = 50.0,
    pressure: npt.ArrayLike = 101.325e3,
) -> FloatArray:
    """Intensity (energy) attenuation constant of air m [1/m].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    temperature, relative_humidity, pressure
        As in :func:`air_attenuation_iso9613`.

    Returns
    -------
    numpy.ndarray
        m = alpha / (10 lg e) = alpha / 4.343 [1/m], with alpha in dB/m.

    Notes
    -----
    Convention: sound *intensity* (energy density) decays as exp(-m x), so a level falls by
    10 lg(e) m = 4.343 m dB per metre.  The pressure amplitude decays as exp(-m x / 2).
    This is the m of Sabine/Eyring's 4 m V term and of ISO 354 clause 8.

    References
    ----------
    .. [1] ISO 9613-1:1993 (attenuation coefficient alpha).
    .. [2] ISO 354:2003, clause 8 (power attenuation coefficient m = alpha / (10 lg e)).
    """
    alpha = air_attenuation_iso9613(
        f, temperature=temperature, relative_humidity=relative_humidity, pressure=pressure
    )
    return np.asarray(alpha / _DB_PER_NEPER_INTENSITY, dtype=np.float64)


def air_absorption_loss_factor(
    f: npt.ArrayLike,
    *,
    temperature: npt.ArrayLike = 20.0,
    relative_humidity: npt.ArrayLike = 50.0,
    pressure: npt.ArrayLike = 101.325e3,
    c0: float = AIR_SOUND_SPEED,
) -> FloatArray:
    """Loss factor of a cavity due to air absorption, eta_air = m c0 / omega.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    temperature, relative_humidity, pressure
        As in :func:`air_attenuation_iso9613`.
    c0 : float, optional
        Speed of sound [m/s].

    Returns
    -------
    numpy.ndarray
        eta_air [-], independent of the cavity volume.

    Notes
    -----
    Energy travelling at c0 loses the fraction m per metre, i.e. m c0 per second; setting
    m c0 E = omega eta E gives eta_air = m c0 / omega.  Equivalent to adding 4 m V to the
    absorption area in :func:`cavity_loss_factor`.

    References
    ----------
    .. [1] ISO 9613-1:1993 (alpha); ISO 354:2003 clause 8 (m and the 4 m V term).
    .. [2] Lyon, R.H., DeJong, R.G. (1995) Theory and Application of SEA, 2nd ed.
    """
    m = air_attenuation_constant(
        f, temperature=temperature, relative_humidity=relative_humidity, pressure=pressure
    )
    _positive("c0", c0)
    omega = 2.0 * math.pi * np.asarray(f, dtype=np.float64)
    return np.asarray(m * c0 / omega, dtype=np.float64)
