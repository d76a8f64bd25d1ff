"""Candidates files of the lightest-treatment search (``seatool lightest FILE``).

``base`` names the model file (relative to the candidates file); ``objective`` (``mass``
or ``cost``) and ``cost_per_kg`` are optional; ``[surfaces.SURFACE.OPTION]`` tables give
each option's ``set`` (key path = value), ``remove`` (key paths), ``cost`` and
``description`` (``docs/model-format.md``, section "Study files").
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from ..errors import InputError, Problem, closest
from ._keypath import read_data
from .lightest import Option, Surface

__all__ = ["load_candidates"]


_OPTION_KEYS = ("description", "set", "remove", "cost")


def load_candidates(
    path: str | Path,
) -> tuple[dict[str, Any], str, Path, list[Surface], dict[str, Any]]:
    """Read a candidates file: base model data, its file and folder, the surfaces, settings.

    Keys: ``base`` (the model file, relative to this file), optional ``objective``
    (``mass`` or ``cost``) and ``cost_per_kg``, and ``[surfaces.SURFACE.OPTION]`` tables
    with ``set`` (key path = value), ``remove`` (key paths), ``cost`` and ``description``.
    """
    raw, file, folder = read_data(path)
    problems = []
    top = ("base", "objective", "cost_per_kg", "surfaces")
    for k in raw:
        if k not in top:
            problems.append(Problem(file, k, "unknown key" + closest(k, top)))
    base = raw.get("base")
    if not isinstance(base, str):
        problems.append(Problem(file, "base", "must name the base model file (a string)"))
    settings: dict[str, Any] = {}
    obj = raw.get("objective", "mass")
    if obj not in ("mass", "cost"):
        problems.append(Problem(file, "objective", f"must be 'mass' or 'cost', got {obj!r}"))
    settings["objective"] = obj
    cpk = raw.get("cost_per_kg")
    if cpk is not None and (isinstance(cpk, bool) or not isinstance(cpk, int | float) or cpk < 0):
        problems.append(Problem(file, "cost_per_kg", "must be a number >= 0"))
    settings["cost_per_kg"] = cpk
    section = raw.get("surfaces")
    surfaces: list[Surface] = []
    if not isinstance(section, dict) or not section:
        problems.append(Problem(file, "surfaces", "give [surfaces.SURFACE.OPTION] tables"))
        section = {}
    for sname, opts in section.items():
        if not isinstance(opts, dict) or not opts:
            problems.append(Problem(file, f"surfaces.{sname}", "give at least one option table"))
            continue
        options = []
        for oname, spec in opts.items():
            p = f"surfaces.{sname}.{oname}"
            if not isinstance(spec, dict):
                problems.append(Problem(file, p, "must be a table"))
                continue
            for k in spec:
                if k not in _OPTION_KEYS:
                    problems.append(
                        Problem(file, f"{p}.{k}", "unknown key" + closest(k, _OPTION_KEYS))
                    )
            sets, rem, cost = spec.get("set", {}), spec.get("remove", []), spec.get("cost")
            if not isinstance(sets, dict):
                problems.append(Problem(file, f"{p}.set", "must be a table of key path = value"))
                sets = {}
            if not isinstance(rem, list) or not all(isinstance(x, str) for x in rem):
                problems.append(Problem(file, f"{p}.remove", "must be an array of key paths"))
                rem = []
            if cost is not None and (isinstance(cost, bool) or not isinstance(cost, int | float)):
                problems.append(Problem(file, f"{p}.cost", "must be a number"))
                cost = None
            options.append(Option(oname, {**sets, **dict.fromkeys(rem)}, cost))
        surfaces.append(Surface(sname, options))
    if problems:
        raise InputError(problems)
    assert isinstance(base, str)
    data, bfile, bfolder = read_data(folder / base)
    return data, bfile, bfolder, surfaces, settings
