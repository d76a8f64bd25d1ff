"""Analyses of solved models: contributions and paths, sensitivities, uncertainty.

These modules only read models and results; they never change a model. Every table
they return is a tidy pandas DataFrame and carries the receiver's per-band validity
indicators (modes in band, modal overlap).
"""

from __future__ import annotations

__all__ = ["paths", "sensitivity", "uncertainty"]
