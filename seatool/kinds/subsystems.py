"""Subsystem kinds and excitations derived from materials and dimensions.

Importing this module registers into :mod:`seatool.modelfile`:

* subsystem kinds ``plate``, ``orthotropic_plate``, ``ribbed_plate``, ``sandwich_panel``,
  ``cylindrical_shell``, ``beam``, ``acoustic_cavity``, ``duct``, ``resonator``;
* excitation keys ``force`` and ``diffuse_sound_pressure_level``.

Every physical value comes from :mod:`seatool.physics` (the formulas and their sources
are there and in ``docs/theory/subsystems.md``); this module only validates keys, looks
up materials and fluids, and fills :attr:`seatool.model.Subsystem.properties` as laid
down in ``DEVELOPERS.md``. The keys are documented in ``docs/model-format.md``.

Materials and fluids are looked up by name first among the model's own
``[materials.NAME]`` / ``[fluids.NAME]`` entries (a user entry replaces a built-in one of
the same name as a whole), then among the built-in tables of :mod:`seatool.materials`.
A ``material`` key may also be an inline table ``{ base = "steel", loss_factor = 0.01 }``
that changes some properties of a named material.
"""

from __future__ import annotations

import dataclasses
import functools
import math
from collections.abc import Callable, Mapping
from typing import Any

import numpy as np
import numpy.typing as npt
from scipy import optimize

from seatool import levels
from seatool import materials as _materials
from seatool.errors import closest
from seatool.model import Subsystem
from seatool.modelfile import (
    DEFAULT_FLUID,
    EXCITATION_KEYS,
    SUBSYSTEM_KINDS,
    ExcitationKey,
    Reader,
    read_damping,
)
from seatool.physics import acoustic as ac
from seatool.physics import beams, elastic, orthotropic_plates, plates, resonators, sandwich, shells
from seatool.physics import mobility as mob

__all__ = [
    "PLATE_KINDS",
    "builtin_fluids",
    "builtin_materials",
    "read_fluid",
    "read_material",
]

Array = npt.NDArray[np.float64]

#: Kinds whose bending field is a flat panel (radiation readers may use lx, ly, f_c).
PLATE_KINDS = ("plate", "orthotropic_plate", "ribbed_plate", "sandwich_panel")
#: Gauss-Legendre nodes per half band used to band-average the shell modal density.
_SHELL_NODES = 24

_MATERIAL_PROPS = ("density", "youngs_modulus", "poisson_ratio", "loss_factor")


# ----------------------------------------------------------------------------------------
# materials and fluids


@functools.cache
def builtin_materials() -> dict[str, _materials.Material]:
    """The built-in materials of :func:`seatool.materials.load_materials` (cached)."""
    return _materials.load_materials()


@functools.cache
def builtin_fluids() -> dict[str, _materials.Fluid]:
    """The built-in fluids of :func:`seatool.materials.load_fluids` (cached)."""
    return _materials.load_fluids()


def _named_material(rd: Reader, value: Any, path: str) -> dict[str, Any] | None:
    if isinstance(value, str) and value in rd.invalid:
        return None  # its definition's problems are already reported
    known = {**dict.fromkeys(builtin_materials()), **dict.fromkeys(rd.materials)}
    name = rd.name_ref(value, path, known, "material")
    if name is None:
        return None
    if name in rd.materials:
        user = rd.materials[name]
        return {
            "name": name,
            "density": user["density"],
            "youngs_modulus": user["youngs_modulus"],
            "poisson_ratio": user["poisson_ratio"],
            "loss_factor": user.get("loss_factor"),
            "source": f"[materials.{name}] of the model",
        }
    m = builtin_materials()[name]
    return {
        "name": name,
        "density": m.density,
        "youngs_modulus": m.youngs_modulus,
        "poisson_ratio": m.poisson_ratio,
        "loss_factor": m.loss_factor,
        "source": f"built-in {name}: {m.source}",
    }


def read_material(rd: Reader, value: Any, path: str) -> dict[str, Any] | None:
    """A material: a name, or an inline table with ``base`` and/or properties.

    Returns a mapping with ``name``, ``density`` [kg/m^3], ``youngs_modulus`` [Pa],
    ``poisson_ratio``, ``loss_factor`` (None if unknown) and ``source``; or None after
    reporting a problem.
    """
    if not isinstance(value, dict):
        return _named_material(rd, value, path)
    allowed = ("base", *_MATERIAL_PROPS)
    if not rd.keys(value, path, allowed):
        return None
    base: dict[str, Any] = {}
    if "base" in value:
        got = _named_material(rd, value["base"], f"{path}.base")
        if got is None:
            return None
        base = got
    out: dict[str, Any] = dict(base)
    ok = True
    for key, unit, minimum, strict in (
        ("density", "kg/m^3", 0.0, True),
        ("youngs_modulus", "Pa", 0.0, True),
        ("poisson_ratio", "", -1.0, True),
        ("loss_factor", "", 0.0, False),
    ):
        if key not in value:
            continue
        x = rd.number(value[key], f"{path}.{key}", unit=unit, minimum=minimum, strict=strict)
        if x is None:
            ok = False
            continue
        if key == "poisson_ratio" and x >= 0.5:
            rd.error(f"{path}.{key}", f"must be < 0.5 for a stable isotropic solid, got {x}")
            ok = False
            continue
        out[key] = x
    if not ok:
        return None
    missing = [k for k in _MATERIAL_PROPS[:3] if k not in out]
    if missing:
        rd.error(
            path,
            f"material misses {', '.join(missing)}; give them or name a material in 'base'",
        )
        return None
    out.setdefault("loss_factor", None)
    changed = sorted(k for k in _MATERIAL_PROPS if k in value)
    out["name"] = base.get("name", "inline") + (f" ({', '.join(changed)} changed)" if base else "")
    out["source"] = (
        f"{base['source']} [changed in the model: {', '.join(changed)}]"
        if base
        else "given inline in the model"
    )
    return out


