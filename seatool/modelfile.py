"""Reading and validating model files (TOML, SI units).

The format is described in ``docs/model-format.md``. :func:`load` returns a
:class:`seatool.model.Model` or raises :class:`seatool.errors.InputError` carrying every
problem found, each with the file, the key path (``subsystems.floor.mass``), what is
wrong and, for an unknown name, the closest valid one. Every section is validated here,
``[uncertainty]`` included, for ``check``, ``solve`` and the analyses alike.

The kinds of subsystems, connections, excitations and damping forms are read generically
through the explicit list of :mod:`seatool.kinds.registry`: each table is checked against
its kind's declaration (:func:`seatool.kinds.validate.check`), then the kind's derive
function builds the subsystems or couplings from the validated values.

Why this file is longer than about 600 lines: it is the one place where the sections are
read in order and tied together (bands, fluids, materials, subsystems, facing trims,
connections, excitations, the sections of limits, spreads and low-frequency requests, the
plausibility pass, the load options). Each section's own rules live in ``seatool.kinds``;
splitting the order itself across modules would hide it.
"""

from __future__ import annotations

import tomllib
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import numpy as np

from . import progress
from .bands import BandAxis, BandError
from .errors import InputError, Problem, closest
from .kinds.excitations import NONRESONANT_SUFFIX, diffuse_nonresonant
from .kinds.facing import apply_facing
from .kinds.low_frequency import read_low_frequency_section
from .kinds.media import FLUID_PARAMS
from .kinds.plausibility import check_model
from .kinds.reader import DEFAULT_FLUID, Reader, join, type_name
from .kinds.records import Records
from .kinds.registry import CONNECTION_KINDS, EXCITATION_KINDS, RENAMED, SUBSYSTEM_KINDS
from .kinds.spreads import read_uncertainty_section
from .kinds.validate import (
    check,
    check_derived,
    check_value,
    positive_finite,
    read_material_section,
)
from .model import Connection, Excitation, Model, ModelError, Subsystem
from .targetfile import read_targets

__all__ = [
    "CONNECTION_KINDS",
    "DEFAULT_FLUID",
    "SUBSYSTEM_KINDS",
    "Reader",
    "LoadOptions",
    "build",
    "load",
    "loads",
    "load_options",
    "set_load_options",
]

#: Sections of the study files (design variants, candidate treatments) and the command
#: that reads each, for a clear answer when one is given where a model is expected.
_STUDY_SECTIONS = {"variants": "variants", "surfaces": "lightest"}

_TOP_KEYS = (
    "title",
    "description",
    "bands",
    "fluids",
    "materials",
    "subsystems",
    "connections",
    "excitations",
    "uncertainty",
    "targets",  # noise limits per receiver (seatool.targetfile)
    "low_frequency",  # boxes solved modally below the SEA range (kinds/low_frequency.py)
)

_MISSING = object()
_MIN, _MAX = np.minimum.reduce, np.maximum.reduce

@dataclass(frozen=True)
class LoadOptions:
    """How models are read in this process (the command line sets them for one run).

    Attributes
    ----------
    strict : bool
        Plausibility warnings are errors (the model is refused, exit code 2).
    allow_outside_files : bool
        Spectrum files outside the model file's folder tree may be read.
    on_warnings : callable or None
        Called with the plausibility warnings of every model read (the command line
        prints them on stderr); they are also kept in :attr:`Model.warnings`.
    """

    strict: bool = False
    allow_outside_files: bool = False
    on_warnings: Callable[[Sequence[Problem]], None] | None = None


_OPTIONS = [LoadOptions()]


def load_options() -> LoadOptions:
    """The options models are read with now."""
    return _OPTIONS[0]


def set_load_options(options: LoadOptions) -> LoadOptions:
    """Replace the options models are read with; returns the previous ones."""
    old, _OPTIONS[0] = _OPTIONS[0], options
    return old


#: Deepest nesting of tables and arrays a model file may have (a model needs about 6).
MAX_DEPTH = 32


def _depth(value: Any, limit: int) -> int:
    """Nesting depth of parsed TOML data, counted up to ``limit`` (iterative)."""
    deepest = 1
    level = [value]  # the containers at depth d (scalars count at their own depth only)
    d = 1
    while level:
        nested = []
        for v in level:
            for x in v.values() if isinstance(v, dict) else v if isinstance(v, list) else ():
                if isinstance(x, dict | list):
                    nested.append(x)
                else:
                    deepest = d + 1
        if nested:
            deepest = d + 1
        if deepest > limit:
            return deepest
        level = nested
        d += 1
    return deepest


