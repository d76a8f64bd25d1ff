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
    Conjugate gradients on the Jacobi-scaled systems of all bands at once (one
    block-diagonal sparse product per iteration, one step length per band and column;
    Hestenes & Stiefel 1952; Saad 2003, alg. 9.1 with a diagonal preconditioner),
    followed by Jacobi sweeps ``x <- x + D^-1 (b - C x)``. For an M-matrix with ``b >= 0``
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
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt
import scipy.sparse as sp
import scipy.sparse.linalg as spla

__all__ = ["BandMatrices", "SingularBandError", "add_rows", "spd_solve"]

Array = npt.NDArray[np.float64]
IntArray = npt.NDArray[np.int64]

#: Conjugate-gradient stopping test on the scaled residual (2-norm, per band and column).
CG_RTOL = 1e-14
#: Largest number of conjugate-gradient iterations before the sweeps take over.
CG_MAXITER = 2000
#: Largest number of Jacobi sweeps after the conjugate gradients.
MAX_SWEEPS = 400
_CHECK_EVERY = 4
#: Safety factor between the gauge ``max(rho) * G`` and the accuracy asked.
_MARGIN = 10.0
_Check = Callable[[Array, Array], npt.NDArray[np.bool_]]


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
        cls, nf: int, rows: IntArray, cols: IntArray, vals: Array
    ) -> BandMatrices:
        """Sum entries ``vals`` (K, B) at ``(rows, cols)`` (duplicates add) into the pattern."""
        order = np.lexsort((rows, cols))
        rs, cs = rows[order], cols[order]
        start = np.ones(rs.size, dtype=bool)
        start[1:] = (rs[1:] != rs[:-1]) | (cs[1:] != cs[:-1])
        first = np.flatnonzero(start)
        values = np.add.reduceat(vals[order], first, axis=0) if first.size else vals[:0]
        indptr = np.zeros(nf + 1, dtype=np.int64)
        np.cumsum(np.bincount(cs[first], minlength=nf), out=indptr[1:])
        return cls(indptr=indptr, indices=rs[first].astype(np.int64), values=values)

    def band(self, j: int) -> sp.csc_matrix:
        """C_j as a sparse matrix."""
        n = self.nf
        return sp.csc_matrix(
            (np.ascontiguousarray(self.values[:, j]), self.indices, self.indptr), shape=(n, n)
        )

    def column_of_entry(self) -> IntArray:
        return np.repeat(np.arange(self.nf), np.diff(self.indptr))

    def diagonal(self) -> Array:
        """Diagonal entries (nf, B)."""
        col = self.column_of_entry()
        on = self.indices == col
        d = np.zeros((self.nf, self.nb))
        d[col[on]] = self.values[on]
        return d

    def m_matrix_signs(self) -> bool:
        """Positive diagonal and non-positive off-diagonal entries in every band."""
        col = self.column_of_entry()
        on = self.indices == col
        return bool(np.all(self.values[on] > 0) and np.all(self.values[~on] <= 0))

    def one_norm(self) -> Array:
        """||C_j||_1 of every band (B,)."""
        out = np.zeros((self.nf, self.nb))
        add_rows(out, self.column_of_entry(), np.abs(self.values))
        return np.asarray(out.max(axis=0), dtype=float)


def _block(mats: BandMatrices, bands: IntArray, scale: Array) -> sp.csr_matrix:
    """Block-diagonal matrix of the Jacobi-scaled bands ``bands`` (band-major unknowns).

    Built as CSR from the CSC arrays, i.e. the transpose: the same matrix up to rounding
    (C is symmetric by reciprocity), and a row-wise product is the faster one.
    """
    nf, nnz, k = mats.nf, int(mats.indptr[-1]), bands.size
    col = mats.column_of_entry()
    s = scale[:, bands]  # (nf, k)
    data = (mats.values[:, bands] * s[mats.indices] * s[col]).T.ravel()
    offs = np.arange(k, dtype=np.int64)
    indices = (mats.indices[None, :] + nf * offs[:, None]).ravel()
    indptr = np.empty(k * nf + 1, dtype=np.int64)
    indptr[:-1] = (mats.indptr[None, :-1] + nnz * offs[:, None]).ravel()
    indptr[-1] = k * nnz
    return sp.csr_matrix((data, indices, indptr), shape=(k * nf, k * nf))


