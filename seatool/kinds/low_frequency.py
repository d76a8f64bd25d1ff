"""The ``[low_frequency.CAVITY]`` section: a box-shaped cavity solved modally below the SEA
range, with the panels in its walls (``[low_frequency.CAVITY.panels.NAME]``).

Two declarations drive the generic checks and the key tables of ``docs/model-format.md``:
:data:`BOX` (the cavity's table) and :data:`PANEL` (each panel's table). Their derive
functions check what depends on the model: the cavity is a cavity with a fluid, the box
dimensions give its volume, each panel is a flat isotropic plate of the model that fits on
its face. The result is :attr:`seatool.model.Model.low_frequency`; the solution and the
merge with SEA are in :mod:`seatool.crossover`.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import numpy as np

from ..errors import closest
from ..model import LowFrequency, PanelPlacement, Subsystem
from ..physics.modal_box import FACES, face_axes
from .params import Kind, Param
from .reader import Reader, join
from .validate import check

__all__ = ["BOX", "LOW_FREQUENCY_KINDS", "PANEL", "read_low_frequency_section"]

#: Largest mismatch between the box volume and the cavity's volume [-].
VOLUME_TOLERANCE = 0.01

#: Bounds of lengths on a box (common practice: a vehicle, rail or building enclosure).
_BOUNDS = (0.0, 1000.0)


def _derive_box(
    rd: Reader, cavity: str, values: Mapping[str, Any], path: str,
    subs: Mapping[str, Subsystem], panels: dict[str, PanelPlacement],
) -> LowFrequency | None:  # fmt: skip
    """The checked request of one cavity (its panels already read into ``panels``)."""
    dims = _box_dims(rd, cavity, values, path, subs)
    return None if dims is None else LowFrequency(cavity, dims, values["up_to"], panels)


def _box_dims(
    rd: Reader, cavity: str, values: Mapping[str, Any], path: str,
    subs: Mapping[str, Subsystem],
) -> tuple[float, float, float] | None:  # fmt: skip
    """The box sides: given or the cavity's own, positive, giving the cavity's volume."""
    sub = subs[cavity]
    dims = values["dimensions"]
    if dims is None:
        given = getattr(sub.props, "dimensions", None)
        if given is None:
            rd.error(join(path, "dimensions"),
                     "missing: the cavity has no dimensions; give [Lx, Ly, Lz] [m]")  # fmt: skip
            return None
        dims = tuple(float(x) for x in given)
    elif min(dims) <= 0:
        rd.error(join(path, "dimensions"), f"give three positive lengths [m], got {list(dims)}")
        return None
    if sub.volume is None or sub.density is None or sub.sound_speed is None:
        rd.error(path, "the modal solution needs a cavity with a fluid and a volume")
        return None
    vol = float(np.prod(dims))
    if abs(vol / sub.volume - 1.0) > VOLUME_TOLERANCE:
        rd.error(
            join(path, "dimensions"),
            f"box dimensions give {vol:.4g} m^3 but the cavity has {sub.volume:.4g} m^3; "
            "make them agree",
        )
        return None
    return (dims[0], dims[1], dims[2])


def _derive_panel(
    rd: Reader, name: str, values: Mapping[str, Any], path: str, sub: Subsystem,
    dims: tuple[float, float, float] | None,
) -> PanelPlacement | None:  # fmt: skip
    """The placement of one panel: a flat isotropic plate that fits on its face."""
    props = sub.props
    keys = ("lx", "ly", "bending_stiffness", "mass_per_area")
    missing = [k for k in keys if getattr(props, k, None) is None]
    if missing or np.ndim(getattr(props, "bending_stiffness", 0.0)) != 0:
        rd.error(path, "the modal solution needs a flat isotropic plate (kind \"plate\"); "
                 f"{name!r} is not one")  # fmt: skip
        return None
    face = values["face"]
    off = values["offset"]
    size = (float(props.lx), float(props.ly))  # type: ignore[union-attr]
    ok = True
    if dims is not None:
        u, v, _, _ = face_axes(face)
        for side, o, ax in ((size[0], off[0], u), (size[1], off[1], v)):
            if o + side > dims[ax] * (1 + 1e-9):
                rd.error(join(path, "offset"),
                         f"a {side:g} m side at {o:g} m does not fit on face {face} "
                         f"({dims[ax]:g} m)")  # fmt: skip
                ok = False
    fp = values["force_point"]
    if fp is not None and (fp[0] > size[0] or fp[1] > size[1]):
        rd.error(join(path, "force_point"),
                 f"({fp[0]:g}, {fp[1]:g}) m is outside the {size[0]:g} m x {size[1]:g} m panel")  # fmt: skip
        ok = False
    return PanelPlacement(face, (off[0], off[1]), fp) if ok else None


BOX = Kind(
    "low_frequency",
    "box",
    "A box-shaped cavity solved modally (its modes and the panels' modes, coupled) in the "
    "bands below the SEA range; `CAVITY` names a cavity subsystem.",
    (
        Param("dimensions", "numbers", doc="box sides [Lx, Ly, Lz]; must give the cavity's "
              "volume within 1 %", default_doc="the cavity's `dimensions`", length=3,
              unit="m", minimum=0.0, strict=False, bounds=_BOUNDS),
        Param("up_to", "number_or_auto", "Hz", "highest band centre solved modally; "
              '`"auto"`: from the SEA validity limits (see below)', default="auto",
              bounds=(1.0, 100000.0)),
        Param("panels", "table", doc="the panels in its walls: "
              "`[low_frequency.CAVITY.panels.NAME]`, NAME a plate subsystem", required=True),
    ),
    _derive_box,
    implicit=("description",),
)

PANEL = Kind(
    "low_frequency",
    "panel",
    "A plate subsystem in a wall of the box: simply supported on its edges, set into one face.",
    (
        Param("face", "choice", doc="the wall: `x0` is the wall at x = 0, `x1` at x = Lx ...; "
              "the panel's `lx` runs along the face's first axis (y for x faces, x for y and "
              "z faces)", required=True, choices=FACES),
        Param("offset", "numbers", doc="the panel's corner [u0, v0] on the face",
              default=(0.0, 0.0), default_doc="[0, 0]", length=2, unit="m", minimum=0.0,
              strict=False, bounds=_BOUNDS),
        Param("force_point", "numbers", doc="where a force excitation on it acts [u, v] on the "
              "panel", default_doc="0.37 and 0.29 of its sides", length=2, unit="m",
              minimum=0.0, strict=False, bounds=_BOUNDS),
    ),
    _derive_panel,
    implicit=("description",),
)

LOW_FREQUENCY_KINDS = (BOX, PANEL)


def read_low_frequency_section(
    rd: Reader, data: Mapping[str, Any], subs: Mapping[str, Subsystem]
) -> list[LowFrequency]:
    """The ``[low_frequency.CAVITY]`` tables of parsed model data; problems go to ``rd``.

    ``subs`` are the subsystems read so far (a name whose own table had problems is not
    reported again).
    """
    out: list[LowFrequency] = []
    section = data.get("low_frequency")
    if section is None:
        return out
    t = rd.table(section, "low_frequency")
    if t is None:
        return out
    cavities = [n for n, s in subs.items() if s.quantity == "sound_pressure"]
    known = {**dict.fromkeys(rd.declared), **dict.fromkeys(subs)}
    for cavity, spec in t.items():
        path = f"low_frequency.{cavity}"
        if cavity not in subs or subs[cavity].quantity != "sound_pressure":
            if cavity not in known or cavity in subs:
                rd.error(path, "not a cavity of the model" + closest(cavity, cavities))
            continue
        table = rd.table(spec, path)
        if table is None:
            continue
        before = len(rd.problems)
        values = check(rd, BOX, table, path)
        raw_panels = table.get("panels")
        if values is None and raw_panels is None:
            continue
        if not isinstance(raw_panels, dict) or not raw_panels:
            if raw_panels is not None:
                rd.error(join(path, "panels"),
                         "name at least one panel: [low_frequency.CAVITY.panels.NAME]")  # fmt: skip
            continue
        dims = None if values is None else _box_dims(rd, cavity, values, path, subs)
        panels: dict[str, PanelPlacement] = {}
        for name, pt in raw_panels.items():
            ppath = f"{path}.panels.{name}"
            if name not in subs:
                if name not in known:
                    rd.error(ppath, "unknown subsystem" + closest(name, list(known)))
                continue
            ptable = rd.table(pt, ppath)
            if ptable is None:
                continue
            pvalues = check(rd, PANEL, ptable, ppath)
            if pvalues is None:
                continue
            place = _derive_panel(rd, name, pvalues, ppath, subs[name], dims)
            if place is not None:
                panels[name] = place
        if values is None or len(rd.problems) > before:
            continue
        if dims is not None:
            out.append(LowFrequency(cavity, dims, values["up_to"], panels))
    return out
