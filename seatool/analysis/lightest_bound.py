"""A proven lower bound on a receiver's level over many combinations of options, and the
branch-and-bound search of :func:`seatool.analysis.lightest.lightest_treatment` built on it.

The bound
---------
For a fixed combination the power balance of the free subsystems reads ``A E = P / omega``
with ``A`` a Z-matrix (off-diagonal entries ``-eta_ji <= 0``, the diagonal the internal
loss factor plus every outgoing coupling loss factor) that is a nonsingular M-matrix for a
model the solver accepts (every connected group damped), so ``A^-1 >= 0`` entrywise.

A *node* of the search fixes the options of some surfaces and leaves the others free. Each
option's effect on each array entry is known (damping, log modal density, log coupling loss
factor, input power, level offset), so every entry of ``A`` and of the right side lies in an
interval over all completions of the node: the interval of a sum is the sum of the intervals
(one per free surface: the least and the largest change among its options), and
``eta_ji = eta_ij n_i / n_j`` is bounded through the intervals of its logarithm. Let ``Au``
be the matrix of the upper ends (largest diagonal, least negative off-diagonal) and ``Pl``
the lower end of the right side (clipped at zero). For any completion, ``A <= Au`` entrywise
and ``Au`` is a Z-matrix, hence a nonsingular M-matrix too, and

    A^-1 - Au^-1 = A^-1 (Au - A) Au^-1 >= 0,

each factor being non-negative (Berman & Plemmons 1994, ch. 6: a Z-matrix above an
M-matrix is an M-matrix; its inverse is non-negative). With ``P >= Pl`` and ``A^-1 >= 0``:

    E = A^-1 P >= Au^-1 P >= Au^-1 Pl,

so ``10 lg(Au^-1 Pl)_r`` plus the least level offset is a lower bound on receiver ``r``'s
level in every band for every completion of the node. Every metric of
:data:`seatool.metrics.METRICS` (energetic sums, A/C weighting, SIL, loudness) is
non-decreasing in each band level, so the margins computed from these band levels are
upper bounds of the margins of every completion. No monotonicity of the level in any one
treatment is assumed (a trim's mass-spring resonance may raise a band): the interval
covers whatever each option does.

The search
----------
Best-first in the objective, batched: a node's objective bound is the objective of its
fixed options plus the least objective of each free surface. A node is dropped when its
margin bound is negative (no completion meets every target) or its objective bound is
above the ``keep``-th best objective found; complete combinations are solved exactly.
The answer is then the lightest combination meeting every target among all combinations
(exact, not a screen). When none meets, a second best-first search maximises the
smallest margin with the same bound, starting from a greedy dive; it stops when no node
can beat the best found (proven) or after ``max_nodes`` bounded nodes (then the best
achievable margin lies between the best found and the largest open bound, both reported).
"""

from __future__ import annotations

import heapq
import itertools
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import numpy.typing as npt
import scipy.sparse as sp
from threadpoolctl import threadpool_limits

from ..levels import db
from ..model import Model
from ..solve import assemble

__all__ = ["LevelFloor", "Search", "best_margin_search", "lightest_search"]

Array = npt.NDArray[np.float64]
Ints = npt.NDArray[np.int64]

#: Margins computed from the bound are trusted to this [dB] against rounding in the solve.
TOL_DB = 1e-7


