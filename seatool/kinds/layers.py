"""Trim and lining layers: the ``layer`` kinds and how layers and build-ups are read.

A layer is a built-in catalogue entry by name (:mod:`seatool.catalogue`: a layer or a
build-up), a changed one (``{ base = "heavy_layer_5kg", thickness = 0.004 }``) or an inline
one (``{ kind = "porous", ... }``, declared below); an array lists layers from the base
outwards. Used by plate treatments (:mod:`seatool.kinds.plate_treatment`) and cavity
linings (:mod:`seatool.kinds.damping_forms`).
"""

from __future__ import annotations

import functools
import math
import warnings
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any, Literal

import numpy as np
import numpy.typing as npt

from ..catalogue import Treatment, load_treatments, to_tmm_layer
from ..errors import closest
from ..physics import porous, tmm
from ..physics.air import AIR_DENSITY, AIR_SOUND_SPEED
from ..physics.damping_layers import ModulusTable
from .params import Kind, Param
from .reader import Reader, join
from .validate import check_value

__all__ = [
    "LAYER_KINDS",
    "TrimLayer",
    "buildup_text",
    "lining_absorption",
    "quiet",
    "read_layers",
    "tmm_layers",
    "validity_notes",
]

Array = npt.NDArray[np.float64]

_POROUS_MODELS = ("jca", "delany_bazley", "miki")
_FRAMES = ("rigid", "limp")


def _no_derive(*args: Any) -> None:
    """Layers are built by :func:`read_layers` (the declaration drives the checks)."""


_THICKNESS = Param(
    "thickness",
    unit="m",
    doc="layer thickness",
    required=True,
    bounds=(1e-6, 1.0),
    typical=(1e-4, 0.2),
)
_DENSITY = Param(
    "density",
    unit="kg/m^3",
    doc="density (porous: of the frame, limp model)",
    required=True,
    bounds=(0.1, 3e4),
)

#: Inline layer kinds (``kind = ...`` in a layer table).
LAYER_KINDS: tuple[Kind, ...] = (
    Kind("layer", "porous", "Porous absorber (fibrous or foam), equivalent fluid.", (
        _THICKNESS,
        _DENSITY,
        Param("flow_resistivity", unit="Pa s/m^2", doc="static airflow resistivity", required=True, bounds=(1.0, 1e7)),
        Param("porosity", doc="open porosity, 0 < phi <= 1", maximum=1.0),
        Param("tortuosity", doc="tortuosity (>= 1)", minimum=1.0, strict=False, bounds=(1.0, 10.0)),
        Param("viscous_length", unit="m", doc="viscous characteristic length (JCA)", bounds=(1e-7, 1e-2)),
        Param("thermal_length", unit="m", doc="thermal characteristic length (JCA)", bounds=(1e-7, 1e-2)),
        Param("model", "choice", doc="equivalent-fluid model", choices=_POROUS_MODELS, default_doc="jca if both lengths are given"),
        Param("frame", "choice", doc="frame model", choices=_FRAMES, default="rigid"),
    ), _no_derive),
    Kind("layer", "heavy_layer", "Limp heavy layer (a mass per area).", (_THICKNESS, _DENSITY), _no_derive),
    Kind("layer", "viscoelastic", "Viscoelastic damping layer with a frequency-dependent modulus.", (
        _THICKNESS,
        _DENSITY,
        Param("poisson", doc="Poisson's ratio", minimum=-1.0, maximum=0.5, strict_max=True),
        Param("modulus", "table", doc="{ frequency_hz, storage, loss_factor } arrays", required=True),
    ), _no_derive),
    Kind("layer", "air_gap", "Air gap.", (_THICKNESS,), _no_derive),
)  # fmt: skip

_BY_NAME = {k.name: k for k in LAYER_KINDS}
_LAYER_NAMES = tuple(_BY_NAME)


@functools.lru_cache(maxsize=1)
def _library() -> dict[str, Treatment]:
    return load_treatments()


