"""Acoustic SEA subsystems: characteristic impedance, cavity and duct modal densities.

Pure, vectorised functions in SI units; modal densities in modes per hertz. The formulas
and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

from typing import Literal

import numpy as np
import numpy.typing as npt

from ._checks import full as _full
from ._checks import positive as _positive

__all__ = [
    "cavity_modal_density",
    "cavity_mode_count",
    "characteristic_impedance",
    "duct_cut_on_frequency_circular",
    "duct_cut_on_frequency_rectangular",
    "duct_modal_density",
    "rectangular_cavity_geometry",
]

FloatArray = npt.NDArray[np.float64]

_SOUND_PRESSURE_RIGID_DUCT_BESSEL_ZERO = 1.84118  # first zero of J1'(x), A&S Table 9.5


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
