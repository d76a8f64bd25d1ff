"""The batched band solver against an independent method: dense LU (numpy.linalg.solve).

Reference: ``numpy.linalg.solve`` (LAPACK gesv, partial pivoting) on the dense matrix of
each band, built entry by entry in plain loops. For these M-matrices with non-negative
right-hand sides Gaussian elimination is accurate entry by entry (Higham 2002, Accuracy
and Stability of Numerical Algorithms, 2nd ed., sec. 9.5: |L||U| = |LU| for an M-matrix,
from memory), so the reference is good to far better than the 1e-9 relative asked here,
also for the tiny energies far from every source.
"""

from __future__ import annotations

import importlib

import numpy as np
import pytest

from seatool.bands import BandAxis
from seatool.bandsolve import BandMatrices, spd_solve
from seatool.model import Connection, Excitation, Model, Subsystem
from seatool.solve import assemble, solve

TOL = 1e-9


def _system(
    rng: np.random.Generator, n: int, nb: int, edges: np.ndarray, damping: tuple[float, float],
    clf: tuple[float, float],
) -> tuple[BandMatrices, np.ndarray, np.ndarray]:
    """A random SEA-like M-matrix C = L diag(m) per band, its dense copies and rhs."""
    a, b = edges[:, 0], edges[:, 1]
    modal = 10 ** rng.uniform(-2, 2, (n, nb))
    eta = 10 ** rng.uniform(np.log10(damping[0]), np.log10(damping[1]), (n, nb))
    eab = 10 ** rng.uniform(np.log10(clf[0]), np.log10(clf[1]), (a.size, nb))
    dense = np.zeros((nb, n, n))
    for j in range(nb):
        for i in range(n):
            dense[j, i, i] += eta[i, j] * modal[i, j]
        for k in range(a.size):
            p, q = a[k], b[k]
            w = eab[k, j] * modal[p, j]  # n_a eta_ab = n_b eta_ba (reciprocity)
            dense[j, p, p] += w
            dense[j, q, q] += w
            dense[j, p, q] -= w
            dense[j, q, p] -= w
    rows, cols = np.nonzero(np.any(dense != 0, axis=0))
    mats = BandMatrices.from_entries(n, rows, cols, dense[:, rows, cols].T)
    rhs = np.zeros((n, nb, 2))
    src = rng.choice(n, max(1, n // 50), replace=False)
    rhs[src, :, 0] = rng.uniform(1e-6, 1e-3, (src.size, nb))
    rhs[:, :, 1] = modal
    return mats, dense, rhs


def _lattice_edges(shape: tuple[int, int, int]) -> np.ndarray:
    idx = np.arange(int(np.prod(shape))).reshape(shape)
    out = []
    for ax in range(3):
        lo = [slice(None)] * 3
        hi = [slice(None)] * 3
        lo[ax], hi[ax] = slice(0, -1), slice(1, None)
        out.append(np.column_stack([idx[tuple(lo)].ravel(), idx[tuple(hi)].ravel()]))
    return np.vstack(out)


def _random_edges(rng: np.random.Generator, n: int) -> np.ndarray:
    ring = np.column_stack([np.arange(n), (np.arange(n) + 1) % n])
    chords = rng.integers(0, n, (n, 2))
    chords = chords[chords[:, 0] != chords[:, 1]]
    return np.vstack([ring, chords])


def _check(mats: BandMatrices, dense: np.ndarray, rhs: np.ndarray, iterative_above: int) -> str:
    x, method = spd_solve(mats, rhs, TOL, iterative_above=iterative_above)
    for j in range(dense.shape[0]):
        ref = np.linalg.solve(dense[j], rhs[:, j, :])
        assert np.all(ref > 0)
        np.testing.assert_allclose(x[:, j, :], ref, rtol=TOL, atol=0, err_msg=f"band {j}")
    return method


CASES = {
    # name: (edges, damping range, coupling range)
    "lattice, weak coupling (energies span > 100 dB)": ("lattice", (3e-3, 3e-2), (1e-5, 1e-3)),
    "lattice, strong coupling": ("lattice", (1e-4, 1e-3), (1e-2, 1e-1)),
    "random, moderate": ("random", (1e-3, 3e-2), (1e-4, 1e-2)),
    "random, ill-conditioned": ("random", (1e-7, 1e-6), (1e-2, 1e-1)),
}


@pytest.mark.parametrize("case", list(CASES))
@pytest.mark.parametrize("iterative_above", [0, 10**9])
def test_energies_match_dense_solve_entry_by_entry(case, iterative_above):
    rng = np.random.default_rng(len(case))
    kind, damping, clf = CASES[case]
    n = 216
    edges = _lattice_edges((6, 6, 6)) if kind == "lattice" else _random_edges(rng, n)
    mats, dense, rhs = _system(rng, n, 4, edges, damping, clf)
    if case == "random, ill-conditioned":
        assert max(np.linalg.cond(d, 1) for d in dense) > 1e7  # it is ill-conditioned
    method = _check(mats, dense, rhs, iterative_above)
    assert method.startswith("iterative" if iterative_above == 0 else "lu")


def test_weak_chain_needs_the_sweeps():
    # A chain of 80 weakly coupled subsystems: energies fall by ~40 dB per link, far below
    # what a Krylov method alone resolves; the sweeps carry the accuracy down the chain.
    rng = np.random.default_rng(3)
    n = 80
    edges = np.column_stack([np.arange(n - 1), np.arange(1, n)])
    mats, dense, rhs = _system(rng, n, 3, edges, (1e-2, 2e-2), (1e-4, 2e-4))
    rhs[:, :, 0] = 0.0
    rhs[0, :, 0] = 1e-3
    x, method = spd_solve(mats, rhs, TOL, iterative_above=0)
    assert method == "iterative"
    for j in range(3):
        ref = np.linalg.solve(dense[j], rhs[:, j, :])
        assert ref[-1, 0] / ref[0, 0] < 1e-150
        np.testing.assert_allclose(x[:, j, :], ref, rtol=TOL, atol=0)


def _lattice_model(shape: tuple[int, int, int], seed: int) -> Model:
    rng = np.random.default_rng(seed)
    bands = BandAxis.from_range(100, 1000)
    nb = len(bands)
    n = int(np.prod(shape))
    subs = tuple(
        Subsystem(f"s{i}", "structure", rng.uniform(0.1, 10, nb), rng.uniform(1e-3, 2e-2, nb),
                  quantity="velocity", mass=1.0)
        for i in range(n)
    )
    cons = tuple(
        Connection(f"c{k}", f"s{a}", f"s{b}", rng.uniform(1e-4, 3e-3, nb))
        for k, (a, b) in enumerate(_lattice_edges(shape))
    )
    exc = (Excitation("p", "s0", "power", power=np.full(nb, 1e-3)),)
    return Model(bands, subs, cons, exc)


def test_solve_chooses_iterative_and_matches_dense_reference():
    # Above ITERATIVE_ABOVE the model is solved iteratively; the energies, the condition
    # numbers (numpy.linalg.cond, 1-norm) and the balance agree with dense solves.
    m = _lattice_model((5, 5, 4), 1)
    sol = solve(m)
    assert sol.method == "iterative"
    asm = assemble(m)
    modal = np.vstack([s.modal_density for s in m.subsystems])
    for j in range(len(m.bands)):
        lmat = asm.matrix(j).toarray()
        ref = np.linalg.solve(lmat, asm.power[:, j] / asm.omega[j])
        np.testing.assert_allclose(sol.energy[:, j], ref, rtol=TOL, atol=0)
        np.testing.assert_allclose(sol.condition[j], np.linalg.cond(lmat, 1), rtol=1e-6)
    assert np.all(modal > 0)
    assert sol.residual.max() <= 1e-9


def test_iterative_failure_falls_back_to_lu(monkeypatch):
    # With no sweeps and a single CG iteration the check fails; LU takes over per band.
    bs = importlib.import_module("seatool.bandsolve")
    monkeypatch.setattr(bs, "CG_MAXITER", 1)
    monkeypatch.setattr(bs, "MAX_SWEEPS", 0)
    rng = np.random.default_rng(5)
    mats, dense, rhs = _system(rng, 216, 3, _lattice_edges((6, 6, 6)), (3e-3, 3e-2), (1e-5, 1e-3))
    method = _check(mats, dense, rhs, 0)
    assert method == "iterative+lu (3 of 3 bands)"
