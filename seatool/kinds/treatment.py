"""Damping forms and plate treatments in the model file.

This module registers, into :data:`seatool.modelfile.DAMPING_FORMS`, three ways of stating
a subsystem's *internal* damping loss factor besides a spectrum:

``damping = { reverberation_time = SPECTRUM }``
    any subsystem: eta = 2.2/(f T60) (:func:`seatool.physics.damping.loss_factor_from_t60`).
``damping = { absorption_area = SPECTRUM, air_absorption = {...} }``
    cavities: eta = c A/(8 pi f V) (:func:`seatool.physics.damping.cavity_loss_factor`).
``damping = { surfaces = [ {area, absorption | lining}, ... ], method, air_absorption }``
    cavities: per-surface absorption coefficients, or the diffuse-field absorption of a
    rigid-backed lining computed by the transfer-matrix method
    (:func:`seatool.physics.tmm.diffuse_absorption`), combined by Sabine or Eyring
    (:func:`seatool.physics.damping.cavity_loss_factor_from_surfaces`).

``air_absorption = { temperature, relative_humidity, pressure }`` adds the ISO 9613-1 air
absorption loss factor (:func:`seatool.physics.air_absorption.air_absorption_loss_factor`).

``damping`` is internal damping only. Radiation damping (power radiated into a cavity or
the exterior) comes from the coupling loss factors of radiation connections; a measured
reverberation time of a *structure* that includes radiation must not be combined with a
radiation connection to the same field, or that loss is counted twice.

Plate treatments (:func:`read_plate_treatment`, called by plate readers for a plate's
``treatment`` key) give a :class:`PlateTreatment`: the bonded added mass, the composite
loss factor of a free or constrained damping layer (Oberst; Ross, Kerwin & Ungar) and the
insertion loss of a trim build-up (transfer-matrix method, field incidence).

Layers and build-ups come from the built-in library (:mod:`seatool.treatments`) by name,
or inline in the model file: ``{ base = "heavy_layer_5kg", thickness = 0.004 }`` changes a
built-in layer; ``{ kind = "porous", ... }`` states a new one; an array lists layers from
the base outwards.
"""

from __future__ import annotations

import functools
import math
import warnings
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Literal

import numpy as np
import numpy.typing as npt

from seatool.errors import closest
from seatool.materials import load_materials
from seatool.modelfile import DAMPING_FORMS, DEFAULT_FLUID, Reader
from seatool.physics import air_absorption, damping_layers, porous, tmm, tmm_transmission
from seatool.physics import damping as dmp
from seatool.physics.air import AIR_DENSITY, AIR_SOUND_SPEED
from seatool.physics.damping_layers import ModulusTable
from seatool.treatments import Treatment, load_treatments

if TYPE_CHECKING:
    from seatool.model import Model

__all__ = [
    "PlateTreatment",
    "TrimLayer",
    "lining_absorption",
    "read_layers",
    "read_plate_treatment",
    "summary_lines",
]

Array = npt.NDArray[np.float64]

_METHODS = ("auto", "sabine", "eyring")
_LAYER_KINDS = ("porous", "heavy_layer", "viscoelastic", "air_gap")
_POROUS_MODELS = ("jca", "delany_bazley", "miki")
_FRAMES = ("rigid", "limp")
#: Keys of an inline layer table, per kind (besides ``kind``, ``base``, ``description``).
_KIND_KEYS: dict[str, tuple[str, ...]] = {
    "porous": (
        "thickness",
        "density",
        "flow_resistivity",
        "porosity",
        "tortuosity",
        "viscous_length",
        "thermal_length",
        "model",
        "frame",
    ),
    "heavy_layer": ("thickness", "density"),
    "viscoelastic": ("thickness", "density", "poisson", "modulus"),
    "air_gap": ("thickness",),
}
_REQUIRED: dict[str, tuple[str, ...]] = {
    "porous": ("thickness", "density", "flow_resistivity"),
    "heavy_layer": ("thickness", "density"),
    "viscoelastic": ("thickness", "density", "modulus"),
    "air_gap": ("thickness",),
}
_UNITS = {
    "thickness": "m",
    "density": "kg/m^3",
    "flow_resistivity": "Pa s/m^2",
    "viscous_length": "m",
    "thermal_length": "m",
}


