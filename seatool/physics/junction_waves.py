"""Plane-wave scattering at a line junction of plates, batched over bands and angles.

The numerical core behind :func:`seatool.physics.junctions.line_junction_transmission` and
:func:`seatool.physics.junctions.line_junction_transmission_diffuse`. Everything here works
on stacked arrays: a frequency axis ``B`` (bands) and a trace-wavenumber axis ``T``
(incidence angles or quadrature nodes); the only loops run over matrix entries and plates.

Plate ``p`` is described by arrays over bands (so a per-band equivalent plate is allowed):
bending stiffness ``D``, membrane stiffness ``C = E h/(1 - nu^2)``, shear stiffness ``G h``,
mass per area ``m''``, Poisson's ratio ``nu``, and by its direction ``angle`` in the
cross-section plane. Each plate's edge dynamic stiffness is block diagonal in its local
edge dofs: in-plane ``(u, v)`` from the longitudinal and shear waves, out-of-plane
``(w, theta)`` from the bending wave and its near field, so the 4 x 4 wave matrices of the
textbook formulation reduce to two closed-form 2 x 2 blocks; only the junction's global
4 x 4 system is solved, as one stacked :func:`numpy.linalg.solve`.

Length: a little over 600 lines, kept in one file because the scattering core, its
diffuse-field average and the interlayer springs it takes are one numerical unit.

A plate may be joined to the line through an elastic interlayer (a strip of springs in
series with its edge, :func:`interlayer_compliance`); without one the junction is rigid.

Conventions as in :mod:`seatool.physics.junctions`: time dependence exp(+j omega t); local
axes ``x`` (in the plate, away from the junction), ``y`` (along the junction), ``n`` (plate
normal); global line dofs ``(U_X, U_Z, V, Theta)``.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np
import numpy.typing as npt

from .quadrature import gauss_legendre

__all__ = [
    "INCIDENT_COLUMNS",
    "PlateArrays",
    "diffuse_nodes",
    "diffuse_transmission",
    "interlayer_compliance",
    "outgoing_kx",
    "plate_arrays",
    "scatter",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]
#: Stacked complex entries (numpy's complex result types vary between operations).
_C = npt.NDArray[Any]

#: Wave amplitude column of each incident wave type (bending, longitudinal, shear);
#: column 1 is the bending near field.
INCIDENT_COLUMNS = (0, 2, 3)

#: Exactly grazing incidence carries no power; it is evaluated just below pi/2.
THETA_MAX = 0.5 * math.pi - 1e-7


@dataclass(frozen=True)
class PlateArrays:
    """Stiffnesses of the ``N`` plates at a junction, each of shape ``(N, B)``.

    Attributes
    ----------
    bending : numpy.ndarray
        Bending stiffness ``D`` [N m].
    membrane : numpy.ndarray
        Membrane stiffness ``C = E h / (1 - nu^2)`` [N/m].
    shear : numpy.ndarray
        In-plane shear stiffness ``G h`` [N/m].
    mass : numpy.ndarray
        Mass per unit area ``m''`` [kg/m^2].
    poisson : numpy.ndarray
        Poisson's ratio [-].
    angle : numpy.ndarray
        Plate directions in the cross-section plane [rad], shape ``(N,)``.
    """

    bending: FloatArray
    membrane: FloatArray
    shear: FloatArray
    mass: FloatArray
    poisson: FloatArray
    angle: FloatArray

    @property
    def count(self) -> int:
        """Number of plates ``N``."""
        return int(self.angle.shape[0])

    def wavenumbers(self, f: FloatArray) -> tuple[FloatArray, FloatArray, FloatArray]:
        """Free bending, longitudinal and shear wavenumbers [rad/m], each ``(N, B)``.

        ``k_B = (omega^2 m''/D)^(1/4)``, ``k_L = omega sqrt(m''/C)``, ``k_S = omega sqrt(m''/(G h))``
        (Cremer, Heckl & Petersson 2005, *Structure-borne Sound*, 3rd ed., ch. 3).
        """
        w = 2.0 * math.pi * f
        k_b = (w**2 * self.mass / self.bending) ** 0.25
        k_l = w * np.sqrt(self.mass / self.membrane)
        k_s = w * np.sqrt(self.mass / self.shear)
        return k_b, k_l, k_s


def _rotation(angle: float) -> FloatArray:
    """Map global line dofs (U_X, U_Z, V, Theta) to local edge dofs (u, v, w, theta)."""
    ca, sa = math.cos(angle), math.sin(angle)
    out: FloatArray = np.array(
        [[ca, sa, 0.0, 0.0], [0.0, 0.0, 1.0, 0.0], [-sa, ca, 0.0, 0.0], [0.0, 0.0, 0.0, 1.0]]
    )
    return out


def outgoing_kx(k: FloatArray | float, q: FloatArray) -> ComplexArray:
    """x-wavenumber of an outgoing wave ``exp(-j kx x - j q y)`` of free wavenumber ``k``.

    ``kx = sqrt(k^2 - q^2)`` (real >= 0) when propagating, ``-j sqrt(q^2 - k^2)`` when
    evanescent (decaying away from the junction).
    """
    d = k**2 - q**2
    root = np.sqrt(np.abs(d))
    out: ComplexArray = np.where(d >= 0.0, root + 0j, -1j * root)
    return out


def _inv2(a: _C, b: _C, c: _C, d: _C) -> tuple[_C, _C, _C, _C]:
    """Entries of the inverse of the stacked 2 x 2 matrices [[a, b], [c, d]]."""
    det = a * d - b * c
    return d / det, -b / det, -c / det, a / det


def _mul2(x: tuple[_C, ...], y: tuple[_C, ...]) -> tuple[_C, _C, _C, _C]:
    """Entries of the product of stacked 2 x 2 matrices given row-wise (x11, x12, x21, x22)."""
    return (
        x[0] * y[0] + x[1] * y[2],
        x[0] * y[1] + x[1] * y[3],
        x[2] * y[0] + x[3] * y[2],
        x[2] * y[1] + x[3] * y[3],
    )


def _bending_block(
    d: FloatArray, nu: FloatArray, kx: ComplexArray, q: FloatArray
) -> tuple[ComplexArray, ComplexArray]:
    """Edge rotation and shear force of a bending wave ``exp(-j kx x - j q y)`` with ``w = 1``.

    Kirchhoff plate: ``theta = -j kx``; the shear force the junction applies is
    ``j D kx (kx^2 + (2 - nu) q^2)`` and the moment ``D (kx^2 + nu q^2)`` (Cremer, Heckl &
    Petersson 2005, *Structure-borne Sound*, 3rd ed., ch. 3 and 5).
    """
    return -1j * kx, 1j * d * kx * (kx**2 + (2.0 - nu) * q**2)


def _edge_blocks(
    pl: PlateArrays,
    p: int,
    k: tuple[FloatArray, FloatArray, FloatArray],
    q: FloatArray,
) -> tuple[tuple[_C, ...], tuple[_C, ...], tuple[_C, ...], tuple[_C, ...], tuple[_C, _C, _C]]:
    """Wave matrices of the outgoing waves of plate ``p`` as two 2 x 2 blocks.

    Returns the in-plane and bending blocks of the edge stiffness ``K = F Phi^-1`` and of
    ``Phi^-1`` (entries row-wise), and the x-wavenumbers of bending, longitudinal and shear
    waves. ``k`` holds this plate's ``(k_B, k_L, k_S)`` with shape ``(B, 1)``; ``q`` is
    ``(B, T)``.
    """
    k_b, k_l, k_s = k
    dd = pl.bending[p][:, None]
    c = pl.membrane[p][:, None]
    gh = pl.shear[p][:, None]
    nu = pl.poisson[p][:, None]
    kxb = outgoing_kx(k_b, q)
    kxn = -1j * np.sqrt(k_b**2 + q**2) + 0j  # bending near field, always decaying
    kxl = outgoing_kx(k_l, q)
    kxs = outgoing_kx(k_s, q)
    # bending block: rows (w, theta), columns (propagating/evanescent wave, near field)
    one = np.ones_like(kxb)
    th_b, fw_b = _bending_block(dd, nu, kxb, q)
    th_n, fw_n = _bending_block(dd, nu, kxn, q)
    phi_b = (one, one, th_b, th_n)
    frc_b = (fw_b, fw_n, dd * (kxb**2 + nu * q**2), dd * (kxn**2 + nu * q**2))
    # in-plane block: rows (u, v), columns (longitudinal, shear); the longitudinal wave
    # moves along its wavevector (kx, q)/k_L, the shear wave across it (-q, kx)/k_S
    phi_i = (kxl / k_l, -q / k_s + 0j, q / k_l + 0j, kxs / k_s)
    frc_i = (
        1j * c * (kxl**2 + nu * q**2) / k_l,
        -1j * 2.0 * gh * kxs * q / k_s,
        1j * gh * 2.0 * q * kxl / k_l,
        1j * gh * (kxs**2 - q**2) / k_s,
    )
    inv_i = _inv2(*phi_i)
    inv_b = _inv2(*phi_b)
    return _mul2(frc_i, inv_i), _mul2(frc_b, inv_b), inv_i, inv_b, (kxb, kxl, kxs)


def scatter(
    f: FloatArray,
    q: FloatArray,
    plates: PlateArrays,
    *,
    source: int,
    incident: int,
    compliance: ComplexArray | None = None,
) -> FloatArray:
    """Power transmission coefficients for stacked bands and trace wavenumbers.

    Parameters
    ----------
    f : numpy.ndarray
        Frequencies [Hz], shape ``(B,)``.
    q : numpy.ndarray
        Trace wavenumbers along the junction [rad/m], shape ``(B, T)``, each below the
        incident wave's free wavenumber.
    plates : PlateArrays
        The ``N`` plates, arrays ``(N, B)``.
    source : int
        Index of the plate carrying the incident wave.
    incident : int
        Incident wave type: 0 bending, 1 longitudinal, 2 shear.
    compliance : numpy.ndarray, optional
        Compliance of an elastic interlayer between each plate's edge and the junction
        line, shape ``(N, 4)``, in the plate's local edge dofs ``(u, v, w, theta)``
        [m^2/N for the three translations, 1/N for the rotation]; 0 where the plate is
        joined rigidly (the default: every plate). See :func:`interlayer_compliance`.

    Returns
    -------
    numpy.ndarray
        ``tau[b, t, p, w]`` of shape ``(B, T, N, 3)``: power carried away by wave type ``w``
        (bending, longitudinal, shear) in plate ``p`` over the incident power.

    Notes
    -----
    Wave approach of Langley & Heron (1990): the edge dynamic stiffness of plate ``p`` from
    its outgoing waves is ``K_p = F_p Phi_p^-1``; continuity ``d_p = R_p D`` and equilibrium
    of the massless rigid line give ``(sum_p R_p^T K_p R_p) D = R_s^T (K_s d_inc - f_inc)``.
    Outgoing amplitudes are ``Phi_p^-1 (d_p - d_inc delta_ps)``; powers per unit length of a
    propagating wave of amplitude ``a``: bending ``omega D k_B^2 Re(kx) |a|^2``,
    longitudinal ``omega C Re(kx) |a|^2 / 2``, shear ``omega G h Re(kx) |a|^2 / 2``.

    An elastic interlayer of diagonal compliance ``C_p`` (springs in series with the
    plate's edge) replaces ``K_p`` by ``K_p (I + C_p K_p)^-1`` (the series combination
    ``(K_p^-1 + C_p)^-1``), the source term ``g = K_s d_inc - f_inc`` by
    ``(I + K_s C_s)^-1 g``, and the plate's own edge displacement by
    ``(I + C_p K_p)^-1 (R_p D + C_p g delta_ps)``; ``C_p = 0`` is the rigid junction.

    References
    ----------
    .. [1] Langley, R.S., Heron, K.H. (1990). "Elastic wave transmission through plate/beam
       junctions." J. Sound Vib. 143(2), 241-253. doi:10.1016/0022-460X(90)90953-W
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.
       Springer, ch. 3 and 5. ISBN 978-3-540-22696-3
    .. [3] Craik, R.J.M. (1996). Sound Transmission through Buildings using Statistical
       Energy Analysis. Gower (junctions with resilient layers; from memory).
    """
    n_p = plates.count
    w = (2.0 * math.pi * f)[:, None]
    k_all = plates.wavenumbers(f)  # each (N, B)
    stiff_i, stiff_b, inv_i, inv_b, kxs_all = [], [], [], [], []
    layer: list[tuple[tuple[_C, ...], tuple[_C, ...]] | None] = []
    k_glob = np.zeros((*q.shape, 4, 4), dtype=np.complex128)
    rots = [_rotation(float(a)) for a in plates.angle]
    for p in range(n_p):
        kp = (k_all[0][p][:, None], k_all[1][p][:, None], k_all[2][p][:, None])
        ki, kb, ii, ib, kx_p = _edge_blocks(plates, p, kp, q)
        soft = None if compliance is None or not np.any(compliance[p]) else compliance[p]
        if soft is not None:
            # series interlayer: (I + C K)^-1 per block; the plate behind it acts on the
            # line with K (I + C K)^-1
            a_i = _inv2(
                1.0 + soft[0] * ki[0], soft[0] * ki[1], soft[1] * ki[2], 1.0 + soft[1] * ki[3]
            )
            a_b = _inv2(
                1.0 + soft[2] * kb[0], soft[2] * kb[1], soft[3] * kb[2], 1.0 + soft[3] * kb[3]
            )
            layer.append((a_i, a_b))
            ki, kb = _mul2(ki, a_i), _mul2(kb, a_b)
        else:
            layer.append(None)
        stiff_i.append(ki)
        stiff_b.append(kb)
        inv_i.append(ii)
        inv_b.append(ib)
        kxs_all.append(kx_p)
        # local stiffness entries (l, m) -> global (g, h): K_glob += R^T K_local R
        local = {
            (0, 0): ki[0], (0, 1): ki[1], (1, 0): ki[2], (1, 1): ki[3],
            (2, 2): kb[0], (2, 3): kb[1], (3, 2): kb[2], (3, 3): kb[3],
        }  # fmt: skip
        rot = rots[p]
        for (lo, mo), val in local.items():
            for g in range(4):
                if rot[lo, g] == 0.0:
                    continue
                for h in range(4):
                    if rot[mo, h] != 0.0:
                        k_glob[..., g, h] += rot[lo, g] * val * rot[mo, h]

    # incoming wave (exp(+j kx x)) of the chosen type in the source plate
    s = source
    ds_ = plates.bending[s][:, None]
    c_s = plates.membrane[s][:, None]
    gh_s = plates.shear[s][:, None]
    nu_s = plates.poisson[s][:, None]
    kx_in = -kxs_all[s][incident]
    zero = np.zeros_like(kx_in)
    if incident == 0:
        th_in, fw_in = _bending_block(ds_, nu_s, kx_in, q)
        d_inc = (zero, zero, zero + 1.0, th_in)
        f_inc = (zero, zero, fw_in, ds_ * (kx_in**2 + nu_s * q**2))
    elif incident == 1:
        k_l = k_all[1][s][:, None]
        d_inc = (kx_in / k_l, q / k_l + 0j, zero, zero)
        f_inc = (1j * c_s * (kx_in**2 + nu_s * q**2) / k_l, 1j * gh_s * 2.0 * q * kx_in / k_l, zero, zero)  # fmt: skip
    else:
        k_s = k_all[2][s][:, None]
        d_inc = (-q / k_s + 0j, kx_in / k_s, zero, zero)
        f_inc = (-1j * 2.0 * gh_s * kx_in * q / k_s, 1j * gh_s * (kx_in**2 - q**2) / k_s, zero, zero)  # fmt: skip
    if layer[s] is None:
        ki, kb = stiff_i[s], stiff_b[s]
    else:  # the plate's own edge stiffness, before the interlayer
        ki, kb, _, _, _ = _edge_blocks(
            plates, s, (k_all[0][s][:, None], k_all[1][s][:, None], k_all[2][s][:, None]), q
        )
    rhs_local = (
        ki[0] * d_inc[0] + ki[1] * d_inc[1] - f_inc[0],
        ki[2] * d_inc[0] + ki[3] * d_inc[1] - f_inc[1],
        kb[0] * d_inc[2] + kb[1] * d_inc[3] - f_inc[2],
        kb[2] * d_inc[2] + kb[3] * d_inc[3] - f_inc[3],
    )
    g_src = rhs_local
    lay_s = layer[s]
    if lay_s is not None:
        # the force the interlayer passes on: (I + K C)^-1 g = g - K a C g with
        # a = (I + C K)^-1 (no inverse of C, so a rigid dof with C = 0 is exact)
        assert compliance is not None
        cs = compliance[s]
        ka_i = _mul2(ki, lay_s[0])
        ka_b = _mul2(kb, lay_s[1])
        cg = (cs[0] * g_src[0], cs[1] * g_src[1], cs[2] * g_src[2], cs[3] * g_src[3])
        rhs_local = (
            g_src[0] - (ka_i[0] * cg[0] + ka_i[1] * cg[1]),
            g_src[1] - (ka_i[2] * cg[0] + ka_i[3] * cg[1]),
            g_src[2] - (ka_b[0] * cg[2] + ka_b[1] * cg[3]),
            g_src[3] - (ka_b[2] * cg[2] + ka_b[3] * cg[3]),
        )
    rot_s = rots[s]
    rhs = np.zeros((*q.shape, 4, 1), dtype=np.complex128)
    for g in range(4):
        for lo in range(4):
            if rot_s[lo, g] != 0.0:
                rhs[..., g, 0] += rot_s[lo, g] * rhs_local[lo]
    disp = np.linalg.solve(k_glob, rhs)[..., 0]

    k_max = np.maximum(np.maximum(k_all[0], k_all[1]), k_all[2])  # (N, B)
    coef = (
        w * plates.bending[s][:, None] * k_all[0][s][:, None] ** 2,
        0.5 * w * plates.membrane[s][:, None],
        0.5 * w * plates.shear[s][:, None],
    )
    kx_inc = kxs_all[s][incident]
    p_inc = np.abs(kx_inc.real) * coef[incident]
    tau = np.zeros((*q.shape, n_p, 3), dtype=np.float64)
    for p in range(n_p):
        rot = rots[p]
        d_p = [rot[lo, 0] * disp[..., 0] + rot[lo, 1] * disp[..., 1]
               + rot[lo, 2] * disp[..., 2] + rot[lo, 3] * disp[..., 3] for lo in range(4)]  # fmt: skip
        lay = layer[p]
        if lay is not None:
            # the plate's edge behind the interlayer: (I + C K)^-1 (R D + C g delta_ps)
            assert compliance is not None
            cp = compliance[p]
            if p == s:
                d_p = [d_p[lo] + cp[lo] * g_src[lo] for lo in range(4)]
            li, lb = lay
            d_p = [
                li[0] * d_p[0] + li[1] * d_p[1],
                li[2] * d_p[0] + li[3] * d_p[1],
                lb[0] * d_p[2] + lb[1] * d_p[3],
                lb[2] * d_p[2] + lb[3] * d_p[3],
            ]
        if p == s:
            d_p = [d_p[lo] - d_inc[lo] for lo in range(4)]
        ii, ib = inv_i[p], inv_b[p]
        amp = (
            ib[0] * d_p[2] + ib[1] * d_p[3],  # bending
            ii[0] * d_p[0] + ii[1] * d_p[1],  # longitudinal
            ii[2] * d_p[0] + ii[3] * d_p[1],  # shear
        )
        flux = (
            w * plates.bending[p][:, None] * k_all[0][p][:, None] ** 2,
            0.5 * w * plates.membrane[p][:, None],
            0.5 * w * plates.shear[p][:, None],
        )
        tol = 1e-12 * k_max[p][:, None]
        for t in range(3):
            kx = kxs_all[p][t]
            prop = np.abs(kx.imag) < tol
            power = np.where(prop, np.abs(kx.real) * flux[t], 0.0) * np.abs(amp[t]) ** 2
            tau[..., p, t] = power / p_inc
    return tau


@lru_cache(maxsize=16)
def _gauss_map(n_points: int) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Gauss-Legendre weights and the end-clustering map on [0, 1], computed once per n.

    Returns ``w``, ``1 - cos(u)`` and ``sin(u)`` at ``u = pi (x + 1)/2`` for the
    Gauss-Legendre nodes ``x`` on [-1, 1] (read-only arrays).
    """
    x, w = gauss_legendre(n_points)
    u = 0.5 * np.pi * (x + 1.0)
    out = (w, 1.0 - np.cos(u), np.sin(u))
    for a in out:
        a.flags.writeable = False
    return out


