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
(``||L^-1||_1 = max(L^-T 1)``) for the condition number. The column dominance also
bounds it without a solve (:func:`condition_bound`, Varah 1975); :func:`solve` computes
the condition number only where that bound exceeds :data:`CONDITION_NOTE` (or when
``Solution.condition`` is first read).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field
from functools import cached_property

import numpy as np
import numpy.typing as npt
import scipy.sparse as sp
from scipy.sparse.csgraph import connected_components

from .bandsolve import BandMatrices, SingularBandError, add_rows, spd_solve
from .model import Model

__all__ = [
    "Assembly",
    "FreeBlock",
    "SolveError",
    "assemble",
    "condition_bound",
    "drives",
    "free_block_matrices",
    "solve",
    "solve_free",
]

Array = npt.NDArray[np.float64]

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
    modal : ndarray (N, B) or None
        Modal densities [1/Hz] (sinks: infinite).
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
    modal: Array | None = None

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


def drives(model: Model) -> tuple[npt.NDArray[np.bool_], Array, Array]:
    """Held subsystems (N,), held energies (N, B) and input powers (N, B) of ``model``.

    Sinks and subsystems with an energy excitation are held (their energy is given, zero
    for a sink); power excitations of one subsystem add up.
    """
    idx = model.index()
    n, nb = len(model.subsystems), len(model.bands)
    held = np.array([s.sink for s in model.subsystems], dtype=bool)
    held_energy = np.zeros((n, nb))
    power = np.zeros((n, nb))
    for e in model.excitations:
        i = idx[e.subsystem]
        if e.drive == "power":
            assert e.power is not None
            power[i] += e.power
        else:
            assert e.energy is not None
            held[i] = True
            held_energy[i] = e.energy
    return held, held_energy, power


def assemble(model: Model) -> Assembly:
    """Assemble per-band loss-factor arrays of ``model`` (vectorised over bands)."""
    idx = model.index()
    nb = len(model.bands)
    modal = np.array([s.modal_density for s in model.subsystems], dtype=float)
    damping = np.array([s.damping for s in model.subsystems], dtype=float)
    sink = np.array([s.sink for s in model.subsystems], dtype=bool)
    if model.connections:
        a = np.array([idx[c.a] for c in model.connections], dtype=np.int64)
        b = np.array([idx[c.b] for c in model.connections], dtype=np.int64)
        eta_ab = np.array([c.coupling_loss_factor for c in model.connections], dtype=float)
        # Reciprocity n_a eta_ab = n_b eta_ba; a sink (n = inf) returns nothing.
        with np.errstate(divide="ignore", invalid="ignore"):
            eta_ba = np.where(sink[b][:, None], 0.0, eta_ab * modal[a] / modal[b])
    else:
        a = b = np.zeros(0, dtype=np.int64)
        eta_ab = eta_ba = np.zeros((0, nb))
    diag = np.where(sink[:, None], 0.0, damping).copy()
    add_rows(diag, a, eta_ab)
    add_rows(diag, b, eta_ba)
    held, held_energy, power = drives(model)
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
        modal=modal,
    )


@dataclass(frozen=True)
class Solution:
    """Raw arrays of a solve; :class:`seatool.results.Result` wraps them for people.

    ``condition`` (B,) is the 1-norm condition number of each band's solved block,
    ``||L||_1 max(L^-T 1)`` (module notes); on the iterative route it is computed when
    first read, since :func:`solve` needs it only where the cheap bound
    ``condition_bound`` (:func:`condition_bound`) exceeds :data:`CONDITION_NOTE`.
    """

    energy: Array  # (N, B) [J]
    input_power: Array  # (N, B) [W] external input (held subsystems: power to hold them)
    dissipated_power: Array  # (N, B) [W] damping loss (sinks: power absorbed)
    connection_power: Array  # (C, B) [W] net power from a to b of each connection
    residual: Array  # (B,) relative conservation residual
    condition_bound: Array  # (B,) upper bound of the condition number (condition_bound())
    notes: tuple[str, ...]
    method: str = "lu"  # how the bands were solved (see seatool.bandsolve.spd_solve)
    condition_of: Callable[[], Array] | None = field(default=None, repr=False, compare=False)

    @cached_property
    def condition(self) -> Array:
        """1-norm condition number of the solved block of every band (B,)."""
        if self.condition_of is None:
            return np.ones_like(self.residual)
        return self.condition_of()


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


#: Above this many unknowns the bands are solved by the batched iterative method first
#: (conjugate gradients and Jacobi sweeps, :mod:`seatool.bandsolve`); bands it cannot
#: solve to :data:`ENERGY_TOLERANCE` fall back to sparse LU.
ITERATIVE_ABOVE = 60
#: Relative accuracy asked of every energy and checked by each subsystem's balance.
ENERGY_TOLERANCE = 1e-9
#: Relative accuracy asked of the vector whose largest entry is ||L^-1||_1.
CONDITION_VECTOR_TOLERANCE = 1e-8