def read_fluid(rd: Reader, value: Any, path: str) -> dict[str, Any] | None:
    """A fluid by name: the model's ``[fluids.NAME]`` first, then the built-in fluids.

    Returns ``{name, density, sound_speed}`` or None after reporting a problem.
    """
    known = {**dict.fromkeys(builtin_fluids()), **dict.fromkeys(rd.fluids)}
    name = rd.name_ref(value, path, known, "fluid")
    if name is None:
        return None
    if name in rd.fluids:
        fl = rd.fluids[name]
        return {"name": name, "density": fl["density"], "sound_speed": fl["sound_speed"]}
    b = builtin_fluids()[name]
    return {"name": name, "density": b.density, "sound_speed": b.sound_speed}


def _fluid_of(rd: Reader, s: Mapping[str, Any], path: str) -> dict[str, Any] | None:
    if "fluid" in s:
        return read_fluid(rd, s["fluid"], f"{path}.fluid")
    air = rd.fluids.get("air", DEFAULT_FLUID)
    return {"name": "air", "density": air["density"], "sound_speed": air["sound_speed"]}


# ----------------------------------------------------------------------------------------
# shared helpers


def _bands(rd: Reader) -> Any:
    assert rd.bands is not None
    return rd.bands


def _wave_fields(
    rd: Reader, s: Mapping[str, Any], path: str, allowed: tuple[str, ...], primary: str
) -> list[str] | None:
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


def _field_name(name: str, field: str, primary: str) -> str:
    return name if field == primary else f"{name}.{field}"


def _damping(
    rd: Reader,
    s: Mapping[str, Any],
    path: str,
    material: Mapping[str, Any],
    context: Mapping[str, Any],
    treatment_eta: Array | None = None,
) -> tuple[Array, str] | None:
    """Damping loss factor: given, else the treatment's composite value, else the material's."""
    nb = len(_bands(rd))
    if "damping" in s:
        eta = read_damping(rd, s["damping"], f"{path}.damping", context)
        return None if eta is None else (eta, "given")
    if treatment_eta is not None:
        return np.asarray(treatment_eta, dtype=float), "treatment composite loss factor"
    lf = material.get("loss_factor")
    if lf is None:
        rd.error(
            f"{path}.damping",
            f"missing required key: material {material['name']!r} has no loss_factor to default to",
        )
        return None
    return (
        np.full(nb, float(lf)),
        f"material loss factor of {material['name']} ({lf:g}); 'damping' not given",
    )


def _number(rd: Reader, s: Mapping[str, Any], path: str, key: str, unit: str) -> float | None:
    return rd.number(s[key], f"{path}.{key}", unit=unit)


def _material_map(mat: Mapping[str, Any]) -> dict[str, Any]:
    return {k: mat[k] for k in ("name", *_MATERIAL_PROPS, "source")}


def _read_treatment(
    rd: Reader, s: Mapping[str, Any], path: str, props: Mapping[str, Any]
) -> tuple[bool, Any]:
    """Apply the ``treatment`` key through :mod:`seatool.kinds.treatment` (lazy import)."""
    if "treatment" not in s:
        return True, None
    import importlib

    try:
        treatment = importlib.import_module("seatool.kinds.treatment")
    except ImportError:
        rd.error(f"{path}.treatment", "plate treatments are not available in this installation")
        return False, None
    plate = {**props, "bands": rd.bands}
    n_before = len(rd.problems)
    got = treatment.read_plate_treatment(rd, s["treatment"], f"{path}.treatment", plate)
    if got is None and len(rd.problems) > n_before:
        return False, None
    return True, got


def _treatment_eta(rd: Reader, treat: Any, path: str) -> Array | None:
    if treat is None or getattr(treat, "loss_factor", None) is None:
        return None
    eta = np.asarray(treat.loss_factor, dtype=float)
    nb = len(_bands(rd))
    if eta.ndim == 0:
        eta = np.full(nb, float(eta))
    if eta.shape != (nb,) or not np.all(np.isfinite(eta) & (eta >= 0)):
        rd.error(f"{path}.treatment", "treatment gave an invalid per-band loss factor")
        return None
    return eta


def _panel_geometry(
    rd: Reader, s: Mapping[str, Any], path: str
) -> tuple[float, float, float, float] | None:
    lx = _number(rd, s, path, "lx", "m")
    ly = _number(rd, s, path, "ly", "m")
    if lx is None or ly is None:
        return None
    return lx, ly, lx * ly, 2.0 * (lx + ly)


def _bending_fields(f: Array, d: Array | float, m: float, c0: float) -> dict[str, Any]:
    return {
        "wavenumber": plates.plate_bending_wavenumber(f, d, m),
        "phase_speed": plates.plate_bending_phase_speed(f, d, m),
        "group_speed": plates.plate_bending_group_speed(f, d, m),
    }