class LevelFloor:
    """Lower bounds of receiver levels over the completions of partial combinations.

    Parameters
    ----------
    model : Model
        The base model.
    base : tuple of arrays
        Base ``damping (N, B)``, ``modal (N, B)``, ``eta_ab (C, B)``, ``power (N, B)``,
        ``offsets (R,)``.
    deltas : sequence (per surface) of tuples of stacked option arrays
        ``damping (O, N, B)`` change, ``modal (O, N, B)`` log ratio, ``eta (O, C, B)`` log
        ratio, ``power (O, N, B)`` change, ``offsets (O, R)`` change.
    receivers : sequence of int
        Indices of the receiver subsystems.

    Notes
    -----
    Only the entries some option changes vary between nodes: the matrix of the base
    values is assembled once per band and each node adds the changes of those entries
    (a sparse scatter), then the stack of dense systems is solved.
    """

    def __init__(
        self,
        model: Model,
        base: tuple[Array, Array, Array, Array, Array],
        deltas: Sequence[tuple[Array, Array, Array, Array, Array]],
        receivers: Sequence[int],
        shared: Sequence[tuple[str, tuple[int, ...], Ints, Array]] = (),
    ) -> None:
        asm = assemble(model)
        a, b = asm.a, asm.b
        held, he = asm.held, asm.held_energy
        sink = np.array([s.sink for s in model.subsystems], dtype=bool)
        self.omega = model.bands.omega
        d0, n0, e0, p0, off0 = base
        n, nb = d0.shape
        # entries changed by some option (subsystems; connections, also through n_a / n_b)
        moved_n = np.zeros(n, dtype=bool)
        moved_c = np.zeros(a.size, dtype=bool)
        for d in deltas:
            moved_n |= np.any(d[0] != 0, axis=(0, 2)) | np.any(d[1] != 0, axis=(0, 2))
            moved_n |= np.any(d[3] != 0, axis=(0, 2))
            moved_c |= np.any(d[2] != 0, axis=(0, 2))
        for what, _, rows, _ in shared:
            if what == "eta":
                moved_c[rows] = True
            else:
                moved_n[rows] = True
        moved_c |= moved_n[a] | moved_n[b]
        self.act_n = np.flatnonzero(moved_n)
        self.act_c = np.flatnonzero(moved_c)
        an, ac = self.act_n, self.act_c
        # per surface: option stacks of the changed entries, then the least and largest
        self.ext = []
        for d in deltas:
            parts = (d[0][:, an], d[1][:, an], d[2][:, ac], d[3][:, an], d[4])
            self.ext.append(
                tuple(np.concatenate([x, x.min(axis=0)[None], x.max(axis=0)[None]]) for x in parts)
            )
        self.sizes = [len(d[0]) for d in deltas]
        # shared couplings: least and largest table values for each pattern of fixed axes
        at = np.full(a.size, -1, dtype=np.int64)
        at[ac] = np.arange(ac.size)
        at_n = np.full(n, -1, dtype=np.int64)
        at_n[an] = np.arange(an.size)
        self.shared: list[tuple[str, tuple[int, ...], Ints, Array, dict[Any, Any]]] = []
        for what, group, rows, table in shared:
            t = len(group)
            pats = {}
            for pat in itertools.product((True, False), repeat=t):
                free_axes = tuple(i for i in range(t) if not pat[i])
                pats[pat] = (table.min(axis=free_axes), table.max(axis=free_axes))
            if what == "eta":
                self.shared.append((what, group, at[rows], np.zeros(1), pats))
            else:  # damping tables hold values; the sums hold changes from the base
                self.shared.append((what, group, at_n[rows], d0[rows], pats))
        self.base_act = (d0[an], n0[an], e0[ac], p0[an], off0)
        # where the ends of the changed connections sit among the changed subsystems
        where = np.full(n, -1, dtype=np.int64)
        where[an] = np.arange(an.size)
        self.wa, self.wb = where[a[ac]], where[b[ac]]
        with np.errstate(divide="ignore", invalid="ignore"):
            ratio = np.where(sink[b][:, None], 0.0, n0[a] / n0[b])
        ratio = np.nan_to_num(ratio, nan=0.0, posinf=0.0)
        eba0 = e0 * ratio
        self.ratio_act = ratio[ac]
        self.eba0_act = eba0[ac]
        self.sink_act = sink[an]
        free = np.flatnonzero(~held)
        pos = np.full(n, -1, dtype=np.int64)
        pos[free] = np.arange(free.size)
        nf = free.size
        self.free, self.nf = free, nf
        self.receivers = np.asarray(receivers, dtype=np.int64)
        self.held, self.he = held, he
        # the base matrices and right sides of the free block, per band
        diag = np.where(sink[:, None], 0.0, d0)
        np.add.at(diag, a, e0)
        np.add.at(diag, b, eba0)
        ff = (pos[a] >= 0) & (pos[b] >= 0)
        m0t = np.zeros((nf, nf, nb))  # band last for the scatter, then bands first
        m0t[np.arange(nf), np.arange(nf)] = diag[free]
        np.add.at(m0t, (pos[a[ff]], pos[b[ff]]), -eba0[ff])
        np.add.at(m0t, (pos[b[ff]], pos[a[ff]]), -e0[ff])
        fa = (pos[a] >= 0) & held[b]
        fb = (pos[b] >= 0) & held[a]
        rhs0t = p0[free] / self.omega[None]  # (nf, B)
        np.add.at(rhs0t, pos[a[fa]], eba0[fa] * he[b[fa]])
        np.add.at(rhs0t, pos[b[fb]], e0[fb] * he[a[fb]])
        self.m0 = np.ascontiguousarray(m0t.transpose(2, 0, 1))
        self.rhs0 = np.ascontiguousarray(rhs0t.T)
        # scatter of the changes: items [damping an | eta_hi ac | eba_hi ac | eba_lo ac |
        # eta_lo ac] into matrix slots, [power an | eba_lo ac | eta_lo ac] into the rhs
        na, nc = an.size, ac.size
        pa, pb = pos[a[ac]], pos[b[ac]]
        slots: list[Ints] = []
        cols: list[Ints] = []
        vals: list[Array] = []

        def put(slot: Ints, item: Ints, sign: float, ok: npt.NDArray[np.bool_]) -> None:
            slots.append(slot[ok])
            cols.append(item[ok])
            vals.append(np.full(int(ok.sum()), sign))

        pn = pos[an]
        put(pn * nf + pn, np.arange(na), 1.0, pn >= 0)
        put(pa * nf + pa, na + np.arange(nc), 1.0, pa >= 0)
        put(pb * nf + pb, na + nc + np.arange(nc), 1.0, pb >= 0)
        both = (pa >= 0) & (pb >= 0)
        put(pa * nf + pb, na + 2 * nc + np.arange(nc), -1.0, both)
        put(pb * nf + pa, na + 3 * nc + np.arange(nc), -1.0, both)
        r, c, v = np.concatenate(slots), np.concatenate(cols), np.concatenate(vals)
        self.slots, inv = np.unique(r, return_inverse=True)
        self.scatter = sp.csr_matrix((v, (inv, c)), shape=(self.slots.size, na + 4 * nc))
        rr = [pn[pn >= 0], pa[(pa >= 0) & (pb < 0)], pb[(pb >= 0) & (pa < 0)]]
        rc = [
            np.flatnonzero(pn >= 0),
            na + np.flatnonzero((pa >= 0) & (pb < 0)),
            na + nc + np.flatnonzero((pb >= 0) & (pa < 0)),
        ]
        self.rhs_scatter = sp.csr_matrix(
            (np.ones(sum(x.size for x in rr)), (np.concatenate(rr), np.concatenate(rc))),
            shape=(nf, na + 2 * nc),
        )
        # held energies at the far end of the changed connections (rhs items)
        self.he_b = np.where((pa >= 0)[:, None] & (pb < 0)[:, None], he[b[ac]], 0.0)
        self.he_a = np.where((pb >= 0)[:, None] & (pa < 0)[:, None], he[a[ac]], 0.0)

    def _sums(self, combos: Ints) -> tuple[list[Array], list[Array]]:
        """Lower and upper sums of the five changes over each node's completions."""
        k = combos.shape[0]
        lo = [np.zeros((k, *x.shape)) for x in self.base_act]
        hi = [np.zeros((k, *x.shape)) for x in self.base_act]
        for s, ext in enumerate(self.ext):
            ch = combos[:, s]
            i_lo = np.where(ch >= 0, ch, self.sizes[s])
            i_hi = np.where(ch >= 0, ch, self.sizes[s] + 1)
            for q in range(5):
                lo[q] += ext[q][i_lo]
                hi[q] += ext[q][i_hi]
        return lo, hi

    def levels(self, combos: Ints) -> Array:
        """Lower bounds (K, R, B) of the receivers' band levels [dB] over the completions
        of nodes ``combos`` (K, S) (-1: surface not fixed)."""
        _, _, e0, p0, off0 = self.base_act
        lo, hi = self._sums(combos)
        k = combos.shape[0]
        nb = self.omega.size
        zero = np.zeros((k, 1, nb))
        with np.errstate(over="ignore", invalid="ignore"):
            eta_lo = e0[None] * np.exp(lo[2])
            eta_hi = e0[None] * np.exp(hi[2])
            # log n of the ends: 0 where an end is not a changed subsystem
            n_lo = np.concatenate([lo[1], zero], axis=1)
            n_hi = np.concatenate([hi[1], zero], axis=1)
            r = self.ratio_act[None]
            for what, group, cols, ref, pats in self.shared:
                fixed = combos[:, list(group)] >= 0
                for pat, (tmin, tmax) in pats.items():
                    sel = np.flatnonzero(np.all(fixed == np.array(pat), axis=1))
                    if sel.size:
                        ix = tuple(combos[sel, g] for g, p in zip(group, pat, strict=True) if p)
                        lo_v, hi_v = (tmin[ix], tmax[ix]) if ix else (tmin[None], tmax[None])
                        if what == "eta":
                            eta_lo[np.ix_(sel, cols)] = lo_v
                            eta_hi[np.ix_(sel, cols)] = hi_v
                        else:
                            hi[0][np.ix_(sel, cols)] = hi_v - ref
            eba_lo = eta_lo * r * np.exp(n_lo[:, self.wa] - n_hi[:, self.wb])
            eba_hi = eta_hi * r * np.exp(n_hi[:, self.wa] - n_lo[:, self.wb])
        damp = np.where(self.sink_act[None, :, None], 0.0, hi[0])
        dp = (np.maximum(p0[None] + lo[3], 0.0) - p0[None]) / self.omega
        off_lo = off0[None] + lo[4]  # (K, R)
        eba0 = self.eba0_act[None]
        items = np.concatenate(
            [damp, eta_hi - e0[None], eba_hi - eba0, eba_lo - eba0, eta_lo - e0[None]], axis=1
        )  # (K, items, B)
        rhs_items = np.concatenate(
            [dp, (eba_lo - eba0) * self.he_b[None], (eta_lo - e0[None]) * self.he_a[None]],
            axis=1,
        )
        nf = self.nf
        energy = np.zeros((k, self.held.size, nb))
        items_b = np.ascontiguousarray(items.transpose(2, 1, 0))  # (B, items, K)
        rhs_b = np.ascontiguousarray(rhs_items.transpose(2, 1, 0))
        with threadpool_limits(limits=1, user_api="blas"):
            for j in range(nb):
                mats = np.broadcast_to(self.m0[j].reshape(1, nf * nf), (k, nf * nf)).copy()
                mats[:, self.slots] += (self.scatter @ items_b[j]).T
                rhs = self.rhs0[j][None] + (self.rhs_scatter @ rhs_b[j]).T
                x = np.linalg.solve(mats.reshape(k, nf, nf), rhs[:, :, None])[:, :, 0]
                energy[:, self.free, j] = np.maximum(x, 0.0)
        energy[:, self.held, :] = self.he[self.held][None]
        with np.errstate(divide="ignore"):
            return db(energy[:, self.receivers, :]) + off_lo[:, :, None]


