"""Wave fields and modal densities of structural SEA subsystems.

Thin isotropic plates (bending, in-plane longitudinal and shear waves), orthotropic and
ribbed plates, sandwich panels with a shear-flexible core, thin cylindrical shells,
beams (bending in two planes, torsion, longitudinal) and single-degree-of-freedom
resonators.

All functions are pure and vectorised: array arguments broadcast against each other and
the result has the broadcast shape. SI units throughout. Modal densities are in modes per
hertz, ``n(f) = 2*pi*n(omega)``.

The formulas and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import numpy.typing as npt
from scipy import special

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive

__all__ = [
    "BeamSection",
    "beam_bending_group_speed",
    "beam_bending_modal_density",
    "beam_bending_phase_speed",
    "beam_bending_wavenumber",
    "bar_longitudinal_speed",
    "bending_stiffness",
    "circular_section",
    "critical_frequency",
    "cylinder_modal_density_ratio",
    "longitudinal_modal_density",
    "orthotropic_bending_wavenumber",
    "orthotropic_critical_frequencies",
    "orthotropic_plate_modal_density",
    "plate_bending_group_speed",
    "plate_bending_modal_density",
    "plate_bending_phase_speed",
    "plate_bending_wavenumber",
    "plate_inplane_longitudinal_modal_density",
    "plate_inplane_shear_modal_density",
    "plate_longitudinal_speed",
    "rectangular_section",
    "resonator_band_fraction",
    "resonator_modal_density",
    "resonator_natural_frequency",
    "rib_second_moment_rectangular",
    "ribbed_plate_bay_frequency",
    "ribbed_plate_stiffness",
    "ring_frequency",
    "sandwich_group_speed",
    "sandwich_modal_density",
    "sandwich_phase_speed",
    "sandwich_section",
    "sandwich_wavenumber",
    "shear_modulus",
    "shear_speed",
    "shell_bending_modal_density",
    "torsion_modal_density",
    "torsion_speed",
]

FloatArray = npt.NDArray[np.float64]


# ---------------------------------------------------------------------------------------
# input checks (shared by the physics modules)
# ---------------------------------------------------------------------------------------
def _poisson(value: npt.ArrayLike) -> FloatArray:
    """Return Poisson's ratio as a float array; raise ValueError outside (-1, 0.5)."""
    arr = np.asarray(value, dtype=np.float64)
    if not np.all(np.isfinite(arr)) or np.any(arr <= -1.0) or np.any(arr >= 0.5):
        msg = f"poisson_ratio must lie in (-1, 0.5), got {value!r}"
        raise ValueError(msg)
    return arr


def _full(value: FloatArray, *others: npt.ArrayLike) -> FloatArray:
    """Broadcast a frequency-independent result to the broadcast shape of ``others``."""
    shape = np.broadcast_shapes(np.shape(value), *(np.shape(o) for o in others))
    return np.array(np.broadcast_to(value, shape), dtype=np.float64)


# ---------------------------------------------------------------------------------------
# material wave speeds
# ---------------------------------------------------------------------------------------
def shear_modulus(youngs_modulus: npt.ArrayLike, poisson_ratio: npt.ArrayLike) -> FloatArray:
    """Shear modulus of an isotropic material.

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    poisson_ratio : float or array_like
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        G = E / (2 (1 + nu)) [Pa].

    References
    ----------
    .. [1] Timoshenko, S.P., Goodier, J.N. (1951). Theory of Elasticity, 2nd ed.,
       McGraw-Hill, sec. 6 (isotropic elastic constants).
    """
    e = _positive("youngs_modulus", youngs_modulus)
    nu = _poisson(poisson_ratio)
    return np.asarray(e / (2.0 * (1.0 + nu)), dtype=np.float64)


def plate_longitudinal_speed(
    youngs_modulus: npt.ArrayLike, density: npt.ArrayLike, poisson_ratio: npt.ArrayLike
) -> FloatArray:
    """Quasi-longitudinal (in-plane compressional) wave speed of a thin plate.

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Material density rho [kg/m^3].
    poisson_ratio : float or array_like
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        c_L' = sqrt(E / (rho (1 - nu^2))) [m/s].

    Notes
    -----
    Plane-stress compressional wave; valid while the wavelength is large compared with
    the thickness.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.3 (quasi-longitudinal waves in plates).
    """
    e = _positive("youngs_modulus", youngs_modulus)
    rho = _positive("density", density)
    nu = _poisson(poisson_ratio)
    return np.asarray(np.sqrt(e / (rho * (1.0 - nu**2))), dtype=np.float64)


def bar_longitudinal_speed(youngs_modulus: npt.ArrayLike, density: npt.ArrayLike) -> FloatArray:
    """Quasi-longitudinal wave speed of a slender bar (rod).

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Material density rho [kg/m^3].

    Returns
    -------
    numpy.ndarray
        c_L = sqrt(E / rho) [m/s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.3 (quasi-longitudinal waves in bars).
    """
    e = _positive("youngs_modulus", youngs_modulus)
    rho = _positive("density", density)
    return np.asarray(np.sqrt(e / rho), dtype=np.float64)


def shear_speed(
    youngs_modulus: npt.ArrayLike, density: npt.ArrayLike, poisson_ratio: npt.ArrayLike
) -> FloatArray:
    """Shear (transverse) wave speed, also the in-plane shear wave speed of a plate.

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Material density rho [kg/m^3].
    poisson_ratio : float or array_like
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        c_S = sqrt(G / rho), G = E / (2 (1 + nu)) [m/s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.4 (transverse/shear waves).
    """
    g = shear_modulus(youngs_modulus, poisson_ratio)
    rho = _positive("density", density)
    return np.asarray(np.sqrt(g / rho), dtype=np.float64)


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


