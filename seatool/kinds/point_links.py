"""Connection kinds at points: ``point`` (rigid) and ``mount`` (resilient).

Coupling loss factors from the ends' infinite-system drive-point mobilities
(:func:`seatool.physics.junctions.clf_point_rigid`,
:func:`seatool.physics.junctions.clf_point_resilient`); a ``point`` joining a resonator
attaches its spring to the structure (:func:`seatool.physics.junctions.clf_resonator_point`).
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import numpy as np
import numpy.typing as npt

from ..model import Connection, Subsystem
from ..physics import junctions, mobility
from ..properties import BeamProps, PanelProps, ResonatorProps, has_point_mobility, is_resonator
from .links import BETWEEN, describe, need_two, per_band
from .params import Kind, Param
from .reader import Reader

__all__ = ["MOUNT", "POINT", "WEAK_RESONATOR_COUPLING"]

Array = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]


def _point_mobility(
    rd: Reader, path: str, sub: Subsystem, f: Array
) -> tuple[ComplexArray, float] | None:
    """Drive-point force mobility (infinite-system value) and mass of a structure."""
    nb = f.size
    if is_resonator(sub):
        rd.error(
            path,
            f"{sub.name!r} is a resonator: its spring is the connection; join it with "
            "kind = 'point' to one plate or beam (resilient mounts and other ends are not "
            "supported)",
        )
        return None
    if not has_point_mobility(sub):
        rd.error(
            path,
            f"{describe(sub)} has no drive-point mobility: a point connection joins plate "
            "bending fields (bending_stiffness, mass_per_area) or beam fields (section, "
            "mass_per_length, material; bending or longitudinal)",
        )
        return None
    p = sub.props
    if isinstance(p, PanelProps):
        y: Any = mobility.plate_point_mobility(p.bending_stiffness, p.mass_per_area)
        mass = sub.mass if sub.mass is not None else p.area * p.mass_per_area
    else:
        assert isinstance(p, BeamProps)
        mat, sec = p.material, p.section
        if p.wave_type == "longitudinal":
            y = mobility.rod_point_mobility(mat.youngs_modulus, mat.density, sec.area)
        else:
            i_b = sec.I_z if p.wave_type == "bending_z" else sec.I_y
            y = mobility.beam_point_mobility(f, mat.youngs_modulus, i_b, p.mass_per_length)
        mass = sub.mass if sub.mass is not None else p.length * p.mass_per_length
    return np.array(np.broadcast_to(np.asarray(y, dtype=complex), (nb,))), float(mass)


def _point_like(
    rd: Reader,
    name: str,
    v: dict[str, Any],
    s: dict[str, Any],
    ends: list[Subsystem],
    path: str,
    *,
    resilient: bool,
) -> Connection | None:
    what = "mount connection" if resilient else "point connection"
    if not need_two(rd, path, ends, what):
        return None
    resonators = [e for e in ends if is_resonator(e)]
    if len(resonators) == 1 and not resilient:
        return _resonator_point(rd, name, s, ends, resonators[0], path)
    assert rd.bands is not None
    f = np.asarray(rd.bands.centre, dtype=float)
    got = [_point_mobility(rd, f"{path}.between[{k}]", e, f) for k, e in enumerate(ends)]
    n = v["points"]
    k_m = v.get("stiffness")
    eta_m = v.get("loss_factor")
    if resilient and eta_m is None:
        eta_m = np.zeros(f.size)
    if None in got:
        return None
    (y1, m1), (y2, _) = got  # type: ignore[misc]
    if resilient:
        assert k_m is not None and eta_m is not None
        eta = junctions.clf_point_resilient(f, y1, y2, m1, k_m, loss_factor=eta_m, n_points=n)
        desc = f"{n} resilient mount(s), incoherent: N Re Y2/(omega M1 |Y1 + Ym + Y2|^2)"
    else:
        eta = junctions.clf_point_rigid(f, y1, y2, m1, n_points=n)
        desc = f"{n} rigid point(s), incoherent: N Re Y2/(omega M1 |Y1 + Y2|^2)"
    eta = np.maximum(per_band(eta, f.size), np.finfo(float).tiny)
    return Connection(
        name,
        ends[0].name,
        ends[1].name,
        eta,
        kind="mount" if resilient else "point",
        provenance={"coupling_loss_factor": desc + ", infinite-system drive-point mobilities"},
    )


#: Loss factor through a resonator's spring above which the weak-coupling estimate is
#: flagged (the neglected frequency shift is of the same order; common practice).
WEAK_RESONATOR_COUPLING = 0.1


def _resonator_point(
    rd: Reader, name: str, s: dict[str, Any], ends: list[Subsystem], res: Subsystem, path: str
) -> Connection | None:
    """A resonator's spring attached at one point of a plate or beam (junctions.clf_resonator_point)."""
    if "points" in s:
        rd.error(
            f"{path}.points",
            "a resonator subsystem is one spring-mass; model several as separate resonators",
        )
        return None
    k_idx = 1 if ends[0] is res else 0
    other = ends[k_idx]
    p = res.props
    assert isinstance(p, ResonatorProps)
    f0 = float(p.natural_frequency)
    got = _point_mobility(rd, f"{path}.between[{k_idx}]", other, np.array([f0]))
    if got is None:
        return None
    y0 = got[0][0]
    assert rd.bands is not None
    f = np.asarray(rd.bands.centre, dtype=float)
    eta = junctions.clf_resonator_point(f, f0, float(p.stiffness), y0)
    eta0 = float(junctions.clf_resonator_point(f0, f0, float(p.stiffness), y0))
    if eta0 > WEAK_RESONATOR_COUPLING:
        rd.notes.append(
            f"{name}: the resonator {res.name!r} is strongly coupled to {other.name!r} "
            f"(loss factor {eta0:.2g} through its spring at f0 = {f0:.4g} Hz, above "
            f"{WEAK_RESONATOR_COUPLING:g}): the weak-coupling estimate is rough; its natural "
            "frequency shifts on this structure"
        )
    eta = np.maximum(per_band(eta, f.size), np.finfo(float).tiny)
    return Connection(
        name,
        res.name,
        other.name,
        eta,
        kind="point",
        provenance={
            "coupling_loss_factor": "resonator spring on the structure's infinite-system "
            f"mobility at f0 = {f0:.4g} Hz: eta = Re(a)/(1 + Im(a)) (omega0/omega), a = k Y/omega0"
        },
    )


