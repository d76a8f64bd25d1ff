"""``seatool lowfreq``: the modal solution of a box-shaped cavity below the SEA range.

A model file asks for it in a ``[low_frequency.CAVITY]`` table (ignored by ``seatool
solve``)::

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
from dataclasses import dataclass
from typing import Any

import numpy as np

from .crossover import PanelPlacement
from .errors import InputError, Problem, closest
from .model import Model
from .physics.modal_box import FACES

__all__ = ["LowFrequencyRequest", "read_low_frequency"]

_KEYS = ("dimensions", "up_to", "panels")
_PANEL_KEYS = ("face", "offset", "force_point")


@dataclass(frozen=True)
class LowFrequencyRequest:
    """One ``[low_frequency.CAVITY]`` table, checked."""

    cavity: str
    dims: tuple[float, float, float] | None
    up_to: float | None
    panels: dict[str, PanelPlacement]


def _numbers(value: Any, n: int) -> list[float] | None:
    if (
        isinstance(value, list)
        and len(value) == n
        and all(isinstance(x, int | float) and not isinstance(x, bool) for x in value)
        and all(np.isfinite(x) and x >= 0 for x in value)
    ):
        return [float(x) for x in value]
    return None


def read_low_frequency(data: Mapping[str, Any], model: Model, file: str) -> list[LowFrequencyRequest]:
    """The checked ``[low_frequency]`` tables of a model file (InputError lists every problem)."""
    raw = data.get("low_frequency", {})
    problems: list[Problem] = []
    out = []
    if not isinstance(raw, dict) or not raw:
        raise InputError([Problem(file, "low_frequency", "add a [low_frequency.CAVITY] table "
                                  "naming a cavity and its panels")])  # fmt: skip
    for name, table in raw.items():
        path = f"low_frequency.{name}"
        if name not in model.names or model.subsystem(name).quantity != "sound_pressure":
            cavities = [s.name for s in model.subsystems if s.quantity == "sound_pressure"]
            problems.append(Problem(file, path, "not a cavity of the model"
                                    + closest(name, cavities)))  # fmt: skip
            continue
        if not isinstance(table, dict):
            problems.append(Problem(file, path, "must be a table"))
            continue
        for k in table:
            if k not in _KEYS:
                problems.append(Problem(file, f"{path}.{k}", "unknown key" + closest(k, _KEYS)))
        dims = None
        if "dimensions" in table:
            d = _numbers(table["dimensions"], 3)
            if d is None or min(d) <= 0:
                problems.append(Problem(file, f"{path}.dimensions",
                                        "give three lengths [m], e.g. [2.4, 2.8, 2.1]"))  # fmt: skip
            else:
                dims = (d[0], d[1], d[2])
        up = table.get("up_to", "auto")
        up_to: float | None = None
        if up != "auto":
            if isinstance(up, int | float) and not isinstance(up, bool) and up > 0:
                up_to = float(up)
            else:
                problems.append(Problem(file, f"{path}.up_to",
                                        "use \"auto\" or a band centre frequency [Hz]"))  # fmt: skip
        panels: dict[str, PanelPlacement] = {}
        raw_panels = table.get("panels", {})
        if not isinstance(raw_panels, dict) or not raw_panels:
            problems.append(Problem(file, f"{path}.panels",
                                    "name at least one panel: [low_frequency.CAVITY.panels.NAME]"))  # fmt: skip
            raw_panels = {}
        for pname, pt in raw_panels.items():
            ppath = f"{path}.panels.{pname}"
            if pname not in model.names:
                problems.append(Problem(file, ppath, "unknown subsystem" + closest(pname, model.names)))
                continue
            if not isinstance(pt, dict):
                problems.append(Problem(file, ppath, "must be a table with face = ..."))
                continue
            for k in pt:
                if k not in _PANEL_KEYS:
                    problems.append(Problem(file, f"{ppath}.{k}", "unknown key" + closest(k, _PANEL_KEYS)))
            face = pt.get("face")
            if face not in FACES:
                problems.append(Problem(file, f"{ppath}.face", f"use one of {', '.join(FACES)}"
                                        + (closest(str(face), FACES) if face else "")))  # fmt: skip
                continue
            off = _numbers(pt.get("offset", [0.0, 0.0]), 2)
            if off is None:
                problems.append(Problem(file, f"{ppath}.offset", "give two distances >= 0 [m]"))
                continue
            fp = None
            if "force_point" in pt:
                fpl = _numbers(pt["force_point"], 2)
                if fpl is None:
                    problems.append(Problem(file, f"{ppath}.force_point",
                                            "give two distances >= 0 [m] on the panel"))  # fmt: skip
                    continue
                fp = (fpl[0], fpl[1])
            panels[pname] = PanelPlacement(face, (off[0], off[1]), fp)
        out.append(LowFrequencyRequest(name, dims, up_to, panels))
    if problems:
        raise InputError(problems)
    return out
