"""Remembering the results of expensive pure physics functions.

Deriving a model's couplings integrates some quantities numerically (line-junction
transmission over angles, curved-panel radiation over the wavenumber plane). A model often
asks the same question twice (two identical junctions; one panel radiating into two
fluids of the same properties), and a parameter study rebuilds a model many times with
most inputs unchanged. :func:`memoised` remembers the last results of a pure function by
the values of its arguments; :func:`clear` forgets all of them (e.g. to time a first
load).

Arguments are keyed by value: numbers, strings, ``None`` and hashable frozen dataclasses
as they are, numpy arrays by dtype, shape and bytes, lists and tuples
element by element. A call with any other argument is simply not remembered. Results are
handed out as fresh copies (arrays, and tuples of arrays), so a caller that changes a
returned array does not change what the next caller gets.
"""

from __future__ import annotations

import functools
import threading
from collections import OrderedDict
from collections.abc import Callable, Hashable
from typing import Any, ParamSpec, TypeVar

import numpy as np

__all__ = ["clear", "memoised"]

P = ParamSpec("P")
R = TypeVar("R")

_CACHES: list[OrderedDict[Hashable, Any]] = []
_LOCK = threading.Lock()


class _Unkeyable(Exception):
    """An argument that cannot be keyed by value."""


def _key(value: Any) -> Hashable:
    if isinstance(value, np.ndarray):
        return ("nd", value.dtype.str, value.shape, value.tobytes())
    if isinstance(value, list | tuple):
        return (type(value).__name__, *(_key(v) for v in value))
    if isinstance(value, dict):
        return ("dict", *((k, _key(v)) for k, v in sorted(value.items())))
    if value is None or isinstance(value, int | float | complex | str | bytes | np.generic):
        return (type(value).__name__, value)
    params = getattr(type(value), "__dataclass_params__", None)
    if params is not None and params.frozen:
        try:
            hash(value)
        except TypeError:  # a frozen dataclass holding arrays or lists
            raise _Unkeyable from None
        return (type(value).__qualname__, value)
    raise _Unkeyable


def _copy(value: Any) -> Any:
    if isinstance(value, np.ndarray):
        return value.copy()
    if isinstance(value, tuple):
        return (
            type(value)(*(_copy(v) for v in value))
            if hasattr(value, "_fields")
            else tuple(_copy(v) for v in value)
        )
    return value


def memoised(maxsize: int = 256) -> Callable[[Callable[P, R]], Callable[P, R]]:
    """Decorator: remember the last ``maxsize`` results of a pure function by argument value.

    Parameters
    ----------
    maxsize : int
        Number of distinct calls remembered (least recently used forgotten first).

    Returns
    -------
    callable
        The decorator. The wrapped function behaves as the original (same signature, same
        results, same exceptions; failed calls are not remembered).
    """

    def decorate(fn: Callable[P, R]) -> Callable[P, R]:
        cache: OrderedDict[Hashable, Any] = OrderedDict()
        _CACHES.append(cache)

        @functools.wraps(fn)
        def wrapper(*args: P.args, **kwargs: P.kwargs) -> R:
            try:
                key = (_key(args), _key(kwargs))
            except _Unkeyable:
                return fn(*args, **kwargs)
            with _LOCK:
                hit = key in cache
                if hit:
                    cache.move_to_end(key)
                    stored = cache[key]
            if hit:
                return _copy(stored)
            out = fn(*args, **kwargs)
            with _LOCK:
                cache[key] = _copy(out)
                while len(cache) > maxsize:
                    cache.popitem(last=False)
            return out

        return wrapper

    return decorate


def clear() -> None:
    """Forget every remembered result."""
    with _LOCK:
        for cache in _CACHES:
            cache.clear()
