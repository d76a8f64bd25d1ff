"""Generic validation driven by the declarations of :mod:`seatool.kinds.params`.

:func:`check` validates one table against a :class:`~seatool.kinds.params.Kind`;
:func:`check_value` one value against a :class:`~seatool.kinds.params.Param`;
:func:`check_derived` the quantities a kind derives (finite and positive, or an error that
names the user's key paths). Materials and fluids are read here by the one schema of
:mod:`seatool.kinds.media`: by name, first among the model's own ``[materials.NAME]`` /
``[fluids.NAME]`` entries (a user entry replaces a built-in one of the same name as a
whole), then among the built-in tables; a ``material`` may also be an inline table
``{ base = "steel", loss_factor = 0.01 }``.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import replace
from typing import Any

import numpy as np
import numpy.typing as npt

from ..errors import closest
from ..properties import FluidProps, MaterialProps
from .media import MATERIAL_PARAMS, MATERIAL_VALUES, builtin_fluids, builtin_materials
from .params import RAW_TYPES, Kind, Param
from .reader import DEFAULT_FLUID, Reader, join, unit_text

__all__ = [
    "check",
    "check_derived",
    "check_value",
    "default_fluid",
    "positive_finite",
    "read_fluid",
    "read_material",
]

Array = npt.NDArray[np.float64]

_MATERIAL = {p.name: p for p in MATERIAL_PARAMS}



def _bounds(rd: Reader, p: Param, x: float, path: str) -> bool:
    if p.maximum is not None:
        over = x >= p.maximum if p.strict_max else x > p.maximum
        if over:
            op = "<" if p.strict_max else "<="
            rd.error(path, f"must be {op} {p.maximum:g}{unit_text(p.unit)}, got {x:g}")
            return False
    if p.bounds is None:
        return True
    lo, hi = p.bounds
    if lo <= x <= hi:
        return True
    hint = ""
    if p.unit == "m" and x > hi and lo <= x / 1000.0 <= hi:
        hint = f"; is it in millimetres? ({x:g} mm = {x / 1000.0:g} m)"
    rd.error(
        path,
        f"{x:g}{unit_text(p.unit)} is outside the physical bounds {lo:g} .. {hi:g}"
        f"{unit_text(p.unit)} ({p.basis}){hint}",
    )
    return False


def _within(p: Param, arr: Array) -> bool:
    """True if every value of ``arr`` passes :func:`_bounds` (one check for the array)."""
    if p.maximum is None and p.bounds is None:
        return True
    if not arr.size:
        return True
    lo, hi = float(arr.min()), float(arr.max())
    if p.maximum is not None and (hi >= p.maximum if p.strict_max else hi > p.maximum):
        return False
    return p.bounds is None or (p.bounds[0] <= lo and hi <= p.bounds[1])


#: Why a value outside a parameter's typical range matters, unless the parameter says.
WHY_TYPICAL = "often a wrong unit or a slipped digit; the results would describe another design"


def _typical(rd: Reader, p: Param, values: Any, path: str) -> None:
    """A plausibility warning if any value lies outside ``p.typical`` (never an error)."""
    if p.typical is None:
        return
    lo, hi = p.typical
    if isinstance(values, float) and lo <= values <= hi:
        return
    arr = np.asarray(values, dtype=float).ravel()
    out = arr[(arr < lo) | (arr > hi)]
    if not out.size:
        return
    shown = f"{out[0]:g}" if np.all(out == out[0]) else f"{out.min():g} .. {out.max():g}"
    u = unit_text(p.unit)
    rd.warn(
        path,
        f"{shown}{u} is outside the typical range {lo:g} .. {hi:g}{u} ({p.basis}): "
        f"{p.why or WHY_TYPICAL}",
    )


def check_value(rd: Reader, p: Param, value: Any, path: str) -> tuple[bool, Any]:
    """Validate one value against its declaration: ``(ok, value)``.

    A value inside the bounds but outside the typical range is accepted with a
    plausibility warning (:meth:`Reader.warn`).
    """
    t = p.type
    if t in RAW_TYPES:
        return True, value
    if t == "number":
        x = rd.number(value, path, unit=p.unit, minimum=p.minimum, strict=p.strict)
        if x is None or not _bounds(rd, p, x, path):
            return False, None
        _typical(rd, p, x, path)
        return True, x
    if t == "number_or_auto":
        if value == "auto":
            return True, None
        if not is_number(value):
            rd.error(path, f'use "auto" or a number{unit_text(p.unit)}, got {value!r}')
            return False, None
        return check_value(rd, replace(p, type="number"), value, path)
    if t == "numbers":
        n = p.length
        if not isinstance(value, list) or (n is not None and len(value) != n):
            what = f"{n} numbers" if n is not None else "numbers"
            rd.error(path, f"must be an array of {what}{unit_text(p.unit)}, got {value!r}")
            return False, None
        out = []
        for i, v in enumerate(value):
            ok, x = check_value(rd, replace(p, type="number"), v, f"{path}[{i}]")
            if not ok:
                return False, None
            out.append(x)
        return True, tuple(out)
    if t == "spectrum":
        if is_number(value) and rd.bands is not None:  # one value for every band
            x = rd.number(value, path, unit=p.unit, minimum=p.minimum, strict=p.strict)
            if x is None or not _bounds(rd, p, x, path):
                return False, None
            _typical(rd, p, x, path)
            return True, rd.constant_spectrum(x)
        arr = rd.spectrum(value, path, unit=p.unit, minimum=p.minimum, strict=p.strict)
        if arr is None:
            return False, None
        if not _within(p, arr):  # the first value outside, with its own message
            for x in np.asarray(arr).ravel():
                if not _bounds(rd, p, float(x), path):
                    return False, None
        _typical(rd, p, arr, path)
        return True, arr
    if t == "integer":
        lo = int(p.minimum) if p.minimum is not None else 1
        if isinstance(value, bool) or not isinstance(value, int) or value < lo:
            rd.error(path, f"must be a whole number >= {lo}, got {value!r}")
            return False, None
        if p.bounds is not None and not p.bounds[0] <= value <= p.bounds[1]:
            return _bounds(rd, p, float(value), path), None
        _typical(rd, p, float(value), path)
        return True, int(value)
    if t == "flag":
        if not isinstance(value, bool):
            rd.error(path, f"must be true or false, got {value!r}")
            return False, None
        return True, value
    if t == "string":
        s = rd.string(value, path)
        return s is not None, s
    if t == "choice":
        if not isinstance(value, str) or value not in p.choices:
            hint = closest(value, p.choices) if isinstance(value, str) else ""
            rd.error(
                path,
                f"must be one of {', '.join(map(repr, p.choices))}, got {value!r}" + hint,
            )
            return False, None
        return True, value
    if t == "material":
        got = read_material(rd, value, path)
        return got is not None, got
    if t == "fluid":
        fl = read_fluid(rd, value, path)
        return fl is not None, fl
    if t == "subsystem":
        name = rd.name_ref(value, path, list(rd.declared), "subsystem")
        return name is not None, name
    raise AssertionError(t)  # excluded by Param.__post_init__


def check(
    rd: Reader,
    kind: Kind,
    table: Mapping[str, Any],
    path: str,
    *,
    skip: tuple[str, ...] = (),
) -> dict[str, Any] | None:
    """Validate ``table`` against ``kind``'s declaration.

    Every problem is reported (unknown keys with the closest valid name even when a
    required key is missing too). Returns the values by key (absent keys with their
    default), or None if anything was wrong. Keys in ``skip`` are left to the caller.
    """
    before = len(rd.problems)
    rd.keys(table, path, kind.allowed, kind.required)
    values: dict[str, Any] = {}
    good = True
    for p in kind.params:
        if p.name in skip:
            continue
        if p.name not in table:
            values[p.name] = p.default
            continue
        ok, v = check_value(rd, p, table[p.name], join(path, p.name))
        good = good and ok  # a reference to an entry whose problems were reported: not ok
        if ok:
            values[p.name] = v
    if "description" in kind.implicit and "description" in table:
        rd.string(table["description"], join(path, "description"))
    return values if good and len(rd.problems) == before else None


def check_derived(
    rd: Reader, path: str, derived: Mapping[str, Any], keys: tuple[str, ...]
) -> bool:
    """Derived quantities must be finite and positive; an error names the user's keys.

    ``derived`` maps a name (``bending stiffness``, ``volume``) to a number or per-band
    array; ``keys`` are the key paths the values were derived from.
    """
    ok = True
    for what, value in derived.items():
        if positive_finite(value):
            continue
        arr = np.asarray(value, dtype=float)
        bad = arr[~(np.isfinite(arr) & (arr > 0))] if arr.size else arr
        shown = f"{float(bad.ravel()[0]):.3g}" if bad.size else "nothing"
        src = ", ".join(keys) if keys else path
        rd.error(
            path,
            f"the derived {what} is {shown}, not a finite positive value; check {src}",
        )
        ok = False
    return ok


def positive_finite(value: Any) -> bool:
    """True if ``value`` (a number or an array) is not empty and every entry is finite and
    > 0: the test of :func:`check_derived`, cheap for the common case that it holds."""
    if type(value) is float:
        return 0.0 < value < math.inf
    arr = np.asarray(value, dtype=float)
    if not arr.size:
        return False
    # NaN propagates through the minimum, so it fails the first test
    return bool(_MIN(arr, axis=None) > 0.0) and bool(_MAX(arr, axis=None) < math.inf)


_MIN, _MAX = np.minimum.reduce, np.maximum.reduce


def is_number(value: Any) -> bool:
    """A TOML number (not a boolean) that is finite."""
    return (
        not isinstance(value, bool)
        and isinstance(value, int | float)
        and math.isfinite(float(value))
    )




# -- materials and fluids --------------------------------------------------------------------


def _material_values(
    rd: Reader, table: Mapping[str, Any], path: str
) -> dict[str, float] | None:
    """The property keys of a material table, each checked by the one schema."""
    out: dict[str, float] = {}
    ok = True
    for key in MATERIAL_VALUES:
        if key in table:
            good, x = check_value(rd, _MATERIAL[key], table[key], join(path, key))
            ok = ok and good
            if good:
                out[key] = x
    return out if ok else None


def read_material_section(rd: Reader, name: str, spec: Any) -> None:
    """One ``[materials.NAME]`` entry into ``rd.materials`` (or ``rd.invalid``)."""
    path = f"materials.{name}"
    s = rd.table(spec, path)
    if s is None:
        rd.invalid.add(name)
        return
    required = () if "base" in s else MATERIAL_VALUES[:3]
    n = len(rd.problems)
    rd.keys(s, path, (*_MATERIAL, "description"), required)
    if "description" in s:
        rd.string(s["description"], join(path, "description"))
    props: dict[str, Any] = {}
    source = f"[materials.{name}] of the model"
    if "base" in s:
        base = rd.name_ref(s["base"], f"{path}.base", builtin_materials(), "built-in material")
        if base is not None:
            m = builtin_materials()[base]
            props.update(
                density=m.density,
                youngs_modulus=m.youngs_modulus,
                poisson_ratio=m.poisson_ratio,
                loss_factor=m.loss_factor,
            )
    vals = _material_values(rd, s, path)
    if vals is None or len(rd.problems) > n:
        rd.invalid.add(name)
        return
    props.update(vals)
    rd.materials[name] = MaterialProps(
        name=name,
        density=props["density"],
        youngs_modulus=props["youngs_modulus"],
        poisson_ratio=props["poisson_ratio"],
        loss_factor=props.get("loss_factor"),
        source=source,
    )


def _named_material(rd: Reader, value: Any, path: str) -> MaterialProps | None:
    if isinstance(value, str) and value in rd.invalid:
        return None  # its definition's problems are already reported
    known = {**dict.fromkeys(builtin_materials()), **dict.fromkeys(rd.materials)}
    name = rd.name_ref(value, path, known, "material")
    if name is None:
        return None
    if name in rd.materials:
        return rd.materials[name]
    m = builtin_materials()[name]
    return MaterialProps(
        name=name,
        density=m.density,
        youngs_modulus=m.youngs_modulus,
        poisson_ratio=m.poisson_ratio,
        loss_factor=m.loss_factor,
        source=f"built-in {name}: {m.source}",
    )


def read_material(rd: Reader, value: Any, path: str) -> MaterialProps | None:
    """A material: a name, or an inline table with ``base`` and/or properties."""
    if not isinstance(value, dict):
        return _named_material(rd, value, path)
    n = len(rd.problems)
    rd.keys(value, path, tuple(_MATERIAL))
    if len(rd.problems) > n:
        return None
    base: MaterialProps | None = None
    if "base" in value:
        base = _named_material(rd, value["base"], f"{path}.base")
        if base is None:
            return None
    vals = _material_values(rd, value, path)
    if vals is None:
        return None
    merged: dict[str, Any] = {}
    if base is not None:
        merged = {k: getattr(base, k) for k in MATERIAL_VALUES}
    merged.update(vals)
    missing = [k for k in MATERIAL_VALUES[:3] if k not in merged]
    if missing:
        rd.error(
            path,
            f"material misses {', '.join(missing)}; give them or name a material in 'base'",
        )
        return None
    changed = sorted(k for k in MATERIAL_VALUES if k in value)
    return MaterialProps(
        name=(base.name + f" ({', '.join(changed)} changed)") if base else "inline",
        density=merged["density"],
        youngs_modulus=merged["youngs_modulus"],
        poisson_ratio=merged["poisson_ratio"],
        loss_factor=merged.get("loss_factor"),
        source=(
            f"{base.source} [changed in the model: {', '.join(changed)}]"
            if base
            else "given inline in the model"
        ),
    )


def read_fluid(rd: Reader, value: Any, path: str) -> FluidProps | None:
    """A fluid by name: the model's ``[fluids.NAME]`` first, then the built-in fluids."""
    known = {**dict.fromkeys(builtin_fluids()), **dict.fromkeys(rd.fluids)}
    name = rd.name_ref(value, path, known, "fluid")
    if name is None:
        return None
    if name in rd.fluids:
        fl = rd.fluids[name]
        return FluidProps(name=name, density=fl["density"], sound_speed=fl["sound_speed"])
    b = builtin_fluids()[name]
    return FluidProps(name=name, density=b.density, sound_speed=b.sound_speed)


def default_fluid(rd: Reader) -> FluidProps:
    """The model's air: its own ``[fluids.air]`` if given, else :data:`DEFAULT_FLUID`."""
    air = rd.fluids.get("air", DEFAULT_FLUID)
    return FluidProps(name="air", density=air["density"], sound_speed=air["sound_speed"])