# ---------------------------------------------------------------------------------------
# orthotropic and ribbed plates
# ---------------------------------------------------------------------------------------
_GL_NODES, _GL_WEIGHTS = np.polynomial.legendre.leggauss(96)


def _directional_stiffness(
    phi: FloatArray, dx: FloatArray, dy: FloatArray, h: FloatArray
) -> FloatArray:
    c2 = np.cos(phi) ** 2
    s2 = np.sin(phi) ** 2
    return np.asarray(dx * c2**2 + 2.0 * h * c2 * s2 + dy * s2**2, dtype=np.float64)


def _check_orthotropic(
    dx: npt.ArrayLike, dy: npt.ArrayLike, h: npt.ArrayLike | None
) -> tuple[FloatArray, FloatArray, FloatArray]:
    dxa = _positive("bending_stiffness_x", dx)
    dya = _positive("bending_stiffness_y", dy)
    ha = np.sqrt(dxa * dya) if h is None else _positive("torsional_stiffness", h)
    return dxa, dya, np.asarray(ha, dtype=np.float64)


def orthotropic_bending_wavenumber(
    f: npt.ArrayLike,
    angle: npt.ArrayLike,
    bending_stiffness_x: npt.ArrayLike,
    bending_stiffness_y: npt.ArrayLike,
    surface_density: npt.ArrayLike,
    *,
    torsional_stiffness: npt.ArrayLike | None = None,
) -> FloatArray:
    """Bending wavenumber of a thin orthotropic (Huber) plate in a given direction.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    angle : float or array_like
        Propagation direction phi measured from the x axis [rad].
    bending_stiffness_x, bending_stiffness_y : float or array_like
        Bending stiffnesses D_x, D_y [N m].
    surface_density : float or array_like
        Mass per unit area m'' [kg/m^2].
    torsional_stiffness : float or array_like, optional
        Effective torsional rigidity H = nu_y D_x + 2 D_xy [N m]. Default sqrt(D_x D_y)
        (Huber's approximation).

    Returns
    -------
    numpy.ndarray
        k(phi) = (m'' omega^2 / D(phi))^(1/4) [rad/m] with
        D(phi) = D_x cos^4 phi + 2 H cos^2 phi sin^2 phi + D_y sin^4 phi.

    References
    ----------
    .. [1] Huber, M.T. (1923). Die Theorie der kreuzweise bewehrten Eisenbetonplatte.
       Der Bauingenieur 4, 354-360.
    .. [2] Timoshenko, S.P., Woinowsky-Krieger, S. (1959). Theory of Plates and Shells,
       2nd ed., McGraw-Hill, sec. 86, eq. (212) (orthotropic plate equation).
    """
    fr = _positive("f", f)
    phi = np.asarray(angle, dtype=np.float64)
    m = _positive("surface_density", surface_density)
    dx, dy, h = _check_orthotropic(bending_stiffness_x, bending_stiffness_y, torsional_stiffness)
    dphi = _directional_stiffness(phi, dx, dy, h)
    omega = 2.0 * np.pi * fr
    return np.asarray((m * omega**2 / dphi) ** 0.25, dtype=np.float64)


def orthotropic_plate_modal_density(
    f: npt.ArrayLike,
    area: npt.ArrayLike,
    bending_stiffness_x: npt.ArrayLike,
    bending_stiffness_y: npt.ArrayLike,
    surface_density: npt.ArrayLike,
    *,
    torsional_stiffness: npt.ArrayLike | None = None,
) -> FloatArray:
    """Asymptotic bending modal density of a thin orthotropic plate [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz] (sets the output shape; the result does not depend on it).
    area : float or array_like
        Plate area S [m^2].
    bending_stiffness_x, bending_stiffness_y : float or array_like
        Bending stiffnesses D_x, D_y [N m].
    surface_density : float or array_like
        Mass per unit area m'' [kg/m^2].
    torsional_stiffness : float or array_like, optional
        Effective torsional rigidity H [N m]; default sqrt(D_x D_y).

    Returns
    -------
    numpy.ndarray
        n(f) = (S / pi) * integral_0^(pi/2) sqrt(m'' / D(phi)) dphi [modes/Hz].

    Notes
    -----
    Area counting in the positive quadrant of wavenumber space, one mode per
    pi^2 / S, with the direction-dependent dispersion of
    :func:`orthotropic_bending_wavenumber`: N(omega) = (S / pi^2) * integral
    k(phi)^2 / 2 dphi and k(phi)^2 = omega sqrt(m''/D(phi)). The angle integral (an
    elliptic integral in general) is evaluated by 96-point Gauss-Legendre quadrature.
    For H = sqrt(D_x D_y) it reduces exactly to the isotropic formula with the
    geometric-mean stiffness sqrt(D_x D_y) [1]_; for D_x = D_y = H to
    :func:`plate_bending_modal_density`.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (orthotropic
       plate modal density; from memory).
    .. [2] Bosmans, I., Mees, P., Vermeir, G. (1996). Structure-borne sound transmission
       between thin orthotropic plates: analytical solutions. J. Sound Vib. 191(1), 75-90
       (orthotropic dispersion used in SEA; from memory).
    """
    fr = _positive("f", f)
    s = _positive("area", area)
    m = _positive("surface_density", surface_density)
    dx, dy, h = _check_orthotropic(bending_stiffness_x, bending_stiffness_y, torsional_stiffness)
    phi = 0.25 * np.pi * (_GL_NODES + 1.0)  # nodes on (0, pi/2)
    w = 0.25 * np.pi * _GL_WEIGHTS
    shape = np.broadcast_shapes(dx.shape, dy.shape, h.shape)
    dphi = _directional_stiffness(phi.reshape((-1,) + (1,) * len(shape)), dx, dy, h)
    integral = np.tensordot(w, 1.0 / np.sqrt(dphi), axes=(0, 0))
    return _full(s / np.pi * np.sqrt(m) * integral, fr)


