"""Linear solves of the symmetric power balance of every band at once.

For the free subsystems of a model the power balance of band j is, with modal energies
``x = E / n``, ``C_j x = b`` where ``C_j = L_UU diag(n_U)`` is symmetric (reciprocity)
and a nonsingular M-matrix: positive diagonal, non-positive off-diagonal entries,
``C_j 1 >= 0`` (the damping of each subsystem times its modal density). All bands share
one sparsity pattern. This module solves such systems for several right-hand sides,
every band in one batched operation where it can, and *verifies* every answer.

Methods
-------
``lu``
    Sparse LU of each band with a symmetric ordering (SuperLU, ``MMD_AT_PLUS_A``,
    symmetric mode, diagonal pivots) followed by one step of iterative refinement when
    the check below asks for it.
``iterative``
    Conjugate gradients on the Jacobi-scaled systems ``I + N_j`` (Hestenes & Stiefel
    1952; Saad 2003, alg. 9.1 with a diagonal preconditioner). Bands are solved in groups
    whose matrices and work vectors fit in :data:`GROUP_BYTES` (a core's cache): a group
    is one block-diagonal sparse product per iteration with one step length per band,
    a group of one band uses level-1 BLAS updates in place. The check below is tried
    once the residual norm is small enough to pass it. The conjugate gradients are
    followed by Jacobi sweeps ``x <- x + D^-1 (b - C x)`` where the check still fails. For an M-matrix with ``b >= 0``
    a sweep computes every energy from its neighbours' energies as a sum of non-negative
    terms, so the relative accuracy of the large energies reaches the small ones, one
    connection per sweep (Varga 1962, Matrix Iterative Analysis, thm. 3.13: the Jacobi
    splitting of an M-matrix is a regular splitting). A Krylov method alone cannot give
    the tiny energies far from every source to a relative accuracy: after k iterations
    they are still zero. Bands that fail the check are solved by ``lu``.

The check (each subsystem's power balance)
------------------------------------------
With the residual ``r = b - C x``, the computed ``x`` is the exact solution of the
balance in which the total loss factor of subsystem i is changed by the relative amount
``rho_i = |r_i| / (C_ii x_i)``: the per-subsystem balance residual relative to the power
passing through the subsystem. It is computed without cancellation (all terms of a row
are at most ``C_ii x_i``). For such a diagonal perturbation the error ``e`` obeys
``d^T |e| <= max(rho) sum_i C_ii x_i`` with ``d = C 1`` (the dissipation weights), so the
dissipation-weighted mean relative error is at most ``max(rho) * G`` with the gain
``G = sum C_ii x_i / sum d_i x_i >= 1`` (throughput over dissipation). This bounds a
mean, not every entry, so a column passes when ``max(rho) <= tol / (10 G)`` (a margin of
10); the tests compare the result entry by entry with dense solves, including
ill-conditioned systems and energies spanning hundreds of decibels.

Where every entry of ``b`` is positive (e.g. the vector ``C^-1 n`` of the condition
number) a rigorous entry-by-entry bound also passes a column: ``|r| <= tol b`` gives
``|x - x*| = |C^-1 r| <= C^-1 |r| <= tol x*``, since ``C^-1 >= 0``.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from typing import Any

import numpy as np
import numpy.typing as npt
import scipy.sparse as sp
import scipy.sparse.linalg as spla
from scipy.linalg.blas import daxpy as _daxpy
from scipy.linalg.blas import ddot as _ddot

__all__ = ["BandMatrices", "SingularBandError", "add_rows", "spd_solve"]

Array = npt.NDArray[np.float64]
IntArray = npt.NDArray[np.int64]

#: Conjugate-gradient stopping test on the scaled residual (2-norm, per band and column).
CG_RTOL = 1e-16
#: Largest number of conjugate-gradient iterations before the sweeps take over.
CG_MAXITER = 2000
#: Largest number of Jacobi sweeps after the conjugate gradients.
MAX_SWEEPS = 400
_SWEEPS_PER_CHECK = 4
#: The iterative method solves bands in groups whose matrices and work vectors take about
#: this many bytes, so that a group stays in a core's cache across the iterations (a block
#: of every band of a large model would stream from main memory at each product).
GROUP_BYTES = 1 << 20
#: Safety factor between the gauge ``max(rho) * G`` and the accuracy asked.
_MARGIN = 10.0


def add_rows(out: Array, index: IntArray, values: Array) -> None:
    """``out[index[k]] += values[k]`` with repeated indices summed (as ``np.add.at``, faster)."""
    if index.size == 0:
        return
    inc = sp.csr_matrix(
        (np.ones(index.size), (index, np.arange(index.size))), shape=(out.shape[0], index.size)
    )
    out += inc @ values


class SingularBandError(ValueError):
    """Sparse LU found band ``band`` singular to working precision."""

    def __init__(self, band: int) -> None:
        super().__init__(f"band {band} is singular to working precision")
        self.band = band


@dataclass(frozen=True)
class BandMatrices:
    """The matrices C_j of all bands on one symmetric sparsity pattern (CSC arrays).

    Attributes
    ----------
    indptr, indices : ndarray of int
        CSC structure of the pattern (nf x nf), shared by every band.
    values : ndarray (nnz, B)
        Entries of every band, in the order of ``indices``.
    """

    indptr: IntArray
    indices: IntArray
    values: Array

    @property
    def nf(self) -> int:
        return int(self.indptr.size - 1)

    @property
    def nb(self) -> int:
        return int(self.values.shape[1])

    @classmethod
    def from_entries(
        cls,
        nf: int,
        rows: IntArray,
        cols: IntArray,
        vals: Array,
        source: IntArray | None = None,
    ) -> BandMatrices:
        """Sum entries at ``(rows, cols)`` (duplicates add) into the pattern.

        The values of entry k are ``vals[k]`` (``vals`` (K, B)), or ``vals[source[k]]`` if
        ``source`` is given (entries sharing a row of ``vals``, e.g. both triangles).
        """
        order = np.lexsort((rows, cols))
        rs, cs = rows[order], cols[order]
        start = np.ones(rs.size, dtype=bool)
        start[1:] = (rs[1:] != rs[:-1]) | (cs[1:] != cs[:-1])
        first = np.flatnonzero(start)
        take = order if source is None else source[order]
        if first.size == order.size:
            values = vals[take]  # no repeated entry (no parallel connections)
        else:
            values = np.add.reduceat(vals[take], first, axis=0) if first.size else vals[:0]
        indptr = np.zeros(nf + 1, dtype=np.int64)
        np.cumsum(np.bincount(cs[first], minlength=nf), out=indptr[1:])
        return cls(indptr=indptr, indices=rs[first].astype(np.int64), values=values)

    def band(self, j: int) -> sp.csc_matrix:
        """C_j as a sparse matrix."""
        n = self.nf
        return sp.csc_matrix(
            (np.ascontiguousarray(self.values[:, j]), self.indices, self.indptr), shape=(n, n)
        )

    @cached_property
    def _col(self) -> IntArray:
        return np.repeat(np.arange(self.nf, dtype=np.int64), np.diff(self.indptr))

    @cached_property
    def _on(self) -> npt.NDArray[np.bool_]:
        return np.asarray(self.indices == self._col)

    def column_of_entry(self) -> IntArray:
        """Column of every stored entry (nnz,)."""
        return self._col

    def diagonal(self) -> Array:
        """Diagonal entries (nf, B)."""
        return self._diagonal.copy()

    @cached_property
    def _diagonal(self) -> Array:
        d = np.zeros((self.nf, self.nb))
        d[self._col[self._on]] = self.values[self._on]
        return d

    def m_matrix_signs(self) -> bool:
        """Positive diagonal and non-positive off-diagonal entries in every band."""
        on = self._on
        return bool(np.all(self._diagonal > 0) and on.sum() == self.nf
                    and np.all(self.values[~on] <= 0))


class _Scaled:
    """The Jacobi-scaled matrices ``S C_j S = I + N_j`` (``S = diag(C_j)^-1/2``) of every
    band: the off-diagonal parts ``N_j`` band by band contiguous, and the weights of the
    balance check in scaled variables.

    With ``x = s y``: the throughput of subsystem i is ``C_ii x_i = y_i / s_i`` and its
    dissipation ``d_i x_i = d_i s_i y_i`` (``d = C 1``).
    """

    def __init__(self, mats: BandMatrices, diag: Array) -> None:
        off = ~mats._on
        col = mats.column_of_entry()[off]
        rows = mats.indices[off]
        self.nf, self.nnz = mats.nf, int(rows.size)
        self.scale = 1.0 / np.sqrt(diag)  # (nf, B)
        s = self.scale
        self.data = np.ascontiguousarray((mats.values[off] * s[rows] * s[col]).T)  # (B, nnz)
        d = np.zeros((mats.nf, mats.nb))
        add_rows(d, mats.indices, mats.values)
        self.thr_w = np.ascontiguousarray((1.0 / s).T)  # (B, nf)
        self.dis_w = np.ascontiguousarray((np.maximum(d, 0.0) * s).T)
        self.indices = rows
        self.indptr = np.zeros(mats.nf + 1, dtype=np.int64)
        np.cumsum(np.bincount(col, minlength=mats.nf), out=self.indptr[1:])
        self._pattern: dict[int, tuple[npt.NDArray[np.signedinteger[Any]], ...]] = {}

    def block(self, start: int, stop: int) -> sp.csr_matrix:
        """Block-diagonal matrix of ``N_j``, bands ``start:stop`` (band-major unknowns).

        Built as CSR from the CSC arrays, i.e. the transpose: the same matrix up to
        rounding (C is symmetric by reciprocity), and a row-wise product is the faster one.
        """
        k, nf, nnz = stop - start, self.nf, self.nnz
        if k not in self._pattern:
            offs = np.arange(k, dtype=np.int64)
            idx = (self.indices[None, :] + nf * offs[:, None]).ravel()
            ptr = np.empty(k * nf + 1, dtype=np.int64)
            ptr[:-1] = (self.indptr[None, :-1] + nnz * offs[:, None]).ravel()
            ptr[-1] = k * nnz
            index = np.int32 if k * max(nf, nnz) < 2**31 else np.int64
            self._pattern[k] = (idx.astype(index), ptr.astype(index))
        indices, indptr = self._pattern[k]
        data = self.data[start:stop].ravel()
        return sp.csr_matrix((data, indices, indptr), shape=(k * nf, k * nf), copy=False)


def _apply(off: sp.csr_matrix, v: Array) -> Array:
    """``(I + N) v`` for the scaled matrix with off-diagonal part ``off`` (flat vectors)."""
    out = off @ v
    out += v
    return np.asarray(out)


class _Check:
    """The balance check of the scaled systems ``op y = b`` of one group of bands (k, nf).

    A system passes when ``max(rho) <= t / (10 G)`` (module notes) or, where ``b > 0`` in
    every entry, when ``|r| <= t b``: then ``|y - y*| = |C^-1 r| <= C^-1 |r| <= t y*``
    entry by entry, since ``C^-1 >= 0`` (M-matrix).
    """

    def __init__(self, b: Array, thr_w: Array, dis_w: Array, t: float) -> None:
        self.thr_w, self.dis_w, self.t = thr_w, dis_w, t
        self.positive = np.all(b > 0, axis=1)  # (k,)
        self.tb = np.where(self.positive[:, None], t * b, -1.0)
        # Necessary for passing: ||r||^2 <= (t / 10)^2 ||y||^2, or <= t^2 ||b||^2 if b > 0.
        self.rr_y = (t / _MARGIN) ** 2
        self.rr_b = np.where(self.positive, t * t * np.einsum("ij,ij->i", b, b), -1.0)

    def __call__(self, y: Array, res: Array) -> npt.NDArray[np.bool_]:
        tau = self.t / (_MARGIN * _gain(y, self.thr_w, self.dis_w))
        ok = _within(res, tau[:, None] * y)
        if self.positive.any():
            ok |= _within(res, self.tb)
        return ok


def _cg(op: sp.csr_matrix, rhs: Array, x0: Array, rtol: float, maxiter: int, check: _Check) -> Array:
    """Conjugate gradients on block-diagonal ``op`` for all systems at once.

    ``rhs`` is (k, nf): one independent system per row (block of ``op``); each has its
    own step lengths and stops on ``||r|| <= rtol ||b||`` or as soon as ``check`` (the
    balance check on the recurred residual, tried once the residual is small enough to
    pass it) passes. ``x0`` is the initial guess.
    """
    k, nf = rhs.shape
    if k == 1:
        return _cg_one(op, rhs[0], x0[0], rtol, maxiter, check)[None, :]
    x = x0.copy()
    r = rhs - _apply(op, x.ravel()).reshape(k, nf)
    p = r.copy()
    rr = np.einsum("ij,ij->i", r, r)
    stop = (rtol * rtol) * np.einsum("ij,ij->i", rhs, rhs)
    active = rr > stop
    for _ in range(maxiter):
        if not active.any():
            break
        q = _apply(op, p.ravel()).reshape(k, nf)
        pq = np.einsum("ij,ij->i", p, q)
        ok = active & (pq > 0)
        alpha = np.divide(rr, pq, out=np.zeros(k), where=ok)
        x += alpha[:, None] * p
        r -= alpha[:, None] * q
        rr_new = np.einsum("ij,ij->i", r, r)
        active = ok & (rr_new > stop)
        near = (rr_new <= check.rr_y * np.einsum("ij,ij->i", x, x)) | (rr_new <= check.rr_b)
        if np.any(active & near):
            active &= ~check(x, r)
        beta = np.divide(rr_new, rr, out=np.zeros(k), where=active)
        p *= beta[:, None]
        p += r
        rr = rr_new
    return x


def _cg_one(op: sp.csr_matrix, b: Array, x0: Array, rtol: float, maxiter: int, check: _Check) -> Array:
    """:func:`_cg` for one system (1-D vectors, level-1 BLAS updates in place)."""
    x = np.array(x0, dtype=np.float64)
    r = b - _apply(op, x)
    p = r.copy()
    rr = float(_ddot(r, r))
    stop = rtol * rtol * float(_ddot(b, b))
    rr_b = float(check.rr_b[0])
    for _ in range(maxiter):
        if rr <= stop:
            break
        q = _apply(op, p)
        pq = float(_ddot(p, q))
        if not pq > 0:
            break
        alpha = rr / pq
        _daxpy(p, x, a=alpha)
        _daxpy(q, r, a=-alpha)
        rr_new = float(_ddot(r, r))
        if (rr_new <= rr_b or rr_new <= check.rr_y * float(_ddot(x, x))) and check(
            x[None, :], r[None, :]
        )[0]:
            break
        p *= rr_new / rr
        p += r
        rr = rr_new
    return x


def _rho(y: Array, r: Array) -> Array:
    """Largest relative balance residual |r_i| / y_i per system (scaled variables)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        q = np.abs(r) / y
    q = np.where(y > 0, q, np.where(r == 0, 0.0, np.inf))
    return np.asarray(q.max(axis=1), dtype=float)


