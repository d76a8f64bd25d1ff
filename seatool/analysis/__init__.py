"""Analyses of solved models: the panel table, contributions and paths, sensitivities,
uncertainty, comfort metrics.

These modules only read models and results; they never change a model. Every table
they return is a tidy pandas DataFrame; the tables of a receiver carry its per-band
validity indicators (modes in band, modal overlap).
"""

from __future__ import annotations

from . import (
    candidates,
    comfort,
    confidence,
    lightest,
    measured,
    panel,
    paths,
    rating,
    sensitivity,
    sweep,
    sweep_run,
    targets,
    uncertainty,
    variants,
)
from ._keypath import read_data
from ._system import receiver_index

__all__ = ["candidates", "comfort", "lightest", "variants", "confidence", "measured", "panel", "paths", "rating", "read_data", "receiver_index", "sensitivity", "sweep", "sweep_run", "targets", "uncertainty"]
