"""Shared input checks of the physics functions (one definition for every module)."""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

FloatArray = npt.NDArray[np.float64]


def positive(name: str, value: npt.ArrayLike) -> FloatArray:
    """Return ``value`` as a float array; raise ValueError unless all entries are finite and > 0."""
    arr = np.asarray(value, dtype=np.float64)
    if not np.all(np.isfinite(arr)) or np.any(arr <= 0.0):
        msg = f"{name} must be finite and > 0, got {value!r}"
        raise ValueError(msg)
    return arr


def nonnegative(name: str, value: npt.ArrayLike) -> FloatArray:
    """Return ``value`` as a float array; raise ValueError unless all entries are finite and >= 0."""
    arr = np.asarray(value, dtype=np.float64)
    if not np.all(np.isfinite(arr)) or np.any(arr < 0.0):
        msg = f"{name} must be finite and >= 0, got {value!r}"
        raise ValueError(msg)
    return arr
