"""Tests for seatool.physics.memo (remembering results of pure functions)."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pytest

from seatool.physics import memo


@dataclass(frozen=True)
class Frozen:
    x: float


@dataclass
class Loose:
    x: float


def counting():  # type: ignore[no-untyped-def]
    calls = []

    @memo.memoised(maxsize=2)
    def fn(a, *, scale=1.0):  # type: ignore[no-untyped-def]
        calls.append(1)
        if isinstance(a, np.ndarray) and np.any(a < 0):
            raise ValueError("negative")
        return np.asarray(a, dtype=float) * getattr(scale, "x", scale)

    return fn, calls


def test_same_values_computed_once_and_copies_handed_out():
    fn, calls = counting()
    a = fn(np.array([1.0, 2.0]), scale=3.0)
    a[:] = -5.0  # the caller changes its copy
    b = fn(np.array([1.0, 2.0]), scale=3.0)  # a different array with the same values
    np.testing.assert_array_equal(b, [3.0, 6.0])
    assert len(calls) == 1
    fn(np.array([1.0, 2.0]), scale=2.0)
    fn(np.array([1.0, 2.0, 3.0]), scale=3.0)
    assert len(calls) == 3


def test_keys_by_value_of_numbers_lists_and_frozen_dataclasses():
    fn, calls = counting()
    fn([1.0, 2.0], scale=Frozen(2.0))
    fn([1.0, 2.0], scale=Frozen(2.0))
    assert len(calls) == 1
    fn([1.0, 2.5], scale=Frozen(2.0))
    assert len(calls) == 2


def test_unkeyable_arguments_are_not_remembered():
    fn, calls = counting()
    # a mutable object could change between calls: keyed by identity it would go stale
    loose = Loose(2.0)
    assert float(fn(1.0, scale=loose)) == 2.0
    loose.x = 3.0
    assert float(fn(1.0, scale=loose)) == 3.0
    assert len(calls) == 2


def test_failed_calls_are_not_remembered_and_least_recent_forgotten():
    fn, calls = counting()
    with pytest.raises(ValueError, match="negative"):
        fn(np.array([-1.0]))
    with pytest.raises(ValueError, match="negative"):
        fn(np.array([-1.0]))
    assert len(calls) == 2
    fn(1.0)
    fn(2.0)
    fn(3.0)  # maxsize 2: forgets 1.0
    fn(1.0)
    assert len(calls) == 6
    memo.clear()
    fn(3.0)
    assert len(calls) == 7