def _inplane(
    rd: Reader,
    name: str,
    kind: str,
    fields: list[str],
    props: Mapping[str, Any],
    mat: Mapping[str, Any],
    mass: float,
    eta: Array,
    prov: str,
) -> list[Subsystem]:
    """In-plane longitudinal and shear fields of a plate (bare-material wave speeds)."""
    b = _bands(rd)
    f, area = b.centre, props["area"]
    out = []
    for field in fields:
        if field == "longitudinal":
            c = float(
                elastic.plate_longitudinal_speed(
                    mat["youngs_modulus"], mat["density"], mat["poisson_ratio"]
                )
            )
            n = plates.plate_inplane_longitudinal_modal_density(f, area, c)
            src = "plate_inplane_longitudinal_modal_density (Lyon & DeJong 1995)"
        elif field == "shear":
            c = float(
                elastic.shear_speed(mat["youngs_modulus"], mat["density"], mat["poisson_ratio"])
            )
            n = plates.plate_inplane_shear_modal_density(f, area, c)
            src = "plate_inplane_shear_modal_density (Lyon & DeJong 1995)"
        else:
            continue
        p = {
            **{k: v for k, v in props.items() if k not in ("critical_frequency",)},
            "wave_type": field,
            "wavenumber": b.omega / c,
            "phase_speed": np.full(len(b), c),
            "group_speed": np.full(len(b), c),
        }
        out.append(
            Subsystem(
                name=f"{name}.{field}",
                kind=kind,
                modal_density=n,
                damping=eta,
                quantity="velocity",
                mass=mass,
                component=name,
                provenance={"modal_density": src, "damping": prov},
                properties=p,
            )
        )
    return out


# ----------------------------------------------------------------------------------------
# plates


_PLATE_COMMON = ("kind", "description", "damping", "fluid", "treatment")


def _finish_plate(
    rd: Reader,
    name: str,
    s: Mapping[str, Any],
    path: str,
    *,
    kind: str,
    mat: dict[str, Any],
    geom: tuple[float, float, float, float],
    thickness: float,
    m_bare: float,
    fluid: dict[str, Any],
    bending: Callable[[float], tuple[Array, dict[str, Any], str]],
    extra: Mapping[str, Any],
    fields: list[str],
) -> list[Subsystem] | None:
    """Common part of every flat-panel kind: treatment, damping, bending + in-plane fields.

    ``bending(m_total)`` returns (modal density, bending properties, provenance text).
    """
    lx, ly, area, perimeter = geom
    n0, bprops0, nsrc = bending(m_bare)
    props: dict[str, Any] = {
        "wave_type": "bending",
        "area": area,
        "lx": lx,
        "ly": ly,
        "perimeter": perimeter,
        "thickness": thickness,
        "mass_per_area": m_bare,
        "material": _material_map(mat),
        "fluid": fluid,
        **bprops0,
        **extra,
    }
    ok, treat = _read_treatment(rd, s, path, props)
    if not ok:
        return None
    added = float(getattr(treat, "added_mass_per_area", 0.0) or 0.0) if treat else 0.0
    if added < 0 or not math.isfinite(added):
        rd.error(f"{path}.treatment", f"treatment gave an invalid added mass {added!r}")
        return None
    m_total = m_bare + added
    if added > 0:
        n, bprops, nsrc = bending(m_total)
        props.update(bprops, mass_per_area=m_total)
    else:
        n = n0
    if treat is not None:
        props["treatment"] = treat
    t_eta = _treatment_eta(rd, treat, path)
    if treat is not None and getattr(treat, "loss_factor", None) is not None and t_eta is None:
        return None
    context = {"area": area, "fluid": fluid, "mass_per_area": m_total, "thickness": thickness}
    got = _damping(rd, s, path, mat, context, t_eta)
    if got is None:
        return None
    eta, dprov = got
    mass = m_total * area
    prov = {"modal_density": nsrc, "damping": dprov, "material": props["material"]["source"]}
    if treat is not None:
        prov["treatment"] = str(getattr(treat, "description", "treatment"))
    bend = Subsystem(
        name=name,
        kind=kind,
        modal_density=n,
        damping=eta,
        quantity="velocity",
        mass=mass,
        component=name,
        provenance=prov,
        properties=props,
    )
    # in-plane fields keep the material damping unless damping was given explicitly
    if "damping" in s or t_eta is None:
        eta_in, prov_in = eta, dprov
    else:
        got_in = _damping(rd, {}, path, mat, context)
        if got_in is None:
            return None
        eta_in, prov_in = got_in
    return [bend, *_inplane(rd, name, kind, fields, props, mat, mass, eta_in, prov_in)]


def _read_plate(rd: Reader, name: str, s: dict[str, Any]) -> list[Subsystem] | None:
    path = f"subsystems.{name}"
    allowed = (*_PLATE_COMMON, "material", "thickness", "lx", "ly", "wave_fields")
    if not rd.keys(s, path, allowed, ("material", "thickness", "lx", "ly")):
        return None
    mat = read_material(rd, s["material"], f"{path}.material")
    h = _number(rd, s, path, "thickness", "m")
    geom = _panel_geometry(rd, s, path)
    fluid = _fluid_of(rd, s, path)
    fields = _wave_fields(rd, s, path, ("bending", "longitudinal", "shear"), "bending")
    if mat is None or h is None or geom is None or fluid is None or fields is None:
        return None
    b = _bands(rd)
    d = float(plates.bending_stiffness(mat["youngs_modulus"], h, mat["poisson_ratio"]))
    c0 = fluid["sound_speed"]
    area = geom[2]

    def bending(m: float) -> tuple[Array, dict[str, Any], str]:
        n = plates.plate_bending_modal_density(b.centre, area, d, m)
        props = {
            **_bending_fields(b.centre, d, m, c0),
            "bending_stiffness": d,
            "critical_frequency": float(plates.critical_frequency(d, m, c0)),
        }
        return n, props, "plate_bending_modal_density (thin plate; Cremer et al. 2005)"

    return _finish_plate(
        rd, name, s, path, kind="plate", mat=mat, geom=geom, thickness=h,
        m_bare=mat["density"] * h, fluid=fluid, bending=bending, extra={}, fields=fields,
    )  # fmt: skip


