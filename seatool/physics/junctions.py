"""Structural junctions: wave transmission through line junctions of plates.

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

Point connections (rigid, resilient mounts, a resonator's spring) are in
:mod:`seatool.physics.point_connections`; their functions are also reachable from here.

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

from . import junction_waves as jw
from . import plates
from .memo import memoised
from .point_connections import clf_point_resilient, clf_point_rigid, clf_resonator_point

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
    "line_junction_transmission_diffuse_many",
    "line_junction_transmission_diffuse_per_band",
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


def _wave_index(incident: str) -> int:
    """Index of an incident wave type in :data:`WAVE_TYPES`."""
    if incident not in WAVE_TYPES:
        msg = f"incident must be one of {WAVE_TYPES}, got {incident!r}"
        raise ValueError(msg)
    return WAVE_TYPES.index(incident)


def _check_plates(plates: Sequence[object], source: int) -> None:
    if len(plates) < 2:
        msg = f"a line junction needs at least 2 plates, got {len(plates)}"
        raise ValueError(msg)
    if not 0 <= source < len(plates):
        msg = f"source must index one of the {len(plates)} plates, got {source!r}"
        raise ValueError(msg)


def _frequencies(f: npt.ArrayLike) -> FloatArray:
    f_arr = np.asarray(f, dtype=np.float64)
    if not np.all(np.isfinite(f_arr)) or np.any(f_arr <= 0.0):
        msg = f"f must be finite and > 0, got {f!r}"
        raise ValueError(msg)
    return f_arr


def _table(per_plate: Sequence[Sequence[JunctionPlate]]) -> FloatArray:
    """``(thickness, E, density, nu, angle)`` of ``per_plate[p][b]`` as an array ``(N, B, 5)``."""
    rows = [
        [(pb.thickness, pb.youngs_modulus, pb.density, pb.poisson, pb.angle) for pb in pp]
        for pp in per_plate
    ]
    return np.array(rows, dtype=np.float64)


def _stack(table: FloatArray) -> jw.PlateArrays:
    """:class:`~seatool.physics.junction_waves.PlateArrays` of a :func:`_table`."""
    h, e, rho, nu = table[..., 0], table[..., 1], table[..., 2], table[..., 3]
    return jw.plate_arrays(h, e, rho, nu, table[:, 0, 4], plates.bending_stiffness(e, h, nu))


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
    f_arr = _frequencies(f).reshape(1)
    pl = _stack(_table([[p] for p in plates]))
    k_in = pl.wavenumbers(f_arr)[col_in][source]  # (1,)
    # exactly grazing incidence carries no power; use the limit just below it
    q = k_in[:, None] * np.sin(np.minimum(th, jw.THETA_MAX)).reshape(1, -1)
    tau = jw.scatter(f_arr, q, pl, source=source, incident=col_in)
    return tau.reshape(*th.shape, len(plates), 3)


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
    f_arr = _frequencies(f)
    return line_junction_transmission_diffuse_per_band(
        f_arr.reshape(-1),
        [[p] * f_arr.size for p in plates],
        source=source,
        incident=incident,
        n_points=n_points,
    ).reshape(*f_arr.shape, len(plates), 3)


def line_junction_transmission_diffuse_per_band(
    f: npt.ArrayLike,
    plates: Sequence[Sequence[JunctionPlate]],
    *,
    source: int = 0,
    incident: WaveType = "bending",
    n_points: int = 48,
) -> FloatArray:
    """Diffuse-field transmission coefficients with plates that may differ per band.

    Parameters
    ----------
    f : array_like
        Band frequencies [Hz], shape ``(B,)``.
    plates : sequence of sequences of JunctionPlate
        ``plates[p][b]``: plate ``p`` in band ``b`` (e.g. an equivalent plate with a
        frequency-dependent bending stiffness); each plate keeps one angle in all bands.
    source, incident, n_points : optional
        As in :func:`line_junction_transmission_diffuse`.

    Returns
    -------
    numpy.ndarray
        ``tau_bar[b, p, t]`` of shape ``(B, N, 3)``; band ``b`` equals
        :func:`line_junction_transmission_diffuse` of the plates ``plates[:][b]``.

    Notes
    -----
    All bands and quadrature nodes are solved as one stack (see
    :func:`seatool.physics.junction_waves.diffuse_transmission`). Results are remembered
    for the last few hundred distinct inputs (plates, frequencies, source, incident wave,
    nodes): identical junctions of a model, and junctions that a parameter study leaves
    unchanged, are computed once.

    References
    ----------
    .. [1] Langley, R.S., Heron, K.H. (1990). "Elastic wave transmission through plate/beam
       junctions." J. Sound Vib. 143(2), 241-253. doi:10.1016/0022-460X(90)90953-W
    """
    return line_junction_transmission_diffuse_many(
        f, plates, [(source, incident)], n_points=n_points
    )[0]


def line_junction_transmission_diffuse_many(
    f: npt.ArrayLike,
    plates: Sequence[Sequence[JunctionPlate]],
    incidents: Sequence[tuple[int, WaveType]],
    *,
    n_points: int = 48,
    compliance: npt.ArrayLike | None = None,
) -> FloatArray:
    """:func:`line_junction_transmission_diffuse_per_band` for several incident waves at once.

    Parameters
    ----------
    f : array_like
        Band frequencies [Hz], shape ``(B,)``.
    plates : sequence of sequences of JunctionPlate
        ``plates[p][b]``: plate ``p`` in band ``b``.
    incidents : sequence of (int, str)
        ``(source plate index, incident wave type)`` pairs.
    n_points : int, optional
        Gauss-Legendre nodes per sub-interval between cut-off angles.
    compliance : array_like, optional
        Compliance of an elastic interlayer under each plate's edge, shape ``(N, 4)``
        (:func:`seatool.physics.junction_waves.interlayer_compliance`; zeros: rigid, the
        default).

    Returns
    -------
    numpy.ndarray
        ``tau_bar[i, b, p, t]`` of shape ``(len(incidents), B, N, 3)``; entry ``i`` equals
        :func:`line_junction_transmission_diffuse_per_band` with ``incidents[i]``.

    Notes
    -----
    One stacked solve over incident waves x bands x quadrature nodes
    (:func:`seatool.physics.junction_waves.diffuse_transmission_many`), remembered by
    argument value like :func:`line_junction_transmission_diffuse_per_band`.

    References
    ----------
    .. [1] Langley, R.S., Heron, K.H. (1990). "Elastic wave transmission through plate/beam
       junctions." J. Sound Vib. 143(2), 241-253. doi:10.1016/0022-460X(90)90953-W
    """
    f_arr = _frequencies(f)
    if f_arr.ndim != 1:
        msg = f"f must be one-dimensional (one value per band), got shape {f_arr.shape}"
        raise ValueError(msg)
    pairs = []
    for source, incident in incidents:
        _check_plates(plates, source)
        pairs.append((int(source), _wave_index(incident)))
    if n_points < 2:
        msg = f"n_points must be >= 2, got {n_points!r}"
        raise ValueError(msg)
    if f_arr.size == 0:
        return np.empty((len(pairs), 0, len(plates), 3))
    for idx, pp in enumerate(plates):
        if len(pp) != f_arr.size:
            msg = f"plates[{idx}] has {len(pp)} entries for {f_arr.size} bands"
            raise ValueError(msg)
    table = _table(plates)
    if np.any(table[..., 4] != table[:, :1, 4]):
        msg = "a plate changes its angle between bands"
        raise ValueError(msg)
    soft = None
    if compliance is not None:
        soft = np.asarray(compliance, dtype=np.complex128)
        if soft.shape != (len(plates), 4):
            msg = f"compliance must have shape ({len(plates)}, 4), got {soft.shape}"
            raise ValueError(msg)
    return _diffuse_memo(f_arr, table, tuple(pairs), n_points, soft)


@memoised(maxsize=512)
def _diffuse_memo(
    f: FloatArray,
    table: FloatArray,
    incidents: tuple[tuple[int, int], ...],
    n_points: int,
    compliance: ComplexArray | None,
) -> FloatArray:
    """Memoised :func:`seatool.physics.junction_waves.diffuse_transmission_many`."""
    return jw.diffuse_transmission_many(
        f, _stack(table), incidents, n_points=n_points, compliance=compliance
    )


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
        kx = jw.outgoing_kx(k, q)
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
    s2, w2 = jw.diffuse_nodes(np.array([breaks]), n_points)
    s, w = s2[0], w2[0]
    tau = bending_junction_transmission(f, np.arcsin(np.clip(s, 0.0, 1.0)), plates, source=source)
    out: FloatArray = np.einsum("t,tp->p", w, tau)
    return out