def orthotropic_critical_frequencies(
    bending_stiffness_x: npt.ArrayLike,
    bending_stiffness_y: npt.ArrayLike,
    surface_density: npt.ArrayLike,
    sound_speed: npt.ArrayLike,
) -> tuple[FloatArray, FloatArray]:
    """Lower and upper critical frequencies of an orthotropic plate.

    Parameters
    ----------
    bending_stiffness_x, bending_stiffness_y : float or array_like
        Bending stiffnesses D_x, D_y [N m].
    surface_density : float or array_like
        Mass per unit area m'' [kg/m^2].
    sound_speed : float or array_like
        Speed of sound of the fluid c0 [m/s].

    Returns
    -------
    tuple of numpy.ndarray
        (f_c,low, f_c,high) [Hz]: coincidence occurs in the stiff direction first; between
        the two the plate radiates efficiently in some directions only.

    References
    ----------
    .. [1] Heckl, M. (1960). Untersuchungen an orthotropen Platten. Acustica 10, 109-115
       (coincidence range of orthotropic plates; from memory).
    """
    fx = critical_frequency(bending_stiffness_x, surface_density, sound_speed)
    fy = critical_frequency(bending_stiffness_y, surface_density, sound_speed)
    return np.minimum(fx, fy), np.maximum(fx, fy)


def rib_second_moment_rectangular(
    rib_width: npt.ArrayLike, rib_height: npt.ArrayLike, plate_thickness: npt.ArrayLike
) -> FloatArray:
    """Second moment of area of a rectangular one-sided rib about the plate mid-plane.

    Parameters
    ----------
    rib_width : float or array_like
        Rib width b_r [m].
    rib_height : float or array_like
        Rib height h_r measured from the plate surface [m].
    plate_thickness : float or array_like
        Plate thickness h [m].

    Returns
    -------
    numpy.ndarray
        I = b_r h_r^3 / 12 + b_r h_r (h/2 + h_r/2)^2 [m^4] (parallel-axis theorem).

    Notes
    -----
    Timoshenko & Woinowsky-Krieger take the rib moment of inertia about the middle plane
    of the plate for the smeared (orthotropic) stiffness; the neutral-axis shift of the
    composite section is neglected in that model.

    References
    ----------
    .. [1] Timoshenko, S.P., Woinowsky-Krieger, S. (1959). Theory of Plates and Shells,
       2nd ed., McGraw-Hill, sec. 86 (plate reinforced by equidistant stiffeners).
    """
    b = _positive("rib_width", rib_width)
    hr = _positive("rib_height", rib_height)
    h = _positive("plate_thickness", plate_thickness)
    return np.asarray(b * hr**3 / 12.0 + b * hr * (0.5 * h + 0.5 * hr) ** 2, dtype=np.float64)


