"""The ``[targets.NAME]`` section of a model file: noise limits per receiver, read at load.

Each table names a receiver subsystem and gives one or more limits::

    [targets.driver]
    receiver = "cab_air"
    limit_dBA = 72.0                                   # overall A-weighted level
    limit_per_band = { csv = "limits.csv", column = "driver" }   # or a number or a table
    description = "driver's ear, full load"

``limit_<metric>`` exists for every metric of :data:`seatool.metrics.METRICS` (``dB``,
``dBA``, ``dBC``, ``SIL``, ``sone``, ``phon``); metric limits need a cavity (a sound
pressure level). ``limit_per_band`` is a spectrum like any other of the file (number,
``{ band_hz, values }`` or ``{ csv, column }``) in dB with the receiver level's reference.
The result is :attr:`seatool.model.Model.targets`; margins and verdicts are in
:mod:`seatool.analysis.targets`. Kept small and free of the other readers so that it can
move into the declaration-driven kinds when they land.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import TYPE_CHECKING, Any

from .metrics import METRICS
from .model import Subsystem, Target

if TYPE_CHECKING:  # the reader imports this module
    from .modelfile import Reader

__all__ = ["LIMIT_KEYS", "read_targets"]

#: Model-file key of each metric limit -> metric name.
LIMIT_KEYS: dict[str, str] = {f"limit_{name}": name for name in METRICS}
_BAND_KEY = "limit_per_band"
_KEYS = ("receiver", *LIMIT_KEYS, _BAND_KEY, "description")
#: Metrics whose value is a positive quantity (not a level in dB).
_POSITIVE = {"sone"}


def read_targets(
    rd: Reader, data: Mapping[str, Any], subs: Mapping[str, Subsystem]
) -> list[Target]:
    """The ``[targets.NAME]`` tables of parsed model data; problems go to ``rd``.

    ``subs`` are the subsystems read so far (a receiver must be one of them; a receiver
    whose own table had problems is not reported again).
    """
    out: list[Target] = []
    section = data.get("targets")
    if section is None:
        return out
    t = rd.table(section, "targets")
    if t is None:
        return out
    known = {**dict.fromkeys(rd.declared), **dict.fromkeys(subs)}
    for name, spec in t.items():
        path = f"targets.{name}"
        s = rd.table(spec, path)
        if s is None:
            continue
        if not rd.keys(s, path, _KEYS, ("receiver",)):
            continue
        before = len(rd.problems)
        receiver = rd.name_ref(s["receiver"], f"{path}.receiver", known, "subsystem")
        limits: dict[str, float] = {}
        for key, metric in LIMIT_KEYS.items():
            if key in s:
                x = rd.number(
                    s[key],
                    f"{path}.{key}",
                    unit=metric,
                    minimum=0.0 if metric in _POSITIVE else None,
                )
                if x is not None:
                    limits[metric] = x
        band = None
        if _BAND_KEY in s:
            band = rd.spectrum(s[_BAND_KEY], f"{path}.{_BAND_KEY}", unit="dB", minimum=None)
        if "description" in s:
            rd.string(s["description"], f"{path}.description")
        if not any(k in s for k in (*LIMIT_KEYS, _BAND_KEY)):
            rd.error(
                path,
                "no limit given; state limit_dBA (or another limit_<metric>: "
                + ", ".join(LIMIT_KEYS)
                + ") and/or limit_per_band",
            )
        if receiver is not None and receiver in subs:
            sub = subs[receiver]
            if sub.sink:
                rd.error(f"{path}.receiver", f"{receiver!r} is the exterior sink and has no level")
            elif limits and sub.quantity != "sound_pressure":
                rd.error(
                    f"{path}.receiver",
                    f"{receiver!r} has a {sub.quantity} level; limit_{next(iter(limits))} needs "
                    "a cavity (sound pressure); give limit_per_band for a structure",
                )
        if len(rd.problems) > before or receiver is None or receiver not in subs:
            continue
        desc = s.get("description", "")
        out.append(Target(name, receiver, limits, band, desc if isinstance(desc, str) else ""))
    return out