def _read_orthotropic(rd: Reader, name: str, s: dict[str, Any]) -> list[Subsystem] | None:
    """``orthotropic_plate`` (stiffnesses given) and ``ribbed_plate`` (ribs along x)."""
    path = f"subsystems.{name}"
    ribbed = s.get("kind") == "ribbed_plate"
    base = (*_PLATE_COMMON, "material", "thickness", "lx", "ly", "wave_fields")
    if ribbed:
        allowed = (*base, "rib_width", "rib_height", "rib_spacing", "rib_material")
        required: tuple[str, ...] = (
            "material", "thickness", "lx", "ly", "rib_width", "rib_height", "rib_spacing",
        )  # fmt: skip
    else:
        allowed = (
            *base, "bending_stiffness_x", "bending_stiffness_y", "torsional_stiffness",
            "mass_per_area",
        )  # fmt: skip
        required = (
            "material", "thickness", "lx", "ly", "bending_stiffness_x", "bending_stiffness_y",
        )  # fmt: skip
    if not rd.keys(s, path, allowed, required):
        return None
    mat = read_material(rd, s["material"], f"{path}.material")
    h = _number(rd, s, path, "thickness", "m")
    geom = _panel_geometry(rd, s, path)
    fluid = _fluid_of(rd, s, path)
    fields = _wave_fields(rd, s, path, ("bending", "longitudinal", "shear"), "bending")
    if mat is None or h is None or geom is None or fluid is None or fields is None:
        return None
    extra: dict[str, Any] = {}
    if ribbed:
        bw = _number(rd, s, path, "rib_width", "m")
        bh = _number(rd, s, path, "rib_height", "m")
        sp = _number(rd, s, path, "rib_spacing", "m")
        rmat = (
            read_material(rd, s["rib_material"], f"{path}.rib_material")
            if "rib_material" in s
            else mat
        )
        if bw is None or bh is None or sp is None or rmat is None:
            return None
        if bw >= sp:
            rd.error(f"{path}.rib_width", f"must be smaller than rib_spacing ({sp:g} m)")
            return None
        i_rib = float(orthotropic_plates.rib_second_moment_rectangular(bw, bh, h))
        dx, dy, hh = (
            float(x)
            for x in orthotropic_plates.ribbed_plate_stiffness(
                mat["youngs_modulus"], h, mat["poisson_ratio"], i_rib, sp,
                rib_youngs_modulus=rmat["youngs_modulus"],
            )
        )  # fmt: skip
        m_skin = mat["density"] * h
        m_bare = m_skin + rmat["density"] * bw * bh / sp
        d_skin = float(plates.bending_stiffness(mat["youngs_modulus"], h, mat["poisson_ratio"]))
        extra["rib_spacing"] = sp
        extra["bay_frequency"] = float(
            orthotropic_plates.ribbed_plate_bay_frequency(sp - bw, d_skin, m_skin)
        )
        h_t: float | None = hh
    else:
        dx_ = _number(rd, s, path, "bending_stiffness_x", "N m")
        dy_ = _number(rd, s, path, "bending_stiffness_y", "N m")
        h_t = (
            _number(rd, s, path, "torsional_stiffness", "N m")
            if "torsional_stiffness" in s
            else None
        )
        mpa = _number(rd, s, path, "mass_per_area", "kg/m^2") if "mass_per_area" in s else None
        if dx_ is None or dy_ is None or ("torsional_stiffness" in s and h_t is None):
            return None
        if "mass_per_area" in s and mpa is None:
            return None
        dx, dy = dx_, dy_
        m_bare = mpa if mpa is not None else mat["density"] * h
    b = _bands(rd)
    c0 = fluid["sound_speed"]
    area = geom[2]
    extra.update(bending_stiffness_x=dx, bending_stiffness_y=dy)

    def bending(m: float) -> tuple[Array, dict[str, Any], str]:
        n = orthotropic_plates.orthotropic_plate_modal_density(
            b.centre, area, dx, dy, m, torsional_stiffness=h_t
        )
        # effective isotropic stiffness with the same modal density, n = (S/2) sqrt(m''/D)
        d_eff = float(m * (area / (2.0 * n[0])) ** 2)
        lo, hi = orthotropic_plates.orthotropic_critical_frequencies(dx, dy, m, c0)
        props = {
            **_bending_fields(b.centre, d_eff, m, c0),
            "bending_stiffness": d_eff,
            "critical_frequency": float(plates.critical_frequency(d_eff, m, c0)),
            "critical_frequency_range": (float(lo), float(hi)),
        }
        return n, props, "orthotropic_plate_modal_density (Huber plate; Lyon & DeJong 1995)"

    return _finish_plate(
        rd, name, s, path, kind=str(s["kind"]), mat=mat, geom=geom, thickness=h,
        m_bare=m_bare, fluid=fluid, bending=bending, extra=extra, fields=fields,
    )  # fmt: skip


def sandwich_critical_frequency(section: sandwich.SandwichSection, sound_speed: float) -> float:
    """Frequency where the sandwich bending phase speed equals the sound speed [Hz].

    Root of :func:`seatool.physics.sandwich.sandwich_phase_speed` ``(f) = c0`` (the
    phase speed rises monotonically from 0 to the face-sheet bending speed, which grows
    without bound), found with :func:`scipy.optimize.brentq` on ln f.
    """

    def g(x: float) -> float:
        return float(sandwich.sandwich_phase_speed(math.exp(x), section)) - sound_speed

    lo, hi = math.log(1e-3), math.log(1e9)
    if g(lo) > 0 or g(hi) < 0:
        return math.inf
    return math.exp(optimize.brentq(g, lo, hi, xtol=1e-12))


