"""Damping: loss factors from decay, room and cavity absorption, air absorption, damping layers.

All functions are pure and broadcast with numpy over frequency bands. Complex moduli use the
time convention exp(+j omega t): a lossy material has ``E* = E' (1 + j eta)``.

Contents
--------
* Loss factor <-> reverberation time (:func:`loss_factor_from_t60`, :func:`t60_from_loss_factor`).
* Sabine and Eyring reverberation time (:func:`sabine_t60`, :func:`eyring_t60`,
  :func:`reverberation_time` with the Sabine/Eyring switch).
* Cavity loss factor from absorption area or from per-surface absorption coefficients
  (:func:`cavity_loss_factor`, :func:`cavity_loss_factor_from_surfaces`).
* Air absorption per ISO 9613-1 (:func:`air_attenuation_iso9613`,
  :func:`air_attenuation_constant`, :func:`air_absorption_loss_factor`).
* Free and constrained viscoelastic damping layers on a plate (:func:`free_layer_damping`,
  :func:`constrained_layer_damping`) with a frequency-dependent complex modulus given as a
  table (:class:`ModulusTable`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _non_negative
from ._checks import positive as _positive
from .structural import bending_stiffness as _structural_bending_stiffness

__all__ = [
    "EYRING_THRESHOLD",
    "SABINE_CONSTANT",
    "CompositeDamping",
    "ModulusTable",
    "air_absorption_loss_factor",
    "air_attenuation_constant",
    "air_attenuation_iso9613",
    "cavity_loss_factor",
    "cavity_loss_factor_from_surfaces",
    "complex_modulus",
    "constrained_layer_damping",
    "eyring_t60",
    "free_layer_damping",
    "free_layer_loss_factor_ratio",
    "loss_factor_from_t60",
    "reverberation_time",
    "rku_geometric_parameter",
    "rku_loss_factor",
    "rku_optimum_shear_parameter",
    "rku_shear_parameter",
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

#: 10 lg(e) = 4.3429 [dB per neper of intensity]: converts dB/m to the intensity
#: attenuation constant m [1/m].
_DB_PER_NEPER_INTENSITY: float = 10.0 * math.log10(math.e)

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
    c0: float = 343.0,
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
    c0: float = 343.0,
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
    c0: float = 343.0,
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
    c0: float = 343.0,
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


def cavity_loss_factor_from_surfaces(
    f: npt.ArrayLike,
    volume: float,
    areas: npt.ArrayLike,
    alphas: npt.ArrayLike,
    *,
    method: Literal["auto", "sabine", "eyring"] = "sabine",
    threshold: float = EYRING_THRESHOLD,
    c0: float = 343.0,
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
    c0: float = 343.0,
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


# ------------------------------------------------------------------------------------------
# viscoelastic damping layers
# ------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class ModulusTable:
    """Frequency-dependent complex modulus of a viscoelastic material, as a table.

    Parameters
    ----------
    frequency : tuple of float
        Table frequencies [Hz], strictly increasing, > 0.
    storage_modulus : tuple of float
        Storage (real) modulus at those frequencies [Pa], > 0.
    loss_factor : tuple of float
        Material loss factor eta = E''/E' at those frequencies [-], > 0.
    kind : {"young", "shear"}
        Whether the table gives Young's modulus E or the shear modulus G.

    Notes
    -----
    Evaluated by :func:`complex_modulus` with linear interpolation of lg(E') and lg(eta)
    against lg(f) (log-log), held constant beyond the table ends.
    """

    frequency: tuple[float, ...]
    storage_modulus: tuple[float, ...]
    loss_factor: tuple[float, ...]
    kind: Literal["young", "shear"] = "young"

    def __post_init__(self) -> None:
        n = len(self.frequency)
        if n == 0 or len(self.storage_modulus) != n or len(self.loss_factor) != n:
            msg = (
                "ModulusTable: frequency, storage_modulus and loss_factor need equal, "
                "non-zero length"
            )
            raise ValueError(msg)
        fr = np.asarray(self.frequency, dtype=np.float64)
        _positive("ModulusTable.frequency", fr)
        if np.any(np.diff(fr) <= 0.0):
            msg = "ModulusTable.frequency must be strictly increasing"
            raise ValueError(msg)
        _positive("ModulusTable.storage_modulus", self.storage_modulus)
        _positive("ModulusTable.loss_factor", self.loss_factor)
        if self.kind not in ("young", "shear"):
            msg = f"ModulusTable.kind must be 'young' or 'shear', got {self.kind!r}"
            raise ValueError(msg)


def complex_modulus(f: npt.ArrayLike, modulus: ModulusTable | complex | float) -> ComplexArray:
    """Complex modulus E* = E' (1 + j eta) at frequencies f (exp(+j omega t)).

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    modulus : ModulusTable or complex or float
        A table (interpolated log-log in f, constant outside the table) or a
        frequency-independent complex modulus [Pa].

    Returns
    -------
    numpy.ndarray of complex
        E*(f) [Pa], shape of ``f``.

    Notes
    -----
    lg E'(f) and lg eta(f) are interpolated linearly in lg f. Log-log interpolation follows
    the power-law behaviour of viscoelastic materials in the transition region (e.g. Nashif,
    Jones & Henderson 1985, ch. 3).

    References
    ----------
    .. [1] Nashif, A.D., Jones, D.I.G., Henderson, J.P. (1985) Vibration Damping, Wiley,
       ISBN 0-471-86772-1, ch. 3 (frequency dependence of complex moduli).
    """
    f_ = _positive("f", f)
    if isinstance(modulus, ModulusTable):
        lf = np.log10(np.asarray(modulus.frequency, dtype=np.float64))
        le = np.log10(np.asarray(modulus.storage_modulus, dtype=np.float64))
        ln = np.log10(np.asarray(modulus.loss_factor, dtype=np.float64))
        x = np.log10(f_)
        e1 = 10.0 ** np.interp(x, lf, le)
        eta = 10.0 ** np.interp(x, lf, ln)
        return np.asarray(e1 * (1.0 + 1j * eta), dtype=np.complex128)
    value = complex(modulus)
    if value.real <= 0.0 or value.imag < 0.0:
        msg = (
            "modulus must have a positive real part and a non-negative imaginary part "
            f"(exp(+j omega t) convention), got {modulus!r}"
        )
        raise ValueError(msg)
    return np.full(f_.shape, value, dtype=np.complex128)


@dataclass(frozen=True)
class CompositeDamping:
    """Result of a damping-layer calculation, per frequency.

    Attributes
    ----------
    loss_factor : numpy.ndarray
        Composite loss factor eta = Im(D*)/Re(D*) [-].
    bending_stiffness : numpy.ndarray
        Composite bending stiffness Re(D*) [N m] (per unit width of plate).
    mass_per_area : float
        Mass per unit area of the composite m'' [kg/m^2].
    added_mass_per_area : float
        Mass per unit area of the added layers (treatment only) [kg/m^2].
    """

    loss_factor: FloatArray
    bending_stiffness: FloatArray
    mass_per_area: float
    added_mass_per_area: float


def free_layer_loss_factor_ratio(
    modulus_ratio: npt.ArrayLike, thickness_ratio: npt.ArrayLike
) -> FloatArray:
    """Oberst / Ross–Kerwin–Ungar free-layer loss-factor ratio eta/eta2.

    Parameters
    ----------
    modulus_ratio : float or array_like
        e = E2/E1, layer storage modulus over base modulus [-].
    thickness_ratio : float or array_like
        h = H2/H1, layer thickness over base thickness [-].

    Returns
    -------
    numpy.ndarray
        eta/eta2 [-] (first order in eta2, base undamped).

    Notes
    -----
    eta/eta2 = e h (3 + 6 h + 4 h^2 + 2 e h^3 + e^2 h^4)
    / ((1 + e h)(1 + 4 e h + 6 e h^2 + 4 e h^3 + e^2 h^4)).
    Thin, soft layers (e h << 1): eta/eta2 ~= e h (3 + 6 h + 4 h^2); for h in about 0.5..2
    this is ~= 14 e h^2 (Ungar's rule of thumb).

    References
    ----------
    .. [1] Oberst, H. (1952) "Über die Dämpfung der Biegeschwingungen dünner Bleche durch
       fest haftende Beläge", Acustica 2 (Akustische Beihefte 4), 181-194.
    .. [2] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) "Damping of plate flexural vibrations
       by means of viscoelastic laminae", in Structural Damping (J.E. Ruzicka, ed.), ASME,
       New York, 49-88.
    .. [3] Ungar, E.E. (1992) "Structural damping", ch. 12 in Beranek, L.L., Vér, I.L.
       (eds.) Noise and Vibration Control Engineering, Wiley, ISBN 0-471-61751-2.
    """
    e = _positive("modulus_ratio", modulus_ratio)
    h = _positive("thickness_ratio", thickness_ratio)
    num = e * h * (3.0 + 6.0 * h + 4.0 * h**2 + 2.0 * e * h**3 + e**2 * h**4)
    den = (1.0 + e * h) * (1.0 + 4.0 * e * h + 6.0 * e * h**2 + 4.0 * e * h**3 + e**2 * h**4)
    return np.asarray(num / den, dtype=np.float64)


def free_layer_damping(
    f: npt.ArrayLike,
    base_thickness: float,
    base_young: float,
    base_density: float,
    layer_thickness: float,
    layer_density: float,
    layer_modulus: ModulusTable | complex | float,
    *,
    base_loss_factor: float = 0.0,
    base_poisson: float = 0.3,
    layer_poisson: float = 0.3,
) -> CompositeDamping:
    """Composite loss factor and bending stiffness of a plate with a free damping layer.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    base_thickness : float
        Base plate thickness H1 [m].
    base_young : float
        Base plate Young's modulus E1 [Pa].
    base_density : float
        Base plate density [kg/m^3].
    layer_thickness : float
        Damping layer thickness H2 [m].
    layer_density : float
        Damping layer density [kg/m^3].
    layer_modulus : ModulusTable or complex or float
        Young's modulus of the layer: a table of kind ``"young"`` or a constant
        complex value E2 (1 + j eta2) [Pa].
    base_loss_factor : float, optional
        Loss factor of the bare base plate eta1 [-] (default 0).
    base_poisson, layer_poisson : float, optional
        Poisson's ratios; plate moduli E/(1 - nu^2) are used.

    Returns
    -------
    CompositeDamping
        Loss factor, Re(D*) [N m], total and added mass per area.

    Notes
    -----
    Pure bending of a two-layer plate with the neutral plane shifted by the layer
    (Oberst 1952; Ross, Kerwin & Ungar 1959), evaluated with complex moduli
    (exp(+j omega t)):

        D*/D1* = 1 + e h^3 + 3 (1 + h)^2 e h / (1 + e h),  e = E2*/E1*,  h = H2/H1,

    eta = Im(D*)/Re(D*).  To first order in eta2 and with eta1 = 0 this is exactly
    :func:`free_layer_loss_factor_ratio`.  Frequency enters only through E2*(f); shear in
    the layer and rotary inertia are neglected (thin layers, bending wavelength >> H1+H2).

    References
    ----------
    .. [1] Oberst, H. (1952) Acustica 2 (Akustische Beihefte 4), 181-194.
    .. [2] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [3] Ungar, E.E. (1992) ch. 12 in Beranek & Vér, Noise and Vibration Control
       Engineering, Wiley, ISBN 0-471-61751-2.
    """
    h1 = float(_positive("base_thickness", base_thickness))
    e1 = float(_positive("base_young", base_young))
    rho1 = float(_positive("base_density", base_density))
    h2 = float(_positive("layer_thickness", layer_thickness))
    rho2 = float(_non_negative("layer_density", layer_density))
    eta1 = float(_non_negative("base_loss_factor", base_loss_factor))
    if isinstance(layer_modulus, ModulusTable) and layer_modulus.kind != "young":
        msg = "layer_modulus must be a table of Young's modulus (kind='young') for a free layer"
        raise ValueError(msg)
    e2 = complex_modulus(f, layer_modulus)
    e1c = e1 * (1.0 + 1j * eta1) / (1.0 - base_poisson**2)
    e2c = e2 / (1.0 - layer_poisson**2)
    e = e2c / e1c
    h = h2 / h1
    d1 = e1c * h1**3 / 12.0
    d = d1 * (1.0 + e * h**3 + 3.0 * (1.0 + h) ** 2 * e * h / (1.0 + e * h))
    added = rho2 * h2
    return CompositeDamping(
        loss_factor=np.asarray(d.imag / d.real, dtype=np.float64),
        bending_stiffness=np.asarray(d.real, dtype=np.float64),
        mass_per_area=rho1 * h1 + added,
        added_mass_per_area=added,
    )


def rku_geometric_parameter(
    base_thickness: npt.ArrayLike,
    base_young: npt.ArrayLike,
    core_thickness: npt.ArrayLike,
    cover_thickness: npt.ArrayLike,
    cover_young: npt.ArrayLike,
) -> FloatArray:
    """Geometric parameter Y of a constrained-layer (three-layer) plate.

    Parameters
    ----------
    base_thickness : float or array_like
        H1 [m].
    base_young : float or array_like
        E1 [Pa] (a plate modulus E/(1 - nu^2) if used for plates).
    core_thickness : float or array_like
        Viscoelastic core thickness H2 [m].
    cover_thickness : float or array_like
        Constraining layer thickness H3 [m].
    cover_young : float or array_like
        E3 [Pa].

    Returns
    -------
    numpy.ndarray
        Y = (D_inf - D_0)/D_0 [-].

    Notes
    -----
    Y = 12 d^2 / (E1 H1^3 + E3 H3^3) * E1 H1 E3 H3 / (E1 H1 + E3 H3),
    d = H2 + (H1 + H3)/2 (distance between the mid-planes of base and cover).
    D_0 = (E1 H1^3 + E3 H3^3)/12 is the stiffness of the uncoupled faces and D_inf the
    fully coupled one (parallel-axis theorem); the core's own extensional and bending
    stiffness are neglected.  This is not restricted to symmetric sandwiches.

    References
    ----------
    .. [1] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [2] Ungar, E.E. (1962) "Loss factors of viscoelastically damped beam structures",
       J. Acoust. Soc. Am. 34(8), 1082-1089, doi:10.1121/1.1918249.
    """
    h1 = _positive("base_thickness", base_thickness)
    e1 = _positive("base_young", base_young)
    h2 = _non_negative("core_thickness", core_thickness)
    h3 = _positive("cover_thickness", cover_thickness)
    e3 = _positive("cover_young", cover_young)
    d = h2 + 0.5 * (h1 + h3)
    k1 = e1 * h1
    k3 = e3 * h3
    return np.asarray(
        12.0 * d**2 / (e1 * h1**3 + e3 * h3**3) * k1 * k3 / (k1 + k3), dtype=np.float64
    )


def rku_shear_parameter(
    wavenumber: npt.ArrayLike,
    core_shear_modulus: npt.ArrayLike,
    core_thickness: npt.ArrayLike,
    base_thickness: npt.ArrayLike,
    base_young: npt.ArrayLike,
    cover_thickness: npt.ArrayLike,
    cover_young: npt.ArrayLike,
) -> FloatArray:
    """Shear parameter g of a constrained-layer plate.

    Parameters
    ----------
    wavenumber : float or array_like
        Bending wavenumber k [rad/m].
    core_shear_modulus : float or array_like
        Storage shear modulus of the core G2 [Pa].
    core_thickness : float or array_like
        H2 [m].
    base_thickness, base_young, cover_thickness, cover_young : float or array_like
        H1 [m], E1 [Pa], H3 [m], E3 [Pa].

    Returns
    -------
    numpy.ndarray
        g = G2 / (k^2 H2) (1/(E1 H1) + 1/(E3 H3)) [-].

    References
    ----------
    .. [1] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [2] Ungar, E.E. (1962) J. Acoust. Soc. Am. 34(8), 1082-1089.
    """
    k = _positive("wavenumber", wavenumber)
    g2 = _positive("core_shear_modulus", core_shear_modulus)
    h2 = _positive("core_thickness", core_thickness)
    h1 = _positive("base_thickness", base_thickness)
    e1 = _positive("base_young", base_young)
    h3 = _positive("cover_thickness", cover_thickness)
    e3 = _positive("cover_young", cover_young)
    return np.asarray(g2 / (k**2 * h2) * (1.0 / (e1 * h1) + 1.0 / (e3 * h3)), dtype=np.float64)


def rku_loss_factor(
    shear_parameter: npt.ArrayLike,
    geometric_parameter: npt.ArrayLike,
    core_loss_factor: npt.ArrayLike,
) -> FloatArray:
    """Constrained-layer composite loss factor (faces undamped).

    Parameters
    ----------
    shear_parameter : float or array_like
        g [-] (see :func:`rku_shear_parameter`).
    geometric_parameter : float or array_like
        Y [-] (see :func:`rku_geometric_parameter`).
    core_loss_factor : float or array_like
        Core shear loss factor beta = eta2 [-].

    Returns
    -------
    numpy.ndarray
        eta = beta Y g / (1 + (2 + Y) g + (1 + Y)(1 + beta^2) g^2) [-].

    Notes
    -----
    Follows from D*/D_0 = 1 + Y g* / (1 + g*), g* = g (1 + j beta).  Maximum at
    g_opt = 1/sqrt((1 + Y)(1 + beta^2)) (:func:`rku_optimum_shear_parameter`), and
    eta -> 0 for g -> 0 (faces slide freely) and g -> inf (core locked, no shear).

    References
    ----------
    .. [1] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [2] Ungar, E.E. (1992) ch. 12 in Beranek & Vér, Noise and Vibration Control
       Engineering, Wiley, ISBN 0-471-61751-2.
    """
    g = _non_negative("shear_parameter", shear_parameter)
    y = _non_negative("geometric_parameter", geometric_parameter)
    b = _non_negative("core_loss_factor", core_loss_factor)
    return np.asarray(
        b * y * g / (1.0 + (2.0 + y) * g + (1.0 + y) * (1.0 + b**2) * g**2), dtype=np.float64
    )


def rku_optimum_shear_parameter(
    geometric_parameter: npt.ArrayLike, core_loss_factor: npt.ArrayLike
) -> FloatArray:
    """Shear parameter that maximises :func:`rku_loss_factor`, 1/sqrt((1 + Y)(1 + beta^2)).

    Parameters
    ----------
    geometric_parameter : float or array_like
        Y [-].
    core_loss_factor : float or array_like
        beta [-].

    Returns
    -------
    numpy.ndarray
        g_opt [-].

    References
    ----------
    .. [1] Ungar, E.E. (1992) ch. 12 in Beranek & Vér, Noise and Vibration Control
       Engineering, Wiley, ISBN 0-471-61751-2.
    """
    y = _non_negative("geometric_parameter", geometric_parameter)
    b = _non_negative("core_loss_factor", core_loss_factor)
    return np.asarray(1.0 / np.sqrt((1.0 + y) * (1.0 + b**2)), dtype=np.float64)


def constrained_layer_damping(
    f: npt.ArrayLike,
    base_thickness: float,
    base_young: float,
    base_density: float,
    core_thickness: float,
    core_density: float,
    core_shear_modulus: ModulusTable | complex | float,
    cover_thickness: float,
    cover_young: float,
    cover_density: float,
    *,
    base_loss_factor: float = 0.0,
    cover_loss_factor: float = 0.0,
    base_poisson: float = 0.3,
    cover_poisson: float = 0.3,
    wavenumber: Literal["composite", "base"] = "composite",
) -> CompositeDamping:
    """Composite loss factor and bending stiffness of a constrained-layer damped plate.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    base_thickness, base_young, base_density : float
        Base plate H1 [m], E1 [Pa], density [kg/m^3].
    core_thickness, core_density : float
        Viscoelastic core H2 [m] and density [kg/m^3].
    core_shear_modulus : ModulusTable or complex or float
        Complex shear modulus of the core G2 (1 + j beta): a table of kind ``"shear"`` or a
        constant [Pa].
    cover_thickness, cover_young, cover_density : float
        Constraining layer H3 [m], E3 [Pa], density [kg/m^3].
    base_loss_factor, cover_loss_factor : float, optional
        Loss factors of the elastic faces (default 0).
    base_poisson, cover_poisson : float, optional
        Poisson's ratios of the faces; plate moduli E/(1 - nu^2) are used.
    wavenumber : {"composite", "base"}, optional
        Bending wavenumber used in the shear parameter: that of the composite plate,
        k^4 = omega^2 m''/Re(D*), found by fixed-point iteration (default), or that of the
        bare base plate.

    Returns
    -------
    CompositeDamping
        Loss factor, Re(D*) [N m], total and added mass per area.

    Notes
    -----
    Ross–Kerwin–Ungar three-layer model without the core's extensional and bending
    stiffness, written with complex moduli (exp(+j omega t)):

        D* = D_0* (1 + Y* g* / (1 + g*)),   D_0* = (E1* H1^3 + E3* H3^3)/12,
        g* = G2* / (k^2 H2) (1/(E1* H1) + 1/(E3* H3)),   Y* from :func:`rku_geometric_parameter`,

    eta = Im(D*)/Re(D*).  With undamped faces this reduces exactly to
    :func:`rku_loss_factor`.  Assumes faces in pure bending plus membrane action, core in
    pure shear, equal transverse displacement of all layers.

    References
    ----------
    .. [1] Ross, D., Ungar, E.E., Kerwin, E.M. (1959) in Structural Damping, ASME, 49-88.
    .. [2] Kerwin, E.M. (1959) "Damping of flexural waves by a constrained viscoelastic
       layer", J. Acoust. Soc. Am. 31(7), 952-962, doi:10.1121/1.1907821.
    .. [3] Ungar, E.E. (1962) J. Acoust. Soc. Am. 34(8), 1082-1089, doi:10.1121/1.1918249.
    """
    h1 = float(_positive("base_thickness", base_thickness))
    e1 = float(_positive("base_young", base_young))
    rho1 = float(_positive("base_density", base_density))
    h2 = float(_positive("core_thickness", core_thickness))
    rho2 = float(_non_negative("core_density", core_density))
    h3 = float(_positive("cover_thickness", cover_thickness))
    e3 = float(_positive("cover_young", cover_young))
    rho3 = float(_non_negative("cover_density", cover_density))
    eta1 = float(_non_negative("base_loss_factor", base_loss_factor))
    eta3 = float(_non_negative("cover_loss_factor", cover_loss_factor))
    if isinstance(core_shear_modulus, ModulusTable) and core_shear_modulus.kind != "shear":
        msg = "core_shear_modulus must be a table of shear modulus (kind='shear')"
        raise ValueError(msg)
    if wavenumber not in ("composite", "base"):
        msg = f"wavenumber must be 'composite' or 'base', got {wavenumber!r}"
        raise ValueError(msg)
    f_ = _positive("f", f)
    g2 = complex_modulus(f_, core_shear_modulus)
    e1c = e1 * (1.0 + 1j * eta1) / (1.0 - base_poisson**2)
    e3c = e3 * (1.0 + 1j * eta3) / (1.0 - cover_poisson**2)
    d0 = (e1c * h1**3 + e3c * h3**3) / 12.0
    dist = h2 + 0.5 * (h1 + h3)
    k1, k3 = e1c * h1, e3c * h3
    coupled = dist**2 * k1 * k3 / (k1 + k3)  # D_inf - D_0
    omega = 2.0 * math.pi * f_
    added = rho2 * h2 + rho3 * h3
    mass = rho1 * h1 + added

    def stiffness(k: FloatArray) -> ComplexArray:
        gs = g2 / (k**2 * h2) * (1.0 / k1 + 1.0 / k3)
        return np.asarray(d0 + coupled * gs / (1.0 + gs), dtype=np.complex128)

    if wavenumber == "base":
        k = (omega**2 * rho1 * h1 / (e1 * h1**3 / (12.0 * (1.0 - base_poisson**2)))) ** 0.25
        d = stiffness(k)
    else:
        # k -> k(D(k)) is increasing with slope <= 1/2 in log terms: monotone convergence.
        k = (omega**2 * mass / d0.real) ** 0.25
        for _ in range(200):
            d = stiffness(k)
            k_new = (omega**2 * mass / d.real) ** 0.25
            converged = np.max(np.abs(k_new / k - 1.0)) < 1e-12
            k = k_new
            if converged:
                break
        d = stiffness(k)
    return CompositeDamping(
        loss_factor=np.asarray(d.imag / d.real, dtype=np.float64),
        bending_stiffness=np.asarray(d.real, dtype=np.float64),
        mass_per_area=mass,
        added_mass_per_area=added,
    )


def _bending_stiffness(
    thickness: npt.ArrayLike, young: npt.ArrayLike, poisson: float
) -> FloatArray:
    """D = E h^3 / (12 (1 - nu^2)) [N m], from :func:`seatool.physics.structural.bending_stiffness`."""
    return _structural_bending_stiffness(young, thickness, poisson)
