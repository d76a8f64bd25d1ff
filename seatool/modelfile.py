"""Reading and validating model files (TOML, SI units).

The format is described in ``docs/model-format.md``. :func:`load` returns a
:class:`seatool.model.Model` or raises :class:`seatool.errors.InputError` carrying every
problem found, each with the file, the key path (``subsystems.floor.mass``), what is
wrong and, for an unknown name, the closest valid one.

Per-band values ("spectra") can be written three ways wherever the format says
*spectrum*:

* a number: the same value in every band;
* a table ``{ band_hz = [...], values = [...] }`` with nominal band centres;
* a CSV reference ``{ csv = "file.csv", column = "name" }``; the CSV has a header whose
  first column is ``band_hz`` (path relative to the model file).

New subsystem, connection and excitation kinds register a reader in
:data:`SUBSYSTEM_KINDS`, :data:`CONNECTION_KINDS` or :data:`EXCITATION_KEYS`.
"""

from __future__ import annotations

import csv
import math
import tomllib
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt

from . import levels
from .bands import BandAxis, BandError, band_index
from .errors import InputError, Problem, closest
from .model import Connection, Excitation, Model, ModelError, Subsystem
from .physics.air import AIR_DENSITY, AIR_SOUND_SPEED

__all__ = ["CONNECTION_KINDS", "SUBSYSTEM_KINDS", "Reader", "load", "loads"]

Array = npt.NDArray[np.float64]

#: Fluid used by a cavity that names none: the default air of
#: :mod:`seatool.physics.air` (20 C, 101.325 kPa; its source is cited there).
DEFAULT_FLUID = {"density": AIR_DENSITY, "sound_speed": AIR_SOUND_SPEED}

_TOP_KEYS = (
    "title",
    "description",
    "bands",
    "fluids",
    "materials",
    "subsystems",
    "connections",
    "excitations",
    "uncertainty",  # read by seatool.analysis (parameter spreads), ignored by the solve
    "low_frequency",  # read by seatool.lowfreq (modal box solution), ignored by the solve
)

_MISSING = object()