def _read_sandwich(rd: Reader, name: str, s: dict[str, Any]) -> list[Subsystem] | None:
    path = f"subsystems.{name}"
    keys = ("face_material", "face_thickness", "core_shear_modulus", "core_thickness",
            "core_density", "lx", "ly")  # fmt: skip
    if not rd.keys(s, path, (*_PLATE_COMMON, *keys), keys):
        return None
    mat = read_material(rd, s["face_material"], f"{path}.face_material")
    t = _number(rd, s, path, "face_thickness", "m")
    gc = _number(rd, s, path, "core_shear_modulus", "Pa")
    c = _number(rd, s, path, "core_thickness", "m")
    rc = rd.number(s["core_density"], f"{path}.core_density", unit="kg/m^3", strict=False)
    geom = _panel_geometry(rd, s, path)
    fluid = _fluid_of(rd, s, path)
    if None in (mat, t, gc, c, rc, geom, fluid):
        return None
    assert mat is not None and t is not None and gc is not None and c is not None
    assert rc is not None and geom is not None and fluid is not None
    sec0 = sandwich.sandwich_section(
        mat["youngs_modulus"], mat["poisson_ratio"], t, mat["density"], gc, c, rc
    )
    b = _bands(rd)
    c0 = fluid["sound_speed"]
    area = geom[2]

    def bending(m: float) -> tuple[Array, dict[str, Any], str]:
        sec = dataclasses.replace(sec0, surface_density=m)
        k = sandwich.sandwich_wavenumber(b.centre, sec)
        props = {
            "wavenumber": k,
            "phase_speed": sandwich.sandwich_phase_speed(b.centre, sec),
            "group_speed": sandwich.sandwich_group_speed(b.centre, sec),
            # effective bending stiffness per band, m'' omega^2 = D_eff k^4
            "bending_stiffness": m * b.omega**2 / k**4,
            "critical_frequency": sandwich_critical_frequency(sec, c0),
            "section": sec,
        }
        n = sandwich.sandwich_modal_density(b.centre, area, sec)
        return n, props, "sandwich_modal_density (Nilsson 1990 dispersion)"

    extra = {"core_thickness": c, "face_thickness": t}
    return _finish_plate(
        rd, name, s, path, kind="sandwich_panel", mat=mat, geom=geom, thickness=2 * t + c,
        m_bare=sec0.surface_density, fluid=fluid, bending=bending, extra=extra,
        fields=["bending"],
    )  # fmt: skip


def _read_shell(rd: Reader, name: str, s: dict[str, Any]) -> list[Subsystem] | None:
    path = f"subsystems.{name}"
    allowed = (*_PLATE_COMMON, "material", "thickness", "radius", "lx", "ly")
    if not rd.keys(s, path, allowed, ("material", "thickness", "radius", "lx")):
        return None
    mat = read_material(rd, s["material"], f"{path}.material")
    h = _number(rd, s, path, "thickness", "m")
    a = _number(rd, s, path, "radius", "m")
    lx = _number(rd, s, path, "lx", "m")
    closed = "ly" not in s
    ly = _number(rd, s, path, "ly", "m") if not closed else None
    fluid = _fluid_of(rd, s, path)
    if mat is None or h is None or a is None or lx is None or fluid is None:
        return None
    if not closed and ly is None:
        return None
    if h >= 0.1 * a:
        rd.error(f"{path}.thickness", f"thin-shell theory needs thickness << radius ({a:g} m)")
        return None
    if ly is None:
        ly = 2.0 * math.pi * a
    elif ly > 2.0 * math.pi * a * (1 + 1e-9):
        rd.error(
            f"{path}.ly", f"arc length {ly:g} m exceeds the circumference {2 * math.pi * a:g} m"
        )
        return None
    perimeter = 2.0 * ly if closed else 2.0 * (lx + ly)
    geom = (lx, ly, lx * ly, perimeter)
    b = _bands(rd)
    e, rho, nu = mat["youngs_modulus"], mat["density"], mat["poisson_ratio"]
    d = float(plates.bending_stiffness(e, h, nu))
    c_l = float(elastic.plate_longitudinal_speed(e, rho, nu))
    c0 = fluid["sound_speed"]
    # Band average of the shell modal density. Its continuous form has a logarithmic
    # singularity at f_m = sqrt(E/rho)/(2 pi a) (shell_bending_modal_density): split each
    # band at f_m (clipped to the band) and cluster Gauss-Legendre nodes towards it with
    # f = f_m -+ D u^3 (integrand ~ u^2 ln u, smooth enough; 2e-9 relative against
    # scipy.integrate.quad in development).
    f_m = math.sqrt(e / rho) / (2.0 * math.pi * a)
    x, w = np.polynomial.legendre.leggauss(_SHELL_NODES)
    u, wu = 0.5 * (x + 1.0), 0.5 * w
    split = np.clip(f_m, b.lower, b.upper)
    total = np.zeros(len(b))
    for sign, span in ((-1.0, split - b.lower), (1.0, b.upper - split)):
        fq = split[:, None] + sign * span[:, None] * u[None, :] ** 3
        fq = np.clip(fq, b.lower[:, None], b.upper[:, None])
        fq = np.where(span[:, None] > 0, fq, b.centre[:, None])  # empty half: weight 0
        n_nodes = shells.shell_bending_modal_density(fq, geom[2], a, h, e, rho, nu)
        total += (wu[None, :] * 3.0 * span[:, None] * u[None, :] ** 2 * n_nodes).sum(axis=1)
    n_shell = np.asarray(total / (b.upper - b.lower), dtype=float)

    def bending(m: float) -> tuple[Array, dict[str, Any], str]:
        # added treatment mass scales the plate-like count as sqrt(m''); shell count likewise
        n = n_shell * math.sqrt(m / (rho * h))
        props = {
            **_bending_fields(b.centre, d, m, c0),
            "bending_stiffness": d,
            "critical_frequency": float(plates.critical_frequency(d, m, c0)),
        }
        return (
            n,
            props,
            (
                "shell_bending_modal_density, band average (Heckl 1962 dispersion, Szechenyi 1971 "
                "count)"
            ),
        )

    extra = {"radius": a, "ring_frequency": float(shells.ring_frequency(a, c_l)), "closed": closed}
    return _finish_plate(
        rd, name, s, path, kind="cylindrical_shell", mat=mat, geom=geom, thickness=h,
        m_bare=rho * h, fluid=fluid, bending=bending, extra=extra, fields=["bending"],
    )  # fmt: skip


