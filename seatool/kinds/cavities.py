"""Acoustic kinds: ``cavity`` (values given, or derived from dimensions) and ``duct``.

Declarations plus one derive function each; the formulas are in
:mod:`seatool.physics.acoustic`. ``acoustic_cavity``, a second name of ``cavity`` in
earlier versions, answers with "renamed to 'cavity'" (:data:`RENAMED`).
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from ..model import Subsystem
from ..physics import acoustic as ac
from ..properties import CavityProps, DuctProps, FluidProps
from .damping_forms import read_damping
from .fields import LENGTH_BOUNDS, bands_of
from .params import Kind, Param
from .reader import Reader
from .validate import check_derived, check_value, default_fluid

__all__ = ["CAVITY", "DUCT", "RENAMED"]

#: Kind names that were renamed: old -> new.
RENAMED = {"acoustic_cavity": "cavity"}

_DIM = Param(
    "dimensions", unit="m", bounds=LENGTH_BOUNDS, typical=(1e-2, 100.0),
    why="a cabin, room or enclosure side over 100 m (or under 1 cm) is more likely a length "
    "typed in millimetres; the volume, modal density and levels follow from it",
)  # fmt: skip
_FLUID = Param("fluid", "fluid", doc="the fluid it holds", default_doc="air")
_N_BOUNDS = (0.0, 1e12)
_N_BASIS = "common practice: a 1e9 m^3 room has about 1e11 modes per Hz at 20 kHz"
_MODAL = Param(
    "modal_density", "spectrum", "modes/Hz", "given values replace the derived ones",
    bounds=_N_BOUNDS, basis=_N_BASIS,
)  # fmt: skip
_DAMPING = Param("damping", "damping", doc="internal damping loss factor (>= 0)", required=True)


def _waves(rd: Reader, fluid: FluidProps) -> dict[str, Any]:
    b = bands_of(rd)
    c = fluid.sound_speed
    return {
        "wave_type": "acoustic",
        "density": fluid.density,
        "sound_speed": c,
        "fluid": fluid,
        "wavenumber": b.omega / c,
        "phase_speed": np.full(len(b), c),
        "group_speed": np.full(len(b), c),
    }


def _cavity(
    rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str
) -> Subsystem | None:
    fluid = v["fluid"] if v["fluid"] is not None else default_fluid(rd)
    geo: dict[str, float] = {}
    dims: tuple[float, float, float] | None = None
    if "dimensions" in s:
        clash = [k for k in ("volume", "surface_area", "edge_length") if k in s]
        for k in clash:
            rd.error(f"{path}.{k}", "give either dimensions or volume/surface_area/edge_length")
        d = s["dimensions"]
        if not isinstance(d, list) or len(d) != 3:
            rd.error(f"{path}.dimensions", "must be an array of three lengths [lx, ly, lz] in m")
            return None
        got = [check_value(rd, _DIM, x, f"{path}.dimensions[{i}]") for i, x in enumerate(d)]
        if clash or not all(ok for ok, _ in got):
            return None
        lx, ly, lz = (float(x) for _, x in got)
        vol, sa, el = ac.rectangular_cavity_geometry(lx, ly, lz)
        geo = {"volume": vol, "surface_area": sa, "edge_length": el}
        dims = (lx, ly, lz)
        geo_src = f"box {lx:g} x {ly:g} x {lz:g} m"
    else:
        need = ("volume",) if "modal_density" in s else ("volume", "surface_area", "edge_length")
        missing = [k for k in need if k not in s]
        if missing:
            others = f" (also {', '.join(missing[1:])})" if len(missing) > 1 else ""
            rd.error(
                f"{path}.{missing[0]}",
                f"missing required key{others}; or give dimensions = [lx, ly, lz]"
                + ("" if "modal_density" in s else ", or modal_density"),
            )
            return None
        geo = {k: v[k] for k in ("volume", "surface_area", "edge_length") if v[k] is not None}
        geo_src = "volume, surface area and edge length given"
    keys = tuple(
        f"{path}.{k}" for k in ("dimensions", "volume", "surface_area", "edge_length") if k in s
    )
    if not check_derived(rd, path, {"volume": geo["volume"]}, keys):
        return None
    b = bands_of(rd)
    c = fluid.sound_speed
    if v["modal_density"] is not None:
        n = v["modal_density"]
        nsrc = "given"
    else:
        n = ac.cavity_modal_density(
            b.centre, geo["volume"], geo["surface_area"], max(geo["edge_length"], 1e-300), c
        )
        nsrc = f"cavity_modal_density with surface and edge terms (Morse & Bolt 1944); {geo_src}"
    # isoperimetric inequality S^3 >= 36 pi V^2 (a sphere encloses V with the least area)
    if "surface_area" in geo and geo["surface_area"] ** 1.5 < 6.0 * math.sqrt(math.pi) * geo[
        "volume"
    ] * (1.0 - 1e-9):
        rd.error(
            f"{path}.surface_area",
            f"{geo['surface_area']:g} m^2 cannot enclose {geo['volume']:g} m^3 "
            "(even a sphere needs more)",
        )
        return None
    eta = read_damping(rd, s["damping"], f"{path}.damping", {**geo, "fluid": fluid})
    if eta is None:
        return None
    return Subsystem(
        name=name,
        kind="cavity",
        modal_density=n,
        damping=eta,
        quantity="sound_pressure",
        volume=geo["volume"],
        density=fluid.density,
        sound_speed=c,
        provenance={"modal_density": nsrc, "damping": "given", "fluid": fluid.name},
        props=CavityProps(
            **_waves(rd, fluid),
            volume=geo["volume"],
            surface_area=geo.get("surface_area"),
            edge_length=geo.get("edge_length"),
            dimensions=dims,
        ),
    )


def _duct(
    rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str
) -> Subsystem | None:
    rect = "width" in s or "height" in s
    if rect == ("diameter" in s) or (rect and not ("width" in s and "height" in s)):
        rd.error(path, "give the cross-section as width and height, or as diameter")
        return None
    fluid = v["fluid"] if v["fluid"] is not None else default_fluid(rd)
    length = v["length"]
    c = fluid.sound_speed
    if rect:
        w, hh = v["width"], v["height"]
        area = w * hh
        vol, sa, el = ac.rectangular_cavity_geometry(length, w, hh)
        f_cut = float(ac.duct_cut_on_frequency_rectangular(w, hh, c))
    else:
        dd = v["diameter"]
        area = math.pi * dd**2 / 4.0
        vol, sa, el = area * length, math.pi * dd * length + 2.0 * area, 0.0
        f_cut = float(ac.duct_cut_on_frequency_circular(dd, c))
    keys = tuple(f"{path}.{k}" for k in ("length", "width", "height", "diameter") if k in s)
    if not check_derived(rd, path, {"volume": vol, "cross-section area": area}, keys):
        return None
    b = bands_of(rd)
    if v["modal_density"] is not None:
        n = v["modal_density"]
        nsrc = "given"
    else:
        n = ac.duct_modal_density(b.centre, length, c)
        nsrc = "duct_modal_density, plane waves 2 L / c (valid below the cut-on frequency)"
    geo = {"volume": vol, "surface_area": sa, "edge_length": el}
    eta = read_damping(rd, s["damping"], f"{path}.damping", {**geo, "fluid": fluid})
    if eta is None:
        return None
    return Subsystem(
        name=name,
        kind="duct",
        modal_density=n,
        damping=eta,
        quantity="sound_pressure",
        volume=vol,
        density=fluid.density,
        sound_speed=c,
        provenance={"modal_density": nsrc, "damping": "given", "fluid": fluid.name},
        props=DuctProps(
            **_waves(rd, fluid),
            volume=vol,
            surface_area=sa,
            edge_length=el,
            length=length,
            section_area=area,
            mass_per_length=fluid.density * area,
            cut_on_frequency=f_cut,
        ),
    )


CAVITY = Kind(
    "subsystem", "cavity",
    "Acoustic cavity: values given (volume and modal_density), or derived from a box's "
    "dimensions or from volume, surface_area and edge_length.",
    (
        Param("dimensions", "array", "m", "box lx, ly, lz: volume, surface area and edge length follow"),
        Param("volume", unit="m^3", doc="volume", default_doc="from dimensions", bounds=(1e-9, 1e9), typical=(1e-3, 1e5)),
        Param("surface_area", unit="m^2", doc="boundary area (other shapes)", bounds=(1e-6, 1e8)),
        Param("edge_length", unit="m", doc="total edge length (may be 0)", strict=False, bounds=(0.0, 1e6)),
        _MODAL,
        _FLUID,
        _DAMPING,
    ),
    _cavity,
)  # fmt: skip

_SIDE = (1e-3, 1e2)

DUCT = Kind(
    "subsystem", "duct", "One-dimensional acoustic duct (plane waves).",
    (
        Param("length", unit="m", doc="length", required=True, bounds=LENGTH_BOUNDS),
        Param("width", unit="m", doc="width of a rectangular section (with height)", bounds=_SIDE),
        Param("height", unit="m", doc="height of a rectangular section (with width)", bounds=_SIDE),
        Param("diameter", unit="m", doc="diameter of a circular section", bounds=_SIDE),
        Param("modal_density", "spectrum", "modes/Hz", "given values replace 2 L / c", bounds=_N_BOUNDS, basis=_N_BASIS),
        _FLUID,
        _DAMPING,
    ),
    _duct,
)  # fmt: skip