@dataclass
class Reader:
    """Validation context: collects problems instead of stopping at the first."""

    file: str
    base_dir: Path
    problems: list[Problem] = field(default_factory=list)
    bands: BandAxis | None = None
    fluids: dict[str, dict[str, float]] = field(default_factory=dict)
    materials: dict[str, dict[str, float]] = field(default_factory=dict)
    #: Names of every subsystem declared in the file (for readers that refer to another
    #: subsystem, e.g. the cavity a trimmed face looks into), with their raw tables.
    declared: Mapping[str, Any] = field(default_factory=dict)
    #: Descriptive lines readers add for ``seatool check`` (e.g. treatment masses); they
    #: become :attr:`seatool.model.Model.reports`.
    reports: list[str] = field(default_factory=list)
    #: Warnings readers add (e.g. a porous model used outside its fitted range); they
    #: become :attr:`seatool.model.Model.notes`.
    notes: list[str] = field(default_factory=list)
    #: Names of materials and fluids defined in the file whose definition had problems
    #: (already reported): references to them are not reported again.
    invalid: set[str] = field(default_factory=set)

    # -- reporting -----------------------------------------------------------------------
    def error(self, path: str, message: str) -> None:
        self.problems.append(Problem(self.file, path, message))

    # -- structure -----------------------------------------------------------------------
    def table(self, value: Any, path: str) -> dict[str, Any] | None:
        if not isinstance(value, dict):
            self.error(path, f"must be a table, got {_type_name(value)}")
            return None
        return value

    def keys(
        self,
        table: Mapping[str, Any],
        path: str,
        allowed: tuple[str, ...],
        required: tuple[str, ...] = (),
    ) -> bool:
        """Report unknown and missing keys; True if nothing is missing."""
        ok = True
        suggested: set[str] = set()
        for k in table:
            if k not in allowed:
                hint = closest(k, allowed)
                self.error(_join(path, k), "unknown key" + hint)
                suggested.add(hint)
        for k in required:
            if k not in table:
                ok = False
                if closest(k, allowed) and f" (did you mean {k!r}?)" in suggested:
                    continue  # the misspelt key's line already names it
                self.error(_join(path, k), "missing required key")
        return ok

    def name_ref(
        self, value: Any, path: str, choices: Mapping[str, Any] | list[str], what: str
    ) -> str | None:
        if not isinstance(value, str):
            self.error(path, f"must be the name of a {what} (a string), got {_type_name(value)}")
            return None
        if value not in choices:
            valid = list(choices)
            hint = closest(value, valid)
            if not hint and valid:
                hint = f" (known: {', '.join(sorted(valid)[:8])})"
            self.error(path, f"unknown {what} {value!r}" + hint)
            return None
        return value

    def string(self, value: Any, path: str) -> str | None:
        if not isinstance(value, str):
            self.error(path, f"must be a string, got {_type_name(value)}")
            return None
        return value

    # -- numbers -------------------------------------------------------------------------
    def number(
        self,
        value: Any,
        path: str,
        *,
        unit: str = "",
        minimum: float | None = 0.0,
        strict: bool = True,
    ) -> float | None:
        """A finite real number; by default strictly positive (a physical quantity)."""
        if isinstance(value, bool) or not isinstance(value, int | float):
            self.error(path, f"must be a number{_unit(unit)}, got {_type_name(value)}")
            return None
        x = float(value)
        if not math.isfinite(x):
            self.error(path, f"must be finite, got {value}")
            return None
        if minimum is not None:
            if strict and x <= minimum:
                self.error(path, f"must be > {minimum:g}{_unit(unit)}, got {value}")
                return None
            if not strict and x < minimum:
                self.error(path, f"must be >= {minimum:g}{_unit(unit)}, got {value}")
                return None
        return x

    def spectrum(
        self,
        value: Any,
        path: str,
        *,
        unit: str = "",
        minimum: float | None = 0.0,
        strict: bool = True,
    ) -> Array | None:
        """A per-band value: number, ``{band_hz, values}`` table or ``{csv, column}``."""
        bands = self.bands
        if bands is None:
            return None
        nb = len(bands)
        if isinstance(value, dict):
            if "csv" in value:
                return self._csv_spectrum(value, path, unit=unit, minimum=minimum, strict=strict)
            if not self.keys(value, path, ("band_hz", "values"), ("band_hz", "values")):
                return None
            fb, vals = value["band_hz"], value["values"]
            if not isinstance(fb, list) or not isinstance(vals, list):
                self.error(path, "band_hz and values must be arrays of numbers")
                return None
            if len(fb) != len(vals):
                self.error(path, f"band_hz has {len(fb)} entries but values has {len(vals)}")
                return None
            return self._per_band(fb, vals, path, unit=unit, minimum=minimum, strict=strict)
        x = self.number(value, path, unit=unit, minimum=minimum, strict=strict)
        if x is None:
            return None
        return np.full(nb, x)

    def _per_band(
        self,
        fb: list[Any],
        vals: list[Any],
        path: str,
        *,
        unit: str,
        minimum: float | None,
        strict: bool,
        source: str = "",
    ) -> Array | None:
        assert self.bands is not None
        bands = self.bands
        out = np.full(len(bands), np.nan)
        ok = True
        seen: set[int] = set()
        for k, (f, v) in enumerate(zip(fb, vals, strict=True)):
            where = f"{path}.band_hz[{k}]" if not source else f"{path} ({source} row {k + 2})"
            if isinstance(f, bool) or not isinstance(f, int | float):
                self.error(where, f"band centre must be a number in Hz, got {_type_name(f)}")
                ok = False
                continue
            try:
                x = band_index(float(f), bands.kind)
            except BandError as exc:
                self.error(where, str(exc))
                ok = False
                continue
            if x in seen:
                self.error(where, f"band {f:g} Hz given twice")
                ok = False
                continue
            seen.add(x)
            j = x - int(bands.indices[0])
            vpath = f"{path}.values[{k}]" if not source else where
            val = self.number(v, vpath, unit=unit, minimum=minimum, strict=strict)
            if val is None:
                ok = False
                continue
            if 0 <= j < len(bands):
                out[j] = val
        missing = [bands.label(int(j)) for j in np.flatnonzero(np.isnan(out))]
        if ok and missing:
            shown = ", ".join(missing[:6]) + (" ..." if len(missing) > 6 else "")
            self.error(path, f"no value for band(s) {shown}; give every band of the model")
            ok = False
        return out if ok else None

    def _csv_spectrum(
        self, value: dict[str, Any], path: str, *, unit: str, minimum: float | None, strict: bool
    ) -> Array | None:
        if not self.keys(value, path, ("csv", "column"), ("csv", "column")):
            return None
        fname = self.string(value["csv"], _join(path, "csv"))
        column = self.string(value["column"], _join(path, "column"))
        if fname is None or column is None:
            return None
        fpath = (self.base_dir / fname).resolve()
        try:
            text = fpath.read_text(encoding="utf-8-sig")
        except FileNotFoundError:
            self.error(_join(path, "csv"), f"file {fname!r} not found (looked in {self.base_dir})")
            return None
        except (OSError, UnicodeDecodeError) as exc:
            self.error(_join(path, "csv"), f"cannot read {fname!r}: {exc}")
            return None
        rows = [r for r in csv.reader(text.splitlines()) if any(c.strip() for c in r)]
        if not rows:
            self.error(_join(path, "csv"), f"{fname!r} is empty; expected a header 'band_hz,...'")
            return None
        header = [h.strip() for h in rows[0]]
        if not header or header[0] != "band_hz":
            self.error(
                _join(path, "csv"), f"{fname!r}: first column of the header must be 'band_hz'"
            )
            return None
        if column not in header:
            self.error(
                _join(path, "column"),
                f"no column {column!r} in {fname!r}" + closest(column, header[1:]),
            )
            return None
        ci = header.index(column)
        fb: list[Any] = []
        vals: list[Any] = []
        for r, row in enumerate(rows[1:], start=2):
            if len(row) != len(header):
                self.error(
                    _join(path, "csv"),
                    f"{fname!r} row {r}: {len(row)} cells, header has {len(header)}",
                )
                return None
            try:
                fb.append(float(row[0]))
                vals.append(float(row[ci]))
            except ValueError:
                self.error(_join(path, "csv"), f"{fname!r} row {r}: not a number in {row!r}")
                return None
        return self._per_band(
            fb, vals, path, unit=unit, minimum=minimum, strict=strict, source=fname
        )


