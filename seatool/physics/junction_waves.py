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

The plate records and the interlayer springs are in :mod:`seatool.physics.junction_plates`
(re-exported here); the small-matrix algebra in :mod:`seatool.physics.stacked_algebra`.

A plate may be joined to the line through an elastic interlayer (a strip of springs in
series with its edge, :func:`interlayer_compliance`); without one the junction is rigid.

Conventions as in :mod:`seatool.physics.junctions`: time dependence exp(+j omega t); local
axes ``x`` (in the plate, away from the junction), ``y`` (along the junction), ``n`` (plate
normal); global line dofs ``(U_X, U_Z, V, Theta)``.

Why this file is a little longer than about 600 lines: the scattering solve, the incident
fields and the diffuse average share the stacked array layout and its band grouping;
splitting them would put one layout in two places.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from functools import lru_cache
from typing import Any

import numpy as np
import numpy.typing as npt

from . import stacked_algebra as sa
from .junction_plates import PlateArrays, interlayer_compliance, plate_arrays
from .quadrature import gauss_legendre

__all__ = [
    "INCIDENT_COLUMNS",
    "PlateArrays",
    "diffuse_nodes",
    "diffuse_transmission",
    "diffuse_transmission_many",
    "interlayer_compliance",
    "outgoing_kx",
    "plate_arrays",
    "scatter",
    "scatter_many",
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


def _rotation(angle: float) -> FloatArray:
    """Map global line dofs (U_X, U_Z, V, Theta) to local edge dofs (u, v, w, theta).

    A cosine or sine below 1e-15 in magnitude is the rounding of a right angle given in
    degrees (cos(pi/2) = 6e-17 in floating point) and is taken as exactly 0, so that the
    stiffness entries a plate at a right angle does not touch stay empty.
    """
    ca, sa = math.cos(angle), math.sin(angle)
    ca = 0.0 if abs(ca) < 1e-15 else ca
    sa = 0.0 if abs(sa) < 1e-15 else sa
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
    q2: FloatArray,
) -> tuple[tuple[_C, ...], tuple[_C, ...], tuple[_C, ...], tuple[_C, ...], tuple[_C, _C, _C]]:
    """Wave matrices of the outgoing waves of plate ``p`` as two 2 x 2 blocks.

    Returns the in-plane and bending blocks of the edge stiffness ``K = F Phi^-1`` and of
    ``Phi^-1`` (entries row-wise), and the x-wavenumbers of bending, longitudinal and shear
    waves. ``k`` holds this plate's ``(k_B, k_L, k_S)`` with shape ``(B, 1)``; ``q`` is
    ``(B, T)`` and ``q2 = q^2``.

    Bending block, rows ``(w, theta)``, columns (propagating/evanescent wave ``kx_B``,
    near field ``kx_N = -j sqrt(k_B^2 + q^2)``): ``Phi = [[1, 1], [-j kx_B, -j kx_N]]``,
    shear forces ``j D kx (kx^2 + (2 - nu) q^2)`` and moments ``D (kx^2 + nu q^2)``
    (Kirchhoff plate; Cremer, Heckl & Petersson 2005, ch. 3 and 5). With
    ``a = k_B^2``, ``b = (1 - nu) q^2`` and ``g = 1/(kx_B - kx_N)`` the product
    ``F Phi^-1`` is written out: ``K_ww = -2 j D a kx_B kx_N g``,
    ``K_wt = K_tw = -D (kx_N (a - b) + kx_B (a + b)) g``, ``K_tt = 2 j D a g``.

    In-plane block, rows ``(u, v)``, columns (longitudinal, shear): the longitudinal wave
    moves along its wavevector ``(kx_L, q)/k_L``, the shear wave across it
    ``(-q, kx_S)/k_S``; with ``h = 1/(kx_L kx_S + q^2)``:
    ``K_uu = j h kx_S (C (k_L^2 - b) + 2 G h q^2)``,
    ``K_uv = j h q (C (k_L^2 - b) - 2 G h kx_L kx_S)``,
    ``K_vu = j h q G h (2 kx_L kx_S - k_S^2 + 2 q^2)``, ``K_vv = j h G h kx_L k_S^2``.
    """
    k_b, k_l, k_s = k
    dd = pl.bending[p][:, None]
    c = pl.membrane[p][:, None]
    gh = pl.shear[p][:, None]
    nu = pl.poisson[p][:, None]
    kb2 = k_b**2
    kxb = outgoing_kx(k_b, q)
    kxn = -1j * np.sqrt(kb2 + q2)  # bending near field, always decaying
    kxl = outgoing_kx(k_l, q)
    kxs = outgoing_kx(k_s, q)
    b = (1.0 - nu) * q2
    # bending block
    g = 1.0 / (kxb - kxn)
    two_da = 2.0 * dd * kb2
    k_wt = -dd * (kxn * (kb2 - b) + kxb * (kb2 + b)) * g
    k_bend = (-1j * two_da * kxb * kxn * g, k_wt, k_wt, 1j * two_da * g)
    inv_b = (-g * kxn, 1j * g, g * kxb, -1j * g)
    # in-plane block
    h = 1.0 / (kxl * kxs + q2)
    jh = 1j * h
    lx_s = kxl * kxs
    cl = c * (k_l**2 - b)
    k_in = (
        jh * kxs * (cl + 2.0 * gh * q2),
        jh * q * (cl - 2.0 * gh * lx_s),
        jh * q * gh * (2.0 * lx_s - k_s**2 + 2.0 * q2),
        jh * gh * kxl * k_s**2,
    )
    inv_i = (h * k_l * kxs, h * k_l * q, -h * k_s * q, h * k_s * kxl)
    return k_in, k_bend, inv_i, inv_b, (kxb, kxl, kxs)


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

    The global 4 x 4 system is solved by 2 x 2 blocks
    (:func:`seatool.physics.stacked_algebra.solve4`).

    References
    ----------
    .. [1] Langley, R.S., Heron, K.H. (1990). "Elastic wave transmission through plate/beam
       junctions." J. Sound Vib. 143(2), 241-253. doi:10.1016/0022-460X(90)90953-W
    .. [2] Cremer, L., Heckl, M., Petersson, B.A.T. (2005). Structure-borne Sound, 3rd ed.
       Springer, ch. 3 and 5. ISBN 978-3-540-22696-3
    .. [3] Craik, R.J.M. (1996). Sound Transmission through Buildings using Statistical
       Energy Analysis. Gower (junctions with resilient layers; from memory).
    """
    return scatter_many(f, [q], plates, [(source, incident)], compliance=compliance)[0]


def _incident_wave(
    plates: PlateArrays, s: int, incident: int, kx_in: _C, q: FloatArray, k_all: Any
) -> tuple[list[_C], list[_C]]:
    """Edge displacement and force of the incoming wave ``exp(+j kx x)`` (``kx_in < 0``)."""
    ds_ = plates.bending[s][:, None]
    c_s = plates.membrane[s][:, None]
    gh_s = plates.shear[s][:, None]
    nu_s = plates.poisson[s][:, None]
    zero = np.zeros_like(kx_in)
    if incident == 0:
        th_in, fw_in = _bending_block(ds_, nu_s, kx_in, q)
        return [zero, zero, zero + 1.0, th_in], [zero, zero, fw_in, ds_ * (kx_in**2 + nu_s * q**2)]
    if incident == 1:
        k_l = k_all[1][s][:, None]
        d_inc = [kx_in / k_l, q / k_l + 0j, zero, zero]
        return d_inc, [1j * c_s * (kx_in**2 + nu_s * q**2) / k_l, 1j * gh_s * 2.0 * q * kx_in / k_l, zero, zero]  # fmt: skip
    k_s = k_all[2][s][:, None]
    d_inc = [-q / k_s + 0j, kx_in / k_s, zero, zero]
    return d_inc, [-1j * 2.0 * gh_s * kx_in * q / k_s, 1j * gh_s * (kx_in**2 - q**2) / k_s, zero, zero]  # fmt: skip


def scatter_many(
    f: FloatArray,
    qs: Sequence[FloatArray],
    plates: PlateArrays,
    incidents: Sequence[tuple[int, int]],
    *,
    compliance: ComplexArray | None = None,
) -> list[FloatArray]:
    """:func:`scatter` for several incident waves, solved as one stack.

    Parameters
    ----------
    f : numpy.ndarray
        Frequencies [Hz], shape ``(B,)``.
    qs : sequence of numpy.ndarray
        Trace wavenumbers [rad/m] for each incident wave, shapes ``(B, T_i)``.
    plates : PlateArrays
        The ``N`` plates.
    incidents : sequence of (int, int)
        ``(source plate, incident wave type)`` for each entry of ``qs``.
    compliance : numpy.ndarray, optional
        Interlayer compliances ``(N, 4)`` as in :func:`scatter`.

    Returns
    -------
    list of numpy.ndarray
        ``tau`` of shape ``(B, T_i, N, 3)`` for each incident wave, as :func:`scatter`.

    Notes
    -----
    The junction's stiffness depends on the trace wavenumber only, not on where the
    incident wave comes from, so the nodes of every incident wave are stacked along one
    axis: one set of edge matrices and one 4 x 4 solve for all (plates x waves x bands x
    nodes). The physics is that of :func:`scatter` (Langley & Heron 1990).

    References
    ----------
    .. [1] Langley, R.S., Heron, K.H. (1990). J. Sound Vib. 143(2), 241-253.
    """
    if len(qs) != len(incidents) or not qs:
        msg = (
            f"need one trace-wavenumber array per incident wave, got {len(qs)} and {len(incidents)}"
        )
        raise ValueError(msg)
    q = qs[0] if len(qs) == 1 else np.concatenate(qs, axis=1)
    q2 = q * q
    cuts = np.cumsum([0] + [x.shape[1] for x in qs])
    segs = [slice(int(cuts[i]), int(cuts[i + 1])) for i in range(len(qs))]
    n_p = plates.count
    w = (2.0 * math.pi * f)[:, None]
    k_all = plates.wavenumbers(f)  # each (N, B)
    rots = [_rotation(float(a)) for a in plates.angle]
    # nonzero entries of each rotation: local dof lo -> [(global dof g, R[lo, g])]
    nzs = [
        [[(g, float(r[lo, g])) for g in range(4) if r[lo, g] != 0.0] for lo in range(4)]
        for r in rots
    ]
    kmat: list[list[sa.Entry]] = [[None] * 4 for _ in range(4)]
    own, inv_i, inv_b, kxs_all = [], [], [], []
    layer: list[tuple[tuple[_C, ...], tuple[_C, ...]] | None] = []
    for p in range(n_p):
        kp = (k_all[0][p][:, None], k_all[1][p][:, None], k_all[2][p][:, None])
        ki, kb, ii, ib, kx_p = _edge_blocks(plates, p, kp, q, q2)
        own.append((ki, kb))
        soft = None if compliance is None or not np.any(compliance[p]) else compliance[p]
        if soft is not None:
            # series interlayer: (I + C K)^-1 per block; the plate behind it acts on the
            # line with K (I + C K)^-1
            a_i = sa.inv2(
                1.0 + soft[0] * ki[0], soft[0] * ki[1], soft[1] * ki[2], 1.0 + soft[1] * ki[3]
            )
            a_b = sa.inv2(
                1.0 + soft[2] * kb[0], soft[2] * kb[1], soft[3] * kb[2], 1.0 + soft[3] * kb[3]
            )
            layer.append((a_i, a_b))
            ki, kb = sa.mul2(ki, a_i), sa.mul2(kb, a_b)
        else:
            layer.append(None)
        inv_i.append(ii)
        inv_b.append(ib)
        kxs_all.append(kx_p)
        # local stiffness entries (l, m) -> global (g, h): K_glob += R^T K_local R
        local = {
            (0, 0): ki[0], (0, 1): ki[1], (1, 0): ki[2], (1, 1): ki[3],
            (2, 2): kb[0], (2, 3): kb[1], (3, 2): kb[2], (3, 3): kb[3],
        }  # fmt: skip
        nz = nzs[p]
        for (lo, mo), val in local.items():
            for g, rg in nz[lo]:
                for h, rh in nz[mo]:
                    c = rg * rh
                    kmat[g][h] = sa.add(kmat[g][h], val if c == 1.0 else c * val)

    # right-hand side: the incoming wave (exp(+j kx x)) of each incident wave's segment
    shape = q.shape
    rhs = [np.zeros(shape, dtype=np.complex128) for _ in range(4)]
    p_inc = np.empty(shape)
    coef = [
        (
            w * plates.bending[p][:, None] * k_all[0][p][:, None] ** 2,
            0.5 * w * plates.membrane[p][:, None],
            0.5 * w * plates.shear[p][:, None],
        )
        for p in range(n_p)
    ]
    d_incs: list[list[_C]] = []
    g_srcs: list[list[_C]] = []
    for (s, inc), sl in zip(incidents, segs, strict=True):
        qq = q[:, sl]
        kx_inc = kxs_all[s][inc][:, sl]
        d_inc, f_inc = _incident_wave(plates, s, inc, -kx_inc, qq, k_all)
        own_i = tuple(x[:, sl] for x in own[s][0])
        own_b = tuple(
            x[:, sl] for x in own[s][1]
        )  # the plate's own edge stiffness (before any layer)
        g_src = [
            own_i[0] * d_inc[0] + own_i[1] * d_inc[1] - f_inc[0],
            own_i[2] * d_inc[0] + own_i[3] * d_inc[1] - f_inc[1],
            own_b[0] * d_inc[2] + own_b[1] * d_inc[3] - f_inc[2],
            own_b[2] * d_inc[2] + own_b[3] * d_inc[3] - f_inc[3],
        ]
        rhs_local = g_src
        lay_s = layer[s]
        if lay_s is not None:
            # the force the interlayer passes on: (I + K C)^-1 g = g - K a C g with
            # a = (I + C K)^-1 (no inverse of C, so a rigid dof with C = 0 is exact)
            assert compliance is not None
            cs = compliance[s]
            ka_i = sa.mul2(own_i, tuple(x[:, sl] for x in lay_s[0]))
            ka_b = sa.mul2(own_b, tuple(x[:, sl] for x in lay_s[1]))
            cg = (cs[0] * g_src[0], cs[1] * g_src[1], cs[2] * g_src[2], cs[3] * g_src[3])
            rhs_local = [
                g_src[0] - (ka_i[0] * cg[0] + ka_i[1] * cg[1]),
                g_src[1] - (ka_i[2] * cg[0] + ka_i[3] * cg[1]),
                g_src[2] - (ka_b[0] * cg[2] + ka_b[1] * cg[3]),
                g_src[3] - (ka_b[2] * cg[2] + ka_b[3] * cg[3]),
            ]
        for lo in range(4):
            for g, rg in nzs[s][lo]:
                rhs[g][:, sl] += rg * rhs_local[lo]
        p_inc[:, sl] = np.abs(kx_inc.real) * coef[s][inc]
        d_incs.append(d_inc)
        g_srcs.append(g_src)
    disp = [sa.as_array(x, shape) for x in sa.solve4(kmat, list(rhs))]

    k_max = np.maximum(np.maximum(k_all[0], k_all[1]), k_all[2])  # (N, B)
    tau = np.zeros((*shape, n_p, 3), dtype=np.float64)
    for p in range(n_p):
        nz = nzs[p]
        d_p = []
        for lo in range(4):
            acc = sa.add(*(disp[g] if rg == 1.0 else rg * disp[g] for g, rg in nz[lo]))
            d_p.append(sa.as_array(acc, shape).copy())
        lay = layer[p]
        sources = [k for k, (s, _) in enumerate(incidents) if s == p]
        if lay is not None:
            # the plate's edge behind the interlayer: (I + C K)^-1 (R D + C g delta_ps)
            assert compliance is not None
            cp = compliance[p]
            for k in sources:
                for lo in range(4):
                    d_p[lo][:, segs[k]] += cp[lo] * g_srcs[k][lo]
            li, lb = lay
            d_p = [
                li[0] * d_p[0] + li[1] * d_p[1],
                li[2] * d_p[0] + li[3] * d_p[1],
                lb[0] * d_p[2] + lb[1] * d_p[3],
                lb[2] * d_p[2] + lb[3] * d_p[3],
            ]
        for k in sources:
            for lo in range(4):
                d_p[lo][:, segs[k]] -= d_incs[k][lo]
        ii, ib = inv_i[p], inv_b[p]
        amp = (
            ib[0] * d_p[2] + ib[1] * d_p[3],  # bending
            ii[0] * d_p[0] + ii[1] * d_p[1],  # longitudinal
            ii[2] * d_p[0] + ii[3] * d_p[1],  # shear
        )
        tol = 1e-12 * k_max[p][:, None]
        for t in range(3):
            kx = kxs_all[p][t]
            prop = np.abs(kx.imag) < tol
            power = np.where(prop, np.abs(kx.real) * coef[p][t], 0.0) * np.abs(amp[t]) ** 2
            tau[..., p, t] = power / p_inc
    return [tau[:, sl] for sl in segs]


#: Largest number of band x quadrature-node pairs :func:`diffuse_transmission_many` solves
#: together; the bands are split into equal groups below it (about 40 kB per complex
#: temporary, so a group's temporaries stay in a core's cache). Measured on the rail
#: cab's junctions (22 bands): 144 nodes per band in two groups 18 % faster than all bands
#: at once, 288 nodes in three groups 15 % faster; groups of under 1,000 pairs are slower.
NODES_PER_GROUP = 2400


def _band_slice(plates: PlateArrays, g: slice) -> PlateArrays:
    """The plates' data of the bands ``g``."""
    return PlateArrays(
        bending=plates.bending[:, g],
        membrane=plates.membrane[:, g],
        shear=plates.shear[:, g],
        mass=plates.mass[:, g],
        poisson=plates.poisson[:, g],
        angle=plates.angle,
    )


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
    return diffuse_transmission_many(
        f, plates, [(source, incident)], n_points=n_points, compliance=compliance
    )[0]