def _keys_ok(
    rd: Reader,
    table: Mapping[str, Any],
    path: str,
    allowed: tuple[str, ...],
    required: tuple[str, ...] = (),
) -> bool:
    """:meth:`Reader.keys`, but False on unknown keys too (one line per problem)."""
    n = len(rd.problems)
    rd.keys(table, path, allowed, required)
    return len(rd.problems) == n


def _type(value: Any) -> str:
    return type(value).__name__


@dataclass(frozen=True)
class TrimLayer:
    """One layer of a trim or lining, as read from the model file.

    Attributes
    ----------
    name : str
        Library name, ``NAME (changed: ...)`` for an override, or ``inline KIND``.
    kind : {"porous", "heavy_layer", "viscoelastic", "air_gap"}
        Layer kind.
    thickness : float
        Thickness [m].
    treatment : Treatment or None
        The library-style description (None for an air gap).
    model : {"jca", "delany_bazley", "miki"}
        Equivalent-fluid model of a porous layer.
    frame : {"rigid", "limp"}
        Frame model of a porous layer.
    """

    name: str
    kind: str
    thickness: float
    treatment: Treatment | None = None
    model: Literal["jca", "delany_bazley", "miki"] = "jca"
    frame: Literal["rigid", "limp"] = "rigid"

    @property
    def mass_per_area(self) -> float:
        """Mass per area [kg/m^2] (0 for an air gap)."""
        return 0.0 if self.treatment is None else self.treatment.mass_per_area

    def tmm_layer(self) -> tmm.Layer:
        """The transfer-matrix layer (:func:`seatool.catalogue.to_tmm_layer`)."""
        if self.treatment is None:
            return tmm.AirLayer(self.thickness)
        return to_tmm_layer(self.treatment, model=self.model, frame=self.frame)


def tmm_layers(layers: Sequence[TrimLayer]) -> list[tmm.Layer]:
    return [layer.tmm_layer() for layer in layers]


def buildup_text(layers: Sequence[TrimLayer]) -> str:
    return " + ".join(f"{x.name} {1000 * x.thickness:.3g} mm" for x in layers)


def validity_notes(layers: Sequence[TrimLayer], f: Array, rho0: float) -> list[str]:
    """Messages of the porous models about their fitting range (Delany–Bazley, Miki)."""
    notes: list[str] = []
    for layer in layers:
        t = layer.treatment
        if t is None or t.kind != "porous" or layer.model == "jca":
            continue
        assert t.flow_resistivity is not None
        fn = porous.delany_bazley if layer.model == "delany_bazley" else porous.miki
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always", porous.ValidityWarning)
            fn(f, t.flow_resistivity, rho0=rho0)
        for w in caught:
            if issubclass(w.category, porous.ValidityWarning):
                notes.append(f"{layer.name}: {w.message}")
    return notes


def quiet(func: Any, *args: Any, **kwargs: Any) -> Any:
    """Call a TMM function with the porous range warnings silenced (reported as notes)."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", porous.ValidityWarning)
        return func(*args, **kwargs)


def _read_modulus(rd: Reader, value: Any, path: str, kind: str) -> ModulusTable | None:
    t = rd.table(value, path)
    if t is None:
        return None
    keys = ("frequency_hz", "storage", "loss_factor")
    if not _keys_ok(rd, t, path, keys, keys):
        return None
    cols: list[list[float]] = []
    ok = True
    for key in keys:
        v = t[key]
        if not isinstance(v, list) or not v:
            rd.error(join(path, key), f"must be a non-empty array of numbers, got {_type(v)}")
            ok = False
            continue
        col = []
        for i, x in enumerate(v):
            unit = {"frequency_hz": "Hz", "storage": "Pa"}.get(key, "")
            num = rd.number(x, f"{path}.{key}[{i}]", unit=unit)
            ok = ok and num is not None
            col.append(num if num is not None else math.nan)
        cols.append(col)
    if not ok:
        return None
    if len({len(c) for c in cols}) != 1:
        rd.error(path, "frequency_hz, storage and loss_factor must have the same length")
        return None
    try:
        return ModulusTable(tuple(cols[0]), tuple(cols[1]), tuple(cols[2]), quantity=kind)  # type: ignore[arg-type]
    except ValueError as exc:
        rd.error(path, str(exc))
        return None


def _read_fields(
    rd: Reader, t: Mapping[str, Any], path: str, kind: str, modulus_kind: str
) -> dict[str, Any] | None:
    """Numbers and options of an inline layer table, checked by the layer's declaration."""
    out: dict[str, Any] = {}
    ok = True
    for p in _BY_NAME[kind].params:
        if p.name not in t:
            continue
        kp = join(path, p.name)
        if p.name == "modulus":
            m = _read_modulus(rd, t[p.name], kp, modulus_kind)
            ok = ok and m is not None
            out[p.name] = m
            continue
        good, x = check_value(rd, p, t[p.name], kp)
        ok = ok and good
        out[p.name] = x
    return out if ok else None