# ----------------------------------------------------------------------------------------
# Sections


def _read_bands(rd: Reader, data: Any) -> None:
    path = "bands"
    if data is _MISSING:
        rd.error(path, "missing required table [bands] (spacing, lowest, highest)")
        return
    t = rd.table(data, path)
    if t is None:
        return
    # `kind` is the older name of `spacing` and keeps working; `kind` elsewhere in the file
    # names the declared kind that builds an entry.
    if not rd.keys(t, path, ("spacing", "kind", "lowest", "highest"), ("lowest", "highest")):
        return
    if "spacing" in t and "kind" in t:
        rd.error(
            f"{path}.kind",
            "both `spacing` and its older name `kind` are given; keep only `spacing`",
        )
        return
    key = "kind" if "kind" in t else "spacing"
    spacing = t.get(key, "third-octave")
    if spacing not in ("third-octave", "octave"):
        rd.error(
            f"{path}.{key}",
            f"must be 'third-octave' or 'octave', got {spacing!r}"
            + closest(str(spacing), ["third-octave", "octave"]),
        )
        return
    lo = rd.number(t["lowest"], f"{path}.lowest", unit="Hz")
    hi = rd.number(t["highest"], f"{path}.highest", unit="Hz")
    if lo is None or hi is None:
        return
    ok = True
    for key, f in (("lowest", lo), ("highest", hi)):
        if not 20.0 * 0.99 <= f <= 20000.0 * 1.01:
            rd.error(f"{path}.{key}", f"{f:g} Hz is outside 20 Hz - 20 kHz")
            ok = False
    if not ok:
        return
    try:
        rd.bands = BandAxis.from_range(lo, hi, spacing)
    except BandError as exc:
        rd.error(path, str(exc))


def _read_fluids(rd: Reader, data: Any) -> None:
    rd.fluids = {"air": dict(DEFAULT_FLUID)}
    if data is _MISSING:
        return
    t = rd.table(data, "fluids")
    if t is None:
        return
    for name, spec in t.items():
        path = f"fluids.{name}"
        s = rd.table(spec, path)
        if s is None:
            continue
        n = len(rd.problems)
        rd.keys(
            s, path, (*(p.name for p in FLUID_PARAMS), "description"), ("density", "sound_speed")
        )
        vals = {}
        for p in FLUID_PARAMS:
            if p.name in s:
                ok, x = check_value(rd, p, s[p.name], join(path, p.name))
                if ok:
                    vals[p.name] = x
        if "description" in s:
            rd.string(s["description"], join(path, "description"))
        if len(rd.problems) == n:
            rd.fluids[name] = {"density": vals["density"], "sound_speed": vals["sound_speed"]}


def _read_materials(rd: Reader, data: Any) -> None:
    """``[materials.NAME]``: all properties, or ``base = "built-in name"`` plus changes."""
    if data is _MISSING:
        return
    t = rd.table(data, "materials")
    if t is None:
        return
    for name, spec in t.items():
        read_material_section(rd, name, spec)


def _kind_of(
    rd: Reader,
    s: Mapping[str, Any],
    path: str,
    family: str,
    kinds: Mapping[str, Any],
    default: str | None,
) -> Any:
    """The declared kind of a table, or None after one error (unknown, renamed, missing)."""
    if "kind" not in s:
        if default is not None:
            return kinds[default]
        misspelt = [k for k in s if isinstance(k, str) and closest(k, ("kind",))]
        for k in misspelt:  # the other keys can be checked only against a kind
            rd.error(join(path, k), "unknown key" + closest(k, ("kind",)))
        if not misspelt:
            rd.error(f"{path}.kind", "missing required key (one of: " + ", ".join(kinds) + ")")
        return None
    kind = s["kind"]
    renamed = RENAMED.get(family, {})
    if isinstance(kind, str) and kind in renamed:
        rd.error(
            f"{path}.kind",
            f"{kind!r} was renamed to {renamed[kind]!r}; write kind = {renamed[kind]!r}",
        )
        return None
    if not isinstance(kind, str) or kind not in kinds:
        rd.error(
            f"{path}.kind",
            f"unknown {family} kind {kind!r}"
            + (closest(kind, kinds) if isinstance(kind, str) else "")
            + f"; known kinds: {', '.join(kinds)}",
        )
        return None
    return kinds[kind]


