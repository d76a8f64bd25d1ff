"""Assembly and solution of the SEA power balance, all bands at once.

The power balance of K subsystems in a band of centre omega is (Lyon & DeJong 1995,
eq. 3.2.x; Vigran 2008, eqs. 7.4-7.7)::

    P_i = omega * (eta_i + sum_j eta_ij) * E_i - omega * sum_j eta_ji * E_j

or ``omega * L @ E = P`` with ``L_ii = eta_i + sum_j eta_ij`` and ``L_ij = -eta_ji``.
Each connection states eta_ab; eta_ba = eta_ab * n_a / n_b (reciprocity, Vigran eq. 7.6)
is derived here, so ``L @ diag(n)`` is symmetric by construction.

Subsystems with a prescribed energy (measured level, or the exterior sink held at zero)
move to the right-hand side. The remaining matrix is a column-diagonally-dominant
Z-matrix (column sums equal the damping loss factors), i.e. an M-matrix when
nonsingular; its inverse is then entrywise non-negative, which gives energies >= 0 and
lets the exact 1-norm of the inverse be read from one transposed solve
(``||L^-1||_1 = max(L^-T 1)``) for the condition number.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
import numpy.typing as npt
import scipy.sparse as sp
import scipy.sparse.linalg as spla
from scipy.sparse.csgraph import connected_components

from .model import Model

__all__ = ["Assembly", "FreeBlock", "SolveError", "assemble", "solve"]

Array = npt.NDArray[np.float64]
IntArray = npt.NDArray[np.int64]

#: Relative residual allowed for conservation (input = dissipated) in every band.
CONSERVATION_TOLERANCE = 1e-9
#: 1-norm condition number above which a band is refused as numerically singular.
CONDITION_LIMIT = 1e13
#: 1-norm condition number above which a note is added to the result.
CONDITION_NOTE = 1e8


class SolveError(ValueError):
    """The power balance cannot be solved (singular or ill-conditioned system)."""


@dataclass(frozen=True)
class Assembly:
    """The assembled loss-factor data of a model, per band.

    Attributes
    ----------
    eta_ab, eta_ba : ndarray (C, B)
        Coupling loss factors of each connection in its stated and reverse direction.
    diag : ndarray (N, B)
        Total loss factors L_ii.
    damping : ndarray (N, B)
        Damping loss factors eta_i.
    a, b : ndarray (C,)
        Subsystem indices of each connection's ends.
    held : ndarray of bool (N,)
        Subsystems whose energy is prescribed (including sinks).
    held_energy : ndarray (N, B)
        Prescribed energies (zero where not held).
    power : ndarray (N, B)
        Input powers from power excitations [W].
    omega : ndarray (B,)
    """

    eta_ab: Array
    eta_ba: Array
    diag: Array
    damping: Array
    a: npt.NDArray[np.int64]
    b: npt.NDArray[np.int64]
    held: npt.NDArray[np.bool_]
    held_energy: Array
    power: Array
    omega: Array

    @property
    def shape(self) -> tuple[int, int]:
        n, nb = self.diag.shape
        return int(n), int(nb)

    def matrix(self, band: int) -> sp.csc_matrix:
        """Full loss-factor matrix L of one band (N x N, sparse)."""
        n = self.diag.shape[0]
        rows = np.concatenate([np.arange(n), self.a, self.b])
        cols = np.concatenate([np.arange(n), self.b, self.a])
        vals = np.concatenate([self.diag[:, band], -self.eta_ba[:, band], -self.eta_ab[:, band]])
        return sp.csc_matrix(sp.coo_matrix((vals, (rows, cols)), shape=(n, n)))


def assemble(model: Model) -> Assembly:
    """Assemble per-band loss-factor arrays of ``model`` (vectorised over bands)."""
    idx = model.index()
    nb = len(model.bands)
    n = len(model.subsystems)
    modal = np.vstack([s.modal_density for s in model.subsystems])
    damping = np.vstack([s.damping for s in model.subsystems])
    sink = np.array([s.sink for s in model.subsystems], dtype=bool)
    if model.connections:
        a = np.array([idx[c.a] for c in model.connections], dtype=np.int64)
        b = np.array([idx[c.b] for c in model.connections], dtype=np.int64)
        eta_ab = np.vstack([c.coupling_loss_factor for c in model.connections])
        # Reciprocity n_a eta_ab = n_b eta_ba; a sink (n = inf) returns nothing.
        with np.errstate(divide="ignore", invalid="ignore"):
            eta_ba = np.where(sink[b][:, None], 0.0, eta_ab * modal[a] / modal[b])
    else:
        a = b = np.zeros(0, dtype=np.int64)
        eta_ab = eta_ba = np.zeros((0, nb))
    diag = np.where(sink[:, None], 0.0, damping).copy()
    np.add.at(diag, a, eta_ab)
    np.add.at(diag, b, eta_ba)
    held = sink.copy()
    held_energy = np.zeros((n, nb))
    power = np.zeros((n, nb))
    for e in model.excitations:
        i = idx[e.subsystem]
        if e.kind == "power":
            assert e.power is not None
            power[i] += e.power
        else:
            assert e.energy is not None
            held[i] = True
            held_energy[i] = e.energy
    return Assembly(
        eta_ab=eta_ab,
        eta_ba=eta_ba,
        diag=diag,
        damping=np.where(sink[:, None], 0.0, damping),
        a=a,
        b=b,
        held=held,
        held_energy=held_energy,
        power=power,
        omega=model.bands.omega.copy(),
    )


@dataclass(frozen=True)
class FreeBlock:
    """The free block of the power balance: the one construction used by the solver and
    by the analyses (:mod:`seatool.analysis`).

    For the free (not held) subsystems U of one band, ``L_UU E_U = P_U / omega + L_UK E_K``
    with the held energies E_K moved to the right (:meth:`rhs`). With modal energies
    ``x = E_U / n_U`` the matrix ``C = L_UU diag(n_U)`` is symmetric positive definite
    (reciprocity; :meth:`matrix`). The sparsity pattern is the same in every band: it is
    built once (CSC), and :attr:`values` holds L_UU's entries per band in that slot order
    (duplicate connections between one pair summed).

    Attributes
    ----------
    asm : Assembly
    free : ndarray of int (nf,)
        Subsystem index of each unknown.
    pos : ndarray of int (N,)
        Position of each subsystem among the unknowns, -1 if held.
    n_free : ndarray (nf, B)
        Modal densities of the unknowns [1/Hz].
    indptr, indices : ndarray of int
        CSC structure of L_UU and C.
    values : ndarray (nnz, B)
        Entries of L_UU per band, in CSC slot order.
    slot_col : ndarray of int (nnz,)
        Column of each slot.
    """

    asm: Assembly
    free: IntArray
    pos: IntArray
    n_free: Array
    indptr: npt.NDArray[np.integer[Any]]
    indices: npt.NDArray[np.integer[Any]]
    values: Array
    slot_col: npt.NDArray[np.integer[Any]]

    @classmethod
    def of(cls, model: Model, asm: Assembly) -> FreeBlock:
        """The free block of ``asm`` (assembled from ``model``)."""
        n, nb = asm.shape
        free = np.flatnonzero(~asm.held).astype(np.int64)
        pos = np.full(n, -1, dtype=np.int64)
        pos[free] = np.arange(free.size)
        nf = free.size
        if not nf:
            empty = np.zeros(0, dtype=np.int64)
            return cls(
                asm, free, pos, np.zeros((0, nb)), np.zeros(1, np.int64), empty,
                np.zeros((0, nb)), empty,
            )  # fmt: skip
        a, b = asm.a, asm.b
        # Entries of L_UU (both ends free): L_ab = -eta_ba, L_ba = -eta_ab.
        ff = (pos[a] >= 0) & (pos[b] >= 0)
        rows = np.concatenate([np.arange(nf), pos[a[ff]], pos[b[ff]]])
        cols = np.concatenate([np.arange(nf), pos[b[ff]], pos[a[ff]]])
        vals_all = np.concatenate([asm.diag[free], -asm.eta_ba[ff], -asm.eta_ab[ff]], axis=0)
        # One sparsity pattern for all bands: build the CSC structure once, refill values.
        pattern = sp.csc_matrix(
            sp.coo_matrix((np.arange(1, rows.size + 1, dtype=float), (rows, cols)), shape=(nf, nf))
        )
        # Map each CSC slot back to its COO entries (duplicates are summed).
        order = np.lexsort((rows, cols))
        rs, cs = rows[order], cols[order]
        start = np.ones(rs.size, dtype=bool)
        start[1:] = (rs[1:] != rs[:-1]) | (cs[1:] != cs[:-1])
        slot = np.cumsum(start) - 1
        summed = np.zeros((int(slot[-1]) + 1, nb))
        np.add.at(summed, slot, vals_all[order])
        slot_col = np.repeat(np.arange(nf), np.diff(pattern.indptr))
        n_free = np.vstack([model.subsystems[i].modal_density for i in free])
        return cls(
            asm=asm,
            free=free,
            pos=pos,
            n_free=n_free,
            indptr=pattern.indptr,
            indices=pattern.indices,
            values=summed,
            slot_col=slot_col,
        )

    @property
    def nf(self) -> int:
        """Number of unknowns."""
        return int(self.free.size)

    def norm1(self, j: int) -> float:
        """1-norm (largest absolute column sum) of L_UU in band ``j``."""
        return float(np.bincount(self.slot_col, np.abs(self.values[:, j]), minlength=self.nf).max())

    def matrix(self, j: int) -> sp.csc_matrix:
        """The symmetric form C = L_UU diag(n_U) of band ``j`` (sparse CSC)."""
        data = self.values[:, j] * self.n_free[self.slot_col, j]
        return sp.csc_matrix((data, self.indices, self.indptr), shape=(self.nf, self.nf))

    def rhs(self, power: Array, held_energy: Array, band: int | None = None) -> Array:
        """Right-hand side ``P_U / omega + L_UK E_K``.

        ``power`` and ``held_energy`` are (N, B) for every band (``band`` None), or (N, S)
        for S right-hand sides of band ``band``; the result is (nf, B) or (nf, S).
        """
        asm, pos = self.asm, self.pos
        a, b = asm.a, asm.b
        if band is None:
            omega, eta_ab, eta_ba = asm.omega, asm.eta_ab, asm.eta_ba
        else:
            omega = asm.omega[band]
            eta_ab, eta_ba = asm.eta_ab[:, band, None], asm.eta_ba[:, band, None]
        out = np.asarray(power[self.free] / omega, dtype=np.float64)
        fa = (pos[a] >= 0) & asm.held[b]
        np.add.at(out, pos[a[fa]], eta_ba[fa] * held_energy[b[fa]])
        fb = (pos[b] >= 0) & asm.held[a]
        np.add.at(out, pos[b[fb]], eta_ab[fb] * held_energy[a[fb]])
        return out


@dataclass(frozen=True)
class Solution:
    """Raw arrays of a solve; :class:`seatool.results.Result` wraps them for people."""

    energy: Array  # (N, B) [J]
    input_power: Array  # (N, B) [W] external input (held subsystems: power to hold them)
    dissipated_power: Array  # (N, B) [W] damping loss (sinks: power absorbed)
    connection_power: Array  # (C, B) [W] net power from a to b of each connection
    residual: Array  # (B,) relative conservation residual
    condition: Array  # (B,) 1-norm condition number of the solved block
    notes: tuple[str, ...]


def _check_singular(model: Model, asm: Assembly) -> None:
    """Refuse groups of subsystems with no way to lose energy."""
    n, nb = asm.shape
    free = ~asm.held
    if not free.any():
        return
    graph = sp.coo_matrix((np.ones(asm.a.size), (asm.a, asm.b)), shape=(n, n)).tocsr()
    ncomp, labels = connected_components(graph, directed=False)
    for k in range(ncomp):
        members = np.flatnonzero(labels == k)
        if asm.held[members].any():
            continue  # energy can leave through a held subsystem or a sink
        lossless = ~np.any(asm.damping[members] > 0, axis=0)
        if lossless.any():
            names = ", ".join(model.subsystems[i].name for i in members)
            bands = ", ".join(model.bands.label(j) for j in np.flatnonzero(lossless)[:5])
            what = (
                "is undamped and unconnected"
                if members.size == 1
                else "have no damping and no connection to anything damped"
            )
            raise SolveError(
                f"the power balance is singular: {names} {what} (bands {bands}); "
                "give a damping loss factor > 0 or connect it to a damped subsystem or the exterior"
            )


#: Above this many unknowns a band is solved by preconditioned conjugate gradients.
ITERATIVE_ABOVE = 1000
_CG_RTOL = 1e-14


def _spd_solve(
    cmat: sp.csc_matrix,
    rhs: Array,
    n: Array,
    model: Model,
    free: npt.NDArray[np.int64],
    j: int,
    asm: Assembly,
) -> tuple[Array, Array]:
    """Solve C x = rhs and C y = n for the symmetric positive definite C of one band.

    Direct sparse LU (symmetric-structure ordering) for small systems; for large ones
    conjugate gradients with a Jacobi preconditioner (Saad 2003, Iterative Methods for
    Sparse Linear Systems, 2nd ed., alg. 9.1), falling back to LU if it does not converge.
    """
    nf = cmat.shape[0]
    if nf > ITERATIVE_ABOVE:
        d = cmat.diagonal()
        if np.all(d > 0):
            prec = spla.LinearOperator(cmat.shape, matvec=lambda v: v / d, dtype=float)
            out = []
            for b in (rhs, n):
                x, info = spla.cg(cmat, b, rtol=_CG_RTOL, atol=0.0, M=prec, maxiter=20 * nf)
                if info != 0:
                    break
                out.append(x)
            if len(out) == 2:
                return out[0], out[1]
    try:
        lu = spla.splu(cmat, permc_spec="MMD_AT_PLUS_A")
    except RuntimeError:  # singular to working precision
        ratio = asm.damping[free, j] / np.maximum(asm.diag[free, j], np.finfo(float).tiny)
        names = ", ".join(model.subsystems[free[i]].name for i in np.argsort(ratio)[:3])
        raise SolveError(
            f"band {model.bands.label(j)}: the power balance is singular to working "
            f"precision; the least damped relative to their coupling are {names} - "
            "check their damping and coupling loss factors"
        ) from None
    return lu.solve(rhs), lu.solve(n)


def solve(model: Model, asm: Assembly | None = None) -> Solution:
    """Solve the SEA power balance of ``model`` in every band.

    Returns a :class:`Solution`; raises :class:`SolveError` if a band is singular,
    ill-conditioned beyond :data:`CONDITION_LIMIT`, or fails the conservation check.
    """
    asm = assemble(model) if asm is None else asm
    _check_singular(model, asm)
    n, nb = asm.shape
    blk = FreeBlock.of(model, asm)
    free, nf = blk.free, blk.nf
    a, b = asm.a, asm.b
    rhs = blk.rhs(asm.power, asm.held_energy)

    energy = asm.held_energy.copy()
    condition = np.ones(nb)
    notes: list[str] = []
    if nf:
        n_free = blk.n_free
        for j in range(nb):
            norm_l = blk.norm1(j)
            cmat = blk.matrix(j)
            x, col_sums = _spd_solve(cmat, rhs[:, j], n_free[:, j], model, free, j, asm)
            # M-matrix: ||L^-1||_1 = max(L^-T 1) exactly, and L^-T 1 = C^-1 n.
            cond = norm_l * float(np.max(col_sums))
            condition[j] = cond
            if not np.isfinite(cond) or cond > CONDITION_LIMIT or np.any(col_sums < 0):
                worst = np.argsort(col_sums)[::-1][:3]
                names = ", ".join(model.subsystems[free[i]].name for i in worst)
                raise SolveError(
                    f"band {model.bands.label(j)}: the power balance is ill-conditioned "
                    f"(condition number {cond:.2g}); energy piles up in {names} - check their "
                    "damping and coupling loss factors"
                )
            energy[free, j] = n_free[:, j] * x
        worst_band = int(np.argmax(condition))
        if condition[worst_band] > CONDITION_NOTE:
            notes.append(
                f"condition number {condition[worst_band]:.2g} in band "
                f"{model.bands.label(worst_band)}: results are sensitive to rounding"
            )

    if np.any(energy < 0):
        i, j = (int(v) for v in np.unravel_index(int(np.argmin(energy)), energy.shape))
        raise SolveError(
            f"negative energy in {model.subsystems[i].name} at {model.bands.label(int(j))}; "
            "check for negative loss factors"
        )
    omega = asm.omega
    damping_power = omega * asm.damping * energy
    connection_power = omega * (asm.eta_ab * energy[a] - asm.eta_ba * energy[b])
    net_out = np.zeros_like(energy)
    np.add.at(net_out, a, connection_power)
    np.add.at(net_out, b, -connection_power)
    input_power = asm.power.copy()
    dissipated = damping_power.copy()
    sinks = np.array([s.sink for s in model.subsystems], dtype=bool)
    # Held subsystems: the power needed to hold them is what they dissipate plus send out.
    held_src = asm.held & ~sinks
    input_power[held_src] = damping_power[held_src] + net_out[held_src]
    # Sinks absorb what flows into them.
    dissipated[sinks] = -net_out[sinks]
    total_in = input_power.sum(axis=0)
    total_out = dissipated.sum(axis=0)
    scale = np.maximum(np.abs(input_power).sum(axis=0), np.finfo(float).tiny)
    residual = np.abs(total_in - total_out) / scale
    balance = np.abs(input_power - dissipated - net_out).max(axis=0) / scale
    residual = np.maximum(residual, balance)
    if np.any(residual > CONSERVATION_TOLERANCE):
        j = int(np.argmax(residual))
        raise SolveError(
            f"band {model.bands.label(j)}: conservation check failed (relative residual "
            f"{residual[j]:.2g} > {CONSERVATION_TOLERANCE:g})"
        )
    return Solution(
        energy=energy,
        input_power=input_power,
        dissipated_power=dissipated,
        connection_power=connection_power,
        residual=residual,
        condition=condition,
        notes=tuple(notes),
    )
