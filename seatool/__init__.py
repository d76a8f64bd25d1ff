"""seatool: statistical energy analysis of built-up vibro-acoustic systems.

Typical use::

    import seatool
    model = seatool.load("models/compressor_enclosure.toml")
    result = seatool.run(model)
    result.table()          # tidy DataFrame: subsystem, band_hz, energy_J, level_dB, ...

Caution: see :data:`seatool.levels.CAUTION`, shown with every level.

Lazy imports
------------
``import seatool`` imports nothing but this file and :mod:`seatool._version`, so that the
command line starts fast. Every public name below is imported on first use by the
module-level :func:`__getattr__` (PEP 562), the package's one lazy-import mechanism:
``seatool.run`` imports :mod:`seatool.results` (and with it numpy, scipy.sparse, pandas)
the first time it is used. The submodules ``analysis``, ``bands``, ``errors``, ``levels``,
``materials``, ``model``, ``modelfile``, ``plot``, ``results``, ``solve`` and ``catalogue``
are reached the same way (``seatool.solve`` is the module; its function is
``seatool.solve.solve``). ``import seatool.solve`` or
``from seatool.analysis.paths import contributions`` import modules directly as usual.
"""

from __future__ import annotations

from types import ModuleType
from typing import TYPE_CHECKING, Any

from ._version import __version__

if TYPE_CHECKING:  # what __getattr__ returns, for type checkers and readers
    from . import analysis as analysis
    from . import bands as bands
    from . import catalogue as catalogue
    from . import errors as errors
    from . import levels as levels
    from . import materials as materials
    from . import model as model
    from . import modelfile as modelfile
    from . import plot as plot
    from . import progress as progress
    from . import report as report
    from . import results as results
    from . import solve as solve
    from .analysis.panel import PanelSpec, panel_table
    from .analysis.paths import connection_powers, contributions, path_ranking, paths
    from .analysis.sensitivity import parameter_sensitivities, ranking, sensitivities
    from .analysis.sweep import sobol_indices, sweep
    from .analysis.uncertainty import spread
    from .bands import BandAxis, a_weighting
    from .errors import InputError
    from .model import Connection, Excitation, Model, Subsystem
    from .modelfile import load, loads
    from .plot import plot_contributions, plot_levels
    from .results import Result, run
    from .solve import SolveError
    from .summary import model_summary

__all__ = [
    "BandAxis",
    "Connection",
    "Excitation",
    "InputError",
    "Model",
    "PanelSpec",
    "Result",
    "SolveError",
    "Subsystem",
    "__version__",
    "a_weighting",
    "connection_powers",
    "contributions",
    "load",
    "loads",
    "model_summary",
    "panel_table",
    "parameter_sensitivities",
    "path_ranking",
    "paths",
    "plot_contributions",
    "plot_levels",
    "ranking",
    "run",
    "sensitivities",
    "sobol_indices",
    "spread",
    "sweep",
]


def _defining_module(name: str) -> ModuleType:
    """The module that is, or defines, public name ``name`` (imported here, on first use)."""
    if name == "analysis":
        import seatool.analysis as analysis

        return analysis
    if name in ("bands", "BandAxis", "a_weighting"):
        import seatool.bands as bands

        return bands
    if name in ("errors", "InputError"):
        import seatool.errors as errors

        return errors
    if name == "materials":
        import seatool.materials as materials

        return materials
    if name == "levels":
        import seatool.levels as levels

        return levels
    if name in ("model", "Connection", "Excitation", "Model", "Subsystem"):
        import seatool.model as model

        return model
    if name in ("modelfile", "load", "loads"):
        import seatool.modelfile as modelfile

        return modelfile
    if name in ("plot", "plot_contributions", "plot_levels"):
        import seatool.plot as plot

        return plot
    if name in ("results", "Result", "run"):
        import seatool.results as results

        return results
    if name in ("solve", "SolveError"):
        import seatool.solve as solve

        return solve
    if name == "lowfreq":
        import seatool.lowfreq as lowfreq

        return lowfreq
    if name == "crossover":
        import seatool.crossover as crossover

        return crossover
    if name == "progress":
        import seatool.progress as progress

        return progress
    if name == "report":
        import seatool.report as report

        return report
    if name == "model_summary":
        import seatool.summary as summary

        return summary
    if name == "catalogue":
        import seatool.catalogue as catalogue

        return catalogue
    if name in ("PanelSpec", "panel_table"):
        import seatool.analysis.panel as panel

        return panel
    if name in ("connection_powers", "contributions", "path_ranking", "paths"):
        import seatool.analysis.paths as paths

        return paths
    if name in ("parameter_sensitivities", "ranking", "sensitivities"):
        import seatool.analysis.sensitivity as sensitivity

        return sensitivity
    if name == "spread":
        import seatool.analysis.uncertainty as uncertainty

        return uncertainty
    if name in ("sobol_indices", "sweep"):
        import seatool.analysis.sweep as sweep

        return sweep
    raise AttributeError(f"module 'seatool' has no attribute {name!r}")


def __getattr__(name: str) -> Any:
    """Import the module defining public name ``name`` on first use (PEP 562).

    The one place in the package where imports are deferred for import speed; each branch
    of :func:`_defining_module` is an ordinary import statement, so the program can be
    followed by reading it.
    """
    mod = _defining_module(name)
    value = mod if mod.__name__ == f"{__name__}.{name}" else getattr(mod, name)
    globals()[name] = value  # later look-ups skip this function
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