@functools.lru_cache(maxsize=1)
def _library() -> dict[str, Treatment]:
    return load_treatments()


def _join(path: str, key: str) -> str:
    return f"{path}.{key}" if path else key


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


# ------------------------------------------------------------------------------------------
# layers
# ------------------------------------------------------------------------------------------


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
        """The transfer-matrix layer (:func:`seatool.treatments.to_tmm_layer`)."""
        if self.treatment is None:
            return tmm.AirLayer(self.thickness)
        from seatool.treatments import to_tmm_layer

        return to_tmm_layer(self.treatment, model=self.model, frame=self.frame)


def _tmm_layers(layers: Sequence[TrimLayer]) -> list[tmm.Layer]:
    return [layer.tmm_layer() for layer in layers]


def _buildup_text(layers: Sequence[TrimLayer]) -> str:
    return " + ".join(f"{x.name} {1000 * x.thickness:.3g} mm" for x in layers)


def _validity_notes(layers: Sequence[TrimLayer], f: Array, rho0: float) -> list[str]:
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


def _quiet(func: Any, *args: Any, **kwargs: Any) -> Any:
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
            rd.error(_join(path, key), f"must be a non-empty array of numbers, got {_type(v)}")
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
        return ModulusTable(tuple(cols[0]), tuple(cols[1]), tuple(cols[2]), kind=kind)  # type: ignore[arg-type]
    except ValueError as exc:
        rd.error(path, str(exc))
        return None


def _read_fields(
    rd: Reader, t: Mapping[str, Any], path: str, kind: str, modulus_kind: str
) -> dict[str, Any] | None:
    """Numbers and options of an inline layer table (keys already checked)."""
    out: dict[str, Any] = {}
    ok = True
    for key in _KIND_KEYS[kind]:
        if key not in t:
            continue
        kp = _join(path, key)
        v = t[key]
        if key in ("model", "frame"):
            choices = _POROUS_MODELS if key == "model" else _FRAMES
            if v not in choices:
                hint = closest(v, choices) if isinstance(v, str) else ""
                rd.error(kp, f"must be one of {', '.join(choices)}, got {v!r}" + hint)
                ok = False
            else:
                out[key] = v
        elif key == "modulus":
            m = _read_modulus(rd, v, kp, modulus_kind)
            ok = ok and m is not None
            out[key] = m
        elif key == "porosity":
            x = rd.number(v, kp)
            if x is not None and x > 1.0:
                rd.error(kp, f"must lie in (0, 1], got {v}")
                x = None
            ok = ok and x is not None
            out[key] = x
        elif key == "tortuosity":
            x = rd.number(v, kp, minimum=1.0, strict=False)
            ok = ok and x is not None
            out[key] = x
        elif key == "poisson":
            x = rd.number(v, kp, minimum=-1.0)
            if x is not None and x >= 0.5:
                rd.error(kp, f"must be < 0.5, got {v}")
                x = None
            ok = ok and x is not None
            out[key] = x
        else:
            x = rd.number(v, kp, unit=_UNITS.get(key, ""))
            ok = ok and x is not None
            out[key] = x
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
            rd.error(_join(path, "model"), "'jca' needs viscous_length and thermal_length")
            return None
        if frame == "limp" and (model != "jca" or not t.density):
            rd.error(_join(path, "frame"), "a limp frame needs model 'jca' and a density")
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
            rd.error(
                _join(path, "base"), f"must be a layer name (a string), got {_type(base_name)}"
            )
            return None
        got = _library_layers(rd, base_name, _join(path, "base"))
        if got is None:
            return None
        if "kind" in t:
            rd.error(_join(path, "kind"), "give either base (a built-in layer) or kind, not both")
            return None
        if len(got) > 1:
            if set(t) - {"base", "description"}:
                rd.error(
                    _join(path, "base"),
                    f"{base_name!r} is a build-up; to change one of its layers list them as an "
                    "array of layers",
                )
                return None
            return got
        base = got[0].treatment
        assert base is not None
        kind: Any = base.kind
        allowed = ("base", "description", *_KIND_KEYS[kind])
        if not _keys_ok(rd, t, path, allowed):
            return None
        fields = _read_fields(
            rd, t, path, kind, base.modulus.kind if base.modulus else modulus_kind
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
            _join(path, "kind"),
            "missing: give base = a built-in layer name, or kind = " + " | ".join(_LAYER_KINDS),
        )
        return None
    if kind not in _LAYER_KINDS:
        hint = closest(kind, _LAYER_KINDS) if isinstance(kind, str) else ""
        rd.error(
            _join(path, "kind"),
            f"unknown layer kind {kind!r}{hint}; known: {', '.join(_LAYER_KINDS)}",
        )
        return None
    allowed = ("kind", "description", *_KIND_KEYS[kind])
    if not _keys_ok(rd, t, path, allowed, _REQUIRED[kind]):
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