def _make_layer(
    rd: Reader, path: str, name: str, kind: str, base: Treatment | None, fields: dict[str, Any]
) -> TrimLayer | None:
    model = fields.pop("model", None)
    frame = fields.pop("frame", "rigid")
    if kind == "air_gap":
        return TrimLayer(name, "air_gap", float(fields["thickness"]))
    changes = dict(fields)
    try:
        if base is not None:
            t = base.replace(**changes, name=name, source=f"model file, from {base.name!r}")
        else:
            t = Treatment(name=name, kind=kind, source="model file", **changes)  # type: ignore[arg-type]
    except (TypeError, ValueError) as exc:
        rd.error(path, str(exc))
        return None
    if kind == "porous":
        has_lengths = t.viscous_length is not None and t.thermal_length is not None
        if model is None:
            model = "jca" if has_lengths else None
        if model is None:
            rd.error(
                path,
                "a porous layer needs viscous_length and thermal_length (JCA model), or "
                "model = 'delany_bazley' or 'miki' (flow resistivity only)",
            )
            return None
        if model == "jca" and not has_lengths:
            rd.error(join(path, "model"), "'jca' needs viscous_length and thermal_length")
            return None
        if frame == "limp" and (model != "jca" or not t.density):
            rd.error(join(path, "frame"), "a limp frame needs model 'jca' and a density")
            return None
    assert t.thickness is not None
    return TrimLayer(t.name, t.kind, t.thickness, t, model or "jca", frame)


def _library_layers(rd: Reader, name: str, path: str) -> list[TrimLayer] | None:
    lib = _library()
    if name not in lib:
        hint = closest(name, lib) or f" (known: {', '.join(lib)})"
        rd.error(path, f"unknown treatment layer or build-up {name!r}" + hint)
        return None
    t = lib[name]
    names = t.layers if t.kind == "buildup" else (t.name,)
    out = []
    for n in names:
        layer = lib[n]
        assert layer.thickness is not None
        out.append(TrimLayer(layer.name, layer.kind, layer.thickness, layer))
    return out