def _cg(
    op: sp.csr_matrix, rhs: Array, x0: Array, rtol: float, maxiter: int, accurate: _Check
) -> Array:
    """Conjugate gradients on block-diagonal ``op`` for all systems at once.

    ``rhs`` is (k, nf): one independent system per row (block of ``op``); each has its
    own step lengths and stops on ``||r|| <= rtol ||b||`` or as soon as ``accurate``
    (the balance check on the recurred residual, every few iterations) passes. ``x0`` is
    the initial guess.
    """
    k, nf = rhs.shape
    x = x0.copy()
    r = rhs - (op @ x.ravel()).reshape(k, nf)
    p = r.copy()
    rr = np.einsum("ij,ij->i", r, r)
    stop = (rtol * rtol) * np.einsum("ij,ij->i", rhs, rhs)
    active = rr > stop
    for it in range(1, maxiter + 1):
        if not active.any():
            break
        q = (op @ p.ravel()).reshape(k, nf)
        pq = np.einsum("ij,ij->i", p, q)
        ok = active & (pq > 0)
        alpha = np.divide(rr, pq, out=np.zeros(k), where=ok)
        x += alpha[:, None] * p
        r -= alpha[:, None] * q
        rr_new = np.einsum("ij,ij->i", r, r)
        active = ok & (rr_new > stop)
        if it % _CHECK_EVERY == 0:
            active &= ~accurate(x, r)
        beta = np.divide(rr_new, rr, out=np.zeros(k), where=active)
        p *= beta[:, None]
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


def _iterative(
    mats: BandMatrices, rhs: Array, tol: Array, diag: Array
) -> tuple[Array, npt.NDArray[np.bool_]]:
    """CG + Jacobi sweeps for all bands; returns x (nf, B, k) and which bands passed (B,)."""
    nf, nb, ncol = rhs.shape
    scale = 1.0 / np.sqrt(diag)  # (nf, B)
    op = _block(mats, np.arange(nb, dtype=np.int64), scale)
    # With x = s y: throughput C_ii x_i = y_i / s_i, dissipation d_i x_i = d_i s_i y_i.
    d = np.zeros((nf, nb))
    add_rows(d, mats.indices, mats.values)
    thr_w = (1.0 / scale).T  # (B, nf)
    dis_w = (np.maximum(d, 0.0) * scale).T
    x = np.empty_like(rhs)
    passed = np.ones(nb, dtype=bool)
    for c in range(ncol):
        t = float(tol[c])

        def accurate(y: Array, res: Array, t: float = t) -> npt.NDArray[np.bool_]:
            return _rho(y, res) <= t / (_MARGIN * _gain(y, thr_w, dis_w))

        b = (rhs[:, :, c] * scale).T.copy()  # (B, nf)
        y0 = np.zeros_like(b)
        if np.all(b > 0) and np.all(dis_w > 0):
            # x = b / (C 1): exact when every subsystem has the same damping loss factor.
            y0 = b * thr_w / dis_w
        y = _cg(op, b, y0, CG_RTOL, CG_MAXITER, accurate)
        np.maximum(y, 0.0, out=y)
        res = b - (op @ y.ravel()).reshape(nb, nf)
        good = accurate(y, res)
        live = ~good
        rho = _rho(y, res)
        sweeps = 0
        while sweeps < MAX_SWEEPS and live.any():
            before = rho
            for _ in range(_CHECK_EVERY):
                y += res * live[:, None]
                res = b - (op @ y.ravel()).reshape(nb, nf)
            sweeps += _CHECK_EVERY
            rho = _rho(y, res)
            good = accurate(y, res)
            # Unreached energies (rho infinite) fill in one connection per sweep; a band
            # whose finite residual stops falling is left to the direct method.
            live &= ~good & ~(np.isfinite(before) & (rho > 0.7 * before))
        passed &= good
        x[:, :, c] = (y * scale.T).T
    return x, passed


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
        x, passed = _iterative(mats, rhs, tol_c, mats.diagonal())
        todo = np.flatnonzero(~passed)
        method = "iterative"
        if todo.size:
            method += f"+lu ({todo.size} of {nb} bands)"
    for j in todo:
        x[:, j, :] = _lu(mats, rhs, tol_c, int(j))
    return x, method