# ------------------------------------------------------------------------------------------
# damping forms
# ------------------------------------------------------------------------------------------


def _freqs(rd: Reader) -> Array:
    assert rd.bands is not None
    return np.asarray(rd.bands.centre, dtype=np.float64)


def _fluid(context: Mapping[str, Any]) -> tuple[float, float]:
    fluid = context.get("fluid") or DEFAULT_FLUID
    return float(fluid["density"]), float(fluid["sound_speed"])


def _cavity_volume(rd: Reader, context: Mapping[str, Any], path: str, form: str) -> float | None:
    """The cavity volume from the context; reports a problem if the form is misplaced."""
    if "volume" not in context:
        rd.error(
            _join(path, form),
            f"damping form {form!r} needs a cavity (its volume); for a structure state a "
            "loss factor spectrum or reverberation_time",
        )
        return None
    v = context["volume"]
    return None if v is None else float(v)  # None: the volume's own problem is reported


def _air_absorption(
    rd: Reader, value: Any, path: str, f: Array, context: Mapping[str, Any]
) -> Array | None:
    t = rd.table(value, path)
    if t is None:
        return None
    if not _keys_ok(rd, t, path, ("temperature", "relative_humidity", "pressure")):
        return None
    rho, c = _fluid(context)
    if not (0.5 < rho < 5.0 and 250.0 < c < 450.0):
        rd.error(
            path,
            f"ISO 9613-1 air absorption applies to air; this cavity's fluid has density "
            f"{rho:g} kg/m^3 and sound speed {c:g} m/s",
        )
        return None
    temp = rd.number(
        t.get("temperature", 20.0), _join(path, "temperature"), unit="deg C", minimum=None
    )
    rh = rd.number(
        t.get("relative_humidity", 50.0),
        _join(path, "relative_humidity"),
        unit="%",
        minimum=0.0,
        strict=False,
    )
    pa = rd.number(t.get("pressure", 101.325e3), _join(path, "pressure"), unit="Pa")
    ok = temp is not None and rh is not None and pa is not None
    if temp is not None and not -50.0 <= temp <= 60.0:
        rd.error(_join(path, "temperature"), f"{temp:g} deg C is outside -50 .. 60 deg C")
        ok = False
    if rh is not None and rh > 100.0:
        rd.error(_join(path, "relative_humidity"), f"must be <= 100 %, got {rh:g}")
        ok = False
    if not ok:
        return None
    assert temp is not None and rh is not None and pa is not None
    return air_absorption.air_absorption_loss_factor(
        f, temperature=temp, relative_humidity=rh, pressure=pa, c0=c
    )


def _read_t60_form(
    rd: Reader, t: dict[str, Any], path: str, context: Mapping[str, Any]
) -> Array | None:
    if "air_absorption" in t:
        rd.error(
            _join(path, "air_absorption"),
            "not with reverberation_time: a reverberation time already includes air absorption",
        )
        return None
    if not _keys_ok(rd, t, path, ("reverberation_time",)):
        return None
    t60 = rd.spectrum(t["reverberation_time"], _join(path, "reverberation_time"), unit="s")
    if t60 is None:
        return None
    return dmp.loss_factor_from_t60(_freqs(rd), t60)


