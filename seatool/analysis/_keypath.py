"""Key paths into parsed model-file data (``subsystems.floor.thickness``).

A key path names a value of the model file: a number, a spectrum table
``{ band_hz, values }`` or an array of numbers. Analyses change copies of the data
(never the original) and rebuild the model with :func:`seatool.modelfile.build`.
"""

from __future__ import annotations

import copy
import tomllib
from collections.abc import Callable, Mapping
from pathlib import Path
from typing import Any

import numpy as np

from ..errors import InputError, Problem, closest


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


def resolve(data: Mapping[str, Any], path: str) -> tuple[Any, str | None]:
    """The value at ``path``, or (None, message) naming the closest key where it fails."""
    parts = path.split(".")
    node: Any = data
    for k, part in enumerate(parts):
        if not isinstance(node, Mapping):
            where = ".".join(parts[:k])
            return None, f"{where} is not a table, so it has no key {part!r}"
        if part not in node:
            where = ".".join(parts[:k]) or "the top level"
            return None, f"no key {part!r} in {where}" + closest(part, [str(x) for x in node])
        node = node[part]
    if isinstance(node, bool):
        return None, "is a boolean, not a number or spectrum"
    if isinstance(node, int | float):
        return node, None
    if isinstance(node, list) and node and all(
        isinstance(v, int | float) and not isinstance(v, bool) for v in node
    ):
        return node, None
    if isinstance(node, Mapping):
        if "csv" in node:
            return None, "is a CSV spectrum; give the values inline ({ band_hz, values }) to vary it"
        vals = node.get("values")
        if isinstance(vals, list) and vals and all(
            isinstance(v, int | float) and not isinstance(v, bool) for v in vals
        ):
            return node, None
    return None, "is not a number, an array of numbers or a { band_hz, values } spectrum"


def numbers(value: Any) -> np.ndarray:
    """The numbers of a resolved value (scalar, array, or spectrum values) as an array."""
    if isinstance(value, Mapping):
        return np.asarray(value["values"], dtype=float)
    return np.asarray(value, dtype=float)


def with_value(
    data: Mapping[str, Any], path: str, change: Callable[[np.ndarray], np.ndarray]
) -> dict[str, Any]:
    """A deep copy of ``data`` with the numbers at ``path`` replaced by ``change(numbers)``."""
    out = copy.deepcopy(dict(data))
    parts = path.split(".")
    node: Any = out
    for part in parts[:-1]:
        node = node[part]
    last = parts[-1]
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
    return out
