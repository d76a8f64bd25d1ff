"""seatool: statistical energy analysis of built-up vibro-acoustic systems.

Predictions guide design; they do not certify. Verify by measurement to the
applicable standards; hearing-protection and occupational-exposure decisions
follow local regulations and qualified professionals.

Typical use::

    import seatool
    model = seatool.load("models/generator_enclosure.toml")
    result = seatool.run(model)
    result.table()          # tidy DataFrame: subsystem, band_hz, energy_J, level_dB, ...
"""

from __future__ import annotations

from .bands import BandAxis, a_weighting
from .errors import InputError
from .model import Connection, Excitation, Model, Subsystem
from .modelfile import load, loads
from .results import Result
from .solve import SolveError, solve

__version__ = "0.1.0"

__all__ = [
    "BandAxis",
    "Connection",
    "Excitation",
    "InputError",
    "Model",
    "Result",
    "SolveError",
    "Subsystem",
    "a_weighting",
    "load",
    "loads",
    "run",
]


def run(model: Model) -> Result:
    """Solve ``model`` in every band and return a :class:`Result` (the model is not changed)."""
    return Result(model, solve(model))