def _read_area_form(
    rd: Reader, t: dict[str, Any], path: str, context: Mapping[str, Any]
) -> Array | None:
    ok = _keys_ok(rd, t, path, ("absorption_area", "air_absorption"))
    vol = _cavity_volume(rd, context, path, "absorption_area")
    a = rd.spectrum(
        t["absorption_area"], _join(path, "absorption_area"), unit="m^2", minimum=0.0, strict=False
    )
    f = _freqs(rd)
    air = (
        _air_absorption(rd, t["air_absorption"], _join(path, "air_absorption"), f, context)
        if "air_absorption" in t
        else np.zeros_like(f)
    )
    if not ok or vol is None or a is None or air is None:
        return None
    _, c = _fluid(context)
    return dmp.cavity_loss_factor(f, vol, a, c0=c) + air


def _read_surfaces_form(
    rd: Reader, t: dict[str, Any], path: str, context: Mapping[str, Any]
) -> Array | None:
    ok = _keys_ok(rd, t, path, ("surfaces", "method", "air_absorption"))
    vol = _cavity_volume(rd, context, path, "surfaces")
    method = t.get("method", "auto")
    if method not in _METHODS:
        hint = closest(method, _METHODS) if isinstance(method, str) else ""
        rd.error(
            _join(path, "method"), f"must be one of {', '.join(_METHODS)}, got {method!r}{hint}"
        )
        ok = False
    f = _freqs(rd)
    rho, c = _fluid(context)
    spath = _join(path, "surfaces")
    surfaces = t["surfaces"]
    if not isinstance(surfaces, list) or not surfaces:
        rd.error(spath, "must be a non-empty array of tables { area, absorption | lining }")
        return None
    areas: list[float] = []
    alphas: list[Array] = []
    for i, s in enumerate(surfaces):
        p = f"{spath}[{i}]"
        st = rd.table(s, p)
        if st is None:
            ok = False
            continue
        if not _keys_ok(rd, st, p, ("area", "absorption", "lining", "description"), ("area",)):
            ok = False
            continue
        area = rd.number(st["area"], _join(p, "area"), unit="m^2")
        given = [k for k in ("absorption", "lining") if k in st]
        if len(given) != 1:
            what = "neither" if not given else "both"
            rd.error(p, f"give exactly one of absorption (a spectrum) or lining (got {what})")
            ok = False
            continue
        alpha: Array | None
        if given[0] == "absorption":
            alpha = rd.spectrum(st["absorption"], _join(p, "absorption"), minimum=0.0, strict=False)
            if alpha is not None and np.any(alpha > 1.0):
                rd.error(_join(p, "absorption"), "absorption coefficients must lie in [0, 1]")
                alpha = None
        else:
            layers = read_layers(rd, st["lining"], _join(p, "lining"))
            alpha = None if layers is None else lining_absorption(f, layers, rho0=rho, c0=c)
            if layers is not None:
                _report_lining(rd, path, i, st, layers, f, rho)
        if area is None or alpha is None:
            ok = False
            continue
        areas.append(area)
        alphas.append(alpha)
    air = (
        _air_absorption(rd, t["air_absorption"], _join(path, "air_absorption"), f, context)
        if "air_absorption" in t
        else np.zeros_like(f)
    )
    if not ok or vol is None or air is None:
        return None
    s_arr = np.asarray(areas)
    a_arr = np.stack(alphas, axis=-1)  # (bands, surfaces)
    total = float(np.sum(s_arr))
    surface_area = context.get("surface_area")
    if surface_area is not None and total > 1.01 * float(surface_area):
        rd.error(
            spath,
            f"the surfaces add up to {total:.4g} m^2, more than the cavity's surface area "
            f"{float(surface_area):.4g} m^2",
        )
        return None
    mean = a_arr @ s_arr / total
    eyring = np.ones_like(mean, bool) if method == "eyring" else mean > dmp.EYRING_THRESHOLD
    if method != "sabine" and np.any(eyring & (mean >= 1.0)):
        bad = (
            [rd.bands.label(int(j)) for j in np.flatnonzero(eyring & (mean >= 1.0))]
            if rd.bands
            else []
        )
        rd.error(
            spath,
            f"mean absorption coefficient is 1 in band(s) {', '.join(bad[:6])}: Eyring's formula "
            "needs it below 1 (use method = 'sabine' or lower an absorption)",
        )
        return None
    eta = dmp.cavity_loss_factor_from_surfaces(f, vol, s_arr, a_arr, method=method, c0=c)
    return np.asarray(eta + air, dtype=np.float64)


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
    exposed_first = list(reversed(_tmm_layers(layers)))
    if not any(isinstance(x, tmm.AirLayer | tmm.PorousLayer) for x in exposed_first):
        # impervious masses on a rigid wall cannot move: Z_s is infinite, nothing absorbed
        return np.zeros_like(np.asarray(f, dtype=np.float64))
    alpha = _quiet(tmm.diffuse_absorption, f, exposed_first, backing="rigid", rho0=rho0, c0=c0)
    return np.clip(np.asarray(alpha, dtype=np.float64), 0.0, 1.0)