def _singular(model: Model, asm: Assembly, free: npt.NDArray[np.int64], j: int) -> SolveError:
    ratio = asm.damping[free, j] / np.maximum(asm.diag[free, j], np.finfo(float).tiny)
    names = ", ".join(model.subsystems[free[i]].name for i in np.argsort(ratio)[:3])
    return SolveError(
        f"band {model.bands.label(j)}: the power balance is singular to working "
        f"precision; the least damped relative to their coupling are {names} - "
        "check their damping and coupling loss factors"
    )


def free_block_matrices(
    asm: Assembly, pos: npt.NDArray[np.int64], n_free: Array
) -> BandMatrices:
    """C = L_UU diag(n_U) of every band on one pattern; ``pos`` maps subsystems to unknowns.

    ``C_ii = L_ii n_i``; a connection between free subsystems a and b gives
    ``C_ab = C_ba = -eta_ab n_a`` (``= -eta_ba n_b``, reciprocity), one value for both
    triangles, so C is symmetric to the last bit.
    """
    nf = n_free.shape[0]
    nb = n_free.shape[1] if n_free.ndim == 2 else asm.diag.shape[1]
    a, b = asm.a, asm.b
    ff = np.flatnonzero((pos[a] >= 0) & (pos[b] >= 0))
    pa, pb = pos[a[ff]], pos[b[ff]]
    m = ff.size
    free = np.flatnonzero(pos >= 0)
    src = np.empty((nf + m, nb))
    np.multiply(asm.diag[free], n_free, out=src[:nf])
    np.multiply(asm.eta_ab[ff], n_free[pa], out=src[nf:])
    np.negative(src[nf:], out=src[nf:])
    unknowns = np.arange(nf, dtype=np.int64)
    links = np.arange(nf, nf + m, dtype=np.int64)
    rows = np.concatenate([unknowns, pa, pb])
    cols = np.concatenate([unknowns, pb, pa])
    return BandMatrices.from_entries(nf, rows, cols, src, np.concatenate([unknowns, links, links]))


@dataclass(frozen=True)
class FreeBlock:
    """The free block of the power balance: the one construction used by the solver and
    by the analyses (:mod:`seatool.analysis`).

    For the free (not held) subsystems U of one band, ``L_UU E_U = P_U / omega + L_UK E_K``
    with the held energies E_K moved to the right (:meth:`rhs`). With modal energies
    ``x = E_U / n_U`` the matrix ``C = L_UU diag(n_U)`` is symmetric positive definite
    (reciprocity); :attr:`mats` holds it for every band on one sparsity pattern
    (:func:`free_block_matrices`).

    Attributes
    ----------
    asm : Assembly
    free : ndarray of int (nf,)
        Subsystem index of each unknown.
    pos : ndarray of int (N,)
        Position of each subsystem among the unknowns, -1 if held.
    n_free : ndarray (nf, B)
        Modal densities of the unknowns [1/Hz].
    mats : BandMatrices
        C of every band.
    """

    asm: Assembly
    free: npt.NDArray[np.int64]
    pos: npt.NDArray[np.int64]
    n_free: Array
    mats: BandMatrices

    @classmethod
    def of(cls, model: Model, asm: Assembly) -> FreeBlock:
        """The free block of ``asm`` (assembled from ``model``)."""
        n, nb = asm.shape
        free = np.flatnonzero(~asm.held).astype(np.int64)
        pos = np.full(n, -1, dtype=np.int64)
        pos[free] = np.arange(free.size)
        if asm.modal is not None:
            n_free = asm.modal[free]
        elif free.size:
            n_free = np.array([model.subsystems[i].modal_density for i in free], dtype=float)
        else:
            n_free = np.zeros((0, nb))
        return cls(asm, free, pos, n_free, free_block_matrices(asm, pos, n_free))

    @property
    def nf(self) -> int:
        """Number of unknowns."""
        return int(self.free.size)

    def matrix(self, j: int) -> sp.csc_matrix:
        """The symmetric form C = L_UU diag(n_U) of band ``j`` (sparse CSC)."""
        return self.mats.band(j)

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


def solve_free(
    mats: BandMatrices,
    rhs: Array,
    tol: npt.ArrayLike | None = None,
    group_bytes: int | None = None,
) -> tuple[Array, str]:
    """:func:`seatool.bandsolve.spd_solve` with the solver's settings (read at call time)."""
    tol = ENERGY_TOLERANCE if tol is None else tol
    return spd_solve(
        mats, rhs, tol, iterative_above=ITERATIVE_ABOVE, group_bytes=group_bytes
    )


