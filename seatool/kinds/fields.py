"""What the subsystem kinds share: common parameters, wave fields, damping defaults and the
common part of every flat-panel and shell kind (treatment, added mass, in-plane fields).

Every physical value comes from :mod:`seatool.physics` (the formulas and their sources are
there and in ``docs/theory/subsystems.md``).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from dataclasses import replace
from typing import Any

import numpy as np
import numpy.typing as npt

from ..bands import BandAxis
from ..errors import closest
from ..model import Subsystem
from ..physics import elastic, plates
from ..properties import FluidProps, MaterialProps, PanelProps, ShellProps
from .damping_forms import read_damping
from .params import Param
from .plate_treatment import TREATMENT, PlateTreatment, read_plate_treatment
from .reader import Reader

__all__ = [
    "DAMPING",
    "FLUID",
    "LENGTH_BOUNDS",
    "THICKNESS",
    "bands_of",
    "bending_fields",
    "field_name",
    "finish_panel",
    "structure_damping",
    "wave_fields",
]

Array = npt.NDArray[np.float64]

#: Dimensions of built-up structures and rooms [m]: 1 mm .. 10 km (common practice).
LENGTH_BOUNDS = (1e-3, 1e4)

THICKNESS = Param(
    "thickness", unit="m", doc="plate thickness", required=True,
    bounds=(1e-5, 1.0), typical=(3e-4, 0.1),
    why="sheet and panels of vehicles, machines and buildings lie between 0.3 mm and 0.1 m; "
    "outside that a thickness is often typed in millimetres and the thin-plate theory may "
    "not hold",
)  # fmt: skip
LX = Param("lx", unit="m", doc="side length (area = lx ly)", required=True, bounds=LENGTH_BOUNDS)
LY = Param("ly", unit="m", doc="side length", required=True, bounds=LENGTH_BOUNDS)
MATERIAL = Param("material", "material", doc="name or inline table", required=True)
DAMPING = Param(
    "damping", "damping", doc="internal damping loss factor (>= 0)", default_doc="material's"
)
FLUID = Param("fluid", "fluid", doc="fluid for the critical frequency", default_doc="air")
WAVE_FIELDS = Param(
    "wave_fields",
    "array",
    doc="bending, longitudinal, shear (in-plane fields)",
    default_doc='["bending"]',
)
TREATMENT_KEY = Param(
    "treatment", "table", doc="damping layer and/or trim: see the treatment table"
)

#: Keys every flat panel takes besides its own.
PANEL_COMMON = (DAMPING, FLUID, TREATMENT_KEY)


def bands_of(rd: Reader) -> BandAxis:
    assert rd.bands is not None
    return rd.bands


def wave_fields(
    rd: Reader, s: Mapping[str, Any], path: str, allowed: tuple[str, ...], primary: str
) -> list[str] | None:
    """The wave fields a component carries (its primary field first)."""
    if "wave_fields" not in s:
        return [primary]
    v = s["wave_fields"]
    p = f"{path}.wave_fields"
    if not isinstance(v, list) or not v or not all(isinstance(x, str) for x in v):
        rd.error(p, f"must be a non-empty array of names from: {', '.join(allowed)}")
        return None
    bad = [x for x in v if x not in allowed]
    for x in bad:
        rd.error(
            p, f"unknown wave field {x!r}" + closest(x, allowed) + f"; known: {', '.join(allowed)}"
        )
    if bad:
        return None
    if len(set(v)) != len(v):
        rd.error(p, "names a wave field twice")
        return None
    if primary not in v:
        rd.error(
            p,
            f"must include {primary!r}: that field carries the subsystem's own name, "
            "which connections and excitations refer to",
        )
        return None
    return [primary] + [x for x in v if x != primary]


def field_name(name: str, field: str, primary: str) -> str:
    return name if field == primary else f"{name}.{field}"


def structure_damping(
    rd: Reader,
    s: Mapping[str, Any],
    path: str,
    material: MaterialProps,
    context: Mapping[str, Any],
    treatment_eta: Array | None = None,
) -> tuple[Array, str] | None:
    """Damping loss factor: given, else the treatment's composite value, else the material's."""
    nb = len(bands_of(rd))
    if "damping" in s:
        eta = read_damping(rd, s["damping"], f"{path}.damping", context)
        return None if eta is None else (eta, "given")
    if treatment_eta is not None:
        return np.asarray(treatment_eta, dtype=float), "treatment composite loss factor"
    lf = material.loss_factor
    if lf is None:
        rd.error(
            f"{path}.damping",
            f"missing required key: material {material.name!r} has no loss_factor to default to",
        )
        return None
    return (
        np.full(nb, float(lf)),
        f"material loss factor of {material.name} ({lf:g}); 'damping' not given",
    )


def bending_fields(f: Array, d: Array | float, m: float) -> dict[str, Any]:
    """Wavenumber, phase and group speed of thin-plate bending waves."""
    return {
        "wavenumber": plates.plate_bending_wavenumber(f, d, m),
        "phase_speed": plates.plate_bending_phase_speed(f, d, m),
        "group_speed": plates.plate_bending_group_speed(f, d, m),
    }


def _read_treatment(
    rd: Reader, s: Mapping[str, Any], path: str, plate: Mapping[str, Any]
) -> tuple[bool, PlateTreatment | None]:
    if "treatment" not in s:
        return True, None
    n_before = len(rd.problems)
    got = read_plate_treatment(rd, s["treatment"], f"{path}.treatment", plate)
    if got is None and len(rd.problems) > n_before:
        return False, None
    return True, got


def _treatment_eta(rd: Reader, treat: PlateTreatment | None, path: str) -> Array | None:
    if treat is None or treat.loss_factor is None:
        return None
    eta = np.asarray(treat.loss_factor, dtype=float)
    nb = len(bands_of(rd))
    if eta.ndim == 0:
        eta = np.full(nb, float(eta))
    if eta.shape != (nb,) or not np.all(np.isfinite(eta) & (eta >= 0)):
        rd.error(f"{path}.treatment", "treatment gave an invalid per-band loss factor")
        return None
    return eta


def _inplane(
    rd: Reader,
    name: str,
    role: str,
    fields: list[str],
    props: PanelProps,
    mass: float,
    eta: Array,
    prov: str,
) -> list[Subsystem]:
    """In-plane longitudinal and shear fields of a plate (bare-material wave speeds)."""
    b = bands_of(rd)
    f, area, mat = b.centre, props.area, props.material
    out = []
    for field in fields:
        if field == "longitudinal":
            c = float(
                elastic.plate_longitudinal_speed(mat.youngs_modulus, mat.density, mat.poisson_ratio)
            )
            n = plates.plate_inplane_longitudinal_modal_density(f, area, c)
            src = "plate_inplane_longitudinal_modal_density (Lyon & DeJong 1995)"
        elif field == "shear":
            c = float(elastic.shear_speed(mat.youngs_modulus, mat.density, mat.poisson_ratio))
            n = plates.plate_inplane_shear_modal_density(f, area, c)
            src = "plate_inplane_shear_modal_density (Lyon & DeJong 1995)"
        else:
            continue
        p = replace(
            props,
            critical_frequency=None,
            wave_type=field,
            wavenumber=b.omega / c,
            phase_speed=np.full(len(b), c),
            group_speed=np.full(len(b), c),
        )
        out.append(
            Subsystem(
                name=f"{name}.{field}",
                kind=role,
                modal_density=n,
                damping=eta,
                quantity="velocity",
                mass=mass,
                component=name,
                provenance={"modal_density": src, "damping": prov},
                props=p,
            )
        )
    return out


def finish_panel(
    rd: Reader,
    name: str,
    s: Mapping[str, Any],
    path: str,
    *,
    role: str,
    mat: MaterialProps,
    geom: tuple[float, float, float, float],
    thickness: float,
    m_bare: float,
    fluid: FluidProps,
    bending: Callable[[float], tuple[Array, dict[str, Any], str]],
    extra: Mapping[str, Any],
    fields: list[str],
    shell: bool = False,
) -> list[Subsystem] | None:
    """Common part of every flat-panel and shell kind: treatment, damping, the bending
    field and the in-plane fields.

    ``bending(m_total)`` returns (modal density, bending property values, provenance text).
    """
    lx, ly, area, perimeter = geom
    n, bprops, nsrc = bending(m_bare)
    plate = {
        "thickness": thickness,
        "material": mat,
        "mass_per_area": m_bare,
        "fluid": fluid,
        "perimeter_per_area": perimeter / area,
    }
    ok, treat = _read_treatment(rd, s, path, plate)
    if not ok:
        return None
    added = float(treat.added_mass_per_area or 0.0) if treat else 0.0
    if added < 0 or not math.isfinite(added):
        rd.error(f"{path}.treatment", f"treatment gave an invalid added mass {added!r}")
        return None
    m_total = m_bare + added
    if added > 0:
        n, bprops, nsrc = bending(m_total)
    cls = ShellProps if shell else PanelProps
    props = cls(
        wave_type="bending",
        area=area,
        lx=lx,
        ly=ly,
        perimeter=perimeter,
        thickness=thickness,
        mass_per_area=m_total,
        material=mat,
        fluid=fluid,
        treatment=treat,
        **bprops,
        **extra,
    )
    t_eta = _treatment_eta(rd, treat, path)
    if treat is not None and treat.loss_factor is not None and t_eta is None:
        return None
    context = {"area": area, "fluid": fluid, "mass_per_area": m_total, "thickness": thickness}
    got = structure_damping(rd, s, path, mat, context, t_eta)
    if got is None:
        return None
    eta, dprov = got
    mass = m_total * area
    prov = {"modal_density": nsrc, "damping": dprov, "material": mat.source}
    if treat is not None:
        prov["treatment"] = str(treat.description)
    bend = Subsystem(
        name=name,
        kind=role,
        modal_density=n,
        damping=eta,
        quantity="velocity",
        mass=mass,
        component=name,
        provenance=prov,
        props=props,
    )
    # in-plane fields keep the material damping unless damping was given explicitly
    if "damping" in s or t_eta is None:
        eta_in, prov_in = eta, dprov
    else:
        got_in = structure_damping(rd, {}, path, mat, context)
        if got_in is None:
            return None
        eta_in, prov_in = got_in
    return [bend, *_inplane(rd, name, role, fields, props, mass, eta_in, prov_in)]


__all__ += ["LX", "LY", "MATERIAL", "PANEL_COMMON", "TREATMENT", "TREATMENT_KEY", "WAVE_FIELDS"]