DAMPING_FORMS["reverberation_time"] = _read_t60_form
DAMPING_FORMS["absorption_area"] = _read_area_form
DAMPING_FORMS["surfaces"] = _read_surfaces_form


# ------------------------------------------------------------------------------------------
# plate treatments
# ------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class PlateTreatment:
    """A plate's treatment as read from the model file.

    Attributes
    ----------
    added_mass_per_area : float
        Mass per area bonded to the plate and moving with it [kg/m^2]: damping layer and
        constraining cover. Add it to the plate's ``mass_per_area``.
    loss_factor : ndarray or None
        Composite damping loss factor per band [-] of the plate with its damping layer
        (includes the base material's loss factor); None without a damping layer. It
        replaces the plate's damping unless the plate states ``damping`` itself.
    insertion_loss_db : ndarray or None
        Insertion loss per band [dB] of the trim on the face looking into cavity
        :attr:`face` (transfer-matrix method, field incidence); None without a trim.
    face : str or None
        Name of the cavity subsystem the trimmed face looks into.
    description : str
        One line describing the treatment with its masses per area.
    bending_stiffness : ndarray or None
        Re D* of the damped plate per band [N m] (for information; None without a layer).
    damping_layer : str or None
        Name of the damping layer.
    constrained : bool
        True for a constrained layer (with a cover).
    damping_mass_per_area : float
        Mass per area of the damping layer alone [kg/m^2].
    cover_mass_per_area : float
        Mass per area of the constraining cover [kg/m^2].
    trim : tuple of TrimLayer
        Trim layers from the plate outwards.
    trim_mass_per_area : float
        Mass per area of the trim [kg/m^2]. Not in :attr:`added_mass_per_area`: a trim's
        mass acts through its insertion loss (already in the TMM), and a decoupled trim does
        not move with the plate above its mass-spring resonance.
    bare_mass_per_area : float
        Mass per area of the plate without treatment [kg/m^2].
    notes : tuple of str
        Validity notes (e.g. porous models outside their fitting range).
    """

    added_mass_per_area: float
    loss_factor: Array | None
    insertion_loss_db: Array | None
    face: str | None
    description: str
    bending_stiffness: Array | None = None
    damping_layer: str | None = None
    constrained: bool = False
    damping_mass_per_area: float = 0.0
    cover_mass_per_area: float = 0.0
    trim: tuple[TrimLayer, ...] = ()
    trim_mass_per_area: float = 0.0
    bare_mass_per_area: float = 0.0
    notes: tuple[str, ...] = field(default=())

    @property
    def treated_mass_per_area(self) -> float:
        """Plate plus bonded layers [kg/m^2] (the plate's ``mass_per_area`` when treated)."""
        return self.bare_mass_per_area + self.added_mass_per_area

    def report(self, name: str) -> list[str]:
        """Lines for ``seatool check``: masses per area, loss factor and insertion loss."""
        out = [f"  {name}: {self.description}"]
        out.append(
            f"    mass per area: bare {self.bare_mass_per_area:.3g} + bonded "
            f"{self.added_mass_per_area:.3g} = {self.treated_mass_per_area:.3g} kg/m^2"
            + (
                f"; trim {self.trim_mass_per_area:.3g} kg/m^2 (in its insertion loss)"
                if self.trim
                else ""
            )
        )
        if self.loss_factor is not None:
            out.append(f"    composite loss factor {_rng(self.loss_factor)}")
        if self.insertion_loss_db is not None:
            out.append(
                f"    trim insertion loss {_rng(self.insertion_loss_db)} dB into {self.face!r}"
            )
        out.extend(f"    note: {n}" for n in self.notes)
        return out

    def provenance(self) -> dict[str, str]:
        """Provenance entries for the treated plate subsystem."""
        out = {"treatment": self.description}
        if self.loss_factor is not None:
            out["damping"] = (
                "constrained-layer composite loss factor (Ross, Kerwin & Ungar 1959)"
                if self.constrained
                else "free-layer composite loss factor (Oberst 1952; Ross, Kerwin & Ungar 1959)"
            )
        if self.insertion_loss_db is not None:
            out["trim_insertion_loss"] = (
                "transfer-matrix method, field incidence (Allard & Atalla 2009)"
            )
        return out