# ----------------------------------------------------------------------------------------
# beams


def _read_section(rd: Reader, value: Any, path: str) -> beams.BeamSection | None:
    t = rd.table(value, path)
    if t is None:
        return None
    shape = t.get("shape", "given")
    shapes = ("rectangular", "circular", "given")
    if shape not in shapes:
        rd.error(
            f"{path}.shape",
            f"unknown section shape {shape!r}" + closest(str(shape), shapes)
            + f"; known: {', '.join(shapes)}",
        )  # fmt: skip
        return None
    if shape == "rectangular":
        if not rd.keys(t, path, ("shape", "width", "height"), ("width", "height")):
            return None
        wd = _number(rd, t, path, "width", "m")
        ht = _number(rd, t, path, "height", "m")
        return None if wd is None or ht is None else beams.rectangular_section(wd, ht)
    if shape == "circular":
        if not rd.keys(t, path, ("shape", "outer_diameter", "inner_diameter"), ("outer_diameter",)):
            return None
        do = _number(rd, t, path, "outer_diameter", "m")
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
    vals = {k: rd.number(t[k], f"{path}.{k}", unit="m^2" if k == "area" else "m^4")
            for k in keys if k in t}  # fmt: skip
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


_BEAM_FIELDS = ("bending_y", "bending_z", "longitudinal", "torsion")


def _read_beam(rd: Reader, name: str, s: dict[str, Any]) -> list[Subsystem] | None:
    path = f"subsystems.{name}"
    allowed = ("kind", "description", "material", "length", "section", "wave_fields", "damping")
    if not rd.keys(s, path, allowed, ("material", "length", "section")):
        return None
    mat = read_material(rd, s["material"], f"{path}.material")
    length = _number(rd, s, path, "length", "m")
    sec = _read_section(rd, s["section"], f"{path}.section")
    fields = _wave_fields(rd, s, path, _BEAM_FIELDS, "bending_y")
    if mat is None or length is None or sec is None or fields is None:
        return None
    got = _damping(rd, s, path, mat, {"length": length})
    if got is None:
        return None
    eta, dprov = got
    b = _bands(rd)
    f = b.centre
    e, rho, nu = mat["youngs_modulus"], mat["density"], mat["poisson_ratio"]
    mpl = rho * sec.area
    section = {
        "area": sec.area,
        "I_y": sec.second_moment_y,
        "I_z": sec.second_moment_z,
        "J": sec.torsion_constant,
        "I_p": sec.polar_moment,
    }
    common = {
        "length": length,
        "mass_per_length": mpl,
        "section": section,
        "material": _material_map(mat),
    }
    out = []
    for field in fields:
        if field in ("bending_y", "bending_z"):
            i = sec.second_moment_y if field == "bending_y" else sec.second_moment_z
            n = beams.beam_bending_modal_density(f, length, e, i, mpl)
            k = beams.beam_bending_wavenumber(f, e, i, mpl)
            cp = beams.beam_bending_phase_speed(f, e, i, mpl)
            cg = beams.beam_bending_group_speed(f, e, i, mpl)
            src = "beam_bending_modal_density (Euler-Bernoulli; Lyon & DeJong 1995)"
        else:
            if field == "longitudinal":
                c = float(elastic.bar_longitudinal_speed(e, rho))
            else:
                g = float(elastic.shear_modulus(e, nu))
                c = float(beams.torsion_speed(g, sec.torsion_constant, rho, sec.polar_moment))
            n = beams.longitudinal_modal_density(f, length, c)
            k, cp, cg = b.omega / c, np.full(len(b), c), np.full(len(b), c)
            src = f"longitudinal_modal_density, 2 L / c ({field})"
        out.append(
            Subsystem(
                name=_field_name(name, field, "bending_y"),
                kind="beam",
                modal_density=n,
                damping=eta,
                quantity="velocity",
                mass=mpl * length,
                component=name,
                provenance={"modal_density": src, "damping": dprov, "material": mat["source"]},
                properties={
                    **common,
                    "wave_type": field,
                    "wavenumber": k,
                    "phase_speed": cp,
                    "group_speed": cg,
                },
            )
        )
    return out


# ----------------------------------------------------------------------------------------
# acoustic subsystems


def _acoustic_props(rd: Reader, fluid: Mapping[str, Any]) -> dict[str, Any]:
    b = _bands(rd)
    c = fluid["sound_speed"]
    return {
        "wave_type": "acoustic",
        "density": fluid["density"],
        "sound_speed": c,
        "fluid": dict(fluid),
        "wavenumber": b.omega / c,
        "phase_speed": np.full(len(b), c),
        "group_speed": np.full(len(b), c),
    }