@np.errstate(all="ignore")  # derive functions may meet inf/nan; the results are checked
def _read_subsystems(rd: Reader, data: Any, records: Records | None = None) -> list[Subsystem]:
    out: list[Subsystem] = []
    if data is _MISSING:
        rd.error("subsystems", "missing required section [subsystems.NAME]")
        return out
    t = rd.table(data, "subsystems")
    if t is None:
        return out
    if not t:
        rd.error("subsystems", "no subsystems defined")
    made: dict[str, str] = {}
    for name, spec in t.items():
        path = f"subsystems.{name}"
        if not name.strip():
            rd.error(path, "a subsystem needs a non-empty name")
            continue
        s = rd.table(spec, path)
        if s is None:
            continue
        kind = _kind_of(rd, s, path, "subsystem", SUBSYSTEM_KINDS, None)
        if kind is None:
            continue

        def derive(
            _subs: Any, kind: Any = kind, name: str = name, s: Any = s, path: str = path
        ) -> list[Subsystem] | None:
            values = check(rd, kind, s, path)
            if values is None:
                return None
            n = len(rd.problems)
            try:
                got = kind.derive(rd, name, values, s, path)
            except (ValueError, ArithmeticError) as exc:
                rd.error(path, f"cannot derive the subsystem from these values: {exc}")
                return None
            if got is None or len(rd.problems) > n:
                return None
            subs = got if isinstance(got, list) else [got]
            return subs if _derived_ok(rd, subs, path, s) else None

        subs = derive(None) if records is None else records.derive(rd, path, s, derive)
        if subs is None:
            continue
        for sub in subs:
            if sub.name in made or (sub.name != name and sub.name in t):
                other = made.get(sub.name) or f"subsystems.{sub.name}"
                rd.error(
                    path,
                    f"the wave field {sub.name!r} of {name!r} has the name of {other}; "
                    "rename one of them",
                )
                continue
            made[sub.name] = path
            out.append(sub)
    return out


def _derived_ok(rd: Reader, subs: list[Subsystem], path: str, s: Mapping[str, Any]) -> bool:
    """Derived modal densities, masses and volumes must be finite and positive."""
    ok = True
    for sub in subs:
        if sub.sink:
            continue
        if not (
            positive_finite(sub.modal_density)
            and (sub.mass is None or positive_finite(sub.mass))
            and (sub.volume is None or positive_finite(sub.volume))
        ):
            derived: dict[str, Any] = {f"modal density of {sub.name!r}": sub.modal_density}
            if sub.mass is not None:
                derived[f"mass of {sub.name!r}"] = sub.mass
            if sub.volume is not None:
                derived[f"volume of {sub.name!r}"] = sub.volume
            keys = tuple(f"{path}.{k}" for k in s if k not in ("kind", "description", "damping"))
            ok = check_derived(rd, path, derived, keys) and ok
        dm = np.asarray(sub.damping, dtype=float)
        if dm.size and not (_MIN(dm, axis=None) >= 0.0 and _MAX(dm, axis=None) < np.inf):
            rd.error(f"{path}.damping", "the derived damping loss factor is not finite and >= 0")
            ok = False
    return ok


# Connections ----------------------------------------------------------------------------


