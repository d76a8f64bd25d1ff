"""Coupled structural-acoustic modal equations, solved per frequency line.

In-vacuo structural modes (modal velocities V_k) and rigid-walled cavity modes (modal
pressures P_n) coupled by the surface integrals C_nk of their shapes over the flexible
wall (:func:`seatool.physics.modal_box.coupling_matrix`). With the time dependence
exp(j omega t), wall displacement positive into the cavity and rms phasors:

.. math::

    Z_k V_k + \\sum_n C_{nk} P_n = F_k, \\qquad
    Y_n P_n - \\sum_k C_{nk} V_k = Q_n,

    Z_k = \\frac{M_k(\\omega_k^2 - \\omega^2 + j\\eta_k\\omega_k\\omega)}{j\\omega}, \\qquad
    Y_n = \\frac{\\Lambda_n(\\omega_n^2 - \\omega^2 + j\\eta_n\\omega_n\\omega)}
               {\\rho c^2\\, j\\omega},

F_k the generalised forces, Q_n = integral of q psi_n dV the modal volume-velocity source,
M_k the modal masses and Lambda_n the cavity normalisation integrals. Both uncoupled
operators are diagonal; the coupling is the only off-diagonal block. Eliminating one set
(a diagonal inverse) leaves a dense system in the other: eliminating the cavity gives the
structural system with the fluid-loading term C^T Y^-1 C, eliminating the structure gives
the cavity system loaded by the wall impedance. :func:`solve_coupled` keeps the smaller set,
forms the reduced matrices with two real matrix products per block of lines and solves them
with batched LU (numpy), for any number of right-hand sides.

References
----------
.. [1] Dowell, E.H., Gorman, G.F., Smith, D.A. (1977). Acoustoelasticity: general theory,
   acoustic natural modes and forced response to sinusoidal excitation, including
   comparisons with experiment. J. Sound Vib. 52(4), 519-542 (modal equations of the
   cavity with flexible walls).
.. [2] Pan, J., Bies, D.A. (1990). The effect of fluid-structural coupling on sound waves in
   an enclosure -- theoretical part. J. Acoust. Soc. Am. 87(2), 691-707.
.. [3] Fahy, F.J., Gardonio, P. (2007). Sound and Structural Vibration, 2nd ed., Academic
   Press, ISBN 978-0-12-373633-8, ch. 7 (acoustic coupling between structures and enclosed
   volumes of fluid: modal-interaction model), from memory.
"""

from __future__ import annotations

from typing import Literal

import numpy as np
import numpy.typing as npt

from ._checks import nonnegative as _nonnegative
from ._checks import positive as _positive
from ._threads import one_blas_thread