def _read_item(rd: Reader, value: Any, path: str, modulus_kind: str) -> list[TrimLayer] | None:
    if isinstance(value, str):
        return _library_layers(rd, value, path)
    t = rd.table(value, path)
    if t is None:
        return None
    if "base" in t:
        base_name = t["base"]
        if not isinstance(base_name, str):
            rd.error(join(path, "base"), f"must be a layer name (a string), got {_type(base_name)}")
            return None
        got = _library_layers(rd, base_name, join(path, "base"))
        if got is None:
            return None
        if "kind" in t:
            rd.error(join(path, "kind"), "give either base (a built-in layer) or kind, not both")
            return None
        if len(got) > 1:
            if set(t) - {"base", "description"}:
                rd.error(
                    join(path, "base"),
                    f"{base_name!r} is a build-up; to change one of its layers list them as an "
                    "array of layers",
                )
                return None
            return got
        base = got[0].treatment
        assert base is not None
        kind: Any = base.kind
        allowed = ("base", "description", *tuple(p.name for p in _BY_NAME[kind].params))
        if not _keys_ok(rd, t, path, allowed):
            return None
        fields = _read_fields(
            rd, t, path, kind, base.modulus.quantity if base.modulus else modulus_kind
        )
        if fields is None:
            return None
        if "model" not in fields and kind == "porous":
            fields["model"] = "jca" if base.viscous_length else None
        changed = sorted(k for k in t if k not in ("base", "description"))
        name = f"{base.name} ({', '.join(changed)} changed)" if changed else base.name
        return _one(_make_layer(rd, path, name, kind, base, fields))
    kind = t.get("kind")
    if kind is None:
        rd.error(
            join(path, "kind"),
            "missing: give base = a built-in layer name, or kind = " + " | ".join(_LAYER_NAMES),
        )
        return None
    if kind not in _LAYER_NAMES:
        hint = closest(kind, _LAYER_NAMES) if isinstance(kind, str) else ""
        rd.error(
            join(path, "kind"),
            f"unknown layer kind {kind!r}{hint}; known: {', '.join(_LAYER_NAMES)}",
        )
        return None
    allowed = ("kind", "description", *tuple(p.name for p in _BY_NAME[kind].params))
    if not _keys_ok(rd, t, path, allowed, _BY_NAME[kind].required):
        return None
    fields = _read_fields(rd, t, path, kind, modulus_kind)
    if fields is None:
        return None
    return _one(_make_layer(rd, path, f"inline {kind}", kind, None, fields))


def _one(layer: TrimLayer | None) -> list[TrimLayer] | None:
    return None if layer is None else [layer]


def read_layers(
    rd: Reader, value: Any, path: str, *, modulus_kind: str = "young"
) -> list[TrimLayer] | None:
    """Read a layer or build-up from the model file, listed from the base outwards.

    Parameters
    ----------
    rd : Reader
        Reader collecting problems.
    value : str, table or array
        A library name (layer or build-up), an inline layer table (``base = NAME`` with
        changed values, or ``kind = ...`` with all values), or an array of those.
    path : str
        Key path for messages.
    modulus_kind : {"young", "shear"}, optional
        Kind of an inline viscoelastic modulus table.

    Returns
    -------
    list of TrimLayer or None
        None after reporting problems.
    """
    items = value if isinstance(value, list) else [value]
    if isinstance(value, list) and not value:
        rd.error(path, "must list at least one layer")
        return None
    out: list[TrimLayer] = []
    ok = True
    for i, item in enumerate(items):
        got = _read_item(
            rd, item, f"{path}[{i}]" if isinstance(value, list) else path, modulus_kind
        )
        if got is None:
            ok = False
        else:
            out.extend(got)
    return out if ok else None


def lining_absorption(
    f: Array, layers: Sequence[TrimLayer], *, rho0: float = AIR_DENSITY, c0: float = AIR_SOUND_SPEED
) -> Array:
    """Diffuse-field absorption coefficient of a rigid-backed lining at band centres.

    Parameters
    ----------
    f : ndarray
        Band centre frequencies [Hz].
    layers : sequence of TrimLayer
        Lining layers from the wall (base) outwards; the outermost layer faces the room.
    rho0, c0 : float, optional
        Fluid density [kg/m^3] and sound speed [m/s].

    Returns
    -------
    ndarray
        :func:`seatool.physics.tmm.diffuse_absorption` (Paris integral, extended reaction)
        of the layers listed from the exposed face to the wall, clipped to [0, 1]; 0 for
        a lining of impervious layers only (limp masses on a rigid wall do not move).
    """
    exposed_first = list(reversed(tmm_layers(layers)))
    if not any(isinstance(x, tmm.AirLayer | tmm.PorousLayer) for x in exposed_first):
        # impervious masses on a rigid wall cannot move: Z_s is infinite, nothing absorbed
        return np.zeros_like(np.asarray(f, dtype=np.float64))
    alpha = quiet(tmm.diffuse_absorption, f, exposed_first, backing="rigid", rho0=rho0, c0=c0)
    return np.clip(np.asarray(alpha, dtype=np.float64), 0.0, 1.0)