@np.errstate(all="ignore")  # derive functions may meet inf/nan; the results are checked
def _read_connections(
    rd: Reader,
    data: Any,
    subs: dict[str, Subsystem],
    declared: Mapping[str, None],
    records: Records | None = None,
) -> list[Connection]:
    out: list[Connection] = []
    if data is _MISSING:
        return out
    t = rd.table(data, "connections")
    if t is None:
        return out
    for name, spec in progress.bar(t.items(), desc="deriving connections", total=len(t)):
        path = f"connections.{name}"
        s = rd.table(spec, path)
        if s is None:
            continue
        kind = _kind_of(rd, s, path, "connection", CONNECTION_KINDS, "given")
        if "between" not in s:
            if kind is not None:  # misspelt keys, with the right name, and the missing one
                rd.keys(s, path, kind.allowed, ("between", *kind.required))
            else:
                rd.error(f"{path}.between", "missing required key (two subsystem names)")
            continue
        btw = s["between"]
        if not isinstance(btw, list) or len(btw) < 2:
            rd.error(
                f"{path}.between",
                f"must be an array of at least two subsystem names, got {type_name(btw)}",
            )
            continue
        names = [
            nm
            if isinstance(nm, str) and nm in declared  # the common case: no message to build
            else rd.name_ref(nm, f"{path}.between[{k}]", declared, "subsystem")
            for k, nm in enumerate(btw)
        ]
        if None in names:
            continue
        if len(set(names)) != len(names):
            rd.error(
                f"{path}.between",
                "names the same subsystem twice (a subsystem cannot connect to itself)",
            )
            continue
        if any(n not in subs for n in names):
            continue  # that subsystem had its own problems, already reported
        ends = [subs[n] for n in names if n is not None]
        if sum(e.sink for e in ends) > 1:
            rd.error(f"{path}.between", "two exterior subsystems cannot be connected")
            continue
        if kind is None:
            continue

        def derive(
            seen: Any,
            kind: Any = kind,
            name: str = name,
            s: Any = s,
            path: str = path,
            ends: list[Subsystem] = ends,
        ) -> list[Connection] | None:
            values = check(rd, kind, s, path)
            if values is None:
                return None
            n = len(rd.problems)
            try:
                got = kind.derive(rd, name, values, s, ends, seen, path)
            except (ValueError, ArithmeticError) as exc:
                rd.error(path, f"cannot derive the coupling from these values: {exc}")
                return None
            if got is None or len(rd.problems) > n:
                return None
            cons = got if isinstance(got, list) else [got]
            if all(positive_finite(c.coupling_loss_factor) for c in cons) or all(
                check_derived(
                    rd,
                    path,
                    {f"coupling loss factor of {c.name!r}": c.coupling_loss_factor},
                    tuple(f"{path}.{k}" for k in s if k not in ("kind", "description")),
                )
                for c in cons
            ):
                return cons
            return None

        got = (
            derive(subs)
            if records is None
            else records.derive(rd, path, s, derive, ends=ends, subs=subs)
        )
        if got is not None:
            out.extend(got)
    return out


# Excitations ----------------------------------------------------------------------------


def _declared_nonresonant(data: Any) -> list[tuple[str, str, tuple[str, ...]]]:
    """(name, through, between) of each ``nonresonant`` connection table as written."""
    out: list[tuple[str, str, tuple[str, ...]]] = []
    if not isinstance(data, Mapping):
        return out
    for name, spec in data.items():
        if isinstance(spec, Mapping) and spec.get("kind") == "nonresonant":
            btw = spec.get("between")
            ends = tuple(str(x) for x in btw) if isinstance(btw, list) else ()
            out.append((str(name), str(spec.get("through", "")), ends))
    return out


