"""``seatool lowfreq``: the modal solution of a box-shaped cavity below the SEA range.

A model file asks for it in a ``[low_frequency.CAVITY]`` table (checked when the model is
loaded, by ``check`` and ``solve`` too, :mod:`seatool.kinds.low_frequency`; used only here)::

    [low_frequency.cab_air]
    dimensions = [2.4, 2.8, 2.1]   # optional if the cavity was given by its dimensions
    up_to = "auto"                 # or the highest band centre solved modally [Hz]
    [low_frequency.cab_air.panels.floor]
    face = "z0"                    # x0, x1, y0, y1, z0, z1: the wall at 0 or at L
    offset = [0.0, 0.0]            # panel corner on the face [m] (default 0, 0)
    force_point = [0.9, 0.8]       # optional: where a force on it acts [m]

The command prints, per band, the level of the cavity and of each panel with the method
that produced it (``modal`` or ``SEA``, see :mod:`seatool.crossover`), writes the merged
table (``--csv``) and the figure of both solutions (``--plot``).
"""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path
from typing import Any

from .errors import InputError, Problem
from .kinds.low_frequency import LowFrequencyRequest, read_low_frequency_section
from .kinds.reader import Reader
from .model import Model

__all__ = ["LowFrequencyRequest", "read_low_frequency"]


def read_low_frequency(
    data: Mapping[str, Any], model: Model, file: str
) -> list[LowFrequencyRequest]:
    """The checked ``[low_frequency]`` tables of a model file (InputError lists every problem).

    The tables are checked by :func:`seatool.kinds.low_frequency.read_low_frequency_section`,
    as when the model is loaded; here a model without any is refused.
    """
    raw = data.get("low_frequency", {})
    if not isinstance(raw, dict) or not raw:
        raise InputError([Problem(file, "low_frequency", "add a [low_frequency.CAVITY] table "
                                  "naming a cavity and its panels")])  # fmt: skip
    rd = Reader(file=file, base_dir=Path("."))
    out = read_low_frequency_section(rd, raw, {s.name: s for s in model.subsystems})
    if rd.problems:
        raise InputError(rd.problems)
    return out