@dataclass
class Search:
    """What a search found: ``found`` (objective, -smallest margin, combination) of the
    combinations meeting every target, lightest first; the best smallest margin seen and
    its combination; counts; the proven upper bound of the best achievable margin."""

    found: list[tuple[float, float, tuple[int, ...]]]
    best_margin: float
    best_combo: tuple[int, ...] | None
    evaluated: int
    bounded: int
    margin_bound: float = np.inf
    proven: bool = True


Judge = Callable[[Ints], Array]


def lightest_search(
    sizes: Sequence[int],
    objective: Sequence[Array],
    exact: Judge,
    bound: Judge,
    order: Sequence[int],
    *,
    keep: int = 1,
    batch: int = 128,
    tick: Callable[[int], object] = lambda _n: None,
) -> Search:
    """Best-first branch and bound for the ``keep`` lightest combinations meeting every
    target (see the module notes).

    ``exact(combos)`` and ``bound(combos)`` return the smallest margin (K,) of complete
    combinations (exact) and an upper bound for the completions of partial ones (-1 for a
    free surface). ``order`` is the order in which surfaces are fixed.
    """
    ns = len(sizes)
    rest = np.zeros(ns + 1)
    for d in range(ns - 1, -1, -1):
        rest[d] = rest[d + 1] + float(np.min(objective[order[d]]))
    counter = itertools.count()
    root = tuple([-1] * ns)
    heap: list[tuple[float, int, int, float, tuple[int, ...]]] = [(rest[0], 0, 0, 0.0, root)]
    out = Search([], -np.inf, None, 0, 0)
    while heap:
        thr = sorted(f[0] for f in out.found)[keep - 1] if len(out.found) >= keep else np.inf
        nodes: list[tuple[float, int, int, float, tuple[int, ...]]] = []
        while heap and len(nodes) < batch:
            item = heapq.heappop(heap)
            if item[0] > thr:
                heap.clear()
                break
            nodes.append(item)
        if not nodes:
            break
        leaves: list[tuple[int, ...]] = []
        inner: list[tuple[float, int, float, tuple[int, ...]]] = []
        for _, _, depth, fixed_obj, combo in nodes:
            s = order[depth]
            for o in range(sizes[s]):
                ob = fixed_obj + float(objective[s][o])
                if ob + rest[depth + 1] > thr:
                    continue
                child = list(combo)
                child[s] = o
                if depth + 1 == ns:
                    leaves.append(tuple(child))
                else:
                    inner.append((ob + rest[depth + 1], depth + 1, ob, tuple(child)))
        if leaves:
            arr = np.array(leaves, dtype=np.int64)
            small = exact(arr)
            out.evaluated += len(leaves)
            tick(len(leaves))
            for c, m in zip(leaves, small, strict=True):
                if m > out.best_margin:
                    out.best_margin, out.best_combo = float(m), c
                if m >= 0.0:
                    obj = float(sum(objective[s][c[s]] for s in range(ns)))
                    out.found.append((obj, -float(m), c))
        if inner:
            ub = bound(np.array([c for *_, c in inner], dtype=np.int64))
            out.bounded += len(inner)
            for (lb, depth, ob, c), u in zip(inner, ub, strict=True):
                if u >= -TOL_DB:
                    heapq.heappush(heap, (lb, next(counter), depth, ob, c))
    out.found.sort()
    return out