def _rng(a: Array) -> str:
    lo, hi = float(np.min(a)), float(np.max(a))
    return f"{lo:.3g}" if math.isclose(lo, hi, rel_tol=1e-3) else f"{lo:.3g} .. {hi:.3g}"


_TREATMENT_KEYS = ("damping_layer", "constrained", "cover", "trim", "face", "description")


def _material(rd: Reader, value: Any, path: str) -> Mapping[str, float] | None:
    builtin = {
        k: {
            "density": m.density,
            "youngs_modulus": m.youngs_modulus,
            "poisson_ratio": m.poisson_ratio,
            "loss_factor": m.loss_factor,
        }
        for k, m in load_materials().items()
    }
    known = {**builtin, **rd.materials}
    name = rd.name_ref(value, path, known, "material")
    return None if name is None else known[name]


def _prop(mat: Mapping[str, Any], key: str, default: float) -> float:
    """A material property, or ``default`` when it is missing or None."""
    v = mat.get(key)
    return default if v is None else float(v)


def _homogeneous(plate: Mapping[str, Any]) -> tuple[float, Mapping[str, float]] | None:
    h = plate.get("thickness")
    mat = plate.get("material")
    if h is None or not isinstance(mat, Mapping):
        return None
    if not all(k in mat for k in ("density", "youngs_modulus")):
        return None
    if np.ndim(h) != 0:
        return None
    return float(h), mat