def _join(path: str, key: str) -> str:
    return f"{path}.{key}" if path else key


def _unit(unit: str) -> str:
    return f" [{unit}]" if unit else ""


def _type_name(value: Any) -> str:
    names = {
        bool: "a boolean",
        str: "a string",
        int: "an integer",
        float: "a number",
        list: "an array",
        dict: "a table",
    }
    for t, n in names.items():
        if type(value) is t:
            return f"{n} ({value!r})" if t in (str, int, float, bool) else n
    return type(value).__name__


# ----------------------------------------------------------------------------------------
# Sections


def _read_bands(rd: Reader, data: Any) -> None:
    path = "bands"
    if data is _MISSING:
        rd.error(path, "missing required table [bands] (kind, lowest, highest)")
        return
    t = rd.table(data, path)
    if t is None:
        return
    if not rd.keys(t, path, ("kind", "lowest", "highest"), ("lowest", "highest")):
        return
    kind = t.get("kind", "third-octave")
    if kind not in ("third-octave", "octave"):
        rd.error(
            f"{path}.kind",
            f"must be 'third-octave' or 'octave', got {kind!r}"
            + closest(str(kind), ["third-octave", "octave"]),
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
        rd.bands = BandAxis.from_range(lo, hi, kind)
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
        if not rd.keys(
            s, path, ("density", "sound_speed", "description"), ("density", "sound_speed")
        ):
            continue
        rho = rd.number(s["density"], f"{path}.density", unit="kg/m^3")
        c = rd.number(s["sound_speed"], f"{path}.sound_speed", unit="m/s")
        if rho is not None and c is not None:
            rd.fluids[name] = {"density": rho, "sound_speed": c}


_MATERIAL_KEYS = (
    "base",
    "density",
    "youngs_modulus",
    "poisson_ratio",
    "loss_factor",
    "description",
)


def _read_materials(rd: Reader, data: Any) -> None:
    """``[materials.NAME]``: all properties, or ``base = "built-in name"`` plus changes."""
    if data is _MISSING:
        return
    t = rd.table(data, "materials")
    if t is None:
        return
    from .materials import load_materials

    builtin = load_materials()
    for name, spec in t.items():
        path = f"materials.{name}"
        s = rd.table(spec, path)
        if s is None:
            continue
        required = () if "base" in s else ("density", "youngs_modulus", "poisson_ratio")
        if not rd.keys(s, path, _MATERIAL_KEYS, required):
            rd.invalid.add(name)
            continue
        props: dict[str, float] = {}
        if "base" in s:
            base = rd.name_ref(s["base"], f"{path}.base", builtin, "built-in material")
            if base is None:
                rd.invalid.add(name)
                continue
            m = builtin[base]
            props.update(
                density=m.density,
                youngs_modulus=m.youngs_modulus,
                poisson_ratio=m.poisson_ratio,
                loss_factor=m.loss_factor,
            )
        ok = True
        for key, unit, minimum, strict in (
            ("density", "kg/m^3", 0.0, True),
            ("youngs_modulus", "Pa", 0.0, True),
            ("poisson_ratio", "", -1.0, True),
            ("loss_factor", "", 0.0, False),
        ):
            if key not in s:
                continue
            x = rd.number(s[key], f"{path}.{key}", unit=unit, minimum=minimum, strict=strict)
            if x is not None and key == "poisson_ratio" and x >= 0.5:
                rd.error(f"{path}.{key}", f"must be < 0.5 for a stable isotropic solid, got {x}")
                x = None
            if x is None:
                ok = False
            else:
                props[key] = x
        if ok:
            rd.materials[name] = props
        else:
            rd.invalid.add(name)


# Subsystem kinds ------------------------------------------------------------------------

#: A subsystem reader returns the wave fields (subsystems) of one component, or None
#: after reporting its problems.
SubsystemReader = Callable[[Reader, str, dict[str, Any]], "Subsystem | list[Subsystem] | None"]

#: Ways to state a damping loss factor other than a spectrum: the key of the inline table
#: (e.g. ``damping = { reverberation_time = 0.5 }``) -> reader(reader, table, path, context)
#: returning the per-band loss factor. ``context`` carries what the subsystem reader knows
#: (``volume``, ``surface_area``, ``fluid``, ``area``, ...).
DampingReader = Callable[[Reader, dict[str, Any], str, Mapping[str, Any]], "Array | None"]
DAMPING_FORMS: dict[str, DampingReader] = {}


def read_damping(
    rd: Reader, value: Any, path: str, context: Mapping[str, Any] | None = None
) -> Array | None:
    """A damping loss factor: a spectrum, or one of the forms in :data:`DAMPING_FORMS`."""
    if isinstance(value, dict) and not ({"band_hz", "values", "csv"} & set(value)):
        forms = [k for k in value if k in DAMPING_FORMS]
        if len(forms) != 1:
            known = ", ".join(
                ["a number", "{ band_hz, values }", "{ csv, column }", *DAMPING_FORMS]
            )
            rd.error(path, f"state damping as one of: {known}")
            return None
        return DAMPING_FORMS[forms[0]](rd, value, path, context or {})
    return rd.spectrum(value, path, minimum=0.0, strict=False)


def _damping(
    rd: Reader, s: dict[str, Any], path: str, context: Mapping[str, Any] | None = None
) -> Array | None:
    return read_damping(rd, s["damping"], f"{path}.damping", context)


def _read_structure(rd: Reader, name: str, s: dict[str, Any]) -> Subsystem | None:
    path = f"subsystems.{name}"
    allowed = ("kind", "description", "mass", "modal_density", "damping")
    if not rd.keys(s, path, allowed, ("mass", "modal_density", "damping")):
        return None
    mass = rd.number(s["mass"], f"{path}.mass", unit="kg")
    n = rd.spectrum(s["modal_density"], f"{path}.modal_density", unit="modes/Hz")
    eta = _damping(rd, s, path)
    if mass is None or n is None or eta is None:
        return None
    return Subsystem(
        name=name,
        kind="structure",
        modal_density=n,
        damping=eta,
        quantity="velocity",
        mass=mass,
        provenance={"modal_density": "given", "damping": "given"},
    )


def _read_exterior(rd: Reader, name: str, s: dict[str, Any]) -> Subsystem | None:
    path = f"subsystems.{name}"
    if not rd.keys(s, path, ("kind", "description")):
        return None
    assert rd.bands is not None
    nb = len(rd.bands)
    return Subsystem(
        name=name,
        kind="exterior",
        modal_density=np.full(nb, np.inf),
        damping=np.zeros(nb),
        quantity="energy",
        sink=True,
        provenance={"modal_density": "free field (sink)"},
    )


#: Readers of subsystem kinds: ``kind`` value -> function(reader, name, table).
SUBSYSTEM_KINDS: dict[str, SubsystemReader] = {
    "structure": _read_structure,
    "exterior": _read_exterior,
}


def _read_subsystems(rd: Reader, data: Any) -> list[Subsystem]:
    out: list[Subsystem] = []
    if data is _MISSING:
        rd.error("subsystems", "missing required section [subsystems.NAME]")
        return out
    t = rd.table(data, "subsystems")
    if t is None:
        return out
    if not t:
        rd.error("subsystems", "no subsystems defined")
    for name, spec in t.items():
        path = f"subsystems.{name}"
        s = rd.table(spec, path)
        if s is None:
            continue
        if "kind" not in s:
            rd.error(
                f"{path}.kind", "missing required key (one of: " + ", ".join(SUBSYSTEM_KINDS) + ")"
            )
            continue
        kind = s["kind"]
        if not isinstance(kind, str) or kind not in SUBSYSTEM_KINDS:
            rd.error(
                f"{path}.kind",
                f"unknown subsystem kind {kind!r}"
                + (closest(kind, SUBSYSTEM_KINDS) if isinstance(kind, str) else "")
                + f"; known kinds: {', '.join(SUBSYSTEM_KINDS)}",
            )
            continue
        if "description" in s:
            rd.string(s["description"], f"{path}.description")
        got = SUBSYSTEM_KINDS[kind](rd, name, s)
        if got is None:
            continue
        out.extend(got if isinstance(got, list) else [got])
    return out


# Connections ----------------------------------------------------------------------------

#: A connection reader gets the connection's table, its ends (the subsystems named in
#: ``between``, in order) and every subsystem read so far (to find the other wave fields
#: of a component); it returns one or more connections, or None after reporting problems.
ConnectionReader = Callable[
    [Reader, str, dict[str, Any], list[Subsystem], Mapping[str, Subsystem]],
    "Connection | list[Connection] | None",
]


def _read_given_connection(
    rd: Reader,
    name: str,
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
) -> Connection | None:
    path = f"connections.{name}"
    if not rd.keys(
        s,
        path,
        ("kind", "description", "between", "coupling_loss_factor"),
        ("coupling_loss_factor",),
    ):
        return None
    if len(ends) != 2:
        rd.error(
            f"{path}.between", f"a given coupling loss factor joins two subsystems, got {len(ends)}"
        )
        return None
    a, b = ends
    if a.sink:
        rd.error(
            f"{path}.between",
            f"put the exterior {a.name!r} second: a coupling loss factor is stated from the "
            "structure into the exterior",
        )
        return None
    eta = rd.spectrum(s["coupling_loss_factor"], f"{path}.coupling_loss_factor")
    if eta is None:
        return None
    return Connection(
        name, a.name, b.name, eta, kind="given", provenance={"coupling_loss_factor": "given"}
    )


#: Readers of connection kinds: ``kind`` value -> function(reader, name, table, (a, b)).
CONNECTION_KINDS: dict[str, ConnectionReader] = {"given": _read_given_connection}


def _read_connections(
    rd: Reader, data: Any, subs: dict[str, Subsystem], declared: Mapping[str, None]
) -> list[Connection]:
    out: list[Connection] = []
    if data is _MISSING:
        return out
    t = rd.table(data, "connections")
    if t is None:
        return out
    for name, spec in t.items():
        path = f"connections.{name}"
        s = rd.table(spec, path)
        if s is None:
            continue
        if "between" not in s:
            rd.error(f"{path}.between", "missing required key (two subsystem names)")
            continue
        btw = s["between"]
        if not isinstance(btw, list) or len(btw) < 2:
            rd.error(
                f"{path}.between",
                f"must be an array of at least two subsystem names, got {_type_name(btw)}",
            )
            continue
        names = []
        for k, nm in enumerate(btw):
            r = rd.name_ref(nm, f"{path}.between[{k}]", declared, "subsystem")
            names.append(r)
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
        kind = s.get("kind", "given")
        if not isinstance(kind, str) or kind not in CONNECTION_KINDS:
            rd.error(
                f"{path}.kind",
                f"unknown connection kind {kind!r}"
                + (closest(kind, CONNECTION_KINDS) if isinstance(kind, str) else "")
                + f"; known kinds: {', '.join(CONNECTION_KINDS)}",
            )
            continue
        got = CONNECTION_KINDS[kind](rd, name, s, ends, subs)
        if got is None:
            continue
        out.extend(got if isinstance(got, list) else [got])
    return out


# Excitations ----------------------------------------------------------------------------

ExcitationConvert = Callable[
    [Reader, Subsystem, Array, str, dict[str, Any]], "tuple[str, Array] | None"
]


@dataclass(frozen=True)
class ExcitationKey:
    """How one excitation key is read.

    ``convert(reader, subsystem, values, path, table)`` turns the per-band values into
    ``('power', watts)`` or ``('prescribed', joules)``, or reports a problem and returns
    None. ``extra`` lists further keys this form accepts in the same table.
    """

    unit: str
    convert: ExcitationConvert
    minimum: float | None = None
    strict: bool = True
    extra: tuple[str, ...] = ()


def _need(rd: Reader, sub: Subsystem, path: str, quantity: str) -> bool:
    if sub.quantity != quantity:
        key = path.rsplit(".", 1)[-1]
        rd.error(
            path,
            f"{key} needs a subsystem whose level is {quantity.replace('_', ' ')}; "
            f"{sub.name!r} is a {sub.kind}",
        )
        return False
    return True


def _conv_power(rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]):  # type: ignore[no-untyped-def]
    return "power", v