def _read_excitations(
    rd: Reader,
    data: Any,
    subs: dict[str, Subsystem],
    declared: Mapping[str, None],
    cons: Sequence[Connection] = (),
    raw_connections: Any = _MISSING,
    records: Records | None = None,
) -> list[Excitation]:
    out: list[Excitation] = []
    if data is _MISSING:
        return out
    declared_nr = _declared_nonresonant(raw_connections)
    t = rd.table(data, "excitations")
    if t is None:
        return out
    held: dict[str, str] = {}
    powered: dict[str, str] = {}
    for name, spec in t.items():
        path = f"excitations.{name}"
        s = rd.table(spec, path)
        if s is None:
            continue
        given = [k for k in EXCITATION_KINDS if k in s]
        extra = tuple(p.name for k in given for p in EXCITATION_KINDS[k].params if p.name != k)
        allowed = ("subsystem", "description", *EXCITATION_KINDS, *extra)
        if not rd.keys(s, path, allowed, ("subsystem",)):
            continue
        if len(given) != 1:
            what = "none" if not given else ", ".join(given)
            rd.error(path, f"give exactly one of {', '.join(EXCITATION_KINDS)} (got {what})")
            continue
        key = given[0]
        kind = EXCITATION_KINDS[key]
        sname = rd.name_ref(s["subsystem"], f"{path}.subsystem", declared, "subsystem")
        if sname is None or sname not in subs:
            check(rd, kind, {k: v for k, v in s.items() if k in kind.allowed}, path)
            continue
        sub = subs[sname]
        kpath = f"{path}.{key}"

        def derive(
            _subs: Any, kind: Any = kind, s: Any = s, path: str = path, sub: Subsystem = sub,
            sname: str = sname, key: str = key, kpath: str = kpath,
        ) -> tuple[Any, str, Any] | None:  # fmt: skip
            values = check(rd, kind, {k: v for k, v in s.items() if k in kind.allowed}, path)
            if values is None:
                return None
            if sub.sink:
                rd.error(f"{path}.subsystem", f"{sname!r} is the exterior; it cannot be excited")
                return None
            v = values[key]
            with np.errstate(all="ignore"):
                got = kind.derive(rd, sub, v, kpath, s)
            if got is None:
                return None
            what, arr = got
            if not check_derived(
                rd,
                kpath,
                {"power" if what == "power" else "held energy": np.where(arr == 0, 1.0, arr)},
                (kpath,),
            ):
                return None
            return v, what, arr

        read = (
            derive(None) if records is None else records.derive(rd, path, s, derive, ends=(sub,))
        )
        if read is None:
            continue
        v, what, arr = read
        desc = s.get("description", "")
        desc = desc if isinstance(desc, str) else ""
        if what == "prescribed":
            if sname in held or sname in powered:
                other = held.get(sname) or powered[sname]
                rd.error(
                    kpath,
                    f"{sname!r} already has excitation {other!r}; a prescribed level must be "
                    "the only excitation of its subsystem",
                )
                continue
            held[sname] = name
            out.append(
                Excitation(
                    name, sname, "prescribed", energy=arr, level=v, quantity=key, description=desc
                )
            )
            continue
        if sname in held:
            rd.error(
                kpath,
                f"{sname!r} has the prescribed level {held[sname]!r}; it cannot also take an "
                "input power",
            )
            continue
        powered.setdefault(sname, name)
        out.append(
            Excitation(name, sname, "power", power=arr, level=v, quantity=key, description=desc)
        )
        if key == "diffuse_sound_pressure_level":

            def forced_part(
                seen: Any, sub: Subsystem = sub, v: Any = v, kpath: str = kpath, s: Any = s
            ) -> tuple[str, Any] | None:
                with np.errstate(all="ignore"):
                    return diffuse_nonresonant(rd, sub, v, kpath, s, seen, cons, declared_nr)

            if records is None:
                forced = forced_part(subs)
            else:
                links = tuple((c.kind, c.a, c.b) for c in cons)
                forced = records.derive(
                    rd, f"{path}#nonresonant", s, forced_part, ends=(sub,), subs=subs,
                    extra=(links, declared_nr),
                )  # fmt: skip
            if forced is None:
                continue
            recv, w = forced
            nr_name = name + NONRESONANT_SUFFIX
            if nr_name in t:
                rd.error(
                    path, f"excitation {nr_name!r} exists; rename it or set nonresonant = false"
                )
                continue
            if recv in held:
                rd.error(
                    f"{path}.nonresonant",
                    f"{recv!r} has the prescribed level {held[recv]!r}; it cannot also take the "
                    "non-resonant transmission (set nonresonant = false)",
                )
                continue
            if not check_derived(
                rd, kpath, {"non-resonant power": np.where(w == 0, 1.0, w)}, (kpath,)
            ):
                continue
            powered.setdefault(recv, nr_name)
            out.append(
                Excitation(
                    nr_name, recv, "power", power=w, level=v, quantity=key,
                    description=desc, through=sname,
                )
            )  # fmt: skip
    return out


# ----------------------------------------------------------------------------------------


