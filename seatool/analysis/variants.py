"""Design variants of a base model, solved and shown side by side.

A variant changes the base model's data by key path, without copying the file::

    Variant("thin_floor", {"subsystems.floor.thickness": 0.004})
    Variant("no_trim", {"subsystems.floor.treatment": None})          # remove a key
    Variant("mat", {"subsystems.floor.treatment": {"trim": "spring_mass_5kg", "face": "cab"}})

Every variant (and the base) is rebuilt through :func:`seatool.modelfile.build` (so it is
validated like a file) and solved. :func:`compare` gives tidy tables: the level of each
receiver (overall dB, dB(A), worst band), margins to the targets, added mass per treatment
and in total, and the band-by-band difference to the base; a change raising any band of a
receiver by more than :data:`RAISE_LIMIT_DB` is flagged in words, naming the band and,
where a trim's mass-spring resonance lies within a third of an octave of it, that cause.

A variants file (``variants.toml``) states the base model and the variants::

    base = "rail_cab.toml"
    [variants.heavier_floor]
    description = "8 mm floor"
    set = { "subsystems.floor.thickness" = 0.008 }
    remove = ["subsystems.floor.treatment"]
"""

from __future__ import annotations

import copy
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from ..bands import a_weighting
from ..errors import InputError, Problem, closest
from ..metrics import METRICS
from ..model import Model
from ..modelfile import build
from ..results import Result
from ..solve import solve as core_solve
from ._keypath import read_data
from .targets import margin_table
from .treatment_mass import TreatedSurface, treated_surfaces

__all__ = [
    "RAISE_LIMIT_DB",
    "Comparison",
    "Variant",
    "apply_changes",
    "compare",
    "load_variants",
]

#: A variant raising a receiver band by more than this [dB] is flagged.
RAISE_LIMIT_DB = 1.0
#: A trim resonance within this factor of a band's centre is named as the cause (1/3 octave).
_NEAR = 2.0 ** (1.0 / 3.0)


@dataclass(frozen=True)
class Variant:
    """A named set of changes to the base model's data: key path -> new value (None removes
    the key). Values are what the model file would hold (numbers, strings, tables)."""

    name: str
    changes: Mapping[str, Any] = field(default_factory=dict)
    description: str = ""


def apply_changes(
    data: Mapping[str, Any], changes: Mapping[str, Any], *, file: str = "<data>", where: str = ""
) -> dict[str, Any]:
    """A deep copy of ``data`` with ``changes`` applied (InputError naming a bad key path).

    Every table on the way must exist (the last key may be new, to add e.g. a treatment);
    a removed key must exist.
    """
    out = copy.deepcopy(dict(data))
    problems = []
    for path, value in changes.items():
        parts = path.split(".")
        node: Any = out
        bad = None
        for k, part in enumerate(parts[:-1]):
            if not isinstance(node, dict) or part not in node:
                at = ".".join(parts[:k]) or "the top level"
                keys = list(node) if isinstance(node, dict) else []
                bad = f"no table {part!r} in {at}" + closest(part, keys)
                break
            node = node[part]
        if bad is None and not isinstance(node, dict):
            bad = f"{'.'.join(parts[:-1])} is not a table"
        last = parts[-1]
        if bad is None and value is None and last not in node:
            bad = f"nothing to remove: no key {last!r}" + closest(last, list(node))
        if bad is not None:
            problems.append(Problem(file, f"{where}{path}", bad))
            continue
        if value is None:
            del node[last]
        else:
            node[last] = copy.deepcopy(value)
    if problems:
        raise InputError(problems)
    return out


@dataclass(frozen=True)
class Comparison:
    """Variants solved side by side (``results`` by name, the base first).

    Attributes
    ----------
    levels : DataFrame
        ``variant, receiver, overall_dB, overall_dBA, worst_band_hz, worst_band_dB,
        added_mass_kg``; the worst band is the one with the smallest margin to a band limit
        when the receiver has one, otherwise the loudest A-weighted band.
    margins : DataFrame
        :func:`seatool.analysis.targets.margin_table` of every variant (``variant`` first).
    masses : DataFrame
        ``variant, subsystem, treatment, added_kg, trim_resonance_hz`` per treated plate.
    difference : DataFrame
        ``variant, receiver, band_hz, level_dB, base_dB, difference_dB`` (variant - base).
    flags : list of str
        Every band of a receiver raised by more than :data:`RAISE_LIMIT_DB`, in words.
    """

    results: dict[str, Result]
    levels: pd.DataFrame
    margins: pd.DataFrame
    masses: pd.DataFrame
    difference: pd.DataFrame
    flags: list[str]