def condition_bound(blk: FreeBlock) -> tuple[Array, Array]:
    """``||L_j||_1`` and an upper bound of the condition number of every band (B,), (B,).

    ``L = L_UU`` is the free block of the power balance. Its column i holds the total loss
    factor ``L_ii`` and the coupling loss factors from i to the other free subsystems
    (negative); their sum, the column excess ``delta_i = |L_ii| - sum_(k != i) |L_ki|``, is
    the damping loss factor of i plus its coupling loss factors into held subsystems
    (computed as that sum, without cancellation). A matrix whose columns are strictly
    diagonally dominant has ``||L^-1||_1 <= 1 / min(delta)`` (Varah 1975, applied to
    ``L^T``), so ``cond_1(L) <= ||L||_1 / min(delta)``; infinite where ``min(delta) <= 0``.

    References
    ----------
    .. [1] Varah, J.M. (1975). "A lower bound for the smallest singular value of a
       matrix." Linear Algebra and its Applications 11(1), 3-5 (the bound
       ``||A^-1||_inf <= 1 / min_i (|a_ii| - sum_(j != i) |a_ij|)``).
    """
    asm, pos = blk.asm, blk.pos
    a, b = asm.a, asm.b
    excess = np.array(asm.damping[blk.free])
    to_held = (pos[a] >= 0) & asm.held[b]
    add_rows(excess, pos[a[to_held]], asm.eta_ab[to_held])
    from_held = (pos[b] >= 0) & asm.held[a]
    add_rows(excess, pos[b[from_held]], asm.eta_ba[from_held])
    col_abs = 2.0 * asm.diag[blk.free] - excess
    norm = np.asarray(col_abs.max(axis=0), dtype=float)
    low = excess.min(axis=0)
    with np.errstate(divide="ignore"):
        bound = np.where(low > 0, norm / np.where(low > 0, low, 1.0), np.inf)
    return norm, np.asarray(bound, dtype=float)


def _condition_vectors(
    model: Model,
    asm: Assembly,
    free: npt.NDArray[np.int64],
    mats: BandMatrices,
    n_free: Array,
    bands: npt.NDArray[np.int64],
) -> Array:
    """``L^-T 1 = C^-1 n`` of the bands ``bands`` (nf, len(bands)); for an M-matrix its
    largest entry is ``||L^-1||_1`` exactly."""
    sub = BandMatrices(mats.indptr, mats.indices, mats.values[:, bands])
    try:
        y, _ = solve_free(sub, n_free[:, bands, None], CONDITION_VECTOR_TOLERANCE)
    except SingularBandError as exc:
        raise _singular(model, asm, free, int(bands[exc.band])) from None
    return y[:, :, 0]


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
    bound = np.ones(nb)
    condition_of: Callable[[], Array] | None = None
    notes: list[str] = []
    method = "none (every subsystem is held)"
    if nf:
        n_free, mats = blk.n_free, blk.mats  # C = L_UU diag(n_U), one pattern for all bands
        norm_l, bound = condition_bound(blk)
        # Small models: the second column L^-T 1 = C^-1 n costs one more substitution with
        # the same factors; large ones compute it only where the bound does not settle it.
        eager = nf <= ITERATIVE_ABOVE
        cols = [rhs, n_free] if eager else [rhs]
        try:
            xy, method = solve_free(
                mats,
                np.stack(cols, axis=2),
                [ENERGY_TOLERANCE, CONDITION_VECTOR_TOLERANCE][: len(cols)],
            )
        except SingularBandError as exc:
            raise _singular(model, asm, free, exc.band) from None
        known = np.full(nb, np.nan)
        col_sums = np.zeros((nf, nb))
        check = np.arange(nb) if eager else np.flatnonzero(~(bound <= CONDITION_NOTE))
        if eager:
            col_sums = xy[:, :, 1]
        elif check.size:
            col_sums[:, check] = _condition_vectors(model, asm, free, mats, n_free, check)
        known[check] = norm_l[check] * col_sums[:, check].max(axis=0)
        bad = np.zeros(nb, dtype=bool)
        bad[check] = ~np.isfinite(known[check]) | (known[check] > CONDITION_LIMIT) | np.any(
            col_sums[:, check] < 0, axis=0
        )
        if bad.any():
            j = int(np.flatnonzero(bad)[0])
            cond = known[j]
            worst = np.argsort(col_sums[:, j])[::-1][:3]
            names = ", ".join(model.subsystems[free[i]].name for i in worst)
            raise SolveError(
                f"band {model.bands.label(j)}: the power balance is ill-conditioned "
                f"(condition number {cond:.2g}); energy piles up in {names} - check their "
                "damping and coupling loss factors"
            )
        energy[free] = n_free * xy[:, :, 0]
        if check.size:
            worst_band = int(check[np.argmax(known[check])])
            if known[worst_band] > CONDITION_NOTE:
                notes.append(
                    f"condition number {known[worst_band]:.2g} in band "
                    f"{model.bands.label(worst_band)}: results are sensitive to rounding"
                )

        def condition_of() -> Array:
            rest = np.flatnonzero(np.isnan(known))
            out = known.copy()
            if rest.size:
                y = _condition_vectors(model, asm, free, mats, n_free, rest)
                out[rest] = norm_l[rest] * y.max(axis=0)
            return out

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
    add_rows(net_out, a, connection_power)
    add_rows(net_out, b, -connection_power)
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
        condition_bound=bound,
        notes=tuple(notes),
        method=method,
        condition_of=condition_of if nf else None,
    )
