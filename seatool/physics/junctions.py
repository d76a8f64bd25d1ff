"""Structural junctions: wave transmission through line junctions of plates, point connections.

Line junctions
--------------
:func:`line_junction_transmission` solves the plane-wave scattering problem at a rigid line
junction of ``N >= 2`` semi-infinite thin plates meeting at arbitrary angles. Each plate
carries bending (Kirchhoff), longitudinal (in-plane compressional) and in-plane shear waves;
all share the trace wavenumber along the junction (Snell's law). The edge dynamic stiffness of
each plate is built from its outgoing waves (propagating or evanescent, plus the bending near
field), the junction line is massless and rigid (continuity of its three displacements and
its rotation, equilibrium of forces and moment), and the power transmission coefficient into
every outgoing propagating wave, reflections included, is returned. Evanescent waves carry no
power. :func:`line_junction_transmission_diffuse` averages over a diffuse incident field,
``tau_bar = int_0^{pi/2} tau(theta) cos(theta) dtheta``.

:func:`bending_junction_transmission` is Cremer's bending-only closed form (junction line held
fixed in translation, common rotation, moments in balance), kept separate for checking.

Point connections
-----------------
:func:`clf_point_rigid` and :func:`clf_point_resilient` give the CLF of ``N`` incoherent point
connections from the drive-point mobilities of the two uncoupled subsystems.

Conventions: time dependence exp(+j omega t); plate ``p`` lies in the half-plane at angle
``angle_p`` [rad] around the junction line, measured in the cross-section plane; its local
axes are ``x`` (in the plate, away from the junction), ``y`` (along the junction, common to all
plates) and ``n`` (plate normal, ``x`` turned by +90 deg in the cross-section plane).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np
import numpy.typing as npt

from . import plates

__all__ = [
    "WAVE_TYPES",
    "JunctionPlate",
    "WaveType",
    "bending_junction_transmission",
    "bending_junction_transmission_diffuse",
    "clf_point_resilient",
    "clf_point_rigid",
    "clf_resonator_point",
    "line_junction_transmission",
    "line_junction_transmission_diffuse",
    "wavenumbers",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

WaveType = Literal["bending", "longitudinal", "shear"]
#: Order of the wave-type axis of the returned transmission arrays.
WAVE_TYPES: tuple[WaveType, WaveType, WaveType] = ("bending", "longitudinal", "shear")


@dataclass(frozen=True)
class JunctionPlate:
    """A semi-infinite thin isotropic plate at a line junction.

    Parameters
    ----------
    thickness : float
        Plate thickness ``h`` [m].
    youngs_modulus : float
        Young's modulus ``E`` [Pa].
    density : float
        Density ``rho`` [kg/m^3].
    poisson : float
        Poisson's ratio ``nu`` [-], ``-1 < nu < 0.5``.
    angle : float
        Direction of the plate away from the junction in the cross-section plane [rad]
        (e.g. 0 and pi/2 for an L junction; 0, pi/2, pi for a T whose stem is the second).
    """

    thickness: float
    youngs_modulus: float
    density: float
    poisson: float
    angle: float

    def __post_init__(self) -> None:
        for name in ("thickness", "youngs_modulus", "density"):
            val = getattr(self, name)
            if not math.isfinite(val) or val <= 0.0:
                msg = f"{name} must be finite and > 0, got {val!r}"
                raise ValueError(msg)
        if not -1.0 < self.poisson < 0.5:
            msg = f"poisson must lie in (-1, 0.5), got {self.poisson!r}"
            raise ValueError(msg)
        if not math.isfinite(self.angle):
            msg = f"angle must be finite, got {self.angle!r}"
            raise ValueError(msg)


# --------------------------------------------------------------------------------------------
# private plate helpers
# --------------------------------------------------------------------------------------------


def _bending_stiffness(p: JunctionPlate) -> float:
    """D = E h^3 / (12 (1 - nu^2)) [N m] (:func:`seatool.physics.plates.bending_stiffness`)."""
    return float(plates.bending_stiffness(p.youngs_modulus, p.thickness, p.poisson))


def _membrane_stiffness(p: JunctionPlate) -> float:
    """C = E h / (1 - nu^2) [N/m]."""
    return p.youngs_modulus * p.thickness / (1.0 - p.poisson**2)


def _shear_stiffness(p: JunctionPlate) -> float:
    """G h = E h / (2 (1 + nu)) [N/m]."""
    return p.youngs_modulus * p.thickness / (2.0 * (1.0 + p.poisson))


def _mass_area(p: JunctionPlate) -> float:
    return p.density * p.thickness


def wavenumbers(f: float, plate: JunctionPlate) -> tuple[float, float, float]:
    """Free wavenumbers of bending, longitudinal and shear waves in a thin plate [rad/m].

    Parameters
    ----------
    f : float
        Frequency [Hz].
    plate : JunctionPlate
        The plate.

    Returns
    -------
    tuple of float
        ``(k_B, k_L, k_S)`` with ``k_B = (omega^2 m''/D)^(1/4)``,
        ``k_L = omega / c_L'``, ``c_L' = sqrt(E/(rho (1 - nu^2)))``, ``k_S = omega / c_S``,
        ``c_S = sqrt(E/(2 rho (1 + nu)))``.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.
       Springer, ch. 3. ISBN 978-3-540-22696-3
    """
    if not math.isfinite(f) or f <= 0.0:
        msg = f"f must be finite and > 0, got {f!r}"
        raise ValueError(msg)
    w = 2.0 * math.pi * f
    m = _mass_area(plate)
    k_b = (w**2 * m / _bending_stiffness(plate)) ** 0.25
    k_l = w * math.sqrt(m / _membrane_stiffness(plate))
    k_s = w * math.sqrt(m / _shear_stiffness(plate))
    return k_b, k_l, k_s


def _kx(k: float, q: FloatArray) -> ComplexArray:
    """x-wavenumber of an outgoing wave: real >= 0 if propagating, -j|.| if evanescent."""
    d = k**2 - q**2
    out: ComplexArray = np.where(d >= 0.0, np.sqrt(np.abs(d)) + 0j, -1j * np.sqrt(np.abs(d)))
    return out


def _edge_matrices(
    plate: JunctionPlate, f: float, q: FloatArray, sign: float
) -> tuple[ComplexArray, ComplexArray, ComplexArray, FloatArray]:
    """Edge displacement and force matrices of the four waves of a plate.

    Rows: local edge dofs (u, v, w, theta); columns: wave amplitudes (bending, bending near
    field, longitudinal, shear). ``sign = +1``: outgoing waves exp(-j kx x); ``sign = -1``:
    incoming waves exp(+j kx x) (only the propagating columns are meaningful then).
    Forces are the generalised forces the junction applies to the plate edge, work-conjugate
    to (u, v, w, theta). Also returns the x-wavenumbers (T, 4) and the power per unit
    junction length per |amplitude|^2 (T, 4) (zero for evanescent waves).
    """
    k_b, k_l, k_s = wavenumbers(f, plate)
    d = _bending_stiffness(plate)
    c = _membrane_stiffness(plate)
    gh = _shear_stiffness(plate)
    nu = plate.poisson
    w = 2.0 * math.pi * f
    kxb = sign * _kx(k_b, q)
    kxn = -1j * np.sqrt(k_b**2 + q**2) + 0j  # bending near field, always decaying
    kxl = sign * _kx(k_l, q)
    kxs = sign * _kx(k_s, q)
    shape = (*q.shape, 4, 4)
    phi = np.zeros(shape, dtype=np.complex128)
    frc = np.zeros(shape, dtype=np.complex128)
    for col, kx in ((0, kxb), (1, kxn)):
        phi[..., 2, col] = 1.0
        phi[..., 3, col] = -1j * kx
        frc[..., 2, col] = 1j * d * kx * (kx**2 + (2.0 - nu) * q**2)
        frc[..., 3, col] = d * (kx**2 + nu * q**2)
    # longitudinal: displacement along the wavevector (kx, q)/k_L
    phi[..., 0, 2] = kxl / k_l
    phi[..., 1, 2] = q / k_l
    frc[..., 0, 2] = 1j * c * (kxl**2 + nu * q**2) / k_l
    frc[..., 1, 2] = 1j * gh * 2.0 * q * kxl / k_l
    # shear: displacement perpendicular to the wavevector (-q, kx)/k_S
    phi[..., 0, 3] = -q / k_s
    phi[..., 1, 3] = kxs / k_s
    frc[..., 0, 3] = -1j * 2.0 * gh * kxs * q / k_s
    frc[..., 1, 3] = 1j * gh * (kxs**2 - q**2) / k_s
    kx_all = np.stack([kxb, kxn, kxl, kxs], axis=-1)
    prop = np.abs(kx_all.imag) < 1e-12 * max(k_b, k_l, k_s)
    kr = np.abs(kx_all.real)
    flux_coef = np.array([w * d * k_b**2, 0.0, 0.5 * w * c, 0.5 * w * gh])
    flux = np.where(prop, kr * flux_coef, 0.0)
    flux[..., 1] = 0.0
    return phi, frc, kx_all, flux


_THETA_MAX = 0.5 * math.pi - 1e-7


def _rotation(angle: float) -> FloatArray:
    """Map global line dofs (U_X, U_Z, V, Theta) to local edge dofs (u, v, w, theta)."""
    ca, sa = math.cos(angle), math.sin(angle)
    out: FloatArray = np.array(
        [[ca, sa, 0.0, 0.0], [0.0, 0.0, 1.0, 0.0], [-sa, ca, 0.0, 0.0], [0.0, 0.0, 0.0, 1.0]]
    )
    return out


def _wave_index(incident: str) -> int:
    if incident not in WAVE_TYPES:
        msg = f"incident must be one of {WAVE_TYPES}, got {incident!r}"
        raise ValueError(msg)
    return {"bending": 0, "longitudinal": 2, "shear": 3}[incident]


def _check_plates(plates: Sequence[JunctionPlate], source: int) -> None:
    if len(plates) < 2:
        msg = f"a line junction needs at least 2 plates, got {len(plates)}"
        raise ValueError(msg)
    if not 0 <= source < len(plates):
        msg = f"source must index one of the {len(plates)} plates, got {source!r}"
        raise ValueError(msg)


# --------------------------------------------------------------------------------------------
# full wave model
# --------------------------------------------------------------------------------------------


def line_junction_transmission(
    f: float,
    theta: npt.ArrayLike,
    plates: Sequence[JunctionPlate],
    *,
    source: int = 0,
    incident: WaveType = "bending",
) -> FloatArray:
    """Power transmission coefficients of a rigid line junction of plates, all wave types.

    Parameters
    ----------
    f : float
        Frequency [Hz].
    theta : float or array_like
        Angle of incidence in the source plate, from the junction normal [rad], 0..pi/2.
    plates : sequence of JunctionPlate
        The ``N >= 2`` plates meeting at the junction.
    source : int, optional
        Index of the plate carrying the incident wave.
    incident : {"bending", "longitudinal", "shear"}, optional
        Type of the incident wave.

    Returns
    -------
    numpy.ndarray
        ``tau[..., p, t]`` of shape ``theta.shape + (N, 3)``: ratio of the power carried away
        from the junction by wave type ``WAVE_TYPES[t]`` in plate ``p`` to the incident power
        (``p = source`` gives the reflection coefficients). The sum over ``p`` and ``t`` is 1.
        Exactly grazing incidence (``theta = pi/2``) is evaluated at ``pi/2 - 1e-7``.

    Notes
    -----
    Wave approach of Langley & Heron (1990) and Cremer, Heckl & Petersson (ch. 5), as
    implemented here: for trace wavenumber ``q = k_inc sin(theta)`` every plate has outgoing
    waves ``exp(-j kx x - j q y)`` with ``kx = sqrt(k^2 - q^2)`` (``-j sqrt(q^2 - k^2)`` when
    evanescent) for bending, longitudinal and shear waves and ``kx = -j sqrt(k_B^2 + q^2)``
    for the bending near field. Kirchhoff plate and plane-stress membrane resultants give the
    edge dynamic stiffness ``K_p = F_p Phi_p^{-1}`` (edge forces per edge displacements
    ``(u, v, w, theta)``). With the rotation ``R_p`` from the junction line dofs
    ``(U_X, U_Z, V, Theta)`` to plate ``p``, continuity ``d_p = R_p D`` and equilibrium
    ``sum_p R_p^T f_p = 0`` give

        (sum_p R_p^T K_p R_p) D = R_s^T (K_s d_inc - f_inc)

    Power per unit junction length of a propagating wave of amplitude ``a``:
    bending ``omega D k_B^2 Re(kx) |a|^2``, longitudinal ``omega C Re(kx) |a|^2 / 2``,
    shear ``omega G h Re(kx) |a|^2 / 2`` (C = E h/(1 - nu^2)).

    Thin-plate theory: valid for ``k_B h << 1`` (bending wavelength > about 6 h).

    References
    ----------
    .. [1] Langley, R.S., Heron, K.H. (1990). "Elastic wave transmission through plate/beam
       junctions." J. Sound Vib. 143(2), 241-253. doi:10.1016/0022-460X(90)90953-W
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.
       Springer, ch. 5. ISBN 978-3-540-22696-3
    """
    _check_plates(plates, source)
    col_in = _wave_index(incident)
    th = np.asarray(theta, dtype=np.float64)
    if np.any(th < 0.0) or np.any(th > 0.5 * np.pi + 1e-12):
        msg = f"theta must lie in [0, pi/2], got {theta!r}"
        raise ValueError(msg)
    k_in = wavenumbers(f, plates[source])[{0: 0, 2: 1, 3: 2}[col_in]]
    # exactly grazing incidence carries no power; use the limit just below it
    q = k_in * np.sin(np.minimum(th, _THETA_MAX))
    n_p = len(plates)

    k_glob = np.zeros((*q.shape, 4, 4), dtype=np.complex128)
    stiff: list[ComplexArray] = []
    phi_inv: list[ComplexArray] = []
    fluxes: list[FloatArray] = []
    rots = [_rotation(p.angle) for p in plates]
    for p, rot in zip(plates, rots, strict=True):
        phi, frc, _, flux = _edge_matrices(p, f, q, +1.0)
        pinv = np.asarray(np.linalg.inv(phi), dtype=np.complex128)
        kp = np.asarray(frc @ pinv, dtype=np.complex128)
        stiff.append(kp)
        phi_inv.append(pinv)
        fluxes.append(flux)
        k_glob = k_glob + rot.T @ kp @ rot

    phi_in, frc_in, _, flux_in = _edge_matrices(plates[source], f, q, -1.0)
    d_inc = phi_in[..., :, col_in]
    f_inc = frc_in[..., :, col_in]
    p_inc = flux_in[..., col_in]
    rhs_local = np.einsum("...ij,...j->...i", stiff[source], d_inc) - f_inc
    rhs = np.einsum("ji,...j->...i", rots[source], rhs_local)
    disp = np.linalg.solve(k_glob, rhs[..., None])[..., 0]

    tau = np.zeros((*q.shape, n_p, 3), dtype=np.float64)
    for idx in range(n_p):
        d_p = np.einsum("ij,...j->...i", rots[idx], disp)
        if idx == source:
            d_p = d_p - d_inc
        amp = np.einsum("...ij,...j->...i", phi_inv[idx], d_p)
        power = fluxes[idx] * np.abs(amp) ** 2
        tau[..., idx, 0] = power[..., 0] / p_inc
        tau[..., idx, 1] = power[..., 2] / p_inc
        tau[..., idx, 2] = power[..., 3] / p_inc
    return tau


def _diffuse_nodes(breaks: Sequence[float], n_points: int) -> tuple[FloatArray, FloatArray]:
    """Quadrature nodes/weights on [0, 1] in s = sin(theta), split at the break points.

    In each sub-interval Gauss-Legendre nodes are mapped by s = a + (b - a)(1 - cos u)/2,
    which clusters them at both ends, where the integrand has square-root behaviour at the
    cut-off of a wave type.
    """
    pts = sorted({0.0, 1.0, *[b for b in breaks if 0.0 < b < 1.0]})
    x, w = np.polynomial.legendre.leggauss(n_points)
    nodes: list[FloatArray] = []
    weights: list[FloatArray] = []
    for a, b in zip(pts[:-1], pts[1:], strict=True):
        # s = a + (b - a) (1 - cos(pi (t + 1)/2)) / 2, t in [-1, 1]
        u = 0.5 * np.pi * (x + 1.0)
        s = a + (b - a) * 0.5 * (1.0 - np.cos(u))
        ds = (b - a) * 0.5 * np.sin(u) * 0.5 * np.pi
        nodes.append(s)
        weights.append(w * ds)
    return np.concatenate(nodes), np.concatenate(weights)


def line_junction_transmission_diffuse(
    f: npt.ArrayLike,
    plates: Sequence[JunctionPlate],
    *,
    source: int = 0,
    incident: WaveType = "bending",
    n_points: int = 48,
) -> FloatArray:
    """Diffuse-field transmission coefficients of a rigid line junction, all wave types.

    Parameters
    ----------
    f : float or array_like
        Frequency [Hz].
    plates : sequence of JunctionPlate
        The plates at the junction.
    source : int, optional
        Index of the plate carrying the incident diffuse field.
    incident : {"bending", "longitudinal", "shear"}, optional
        Incident wave type.
    n_points : int, optional
        Gauss-Legendre nodes per sub-interval between cut-off angles.

    Returns
    -------
    numpy.ndarray
        ``tau_bar[..., p, t]`` of shape ``f.shape + (N, 3)``,
        ``tau_bar = int_0^{pi/2} tau(theta) cos(theta) dtheta``; summed over ``p, t`` it is 1.

    Notes
    -----
    With ``s = sin(theta)``, ``tau_bar = int_0^1 tau ds``: uniform in the trace wavenumber.
    The interval is split where another wave type cuts off (``s = k_other / k_inc``).
    Reciprocity of the averages (derived in docs/theory/coupling.md):
    ``k_a tau_bar(a -> b) = k_b tau_bar(b -> a)`` for wave type ``a`` in plate i and ``b`` in
    plate j, which with :func:`seatool.physics.coupling.clf_line_junction` is SEA reciprocity.

    References
    ----------
    .. [1] Langley, R.S., Heron, K.H. (1990). J. Sound Vib. 143(2), 241-253.
    .. [2] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of SEA, 2nd ed.
       (diffuse-field average and CLF, from memory).
    """
    _check_plates(plates, source)
    col_in = _wave_index(incident)
    if n_points < 2:
        msg = f"n_points must be >= 2, got {n_points!r}"
        raise ValueError(msg)
    f_arr = np.asarray(f, dtype=np.float64)
    out = np.empty((*f_arr.shape, len(plates), 3), dtype=np.float64)
    for idx in np.ndindex(f_arr.shape):
        fi = float(f_arr[idx])
        k_in = wavenumbers(fi, plates[source])[{0: 0, 2: 1, 3: 2}[col_in]]
        breaks = [k / k_in for p in plates for k in wavenumbers(fi, p)]
        s, w = _diffuse_nodes(breaks, n_points)
        tau = line_junction_transmission(
            fi, np.arcsin(np.clip(s, 0.0, 1.0)), plates, source=source, incident=incident
        )
        out[idx] = np.einsum("t,tpw->pw", w, tau)
    return out


# --------------------------------------------------------------------------------------------
# bending-only closed form
# --------------------------------------------------------------------------------------------


def bending_junction_transmission(
    f: float,
    theta: npt.ArrayLike,
    plates: Sequence[JunctionPlate],
    *,
    source: int = 0,
) -> FloatArray:
    """Bending-wave transmission at a line junction whose line does not move (Cremer).

    Parameters
    ----------
    f : float
        Frequency [Hz].
    theta : float or array_like
        Angle of incidence in the source plate [rad].
    plates : sequence of JunctionPlate
        The plates (their angles do not matter in this model).
    source : int, optional
        Index of the source plate.

    Returns
    -------
    numpy.ndarray
        ``tau[..., p]`` of shape ``theta.shape + (N,)``; ``p = source`` is the reflection.

    Notes
    -----
    The junction line is held in translation by the in-plane stiffness of the plates; the
    plates share the rotation ``Theta`` and the moments balance. Each plate's rotational edge
    stiffness for ``w = 0`` is ``K_p = 2 D_p k_p^2 / (kappa_p - j kx_p)``,
    ``kx_p = sqrt(k_p^2 - q^2)``, ``kappa_p = sqrt(k_p^2 + q^2)``; then

        tau_sp = 4 D_s D_p kx_s kx_p / |sum_i K_i|^2      (kx_p real; else 0)

    At normal incidence ``tau_sp = 2 psi_s psi_p / (sum_i psi_i)^2``, ``psi = D k``; identical
    plates give ``2 cos^2(theta) / N^2`` (L: 1/2, T: 2/9, X: 1/8 at normal incidence).
    Derived here; agrees with Vigran (2008) eqs. 9.35-9.39 and Cremer, Heckl & Petersson.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.
       Springer, ch. 5. ISBN 978-3-540-22696-3
    .. [2] Vigran, T.E. (2008). Building Acoustics. Taylor & Francis, eqs. 9.35-9.39.
       ISBN 978-0-415-42853-8
    """
    _check_plates(plates, source)
    th = np.asarray(theta, dtype=np.float64)
    if np.any(th < 0.0) or np.any(th > 0.5 * np.pi + 1e-12):
        msg = f"theta must lie in [0, pi/2], got {theta!r}"
        raise ValueError(msg)
    k_src = wavenumbers(f, plates[source])[0]
    q = k_src * np.sin(th)
    kx_list: list[ComplexArray] = []
    stiff_sum = np.zeros(q.shape, dtype=np.complex128)
    for p in plates:
        k = wavenumbers(f, p)[0]
        kx = _kx(k, q)
        kappa = np.sqrt(k**2 + q**2)
        stiff_sum = stiff_sum + 2.0 * _bending_stiffness(p) * k**2 / (kappa - 1j * kx)
        kx_list.append(kx)
    d_s = _bending_stiffness(plates[source])
    kx_s = kx_list[source]
    tau = np.zeros((*q.shape, len(plates)), dtype=np.float64)
    for idx, p in enumerate(plates):
        kx_p = kx_list[idx]
        prop = np.abs(kx_p.imag) == 0.0
        val = 4.0 * d_s * _bending_stiffness(p) * kx_s.real * kx_p.real / np.abs(stiff_sum) ** 2
        tau[..., idx] = np.where(prop, val, 0.0)
    # reflection coefficient from the rotation of the junction line
    k_s = wavenumbers(f, plates[source])[0]
    kappa_s = np.sqrt(k_s**2 + q**2)
    k_own = 2.0 * d_s * k_s**2 / (kappa_s - 1j * kx_s)
    rot = 2j * kx_s * k_own / stiff_sum
    refl = (rot - 2j * kx_s) / (kappa_s - 1j * kx_s) - 1.0
    tau[..., source] = np.abs(refl) ** 2
    return tau


def bending_junction_transmission_diffuse(
    f: float,
    plates: Sequence[JunctionPlate],
    *,
    source: int = 0,
    n_points: int = 64,
) -> FloatArray:
    """Diffuse-field average of :func:`bending_junction_transmission`.

    Parameters
    ----------
    f : float
        Frequency [Hz] (the result does not depend on it).
    plates : sequence of JunctionPlate
        The plates.
    source : int, optional
        Source plate index.
    n_points : int, optional
        Gauss-Legendre nodes per sub-interval.

    Returns
    -------
    numpy.ndarray
        ``tau_bar[p] = int_0^{pi/2} tau_sp(theta) cos(theta) dtheta``, shape ``(N,)``.
        Identical plates: ``4/(3 N^2)``.

    References
    ----------
    .. [1] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, ch. 5.
    .. [2] Vigran, T.E. (2008). Building Acoustics, eqs. 9.35-9.39.
    """
    _check_plates(plates, source)
    k_src = wavenumbers(f, plates[source])[0]
    breaks = [wavenumbers(f, p)[0] / k_src for p in plates]
    s, w = _diffuse_nodes(breaks, n_points)
    tau = bending_junction_transmission(f, np.arcsin(np.clip(s, 0.0, 1.0)), plates, source=source)
    out: FloatArray = np.einsum("t,tp->p", w, tau)
    return out


# --------------------------------------------------------------------------------------------
# point connections
# --------------------------------------------------------------------------------------------


def _check_points(
    f: npt.ArrayLike, mass_1: npt.ArrayLike, n_points: int
) -> tuple[FloatArray, FloatArray]:
    f_a = np.asarray(f, dtype=np.float64)
    if np.any(~np.isfinite(f_a)) or np.any(f_a <= 0.0):
        msg = f"f must be finite and > 0, got {f!r}"
        raise ValueError(msg)
    m_a = np.asarray(mass_1, dtype=np.float64)
    if np.any(~np.isfinite(m_a)) or np.any(m_a <= 0.0):
        msg = f"mass_1 must be finite and > 0, got {mass_1!r}"
        raise ValueError(msg)
    if n_points < 1:
        msg = f"n_points must be >= 1, got {n_points!r}"
        raise ValueError(msg)
    return f_a, m_a


def clf_point_rigid(
    f: npt.ArrayLike,
    mobility_1: npt.ArrayLike,
    mobility_2: npt.ArrayLike,
    mass_1: npt.ArrayLike,
    *,
    n_points: int = 1,
) -> FloatArray:
    """CLF of rigid point connections between two structural subsystems.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    mobility_1, mobility_2 : complex or array_like
        Drive-point mobilities ``Y_1, Y_2`` of the uncoupled subsystems at the connection
        [m/(N s)], exp(+j omega t); the infinite-system values are the usual SEA estimate.
    mass_1 : float or array_like
        Mass of the source subsystem ``M_1`` [kg].
    n_points : int, optional
        Number of connection points ``N``; the points are treated as incoherent.

    Returns
    -------
    numpy.ndarray
        ``eta_12 = N Re(Y_2) / (omega M_1 |Y_1 + Y_2|^2)`` [-].

    Notes
    -----
    The reverberant field of subsystem 1 gives the free velocity ``v_f`` at the point with
    ``<|v_f|^2> = <v_1^2> = E_1/M_1``; the connection force is ``v_f/(Y_1 + Y_2)`` and the
    power into 2 is ``|F|^2 Re(Y_2)``. For ``N`` points the powers add when the points are
    more than about half a bending wavelength apart (incoherent); closer points interact
    and the sum over-estimates the coupling.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed. Butterworth-Heinemann (point connection CLF, from memory).
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.
       Springer (mobilities, power through a point). ISBN 978-3-540-22696-3
    """
    f_a, m_a = _check_points(f, mass_1, n_points)
    y1 = np.asarray(mobility_1, dtype=np.complex128)
    y2 = np.asarray(mobility_2, dtype=np.complex128)
    out: FloatArray = n_points * y2.real / (2.0 * np.pi * f_a * m_a * np.abs(y1 + y2) ** 2)
    return out


def clf_point_resilient(
    f: npt.ArrayLike,
    mobility_1: npt.ArrayLike,
    mobility_2: npt.ArrayLike,
    mass_1: npt.ArrayLike,
    stiffness: npt.ArrayLike,
    *,
    loss_factor: npt.ArrayLike = 0.0,
    n_points: int = 1,
) -> FloatArray:
    """CLF of resilient mounts (massless springs) at points between two subsystems.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz].
    mobility_1, mobility_2 : complex or array_like
        Drive-point mobilities of the uncoupled subsystems [m/(N s)], exp(+j omega t).
    mass_1 : float or array_like
        Mass of the source subsystem [kg].
    stiffness : float or array_like
        Dynamic stiffness of one mount ``k`` [N/m], > 0.
    loss_factor : float or array_like, optional
        Loss factor of the mount material ``eta_m`` [-] (complex stiffness ``k (1 + j eta_m)``).
    n_points : int, optional
        Number of incoherent mounts.

    Returns
    -------
    numpy.ndarray
        ``eta_12 = N Re(Y_2) / (omega M_1 |Y_1 + Y_m + Y_2|^2)``,
        ``Y_m = j omega / (k (1 + j eta_m))`` [-].

    Notes
    -----
    The mount is in series with the two drive points. Power dissipated in the mount is lost
    from both subsystems (it is not part of ``eta_12``). A stiff mount (``k -> inf``) gives
    :func:`clf_point_rigid`. Same incoherence condition as :func:`clf_point_rigid`.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of SEA, 2nd ed.
       (from memory).
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.,
       ch. on vibration isolation (mobility of a spring).
    """
    f_a, m_a = _check_points(f, mass_1, n_points)
    k = np.asarray(stiffness, dtype=np.float64)
    if np.any(~np.isfinite(k)) or np.any(k <= 0.0):
        msg = f"stiffness must be finite and > 0, got {stiffness!r}"
        raise ValueError(msg)
    eta_m = np.asarray(loss_factor, dtype=np.float64)
    if np.any(~np.isfinite(eta_m)) or np.any(eta_m < 0.0):
        msg = f"loss_factor must be finite and >= 0, got {loss_factor!r}"
        raise ValueError(msg)
    w = 2.0 * np.pi * f_a
    y_m = 1j * w / (k * (1.0 + 1j * eta_m))
    y1 = np.asarray(mobility_1, dtype=np.complex128)
    y2 = np.asarray(mobility_2, dtype=np.complex128)
    out: FloatArray = n_points * y2.real / (w * m_a * np.abs(y1 + y_m + y2) ** 2)
    return out


def clf_resonator_point(
    f: npt.ArrayLike,
    natural_frequency: npt.ArrayLike,
    stiffness: npt.ArrayLike,
    mobility_at_f0: npt.ArrayLike,
) -> FloatArray:
    r"""CLF from a spring-mass resonator to the structure its spring is attached to.

    Parameters
    ----------
    f : float or array_like
        Band centre frequency [Hz] at which the SEA power balance is written.
    natural_frequency : float or array_like
        Natural frequency of the resonator on a rigid base, f0 = sqrt(k/m)/(2 pi) [Hz].
    stiffness : float or array_like
        Spring stiffness k [N/m].
    mobility_at_f0 : complex or array_like
        Drive-point mobility Y of the (reverberant, infinite-system) structure at the
        attachment, evaluated at f0 [m/(N s)], exp(+j omega t).

    Returns
    -------
    numpy.ndarray
        eta_rs [-], stated for the band centre: ``omega eta_rs E_r`` is the power the
        resonator of energy E_r gives to the structure.

    Notes
    -----
    With the base free to move with mobility Y, the spring in series with the structure
    acts on the mass as the complex stiffness (force-displacement ratio, exp(+j omega t))

    .. math:: k_{eff} = \frac{k}{1 - j a}, \qquad a = \frac{k Y}{\omega_0},

    so the resonator's loss factor through the attachment is
    :math:`\eta_0 = \mathrm{Im}\,k_{eff} / \mathrm{Re}\,k_{eff} = \mathrm{Re}(a) /
    (1 + \mathrm{Im}(a))`, which for a real mobility is :math:`k\,\mathrm{Re}(Y)/\omega_0
    = m\,\omega_0\,\mathrm{Re}(Y)` (the structure acts as a dashpot of impedance 1/Y at the
    base). The resonator only holds energy near f0, so the power is
    :math:`\omega_0 \eta_0 E_r`; written at the band centre omega the coupling loss factor
    is :math:`\eta_{rs} = (\omega_0/\omega)\,\eta_0`. Valid for weak coupling
    (eta_0 << 1; the shift of the natural frequency by the base mobility is neglected) and
    for a structure whose response at the attachment is reverberant (infinite-system
    mobility, the usual SEA estimate). The derivation is the series combination of a spring
    and a structural mobility (Cremer, Heckl & Petersson 2005, ch. on mobilities and
    isolation; from memory) applied to the SEA description of an oscillator coupled to a
    multimodal system (Lyon & DeJong 1995, ch. 3, "oscillator-to-oscillator" and
    "oscillator-to-multimodal" coupling; from memory).

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed. Butterworth-Heinemann. ISBN 0-7506-9111-5
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.
       Springer. ISBN 978-3-540-22696-3
    """
    f_a = np.asarray(f, dtype=np.float64)
    f0 = np.asarray(natural_frequency, dtype=np.float64)
    k = np.asarray(stiffness, dtype=np.float64)
    if np.any(~np.isfinite(f_a) | (f_a <= 0)):
        raise ValueError("f must be positive and finite")
    if np.any(~np.isfinite(f0) | (f0 <= 0)):
        raise ValueError("natural_frequency must be positive and finite")
    if np.any(~np.isfinite(k) | (k <= 0)):
        raise ValueError("stiffness must be positive and finite")
    y = np.asarray(mobility_at_f0, dtype=np.complex128)
    if np.any(y.real < 0):
        raise ValueError("mobility_at_f0 must have a non-negative real part (a passive structure)")
    w0 = 2.0 * np.pi * f0
    a = k * y / w0
    eta0 = a.real / (1.0 + a.imag)
    out: FloatArray = np.asarray(eta0 * f0 / f_a, dtype=np.float64)
    return out