def _conv_power_level(rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]):  # type: ignore[no-untyped-def]
    return "power", levels.REFERENCE["power"] * 10.0 ** (v / 10.0)


def _conv_spl(rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]):  # type: ignore[no-untyped-def]
    if not _need(rd, sub, path, "sound_pressure"):
        return None
    assert sub.volume is not None and sub.density is not None and sub.sound_speed is not None
    p_sq = levels.REFERENCE["sound_pressure"] ** 2 * 10.0 ** (v / 10.0)
    return "prescribed", p_sq * sub.volume / (sub.density * sub.sound_speed**2)


def _conv_velocity(rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]):  # type: ignore[no-untyped-def]
    if not _need(rd, sub, path, "velocity"):
        return None
    assert sub.mass is not None
    return "prescribed", sub.mass * levels.REFERENCE["velocity"] ** 2 * 10.0 ** (v / 10.0)


def _conv_acceleration(rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]):  # type: ignore[no-untyped-def]
    if not _need(rd, sub, path, "velocity"):
        return None
    assert sub.mass is not None and rd.bands is not None
    a_sq = levels.REFERENCE["acceleration"] ** 2 * 10.0 ** (v / 10.0)
    return "prescribed", sub.mass * a_sq / rd.bands.omega**2


#: Keys that state what an excitation gives (exactly one per excitation).
EXCITATION_KEYS: dict[str, ExcitationKey] = {
    "power": ExcitationKey("W", _conv_power, minimum=0.0, strict=False),
    "sound_power_level": ExcitationKey("dB re 1 pW", _conv_power_level),
    "sound_pressure_level": ExcitationKey("dB re 20 uPa", _conv_spl),
    "velocity_level": ExcitationKey("dB re 1e-9 m/s", _conv_velocity),
    "acceleration_level": ExcitationKey("dB re 1e-6 m/s^2", _conv_acceleration),
}