def ribbed_plate_stiffness(
    youngs_modulus: npt.ArrayLike,
    thickness: npt.ArrayLike,
    poisson_ratio: npt.ArrayLike,
    rib_second_moment: npt.ArrayLike,
    rib_spacing: npt.ArrayLike,
    *,
    rib_youngs_modulus: npt.ArrayLike | None = None,
) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Smeared orthotropic stiffnesses of a plate with equidistant ribs along x.

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus of the plate E [Pa].
    thickness : float or array_like
        Plate thickness h [m].
    poisson_ratio : float or array_like
        Poisson's ratio of the plate [-].
    rib_second_moment : float or array_like
        Second moment of area I of one rib cross-section about the plate mid-plane [m^4]
        (:func:`rib_second_moment_rectangular`).
    rib_spacing : float or array_like
        Distance between rib centre lines d [m].
    rib_youngs_modulus : float or array_like, optional
        Young's modulus of the ribs E' [Pa]; default: the plate's.

    Returns
    -------
    tuple of numpy.ndarray
        (D_x, D_y, H) [N m]: D_x = D + E' I / d (bending about the y axis, i.e. waves
        travelling along the ribs), D_y = H = D.

    Notes
    -----
    Timoshenko & Woinowsky-Krieger sec. 86, case of a plate reinforced by equidistant
    stiffeners in one direction. The smeared model holds while the bending wavelength is
    long against the rib spacing; above :func:`ribbed_plate_bay_frequency` the skin bays
    vibrate between the ribs and the panel should be modelled as separate bays.
    The rib mass enters m'' separately (add rib mass per unit area, rho A_rib / d).

    References
    ----------
    .. [1] Timoshenko, S.P., Woinowsky-Krieger, S. (1959). Theory of Plates and Shells,
       2nd ed., McGraw-Hill, sec. 86 (rigidities of stiffened plates; from memory).
    .. [2] Troitsky, M.S. (1976). Stiffened Plates: Bending, Stability and Vibrations,
       Elsevier, ISBN 0-444-41369-1 (orthotropic equivalent of ribbed plates).
    """
    d = bending_stiffness(youngs_modulus, thickness, poisson_ratio)
    i_rib = _positive("rib_second_moment", rib_second_moment)
    spacing = _positive("rib_spacing", rib_spacing)
    e_rib = (
        np.asarray(youngs_modulus, dtype=np.float64)
        if rib_youngs_modulus is None
        else _positive("rib_youngs_modulus", rib_youngs_modulus)
    )
    dx = d + e_rib * i_rib / spacing
    shape = np.broadcast_shapes(dx.shape, d.shape)
    dy = np.array(np.broadcast_to(d, shape), dtype=np.float64)
    return np.asarray(dx, dtype=np.float64), dy, dy.copy()


def ribbed_plate_bay_frequency(
    rib_spacing: npt.ArrayLike,
    bending_stiffness: npt.ArrayLike,
    surface_density: npt.ArrayLike,
) -> FloatArray:
    """First bending resonance of a skin bay between two ribs (strip, pinned edges).

    Parameters
    ----------
    rib_spacing : float or array_like
        Clear distance between ribs d [m].
    bending_stiffness : float or array_like
        Skin bending stiffness D [N m].
    surface_density : float or array_like
        Skin mass per unit area m'' [kg/m^2].

    Returns
    -------
    numpy.ndarray
        f_bay = (pi / 2) sqrt(D / m'') / d^2 [Hz]: the frequency at which half a skin
        bending wavelength fits between two ribs.

    Notes
    -----
    Common practice: the smeared orthotropic model of :func:`ribbed_plate_stiffness` is
    used well below f_bay; near and above it the bays act as plates of their own.
    The formula itself is the first mode of a simply supported strip (Kirchhoff).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 7 (natural frequencies of simply supported
       plates and strips).
    """
    d = _positive("rib_spacing", rib_spacing)
    bd = _positive("bending_stiffness", bending_stiffness)
    m = _positive("surface_density", surface_density)
    return np.asarray(0.5 * np.pi * np.sqrt(bd / m) / d**2, dtype=np.float64)


# ---------------------------------------------------------------------------------------
# sandwich panels
# ---------------------------------------------------------------------------------------
@dataclass(frozen=True)
class SandwichSection:
    """Section properties of a symmetric sandwich panel (per unit width).

    Attributes
    ----------
    face_bending_stiffness : float
        D_f, sum of the face sheets' own bending stiffnesses [N m].
    sandwich_bending_stiffness : float
        D_0, parallel-axis (membrane) contribution of the faces [N m].
    shear_stiffness : float
        S, transverse shear stiffness of the core [N/m].
    surface_density : float
        Total mass per unit area m'' [kg/m^2].
    """

    face_bending_stiffness: float
    sandwich_bending_stiffness: float
    shear_stiffness: float
    surface_density: float

    @property
    def total_bending_stiffness(self) -> float:
        """Whole-section bending stiffness D_f + D_0 [N m] (no core shear)."""
        return self.face_bending_stiffness + self.sandwich_bending_stiffness


def sandwich_section(
    face_youngs_modulus: float,
    face_poisson_ratio: float,
    face_thickness: float,
    face_density: float,
    core_shear_modulus: float,
    core_thickness: float,
    core_density: float,
) -> SandwichSection:
    """Section properties of a symmetric sandwich panel with a shear-flexible core.

    Parameters
    ----------
    face_youngs_modulus : float
        Young's modulus of each face sheet E_f [Pa].
    face_poisson_ratio : float
        Poisson's ratio of the face sheets [-].
    face_thickness : float
        Thickness of each face sheet t [m].
    face_density : float
        Density of the face sheets [kg/m^3].
    core_shear_modulus : float
        Transverse shear modulus of the core G_c [Pa].
    core_thickness : float
        Core thickness c [m].
    core_density : float
        Core density [kg/m^3].

    Returns
    -------
    SandwichSection
        D_f = 2 E_f t^3 / (12 (1 - nu^2)), D_0 = E_f t d^2 / (2 (1 - nu^2)),
        S = G_c d^2 / c, m'' = 2 rho_f t + rho_c c, with d = c + t the distance between
        the face centroids.

    Notes
    -----
    Thick-face sandwich theory of Allen (1969), ch. 3: the core carries transverse shear
    only (its own bending and in-plane stiffness neglected); plate moduli E/(1 - nu^2)
    replace beam moduli.

    References
    ----------
    .. [1] Allen, H.G. (1969). Analysis and Design of Structural Sandwich Panels,
       Pergamon, ch. 2-3 (flexural and shear stiffness; thick faces; from memory).
    .. [2] Zenkert, D. (1995). An Introduction to Sandwich Construction, EMAS,
       ISBN 0-947817-77-8, ch. 3 (from memory).
    """
    ef = float(_positive("face_youngs_modulus", face_youngs_modulus))
    nu = float(_poisson(face_poisson_ratio))
    t = float(_positive("face_thickness", face_thickness))
    rho_f = float(_positive("face_density", face_density))
    gc = float(_positive("core_shear_modulus", core_shear_modulus))
    c = float(_positive("core_thickness", core_thickness))
    rho_c = float(_nonnegative("core_density", core_density))
    ep = ef / (1.0 - nu**2)
    d = c + t
    return SandwichSection(
        face_bending_stiffness=2.0 * ep * t**3 / 12.0,
        sandwich_bending_stiffness=0.5 * ep * t * d**2,
        shear_stiffness=gc * d**2 / c,
        surface_density=2.0 * rho_f * t + rho_c * c,
    )


def _sandwich_k2(omega: FloatArray, sec: SandwichSection) -> FloatArray:
    """Solve the sandwich dispersion for x = k^2 by bisection in log space (vectorised)."""
    df = sec.face_bending_stiffness
    d0 = sec.sandwich_bending_stiffness
    s = sec.shear_stiffness
    m = sec.surface_density

    def residual(x: FloatArray) -> FloatArray:
        return np.asarray(x**2 * (df + d0 * s / (d0 * x + s)) - m * omega**2, dtype=np.float64)

    # the root lies between the whole-section and the face-sheet bending solutions
    lo = np.log(omega * np.sqrt(m / (df + d0)))
    hi = np.log(omega * np.sqrt(m / df))
    for _ in range(80):
        mid = 0.5 * (lo + hi)
        pos = residual(np.exp(mid)) > 0.0
        hi = np.where(pos, mid, hi)
        lo = np.where(pos, lo, mid)
    x = np.exp(0.5 * (lo + hi))
    # two Newton polishing steps
    for _ in range(2):
        g = residual(x)
        dg = 2.0 * x * (df + d0 * s / (d0 * x + s)) - x**2 * d0**2 * s / (d0 * x + s) ** 2
        x = x - g / dg
    return np.asarray(x, dtype=np.float64)


def sandwich_wavenumber(f: npt.ArrayLike, section: SandwichSection) -> FloatArray:
    """Free bending wavenumber of a sandwich panel with a shear-flexible core.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    section : SandwichSection
        Section properties (:func:`sandwich_section`).

    Returns
    -------
    numpy.ndarray
        Real positive root k [rad/m] of the sixth-order dispersion relation

        m'' omega^2 = k^4 (D_f + D_0 S / (D_0 k^2 + S)),

        i.e. D_f D_0 k^6 + (D_f + D_0) S k^4 - m'' omega^2 D_0 k^2 - m'' omega^2 S = 0.

    Notes
    -----
    Low frequency: k -> (m'' omega^2 / (D_f + D_0))^(1/4), whole-section bending.
    Intermediate: core shear, m'' omega^2 ~ S k^2. High frequency: k ->
    (m'' omega^2 / D_f)^(1/4), bending of the face sheets alone. Rotary and in-plane
    inertia and core compression are neglected (no dilatational resonance). The
    equation is the thick-face sandwich beam equation of Allen (1969) in plate form and
    the real-modulus special case of the sixth-order equation of Mead & Markus (1969).
    The left side is monotonic in k^2, so the positive root is unique; it is found by
    bisection between the two bending limits.

    References
    ----------
    .. [1] Allen, H.G. (1969). Analysis and Design of Structural Sandwich Panels,
       Pergamon, ch. 3 (thick faces; from memory).
    .. [2] Mead, D.J., Markus, S. (1969). The forced vibration of a three-layer, damped
       sandwich beam with arbitrary boundary conditions. J. Sound Vib. 10(2), 163-175.
    .. [3] Nilsson, A.C. (1990). Wave propagation in and sound transmission through
       sandwich plates. J. Sound Vib. 138(1), 73-94.
    """
    fr = _positive("f", f)
    return np.asarray(np.sqrt(_sandwich_k2(2.0 * np.pi * fr, section)), dtype=np.float64)


def sandwich_phase_speed(f: npt.ArrayLike, section: SandwichSection) -> FloatArray:
    """Bending phase speed omega / k of a sandwich panel [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    section : SandwichSection
        Section properties.

    Returns
    -------
    numpy.ndarray
        Phase speed [m/s] from :func:`sandwich_wavenumber`.

    References
    ----------
    .. [1] Nilsson, A.C. (1990). J. Sound Vib. 138(1), 73-94.
    """
    k = sandwich_wavenumber(f, section)
    return np.asarray(2.0 * np.pi * np.asarray(f, dtype=np.float64) / k, dtype=np.float64)


def sandwich_group_speed(f: npt.ArrayLike, section: SandwichSection) -> FloatArray:
    """Bending group speed d omega / dk of a sandwich panel [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    section : SandwichSection
        Section properties.

    Returns
    -------
    numpy.ndarray
        c_g = (4 k^3 B + k^4 dB/dk) / (2 m'' omega) [m/s] with
        B(k) = D_f + D_0 S / (D_0 k^2 + S) (differentiated dispersion relation of
        :func:`sandwich_wavenumber`).

    References
    ----------
    .. [1] Nilsson, A.C. (1990). J. Sound Vib. 138(1), 73-94.
    """
    fr = _positive("f", f)
    omega = 2.0 * np.pi * fr
    k = sandwich_wavenumber(fr, section)
    df = section.face_bending_stiffness
    d0 = section.sandwich_bending_stiffness
    s = section.shear_stiffness
    b = df + d0 * s / (d0 * k**2 + s)
    db = -2.0 * d0**2 * s * k / (d0 * k**2 + s) ** 2
    return np.asarray(
        (4.0 * k**3 * b + k**4 * db) / (2.0 * section.surface_density * omega), dtype=np.float64
    )


def sandwich_modal_density(
    f: npt.ArrayLike, area: npt.ArrayLike, section: SandwichSection
) -> FloatArray:
    """Asymptotic bending modal density of a sandwich panel [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    area : float or array_like
        Panel area S [m^2].
    section : SandwichSection
        Section properties.

    Returns
    -------
    numpy.ndarray
        n(f) = S k / c_g = 2 pi f S / (c_p c_g) [modes/Hz].

    Notes
    -----
    Two-dimensional Weyl count N = S k^2 / (4 pi) of an in-plane isotropic dispersive wave
    field. Tends to the plate value with D_f + D_0 at low and with D_f at high frequency.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (modal density
       from the dispersion relation; from memory).
    .. [2] Nilsson, A.C. (1990). J. Sound Vib. 138(1), 73-94.
    """
    s = _positive("area", area)
    k = sandwich_wavenumber(f, section)
    cg = sandwich_group_speed(f, section)
    return np.asarray(s * k / cg, dtype=np.float64)


# ---------------------------------------------------------------------------------------
# thin cylindrical shell
# ---------------------------------------------------------------------------------------
def ring_frequency(radius: npt.ArrayLike, longitudinal_speed: npt.ArrayLike) -> FloatArray:
    """Ring frequency of a thin cylindrical shell.

    Parameters
    ----------
    radius : float or array_like
        Mean shell radius a [m].
    longitudinal_speed : float or array_like
        Quasi-longitudinal plate speed c_L' [m/s] (:func:`plate_longitudinal_speed`).

    Returns
    -------
    numpy.ndarray
        f_r = c_L' / (2 pi a) [Hz]: the frequency at which a longitudinal wavelength equals
        the circumference (breathing mode n = 0 of the infinite cylinder).

    References
    ----------
    .. [1] Heckl, M. (1962). Vibrations of point-driven cylindrical shells. J. Acoust.
       Soc. Am. 34(10), 1553-1557.
    .. [2] Leissa, A.W. (1973). Vibration of Shells, NASA SP-288 (ring frequency of the
       n = 0 mode; from memory).
    """
    a = _positive("radius", radius)
    c = _positive("longitudinal_speed", longitudinal_speed)
    return np.asarray(c / (2.0 * np.pi * a), dtype=np.float64)


def cylinder_modal_density_ratio(frequency_ratio: npt.ArrayLike) -> FloatArray:
    """Ratio of the thin-shell to the flat-plate bending modal density.

    Parameters
    ----------
    frequency_ratio : float or array_like
        nu = f / f_m [-], > 0, with f_m the frequency where the membrane term of the
        dispersion relation saturates (see :func:`shell_bending_modal_density`).

    Returns
    -------
    numpy.ndarray
        n_shell / n_plate [-]:

        * nu < 1: sqrt(nu / 2) K((1 + nu) / 2) * 2 / pi
        * nu > 1: sqrt(nu / (1 + nu)) K(2 / (1 + nu)) * 2 / pi
        * nu = 1: inf (logarithmic singularity of the continuous count)

        with K(m) the complete elliptic integral of the first kind, parameter m = k^2.

    Notes
    -----
    Heckl's simplified (Donnell-type) dispersion relation of the thin cylindrical shell,
    in non-dimensional form nu^2 = (k_x / k)^4 + beta'^2 (k a)^4 (beta' a constant;
    beta'^2 = h^2 / (12 a^2 (1 - nu_P^2)) with Poisson's ratio nu_P),
    and the wavenumber-area count of Szechenyi (1971) give

        n / n_p = (2 / pi) * integral over {0 < phi < pi/2, cos^2 phi < nu} of
                  nu / sqrt(nu^2 - cos^4 phi) dphi.

    With u = cos^2 phi the integral becomes integral du / sqrt(u (1-u) (nu-u) (nu+u)) * nu/2,
    a complete elliptic integral of the first kind (standard reduction of an integral
    over a quartic with four real roots, see Byrd & Friedman; the reduction was done here
    and is checked against direct numerical quadrature in the tests).
    Asymptotes: 0.8346 sqrt(nu) for nu << 1, 1 + 3/(16 nu^2) for nu >> 1.
    The peak at nu = 1 is an artefact of the continuous count; finite shells give a
    finite, rounded peak (band averaging and the axial mode spacing).

    References
    ----------
    .. [1] Heckl, M. (1962). Vibrations of point-driven cylindrical shells. J. Acoust.
       Soc. Am. 34(10), 1553-1557 (simplified dispersion relation).
    .. [2] Szechenyi, E. (1971). Modal densities and radiation efficiencies of unstiffened
       cylinders using statistical methods. J. Sound Vib. 19(1), 65-81 (wavenumber-space
       mode counting; closed forms there not checked here).
    .. [3] Byrd, P.F., Friedman, M.D. (1971). Handbook of Elliptic Integrals for Engineers
       and Scientists, 2nd ed., Springer (reduction to K).
    """
    nu = _positive("frequency_ratio", frequency_ratio)
    below = nu < 1.0
    above = nu > 1.0
    out = np.full(nu.shape, np.inf, dtype=np.float64)
    nb = np.where(below, nu, 0.5)
    na = np.where(above, nu, 2.0)
    val_b = np.sqrt(nb / 2.0) * special.ellipk((1.0 + nb) / 2.0)
    val_a = np.sqrt(na / (1.0 + na)) * special.ellipk(2.0 / (1.0 + na))
    out = np.where(below, val_b, out)
    out = np.where(above, val_a, out)
    return np.asarray(2.0 / np.pi * out, dtype=np.float64)


def shell_bending_modal_density(
    f: npt.ArrayLike,
    area: npt.ArrayLike,
    radius: npt.ArrayLike,
    thickness: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    density: npt.ArrayLike,
    poisson_ratio: npt.ArrayLike,
) -> FloatArray:
    """Asymptotic flexural modal density of a thin cylindrical shell or curved panel.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    area : float or array_like
        Shell area S [m^2] (2 pi a L for a closed cylinder of length L; the developed
        area for a curved panel).
    radius : float or array_like
        Radius of curvature a [m].
    thickness : float or array_like
        Shell thickness h [m].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    density : float or array_like
        Density rho [kg/m^3].
    poisson_ratio : float or array_like
        Poisson's ratio nu [-].

    Returns
    -------
    numpy.ndarray
        n(f) = n_p * ratio(f / f_m) [modes/Hz] with the flat-plate value
        n_p = sqrt(3) S / (h c_L') and :func:`cylinder_modal_density_ratio` evaluated at
        f / f_m, f_m = sqrt(E / rho) / (2 pi a) = sqrt(1 - nu^2) * f_r.

    Notes
    -----
    The flexural (lowest) branch of the Donnell-Mushtari shell equations is, for
    k a >> 1 or k_x << k, Omega^2 = (1 - nu^2) (k_x / k)^4 + beta^2 (k a)^4 with
    Omega = f / f_r, f_r = c_L' / (2 pi a) (:func:`ring_frequency`) and
    beta = h / (a sqrt 12) (Heckl 1962). Dividing by (1 - nu^2) gives the form used by
    :func:`cylinder_modal_density_ratio` with frequency ratio f / f_m: the membrane term
    saturates at the ring frequency based on the bar speed sqrt(E / rho), which is where
    the continuous count peaks. The n = 0 breathing resonance itself is at f_r.

    Validity: thin shell (h << a), isotropic homogeneous wall, many modes per band.
    Below the ring frequency the axial mode spacing of short shells makes band counts
    scatter. Near f = f_m the continuous formula diverges logarithmically; band-average
    it (e.g. scipy.integrate.quad over the band) rather than sampling at f_m.
    In-plane (longitudinal, shear) wave families are not included.

    References
    ----------
    .. [1] Heckl, M. (1962). Vibrations of point-driven cylindrical shells. J. Acoust.
       Soc. Am. 34(10), 1553-1557 (simplified flexural dispersion relation).
    .. [2] Szechenyi, E. (1971). Modal densities and radiation efficiencies of unstiffened
       cylinders using statistical methods. J. Sound Vib. 19(1), 65-81 (wavenumber-space
       mode count).
    .. [3] Leissa, A.W. (1973). Vibration of Shells, NASA SP-288, ch. 2 (Donnell-Mushtari
       equations; from memory).
    """
    fr = _positive("f", f)
    s = _positive("area", area)
    h = _positive("thickness", thickness)
    c = plate_longitudinal_speed(youngs_modulus, density, poisson_ratio)
    nu = np.asarray(poisson_ratio, dtype=np.float64)
    n_p = np.sqrt(3.0) * s / (h * c)
    f_m = ring_frequency(radius, c) * np.sqrt(1.0 - nu**2)
    ratio = cylinder_modal_density_ratio(fr / f_m)
    return np.asarray(n_p * ratio, dtype=np.float64)


# ---------------------------------------------------------------------------------------
# beams
# ---------------------------------------------------------------------------------------
@dataclass(frozen=True)
class BeamSection:
    """Cross-section constants of a beam.

    Attributes
    ----------
    area : float
        Cross-section area A [m^2].
    second_moment_y : float
        Second moment of area I_y about the y axis (bending deflection along z) [m^4].
    second_moment_z : float
        Second moment of area I_z about the z axis (bending deflection along y) [m^4].
    torsion_constant : float
        Saint-Venant torsion constant J [m^4].
    polar_moment : float
        Polar second moment of area I_p = I_y + I_z [m^4].
    """

    area: float
    second_moment_y: float
    second_moment_z: float
    torsion_constant: float
    polar_moment: float


def rectangular_section(width: float, height: float, *, terms: int = 50) -> BeamSection:
    """Section constants of a solid rectangular beam.

    Parameters
    ----------
    width : float
        Width b along y [m].
    height : float
        Height h along z [m].
    terms : int, optional
        Number of odd terms of the Saint-Venant series for J (default 50).

    Returns
    -------
    BeamSection
        A = b h, I_y = b h^3 / 12, I_z = h b^3 / 12, I_p = I_y + I_z, and the torsion
        constant J = (1/3) a t^3 [1 - (192 / pi^5) (t / a) sum_{n odd} tanh(n pi a / (2 t))
        / n^5] with a = max(b, h), t = min(b, h).

    References
    ----------
    .. [1] Timoshenko, S.P., Goodier, J.N. (1951). Theory of Elasticity, 2nd ed.,
       McGraw-Hill, sec. 93 (torsion of a rectangular bar, series solution; from memory).
    """
    b = float(_positive("width", width))
    h = float(_positive("height", height))
    a, t = max(b, h), min(b, h)
    n = np.arange(1, 2 * terms, 2, dtype=np.float64)
    series = np.sum(np.tanh(n * np.pi * a / (2.0 * t)) / n**5)
    j = a * t**3 / 3.0 * (1.0 - 192.0 / np.pi**5 * (t / a) * series)
    iy = b * h**3 / 12.0
    iz = h * b**3 / 12.0
    return BeamSection(
        area=b * h,
        second_moment_y=iy,
        second_moment_z=iz,
        torsion_constant=float(j),
        polar_moment=iy + iz,
    )


def circular_section(outer_diameter: float, inner_diameter: float = 0.0) -> BeamSection:
    """Section constants of a solid or hollow circular beam (tube).

    Parameters
    ----------
    outer_diameter : float
        Outer diameter D [m].
    inner_diameter : float, optional
        Inner diameter d [m], 0 for a solid bar.

    Returns
    -------
    BeamSection
        A = pi (D^2 - d^2) / 4, I_y = I_z = pi (D^4 - d^4) / 64,
        J = I_p = pi (D^4 - d^4) / 32.

    References
    ----------
    .. [1] Timoshenko, S.P., Goodier, J.N. (1951). Theory of Elasticity, 2nd ed.,
       McGraw-Hill, sec. 90 (torsion of circular shafts).
    """
    do = float(_positive("outer_diameter", outer_diameter))
    di = float(_nonnegative("inner_diameter", inner_diameter))
    if di >= do:
        msg = f"inner_diameter ({di}) must be smaller than outer_diameter ({do})"
        raise ValueError(msg)
    i = np.pi * (do**4 - di**4) / 64.0
    return BeamSection(
        area=np.pi * (do**2 - di**2) / 4.0,
        second_moment_y=i,
        second_moment_z=i,
        torsion_constant=2.0 * i,
        polar_moment=2.0 * i,
    )


def beam_bending_wavenumber(
    f: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> FloatArray:
    """Bending wavenumber of an Euler-Bernoulli beam.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    second_moment : float or array_like
        Second moment of area I for the bending plane considered (I_y or I_z) [m^4].
    mass_per_length : float or array_like
        Mass per unit length m' [kg/m].

    Returns
    -------
    numpy.ndarray
        k_B = (omega^2 m' / (E I))^(1/4) [rad/m].

    Notes
    -----
    Bending in the two principal planes are two independent wave types; call the
    function once with I_y and once with I_z. Valid while the wavelength is long against
    the section depth (shear and rotary inertia neglected).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.5 (bending waves in beams).
    """
    fr = _positive("f", f)
    e = _positive("youngs_modulus", youngs_modulus)
    i = _positive("second_moment", second_moment)
    m = _positive("mass_per_length", mass_per_length)
    omega = 2.0 * np.pi * fr
    return np.asarray((omega**2 * m / (e * i)) ** 0.25, dtype=np.float64)


def beam_bending_phase_speed(
    f: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> FloatArray:
    """Bending phase speed of a beam, c_B = (omega^2 E I / m')^(1/4) [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    second_moment : float or array_like
        Second moment of area I [m^4].
    mass_per_length : float or array_like
        Mass per unit length m' [kg/m].

    Returns
    -------
    numpy.ndarray
        Phase speed [m/s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.5.
    """
    k = beam_bending_wavenumber(f, youngs_modulus, second_moment, mass_per_length)
    return np.asarray(2.0 * np.pi * np.asarray(f, dtype=np.float64) / k, dtype=np.float64)


def beam_bending_group_speed(
    f: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> FloatArray:
    """Bending group speed of a beam, c_g = 2 c_B [m/s].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    second_moment : float or array_like
        Second moment of area I [m^4].
    mass_per_length : float or array_like
        Mass per unit length m' [kg/m].

    Returns
    -------
    numpy.ndarray
        Group speed [m/s].

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.5.
    """
    return 2.0 * beam_bending_phase_speed(f, youngs_modulus, second_moment, mass_per_length)


def beam_bending_modal_density(
    f: npt.ArrayLike,
    length: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    second_moment: npt.ArrayLike,
    mass_per_length: npt.ArrayLike,
) -> FloatArray:
    """Asymptotic bending modal density of a beam in one plane [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    length : float or array_like
        Beam length L [m].
    youngs_modulus : float or array_like
        Young's modulus E [Pa].
    second_moment : float or array_like
        Second moment of area I for the plane considered [m^4].
    mass_per_length : float or array_like
        Mass per unit length m' [kg/m].

    Returns
    -------
    numpy.ndarray
        n(f) = 2 L / c_g = L / c_B [modes/Hz].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (one-dimensional
       modal density; from memory).
    .. [2] Harris' Shock and Vibration Handbook, SEA chapter (c_g = 2 c_B).
    """
    ell = _positive("length", length)
    c = beam_bending_phase_speed(f, youngs_modulus, second_moment, mass_per_length)
    return np.asarray(ell / c, dtype=np.float64)


def torsion_speed(
    shear_modulus: npt.ArrayLike,
    torsion_constant: npt.ArrayLike,
    density: npt.ArrayLike,
    polar_moment: npt.ArrayLike,
) -> FloatArray:
    """Torsional wave speed of a beam, c_T = sqrt(G J / (rho I_p)) [m/s].

    Parameters
    ----------
    shear_modulus : float or array_like
        Shear modulus G [Pa].
    torsion_constant : float or array_like
        Saint-Venant torsion constant J [m^4].
    density : float or array_like
        Density rho [kg/m^3].
    polar_moment : float or array_like
        Polar second moment of area I_p [m^4].

    Returns
    -------
    numpy.ndarray
        c_T [m/s]; equals sqrt(G / rho) for circular sections (J = I_p).

    Notes
    -----
    Saint-Venant torsion without warping restraint; non-dispersive.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.,
       Springer, ISBN 978-3-540-22696-3, sec. 3.4 (torsional waves).
    """
    g = _positive("shear_modulus", shear_modulus)
    j = _positive("torsion_constant", torsion_constant)
    rho = _positive("density", density)
    ip = _positive("polar_moment", polar_moment)
    return np.asarray(np.sqrt(g * j / (rho * ip)), dtype=np.float64)


def longitudinal_modal_density(
    f: npt.ArrayLike, length: npt.ArrayLike, wave_speed: npt.ArrayLike
) -> FloatArray:
    """Modal density of a non-dispersive one-dimensional wave field [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz] (sets the output shape).
    length : float or array_like
        Length L [m].
    wave_speed : float or array_like
        Wave speed c [m/s] (c_L of a rod, c_T for torsion, c0 of a 1-D duct).

    Returns
    -------
    numpy.ndarray
        n(f) = 2 L / c [modes/Hz].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (from memory).
    """
    fr = _positive("f", f)
    ell = _positive("length", length)
    c = _positive("wave_speed", wave_speed)
    return _full(2.0 * ell / c, fr)


def torsion_modal_density(
    f: npt.ArrayLike, length: npt.ArrayLike, torsion_speed: npt.ArrayLike
) -> FloatArray:
    """Torsional modal density of a beam, n(f) = 2 L / c_T [modes/Hz].

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    length : float or array_like
        Beam length L [m].
    torsion_speed : float or array_like
        Torsional wave speed c_T [m/s] (:func:`torsion_speed`).

    Returns
    -------
    numpy.ndarray
        n(f) [modes/Hz].

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann, ISBN 0-7506-9111-5, ch. 8 (from memory).
    """
    return longitudinal_modal_density(f, length, torsion_speed)


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
