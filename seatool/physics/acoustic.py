"""Acoustic SEA subsystems: fluid properties, cavity and duct modal densities.

Pure, vectorised functions in SI units; modal densities in modes per hertz. The formulas
and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

from typing import Literal

import numpy as np
import numpy.typing as npt

from seatool.physics.structural import _full, _positive

__all__ = [
    "GAS_CONSTANT",
    "MOLAR_MASS_DRY_AIR",
    "RATIO_OF_SPECIFIC_HEATS_AIR",
    "air_density",
    "air_sound_speed",
    "cavity_modal_density",
    "cavity_mode_count",
    "characteristic_impedance",
    "duct_cut_on_frequency_circular",
    "duct_cut_on_frequency_rectangular",
    "duct_modal_density",
    "rectangular_cavity_geometry",
]

FloatArray = npt.NDArray[np.float64]

#: Molar gas constant R [J/(mol K)] (exact in the 2019 SI, CODATA 2018).
GAS_CONSTANT = 8.314462618
#: Molar mass of dry air [kg/mol] (CIPM-2007 air-density formula, Picard et al. 2008;
#: from memory).
MOLAR_MASS_DRY_AIR = 0.0289647
#: Ratio of specific heats of dry air near room temperature [-] (common practice).
RATIO_OF_SPECIFIC_HEATS_AIR = 1.4
_KELVIN = 273.15
_SOUND_PRESSURE_RIGID_DUCT_BESSEL_ZERO = 1.84118  # first zero of J1'(x), A&S Table 9.5


def _temperature_kelvin(temperature_C: npt.ArrayLike) -> FloatArray:
    t = np.asarray(temperature_C, dtype=np.float64)
    if not np.all(np.isfinite(t)) or np.any(t <= -_KELVIN):
        msg = f"temperature_C must be finite and above -273.15 C, got {temperature_C!r}"
        raise ValueError(msg)
    return np.asarray(t + _KELVIN, dtype=np.float64)


def air_sound_speed(temperature_C: npt.ArrayLike) -> FloatArray:
    """Speed of sound in dry air, ideal gas.

    Parameters
    ----------
    temperature_C : float or array_like
        Air temperature [deg C].

    Returns
    -------
    numpy.ndarray
        c = sqrt(gamma R T / M) [m/s] with gamma = 1.4, R = 8.314462618 J/(mol K),
        M = 0.0289647 kg/mol; 343.2 m/s at 20 C. Independent of static pressure for an
        ideal gas.

    Notes
    -----
    Humidity is neglected (it raises c by up to about 0.3 % at room temperature).
    ISO 9613-1 writes the same law as c = 343.2 sqrt(T / 293.15 K).

    References
    ----------
    .. [1] Bies, D.A., Hansen, C.H. (2009). Engineering Noise Control, 4th ed., Spon,
       ISBN 978-0-415-48707-8, sec. 1.4.2, eq. (1.6) (speed of sound in an ideal gas;
       equation number from memory).
    .. [2] ISO 9613-1:1993. Acoustics - Attenuation of sound during propagation outdoors -
       Part 1: Calculation of the absorption of sound by the atmosphere (reference speed
       of sound; from memory).
    """
    t = _temperature_kelvin(temperature_C)
    return np.asarray(
        np.sqrt(RATIO_OF_SPECIFIC_HEATS_AIR * GAS_CONSTANT * t / MOLAR_MASS_DRY_AIR),
        dtype=np.float64,
    )


def air_density(temperature_C: npt.ArrayLike, pressure_Pa: npt.ArrayLike = 101325.0) -> FloatArray:
    """Density of dry air, ideal gas.

    Parameters
    ----------
    temperature_C : float or array_like
        Air temperature [deg C].
    pressure_Pa : float or array_like, optional
        Static pressure [Pa]; default 101325 Pa.

    Returns
    -------
    numpy.ndarray
        rho = p M / (R T) [kg/m^3]; 1.204 kg/m^3 at 20 C and 101.325 kPa.

    References
    ----------
    .. [1] Bies, D.A., Hansen, C.H. (2009). Engineering Noise Control, 4th ed., Spon,
       ISBN 978-0-415-48707-8, sec. 1.4.2 (ideal gas law; from memory).
    """
    t = _temperature_kelvin(temperature_C)
    p = _positive("pressure_Pa", pressure_Pa)
    return np.asarray(p * MOLAR_MASS_DRY_AIR / (GAS_CONSTANT * t), dtype=np.float64)


def characteristic_impedance(density: npt.ArrayLike, sound_speed: npt.ArrayLike) -> FloatArray:
    """Characteristic (specific acoustic) impedance of a fluid, rho c [Pa s/m].

    Parameters
    ----------
    density : float or array_like
        Fluid density rho [kg/m^3].
    sound_speed : float or array_like
        Speed of sound c [m/s].

    Returns
    -------
    numpy.ndarray
        rho c [Pa s/m] (real; plane progressive wave).

    References
    ----------
    .. [1] Kinsler, L.E., Frey, A.R., Coppens, A.B., Sanders, J.V. (2000). Fundamentals of
       Acoustics, 4th ed., Wiley, ISBN 0-471-84789-5, sec. 5.10 (from memory).
    """
    rho = _positive("density", density)
    c = _positive("sound_speed", sound_speed)
    return np.asarray(rho * c, dtype=np.float64)


def rectangular_cavity_geometry(
    length_x: float, length_y: float, length_z: float
) -> tuple[float, float, float]:
    """Volume, wall area and total edge length of a rectangular box.

    Parameters
    ----------
    length_x, length_y, length_z : float
        Box dimensions [m].

    Returns
    -------
    tuple of float
        (V [m^3], S = 2 (LxLy + LyLz + LzLx) [m^2], L = 4 (Lx + Ly + Lz) [m]).
    """
    lx = float(_positive("length_x", length_x))
    ly = float(_positive("length_y", length_y))
    lz = float(_positive("length_z", length_z))
    return lx * ly * lz, 2.0 * (lx * ly + ly * lz + lz * lx), 4.0 * (lx + ly + lz)


def cavity_mode_count(
    f: npt.ArrayLike,
    volume: npt.ArrayLike,
    surface_area: npt.ArrayLike,
    edge_length: npt.ArrayLike,
    sound_speed: npt.ArrayLike,
    *,
    terms: Literal["all", "volume"] = "all",
) -> FloatArray:
    """Number of acoustic modes of a rigid-walled cavity below frequency f.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    volume : float or array_like
        Cavity volume V [m^3].
    surface_area : float or array_like
        Total wall area S [m^2].
    edge_length : float or array_like
        Total edge length L [m] (sum of all box edges, 4 (Lx + Ly + Lz) for a box).
    sound_speed : float or array_like
        Speed of sound c [m/s].
    terms : {"all", "volume"}, optional
        "all" (default): volume, surface and edge terms; "volume": the leading term only.

    Returns
    -------
    numpy.ndarray
        N(f) = 4 pi f^3 V / (3 c^3) + pi f^2 S / (4 c^2) + f L / (8 c) [-].

    Notes
    -----
    Exact asymptotics for a rectangular box with rigid (Neumann) walls, counting oblique,
    tangential and axial modes; commonly applied to other room shapes. For
    pressure-release walls the surface term changes sign (not implemented).

    References
    ----------
    .. [1] Morse, P.M., Bolt, R.H. (1944). Sound waves in rooms. Rev. Mod. Phys. 16(2),
       69-150.
    .. [2] Bies, D.A., Hansen, C.H. (2003). Engineering Noise Control, 3rd ed., Spon,
       ISBN 0-415-26713-7, sec. 7.3.1.
    """
    fr = _positive("f", f)
    v = _positive("volume", volume)
    s = _positive("surface_area", surface_area)
    ell = _positive("edge_length", edge_length)
    c = _positive("sound_speed", sound_speed)
    out = 4.0 * np.pi * fr**3 * v / (3.0 * c**3)
    if terms == "all":
        out = out + np.pi * fr**2 * s / (4.0 * c**2) + fr * ell / (8.0 * c)
    elif terms != "volume":
        msg = f"terms must be 'all' or 'volume', got {terms!r}"
        raise ValueError(msg)
    return np.asarray(out, dtype=np.float64)


def cavity_modal_density(
    f: npt.ArrayLike,
    volume: npt.ArrayLike,
    surface_area: npt.ArrayLike,
    edge_length: npt.ArrayLike,
    sound_speed: npt.ArrayLike,
    *,
    terms: Literal["all", "volume"] = "all",
) -> FloatArray:
    """Modal density of a rigid-walled acoustic cavity [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    volume : float or array_like
        Cavity volume V [m^3].
    surface_area : float or array_like
        Total wall area S [m^2].
    edge_length : float or array_like
        Total edge length L [m].
    sound_speed : float or array_like
        Speed of sound c [m/s].
    terms : {"all", "volume"}, optional
        "all" (default) or only the leading volume term 4 pi f^2 V / c^3.

    Returns
    -------
    numpy.ndarray
        n(f) = 4 pi f^2 V / c^3 + pi f S / (2 c^2) + L / (8 c) [modes/Hz], the derivative
        of :func:`cavity_mode_count`.

    References
    ----------
    .. [1] Morse, P.M., Bolt, R.H. (1944). Sound waves in rooms. Rev. Mod. Phys. 16(2),
       69-150.
    .. [2] Bies, D.A., Hansen, C.H. (2003). Engineering Noise Control, 3rd ed., Spon,
       ISBN 0-415-26713-7, sec. 7.3.1.
    """
    fr = _positive("f", f)
    v = _positive("volume", volume)
    s = _positive("surface_area", surface_area)
    ell = _positive("edge_length", edge_length)
    c = _positive("sound_speed", sound_speed)
    out = 4.0 * np.pi * fr**2 * v / c**3
    if terms == "all":
        out = out + np.pi * fr * s / (2.0 * c**2) + ell / (8.0 * c)
    elif terms != "volume":
        msg = f"terms must be 'all' or 'volume', got {terms!r}"
        raise ValueError(msg)
    return np.asarray(out, dtype=np.float64)


def duct_modal_density(
    f: npt.ArrayLike, length: npt.ArrayLike, sound_speed: npt.ArrayLike
) -> FloatArray:
    """Modal density of the plane-wave field in a duct or tube, n(f) = 2 L / c [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz] (sets the output shape).
    length : float or array_like
        Duct length L [m].
    sound_speed : float or array_like
        Speed of sound c [m/s].

    Returns
    -------
    numpy.ndarray
        n(f) [modes/Hz]. Valid below the first cut-on frequency
        (:func:`duct_cut_on_frequency_rectangular`,
        :func:`duct_cut_on_frequency_circular`); above it cross modes add to the count.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (1-D modal
       density; from memory).
    """
    fr = _positive("f", f)
    ell = _positive("length", length)
    c = _positive("sound_speed", sound_speed)
    return _full(2.0 * ell / c, fr)


def duct_cut_on_frequency_rectangular(
    width: npt.ArrayLike, height: npt.ArrayLike, sound_speed: npt.ArrayLike
) -> FloatArray:
    """Cut-on frequency of the first cross mode of a rigid rectangular duct.

    Parameters
    ----------
    width, height : float or array_like
        Inner cross-section dimensions [m].
    sound_speed : float or array_like
        Speed of sound c [m/s].

    Returns
    -------
    numpy.ndarray
        f_10 = c / (2 max(width, height)) [Hz]; above it the duct is no longer a 1-D
        acoustic subsystem.

    References
    ----------
    .. [1] Kinsler, L.E., Frey, A.R., Coppens, A.B., Sanders, J.V. (2000). Fundamentals of
       Acoustics, 4th ed., Wiley, ISBN 0-471-84789-5, sec. 9.2 (rectangular waveguide with
       rigid walls; from memory).
    """
    w = _positive("width", width)
    h = _positive("height", height)
    c = _positive("sound_speed", sound_speed)
    return np.asarray(c / (2.0 * np.maximum(w, h)), dtype=np.float64)


def duct_cut_on_frequency_circular(
    diameter: npt.ArrayLike, sound_speed: npt.ArrayLike
) -> FloatArray:
    """Cut-on frequency of the first cross mode of a rigid circular duct.

    Parameters
    ----------
    diameter : float or array_like
        Inner diameter d [m].
    sound_speed : float or array_like
        Speed of sound c [m/s].

    Returns
    -------
    numpy.ndarray
        f_11 = 1.84118 c / (pi d) [Hz] (first (1,1) mode; 1.84118 is the first zero of
        the Bessel function derivative J1').

    References
    ----------
    .. [1] Kinsler, L.E., Frey, A.R., Coppens, A.B., Sanders, J.V. (2000). Fundamentals of
       Acoustics, 4th ed., Wiley, ISBN 0-471-84789-5, sec. 9.3 (circular waveguide;
       from memory).
    .. [2] Abramowitz, M., Stegun, I.A. (1964). Handbook of Mathematical Functions, NBS,
       Table 9.5 (zeros of J1').
    """
    d = _positive("diameter", diameter)
    c = _positive("sound_speed", sound_speed)
    return np.asarray(_SOUND_PRESSURE_RIGID_DUCT_BESSEL_ZERO * c / (np.pi * d), dtype=np.float64)
