"""Shared linear algebra of the analyses: the free block of the power balance, per band.

For the free (not held) subsystems U the power balance of one band is (see
:mod:`seatool.solve`)::

    L_UU E_U = P_U / omega + sum_{held h} eta_hu E_h          (1)

and with modal energies x = E_U / n_U the matrix ``C = L_UU diag(n_U)`` is symmetric
positive definite (reciprocity). One factorisation of ``C`` per band serves every
right-hand side of the analyses: per-source solves (superposition) and the adjoint
``L_UU^T lam = e_r``, which is ``C lam = n_r e_r`` because
``L_UU^T = diag(1/n_U) C``.

Nothing here changes a model; the arrays of an :class:`~seatool.solve.Assembly` are only
read.
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt
import scipy.sparse as sp
import scipy.sparse.linalg as spla

from ..errors import InputError, Problem, closest
from ..model import Model
from ..physics.validity import modal_overlap, modes_in_band
from ..solve import Assembly, SolveError

Array = npt.NDArray[np.float64]
IntArray = npt.NDArray[np.int64]


@dataclass(frozen=True)
class FreeBlock:
    """Index maps of the free block of an assembled model."""

    asm: Assembly
    free: IntArray  # (nf,) subsystem index of each unknown
    pos: IntArray  # (N,) position among the unknowns, -1 if held
    n_free: Array  # (nf, B) modal densities of the unknowns

    @classmethod
    def of(cls, model: Model, asm: Assembly) -> FreeBlock:
        n = asm.shape[0]
        free = np.flatnonzero(~asm.held).astype(np.int64)
        pos = np.full(n, -1, dtype=np.int64)
        pos[free] = np.arange(free.size)
        if free.size:
            n_free = np.vstack([model.subsystems[i].modal_density for i in free])
        else:
            n_free = np.zeros((0, asm.shape[1]))
        return cls(asm=asm, free=free, pos=pos, n_free=n_free)

    @property
    def nf(self) -> int:
        return int(self.free.size)

    def matrix(self, j: int) -> sp.csc_matrix:
        """The symmetric form C = L_UU diag(n_U) of band ``j`` (sparse)."""
        asm, pos = self.asm, self.pos
        nf = self.nf
        a, b = asm.a, asm.b
        ff = (pos[a] >= 0) & (pos[b] >= 0)
        rows = np.concatenate([np.arange(nf), pos[a[ff]], pos[b[ff]]])
        cols = np.concatenate([np.arange(nf), pos[b[ff]], pos[a[ff]]])
        vals = (
            np.concatenate([asm.diag[self.free, j], -asm.eta_ba[ff, j], -asm.eta_ab[ff, j]])
            * self.n_free[cols, j]
        )
        return sp.csc_matrix(sp.coo_matrix((vals, (rows, cols)), shape=(nf, nf)))

    def rhs(self, power: Array, held_energy: Array, j: int) -> Array:
        """Right-hand side of (1) for band ``j``; ``power`` and ``held_energy`` are (N, S)."""
        asm, pos = self.asm, self.pos
        out = np.zeros((self.nf, power.shape[1]))
        out += power[self.free] / asm.omega[j]
        a, b = asm.a, asm.b
        fa = (pos[a] >= 0) & asm.held[b]
        np.add.at(out, pos[a[fa]], asm.eta_ba[fa, j][:, None] * held_energy[b[fa]])
        fb = (pos[b] >= 0) & asm.held[a]
        np.add.at(out, pos[b[fb]], asm.eta_ab[fb, j][:, None] * held_energy[a[fb]])
        return out

    def factors(self, model: Model) -> Iterator[tuple[int, spla.SuperLU | None]]:
        """Sparse LU of C per band (symmetric-structure ordering); None if nothing is free."""
        for j in range(self.asm.shape[1]):
            if not self.nf:
                yield j, None
                continue
            try:
                lu = spla.splu(self.matrix(j), permc_spec="MMD_AT_PLUS_A")
            except RuntimeError:
                raise SolveError(
                    f"band {model.bands.label(j)}: the power balance is singular to working "
                    "precision"
                ) from None
            yield j, lu


def solve_sources(model: Model, asm: Assembly, power: Array, held_energy: Array) -> Array:
    """Energies (N, S, B) for S right-hand sides (``power``, ``held_energy``: (N, S, B)).

    Each column s is an independent solve with the input powers ``power[:, s]`` and the
    held energies ``held_energy[:, s]`` (held subsystems keep their place in the system;
    a held subsystem not excited in column s is held at zero energy).
    """
    blk = FreeBlock.of(model, asm)
    n, ns, nb = power.shape
    energy = np.where(asm.held[:, None, None], held_energy, 0.0)
    for j, lu in blk.factors(model):
        if lu is None:
            continue
        rhs = blk.rhs(power[:, :, j], held_energy[:, :, j], j)
        x = lu.solve(rhs)
        energy[blk.free, :, j] = blk.n_free[:, j][:, None] * x
    return energy


def receiver_index(model: Model, receiver: str, *, option: str = "--to") -> int:
    """Index of subsystem ``receiver`` or an InputError naming the closest one."""
    idx = model.index()
    if receiver not in idx:
        raise InputError(
            [
                Problem(
                    model.source,
                    option,
                    f"unknown subsystem {receiver!r}" + closest(receiver, model.names),
                )
            ]
        )
    return idx[receiver]


def validity_columns(model: Model, asm: Assembly, i: int) -> dict[str, Array]:
    """Per-band validity indicators of subsystem ``i`` (modes in band, modal overlap, flag).

    ``valid`` is False in a band with fewer than one mode (N = n(f) Delta_f < 1) or modal
    overlap M = eta_total f n(f) < 1 (thresholds: common practice; Fahy & Mohammed 1992
    for M, from memory). Sinks and held subsystems are reported as valid (NaN indicators):
    their level is not predicted by the balance.
    """
    s = model.subsystems[i]
    bands = model.bands
    nb = len(bands)
    if s.sink:
        nan = np.full(nb, np.nan)
        return {"modes_in_band": nan, "modal_overlap": nan, "valid": np.ones(nb, dtype=bool)}
    n_modes = modes_in_band(s.modal_density, bands.width)
    total = asm.diag[i]
    m = np.where(
        total > 0, modal_overlap(bands.centre, s.modal_density, np.where(total > 0, total, 1.0)), 0
    )
    valid = (n_modes >= 1.0) & (m >= 1.0)
    return {"modes_in_band": n_modes, "modal_overlap": np.asarray(m, float), "valid": valid}


def level_offset(model: Model, i: int) -> float:
    """Level of subsystem ``i`` at an energy of 1 J [dB]: level = 10 lg(E / 1 J) + offset.

    The levels are 10 lg of quantities proportional to E, so the offset is the level of 1 J
    (:func:`seatool.results.subsystem_level`).
    """
    from ..results import subsystem_level

    return float(subsystem_level(model.subsystems[i], np.ones(1))[0][0])


def db(x: npt.ArrayLike) -> Array:
    """10 lg x [dB] of a ratio of powers or energies (common practice; -inf at 0)."""
    with np.errstate(divide="ignore"):
        return np.asarray(10.0 * np.log10(np.asarray(x, dtype=float)), dtype=float)
