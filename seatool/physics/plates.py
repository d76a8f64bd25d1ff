"""Thin isotropic plates: bending stiffness, bending waves, critical frequency, modal densities.

Bending waves (Kirchhoff plate) and the in-plane longitudinal and shear wave fields.
All functions are pure and vectorised: array arguments broadcast against each other and
the result has the broadcast shape. SI units throughout. Modal densities are in modes per
hertz, ``n(f) = 2*pi*n(omega)``.

The formulas and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from ._checks import full as _full
from ._checks import poisson as _poisson
from ._checks import positive as _positive

__all__ = [
    "bending_stiffness",
    "critical_frequency",
    "plate_bending_group_speed",
    "plate_bending_modal_density",
    "plate_bending_phase_speed",
    "plate_bending_wavenumber",
    "plate_inplane_longitudinal_modal_density",
    "plate_inplane_shear_modal_density",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


# ---------------------------------------------------------------------------------------
# thin isotropic plate
# ---------------------------------------------------------------------------------------
def bending_stiffness(
    youngs_modulus: npt.ArrayLike, thickness: npt.ArrayLike, poisson_ratio: npt.ArrayLike
) -> FloatArray:
    """Bending stiffness of a thin homogeneous isotropic plate.

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    thickness : float or array_like
        Plate thickness h [m].
    poisson_ratio : float or array_like
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        D = E h^3 / (12 (1 - nu^2)) [N m].

    References
    ----------
    .. [1] Timoshenko, S.P., Woinowsky-Krieger, S. (1959). Theory of Plates and Shells,
       2nd ed., McGraw-Hill, ISBN 0-07-064779-8, sec. 4, eq. (3) (flexural rigidity).
    """
    e = _positive("youngs_modulus", youngs_modulus)
    h = _positive("thickness", thickness)
    nu = _poisson(poisson_ratio)
    return np.asarray(e * h**3 / (12.0 * (1.0 - nu**2)), dtype=np.float64)


def plate_bending_wavenumber(
    f: npt.ArrayLike, bending_stiffness: npt.ArrayLike, surface_density: npt.ArrayLike
) -> FloatArray:
    """Free bending wavenumber of a thin (Kirchhoff) plate.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    bending_stiffness : float or array_like
        Plate bending stiffness D [N m].
    surface_density : float or array_like
        Mass per unit area m'' [kg/m^2].

    Returns
    -------
    numpy.ndarray
        k_B = (omega^2 m'' / D)^(1/4) [rad/m].

    Notes
    -----
    From the Kirchhoff plate equation D nabla^4 w - m'' omega^2 w = 0. Valid while the
    bending wavelength is well above the thickness (see
    :func:`seatool.physics.validity.thin_plate_upper_frequency`).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.7 (bending waves in plates).
    """
    fr = _positive("f", f)
    d = _positive("bending_stiffness", bending_stiffness)
    m = _positive("surface_density", surface_density)
    omega = 2.0 * np.pi * fr
    return np.asarray((omega**2 * m / d) ** 0.25, dtype=np.float64)


def plate_bending_phase_speed(
    f: npt.ArrayLike, bending_stiffness: npt.ArrayLike, surface_density: npt.ArrayLike
) -> FloatArray:
    """Bending-wave phase speed of a thin plate, c_B = (omega^2 D / m'')^(1/4) [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    bending_stiffness : float or array_like
        Plate bending stiffness D [N m].
    surface_density : float or array_like
        Mass per unit area m'' [kg/m^2].

    Returns
    -------
    numpy.ndarray
        Phase speed omega / k_B [m/s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.7.
    """
    k = plate_bending_wavenumber(f, bending_stiffness, surface_density)
    return np.asarray(2.0 * np.pi * np.asarray(f, dtype=np.float64) / k, dtype=np.float64)


def plate_bending_group_speed(
    f: npt.ArrayLike, bending_stiffness: npt.ArrayLike, surface_density: npt.ArrayLike
) -> FloatArray:
    """Bending-wave group speed of a thin plate, c_g = 2 c_B [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    bending_stiffness : float or array_like
        Plate bending stiffness D [N m].
    surface_density : float or array_like
        Mass per unit area m'' [kg/m^2].

    Returns
    -------
    numpy.ndarray
        Group speed d omega / d k [m/s].

    Notes
    -----
    omega = sqrt(D/m'') k^2, hence d omega / dk = 2 omega / k = 2 c_B.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.7.
    """
    return 2.0 * plate_bending_phase_speed(f, bending_stiffness, surface_density)


def critical_frequency(
    bending_stiffness: npt.ArrayLike,
    surface_density: npt.ArrayLike,
    sound_speed: npt.ArrayLike,
) -> FloatArray:
    """Critical (coincidence) frequency of a thin plate in a fluid.

    Parameters
    ----------
    bending_stiffness : float or array_like
        Plate bending stiffness D [N m].
    surface_density : float or array_like
        Mass per unit area m'' [kg/m^2].
    sound_speed : float or array_like
        Speed of sound of the surrounding fluid c0 [m/s].

    Returns
    -------
    numpy.ndarray
        f_c = (c0^2 / (2 pi)) sqrt(m'' / D) [Hz], the frequency at which the free
        bending wave speed equals c0.

    Notes
    -----
    For a homogeneous plate f_c h = c0^2 sqrt(12) / (2 pi c_L'), independent of thickness
    (tabulated in [2]_).

    References
    ----------
    .. [1] Cremer, L. (1942). Theorie der Schalldämmung dünner Wände bei schrägem
       Einfall. Akustische Zeitschrift 7, 81-104.
    .. [2] Long, M. (2006). Architectural Acoustics, Elsevier, ISBN 0-12-455551-9,
       Table 9.1 and eq. 9.48.
    """
    d = _positive("bending_stiffness", bending_stiffness)
    m = _positive("surface_density", surface_density)
    c0 = _positive("sound_speed", sound_speed)
    return np.asarray(c0**2 / (2.0 * np.pi) * np.sqrt(m / d), dtype=np.float64)


def plate_bending_modal_density(
    f: npt.ArrayLike,
    area: npt.ArrayLike,
    bending_stiffness: npt.ArrayLike,
    surface_density: npt.ArrayLike,
) -> FloatArray:
    """Asymptotic modal density of a thin plate in bending, in modes per hertz.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz] (sets the output shape; the result does not depend on it).
    area : float or array_like
        Plate area S [m^2].
    bending_stiffness : float or array_like
        Plate bending stiffness D [N m].
    surface_density : float or array_like
        Mass per unit area m'' [kg/m^2].

    Returns
    -------
    numpy.ndarray
        n(f) = (S / 2) sqrt(m'' / D) [modes/Hz]  (n(omega) = n(f) / (2 pi)).

    Notes
    -----
    Weyl-type count of wavenumber lattice points: N(k) = S k^2 / (4 pi) with
    k^2 = omega sqrt(m''/D). Independent of frequency and, to leading order, of the
    boundary conditions. Equivalent forms: S sqrt(3) / (h c_L') = pi S f_c / c0^2.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 7 (modal density of plates).
    .. [2] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (from memory).
    """
    fr = _positive("f", f)
    s = _positive("area", area)
    d = _positive("bending_stiffness", bending_stiffness)
    m = _positive("surface_density", surface_density)
    return _full(0.5 * s * np.sqrt(m / d), fr)


def plate_inplane_longitudinal_modal_density(
    f: npt.ArrayLike, area: npt.ArrayLike, longitudinal_speed: npt.ArrayLike
) -> FloatArray:
    """Modal density of in-plane quasi-longitudinal waves of a plate [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    area : float or array_like
        Plate area S [m^2].
    longitudinal_speed : float or array_like
        Quasi-longitudinal plate speed c_L' [m/s] (:func:`plate_longitudinal_speed`).

    Returns
    -------
    numpy.ndarray
        n(f) = 2 pi f S / c_L'^2 [modes/Hz].

    Notes
    -----
    Two-dimensional non-dispersive wave field, n(f) = 2 pi f S / (c_p c_g) with
    c_p = c_g = c_L'. Counts only the compressional wave family.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (from memory).
    .. [2] Harris' Shock and Vibration Handbook, SEA chapter (which speeds enter).
    """
    fr = _positive("f", f)
    s = _positive("area", area)
    c = _positive("longitudinal_speed", longitudinal_speed)
    return np.asarray(2.0 * np.pi * fr * s / c**2, dtype=np.float64)


def plate_inplane_shear_modal_density(
    f: npt.ArrayLike, area: npt.ArrayLike, shear_speed: npt.ArrayLike
) -> FloatArray:
    """Modal density of in-plane shear waves of a plate [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    area : float or array_like
        Plate area S [m^2].
    shear_speed : float or array_like
        Shear wave speed c_S [m/s] (:func:`shear_speed`).

    Returns
    -------
    numpy.ndarray
        n(f) = 2 pi f S / c_S^2 [modes/Hz].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (from memory).
    """
    fr = _positive("f", f)
    s = _positive("area", area)
    c = _positive("shear_speed", shear_speed)
    return np.asarray(2.0 * np.pi * fr * s / c**2, dtype=np.float64)