def diffuse_nodes(breaks: FloatArray, n_points: int) -> tuple[FloatArray, FloatArray]:
    """Quadrature nodes and weights on [0, 1] in ``s = sin(theta)`` for every band at once.

    Parameters
    ----------
    breaks : numpy.ndarray
        Break points per band, shape ``(B, K)``; those outside (0, 1) are ignored.
    n_points : int
        Gauss-Legendre nodes per sub-interval.

    Returns
    -------
    tuple of numpy.ndarray
        ``s`` and ``weights``, each ``(B, I n_points)``. Each band's interval [0, 1] is split
        at its break points; in each sub-interval [a, b] the Gauss-Legendre nodes are mapped
        by ``s = a + (b - a)(1 - cos u)/2``, clustering them at both ends where the
        integrand has square-root behaviour at a wave type's cut-off. Bands with fewer
        break points get empty sub-intervals (weight 0) so that all bands share one shape.

    References
    ----------
    .. [1] Abramowitz, M., Stegun, I.A. (1964). Handbook of Mathematical Functions, NBS
       AMS 55, eq. 25.4.29 (Gauss-Legendre quadrature).
    """
    b_arr = np.asarray(breaks, dtype=np.float64)
    inner = np.where((b_arr > 0.0) & (b_arr < 1.0), b_arr, 1.0)
    pts = np.sort(
        np.concatenate([np.zeros((b_arr.shape[0], 1)), inner, np.ones((b_arr.shape[0], 1))], 1),
        axis=1,
    )
    lo, hi = pts[:, :-1], pts[:, 1:]
    keep = np.any(hi > lo, axis=0)  # drop sub-intervals that are empty in every band
    lo, hi = lo[:, keep, None], hi[:, keep, None]
    w, one_minus_cos, sin_u = _gauss_map(n_points)
    half = (hi - lo) * 0.5
    s = lo + half * one_minus_cos
    ds = half * sin_u * 0.5 * np.pi
    nb = b_arr.shape[0]
    return s.reshape(nb, -1), (w * ds).reshape(nb, -1)


