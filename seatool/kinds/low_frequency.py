"""The ``[low_frequency.CAVITY]`` tables: which box cavity and panels to solve modally.

Read at load by :func:`seatool.modelfile.build` (so ``check`` and ``solve`` refuse a bad
table as ``seatool lowfreq`` does) and again by :func:`seatool.lowfreq.read_low_frequency`
for the requests themselves::

    [low_frequency.cab_air]
    dimensions = [2.4, 2.8, 2.1]   # optional if the cavity was given by its dimensions
    up_to = "auto"                 # or the highest band centre solved modally [Hz]
    [low_frequency.cab_air.panels.floor]
    face = "z0"                    # x0, x1, y0, y1, z0, z1: the wall at 0 or at L
    offset = [0.0, 0.0]            # panel corner on the face [m] (default 0, 0)
    force_point = [0.9, 0.8]       # optional: where a force on it acts [m]
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import closest
from ..model import Subsystem
from ..physics.modal_box import FACES
from .reader import Reader

__all__ = ["LowFrequencyRequest", "PanelPlacement", "read_low_frequency_section"]

_KEYS = ("dimensions", "up_to", "panels")
_PANEL_KEYS = ("face", "offset", "force_point")


@dataclass(frozen=True)
class PanelPlacement:
    """Where an SEA panel sits on the box: a face (``x0``... ``z1``) and its corner (u0, v0)
    [m]; ``force_point`` (u, v) [m] is where a power input on it acts (default
    :data:`seatool.crossover.DEFAULT_FORCE_POINT` times its sides)."""

    face: str
    offset: tuple[float, float] = (0.0, 0.0)
    force_point: tuple[float, float] | None = None


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


def read_low_frequency_section(
    rd: Reader,
    raw: Any,
    subs: Mapping[str, Subsystem],
    declared: Mapping[str, Any] | None = None,
) -> list[LowFrequencyRequest]:
    """The ``[low_frequency]`` tables, every problem reported to ``rd``.

    ``subs`` are the model's subsystems; a name in ``declared`` but not in ``subs`` (a
    subsystem whose own problems were reported) is skipped without a second message.
    """
    if not isinstance(raw, dict):
        rd.error("low_frequency", "must be a table of [low_frequency.CAVITY] tables")
        return []
    out = []
    cavities = [n for n, s in subs.items() if s.quantity == "sound_pressure"]
    for name, table in raw.items():
        path = f"low_frequency.{name}"
        if name not in cavities:
            if declared is None or name not in declared or name in subs:
                rd.error(path, "not a cavity of the model" + closest(name, cavities))
            continue
        if not isinstance(table, dict):
            rd.error(path, "must be a table")
            continue
        for k in table:
            if k not in _KEYS:
                rd.error(f"{path}.{k}", "unknown key" + closest(k, _KEYS))
        dims = None
        if "dimensions" in table:
            d = _numbers(table["dimensions"], 3)
            if d is None or min(d) <= 0:
                rd.error(f"{path}.dimensions", "give three lengths [m], e.g. [2.4, 2.8, 2.1]")
            else:
                dims = (d[0], d[1], d[2])
        up = table.get("up_to", "auto")
        up_to: float | None = None
        if up != "auto":
            if isinstance(up, int | float) and not isinstance(up, bool) and up > 0:
                up_to = float(up)
            else:
                rd.error(f"{path}.up_to", 'use "auto" or a band centre frequency [Hz]')
        panels = _panels(rd, table, path, subs, declared or {})
        out.append(LowFrequencyRequest(name, dims, up_to, panels))
    return out


def _panels(
    rd: Reader,
    table: Mapping[str, Any],
    path: str,
    subs: Mapping[str, Subsystem],
    declared: Mapping[str, Any],
) -> dict[str, PanelPlacement]:
    panels: dict[str, PanelPlacement] = {}
    raw_panels = table.get("panels", {})
    if not isinstance(raw_panels, dict) or not raw_panels:
        rd.error(f"{path}.panels", "name at least one panel: [low_frequency.CAVITY.panels.NAME]")
        return panels
    names = list(subs)
    for pname, pt in raw_panels.items():
        ppath = f"{path}.panels.{pname}"
        if pname not in subs:
            if pname not in declared:  # else its own problems were reported
                rd.error(ppath, "unknown subsystem" + closest(pname, names))
            continue
        if not isinstance(pt, dict):
            rd.error(ppath, "must be a table with face = ...")
            continue
        for k in pt:
            if k not in _PANEL_KEYS:
                rd.error(f"{ppath}.{k}", "unknown key" + closest(k, _PANEL_KEYS))
        face = pt.get("face")
        if face not in FACES:
            rd.error(
                f"{ppath}.face",
                f"use one of {', '.join(FACES)}" + (closest(str(face), FACES) if face else ""),
            )
            continue
        off = _numbers(pt.get("offset", [0.0, 0.0]), 2)
        if off is None:
            rd.error(f"{ppath}.offset", "give two distances >= 0 [m]")
            continue
        fp = None
        if "force_point" in pt:
            fpl = _numbers(pt["force_point"], 2)
            if fpl is None:
                rd.error(f"{ppath}.force_point", "give two distances >= 0 [m] on the panel")
                continue
            fp = (fpl[0], fpl[1])
        panels[pname] = PanelPlacement(face, (off[0], off[1]), fp)
    return panels