def _read_acoustic_cavity(rd: Reader, name: str, s: dict[str, Any]) -> Subsystem | None:
    path = f"subsystems.{name}"
    allowed = ("kind", "description", "fluid", "dimensions", "volume", "surface_area",
               "edge_length", "modal_density", "damping")  # fmt: skip
    if not rd.keys(s, path, allowed, ("damping",)):
        return None
    fluid = _fluid_of(rd, s, path)
    geo: dict[str, float] = {}
    ok = True
    if "dimensions" in s:
        for k in ("volume", "surface_area", "edge_length"):
            if k in s:
                rd.error(f"{path}.{k}", "give either dimensions or volume/surface_area/edge_length")
                ok = False
        dims = s["dimensions"]
        if not isinstance(dims, list) or len(dims) != 3:
            rd.error(f"{path}.dimensions", "must be an array of three lengths [lx, ly, lz] in m")
            return None
        vals = [rd.number(x, f"{path}.dimensions[{i}]", unit="m") for i, x in enumerate(dims)]
        if not ok or any(v is None for v in vals):
            return None
        lx, ly, lz = (float(v) for v in vals if v is not None)
        v, sa, el = ac.rectangular_cavity_geometry(lx, ly, lz)
        geo = {"volume": v, "surface_area": sa, "edge_length": el}
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
            ok = False
        for k, unit in (("volume", "m^3"), ("surface_area", "m^2"), ("edge_length", "m")):
            if k in s:
                x = rd.number(s[k], f"{path}.{k}", unit=unit, strict=k != "edge_length")
                if x is None:
                    ok = False
                else:
                    geo[k] = x
        if not ok:
            return None
        geo_src = "volume, surface area and edge length given"
    if fluid is None:
        return None
    b = _bands(rd)
    c = fluid["sound_speed"]
    if "modal_density" in s:
        n = rd.spectrum(s["modal_density"], f"{path}.modal_density", unit="modes/Hz")
        nsrc = "given"
    else:
        n = ac.cavity_modal_density(
            b.centre, geo["volume"], geo["surface_area"], max(geo["edge_length"], 1e-300), c
        )
        nsrc = f"cavity_modal_density with surface and edge terms (Morse & Bolt 1944); {geo_src}"
    eta = read_damping(rd, s["damping"], f"{path}.damping", {**geo, "fluid": fluid})
    if n is None or eta is None:
        return None
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
    props = {**_acoustic_props(rd, fluid), **geo}
    if "dimensions" in s:
        props["dimensions"] = tuple(float(x) for x in s["dimensions"])
    return Subsystem(
        name=name,
        kind=str(s["kind"]),
        modal_density=n,
        damping=eta,
        quantity="sound_pressure",
        volume=geo["volume"],
        density=fluid["density"],
        sound_speed=c,
        provenance={"modal_density": nsrc, "damping": "given", "fluid": fluid["name"]},
        properties=props,
    )


def _read_duct(rd: Reader, name: str, s: dict[str, Any]) -> Subsystem | None:
    path = f"subsystems.{name}"
    allowed = ("kind", "description", "fluid", "length", "width", "height", "diameter",
               "modal_density", "damping")  # fmt: skip
    if not rd.keys(s, path, allowed, ("length", "damping")):
        return None
    rect = "width" in s or "height" in s
    if rect == ("diameter" in s) or (rect and not ("width" in s and "height" in s)):
        rd.error(path, "give the cross-section as width and height, or as diameter")
        return None
    fluid = _fluid_of(rd, s, path)
    length = _number(rd, s, path, "length", "m")
    if rect:
        w = _number(rd, s, path, "width", "m")
        hh = _number(rd, s, path, "height", "m")
        dd = None
    else:
        w = hh = None
        dd = _number(rd, s, path, "diameter", "m")
    if fluid is None or length is None or (rect and (w is None or hh is None)):
        return None
    if not rect and dd is None:
        return None
    c = fluid["sound_speed"]
    if w is not None and hh is not None:
        area = w * hh
        v, sa, el = ac.rectangular_cavity_geometry(length, w, hh)
        f_cut = float(ac.duct_cut_on_frequency_rectangular(w, hh, c))
    else:
        assert dd is not None
        area = math.pi * dd**2 / 4.0
        v, sa, el = area * length, math.pi * dd * length + 2.0 * area, 0.0
        f_cut = float(ac.duct_cut_on_frequency_circular(dd, c))
    b = _bands(rd)
    if "modal_density" in s:
        n = rd.spectrum(s["modal_density"], f"{path}.modal_density", unit="modes/Hz")
        nsrc = "given"
    else:
        n = ac.duct_modal_density(b.centre, length, c)
        nsrc = "duct_modal_density, plane waves 2 L / c (valid below the cut-on frequency)"
    geo = {"volume": v, "surface_area": sa, "edge_length": el}
    eta = read_damping(rd, s["damping"], f"{path}.damping", {**geo, "fluid": fluid})
    if n is None or eta is None:
        return None
    props = {
        **_acoustic_props(rd, fluid),
        **geo,
        "length": length,
        "section": {"area": area},
        "mass_per_length": fluid["density"] * area,
        "cut_on_frequency": f_cut,
    }
    return Subsystem(
        name=name,
        kind="duct",
        modal_density=n,
        damping=eta,
        quantity="sound_pressure",
        volume=v,
        density=fluid["density"],
        sound_speed=c,
        provenance={"modal_density": nsrc, "damping": "given", "fluid": fluid["name"]},
        properties=props,
    )


# ----------------------------------------------------------------------------------------
# resonator


