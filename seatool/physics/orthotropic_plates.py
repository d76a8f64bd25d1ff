"""Orthotropic and ribbed plates: direction-dependent bending waves and modal density.

A ribbed (stiffened) plate is treated as an equivalent orthotropic plate below the bay
frequency of the panels between the ribs.
All functions are pure and vectorised: array arguments broadcast against each other and
the result has the broadcast shape. SI units throughout. Modal densities are in modes per
hertz, ``n(f) = 2*pi*n(omega)``.

The formulas and their sources are collected in ``docs/theory/subsystems.md``.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from ._checks import full as _full
from ._checks import positive as _positive
from .plates import bending_stiffness, critical_frequency

__all__ = [
    "orthotropic_bending_wavenumber",
    "orthotropic_critical_frequencies",
    "orthotropic_plate_modal_density",
    "rib_second_moment_rectangular",
    "ribbed_plate_bay_frequency",
    "ribbed_plate_stiffness",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

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
