"""Flat panel kinds: ``plate``, ``orthotropic_plate``, ``ribbed_plate``, ``sandwich_panel``.

Each is a declaration plus one derive function ``derive(reader, name, values, table, path)``
returning the component's wave fields; the formulas are in :mod:`seatool.physics.structural`.
"""

from __future__ import annotations

import dataclasses
from typing import Any

import numpy as np
import numpy.typing as npt

from ..model import Subsystem
from ..physics import orthotropic_plates, plates, sandwich
from .edge_seal import EDGE_SEAL_KEY, add_edge_seal
from .fields import (
    LX,
    LY,
    MATERIAL,
    PANEL_COMMON,
    THICKNESS,
    WAVE_FIELDS,
    bands_of,
    bending_fields,
    finish_panel,
    wave_fields,
)
from .params import Kind, Param
from .reader import Reader
from .validate import check_derived, default_fluid

__all__ = [
    "ORTHOTROPIC_PLATE",
    "PLATE",
    "RIBBED_PLATE",
    "SANDWICH_PANEL",
]

Array = npt.NDArray[np.float64]

_PLATE_FIELDS = ("bending", "longitudinal", "shear")
_D_BOUNDS = (1e-9, 1e12)  # bending stiffness [N m], foil to thick concrete (common practice)


def _geometry(v: dict[str, Any]) -> tuple[float, float, float, float]:
    lx, ly = v["lx"], v["ly"]
    return lx, ly, lx * ly, 2.0 * (lx + ly)


def _fluid(rd: Reader, v: dict[str, Any]) -> Any:
    return v["fluid"] if v["fluid"] is not None else default_fluid(rd)


def _plate(
    rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str
) -> list[Subsystem] | None:
    mat, h, fluid = v["material"], v["thickness"], _fluid(rd, v)
    fields = wave_fields(rd, s, path, _PLATE_FIELDS, "bending")
    if fields is None:
        return None
    geom = _geometry(v)
    b = bands_of(rd)
    d = float(plates.bending_stiffness(mat.youngs_modulus, h, mat.poisson_ratio))
    keys = (f"{path}.thickness", f"{path}.material")
    if not check_derived(
        rd, path, {"bending stiffness": d, "mass per area": mat.density * h}, keys
    ):
        return None
    c0, area = fluid.sound_speed, geom[2]

    def bending(m: float) -> tuple[Array, dict[str, Any], str]:
        n = plates.plate_bending_modal_density(b.centre, area, d, m)
        props = {
            **bending_fields(b.centre, d, m),
            "bending_stiffness": d,
            "critical_frequency": float(plates.critical_frequency(d, m, c0)),
        }
        return n, props, "plate_bending_modal_density (thin plate; Cremer et al. 2005)"

    subs = finish_panel(
        rd, name, s, path, role="plate", mat=mat, geom=geom, thickness=h,
        m_bare=mat.density * h, fluid=fluid, bending=bending, extra={}, fields=fields,
    )  # fmt: skip
    if subs is None or v["edge_seal"] is None:
        return subs
    sealed = add_edge_seal(rd, v["edge_seal"], f"{path}.edge_seal", subs[0], mat.poisson_ratio)
    return None if sealed is None else [sealed, *subs[1:]]


def _orthotropic(
    rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str
) -> list[Subsystem] | None:
    """``orthotropic_plate`` (stiffnesses given) and ``ribbed_plate`` (ribs along x)."""
    ribbed = s.get("kind") == "ribbed_plate"
    mat, h, fluid = v["material"], v["thickness"], _fluid(rd, v)
    fields = wave_fields(rd, s, path, _PLATE_FIELDS, "bending")
    if fields is None:
        return None
    geom = _geometry(v)
    extra: dict[str, Any] = {}
    if ribbed:
        bw, bh, sp = v["rib_width"], v["rib_height"], v["rib_spacing"]
        rmat = v["rib_material"] if v["rib_material"] is not None else mat
        if bw >= sp:
            rd.error(f"{path}.rib_width", f"must be smaller than rib_spacing ({sp:g} m)")
            return None
        i_rib = float(orthotropic_plates.rib_second_moment_rectangular(bw, bh, h))
        dx, dy, hh = (
            float(x)
            for x in orthotropic_plates.ribbed_plate_stiffness(
                mat.youngs_modulus, h, mat.poisson_ratio, i_rib, sp,
                rib_youngs_modulus=rmat.youngs_modulus,
            )
        )  # fmt: skip
        m_skin = mat.density * h
        m_bare = m_skin + rmat.density * bw * bh / sp
        d_skin = float(plates.bending_stiffness(mat.youngs_modulus, h, mat.poisson_ratio))
        extra["rib_spacing"] = sp
        extra["bay_frequency"] = float(orthotropic_plates.ribbed_plate_bay_frequency(sp - bw, d_skin, m_skin))
        h_t: float | None = hh
        keys: tuple[str, ...] = tuple(
            f"{path}.{k}" for k in ("thickness", "rib_width", "rib_height", "rib_spacing")
        )
    else:
        dx, dy = v["bending_stiffness_x"], v["bending_stiffness_y"]
        h_t = v["torsional_stiffness"]
        m_bare = v["mass_per_area"] if v["mass_per_area"] is not None else mat.density * h
        keys = tuple(
            f"{path}.{k}" for k in ("bending_stiffness_x", "bending_stiffness_y", "thickness")
        )
    if not check_derived(rd, path, {"bending stiffness": (dx, dy), "mass per area": m_bare}, keys):
        return None
    b = bands_of(rd)
    c0, area = fluid.sound_speed, geom[2]
    extra.update(bending_stiffness_x=dx, bending_stiffness_y=dy)

    def bending(m: float) -> tuple[Array, dict[str, Any], str]:
        n = orthotropic_plates.orthotropic_plate_modal_density(b.centre, area, dx, dy, m, torsional_stiffness=h_t)
        # effective isotropic stiffness with the same modal density, n = (S/2) sqrt(m''/D)
        d_eff = float(m * (area / (2.0 * n[0])) ** 2)
        lo, hi = orthotropic_plates.orthotropic_critical_frequencies(dx, dy, m, c0)
        props = {
            **bending_fields(b.centre, d_eff, m),
            "bending_stiffness": d_eff,
            "critical_frequency": float(plates.critical_frequency(d_eff, m, c0)),
            "critical_frequency_range": (float(lo), float(hi)),
        }
        return n, props, "orthotropic_plate_modal_density (Huber plate; Lyon & DeJong 1995)"

    return finish_panel(
        rd, name, s, path, role=str(s["kind"]), mat=mat, geom=geom, thickness=h,
        m_bare=m_bare, fluid=fluid, bending=bending, extra=extra, fields=fields,
    )  # fmt: skip


