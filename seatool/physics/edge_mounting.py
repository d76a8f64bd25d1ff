"""Bending waves at a plate edge held by a resilient, lossy line support (an edge seal).

A panel held in a rigid frame through a resilient strip on each face (a glazing gasket, a
sealant bead, putty, a perimeter strip) is supported along its edge by a translational and
a rotational spring per unit length. Where the strip is lossy, a bending wave that reaches
the edge leaves part of its power in it. This module gives

* :func:`seal_stiffness`: the two stiffnesses per unit length of the strips, from their
  modulus and shape (thin elastic layers in compression);
* :func:`elastic_edge_reflection`: the reflection coefficient and the near-field amplitude
  of an obliquely incident bending wave of a thin (Kirchhoff) plate at such an edge;
* :func:`elastic_edge_absorption`: the absorption coefficient ``1 - |r|^2`` per angle;
* :func:`elastic_edge_absorption_diffuse`: its diffuse-field average, the ``alpha_k``
  of the edge term of EN ISO 12354-1 Annex C
  (:func:`seatool.physics.installed_damping.edge_absorption_loss_factor`);
* :func:`seal_absorption_diffuse`: the same for the two strips of :func:`seal_stiffness`.

All functions are pure and broadcast with numpy over frequency bands and angles. The
derivation is in ``docs/theory/subsystems.md``, section 11.
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _nonnegative
from ._checks import poisson as _poisson
from ._checks import positive as _positive
from .quadrature import gauss_legendre

__all__ = [
    "elastic_edge_absorption",
    "elastic_edge_absorption_diffuse",
    "elastic_edge_reflection",
    "seal_absorption_diffuse",
    "seal_stiffness",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

#: Gauss-Legendre nodes of the diffuse-field average over 0 .. pi/2 (the absorption is a
#: smooth function of the angle; 48 nodes give it to better than 1e-6 relative for the
#: seals and plates of the tests).
DIFFUSE_NODES = 48


def seal_stiffness(
    youngs_modulus: npt.ArrayLike,
    width: npt.ArrayLike,
    thickness: npt.ArrayLike,
    *,
    faces: int = 2,
) -> tuple[FloatArray, FloatArray]:
    """Translational and rotational stiffness per unit length of resilient edge strips.

    Parameters
    ----------
    youngs_modulus : float or array_like
        Young's modulus E of the strip material [Pa] (its effective compression modulus,
        see Notes).
    width : float or array_like
        Contact width w of each strip on the panel face, measured inwards from the edge [m].
    thickness : float or array_like
        Thickness t of each strip between the panel face and the rigid frame [m].
    faces : int, optional
        Number of strips (1 or 2): one on each face of the panel by default.

    Returns
    -------
    tuple of numpy.ndarray
        ``(s_t, s_r)``: translational stiffness per unit length [N/m^2] and rotational
        stiffness per unit length [N m/(m rad)].

    Notes
    -----
    Each strip is a thin elastic layer in compression between the panel face and a rigid
    frame (common practice, the layer as a bed of independent springs of stiffness E/t per
    unit area)::

        s_t = faces * E w / t
        s_r = faces * E w^3 / (12 t)

    A displacement w of the panel normal to its plane compresses one strip and relieves the
    other (springs in parallel); a rotation phi about the strip's centre line compresses it
    by phi x over its width, the moment per unit length is int (E/t) x^2 phi dx over
    -w/2 .. w/2. Assumptions: the strip is thin (t small against w and against the bending
    wavelength: no shear in the layer, no bending of the frame), the frame is rigid, the
    strip acts at the panel's edge line (w small against the bending wavelength), and the
    strip stays in contact (pre-compressed). No bulging correction: a layer bonded to both
    faces is stiffer in compression than E w / t by a shape factor (Gent & Lindley 1959,
    from memory, about 1 + (w/2t)^2 for a long incompressible strip); give the effective
    compression modulus in ``youngs_modulus`` for such a bead.

    References
    ----------
    .. [1] Gent, A.N., Lindley, P.B. (1959). "The compression of bonded rubber blocks."
       Proceedings of the Institution of Mechanical Engineers 173, 111-122 (shape factor;
       from memory).
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.
       Springer (resilient layers as springs per unit area; chapter from memory).
    """
    e = _positive("youngs_modulus", youngs_modulus)
    w = _positive("width", width)
    t = _positive("thickness", thickness)
    if faces not in (1, 2):
        msg = f"faces must be 1 or 2, got {faces!r}"
        raise ValueError(msg)
    s_t = np.asarray(faces * e * w / t, dtype=np.float64)
    s_r = np.asarray(faces * e * w**3 / (12.0 * t), dtype=np.float64)
    return s_t, s_r


def _edge_terms(
    f: npt.ArrayLike,
    bending_stiffness: npt.ArrayLike,
    mass_per_area: npt.ArrayLike,
    poisson_ratio: npt.ArrayLike,
    translational: npt.ArrayLike,
    rotational: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
    theta: npt.ArrayLike,
) -> tuple[ComplexArray, ComplexArray, FloatArray]:
    """Reflection coefficient, near-field amplitude and k of :func:`elastic_edge_reflection`."""
    f_a = _positive("f", f)
    d = _positive("bending_stiffness", bending_stiffness)
    m = _positive("mass_per_area", mass_per_area)
    nu = _poisson(poisson_ratio)
    s_t = _nonnegative("translational", translational)
    s_r = _nonnegative("rotational", rotational)
    eta = _nonnegative("loss_factor", loss_factor)
    th = np.asarray(theta, dtype=np.float64)
    if not np.all((th >= 0.0) & (th <= np.pi / 2)):
        msg = f"theta must lie in 0 .. pi/2, got {theta!r}"
        raise ValueError(msg)
    omega = 2.0 * np.pi * f_a
    k = np.sqrt(omega) * (m / d) ** 0.25
    sin2 = np.sin(th) ** 2
    cos = np.cos(th)
    stiff = 1.0 + 1j * eta
    rot = s_r * stiff / (d * k)  # rotational spring over D k
    tra = s_t * stiff / (d * k**3)  # translational spring over D k^3
    q = (-1j * cos, 1j * cos, np.sqrt(1.0 + sin2) + 0j)  # incident, reflected, near field

    def moment(qq: ComplexArray) -> ComplexArray:
        return qq**2 - nu * sin2 + rot * qq

    def shear(qq: ComplexArray) -> ComplexArray:
        return qq**3 - (2.0 - nu) * sin2 * qq - tra

    a1, a2, a3 = (moment(qq) for qq in q)
    b1, b2, b3 = (shear(qq) for qq in q)
    det = a2 * b3 - a3 * b2
    r = np.asarray((a3 * b1 - a1 * b3) / det, dtype=np.complex128)
    n = np.asarray((a1 * b2 - a2 * b1) / det, dtype=np.complex128)
    return r, n, np.asarray(k * np.ones_like(cos), dtype=np.float64)


def elastic_edge_reflection(
    f: npt.ArrayLike,
    bending_stiffness: npt.ArrayLike,
    mass_per_area: npt.ArrayLike,
    poisson_ratio: npt.ArrayLike,
    translational: npt.ArrayLike,
    rotational: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
    theta: npt.ArrayLike = 0.0,
) -> tuple[ComplexArray, ComplexArray]:
    """Reflection of a bending wave at a plate edge on a lossy translational and rotational support.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    bending_stiffness : float or array_like
        Plate bending stiffness D [N m].
    mass_per_area : float or array_like
        Plate mass per unit area m'' [kg/m^2].
    poisson_ratio : float or array_like
        Plate Poisson's ratio nu [-].
    translational : float or array_like
        Translational stiffness of the support per unit edge length s_t [N/m^2] (0: free;
        very large: held).
    rotational : float or array_like
        Rotational stiffness of the support per unit edge length s_r [N m/(m rad)]
        (0: free to rotate; very large: clamped).
    loss_factor : float or array_like
        Loss factor eta_s of both stiffnesses [-] (complex stiffness s (1 + j eta_s)).
    theta : float or array_like, optional
        Angle of incidence from the edge's normal [rad], 0 .. pi/2.

    Returns
    -------
    tuple of numpy.ndarray (complex)
        ``(r, n)``: the reflected and the near-field amplitude per unit incident amplitude,
        at the edge (time dependence exp(j omega t)).

    Notes
    -----
    The plate fills x < 0, the edge is the line x = 0. With the free bending wavenumber
    ``k = (omega^2 m''/D)^(1/4)``, ``k_y = k sin(theta)``, ``k_x = k cos(theta)`` and
    ``kappa = k sqrt(1 + sin^2 theta)``, the field is (Cremer, Heckl & Petersson 2005,
    bending waves at boundaries; Graff 1975, sec. 4.2 for the plate)::

        w = [exp(-j k_x x) + r exp(j k_x x) + n exp(kappa x)] exp(-j k_y y)

    The edge conditions of a thin plate on a rotational and a translational spring per
    unit length (natural conditions of the plate's strain energy plus the springs'
    energy ``(s_t w^2 + s_r w_x^2)/2`` per unit length; Timoshenko & Woinowsky-Krieger 1959,
    sec. 22, for the effective shear force)::

        D (w_xx + nu w_yy)            = -s_r (1 + j eta_s) w_x
        D (w_xxx + (2 - nu) w_xyy)    =  s_t (1 + j eta_s) w

    give two linear equations in (r, n), solved in closed form (Cramer's rule) with the
    stiffnesses scaled by D k and D k^3. Limits: simply supported (s_t -> inf, s_r = 0)
    r = -1; clamped (both -> inf) and free (both 0) r = -j at normal incidence (Cremer,
    Heckl & Petersson 2005). Real (lossless) stiffnesses give |r| = 1.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.
       Springer, sec. 5.7 (from memory: reflection of bending waves at the ends of beams and
       the edges of plates, near fields).
    .. [2] Graff, K.F. (1975). Wave Motion in Elastic Solids. Oxford University Press /
       Dover 1991, secs. 3.4 (flexural waves at boundaries of beams) and 4.2 (plates).
    .. [3] Timoshenko, S.P., Woinowsky-Krieger, S. (1959). Theory of Plates and Shells,
       2nd ed., McGraw-Hill, sec. 22 (boundary conditions, the effective shear force).
    """
    r, n, _ = _edge_terms(
        f, bending_stiffness, mass_per_area, poisson_ratio, translational, rotational,
        loss_factor, theta,
    )  # fmt: skip
    return r, n


def elastic_edge_absorption(
    f: npt.ArrayLike,
    bending_stiffness: npt.ArrayLike,
    mass_per_area: npt.ArrayLike,
    poisson_ratio: npt.ArrayLike,
    translational: npt.ArrayLike,
    rotational: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
    theta: npt.ArrayLike = 0.0,
) -> FloatArray:
    """Bending-wave absorption coefficient of an edge on a lossy elastic support, per angle.

    Parameters
    ----------
    f, bending_stiffness, mass_per_area, poisson_ratio, translational, rotational, \
loss_factor, theta
        As :func:`elastic_edge_reflection` (units there).

    Returns
    -------
    numpy.ndarray
        alpha(theta) = 1 - |r|^2 [-]: the share of the incident bending power left in the
        support.

    Notes
    -----
    The near field carries no power away from the edge, so the power the support takes is
    the incident minus the reflected power (Cremer, Heckl & Petersson 2005)::

        alpha(theta) = 1 - |r(theta)|^2

    It equals the power dissipated in the support, ``omega eta_s (s_t |w|^2 + s_r |w_x|^2)
    / 2`` per unit length at the edge, over the incident power per unit length
    ``m'' omega^3 cos(theta) / k`` (checked in ``tests/physics/test_edge_mounting.py``).

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.
       Springer, sec. 5.7 (from memory).
    """
    r, _, _ = _edge_terms(
        f, bending_stiffness, mass_per_area, poisson_ratio, translational, rotational,
        loss_factor, theta,
    )  # fmt: skip
    return np.asarray(np.clip(1.0 - np.abs(r) ** 2, 0.0, 1.0), dtype=np.float64)


def elastic_edge_absorption_diffuse(
    f: npt.ArrayLike,
    bending_stiffness: npt.ArrayLike,
    mass_per_area: npt.ArrayLike,
    poisson_ratio: npt.ArrayLike,
    translational: npt.ArrayLike,
    rotational: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
    *,
    nodes: int = DIFFUSE_NODES,
) -> FloatArray:
    """Diffuse-field bending-wave absorption coefficient of an edge on a lossy elastic support.

    Parameters
    ----------
    f, bending_stiffness, mass_per_area, poisson_ratio, translational, rotational, \
loss_factor
        As :func:`elastic_edge_reflection` (units there); they broadcast together.
    nodes : int, optional
        Gauss-Legendre nodes over 0 .. pi/2.

    Returns
    -------
    numpy.ndarray
        alpha_d [-], the ``alpha_k`` of the edge term of EN ISO 12354-1 Annex C.

    Notes
    -----
    In a diffuse bending field the power reaching a boundary element from directions
    theta .. theta + d theta is proportional to cos(theta) d theta (the flux onto the
    boundary; Cremer, Heckl & Petersson 2005, the diffuse bending field). The absorbed
    share is therefore the cos-weighted average::

        alpha_d = int_0^(pi/2) alpha(theta) cos(theta) d theta

    (``int_0^(pi/2) cos(theta) d theta = 1``). It is the weighting the edge term
    ``eta = c0 sum l_k alpha_k / (pi^2 S sqrt(f f_c))`` of EN ISO 12354-1 Annex C implies:
    that term is ``c_g L alpha / (pi omega S)``, the diffuse flux ``E c_g L / (pi S)`` onto
    the boundary (angle integral of cos(theta) / (2 pi) over -pi/2 .. pi/2) times alpha,
    so alpha is the share of that flux absorbed, the average above.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.
       Springer (diffuse bending field; reflection at boundaries, sec. 5.7, from memory).
    .. [2] EN ISO 12354-1:2017, Annex C (the edge term of the in-situ loss factor).
    """
    x, w = gauss_legendre(nodes)
    theta = np.pi / 4 * (x + 1.0)
    weight = np.pi / 4 * w * np.cos(theta)
    def last(a: npt.ArrayLike) -> FloatArray:
        return np.asarray(a, dtype=np.float64)[..., None]

    alpha = elastic_edge_absorption(
        last(f), last(bending_stiffness), last(mass_per_area), last(poisson_ratio),
        last(translational), last(rotational), last(loss_factor), theta,
    )  # fmt: skip
    return np.asarray(alpha @ weight, dtype=np.float64)


def seal_absorption_diffuse(
    f: npt.ArrayLike,
    bending_stiffness: npt.ArrayLike,
    mass_per_area: npt.ArrayLike,
    poisson_ratio: npt.ArrayLike,
    youngs_modulus: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
    width: npt.ArrayLike,
    thickness: npt.ArrayLike,
) -> FloatArray:
    """Diffuse bending-wave absorption coefficient of a plate edge held by two lossy strips.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    bending_stiffness, mass_per_area, poisson_ratio : float or array_like
        The plate: D [N m], m'' [kg/m^2], nu [-].
    youngs_modulus, loss_factor, width, thickness : float or array_like
        The strips (one on each face): E [Pa], eta_s [-], contact width w [m], thickness
        t [m].

    Returns
    -------
    numpy.ndarray
        alpha_d [-].

    Notes
    -----
    :func:`elastic_edge_absorption_diffuse` with the stiffnesses of :func:`seal_stiffness`
    (two strips): ``s_t = 2 E w / t``, ``s_r = 2 E w^3 / (12 t)``, both ``(1 + j eta_s)``.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-Borne Sound, 3rd ed.
       Springer (see :func:`elastic_edge_reflection`).
    """
    s_t, s_r = seal_stiffness(youngs_modulus, width, thickness)
    return elastic_edge_absorption_diffuse(
        f, bending_stiffness, mass_per_area, poisson_ratio, s_t, s_r, loss_factor
    )
