"""seatool.physics.stacked_algebra against numpy.linalg (an independent general solver)."""

from __future__ import annotations

import numpy as np

from seatool.physics import stacked_algebra as sa


def _random(rng: np.random.Generator, shape: tuple[int, ...]) -> np.ndarray:
    return rng.standard_normal(shape) + 1j * rng.standard_normal(shape)


def test_solve4_matches_numpy_linalg_solve_with_and_without_zero_entries():
    # numpy.linalg.solve (LAPACK gesv, partial pivoting) on the same stacked 4 x 4 systems;
    # diagonally weighted so that the leading block and its Schur complement are regular.
    rng = np.random.default_rng(3)
    shape = (5, 7)
    for zeros in ([], [(0, 1), (1, 0), (2, 3)], [(0, 1), (1, 0), (0, 3), (3, 0), (1, 2)]):
        dense = _random(rng, (*shape, 4, 4)) + 6.0 * np.eye(4)
        for g, h in zeros:
            dense[..., g, h] = 0.0
        rhs = _random(rng, (*shape, 4))
        rhs[..., 1] = 0.0  # a zero right-hand entry
        k = [[None if (g, h) in zeros else dense[..., g, h] for h in range(4)] for g in range(4)]
        r = [None if i == 1 else rhs[..., i] for i in range(4)]
        got = np.stack([sa.as_array(x, shape) for x in sa.solve4(k, r)], axis=-1)
        ref = np.linalg.solve(dense, rhs[..., None])[..., 0]
        np.testing.assert_allclose(got, ref, rtol=1e-12, atol=1e-14)


def test_inv2_and_mul2_match_numpy():
    rng = np.random.default_rng(4)
    a = _random(rng, (6, 2, 2)) + 3.0 * np.eye(2)
    b = _random(rng, (6, 2, 2))
    entries = (a[:, 0, 0], a[:, 0, 1], a[:, 1, 0], a[:, 1, 1])
    inv = np.linalg.inv(a)
    for got, ref in zip(
        sa.inv2(*entries), (inv[:, 0, 0], inv[:, 0, 1], inv[:, 1, 0], inv[:, 1, 1]), strict=True
    ):
        np.testing.assert_allclose(got, ref, rtol=1e-12)
    prod = a @ b
    got = sa.mul2(entries, (b[:, 0, 0], b[:, 0, 1], b[:, 1, 0], b[:, 1, 1]))
    for x, ref in zip(
        got, (prod[:, 0, 0], prod[:, 0, 1], prod[:, 1, 0], prod[:, 1, 1]), strict=True
    ):
        np.testing.assert_allclose(x, ref, rtol=1e-12)