def _gain(y: Array, thr_w: Array, dis_w: Array) -> Array:
    """Throughput over dissipation per system, ``sum thr_w y / sum dis_w y``, at least 1."""
    thr = np.einsum("ij,ij->i", thr_w, y)
    dis = np.einsum("ij,ij->i", dis_w, y)
    g = np.divide(thr, dis, out=np.ones_like(thr), where=dis > 0)
    return np.asarray(np.maximum(g, 1.0), dtype=float)


def _within(res: Array, bound: Array) -> npt.NDArray[np.bool_]:
    """``|res_i| <= bound_i`` for every i, per system (row)."""
    return np.asarray(np.all(np.abs(res) <= bound, axis=1))


def _groups(nf: int, nnz: int, nb: int, group_bytes: int) -> list[tuple[int, int]]:
    """Bands solved together: as many as fit in ``group_bytes`` (at least one)."""
    per_band = 12 * nnz + 8 * 8 * nf  # entries and their index, about eight work vectors
    k = max(1, min(nb, group_bytes // max(per_band, 1)))
    return [(s, min(nb, s + k)) for s in range(0, nb, k)]


def _iterative(
    mats: BandMatrices, rhs: Array, tol: Array, diag: Array, group_bytes: int
) -> tuple[Array, npt.NDArray[np.bool_]]:
    """CG + Jacobi sweeps for all bands; returns x (nf, B, k) and which bands passed (B,)."""
    nf, nb, ncol = rhs.shape
    sc = _Scaled(mats, diag)
    # Band-major, scaled: b[c, j] is the right-hand side of column c, band j (y = x / s).
    b_all = rhs.transpose(2, 1, 0) * sc.scale.T
    y_all = np.empty_like(b_all)
    passed = np.ones(nb, dtype=bool)
    for start, stop in _groups(nf, sc.nnz, nb, group_bytes):
        op = sc.block(start, stop)
        for c in range(ncol):
            y, good = _solve_group(
                op, b_all[c, start:stop], sc.thr_w[start:stop], sc.dis_w[start:stop], tol[c]
            )
            passed[start:stop] &= good
            y_all[c, start:stop] = y
    y_all *= sc.scale.T
    return y_all.transpose(2, 1, 0), passed  # a view (nf, B, k)


def _solve_group(
    op: sp.csr_matrix, b: Array, thr_w: Array, dis_w: Array, t: float
) -> tuple[Array, npt.NDArray[np.bool_]]:
    """CG then Jacobi sweeps on the scaled systems ``op y = b`` of one group of bands."""
    k, nf = b.shape
    check = _Check(b, thr_w, dis_w, float(t))
    y0 = np.zeros_like(b)
    easy = check.positive & np.all(dis_w > 0, axis=1)
    # y = b / (C 1) in scaled form: exact when every subsystem has the same damping.
    y0[easy] = b[easy] * thr_w[easy] / dis_w[easy]
    y = _cg(op, b, y0, CG_RTOL, CG_MAXITER, check)
    np.maximum(y, 0.0, out=y)
    res = b - _apply(op, y.ravel()).reshape(k, nf)
    good = check(y, res)
    live = ~good
    rho = _rho(y, res)
    sweeps = 0
    while sweeps < MAX_SWEEPS and live.any():
        before = rho
        for _ in range(_SWEEPS_PER_CHECK):
            y += res * live[:, None]
            res = b - _apply(op, y.ravel()).reshape(k, nf)
        sweeps += _SWEEPS_PER_CHECK
        rho = _rho(y, res)
        good = check(y, res)
        # Unreached energies (rho infinite) fill in one connection per sweep; a band
        # whose finite residual stops falling is left to the direct method.
        live &= ~good & ~(np.isfinite(before) & (rho > 0.7 * before))
    return y, good


def _lu(mats: BandMatrices, rhs: Array, tol: Array, j: int) -> Array:
    """Sparse LU of band j (symmetric ordering), refined once if a column fails the check."""
    cmat = mats.band(j)
    try:
        lu = spla.splu(
            cmat,
            permc_spec="MMD_AT_PLUS_A",
            diag_pivot_thresh=0.0,
            options={"SymmetricMode": True},
        )
    except RuntimeError:  # exactly singular pivot
        raise SingularBandError(j) from None
    b = rhs[:, j, :]
    x = lu.solve(b)
    if not np.all(np.isfinite(x)):
        raise SingularBandError(j)
    r = b - cmat @ x
    d = cmat.diagonal()[:, None]
    with np.errstate(divide="ignore", invalid="ignore"):
        rho = np.where(x > 0, np.abs(r) / (d * x), np.where(r == 0, 0.0, np.inf)).max(axis=0)
    if np.any(rho > tol):
        x = x + lu.solve(r)
    return np.asarray(x, dtype=float)


def spd_solve(
    mats: BandMatrices,
    rhs: Array,
    tol: npt.ArrayLike = 1e-9,
    *,
    iterative_above: int,
    group_bytes: int | None = None,
) -> tuple[Array, str]:
    """Solve ``C_j x = rhs[:, j, c]`` for every band j and column c.

    Parameters
    ----------
    mats : BandMatrices
        The symmetric M-matrices of all bands.
    rhs : ndarray (nf, B, k)
        Right-hand sides.
    tol : float or array (k,)
        Target relative accuracy of each column (see the module notes for the check).
    iterative_above : int
        Try the iterative method above this many unknowns.
    group_bytes : int, optional
        Size of the groups of bands the iterative method solves together (default
        :data:`GROUP_BYTES`; many small systems, e.g. Monte Carlo samples, gain from more).

    Returns
    -------
    x : ndarray (nf, B, k)
    method : str
        ``'lu'``, ``'iterative'`` or ``'iterative+lu (bands ...)'`` (bands that needed LU).

    Raises
    ------
    SingularBandError
        If LU meets an exactly singular band.
    """
    nf, nb, ncol = rhs.shape
    tol_c = np.broadcast_to(np.asarray(tol, dtype=float), (ncol,))
    x = np.zeros_like(rhs)
    todo = np.arange(nb)
    method = "lu"
    if nf > iterative_above and np.all(rhs >= 0) and mats.m_matrix_signs():
        gb = GROUP_BYTES if group_bytes is None else group_bytes
        x, passed = _iterative(mats, rhs, tol_c, mats.diagonal(), gb)
        todo = np.flatnonzero(~passed)
        method = "iterative"
        if todo.size:
            method += f"+lu ({todo.size} of {nb} bands)"
    for j in todo:
        x[:, j, :] = _lu(mats, rhs, tol_c, int(j))
    return x, method