def read_plate_treatment(
    rd: Reader, value: Any, path: str, plate: Mapping[str, Any]
) -> PlateTreatment | None:
    """Read a plate's ``treatment`` table.

    Parameters
    ----------
    rd : Reader
        Reader (its bands are used).
    value : Any
        The value of the ``treatment`` key::

            treatment = { damping_layer = LAYER, constrained = false,
                          cover = { material = "steel", thickness = 0.0005 },
                          trim = LAYERS, face = "cavity name", description = "..." }

        ``LAYER``: a viscoelastic library name or inline table; ``LAYERS``: see
        :func:`read_layers`.
    path : str
        Key path (``subsystems.NAME.treatment``).
    plate : mapping
        The plate's properties (DEVELOPERS.md keys: ``thickness``, ``material``,
        ``mass_per_area``, ...; optionally ``fluid`` with ``density`` and ``sound_speed``).

    Returns
    -------
    PlateTreatment or None
        None after reporting problems through ``rd.error``.
    """
    t = rd.table(value, path)
    if t is None or rd.bands is None:
        return None
    if not _keys_ok(rd, t, path, _TREATMENT_KEYS):
        return None
    if "damping_layer" not in t and "trim" not in t:
        rd.error(path, "give damping_layer, trim or both")
        return None
    f = _freqs(rd)
    fluid = plate.get("fluid") or DEFAULT_FLUID
    rho0, c0 = float(fluid["density"]), float(fluid["sound_speed"])
    m_bare = plate.get("mass_per_area")
    homog = _homogeneous(plate)
    ok = True
    parts: list[str] = []
    notes: list[str] = []

    constrained = t.get("constrained", "cover" in t)
    if not isinstance(constrained, bool):
        rd.error(_join(path, "constrained"), f"must be true or false, got {_type(constrained)}")
        return None
    if "damping_layer" not in t:
        for k in ("constrained", "cover"):
            if k in t:
                rd.error(_join(path, k), "only with a damping_layer")
                ok = False
    if constrained and "cover" not in t and "damping_layer" in t:
        rd.error(
            _join(path, "cover"), "a constrained layer needs a cover = { material, thickness }"
        )
        ok = False
    if not constrained and "cover" in t:
        rd.error(
            _join(path, "constrained"),
            "a cover makes a constrained layer; remove constrained = false or the cover",
        )
        ok = False

    eta: Array | None = None
    stiff: Array | None = None
    layer_name: str | None = None
    m_layer = m_cover = 0.0
    base_extra: list[tmm.Layer] = []
    if "damping_layer" in t and ok:
        lp = _join(path, "damping_layer")
        got = read_layers(
            rd, t["damping_layer"], lp, modulus_kind="shear" if constrained else "young"
        )
        if got is None:
            return None
        if len(got) != 1 or got[0].kind != "viscoelastic" or got[0].treatment is None:
            rd.error(
                lp,
                "must be one viscoelastic layer (e.g. 'damping_sheet_free', 'vem_core_constrained')",
            )
            return None
        layer = got[0]
        vt = layer.treatment
        assert vt is not None and vt.modulus is not None and vt.density is not None
        want = "shear" if constrained else "young"
        if vt.modulus.kind != want:
            what = (
                "a constrained core needs a shear modulus table"
                if constrained
                else "a free layer needs a Young's modulus table (a constrained layer needs "
                "cover = { material, thickness })"
            )
            rd.error(lp, f"{layer.name!r} has a {vt.modulus.kind} modulus table; {what}")
            return None
        if homog is None:
            rd.error(lp, "a damping layer needs a homogeneous plate (thickness and material)")
            return None
        h1, mat = homog
        e1, rho1 = float(mat["youngs_modulus"]), float(mat["density"])
        nu1 = _prop(mat, "poisson_ratio", 0.3)
        eta1 = _prop(mat, "loss_factor", 0.0)
        nu2 = vt.poisson if vt.poisson is not None else 0.3
        layer_name = layer.name
        if constrained:
            cp = _join(path, "cover")
            ct = rd.table(t["cover"], cp)
            if ct is None or not _keys_ok(
                rd, ct, cp, ("material", "thickness"), ("material", "thickness")
            ):
                return None
            cmat = _material(rd, ct["material"], _join(cp, "material"))
            h3 = rd.number(ct["thickness"], _join(cp, "thickness"), unit="m")
            if cmat is None or h3 is None:
                return None
            res = damping_layers.constrained_layer_damping(
                f, h1, e1, rho1, layer.thickness, vt.density, vt.modulus,
                h3, float(cmat["youngs_modulus"]), float(cmat["density"]),
                base_loss_factor=eta1, cover_loss_factor=_prop(cmat, "loss_factor", 0.0),
                base_poisson=nu1, cover_poisson=_prop(cmat, "poisson_ratio", 0.3),
            )  # fmt: skip
            m_cover = float(cmat["density"]) * h3
            parts.append(
                f"constrained layer {layer.name} {1000 * layer.thickness:.3g} mm under "
                f"{1000 * h3:.3g} mm cover ({vt.density * layer.thickness + m_cover:.3g} kg/m^2)"
            )
        else:
            res = damping_layers.free_layer_damping(
                f, h1, e1, rho1, layer.thickness, vt.density, vt.modulus,
                base_loss_factor=eta1, base_poisson=nu1, layer_poisson=nu2,
            )  # fmt: skip
            parts.append(
                f"free damping layer {layer.name} {1000 * layer.thickness:.3g} mm "
                f"({vt.density * layer.thickness:.3g} kg/m^2)"
            )
        m_layer = vt.density * layer.thickness
        eta, stiff = res.loss_factor, res.bending_stiffness
        base_extra = [tmm.LimpLayer(res.added_mass_per_area)]
        lo, hi = vt.modulus.frequency[0], vt.modulus.frequency[-1]
        if f[0] < lo / 1.12 or f[-1] > hi * 1.12:
            notes.append(
                f"{layer.name}: modulus table covers {lo:g} - {hi:g} Hz; held constant outside"
            )

    il: Array | None = None
    trim: tuple[TrimLayer, ...] = ()
    face: str | None = None
    if "trim" in t:
        trim_layers = read_layers(rd, t["trim"], _join(path, "trim"))
        if "face" not in t:
            rd.error(_join(path, "face"), "missing: name the cavity subsystem the trim faces")
            ok = False
        else:
            face = rd.string(t["face"], _join(path, "face"))
            if face is not None and rd.declared and face not in rd.declared:
                face = rd.name_ref(face, _join(path, "face"), list(rd.declared), "subsystem")
            ok = ok and face is not None
        if trim_layers is None or not ok:
            return None
        trim = tuple(trim_layers)
        if homog is not None:
            h1, mat = homog
            base: list[tmm.Layer] = [
                tmm.PlateLayer(
                    h1,
                    float(mat["youngs_modulus"]),
                    float(mat["density"]),
                    _prop(mat, "poisson_ratio", 0.3),
                    _prop(mat, "loss_factor", 0.01),
                ),
                *base_extra,
            ]
        elif m_bare is not None:
            base = [tmm.LimpLayer(float(m_bare))]
            notes.append(
                "trim insertion loss on a limp base of the plate's mass (no thickness/material)"
            )
        else:
            rd.error(_join(path, "trim"), "the plate has no mass per area to put the trim on")
            return None
        res_il = _quiet(
            tmm_transmission.insertion_loss, f, base, _tmm_layers(trim), rho0=rho0, c0=c0
        )
        il = np.asarray(res_il.insertion_loss, dtype=np.float64)
        notes.extend(_validity_notes(trim, f, rho0))
        parts.append(
            f"trim {_buildup_text(trim)} ({tmm.mass_per_area(_tmm_layers(trim)):.3g} kg/m^2) "
            f"facing {face!r}"
        )
    elif "face" in t:
        rd.error(_join(path, "face"), "only with a trim")
        return None
    if not ok:
        return None
    desc = t.get("description")
    if desc is not None and not isinstance(desc, str):
        rd.error(_join(path, "description"), f"must be a string, got {_type(desc)}")
        return None
    text = "; ".join(parts) + (f" -- {desc}" if desc else "")
    return PlateTreatment(
        added_mass_per_area=m_layer + m_cover,
        loss_factor=_frozen(eta),
        insertion_loss_db=_frozen(il),
        face=face,
        description=text,
        bending_stiffness=_frozen(stiff),
        damping_layer=layer_name,
        constrained=constrained and layer_name is not None,
        damping_mass_per_area=m_layer,
        cover_mass_per_area=m_cover,
        trim=trim,
        trim_mass_per_area=tmm.mass_per_area(_tmm_layers(trim)) if trim else 0.0,
        bare_mass_per_area=float(m_bare) if m_bare is not None else 0.0,
        notes=tuple(notes),
    )