def loads(
    text: str,
    *,
    file: str = "<string>",
    base_dir: str | Path = ".",
    strict: bool | None = None,
    allow_outside_files: bool | None = None,
) -> Model:
    """Read a model from TOML text. See :func:`load`."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError([Problem(file, "", f"not valid TOML: {exc}")]) from None
    except RecursionError:
        raise InputError([Problem(file, "", f"nested more than {MAX_DEPTH} levels deep")]) from None
    return build(
        data,
        file=file,
        base_dir=base_dir,
        strict=strict,
        allow_outside_files=allow_outside_files,
    )


def _options(strict: bool | None, allow_outside_files: bool | None) -> LoadOptions:
    opts = load_options()
    if strict is not None:
        opts = replace(opts, strict=strict)
    if allow_outside_files is not None:
        opts = replace(opts, allow_outside_files=allow_outside_files)
    return opts


def build(
    data: Mapping[str, Any],
    *,
    file: str = "<data>",
    base_dir: str | Path = ".",
    strict: bool | None = None,
    allow_outside_files: bool | None = None,
    records: Records | None = None,
) -> Model:
    """Validate parsed model-file data (nested dicts as from ``tomllib``) into a Model.

    Used by :func:`loads`, and by analyses that rebuild a model with changed parameters.
    ``strict`` and ``allow_outside_files`` replace those of :func:`load_options` when given.
    ``records`` (:class:`seatool.kinds.records.Records`, the same instance for every build
    of one file) takes over the subsystems, couplings and excitations whose tables and
    inputs are unchanged since the last build instead of deriving them again; the model
    is the same as without it.
    """
    opts = _options(strict, allow_outside_files)
    if _depth(data, MAX_DEPTH) > MAX_DEPTH:
        raise InputError([Problem(file, "", f"nested more than {MAX_DEPTH} levels deep")])
    study = next((k for k in _STUDY_SECTIONS if k in data), None)
    if "base" in data and study is not None:
        msg = (
            f"a study file of {data['base']!r}, not a model file: read it with "
            f"`seatool {_STUDY_SECTIONS[study]} {file}`"
        )
        raise InputError([Problem(file, study, msg)])
    rd = Reader(
        file=file, base_dir=Path(base_dir), allow_outside_files=opts.allow_outside_files
    )
    rd.keys(data, "", _TOP_KEYS)
    title = data.get("title", "")
    if not isinstance(title, str):
        rd.error("title", f"must be a string, got {type_name(title)}")
        title = ""
    if "description" in data:
        rd.string(data["description"], "description")
    _read_bands(rd, data.get("bands", _MISSING))
    if rd.bands is None:
        raise InputError(rd.problems)
    _read_fluids(rd, data.get("fluids", _MISSING))
    _read_materials(rd, data.get("materials", _MISSING))
    raw_subs = data.get("subsystems")
    rd.declared = dict(raw_subs) if isinstance(raw_subs, dict) else {}
    declared = dict.fromkeys(rd.declared)
    if records is not None:
        records.begin(rd, data, opts)
    subs = {s.name: s for s in _read_subsystems(rd, data.get("subsystems", _MISSING), records)}
    if rd.bands is not None:  # facing trims line their cavities
        if records is None:
            subs = apply_facing(rd, subs)
        else:
            subs = dict(
                records.derive(rd, "#facing", None, lambda seen: apply_facing(rd, dict(seen or {})), subs=subs)
            )
    cons = _read_connections(rd, data.get("connections", _MISSING), subs, declared, records)
    exs = _read_excitations(
        rd,
        data.get("excitations", _MISSING),
        subs,
        declared,
        cons,
        data.get("connections", _MISSING),
        records,
    )
    spreads = read_uncertainty_section(rd, data)
    targets = read_targets(rd, data, subs)
    low_frequency = read_low_frequency_section(rd, data, subs)
    if rd.problems:
        raise InputError(rd.problems)
    check_model(rd, subs, data.get("connections"))
    if rd.warnings and opts.strict:
        raise InputError(
            [replace(w, message=w.message + " (--strict: a warning is an error)") for w in rd.warnings]
        )
    if rd.warnings and opts.on_warnings is not None:
        opts.on_warnings(tuple(rd.warnings))
    try:
        return Model(
            bands=rd.bands,
            subsystems=tuple(subs.values()),
            connections=tuple(cons),
            excitations=tuple(exs),
            title=title,
            source=file,
            notes=tuple(rd.notes),
            reports=tuple(rd.reports),
            warnings=tuple(rd.warnings),
            uncertainty=tuple(spreads),
            targets=tuple(targets),
            low_frequency=tuple(low_frequency),
        )
    except ModelError as exc:
        raise InputError([Problem(file, "", str(exc))]) from None


def load(
    path: str | Path, *, strict: bool | None = None, allow_outside_files: bool | None = None
) -> Model:
    """Read and validate a model file.

    Spectrum files are read relative to the model file's folder, only inside its folder
    tree unless ``allow_outside_files``; plausibility warnings are kept in
    :attr:`Model.warnings` (errors if ``strict``). Both default to :func:`load_options`.

    Raises
    ------
    InputError
        Every problem found, one per line (file, key path, what is wrong).
    """
    p = Path(path)
    try:
        raw = p.read_bytes()
    except FileNotFoundError:
        raise InputError([Problem(str(p), "", "file not found")]) from None
    except IsADirectoryError:
        raise InputError(
            [Problem(str(p), "", "is a directory, expected a .toml model file")]
        ) from None
    except OSError as exc:
        raise InputError([Problem(str(p), "", f"cannot read: {exc.strerror}")]) from None
    try:
        text = raw.decode("utf-8-sig")  # tolerate a byte-order mark
    except UnicodeDecodeError:
        raise InputError(
            [Problem(str(p), "", "not a text file (not UTF-8); expected a TOML model file")]
        ) from None
    return loads(
        text,
        file=str(p),
        base_dir=p.parent,
        strict=strict,
        allow_outside_files=allow_outside_files,
    )
