"""Analyses of solved models: the panel table, contributions and paths, sensitivities,
uncertainty, comfort metrics.

These modules only read models and results; they never change a model. Every table
they return is a tidy pandas DataFrame; the tables of a receiver carry its per-band
validity indicators (modes in band, modal overlap).

Lazy imports
------------
``import seatool.analysis`` imports nothing but this file: each submodule below (and
``read_data``, ``receiver_index``) is imported on first use by the module-level
:func:`__getattr__` (PEP 562), the same mechanism as :mod:`seatool`'s, so that a command
or a plot that needs one analysis does not pay for the others (scipy.stats, networkx,
SALib, dask). ``from seatool.analysis import paths`` and ``seatool.analysis.paths`` work
as usual.
"""

from __future__ import annotations

from types import ModuleType
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:  # what __getattr__ returns, for type checkers and readers
    from . import candidates as candidates
    from . import comfort as comfort
    from . import confidence as confidence
    from . import lightest as lightest
    from . import measured as measured
    from . import panel as panel
    from . import paths as paths
    from . import rating as rating
    from . import sensitivity as sensitivity
    from . import sweep as sweep
    from . import sweep_run as sweep_run
    from . import targets as targets
    from . import uncertainty as uncertainty
    from . import variants as variants
    from ._keypath import read_data
    from ._system import receiver_index

__all__ = [
    "candidates",
    "comfort",
    "confidence",
    "lightest",
    "measured",
    "panel",
    "paths",
    "rating",
    "read_data",
    "receiver_index",
    "sensitivity",
    "sweep",
    "sweep_run",
    "targets",
    "uncertainty",
    "variants",
]


def _defining_module(name: str) -> ModuleType:
    """The module that is, or defines, public name ``name`` (imported here, on first use)."""
    if name == "candidates":
        import seatool.analysis.candidates as candidates

        return candidates
    if name == "comfort":
        import seatool.analysis.comfort as comfort

        return comfort
    if name == "confidence":
        import seatool.analysis.confidence as confidence

        return confidence
    if name == "lightest":
        import seatool.analysis.lightest as lightest

        return lightest
    if name == "measured":
        import seatool.analysis.measured as measured

        return measured
    if name == "panel":
        import seatool.analysis.panel as panel

        return panel
    if name == "paths":
        import seatool.analysis.paths as paths

        return paths
    if name == "rating":
        import seatool.analysis.rating as rating

        return rating
    if name == "sensitivity":
        import seatool.analysis.sensitivity as sensitivity

        return sensitivity
    if name == "sweep":
        import seatool.analysis.sweep as sweep

        return sweep
    if name == "sweep_run":
        import seatool.analysis.sweep_run as sweep_run

        return sweep_run
    if name == "targets":
        import seatool.analysis.targets as targets

        return targets
    if name == "uncertainty":
        import seatool.analysis.uncertainty as uncertainty

        return uncertainty
    if name == "variants":
        import seatool.analysis.variants as variants

        return variants
    if name == "read_data":
        import seatool.analysis._keypath as _keypath

        return _keypath
    if name == "receiver_index":
        import seatool.analysis._system as _system

        return _system
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def __getattr__(name: str) -> Any:
    """Import the module defining public name ``name`` on first use (PEP 562)."""
    mod = _defining_module(name)
    value = mod if mod.__name__ == f"{__name__}.{name}" else getattr(mod, name)
    globals()[name] = value  # later look-ups skip this function
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
