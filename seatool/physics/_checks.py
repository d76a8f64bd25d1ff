"""Shared input checks of the physics functions (one definition for every module)."""

from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

FloatArray = npt.NDArray[np.float64]


def _within(arr: FloatArray, lo: float, hi: float, *, closed_lo: bool) -> bool:
    """All entries in (lo, hi) or [lo, hi) (NaN fails): one comparison per entry.

    A single value is compared as a Python float (a whole-array reduction costs more than
    the comparison itself; the readers call these checks a few hundred times per model).
    """
    if arr.ndim == 0:
        v = float(arr)
        return (lo <= v if closed_lo else lo < v) and v < hi
    above = arr >= lo if closed_lo else arr > lo
    return bool((above & (arr < hi)).all())


def positive(name: str, value: npt.ArrayLike) -> FloatArray:
    """Return ``value`` as a float array; raise ValueError unless all entries are finite and > 0."""
    arr = np.asarray(value, dtype=np.float64)
    if not _within(arr, 0.0, math.inf, closed_lo=False):
        msg = f"{name} must be finite and > 0, got {value!r}"
        raise ValueError(msg)
    return arr


def nonnegative(name: str, value: npt.ArrayLike) -> FloatArray:
    """Return ``value`` as a float array; raise ValueError unless all entries are finite and >= 0."""
    arr = np.asarray(value, dtype=np.float64)
    if not _within(arr, 0.0, math.inf, closed_lo=True):
        msg = f"{name} must be finite and >= 0, got {value!r}"
        raise ValueError(msg)
    return arr


def poisson(value: npt.ArrayLike) -> FloatArray:
    """Return Poisson's ratio as a float array; raise ValueError outside (-1, 0.5)."""
    arr = np.asarray(value, dtype=np.float64)
    if not _within(arr, -1.0, 0.5, closed_lo=False):
        msg = f"poisson_ratio must lie in (-1, 0.5), got {value!r}"
        raise ValueError(msg)
    return arr


def full(value: FloatArray, *others: npt.ArrayLike) -> FloatArray:
    """Broadcast a frequency-independent result to the broadcast shape of ``others``."""
    shape = np.broadcast_shapes(np.shape(value), *(np.shape(o) for o in others))
    return np.array(np.broadcast_to(value, shape), dtype=np.float64)


def fluid(rho0: float, c0: float) -> None:
    """Raise ValueError unless the fluid density ``rho0`` and sound speed ``c0`` are > 0."""
    positive("rho0", rho0)
    positive("c0", c0)