def diffuse_transmission_many(
    f: FloatArray,
    plates: PlateArrays,
    incidents: Sequence[tuple[int, int]],
    *,
    n_points: int,
    compliance: ComplexArray | None = None,
) -> FloatArray:
    """:func:`diffuse_transmission` for several (source plate, incident wave) at once.

    Parameters
    ----------
    f : numpy.ndarray
        Frequencies [Hz], shape ``(B,)``.
    plates : PlateArrays
        The plates, arrays ``(N, B)``.
    incidents : sequence of (int, int)
        ``(source plate, incident wave type)`` pairs (wave type 0 bending, 1 longitudinal,
        2 shear).
    n_points : int
        Gauss-Legendre nodes per sub-interval between cut-offs.
    compliance : numpy.ndarray, optional
        Interlayer compliances ``(N, 4)`` as in :func:`scatter` (default: rigid).

    Returns
    -------
    numpy.ndarray
        ``tau_bar[i, b, p, w]``, shape ``(len(incidents), B, N, 3)``.

    Notes
    -----
    Each incident wave has its own quadrature nodes (its cut-offs); all of them are solved
    as one stack (:func:`scatter_many`). Same integral as :func:`diffuse_transmission`.

    References
    ----------
    .. [1] Langley, R.S., Heron, K.H. (1990). J. Sound Vib. 143(2), 241-253.
    """
    k_all = plates.wavenumbers(f)  # 3 x (N, B)
    qs, wts = [], []
    for source, incident in incidents:
        k_in = k_all[incident][source]  # (B,)
        breaks = np.concatenate([(k / k_in).T for k in k_all], axis=1)  # (B, 3N)
        s, wt = diffuse_nodes(breaks, n_points)
        theta = np.arcsin(np.clip(s, 0.0, 1.0))
        qs.append(k_in[:, None] * np.sin(np.minimum(theta, THETA_MAX)))
        wts.append(wt)
    # bands in groups of about NODES_PER_GROUP nodes: every band is solved by itself
    # (elementwise), and the many temporaries of a group stay in a core's cache
    nb = f.shape[0]
    count = max(1, -(-nb * sum(q.shape[1] for q in qs) // NODES_PER_GROUP))
    step = max(1, -(-nb // count))
    groups = [slice(i, i + step) for i in range(0, nb, step)]
    parts = [
        scatter_many(
            f[g], [q[g] for q in qs], _band_slice(plates, g), incidents, compliance=compliance
        )
        for g in groups
    ]
    taus = [np.concatenate([p[i] for p in parts]) for i in range(len(qs))]
    out: FloatArray = np.stack(
        [np.einsum("bt,btpw->bpw", wt, tau) for wt, tau in zip(wts, taus, strict=True)]
    )
    return out