def _receivers(model: Model, receivers: Sequence[str] | None) -> list[str]:
    if receivers is not None:
        bad = [r for r in receivers if r not in model.names]
        if bad:
            raise InputError(
                [
                    Problem(
                        model.source,
                        "receivers",
                        f"unknown subsystem {r!r}" + closest(r, model.names),
                    )
                    for r in bad
                ]
            )
        return list(receivers)
    names = [s.name for s in model.subsystems if s.quantity == "sound_pressure" and not s.sink]
    for t in model.targets:
        if t.receiver not in names:
            names.append(t.receiver)
    return names


def _flag(
    name: str,
    receiver: str,
    diff: np.ndarray,
    raised: np.ndarray,
    nominal: np.ndarray,
    centre: np.ndarray,
    surfaces: Sequence[TreatedSurface],
    base_surf: Mapping[str, TreatedSurface],
) -> str:
    """Words for the bands of one receiver a variant raises by more than the limit."""
    k = int(raised[np.argmax(diff[raised])])
    labels = [_hz(float(nominal[j])) for j in raised]
    shown = (
        ", ".join(labels)
        if len(labels) <= 4
        else f"{labels[0]} to {labels[-1]} ({len(labels)} bands)"
    )
    # one phrase per (bands, f0): trims of equal resonance on several plates named together
    groups: dict[tuple[str, str], list[str]] = {}
    for t in surfaces:
        if t.resonance_hz is None:
            continue
        if t.subsystem in base_surf and base_surf[t.subsystem].description == t.description:
            continue  # unchanged treatment
        near = [j for j in raised if 1 / _NEAR <= t.resonance_hz / float(centre[j]) <= _NEAR]
        if near:
            key = (", ".join(_hz(float(nominal[j])) for j in near), f"{t.resonance_hz:.0f}")
            groups.setdefault(key, []).append(t.subsystem)
    causes = [
        f"at {bands} near the mass-spring resonance f0 = {f0} Hz of the "
        + (f"trim on {subs[0]}" if len(subs) == 1 else f"trims on {', '.join(subs)}")
        for (bands, f0), subs in groups.items()
    ]
    cause = f"; {'; '.join(causes)}" if causes else ""
    return (
        f"variant {name} raises {receiver} by more than {RAISE_LIMIT_DB:g} dB in {shown} "
        f"(most {diff[k]:.1f} dB at {_hz(float(nominal[k]))}{cause})"
    )


def _hz(f: float) -> str:
    return f"{f / 1000:g} kHz" if f >= 1000 else f"{f:g} Hz"