def _read_excitations(
    rd: Reader, data: Any, subs: dict[str, Subsystem], declared: Mapping[str, None]
) -> list[Excitation]:
    out: list[Excitation] = []
    if data is _MISSING:
        return out
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
        given = [k for k in EXCITATION_KEYS if k in s]
        extra = tuple(x for k in given for x in EXCITATION_KEYS[k].extra)
        allowed = ("subsystem", "description", *EXCITATION_KEYS, *extra)
        if not rd.keys(s, path, allowed, ("subsystem",)):
            continue
        if len(given) != 1:
            what = "none" if not given else ", ".join(given)
            rd.error(path, f"give exactly one of {', '.join(EXCITATION_KEYS)} (got {what})")
            continue
        key = given[0]
        spec_key = EXCITATION_KEYS[key]
        sname = rd.name_ref(s["subsystem"], f"{path}.subsystem", declared, "subsystem")
        if sname is None or sname not in subs:
            continue
        sub = subs[sname]
        if sub.sink:
            rd.error(f"{path}.subsystem", f"{sname!r} is the exterior; it cannot be excited")
            continue
        kpath = f"{path}.{key}"
        v = rd.spectrum(
            s[key], kpath, unit=spec_key.unit, minimum=spec_key.minimum, strict=spec_key.strict
        )
        if v is None:
            continue
        got = spec_key.convert(rd, sub, v, kpath, s)
        if got is None:
            continue
        kind, arr = got
        desc = s.get("description", "")
        desc = desc if isinstance(desc, str) else ""
        if kind == "prescribed":
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
    return out