def _frozen(a: Array | None) -> Array | None:
    if a is None:
        return None
    out = np.array(a, dtype=np.float64)
    out.setflags(write=False)
    return out


# ------------------------------------------------------------------------------------------
# report
# ------------------------------------------------------------------------------------------


def summary_lines(model: Model) -> list[str]:
    """Lines for ``seatool check``: treated plates and cavity linings with masses per area.

    Plate treatments come from ``properties["treatment"]``; cavity linings from the
    reports the ``surfaces`` damping form left in :attr:`Model.reports`.
    """
    lines: list[str] = []
    for s in model.subsystems:
        t = s.properties.get("treatment")
        if isinstance(t, PlateTreatment):
            lines.extend(t.report(s.name))
    lines.extend(model.reports)
    return (["treatments:", *lines]) if lines else []


def _report_lining(
    rd: Reader,
    path: str,
    i: int,
    surface: Mapping[str, Any],
    layers: Sequence[TrimLayer],
    f: Array,
    rho0: float,
) -> None:
    """Add the lining's build-up and mass to the model's reports, its validity to the notes."""
    parts = path.split(".")
    name = parts[1] if len(parts) > 1 else path
    m = tmm.mass_per_area(_tmm_layers(layers))
    what = surface.get("description")
    what = what if isinstance(what, str) else ""
    rd.reports.append(
        f"  {name}: lining on surface {i}{f' ({what})' if what else ''}, "
        f"{surface.get('area', '?')} m^2: {_buildup_text(layers)} ({m:.3g} kg/m^2)"
    )
    rd.notes.extend(f"{name} lining: {n}" for n in _validity_notes(layers, f, rho0))
