"""One treatment declaration with all its effects: a trim declared with ``facing`` lines the
cavity it faces.

``treatment = { trim = LAYERS, facing = "cab" }`` on a panel gives (read by
:mod:`seatool.kinds.plate_treatment`) the panel's added mass and damping and the trim's
insertion loss into ``cab``; after every subsystem is read, :func:`apply_facing` adds the
trim's absorption to ``cab``: the panel's area times the trim's diffuse-field absorption
coefficient (:func:`seatool.kinds.layers.lining_absorption`, the transfer-matrix method on a
rigid backing), exactly as if the same lining had been listed in the cavity's ``surfaces``:

* a cavity whose damping is ``{ surfaces = [...] }`` gets the lining as one more surface,
  combined with the others by Sabine or Eyring as the form states;
* any other damping (a loss factor, a reverberation time, an absorption area) gets the
  lining's absorption area added, eta += c0 S alpha / (8 pi f V) (Sabine's absorption areas
  add; :func:`seatool.physics.damping.cavity_loss_factor`).

The older double declaration (``face`` on the panel and the same lining again in the
cavity's surface list) keeps its meaning; its lining's mass is then counted once, on the
panel. A ``facing`` trim whose lining is also listed in the cavity's surfaces (same
build-up, same area within 1 %) is refused as declared twice.

Every cavity's lined surfaces are recorded in ``CavityProps.linings`` (area, mass per area)
so that :mod:`seatool.analysis.treatment_mass` counts their mass.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping
from typing import Any

import numpy as np

from ..model import Subsystem
from ..physics import damping as dmp
from ..physics import tmm
from ..properties import CavityProps, Lining, is_cavity
from .damping_forms import read_damping
from .layers import buildup_text, lining_absorption, read_layers, tmm_layers
from .reader import Reader, join

__all__ = ["apply_facing"]

#: Relative difference of areas below which a listed lining is the same surface as a trim.
SAME_AREA = 0.01


def _scratch(rd: Reader) -> Reader:
    """A reader with the same context whose reports and notes are dropped."""
    return Reader(
        file=rd.file,
        base_dir=rd.base_dir,
        bands=rd.bands,
        fluids=rd.fluids,
        materials=rd.materials,
        declared=rd.declared,
        invalid=rd.invalid,
    )


def _trim_raw(rd: Reader, name: str) -> Any:
    t = rd.declared.get(name)
    tr = t.get("treatment") if isinstance(t, Mapping) else None
    return tr.get("trim") if isinstance(tr, Mapping) else None


def _surfaces(raw: Any) -> list[Any] | None:
    if isinstance(raw, Mapping) and isinstance(raw.get("surfaces"), list):
        return list(raw["surfaces"])
    return None


def apply_facing(rd: Reader, subs: dict[str, Subsystem]) -> dict[str, Subsystem]:
    """Add the absorption of ``facing`` trims to the cavities they face; record every
    cavity's linings. Returns the subsystems (changed cavities replaced); problems go to
    ``rd``."""
    assert rd.bands is not None
    f = np.asarray(rd.bands.centre, dtype=np.float64)
    trims: dict[str, list[tuple[str, Any, float]]] = {}  # cavity -> (panel, treatment, area)
    for name, s in subs.items():
        t = getattr(s.props, "treatment", None)
        if t is None or getattr(t, "face", None) is None or name not in rd.declared:
            continue
        cav = subs.get(t.face)
        key = "facing" if t.absorbs else "face"
        if t.absorbs and (cav is None or not is_cavity(cav) or cav.name not in rd.declared):
            if cav is not None:
                rd.error(
                    f"subsystems.{name}.treatment.{key}",
                    f"{t.face!r} is not a cavity: a trim lines a cavity (use face = ... for "
                    "the insertion loss only)",
                )
            continue
        trims.setdefault(t.face, []).append((name, t, float(getattr(s.props, "area", 0.0))))
    out = dict(subs)
    for cname, cav in subs.items():
        if not isinstance(cav.props, CavityProps) or cname not in rd.declared:
            continue
        raw = rd.declared[cname]
        raw_damp = raw.get("damping") if isinstance(raw, Mapping) else None
        path = f"subsystems.{cname}.damping"
        listed = _surfaces(raw_damp) or []
        linings: list[Lining] = []
        twice = False
        scratch = _scratch(rd)
        for i, entry in enumerate(listed):
            if not isinstance(entry, Mapping) or "lining" not in entry:
                continue
            layers = read_layers(scratch, entry["lining"], join(path, f"surfaces[{i}].lining"))
            area = entry.get("area")
            if layers is None or not isinstance(area, int | float):
                continue
            owner = None
            for panel, t, a_p in trims.get(cname, []):
                same = (
                    entry["lining"] == _trim_raw(rd, panel) and abs(area - a_p) <= SAME_AREA * a_p
                )
                if not same:
                    continue
                if t.absorbs:
                    twice = True
                    rd.error(
                        join(path, f"surfaces[{i}]"),
                        f"declared twice: the treatment of {panel!r} (facing = {cname!r}) "
                        "already adds this lining's absorption; remove this surface, or write "
                        f"face = {cname!r} on {panel!r} for its insertion loss only",
                    )
                owner = panel
            desc = entry.get("description")
            linings.append(
                Lining(
                    float(area),
                    tmm.mass_per_area(tmm_layers(layers)),
                    desc if isinstance(desc, str) else f"surface {i}",
                    owner,
                )
            )
        facing = [(p, t, a) for p, t, a in trims.get(cname, []) if t.absorbs]
        eta = cav.damping
        prov = dict(cav.provenance)
        if facing and twice:
            continue  # reported; the area check of the surfaces would only repeat it
        if facing:
            rho, c = float(cav.props.fluid.density), float(cav.props.fluid.sound_speed)
            if listed:
                extra = [
                    {"area": a, "lining": _trim_raw(rd, p), "description": f"trim of {p}"}
                    for p, _, a in facing
                ]
                assert isinstance(raw_damp, Mapping)
                table = {**raw_damp, "surfaces": [*listed, *extra]}
                ctx = {
                    "volume": cav.props.volume,
                    "surface_area": cav.props.surface_area,
                    "edge_length": cav.props.edge_length,
                    "fluid": cav.props.fluid,
                }
                got = read_damping(scratch, table, path, ctx)
                if got is None:
                    rd.problems.extend(scratch.problems)
                    continue
                eta = got
            else:
                area_abs = sum(
                    a * lining_absorption(f, t.trim, rho0=rho, c0=c) for _, t, a in facing
                )
                eta = np.asarray(
                    cav.damping + dmp.cavity_loss_factor(f, cav.props.volume, area_abs, c0=c),
                    dtype=np.float64,
                )
            eta.setflags(write=False)
            prov["damping_treatments"] = "; ".join(
                f"absorption of the trim of {p!r} ({a:.4g} m^2, Sabine area added)"
                for p, _, a in facing
            )
            for p, t, a in facing:
                linings.append(Lining(a, float(t.trim_mass_per_area), f"trim of {p}", p))
                rd.reports.append(
                    f"  {cname}: lined by the trim of {p!r} ({a:.4g} m^2): "
                    f"{buildup_text(t.trim)} ({t.trim_mass_per_area:.3g} kg/m^2)"
                )
        rd.problems.extend(scratch.problems)
        if facing or linings:
            out[cname] = dataclasses.replace(
                cav,
                damping=eta,
                provenance=prov,
                props=dataclasses.replace(cav.props, linings=tuple(linings)),
            )
    return out
