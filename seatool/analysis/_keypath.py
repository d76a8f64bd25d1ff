"""Key paths into parsed model-file data (``subsystems.floor.thickness``).

A key path names a value of the model file: a number, a spectrum table
``{ band_hz, values }`` or an array of numbers. Analyses change copies of the data
(never the original) and rebuild the model with :func:`seatool.modelfile.build`.
"""

from __future__ import annotations

import copy
import tomllib
from collections.abc import Callable, Mapping, Sequence
from pathlib import Path
from typing import Any

import numpy as np

from ..errors import InputError, Problem
from ..kinds.spreads import resolve

__all__ = ["numbers", "read_data", "resolve", "with_value", "with_values"]


def read_data(path: str | Path) -> tuple[dict[str, Any], str, Path]:
    """Parsed TOML data of a model file, its name and its folder (InputError if unreadable)."""
    p = Path(path)
    try:
        text = p.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise InputError([Problem(str(p), "", "file not found")]) from None
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError([Problem(str(p), "", f"cannot read: {exc}")]) from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError([Problem(str(p), "", f"not valid TOML: {exc}")]) from None
    return data, str(p), p.parent


def numbers(value: Any) -> np.ndarray:
    """The numbers of a resolved value (scalar, array, or spectrum values) as an array."""
    if isinstance(value, Mapping):
        return np.asarray(value["values"], dtype=float)
    return np.asarray(value, dtype=float)


def _replace(node: Any, last: str, change: Callable[[np.ndarray], np.ndarray]) -> None:
    value = node[last]
    new = change(numbers(value))
    if isinstance(value, Mapping):
        value = dict(value)
        value["values"] = [float(v) for v in np.asarray(new).ravel()]
        node[last] = value
    elif isinstance(value, list):
        node[last] = [float(v) for v in np.asarray(new).ravel()]
    else:
        node[last] = float(np.asarray(new).ravel()[0])


def with_value(
    data: Mapping[str, Any], path: str, change: Callable[[np.ndarray], np.ndarray]
) -> dict[str, Any]:
    """A deep copy of ``data`` with the numbers at ``path`` replaced by ``change(numbers)``."""
    out = copy.deepcopy(dict(data))
    parts = path.split(".")
    node: Any = out
    for part in parts[:-1]:
        node = node[part]
    _replace(node, parts[-1], change)
    return out


def with_values(
    data: Mapping[str, Any], changes: Sequence[tuple[str, Callable[[np.ndarray], np.ndarray]]]
) -> dict[str, Any]:
    """``data`` with the numbers at each path replaced by ``change(numbers)``, in order.

    Only the tables on the changed paths are copied; every other table is shared with
    ``data``, so the result is for reading (a model rebuild), not for changing in place.
    ``data`` itself is not changed.
    """
    out = dict(data)
    for path, change in changes:
        parts = path.split(".")
        node: Any = out
        for part in parts[:-1]:
            child = node[part]
            copied = dict(child) if isinstance(child, Mapping) else list(child)
            node[part] = copied
            node = copied
        _replace(node, parts[-1], change)
    return out