# ----------------------------------------------------------------------------------------


def _declared_subsystems(data: Mapping[str, Any]) -> dict[str, None]:
    subs = data.get("subsystems")
    return dict.fromkeys(subs) if isinstance(subs, dict) else {}


#: Modules that register further readers into the registries above (imported before the
#: first model is read, so that physics-derived kinds are available).
READER_MODULES: list[str] = [
    "seatool.kinds.subsystems",
    "seatool.kinds.connections",
    "seatool.kinds.treatment",
]


def register_readers() -> None:
    """Import every module of :data:`READER_MODULES` (idempotent)."""
    import importlib

    for mod in READER_MODULES:
        importlib.import_module(mod)


def loads(text: str, *, file: str = "<string>", base_dir: str | Path = ".") -> Model:
    """Read a model from TOML text. See :func:`load`."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError([Problem(file, "", f"not valid TOML: {exc}")]) from None
    return build(data, file=file, base_dir=base_dir)


def build(data: Mapping[str, Any], *, file: str = "<data>", base_dir: str | Path = ".") -> Model:
    """Validate parsed model-file data (nested dicts as from ``tomllib``) into a Model.

    Used by :func:`loads`, and by analyses that rebuild a model with changed parameters.
    """
    register_readers()
    rd = Reader(file=file, base_dir=Path(base_dir))
    rd.keys(data, "", _TOP_KEYS)
    title = data.get("title", "")
    if not isinstance(title, str):
        rd.error("title", f"must be a string, got {_type_name(title)}")
        title = ""
    if "description" in data:
        rd.string(data["description"], "description")
    _read_bands(rd, data.get("bands", _MISSING))
    if rd.bands is None:
        raise InputError(rd.problems)
    _read_fluids(rd, data.get("fluids", _MISSING))
    _read_materials(rd, data.get("materials", _MISSING))
    declared = _declared_subsystems(data)
    raw_subs = data.get("subsystems")
    rd.declared = dict(raw_subs) if isinstance(raw_subs, dict) else {}
    subs = {s.name: s for s in _read_subsystems(rd, data.get("subsystems", _MISSING))}
    cons = _read_connections(rd, data.get("connections", _MISSING), subs, declared)
    exs = _read_excitations(rd, data.get("excitations", _MISSING), subs, declared)
    if rd.problems:
        raise InputError(rd.problems)
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
        )
    except ModelError as exc:
        raise InputError([Problem(file, "", str(exc))]) from None


def load(path: str | Path) -> Model:
    """Read and validate a model file.

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
    return loads(text, file=str(p), base_dir=p.parent)
