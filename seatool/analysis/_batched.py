"""Batched solves of the power balance of many Monte Carlo samples (the direct route of
:mod:`seatool.analysis.uncertainty`).

The sampled arrays (damping, modal densities, stated coupling loss factors, input powers;
(S, ., B) for S samples) share one model structure, so every band's samples are solved
together: stacked dense solves (:func:`batched_dense`, small models) or the solver's own
batched iterative path over the samples (:func:`batched_sparse`). The balance is the one
of :mod:`seatool.solve` (Lyon & DeJong 1995, eq. 3.2.x; reciprocity Vigran 2008, eq. 7.6).
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt
import scipy.sparse as sp
from threadpoolctl import threadpool_limits

from ..bandsolve import BandMatrices, SingularBandError
from ..model import Model
from ..solve import ENERGY_TOLERANCE, SolveError, assemble, solve_free

__all__ = ["SAMPLE_GROUP_BYTES", "batched_dense", "batched_sparse"]

Array = npt.NDArray[np.float64]
IntArray = npt.NDArray[np.int64]

#: Samples of one band solved together by the iterative method: larger groups than the
#: solver's bands (many small systems; fewer, longer array operations).
SAMPLE_GROUP_BYTES = 1 << 23


def _free_layout(
    model: Model, held: npt.NDArray[np.bool_], held_energy: Array, shape: tuple[int, int, int]
) -> tuple[IntArray, IntArray, IntArray, IntArray, Array]:
    """Connection ends ``a, b``, the free subsystems, each subsystem's position among them
    (-1 where held), and the energies (S, N, B) with the held ones filled in."""
    asm0 = assemble(model)
    free = np.flatnonzero(~held)
    pos = np.full(shape[1], -1, dtype=np.int64)
    pos[free] = np.arange(free.size)
    energy = np.broadcast_to(np.where(held[:, None], held_energy, 0.0), shape).copy()
    return asm0.a, asm0.b, free, pos, energy


def _sampled_totals(
    model: Model, a: IntArray, b: IntArray, damping: Array, modal: Array, eta_ab: Array
) -> tuple[Array, Array]:
    """Reverse coupling loss factors (S, C, B) and total loss factors (S, N, B) of samples."""
    sink = np.array([s.sink for s in model.subsystems], dtype=bool)
    ns, n, nb = damping.shape
    with np.errstate(divide="ignore", invalid="ignore"):
        eta_ba = np.where(sink[b][None, :, None], 0.0, eta_ab * modal[:, a] / modal[:, b])
    nc = a.size
    # total loss factors: damping + sum of outgoing coupling loss factors (incidence products)
    inc_a = sp.csr_matrix((np.ones(nc), (a, np.arange(nc))), shape=(n, nc))
    inc_b = sp.csr_matrix((np.ones(nc), (b, np.arange(nc))), shape=(n, nc))

    def _gather(inc: sp.csr_matrix, x: Array) -> Array:
        flat = x.transpose(1, 0, 2).reshape(nc, ns * nb)
        return np.asarray(inc @ flat).reshape(n, ns, nb).transpose(1, 0, 2)

    diag = np.where(sink[None, :, None], 0.0, damping) + _gather(inc_a, eta_ab)
    diag = diag + _gather(inc_b, eta_ba)
    return eta_ba, diag


def batched_dense(
    model: Model,
    damping: Array,
    modal: Array,
    eta_ab: Array,
    power: Array,
    held: npt.NDArray[np.bool_],
    held_energy: Array,
) -> Array:
    """Energies (S, N, B) from sampled arrays (S, ., B); dense batched solves per band."""
    ns, n, nb = damping.shape
    a, b, free, pos, energy = _free_layout(model, held, held_energy, (ns, n, nb))
    eta_ba, diag = _sampled_totals(model, a, b, damping, modal, eta_ab)
    nf = free.size
    if not nf:
        return energy
    ff = (pos[a] >= 0) & (pos[b] >= 0)
    rows = np.concatenate([np.arange(nf), pos[a[ff]], pos[b[ff]]])
    cols = np.concatenate([np.arange(nf), pos[b[ff]], pos[a[ff]]])
    # entries (row, col) of the dense matrix; parallel connections repeat a slot: sum them
    flat = rows * nf + cols
    order = np.argsort(flat, kind="stable")
    slots, starts = np.unique(flat[order], return_index=True)
    fa = (pos[a] >= 0) & held[b]
    fb = (pos[b] >= 0) & held[a]
    omega = model.bands.omega
    for j in range(nb):
        vals = np.concatenate(
            [diag[:, free, j], -eta_ba[:, ff, j], -eta_ab[:, ff, j]], axis=1
        )  # (S, K)
        flat_mats = np.zeros((ns, nf * nf))
        flat_mats[:, slots] = np.add.reduceat(vals[:, order], starts, axis=1)
        mats = flat_mats.reshape(ns, nf, nf)
        rhs = power[:, free, j] / omega[j]
        rhs_t = rhs.T  # a view: (nf, S)
        np.add.at(rhs_t, pos[a[fa]], (eta_ba[:, fa, j] * held_energy[b[fa], j]).T)
        np.add.at(rhs_t, pos[b[fb]], (eta_ab[:, fb, j] * held_energy[a[fb], j]).T)
        try:
            # One BLAS thread: a stack of small solves gains nothing from threads inside
            # each one, and extra threads on a busy machine multiply the time.
            with threadpool_limits(limits=1, user_api="blas"):
                x = np.linalg.solve(mats, rhs[:, :, None])[:, :, 0]
        except np.linalg.LinAlgError:
            raise SolveError(
                f"band {model.bands.label(j)}: a sampled power balance is singular"
            ) from None
        energy[:, free, j] = x
    if np.any(energy < 0):
        raise SolveError("a sample gave a negative energy (negative sampled loss factor?)")
    return energy


def batched_sparse(
    model: Model,
    damping: Array,
    modal: Array,
    eta_ab: Array,
    power: Array,
    held: npt.NDArray[np.bool_],
    held_energy: Array,
) -> Array:
    """Energies (S, N, B) from sampled arrays (S, ., B), on the solver's own path.

    In each band the samples share one sparsity pattern, so they are solved like the bands
    of one model (:func:`seatool.solve.solve_free`: batched conjugate gradients, every
    energy verified by its subsystem's balance, sparse LU where that fails), with the
    symmetric form ``C = L_UU diag(n_U)`` of each sample (``C_ab = -eta_ab n_a`` for both
    triangles, reciprocity).
    """
    ns, n, nb = damping.shape
    a, b, free, pos, energy = _free_layout(model, held, held_energy, (ns, n, nb))
    eta_ba, diag = _sampled_totals(model, a, b, damping, modal, eta_ab)
    nf = free.size
    if not nf:
        return energy
    ff = np.flatnonzero((pos[a] >= 0) & (pos[b] >= 0))
    pa, pb = pos[a[ff]], pos[b[ff]]
    m = ff.size
    unknowns = np.arange(nf, dtype=np.int64)
    links = np.arange(nf, nf + m, dtype=np.int64)
    rows = np.concatenate([unknowns, pa, pb])
    cols = np.concatenate([unknowns, pb, pa])
    source = np.concatenate([unknowns, links, links])
    fa = (pos[a] >= 0) & held[b]
    fb = (pos[b] >= 0) & held[a]
    omega = model.bands.omega

    def band_major(x: Array) -> Array:
        """(S, K, B) -> (B, K, S), contiguous: each band's samples in one block."""
        return np.ascontiguousarray(x.transpose(2, 1, 0))

    modal_t, diag_t, power_t = band_major(modal), band_major(diag), band_major(power)
    eta_ab_t, eta_ba_t = band_major(eta_ab), band_major(eta_ba)
    out = np.empty((nb, nf, ns))
    src = np.empty((nf + m, ns))
    for j in range(nb):
        n_free = modal_t[j, free]  # (nf, S)
        np.multiply(diag_t[j, free], n_free, out=src[:nf])
        np.multiply(eta_ab_t[j, ff], n_free[pa], out=src[nf:])
        np.negative(src[nf:], out=src[nf:])
        mats = BandMatrices.from_entries(nf, rows, cols, src, source)
        rhs = power_t[j, free] / omega[j]  # (nf, S)
        np.add.at(rhs, pos[a[fa]], eta_ba_t[j, fa] * held_energy[b[fa], j, None])
        np.add.at(rhs, pos[b[fb]], eta_ab_t[j, fb] * held_energy[a[fb], j, None])
        try:
            x, _ = solve_free(mats, rhs[:, :, None], ENERGY_TOLERANCE, SAMPLE_GROUP_BYTES)
        except SingularBandError:
            raise SolveError(
                f"band {model.bands.label(j)}: a sampled power balance is singular"
            ) from None
        np.multiply(n_free, x[:, :, 0], out=out[j])
    energy[:, free, :] = out.transpose(2, 1, 0)
    if np.any(energy < 0):
        raise SolveError("a sample gave a negative energy (negative sampled loss factor?)")
    return energy
