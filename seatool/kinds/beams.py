"""Beam kind ``beam``: Euler-Bernoulli bending in two planes, longitudinal and torsional waves.

Declaration plus one derive function; the formulas are in :mod:`seatool.physics.structural`.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from ..errors import closest
from ..model import Subsystem
from ..physics import beams, elastic
from ..properties import BeamProps, BeamSectionProps
from .fields import (
    DAMPING,
    LENGTH_BOUNDS,
    MATERIAL,
    bands_of,
    field_name,
    structure_damping,
    wave_fields,
)
from .params import Kind, Param
from .reader import Reader
from .validate import check_derived, check_value

__all__ = ["BEAM"]

_BEAM_FIELDS = ("bending_y", "bending_z", "longitudinal", "torsion")
_SHAPES = ("rectangular", "circular", "given")
_SIDE = Param("side", unit="m", bounds=(1e-5, 1e2))
_SECTION = {
    "area": Param("area", unit="m^2", bounds=(1e-12, 1e3)),
    "I": Param("I", unit="m^4", bounds=(1e-24, 1e4)),
}


def _num(rd: Reader, t: dict[str, Any], path: str, key: str, p: Param) -> float | None:
    ok, x = check_value(rd, p, t[key], f"{path}.{key}")
    return x if ok else None


def _read_section(rd: Reader, value: Any, path: str) -> beams.BeamSection | None:
    t = rd.table(value, path)
    if t is None:
        return None
    shape = t.get("shape", "given")
    if shape not in _SHAPES:
        rd.error(
            f"{path}.shape",
            f"unknown section shape {shape!r}" + closest(str(shape), _SHAPES)
            + f"; known: {', '.join(_SHAPES)}",
        )  # fmt: skip
        return None
    if shape == "rectangular":
        if not rd.keys(t, path, ("shape", "width", "height"), ("width", "height")):
            return None
        wd = _num(rd, t, path, "width", _SIDE)
        ht = _num(rd, t, path, "height", _SIDE)
        return None if wd is None or ht is None else beams.rectangular_section(wd, ht)
    if shape == "circular":
        if not rd.keys(t, path, ("shape", "outer_diameter", "inner_diameter"), ("outer_diameter",)):
            return None
        do = _num(rd, t, path, "outer_diameter", _SIDE)
        di = (
            rd.number(t["inner_diameter"], f"{path}.inner_diameter", unit="m", strict=False)
            if "inner_diameter" in t
            else 0.0
        )
        if do is None or di is None:
            return None
        if di >= do:
            rd.error(f"{path}.inner_diameter", f"must be smaller than outer_diameter ({do:g} m)")
            return None
        return beams.circular_section(do, di)
    keys = ("area", "I_y", "I_z", "J", "I_p")
    if not rd.keys(t, path, ("shape", *keys), keys[:4]):
        return None
    vals = {
        k: _num(rd, t, path, k, _SECTION["area" if k == "area" else "I"]) for k in keys if k in t
    }
    if any(v is None for v in vals.values()):
        return None
    iy, iz = vals["I_y"], vals["I_z"]
    assert iy is not None and iz is not None
    ip = vals.get("I_p") or iy + iz
    return beams.BeamSection(
        area=float(vals["area"] or 0.0),
        second_moment_y=iy,
        second_moment_z=iz,
        torsion_constant=float(vals["J"] or 0.0),
        polar_moment=float(ip),
    )


def _beam(
    rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str
) -> list[Subsystem] | None:
    mat, length = v["material"], v["length"]
    sec = _read_section(rd, s["section"], f"{path}.section")
    fields = wave_fields(rd, s, path, _BEAM_FIELDS, "bending_y")
    if sec is None or fields is None:
        return None
    got = structure_damping(rd, s, path, mat, {"length": length})
    if got is None:
        return None
    eta, dprov = got
    b = bands_of(rd)
    f = b.centre
    e, rho, nu = mat.youngs_modulus, mat.density, mat.poisson_ratio
    mpl = rho * sec.area
    if not check_derived(
        rd, path, {"mass per length": mpl}, (f"{path}.section", f"{path}.material")
    ):
        return None
    section = BeamSectionProps(
        area=sec.area,
        I_y=sec.second_moment_y,
        I_z=sec.second_moment_z,
        J=sec.torsion_constant,
        I_p=sec.polar_moment,
    )
    out = []
    for fld in fields:
        if fld in ("bending_y", "bending_z"):
            i = sec.second_moment_y if fld == "bending_y" else sec.second_moment_z
            n = beams.beam_bending_modal_density(f, length, e, i, mpl)
            k = beams.beam_bending_wavenumber(f, e, i, mpl)
            cp = beams.beam_bending_phase_speed(f, e, i, mpl)
            cg = beams.beam_bending_group_speed(f, e, i, mpl)
            src = "beam_bending_modal_density (Euler-Bernoulli; Lyon & DeJong 1995)"
        else:
            if fld == "longitudinal":
                c = float(elastic.bar_longitudinal_speed(e, rho))
            else:
                g = float(elastic.shear_modulus(e, nu))
                c = float(beams.torsion_speed(g, sec.torsion_constant, rho, sec.polar_moment))
            n = beams.longitudinal_modal_density(f, length, c)
            k, cp, cg = b.omega / c, np.full(len(b), c), np.full(len(b), c)
            src = f"longitudinal_modal_density, 2 L / c ({fld})"
        out.append(
            Subsystem(
                name=field_name(name, fld, "bending_y"),
                kind="beam",
                modal_density=n,
                damping=eta,
                quantity="velocity",
                mass=mpl * length,
                component=name,
                provenance={"modal_density": src, "damping": dprov, "material": mat.source},
                props=BeamProps(
                    wave_type=fld,
                    wavenumber=k,
                    phase_speed=cp,
                    group_speed=cg,
                    length=length,
                    mass_per_length=mpl,
                    section=section,
                    material=mat,
                ),
            )
        )
    return out


BEAM = Kind(
    "subsystem", "beam", "Straight beam of constant cross-section.",
    (
        MATERIAL,
        Param("length", unit="m", doc="length", required=True, bounds=LENGTH_BOUNDS),
        Param("section", "table", doc='{ shape = "rectangular", width, height }, { shape = "circular", outer_diameter, inner_diameter = 0 } or { area, I_y, I_z, J, I_p } (I_p defaults to I_y + I_z)', required=True),
        Param("wave_fields", "array", doc="bending_y, bending_z, longitudinal, torsion", default_doc='["bending_y"]'),
        DAMPING,
    ),
    _beam,
)  # fmt: skip
