"""The validation context of the model-file readers.

:class:`Reader` collects every problem (file, key path, message) instead of stopping at
the first, and reads the value forms shared by every section: numbers, strings, names of
other entries, and *spectra* (per-band values written as a number, a
``{ band_hz, values }`` table or a ``{ csv, column }`` reference; see
``docs/model-format.md``). The declarations of :mod:`seatool.kinds.params` are checked
through it.
"""

from __future__ import annotations

import csv
import math
import os
import stat
from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt

from ..bands import BandAxis, BandError, band_index
from ..errors import Problem, closest
from ..physics.air import AIR_DENSITY, AIR_SOUND_SPEED

__all__ = ["DEFAULT_FLUID", "MAX_CSV_BYTES", "Reader", "join", "type_name", "unit_text"]

Array = npt.NDArray[np.float64]

#: Fluid used by a cavity that names none: the default air of
#: :mod:`seatool.physics.air` (20 C, 101.325 kPa; its source is cited there).
DEFAULT_FLUID = {"density": AIR_DENSITY, "sound_speed": AIR_SOUND_SPEED}

#: Largest spectrum CSV file read [bytes] (1 MiB: a per-band table of a few columns is a
#: few kilobytes; anything larger is not a spectrum file).
MAX_CSV_BYTES = 1 << 20

#: Longest part of a file's cell shown in a message (never more of the file than that).
_CELL_SHOWN = 40


@dataclass
class Reader:
    """Validation context: collects problems instead of stopping at the first."""

    file: str
    base_dir: Path
    problems: list[Problem] = field(default_factory=list)
    bands: BandAxis | None = None
    fluids: dict[str, dict[str, float]] = field(default_factory=dict)
    materials: dict[str, Any] = field(default_factory=dict)
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
    #: Plausibility warnings (file, key path, message): values inside the physical bounds
    #: but unusual for their role; they become :attr:`seatool.model.Model.warnings`.
    warnings: list[Problem] = field(default_factory=list)
    #: Read spectrum files outside the model file's folder tree too (by default refused).
    allow_outside_files: bool = False

    # -- reporting -----------------------------------------------------------------------
    def error(self, path: str, message: str) -> None:
        self.problems.append(Problem(self.file, path, message))

    def warn(self, path: str, message: str) -> None:
        """A plausibility warning (reported once per key path and message)."""
        w = Problem(self.file, path, message)
        if w not in self.warnings:
            self.warnings.append(w)

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
        return self.constant_spectrum(x)

    def constant_spectrum(self, x: float) -> Array:
        """The same value ``x`` in every band of the model (a new read-only array)."""
        assert self.bands is not None
        out = np.empty(len(self.bands))
        out.fill(x)
        out.setflags(write=False)
        return out

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
                x = band_index(float(f), bands.spacing)
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
            if not 0 <= j < len(bands):
                self.error(
                    where,
                    f"band {f:g} Hz is outside the model's bands {bands.label(0)} .. "
                    f"{bands.label(len(bands) - 1)}; give exactly the bands of the model",
                )
                ok = False
                continue
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
        text = self._read_csv_file(fname, _join(path, "csv"))
        if text is None:
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
                f"no column {_cell(column)} in {fname!r}" + closest(column, header[1:]),
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
            for cell, out_list, col in ((row[0], fb, header[0]), (row[ci], vals, column)):
                try:
                    out_list.append(float(cell))
                except ValueError:
                    self.error(
                        _join(path, "csv"),
                        f"{fname!r} row {r}: not a number in column {_cell(col)}: {_cell(cell)}",
                    )
                    return None
        return self._per_band(
            fb, vals, path, unit=unit, minimum=minimum, strict=strict, source=fname
        )


    def _read_csv_file(self, fname: str, path: str) -> str | None:
        """The text of a spectrum file: a regular file, inside the model's folder tree
        (unless :attr:`allow_outside_files`), at most :data:`MAX_CSV_BYTES`."""
        base = self.base_dir.resolve()
        fpath = (base / fname).resolve()
        if not self.allow_outside_files and not fpath.is_relative_to(base):
            self.error(
                path,
                f"{fname!r} is outside the model's folder {str(base)!r}; move it next to the "
                "model or allow it explicitly (--allow-outside-files)",
            )
            return None
        try:
            # O_NONBLOCK: opening a FIFO must not wait for a writer; fstat then refuses it
            fd = os.open(fpath, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
        except FileNotFoundError:
            self.error(path, f"file {fname!r} not found (looked in {str(base)!r})")
            return None
        except OSError as exc:
            self.error(path, f"cannot read {fname!r}: {exc.strerror or type(exc).__name__}")
            return None
        with os.fdopen(fd, "rb") as fh:
            st = os.fstat(fh.fileno())
            if not stat.S_ISREG(st.st_mode):
                self.error(path, f"{fname!r} is not a regular file (a device, pipe or folder)")
                return None
            raw = fh.read(MAX_CSV_BYTES + 1)
        if len(raw) > MAX_CSV_BYTES:
            self.error(
                path, f"{fname!r} is larger than {MAX_CSV_BYTES} bytes; not a spectrum table"
            )
            return None
        try:
            return raw.decode("utf-8-sig")
        except UnicodeDecodeError:
            self.error(path, f"{fname!r} is not a UTF-8 text file")
            return None


def _cell(text: str) -> str:
    """A cell of a user's file for a message: quoted, at most a few dozen characters."""
    shown = text if len(text) <= _CELL_SHOWN else text[:_CELL_SHOWN] + "..."
    return repr(shown)


def join(path: str, key: str) -> str:
    """``path.key`` (or ``key`` at the top level)."""
    return f"{path}.{key}" if path else key


def unit_text(unit: str) -> str:
    """`` [unit]`` for messages, or '' without a unit."""
    return f" [{unit}]" if unit else ""


def type_name(value: Any) -> str:
    """What a TOML value is, for messages (``a string ('x')``, ``a table`` ...)."""
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


_join = join
_unit = unit_text
_type_name = type_name