def diffuse_transmission(
    f: FloatArray,
    plates: PlateArrays,
    *,
    source: int,
    incident: int,
    n_points: int,
    compliance: ComplexArray | None = None,
) -> FloatArray:
    """Diffuse-field average ``int_0^1 tau ds`` (``s = sin(theta)``) for all bands at once.

    Parameters
    ----------
    f : numpy.ndarray
        Frequencies [Hz], shape ``(B,)``.
    plates : PlateArrays
        The plates, arrays ``(N, B)``.
    source, incident : int
        Source plate index; incident wave type (0 bending, 1 longitudinal, 2 shear).
    n_points : int
        Gauss-Legendre nodes per sub-interval between cut-offs.
    compliance : numpy.ndarray, optional
        Interlayer compliances ``(N, 4)`` as in :func:`scatter` (default: rigid).

    Returns
    -------
    numpy.ndarray
        ``tau_bar[b, p, w]``, shape ``(B, N, 3)``.

    Notes
    -----
    ``tau_bar = int_0^{pi/2} tau(theta) cos(theta) dtheta = int_0^1 tau ds``, split where a
    wave type of any plate cuts off (``s = k / k_inc``); see
    :func:`seatool.physics.junctions.line_junction_transmission_diffuse`.

    References
    ----------
    .. [1] Langley, R.S., Heron, K.H. (1990). J. Sound Vib. 143(2), 241-253.
    """
    k_all = plates.wavenumbers(f)  # 3 x (N, B)
    k_in = k_all[incident][source]  # (B,)
    breaks = np.concatenate([(k / k_in).T for k in k_all], axis=1)  # (B, 3N)
    s, wts = diffuse_nodes(breaks, n_points)
    theta = np.arcsin(np.clip(s, 0.0, 1.0))
    q = k_in[:, None] * np.sin(np.minimum(theta, THETA_MAX))
    tau = scatter(f, q, plates, source=source, incident=incident, compliance=compliance)
    out: FloatArray = np.einsum("bt,btpw->bpw", wts, tau)
    return out