def _sandwich(
    rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str
) -> list[Subsystem] | None:
    mat, fluid = v["face_material"], _fluid(rd, v)
    t, gc, c, rc = (
        v["face_thickness"],
        v["core_shear_modulus"],
        v["core_thickness"],
        v["core_density"],
    )
    geom = _geometry(v)
    sec0 = sandwich.sandwich_section(mat.youngs_modulus, mat.poisson_ratio, t, mat.density, gc, c, rc)
    b = bands_of(rd)
    c0, area = fluid.sound_speed, geom[2]

    def bending(m: float) -> tuple[Array, dict[str, Any], str]:
        sec = dataclasses.replace(sec0, surface_density=m)
        k = sandwich.sandwich_wavenumber(b.centre, sec)
        props = {
            "wavenumber": k,
            "phase_speed": sandwich.sandwich_phase_speed(b.centre, sec),
            "group_speed": sandwich.sandwich_group_speed(b.centre, sec),
            # effective bending stiffness per band, m'' omega^2 = D_eff k^4
            "bending_stiffness": m * b.omega**2 / k**4,
            "critical_frequency": sandwich.sandwich_critical_frequency(sec, c0),
            "section": sec,
        }
        n = sandwich.sandwich_modal_density(b.centre, area, sec)
        return n, props, "sandwich_modal_density (Nilsson 1990 dispersion)"

    extra = {"core_thickness": c, "face_thickness": t}
    return finish_panel(
        rd, name, s, path, role="sandwich_panel", mat=mat, geom=geom, thickness=2 * t + c,
        m_bare=sec0.surface_density, fluid=fluid, bending=bending, extra=extra,
        fields=["bending"],
    )  # fmt: skip


PLATE = Kind(
    "subsystem", "plate", "Thin flat isotropic plate.",
    (MATERIAL, THICKNESS, LX, LY, WAVE_FIELDS, *PANEL_COMMON, EDGE_SEAL_KEY),
    _plate,
)  # fmt: skip

_ORTHO_COMMON = (MATERIAL, THICKNESS, LX, LY, WAVE_FIELDS)

ORTHOTROPIC_PLATE = Kind(
    "subsystem", "orthotropic_plate",
    "Flat plate with different bending stiffnesses along x and y (Huber plate).",
    (
        *_ORTHO_COMMON,
        Param("bending_stiffness_x", unit="N m", doc="D_x", required=True, bounds=_D_BOUNDS),
        Param("bending_stiffness_y", unit="N m", doc="D_y", required=True, bounds=_D_BOUNDS),
        Param("torsional_stiffness", unit="N m", doc="effective H", default_doc="sqrt(D_x D_y)", bounds=_D_BOUNDS),
        Param("mass_per_area", unit="kg/m^2", doc="mass per area", default_doc="rho h", bounds=(1e-4, 1e5)),
        *PANEL_COMMON,
    ),
    _orthotropic,
)  # fmt: skip

_RIB = (1e-5, 10.0)

RIBBED_PLATE = Kind(
    "subsystem", "ribbed_plate",
    "Flat plate with rectangular ribs along x on one side (smeared orthotropic plate).",
    (
        *_ORTHO_COMMON,
        Param("rib_width", unit="m", doc="rib width", required=True, bounds=_RIB),
        Param("rib_height", unit="m", doc="rib height", required=True, bounds=_RIB),
        Param("rib_spacing", unit="m", doc="rib spacing", required=True, bounds=_RIB),
        Param("rib_material", "material", doc="rib material", default_doc="the plate's"),
        *PANEL_COMMON,
    ),
    _orthotropic,
)  # fmt: skip

SANDWICH_PANEL = Kind(
    "subsystem", "sandwich_panel",
    "Symmetric sandwich panel with a shear-flexible core (Nilsson dispersion).",
    (
        Param("face_material", "material", doc="material of both faces", required=True),
        Param("face_thickness", unit="m", doc="thickness of each face", required=True, bounds=(1e-5, 0.1)),
        Param("core_shear_modulus", unit="Pa", doc="core shear modulus", required=True, bounds=(1e3, 1e11)),
        Param("core_thickness", unit="m", doc="core thickness", required=True, bounds=(1e-5, 1.0)),
        Param("core_density", unit="kg/m^3", doc="core density", required=True, strict=False, bounds=(0.0, 3e4)),
        LX, LY,
        *PANEL_COMMON,
    ),
    _sandwich,
)  # fmt: skip