__all__ = [
    "band_lines",
    "cavity_modal_admittance_term",
    "coupling_group_count",
    "line_average",
    "modal_impedance",
    "solve_coupled",
    "solve_coupled_full",
    "solve_coupled_squares",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

#: Complex numbers held per block of frequency lines while forming reduced matrices.
_BLOCK_ELEMENTS = 6_000_000


def modal_impedance(
    omega: npt.ArrayLike,
    natural_frequency: npt.ArrayLike,
    modal_mass: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
) -> ComplexArray:
    """Modal impedance of uncoupled, viscously damped modes, Z = M (w_k^2 - w^2 + j eta w_k w)/(j w).

    Parameters
    ----------
    omega : array_like, shape (L,)
        Angular frequencies of the lines [rad/s] (> 0).
    natural_frequency : array_like, shape (K,)
        Natural frequencies f_k [Hz] (>= 0).
    modal_mass : float or array_like, shape (K,)
        Generalised masses M_k [kg] (or Lambda_n / (rho c^2) [m^3/Pa] for cavity modes,
        see :func:`cavity_modal_admittance_term`).
    loss_factor : float or array_like, shape (K,)
        Modal loss factors eta_k [-]: the half-power bandwidth of mode k is eta_k f_k.

    Returns
    -------
    numpy.ndarray of complex, shape (L, K)

    Notes
    -----
    Modal damping as an equivalent viscous term 2 zeta_k omega_k omega with zeta = eta / 2,
    which equals the loss-factor (hysteretic) form at resonance and keeps the equations
    linear in j omega; the 0 Hz cavity mode stays undamped (a pure compliance).

    References
    ----------
    .. [1] Fahy, F.J., Gardonio, P. (2007). Sound and Structural Vibration, 2nd ed.,
       Academic Press, ch. 2 (modal damping, loss factor and damping ratio), from memory.
    """
    w = _positive("omega", omega)[:, None]
    wk = 2.0 * np.pi * _nonnegative("natural_frequency", natural_frequency)[None, :]
    m = _positive("modal_mass", modal_mass)
    eta = _nonnegative("loss_factor", loss_factor)
    out = m * (wk**2 - w**2 + 1j * eta * wk * w) / (1j * w)
    return np.asarray(out, dtype=np.complex128)


def cavity_modal_admittance_term(
    omega: npt.ArrayLike,
    natural_frequency: npt.ArrayLike,
    norm: npt.ArrayLike,
    loss_factor: npt.ArrayLike,
    *,
    density: float,
    sound_speed: float,
) -> ComplexArray:
    """Y_n = Lambda_n (w_n^2 - w^2 + j eta w_n w) / (rho c^2 j w) of the cavity modes, shape (L, N).

    ``norm`` is Lambda_n [m^3], ``density`` rho [kg/m^3], ``sound_speed`` c [m/s]. This is
    :func:`modal_impedance` with the acoustic "mass" Lambda_n / (rho c^2) (Dowell, Gorman &
    Smith 1977; Fahy & Gardonio 2007, ch. 7). Y_n P_n is the modal volume velocity.
    """
    rho = float(_positive("density", density))
    c = float(_positive("sound_speed", sound_speed))
    lam = _positive("norm", norm)
    return modal_impedance(omega, natural_frequency, lam / (rho * c**2), loss_factor)


def _rhs(x: npt.ArrayLike | None, n_lines: int, size: int) -> ComplexArray:
    """Right-hand sides as (L, size, R); None -> zeros with R = 1."""
    if x is None:
        return np.zeros((n_lines, size, 1), dtype=np.complex128)
    a = np.asarray(x, dtype=np.complex128)
    if a.ndim == 1:
        a = a[:, None]
    if a.ndim == 2:
        a = np.broadcast_to(a, (n_lines, *a.shape))
    if a.ndim != 3 or a.shape[:2] != (n_lines, size):
        msg = f"right-hand side must have shape ({size},), ({size}, R) or ({n_lines}, {size}, R)"
        raise ValueError(msg)
    return a


def _apply(b: FloatArray, x: ComplexArray) -> ComplexArray:
    """b @ x[f] for every line f: real (S, G) times complex (F, G, R) -> (F, S, R).

    The complex array is read as real pairs (F, G, 2R), so every line is one real matrix
    product and nothing is transposed or copied; loads that are the same at every line (a
    broadcast first axis) are multiplied once.
    """
    nf, ng, nr = x.shape
    if nf > 1 and x.strides[0] == 0:
        once = _apply(b, x[:1])
        return np.broadcast_to(once, (nf, b.shape[0], nr))
    xc = np.ascontiguousarray(x, dtype=np.complex128)
    out = np.matmul(b, xc.view(np.float64))  # (F, S, 2R) real: (re, im) pairs
    return out.view(np.complex128)


def _reduced(diag: ComplexArray, inv_other: ComplexArray, b: FloatArray) -> ComplexArray:
    """diag(d) + B diag(1/o) B^T for a block of lines: (F, S) + (S, G) (F, G) (G, S)."""
    nf, ns = diag.shape
    bt = b.T if b.T.flags.c_contiguous else np.ascontiguousarray(b.T)
    g = _apply(b, inv_other[:, :, None] * bt[None, :, :])
    idx = np.arange(ns)
    g[:, idx, idx] += diag
    return g


def _nonzero_columns(x: ComplexArray) -> npt.NDArray[np.int64]:
    """Right-hand-side columns (last axis) of (L, S, R) loads that are not zero everywhere."""
    if x.size == 0:
        return np.zeros(0, dtype=np.int64)
    compact = x[:1] if x.strides[0] == 0 else x
    return np.flatnonzero(np.any(compact, axis=(0, 1))).astype(np.int64)


def _columns(idx: npt.NDArray[np.int64]) -> slice | npt.NDArray[np.int64]:
    """A slice for consecutive columns (a view, no copy), else the indices."""
    if idx.size and idx[-1] - idx[0] == idx.size - 1:
        return slice(int(idx[0]), int(idx[-1]) + 1)
    return idx


def _writable(x: ComplexArray) -> ComplexArray:
    """``x`` itself if it owns writable memory, else a copy (a broadcast product)."""
    return x if x.flags.writeable else np.array(x)


def _batched_solve(a: ComplexArray, b: ComplexArray) -> ComplexArray:
    """Batched LU solves, one BLAS thread: many small factorisations gain nothing from
    threads and lose much to thread contention on a busy machine (measured 50x slower with
    two threads under load; see docs/performance.md)."""
    with one_blas_thread():
        return np.asarray(np.linalg.solve(a, b), dtype=np.complex128)


def solve_coupled(
    z_struct: npt.ArrayLike,
    y_cavity: npt.ArrayLike,
    coupling: npt.ArrayLike,
    force: npt.ArrayLike | None = None,
    volume_velocity: npt.ArrayLike | None = None,
    *,
    keep: Literal["auto", "structure", "cavity", "groups"] = "auto",
) -> tuple[ComplexArray, ComplexArray]:
    """Solve the coupled modal equations at every frequency line.

    Parameters
    ----------
    z_struct : array_like of complex, shape (L, K)
        Structural modal impedances Z_k (:func:`modal_impedance`).
    y_cavity : array_like of complex, shape (L, N)
        Cavity terms Y_n (:func:`cavity_modal_admittance_term`).
    coupling : array_like, shape (N, K)
        Coupling integrals C_nk [m^2].
    force : array_like, optional
        Generalised forces F_k [N], shape (K,), (K, R) or (L, K, R).
    volume_velocity : array_like, optional
        Modal sources Q_n [m^3/s], shape (N,), (N, R) or (L, N, R).
    keep : {"auto", "structure", "cavity", "groups"}, optional
        Which set stays in the dense system (default: the smallest one; see Notes).

    Returns
    -------
    velocity : numpy.ndarray of complex, shape (L, K, R)
        Modal velocities V_k [m/s].
    pressure : numpy.ndarray of complex, shape (L, N, R)
        Modal pressures P_n [Pa].

    Notes
    -----
    Structure kept: (Z + C^T Y^-1 C) V = F - C^T Y^-1 Q, then P = Y^-1 (Q + C V).
    Cavity kept: (Y + C Z^-1 C^T) P = Q + C Z^-1 F, then V = Z^-1 (F - C^T P).
    Groups kept: cavity modes whose coupling rows are equal up to sign, c_n = s_n c_g (on a
    panel in one face the row depends only on the mode's two indices along the face, not
    on the third), form G groups, C = E C_G with E the signed N x G incidence. With
    W = E^T Y^-1 E (diagonal, W_g = sum of 1/Y_n over the group) and the group loads
    pi = E^T P: (I + W C_G Z^-1 C_G^T) pi = W C_G Z^-1 F + E^T Y^-1 Q, then
    V = Z^-1 (F - C_G^T pi) and P = Y^-1 (Q + E C_G V): a G x G system per line, chosen by
    "auto" when G is smaller than both K and N.
    All three are exact rearrangements of the equations in the module docstring (Dowell,
    Gorman & Smith 1977; Pan & Bies 1990); the tests compare them with each other and with
    the full system (:func:`solve_coupled_full`).
    """
    z = np.atleast_2d(np.asarray(z_struct, dtype=np.complex128))
    y = np.atleast_2d(np.asarray(y_cavity, dtype=np.complex128))
    c = np.asarray(coupling, dtype=np.float64)
    nl, nk = z.shape
    nn = y.shape[1]
    if y.shape[0] != nl or c.shape != (nn, nk):
        msg = f"shapes do not match: Z {z.shape}, Y {y.shape}, C {c.shape}"
        raise ValueError(msg)
    f = _rhs(force, nl, nk)
    q = _rhs(volume_velocity, nl, nn)
    nr = max(f.shape[2], q.shape[2])
    f = np.broadcast_to(f, (nl, nk, nr))
    q = np.broadcast_to(q, (nl, nn, nr))
    if keep not in ("auto", "structure", "cavity", "groups"):
        msg = f"keep must be 'auto', 'structure', 'cavity' or 'groups', got {keep!r}"
        raise ValueError(msg)
    groups = _coupling_groups(c) if keep in ("auto", "groups") else None
    if keep == "auto":
        assert groups is not None
        if groups[0].shape[0] < min(nk, nn):
            keep = "groups"
        else:
            keep = "structure" if nk <= nn else "cavity"
    if keep == "groups":
        assert groups is not None
        vel_g, prs_g = _solve_groups(z, y, groups, f, q)
        return vel_g, np.asarray(prs_g, dtype=np.complex128)
    vel = np.empty((nl, nk, nr), dtype=np.complex128)
    prs = np.empty((nl, nn, nr), dtype=np.complex128)
    ns, ng = (nk, nn) if keep == "structure" else (nn, nk)
    block = max(1, _BLOCK_ELEMENTS // max(1, ns * max(ns, ng)))
    # only the columns where a load is given take part in the elimination's load terms
    fcols, qcols = _nonzero_columns(f), _nonzero_columns(q)
    ct = np.ascontiguousarray(c.T)  # C-ordered, so the products below copy nothing
    with one_blas_thread():
        for s in range(0, nl, block):
            sl = slice(s, min(nl, s + block))
            zi, yi = z[sl], y[sl]
            if keep == "structure":
                yinv = 1.0 / yi
                g = _reduced(zi, yinv, ct)
                rhs = np.array(f[sl], dtype=np.complex128)
                if qcols.size:
                    rhs[:, :, qcols] -= _apply(ct, yinv[:, :, None] * q[sl][:, :, qcols])
                v = _batched_solve(g, rhs)
                p = _writable(_apply(c, v))
                if qcols.size:
                    p[:, :, qcols] += q[sl][:, :, qcols]
                p *= yinv[:, :, None]
            else:
                zinv = 1.0 / zi
                g = _reduced(yi, zinv, c)
                rhs = np.array(q[sl], dtype=np.complex128)
                if fcols.size:
                    rhs[:, :, fcols] += _apply(c, zinv[:, :, None] * f[sl][:, :, fcols])
                p = _batched_solve(g, rhs)
                v = _writable(_apply(ct, p))
                np.negative(v, out=v)
                if fcols.size:
                    v[:, :, fcols] += f[sl][:, :, fcols]
                v *= zinv[:, :, None]
            vel[sl] = v
            prs[sl] = p
    return vel, prs


def coupling_group_count(coupling: npt.ArrayLike) -> int:
    """Number of groups of cavity modes whose coupling rows are equal up to sign (Notes of
    :func:`solve_coupled`); the groups are eliminated together when fewer than both sets."""
    return int(_coupling_groups(np.asarray(coupling, dtype=np.float64))[0].shape[0])


def _coupling_groups(c: FloatArray) -> tuple[FloatArray, npt.NDArray[np.int64], FloatArray]:
    """Rows of C equal up to sign: (C_G (G, K), the group of each row (N,), its sign (N,)).

    Remembered for the last few matrices (the same C comes with every block of lines)."""
    key = (c.shape, c.tobytes())
    got = _GROUPS.get(key)
    if got is None:
        got = _GROUPS[key] = _find_groups(c)
        while len(_GROUPS) > 4:
            _GROUPS.pop(next(iter(_GROUPS)))
    return got


_GROUPS: dict[tuple[tuple[int, ...], bytes], tuple[FloatArray, npt.NDArray[np.int64], FloatArray]] = {}


def _find_groups(c: FloatArray) -> tuple[FloatArray, npt.NDArray[np.int64], FloatArray]:
    nz = c != 0
    first = np.argmax(nz, axis=1)
    sign = np.where(nz.any(axis=1), np.sign(c[np.arange(c.shape[0]), first]), 1.0)
    cg, at = np.unique(c * sign[:, None], axis=0, return_inverse=True)
    return np.ascontiguousarray(cg), np.asarray(at, dtype=np.int64).ravel(), sign


def _solve_groups(
    z: ComplexArray,
    y: ComplexArray,
    groups: tuple[FloatArray, npt.NDArray[np.int64], FloatArray],
    f: ComplexArray,
    q: ComplexArray,
    pressure_weight: FloatArray | None = None,
) -> tuple[ComplexArray, ComplexArray | FloatArray]:
    """The coupled equations with the coupling groups kept (Notes of :func:`solve_coupled`).

    Returns V and P, or with ``pressure_weight`` (N,) V and sum_n w_n |P_n|^2 per line and
    column (L, R): where no source acts, |P_n| = |E C_G V|_g / |Y_n|, summed per group.
    """
    cg, at, sign = groups
    ng, nk = cg.shape
    nl, nn = y.shape
    nr = f.shape[2]
    cgt = np.ascontiguousarray(cg.T)
    member = np.zeros((nn, ng))  # |E|: which group each cavity mode belongs to
    member[np.arange(nn), at] = 1.0
    signed_t = np.ascontiguousarray((member * sign[:, None]).T)  # E^T, (G, N)
    fi, qi = _nonzero_columns(f), _nonzero_columns(q)
    fcols, qcols = _columns(fi), _columns(qi)
    vel = np.empty((nl, nk, nr), dtype=np.complex128)
    squares = pressure_weight is not None
    prs: ComplexArray | FloatArray = (np.empty((nl, nr)) if squares
                                      else np.empty((nl, nn, nr), dtype=np.complex128))  # fmt: skip
    block = max(1, _BLOCK_ELEMENTS // max(1, nk * max(ng, nr) + nn * nr))
    eye = np.eye(ng)
    with one_blas_thread():
        for s in range(0, nl, block):
            sl = slice(s, min(nl, s + block))
            zinv, yinv = 1.0 / z[sl], 1.0 / y[sl]
            w = yinv.real @ member + 1j * (yinv.imag @ member)  # (F, G)
            a = _writable(_apply(cg, zinv[:, :, None] * cgt[None, :, :]))  # C_G Z^-1 C_G^T
            a *= w[:, :, None]
            a += eye
            rhs = np.zeros((sl.stop - sl.start, ng, nr), dtype=np.complex128)
            fs = f[sl][:, :, fcols] if fi.size else None
            if fs is not None:
                rhs[:, :, fcols] = w[:, :, None] * _apply(cg, zinv[:, :, None] * fs)
            if qi.size:
                rhs[:, :, qcols] += _apply(signed_t, yinv[:, :, None] * q[sl][:, :, qcols])
            pi = _batched_solve(a, rhs)
            v = _writable(_apply(cgt, pi))
            np.negative(v, out=v)
            if fs is not None:
                v[:, :, fcols] += fs
            v *= zinv[:, :, None]
            vel[sl] = v
            cv = _apply(cg, v)  # (F, G, R)
            if not squares:
                p = cv[:, at, :] * sign[None, :, None]
                if qi.size:
                    p[:, :, qcols] += q[sl][:, :, qcols]
                p *= yinv[:, :, None]
                prs[sl] = p
                continue
            assert pressure_weight is not None
            # columns without a source: sum over each group's modes of w_n |1/Y_n|^2
            wg = (pressure_weight * _abs2(yinv)) @ member  # (F, G)
            out = np.einsum("lg,lgr->lr", wg, _abs2(cv))
            if qi.size:  # columns with a source: P in full
                p = cv[:, at, :][:, :, qcols] * sign[None, :, None]
                p += q[sl][:, :, qcols]
                p *= yinv[:, :, None]
                out[:, qcols] = np.einsum("n,lnr->lr", pressure_weight, _abs2(p))
            prs[sl] = out
    return vel, prs


def _abs2(x: ComplexArray) -> FloatArray:
    """|x|^2 elementwise."""
    return np.asarray(x.real**2 + x.imag**2, dtype=np.float64)


def solve_coupled_squares(
    z_struct: npt.ArrayLike,
    y_cavity: npt.ArrayLike,
    coupling: npt.ArrayLike,
    force: npt.ArrayLike | None = None,
    volume_velocity: npt.ArrayLike | None = None,
    *,
    pressure_weight: npt.ArrayLike,
) -> tuple[ComplexArray, FloatArray]:
    """:func:`solve_coupled`, returning the modal velocities and, instead of the modal
    pressures, their weighted squares sum_n w_n |P_n|^2 [Pa^2] per line and right-hand side.

    ``pressure_weight`` (N,) is w_n (e.g. Lambda_n / V for the space-averaged mean-square
    pressure). With the coupling groups kept (Notes of :func:`solve_coupled`) the sum takes
    O(G) per line and column instead of O(N); otherwise the pressures are formed in full.
    Returns velocity (L, K, R) [m/s] and the sums (L, R).
    """
    wn = np.asarray(pressure_weight, dtype=np.float64)
    z = np.atleast_2d(np.asarray(z_struct, dtype=np.complex128))
    y = np.atleast_2d(np.asarray(y_cavity, dtype=np.complex128))
    c = np.asarray(coupling, dtype=np.float64)
    nl, nk = z.shape
    nn = y.shape[1]
    if wn.shape != (nn,) or y.shape[0] != nl or c.shape != (nn, nk):
        msg = f"shapes do not match: Z {z.shape}, Y {y.shape}, C {c.shape}, weight {wn.shape}"
        raise ValueError(msg)
    groups = _coupling_groups(c)
    if groups[0].shape[0] < min(nk, nn):
        f = _rhs(force, nl, nk)
        q = _rhs(volume_velocity, nl, nn)
        nr = max(f.shape[2], q.shape[2])
        vel, p2 = _solve_groups(z, y, groups, np.broadcast_to(f, (nl, nk, nr)),
                                np.broadcast_to(q, (nl, nn, nr)), wn)  # fmt: skip
        return vel, np.asarray(p2, dtype=np.float64)
    vel, prs = solve_coupled(z, y, c, force, volume_velocity)
    return vel, np.einsum("n,lnr->lr", wn, _abs2(prs))


def solve_coupled_full(
    z_struct: npt.ArrayLike,
    y_cavity: npt.ArrayLike,
    coupling: npt.ArrayLike,
    force: npt.ArrayLike | None = None,
    volume_velocity: npt.ArrayLike | None = None,
) -> tuple[ComplexArray, ComplexArray]:
    """The same equations as :func:`solve_coupled`, solved as one (K + N) system per line.

    The plain alternative (no elimination): a reference for the tests and the benchmark.
    Shapes as in :func:`solve_coupled`.
    """
    z = np.atleast_2d(np.asarray(z_struct, dtype=np.complex128))
    y = np.atleast_2d(np.asarray(y_cavity, dtype=np.complex128))
    c = np.asarray(coupling, dtype=np.float64)
    nl, nk = z.shape
    nn = y.shape[1]
    f = _rhs(force, nl, nk)
    q = _rhs(volume_velocity, nl, nn)
    nr = max(f.shape[2], q.shape[2])
    rhs = np.concatenate(
        [np.broadcast_to(f, (nl, nk, nr)), np.broadcast_to(q, (nl, nn, nr))], axis=1
    )
    a = np.zeros((nl, nk + nn, nk + nn), dtype=np.complex128)
    ik, i_n = np.arange(nk), np.arange(nn) + nk
    a[:, ik, ik] = z
    a[:, i_n, i_n] = y
    a[:, :nk, nk:] = c.T
    a[:, nk:, :nk] = -c
    x = _batched_solve(a, rhs)
    return x[:, :nk], x[:, nk:]


def band_lines(
    lower: npt.ArrayLike,
    upper: npt.ArrayLike,
    min_loss_factor: float,
    *,
    lines_per_bandwidth: float = 4.0,
    min_lines: int = 8,
    max_lines: int = 2000,
) -> tuple[FloatArray, FloatArray, npt.NDArray[np.int64]]:
    """Frequency lines that sample each band finely enough to resolve its modal peaks.

    Parameters
    ----------
    lower, upper : array_like, shape (B,)
        Band edges [Hz].
    min_loss_factor : float
        Smallest modal loss factor eta of the modes that respond in the bands [-].
    lines_per_bandwidth : float, optional
        Lines per half-power bandwidth eta f_lower of the narrowest peak in the band
        (default 4).
    min_lines, max_lines : int, optional
        Bounds on the lines per band.

    Returns
    -------
    f : numpy.ndarray, shape (L,)
        Line frequencies [Hz]: midpoints of equal sub-intervals of each band.
    weight : numpy.ndarray, shape (L,)
        Weights that make a weighted sum over a band's lines its mean over the band.
    band : numpy.ndarray of int, shape (L,)
        Band position of each line.

    Notes
    -----
    The band mean of a modal response, (1/Delta f) times its integral over the band, is what a
    band-limited white-noise excitation of the same band power produces. The midpoint rule
    resolves a resonance of half-power bandwidth eta f when several lines fall inside it
    (common practice: at least 3-4).
    """
    lo = _positive("lower", lower)
    hi = _positive("upper", upper)
    eta = float(_positive("min_loss_factor", min_loss_factor))
    if lo.shape != hi.shape or lo.ndim != 1 or np.any(hi <= lo):
        msg = "lower and upper must be 1-D arrays with upper > lower"
        raise ValueError(msg)
    spacing = eta * lo / lines_per_bandwidth
    count = np.clip(np.ceil((hi - lo) / spacing), min_lines, max_lines).astype(np.int64)
    parts_f, parts_w, parts_b = [], [], []
    for i, (a, b, n) in enumerate(zip(lo, hi, count, strict=True)):
        parts_f.append(a + (np.arange(n) + 0.5) * (b - a) / n)
        parts_w.append(np.full(n, 1.0 / n))
        parts_b.append(np.full(n, i, dtype=np.int64))
    return np.concatenate(parts_f), np.concatenate(parts_w), np.concatenate(parts_b)


def line_average(
    values: npt.ArrayLike, weight: npt.ArrayLike, band: npt.ArrayLike, n_bands: int
) -> FloatArray:
    """Weighted band means of per-line values (first axis = lines) -> shape (B, ...)."""
    v = np.asarray(values, dtype=np.float64)
    w = np.asarray(weight, dtype=np.float64)
    b = np.asarray(band, dtype=np.int64)
    out = np.zeros((n_bands, *v.shape[1:]), dtype=np.float64)
    np.add.at(out, b, v * w.reshape((-1,) + (1,) * (v.ndim - 1)))
    return out