def best_margin_search(
    sizes: Sequence[int],
    exact: Judge,
    bound: Judge,
    order: Sequence[int],
    *,
    batch: int = 128,
    max_nodes: int = 200_000,
    tick: Callable[[int], object] = lambda _n: None,
) -> Search:
    """Best-first branch and bound for the largest smallest margin (when nothing meets).

    Starts with a greedy dive (fix each surface in ``order`` to the option of the largest
    margin bound) for a first combination, then expands the node of the largest bound;
    drops nodes whose bound cannot beat the best found. Stops proven when no node is left,
    or after ``max_nodes`` bounded nodes with ``proven=False`` and ``margin_bound`` the
    largest open bound.
    """
    ns = len(sizes)
    out = Search([], -np.inf, None, 0, 0)
    combo = [-1] * ns
    for depth, s in enumerate(order):
        kids = np.array([combo] * sizes[s], dtype=np.int64)
        kids[:, s] = np.arange(sizes[s])
        if depth + 1 == ns:
            small = exact(kids)
            out.evaluated += sizes[s]
            tick(sizes[s])
            o = int(np.argmax(small))
            out.best_margin, out.best_combo = float(small[o]), tuple(int(x) for x in kids[o])
        else:
            ub = bound(kids)
            out.bounded += sizes[s]
            combo[s] = int(np.argmax(ub))
    root_ub = float(bound(np.full((1, ns), -1, dtype=np.int64))[0])
    counter = itertools.count()
    heap: list[tuple[float, int, int, tuple[int, ...]]] = [(-root_ub, 0, 0, tuple([-1] * ns))]
    while heap and out.bounded < max_nodes:
        nodes: list[tuple[float, int, int, tuple[int, ...]]] = []
        while heap and len(nodes) < batch:
            item = heapq.heappop(heap)
            if -item[0] <= out.best_margin + TOL_DB:
                heap.clear()
                break
            nodes.append(item)
        if not nodes:
            break
        leaves: list[tuple[int, ...]] = []
        inner: list[tuple[int, tuple[int, ...]]] = []
        for _, _, depth, c in nodes:
            s = order[depth]
            for o in range(sizes[s]):
                child = list(c)
                child[s] = o
                if depth + 1 == ns:
                    leaves.append(tuple(child))
                else:
                    inner.append((depth + 1, tuple(child)))
        if leaves:
            small = exact(np.array(leaves, dtype=np.int64))
            out.evaluated += len(leaves)
            tick(len(leaves))
            k = int(np.argmax(small))
            if small[k] > out.best_margin:
                out.best_margin, out.best_combo = float(small[k]), leaves[k]
        if inner:
            ub = bound(np.array([c for _, c in inner], dtype=np.int64))
            out.bounded += len(inner)
            for (depth, c), u in zip(inner, ub, strict=True):
                if u > out.best_margin + TOL_DB:
                    heapq.heappush(heap, (-float(u), next(counter), depth, c))
    open_ub = [-h[0] for h in heap if -h[0] > out.best_margin + TOL_DB]
    out.proven = not open_ub
    out.margin_bound = max([out.best_margin, *open_ub])
    return out