def _point(
    rd: Reader,
    name: str,
    v: dict[str, Any],
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
    path: str,
) -> Connection | None:
    return _point_like(rd, name, v, s, ends, path, resilient=False)


def _mount(
    rd: Reader,
    name: str,
    v: dict[str, Any],
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
    path: str,
) -> Connection | None:
    return _point_like(rd, name, v, s, ends, path, resilient=True)


_POINTS = Param(
    "points", "integer", doc="number of connection points (incoherent)", default=1, minimum=1,
    bounds=(1, 1e6),
)

POINT = Kind(
    "connection", "point",
    "Rigid point connection(s) between plates and beams from drive-point mobilities; "
    "with a resonator: its spring on the structure.",
    (_POINTS,),
    _point,
    implicit=BETWEEN,
    extent="point",
)  # fmt: skip

MOUNT = Kind(
    "connection", "mount",
    "Resilient mount(s): massless springs with a loss factor at points between two structures.",
    (
        _POINTS,
        Param("stiffness", "spectrum", "N/m", "dynamic stiffness of one mount", required=True, bounds=(1e-6, 1e15)),
        Param("loss_factor", "spectrum", doc="loss factor of the mount", strict=False, bounds=(0.0, 10.0), default_doc="0"),
    ),
    _mount,
    implicit=BETWEEN,
    extent="point",
)  # fmt: skip
