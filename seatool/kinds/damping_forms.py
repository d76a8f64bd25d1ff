"""Damping forms: ways to state a subsystem's internal damping loss factor.

Besides a spectrum (``damping = 0.01``, a table or a CSV column), ``damping`` may be one of
the forms declared below (the key inside the inline table names the form):

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
absorption loss factor (:func:`seatool.physics.damping.air_absorption_loss_factor`).

``damping`` is internal damping only. Radiation damping (power radiated into a cavity or
the exterior) comes from the coupling loss factors of radiation connections; a measured
reverberation time of a *structure* that includes radiation must not be combined with a
radiation connection to the same field, or that loss is counted twice.

A form's ``derive(reader, table, path, context)`` returns the per-band loss factor;
``context`` carries what the subsystem kind knows (``volume``, ``surface_area``,
``fluid`` as :class:`seatool.properties.FluidProps`, ``area`` ...).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import Any

import numpy as np
import numpy.typing as npt

from ..errors import closest
from ..physics import air_absorption, tmm
from ..physics import damping as dmp
from .layers import (
    TrimLayer,
    buildup_text,
    lining_absorption,
    read_layers,
    tmm_layers,
    validity_notes,
)
from .params import Kind, Param
from .reader import DEFAULT_FLUID, Reader, join
from .validate import check_value

__all__ = ["DAMPING_FORMS", "DAMPING_KINDS", "read_damping"]

Array = npt.NDArray[np.float64]

_METHODS = ("auto", "sabine", "eyring")


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


def _freqs(rd: Reader) -> Array:
    assert rd.bands is not None
    return np.asarray(rd.bands.centre, dtype=np.float64)


def _fluid(context: Mapping[str, Any]) -> tuple[float, float]:
    fluid = context.get("fluid")
    if fluid is None:
        return DEFAULT_FLUID["density"], DEFAULT_FLUID["sound_speed"]
    return float(fluid.density), float(fluid.sound_speed)


def _cavity_volume(rd: Reader, context: Mapping[str, Any], path: str, form: str) -> float | None:
    """The cavity volume from the context; reports a problem if the form is misplaced."""
    if "volume" not in context:
        rd.error(
            join(path, form),
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
        t.get("temperature", 20.0), join(path, "temperature"), unit="deg C", minimum=None
    )
    rh = rd.number(
        t.get("relative_humidity", 50.0),
        join(path, "relative_humidity"),
        unit="%",
        minimum=0.0,
        strict=False,
    )
    pa = rd.number(t.get("pressure", 101.325e3), join(path, "pressure"), unit="Pa")
    ok = temp is not None and rh is not None and pa is not None
    if temp is not None and not -50.0 <= temp <= 60.0:
        rd.error(join(path, "temperature"), f"{temp:g} deg C is outside -50 .. 60 deg C")
        ok = False
    if rh is not None and rh > 100.0:
        rd.error(join(path, "relative_humidity"), f"must be <= 100 %, got {rh:g}")
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
            join(path, "air_absorption"),
            "not with reverberation_time: a reverberation time already includes air absorption",
        )
        return None
    if not _keys_ok(rd, t, path, ("reverberation_time",)):
        return None
    ok, t60 = check_value(rd, _T60, t["reverberation_time"], join(path, "reverberation_time"))
    if not ok:
        return None
    return dmp.loss_factor_from_t60(_freqs(rd), t60)


def _read_area_form(
    rd: Reader, t: dict[str, Any], path: str, context: Mapping[str, Any]
) -> Array | None:
    ok = _keys_ok(rd, t, path, ("absorption_area", "air_absorption"))
    vol = _cavity_volume(rd, context, path, "absorption_area")
    _, a = check_value(rd, _AREA, t["absorption_area"], join(path, "absorption_area"))
    f = _freqs(rd)
    air = (
        _air_absorption(rd, t["air_absorption"], join(path, "air_absorption"), f, context)
        if "air_absorption" in t
        else np.zeros_like(f)
    )
    if not ok or vol is None or a is None or air is None:
        return None
    surface = context.get("surface_area")
    if surface and np.any(a > float(surface)):
        rd.warn(
            join(path, "absorption_area"),
            f"absorption area up to {float(np.max(a)):.4g} m^2 is more than the cavity's "
            f"boundary area {float(surface):.4g} m^2: a mean absorption coefficient above 1, "
            "which no boundary has (Sabine); the cavity would be damped too much",
        )
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
            join(path, "method"), f"must be one of {', '.join(_METHODS)}, got {method!r}{hint}"
        )
        ok = False
    f = _freqs(rd)
    rho, c = _fluid(context)
    spath = join(path, "surfaces")
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
        area = rd.number(st["area"], join(p, "area"), unit="m^2")
        given = [k for k in ("absorption", "lining") if k in st]
        if len(given) != 1:
            what = "neither" if not given else "both"
            rd.error(p, f"give exactly one of absorption (a spectrum) or lining (got {what})")
            ok = False
            continue
        alpha: Array | None
        if given[0] == "absorption":
            alpha = rd.spectrum(st["absorption"], join(p, "absorption"), minimum=0.0, strict=False)
            if alpha is not None and np.any(alpha > 1.0):
                rd.error(join(p, "absorption"), "absorption coefficients must lie in [0, 1]")
                alpha = None
        else:
            layers = read_layers(rd, st["lining"], join(p, "lining"))
            alpha = None if layers is None else lining_absorption(f, layers, rho0=rho, c0=c)
            if layers is not None:
                _report_lining(rd, path, i, st, layers, f, rho)
        if area is None or alpha is None:
            ok = False
            continue
        areas.append(area)
        alphas.append(alpha)
    air = (
        _air_absorption(rd, t["air_absorption"], join(path, "air_absorption"), f, context)
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
    m = tmm.mass_per_area(tmm_layers(layers))
    what = surface.get("description")
    what = what if isinstance(what, str) else ""
    rd.reports.append(
        f"  {name}: lining on surface {i}{f' ({what})' if what else ''}, "
        f"{surface.get('area', '?')} m^2: {buildup_text(layers)} ({m:.3g} kg/m^2)"
    )
    rd.notes.extend(f"{name} lining: {n}" for n in validity_notes(layers, f, rho0))


_T60 = Param(
    "reverberation_time", "spectrum", "s", "reverberation time T60", required=True,
    bounds=(1e-4, 1e3), typical=(0.05, 10.0),
)  # fmt: skip
_AREA = Param(
    "absorption_area", "spectrum", "m^2", "equivalent absorption area A", required=True,
    minimum=0.0, strict=False, bounds=(0.0, 1e8),
)  # fmt: skip
_AIR = Param(
    "air_absorption",
    "table",
    doc="{ temperature [deg C] = 20, relative_humidity [%] = 50, pressure [Pa] = 101325 }: adds ISO 9613-1 air absorption",
)

#: The damping forms, by the key that names them.
DAMPING_KINDS: tuple[Kind, ...] = (
    Kind("damping", "reverberation_time", "Any subsystem: eta = 2.2 / (f T60).", (
        _T60,
    ), _read_t60_form, implicit=()),
    Kind("damping", "absorption_area", "Cavities: eta = c A / (8 pi f V).", (
        _AREA,
        _AIR,
    ), _read_area_form, implicit=()),
    Kind("damping", "surfaces", "Cavities: absorbing surfaces combined by Sabine or Eyring.", (
        Param("surfaces", "array", doc="[ { area [m^2], absorption (spectrum) | lining (layers), description }, ... ]", required=True),
        Param("method", "choice", doc="auto: Eyring above a mean absorption of 0.2", choices=_METHODS, default="auto"),
        _AIR,
    ), _read_surfaces_form, implicit=()),
)  # fmt: skip

#: Damping forms by the key inside ``damping = { ... }``.
DAMPING_FORMS: dict[str, Kind] = {k.name: k for k in DAMPING_KINDS}


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
        with np.errstate(all="ignore"):
            got = DAMPING_FORMS[forms[0]].derive(rd, value, path, context or {})
        return got
    ok, eta = check_value(rd, _LOSS_FACTOR, value, path)
    return eta if ok else None


#: A loss factor given directly (number, table or CSV): above 1 a mode loses its energy
#: within a cycle and the modal picture of SEA no longer holds (common practice).
_LOSS_FACTOR = Param(
    "damping", "spectrum", doc="damping loss factor", minimum=0.0, strict=False,
    bounds=(0.0, 1.0), basis="common practice: above 1 a mode is damped within one cycle",
)  # fmt: skip