def _read_resonator(rd: Reader, name: str, s: dict[str, Any]) -> Subsystem | None:
    path = f"subsystems.{name}"
    allowed = ("kind", "description", "mass", "stiffness", "loss_factor")
    if not rd.keys(s, path, allowed, ("mass", "stiffness", "loss_factor")):
        return None
    m = _number(rd, s, path, "mass", "kg")
    k = _number(rd, s, path, "stiffness", "N/m")
    eta = _number(rd, s, path, "loss_factor", "")
    if m is None or k is None or eta is None:
        return None
    b = _bands(rd)
    f0 = float(resonators.resonator_natural_frequency(m, k))
    n = resonators.resonator_modal_density(b.lower, b.upper, f0, loss_factor=eta)
    if not np.all(n > 0):
        rd.error(
            f"{path}.loss_factor",
            f"natural frequency {f0:.3g} Hz is too far from the bands for this loss factor "
            "(zero modal density in some bands)",
        )
        return None
    return Subsystem(
        name=name,
        kind="resonator",
        modal_density=n,
        damping=np.full(len(b), eta),
        quantity="velocity",
        mass=m,
        provenance={
            "modal_density": "resonator_modal_density, Lorentzian line of one mode "
            "(Lyon & DeJong 1995)",
            "damping": "given (loss_factor)",
        },
        properties={
            "wave_type": "resonator",
            "mass": m,
            "stiffness": k,
            "natural_frequency": f0,
            "loss_factor": eta,
        },
    )


SUBSYSTEM_KINDS.update(
    {
        "plate": _read_plate,
        "orthotropic_plate": _read_orthotropic,
        "ribbed_plate": _read_orthotropic,
        "sandwich_panel": _read_sandwich,
        "cylindrical_shell": _read_shell,
        "beam": _read_beam,
        "acoustic_cavity": _read_acoustic_cavity,
        # One cavity kind: given values (volume + modal_density) or derived from dimensions.
        "cavity": _read_acoustic_cavity,
        "duct": _read_duct,
        "resonator": _read_resonator,
    }
)


# ----------------------------------------------------------------------------------------
# excitations


def _position(rd: Reader, t: Mapping[str, Any], path: str, beam: bool) -> str | None:
    pos = t.get("position", "interior")
    ppath = path.rsplit(".", 1)[0] + ".position"
    if pos not in ("interior", "end"):
        rd.error(ppath, f"must be 'interior' or 'end', got {pos!r}")
        return None
    if pos == "end" and not beam:
        rd.error(ppath, "'end' is available for beams only")
        return None
    return str(pos)


def _conv_force(  # type: ignore[no-untyped-def]
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
):
    """Rms point force per band [N] -> P = F^2 Re(Y_infinite) (Cremer et al. 2005)."""
    p = sub.properties
    wave = p.get("wave_type")
    b = _bands(rd)
    if sub.kind in ("plate", "orthotropic_plate", "ribbed_plate") and wave == "bending":
        if _position(rd, t, path, beam=False) is None:
            return None
        y = mob.plate_point_mobility(p["bending_stiffness"], p["mass_per_area"])
        return "power", mob.point_force_power(v, np.broadcast_to(y, v.shape))
    if sub.kind == "beam" and wave in ("bending_y", "bending_z", "longitudinal"):
        pos = _position(rd, t, path, beam=True)
        if pos is None:
            return None
        mat, sec = p["material"], p["section"]
        if wave == "longitudinal":
            fn = mob.rod_end_mobility if pos == "end" else mob.rod_point_mobility
            y = fn(mat["youngs_modulus"], mat["density"], sec["area"])
        else:
            i = sec["I_y"] if wave == "bending_y" else sec["I_z"]
            fb = mob.beam_end_mobility if pos == "end" else mob.beam_point_mobility
            y = fb(b.centre, mat["youngs_modulus"], i, p["mass_per_length"])
        return "power", mob.point_force_power(v, np.broadcast_to(y, v.shape))
    what = f"of kind {sub.kind}" + (f" ({wave} field)" if wave else "")
    rd.error(
        path,
        f"a point force needs the bending field of a plate or the bending or longitudinal "
        f"field of a beam; {sub.name!r} is {what}",
    )
    return None


def _critical_in(sub: Subsystem, c0: float) -> float:
    p = sub.properties
    if sub.kind == "sandwich_panel":
        return sandwich_critical_frequency(p["section"], c0)
    return float(plates.critical_frequency(p["bending_stiffness"], p["mass_per_area"], c0))


def _conv_diffuse(  # type: ignore[no-untyped-def]
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
):
    """Diffuse-field SPL on one face -> resonant input power by SEA reciprocity."""
    from seatool.physics.radiation import radiation_efficiency_band

    p = sub.properties
    if sub.kind not in PLATE_KINDS or p.get("wave_type") != "bending":
        rd.error(
            path,
            f"a diffuse sound field acts on the bending field of a flat panel "
            f"({', '.join(PLATE_KINDS)}); {sub.name!r} is of kind {sub.kind}",
        )
        return None
    fpath = path.rsplit(".", 1)[0] + ".fluid"
    fluid = read_fluid(rd, t["fluid"], fpath) if "fluid" in t else p["fluid"]
    if fluid is None:
        return None
    c0 = fluid["sound_speed"]
    f_c = _critical_in(sub, c0)
    b = _bands(rd)
    sigma = radiation_efficiency_band(
        b.centre, p["lx"], p["ly"], f_c, f_lower=b.lower, f_upper=b.upper, c0=c0
    )
    p2 = levels.REFERENCE["sound_pressure"] ** 2 * 10.0 ** (v / 10.0)
    power = mob.diffuse_field_power_input(
        b.centre, p2, sigma, sub.modal_density, p["mass_per_area"], c0
    )
    return "power", power


EXCITATION_KEYS.update(
    {
        "force": ExcitationKey("N", _conv_force, minimum=0.0, strict=False, extra=("position",)),
        "diffuse_sound_pressure_level": ExcitationKey(
            "dB re 20 uPa", _conv_diffuse, minimum=None, extra=("fluid",)
        ),
    }
)