def compare(
    data: Mapping[str, Any],
    variants: Sequence[Variant],
    *,
    file: str = "<data>",
    base_dir: str | Path = ".",
    receivers: Sequence[str] | None = None,
) -> Comparison:
    """Solve the base model ``data`` and each variant; tables side by side (see
    :class:`Comparison`)."""
    names = [v.name for v in variants]
    if "base" in names or len(set(names)) != len(names):
        raise InputError([Problem(file, "variants", "variant names must be unique and not 'base'")])
    models = {"base": build(data, file=file, base_dir=base_dir)}
    for v in variants:
        d = apply_changes(data, v.changes, file=file, where=f"variants.{v.name}: ")
        models[v.name] = build(d, file=f"{file} (variant {v.name})", base_dir=base_dir)
    results = {k: Result(m, core_solve(m)) for k, m in models.items()}
    base = results["base"]
    recs = _receivers(base.model, receivers)
    bands = base.model.bands
    level_rows = []
    margin_tables = []
    mass_rows = []
    diff_rows = []
    flags = []
    base_lv = {r: base.level_array()[0][base.model.index()[r]] for r in recs}
    base_surf = {t.subsystem: t for t in treated_surfaces(base.model)}
    for name, res in results.items():
        m = res.model
        lv_all, _, _ = res.level_array()
        idx = m.index()
        surfaces = treated_surfaces(m)
        total = sum(t.added_kg for t in surfaces)
        mt = margin_table(res)
        mt.insert(0, "variant", name)
        margin_tables.append(mt)
        for t in surfaces:
            mass_rows.append((name, t.subsystem, t.description, t.added_kg, t.resonance_hz))
        for r in recs:
            if r not in idx:
                continue
            lv = np.asarray(lv_all[idx[r]], dtype=float)
            band_m = mt[(mt["receiver"] == r) & (mt["limit_on"] == "band")]
            if len(band_m):
                w = band_m.iloc[int(np.argmin(band_m["margin"].to_numpy()))]
                worst_hz = float(w["band_hz"])
            else:
                sound = m.subsystem(r).quantity == "sound_pressure"
                weighted = lv + a_weighting(bands.centre) if sound else lv
                worst_hz = float(bands.nominal[int(np.argmax(weighted))])
            k_w = int(np.flatnonzero(bands.nominal == worst_hz)[0])
            sound = m.subsystem(r).quantity == "sound_pressure"
            level_rows.append(
                (
                    name,
                    r,
                    float(METRICS["dB"](lv, bands).value),
                    float(METRICS["dBA"](lv, bands).value) if sound else np.nan,
                    worst_hz,
                    float(lv[k_w]),
                    total,
                )
            )
            diff = lv - base_lv[r]
            for k in range(len(bands)):
                diff_rows.append((name, r, float(bands.nominal[k]), lv[k], base_lv[r][k], diff[k]))
            if name == "base":
                continue
            raised = np.flatnonzero(diff > RAISE_LIMIT_DB)
            if raised.size:
                flags.append(
                    _flag(name, r, diff, raised, bands.nominal, bands.centre, surfaces, base_surf)
                )
    levels_df = pd.DataFrame(
        level_rows,
        columns=[
            "variant", "receiver", "overall_dB", "overall_dBA",
            "worst_band_hz", "worst_band_dB", "added_mass_kg",
        ],
    )  # fmt: skip
    masses = pd.DataFrame(
        mass_rows, columns=["variant", "subsystem", "treatment", "added_kg", "trim_resonance_hz"]
    )
    difference = pd.DataFrame(
        diff_rows,
        columns=["variant", "receiver", "band_hz", "level_dB", "base_dB", "difference_dB"],
    )
    margins = pd.concat(margin_tables, ignore_index=True)
    return Comparison(results, levels_df, margins, masses, difference, flags)


def load_variants(path: str | Path) -> tuple[dict[str, Any], str, Path, list[Variant]]:
    """Read a variants file: the base model's data, its file name and folder, the variants.

    Keys: ``base`` (the model file, relative to the variants file) and ``[variants.NAME]``
    with ``description``, ``set`` (a table of key path -> value) and ``remove`` (key paths).
    """
    raw, file, folder = read_data(path)
    problems = []
    for k in raw:
        if k not in ("base", "variants"):
            problems.append(Problem(file, k, "unknown key" + closest(k, ["base", "variants"])))
    base = raw.get("base")
    if not isinstance(base, str):
        problems.append(Problem(file, "base", "must name the base model file (a string)"))
    section = raw.get("variants", {})
    if not isinstance(section, dict) or not section:
        problems.append(Problem(file, "variants", "give at least one [variants.NAME] table"))
        section = {}
    out = []
    for name, spec in section.items():
        p = f"variants.{name}"
        if not isinstance(spec, dict):
            problems.append(Problem(file, p, "must be a table"))
            continue
        for k in spec:
            if k not in ("description", "set", "remove"):
                problems.append(
                    Problem(
                        file,
                        f"{p}.{k}",
                        "unknown key" + closest(k, ["description", "set", "remove"]),
                    )
                )
        sets = spec.get("set", {})
        rem = spec.get("remove", [])
        if not isinstance(sets, dict):
            problems.append(Problem(file, f"{p}.set", "must be a table of key path = value"))
            sets = {}
        if not isinstance(rem, list) or not all(isinstance(x, str) for x in rem):
            problems.append(Problem(file, f"{p}.remove", "must be an array of key paths"))
            rem = []
        changes: dict[str, Any] = {**sets, **dict.fromkeys(rem)}
        out.append(Variant(name, changes, str(spec.get("description", ""))))
    if problems:
        raise InputError(problems)
    assert isinstance(base, str)
    data, bfile, bfolder = read_data(folder / base)
    return data, bfile, bfolder, out