def plate_arrays(
    thickness: Sequence[FloatArray] | FloatArray,
    youngs_modulus: Sequence[FloatArray] | FloatArray,
    density: Sequence[FloatArray] | FloatArray,
    poisson: Sequence[FloatArray] | FloatArray,
    angle: Sequence[float] | FloatArray,
    bending: Sequence[FloatArray] | FloatArray,
) -> PlateArrays:
    """Stack plate data (each ``(N, B)``; ``angle`` ``(N,)``) into :class:`PlateArrays`.

    ``bending`` is ``D`` computed by the caller with
    :func:`seatool.physics.plates.bending_stiffness` (one formula, one place).
    """
    h = np.asarray(thickness, dtype=np.float64)
    e = np.asarray(youngs_modulus, dtype=np.float64)
    rho = np.asarray(density, dtype=np.float64)
    nu = np.asarray(poisson, dtype=np.float64)
    return PlateArrays(
        bending=np.asarray(bending, dtype=np.float64),
        membrane=e * h / (1.0 - nu**2),
        shear=e * h / (2.0 * (1.0 + nu)),
        mass=rho * h,
        poisson=nu,
        angle=np.asarray(angle, dtype=np.float64),
    )


def interlayer_compliance(
    stiffness: float,
    *,
    width: float,
    shear_stiffness: float | None = None,
    loss_factor: float = 0.0,
) -> ComplexArray:
    """Compliance of an elastic strip under a plate's edge, in the edge dofs (u, v, w, theta).

    Parameters
    ----------
    stiffness : float
        Dynamic stiffness per unit length of seam in compression across the strip
        ``k'`` [N/m^2] (``s' b``: dynamic stiffness per unit area ``s'`` [N/m^3] of the
        resilient material times the strip width ``b``); ``inf`` for a rigid joint.
    width : float
        Width ``b`` of the strip across the seam [m], > 0 (usually the thickness of the
        plate standing on it; a very narrow strip passes almost no moment: a hinge).
    shear_stiffness : float, optional
        Dynamic stiffness per unit length in shear (both directions in the strip's
        plane) [N/m^2]; default ``k'/3``.
    loss_factor : float, optional
        Loss factor ``eta`` of the material [-]: stiffnesses ``k (1 + j eta)``.

    Returns
    -------
    numpy.ndarray
        ``(1/k', 1/k'_s, 1/k'_s, 1/k'_theta)`` (complex, shape ``(4,)``) [m^2/N, m^2/N,
        m^2/N, 1/N] for the plate's edge dofs: ``u`` (in the plate, compressing the strip),
        ``v`` (along the seam) and ``w`` (plate normal) shear the strip, ``theta`` rocks it.

    Notes
    -----
    The strip is a layer of independent springs (Winkler foundation) of stiffness
    ``k'/b`` per unit area of contact. Compression of the strip by ``u`` gives a force per
    unit length ``k' u``; a rotation ``theta`` of the plate's edge about the middle of the
    strip gives the moment per unit length
    ``int_{-b/2}^{b/2} (k'/b) theta x^2 dx = k' b^2 theta / 12`` [1]_. The default shear
    stiffness takes the strip as a free-to-bulge elastomer, ``G = E / 3``
    (``E = 2 G (1 + nu)``, ``nu = 0.5``) [2]_, so ``k'_s = G b / t = k' / 3``. A dynamic
    stiffness per unit area is what EN 29052-1 measures for resilient layers [3]_.

    References
    ----------
    .. [1] Hetenyi, M. (1946). Beams on Elastic Foundation. University of Michigan Press,
       ch. 1 (the Winkler foundation) (from memory).
    .. [2] Timoshenko, S.P., Goodier, J.N. (1970). Theory of Elasticity, 3rd ed.
       McGraw-Hill, sec. 3 (relations between the elastic constants).
    .. [3] EN 29052-1:1992 (ISO 9052-1:1989). Acoustics - Determination of dynamic
       stiffness - Part 1: Materials used under floating floors in dwellings, clause 3.
    """
    if not stiffness > 0.0:
        msg = f"stiffness must be > 0, got {stiffness!r}"
        raise ValueError(msg)
    if not (math.isfinite(width) and width > 0.0):
        msg = f"width must be finite and > 0, got {width!r}"
        raise ValueError(msg)
    ks = stiffness / 3.0 if shear_stiffness is None else shear_stiffness
    if not ks > 0.0:
        msg = f"shear_stiffness must be > 0, got {shear_stiffness!r}"
        raise ValueError(msg)
    if not (math.isfinite(loss_factor) and loss_factor >= 0.0):
        msg = f"loss_factor must be finite and >= 0, got {loss_factor!r}"
        raise ValueError(msg)
    k_rot = stiffness * width**2 / 12.0
    cplx = 1.0 + 1j * loss_factor
    out: ComplexArray = np.array(
        [0.0 if math.isinf(k) else 1.0 / (k * cplx) for k in (stiffness, ks, ks, k_rot)],
        dtype=np.complex128,
    )
    return out
