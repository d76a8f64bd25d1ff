"""Shared linear algebra of the analyses: factorisations of the free block, per band.

For the free (not held) subsystems U the power balance of one band is (see
:mod:`seatool.solve`)::

    L_UU E_U = P_U / omega + sum_{held h} eta_hu E_h          (1)

and with modal energies x = E_U / n_U the matrix ``C = L_UU diag(n_U)`` is symmetric
positive definite (reciprocity). One factorisation of ``C`` per band serves every
right-hand side of the analyses: per-source solves (superposition) and the adjoint
``L_UU^T lam = e_r``, which is ``C lam = n_r e_r`` because
``L_UU^T = diag(1/n_U) C``.

The free block itself is built by :class:`seatool.solve.FreeBlock`, the solver's own
construction. Nothing here changes a model; the arrays of an
:class:`~seatool.solve.Assembly` are only read.
"""

from __future__ import annotations

from collections.abc import Iterator

import numpy as np
import numpy.typing as npt
import scipy.sparse.linalg as spla

from ..errors import InputError, Problem, closest
from ..model import Model
from ..physics.validity import modal_overlap, modes_in_band
from ..results import subsystem_level
from ..solve import Assembly, FreeBlock, SolveError

Array = npt.NDArray[np.float64]
IntArray = npt.NDArray[np.int64]


def factors(blk: FreeBlock, model: Model) -> Iterator[tuple[int, spla.SuperLU | None]]:
    """Sparse LU of C per band (symmetric-structure ordering); None if nothing is free."""
    for j in range(blk.asm.shape[1]):
        if not blk.nf:
            yield j, None
            continue
        try:
            lu = spla.splu(blk.matrix(j), permc_spec="MMD_AT_PLUS_A")
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
    for j, lu in factors(blk, model):
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
    return float(subsystem_level(model.subsystems[i], np.ones(1))[0][0])
