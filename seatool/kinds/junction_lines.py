"""Connection kind ``line``: a rigid line junction of two or more plates along a seam.

Wave model with bending and (when the plates carry them) in-plane wave fields,
``eta_ij = c_g,i L tau_ij / (pi omega S_i)``
(:func:`seatool.physics.junctions.line_junction_transmission_diffuse`,
:func:`seatool.physics.coupling.clf_line_junction`).

What every line-junction kind shares is public here: :func:`junction_plate` (the plate of
the wave model for a subsystem), :func:`group_speed`, :func:`read_angles` and
:func:`line_connections`, which turns any diffuse-field transmission function of the
plates into the coupling loss factors between every pair of wave fields.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping, Sequence
from typing import Any

import numpy as np
import numpy.typing as npt

from ..model import Connection, Subsystem
from ..physics import coupling, elastic, junctions, plates
from ..properties import PanelProps, radiates
from .fields import LENGTH_BOUNDS
from .links import BETWEEN, describe, per_band
from .params import Kind, Param
from .reader import Reader

__all__ = [
    "LINE",
    "Transmission",
    "default_angles",
    "group_speed",
    "junction_plate",
    "line_connections",
    "read_angles",
]

Array = npt.NDArray[np.float64]

#: ``transmission(f, plates, incidents)``: diffuse-field ``tau_bar[i, b, p, t]``
#: ``(I, B, N, 3)`` of a line junction for the bands ``f`` [Hz] (the plates of those bands)
#: and each ``(source plate, incident wave)`` of ``incidents`` (wave one of
#: :data:`seatool.physics.junctions.WAVE_TYPES`), all solved as one stack.
Transmission = Callable[
    [Array, Sequence[junctions.JunctionPlate], Sequence[tuple[int, str]]], Array
]

#: Default junction angles [deg] by number of plates: L, T (the second plate is the stem), X.
_DEFAULT_ANGLES = {2: (0.0, 90.0), 3: (0.0, 90.0, 180.0), 4: (0.0, 90.0, 180.0, 270.0)}

#: Relative tolerance for "bending stiffness of a homogeneous plate".
_HOMOGENEOUS = 1e-6


def default_angles(n: int) -> tuple[float, ...] | None:
    """Default junction angles [deg]: L for 2 plates, T for 3, X for 4 (else None)."""
    return _DEFAULT_ANGLES.get(n)


def junction_plate(
    rd: Reader, path: str, sub: Subsystem, angle_deg: float, nb: int
) -> tuple[list[junctions.JunctionPlate], bool] | None:
    """Per-band plates of the wave model for one subsystem, and whether it is equivalent.

    A homogeneous isotropic plate is used as it is (density from the mass per area, so an
    added treatment mass is included). Any other flat panel (orthotropic, ribbed,
    sandwich: ``bending_stiffness`` differs from ``E h^3/(12(1 - nu^2))``) is replaced by
    the equivalent isotropic plate with the subsystem's own bending stiffness and mass
    per area (thickness ``h_eq = (12 (1 - nu^2) D / E)^(1/3)``), so that the bending
    wavenumber, which dominates the junction, is the subsystem's; its in-plane stiffness is
    then that of ``h_eq`` (an approximation, stated in the provenance).
    """
    p = sub.props
    assert isinstance(p, PanelProps)
    mat = p.material
    e, nu = float(mat.youngs_modulus), float(mat.poisson_ratio)
    m = float(p.mass_per_area)
    d = per_band(p.bending_stiffness, nb)
    h = p.thickness
    if h is not None and np.ndim(h) == 0:
        d_iso = float(plates.bending_stiffness(e, float(h), nu))
        homogeneous = bool(np.allclose(d, d_iso, rtol=_HOMOGENEOUS, atol=0.0))
    else:
        homogeneous = False
    if not np.all(np.isfinite(d) & (d > 0)):
        rd.error(path, f"plate {sub.name!r} has no valid bending_stiffness property")
        return None
    if homogeneous:
        assert h is not None
        h_eq = np.full(nb, float(h))
    else:
        h_eq = (12.0 * (1.0 - nu**2) * d / e) ** (1 / 3)
    cache: dict[float, junctions.JunctionPlate] = {}
    out = []
    try:
        for hb in h_eq:
            key = float(hb)
            if key not in cache:
                cache[key] = junctions.JunctionPlate(
                    thickness=key,
                    youngs_modulus=e,
                    density=m / key,
                    poisson=nu,
                    angle=math.radians(angle_deg),
                )
            out.append(cache[key])
    except ValueError as exc:
        rd.error(path, f"plate {sub.name!r}: {exc}")
        return None
    return out, not homogeneous


def group_speed(sub: Subsystem, plate: junctions.JunctionPlate, wave: str, f: Array) -> Array:
    """Group speed of a plate wave field: the subsystem's own, else from its material."""
    nb = f.size
    if isinstance(sub.props, PanelProps):
        return per_band(sub.props.group_speed, nb)
    e, rho, nu, h = plate.youngs_modulus, plate.density, plate.poisson, plate.thickness
    if wave == "bending":
        d = plates.bending_stiffness(e, h, nu)
        return per_band(plates.plate_bending_group_speed(f, d, rho * h), nb)
    if wave == "longitudinal":
        return per_band(elastic.plate_longitudinal_speed(e, rho, nu), nb)
    return per_band(elastic.shear_speed(e, rho, nu), nb)


def read_angles(rd: Reader, s: Mapping[str, Any], path: str, n: int) -> list[float] | None:
    """The ``angles`` of a line junction of ``n`` plates [deg] (defaults: L, T, X)."""
    if "angles" not in s:
        dflt = default_angles(n)
        if dflt is None:
            rd.error(
                f"{path}.angles",
                f"missing: {n} plates need their angles in degrees (defaults exist for 2, 3, 4)",
            )
            return None
        return list(dflt)
    a = s["angles"]
    p = f"{path}.angles"
    if not isinstance(a, list) or any(
        isinstance(x, bool) or not isinstance(x, int | float) for x in a
    ):
        rd.error(p, "must be an array of numbers (degrees), one per plate in 'between'")
        return None
    if len(a) != n:
        rd.error(p, f"has {len(a)} angles but 'between' names {n} plates")
        return None
    vals = [float(x) for x in a]
    if not all(math.isfinite(x) for x in vals):
        rd.error(p, "angles must be finite")
        return None
    norm = [x % 360.0 for x in vals]
    for i in range(n):
        for j in range(i):
            d = abs(norm[i] - norm[j])
            if min(d, 360.0 - d) < 1.0:
                rd.error(
                    p,
                    f"plates {j} and {i} point in the same direction ({vals[j]:g} and "
                    f"{vals[i]:g} deg); give distinct angles",
                )
                return None
    return vals


_WAVES = junctions.WAVE_TYPES


def _rigid(
    f: Array, plates: Sequence[junctions.JunctionPlate], incidents: Sequence[tuple[int, str]]
) -> Array:
    return junctions.line_junction_transmission_diffuse_many(
        f,
        [[p] * f.size for p in plates],
        incidents,  # type: ignore[arg-type]
    )


def _line(
    rd: Reader,
    name: str,
    v: dict[str, Any],
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
    path: str,
) -> list[Connection] | None:
    return line_connections(rd, name, v, s, ends, subs, path, "line", "rigid line junction", _rigid)


def line_connections(
    rd: Reader,
    name: str,
    v: Mapping[str, Any],
    s: Mapping[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
    path: str,
    kind: str,
    label: str,
    transmission: Transmission,
) -> list[Connection] | None:
    """Coupling loss factors between every pair of wave fields of a line junction.

    ``v`` holds the validated ``length`` [m]; ``s`` is the raw table (``angles`` are read
    here); ``kind`` names the connections' kind and ``label`` opens their provenance;
    ``transmission`` gives the diffuse-field transmission coefficients of the plates
    (see :data:`Transmission`). Each unordered pair of wave fields is stated once, from
    the lower to the higher (plate, wave) index; the solver adds the other direction by
    reciprocity. Returns None after reporting problems.
    """
    length = v["length"]
    angles = read_angles(rd, s, path, len(ends))
    per_plate: list[list[junctions.JunctionPlate]] = []
    equivalent: list[str] = []
    ok = length is not None and angles is not None
    assert rd.bands is not None
    nb = len(rd.bands)
    for k, e in enumerate(ends):
        bp = f"{path}.between[{k}]"
        if not radiates(e):
            rd.error(
                bp,
                f"{describe(e)} is not the bending field of a plate (a line junction joins "
                "plates; name their bending fields, the in-plane fields are found by name)",
            )
            ok = False
            continue
        if angles is not None:
            got = junction_plate(rd, bp, e, angles[k], nb)
            if got is None:
                ok = False
            else:
                per_plate.append(got[0])
                if got[1]:
                    equivalent.append(e.name)
    if not ok:
        return None
    assert length is not None
    f = np.asarray(rd.bands.centre, dtype=float)
    # Bands that share the same set of plates are solved together (one group unless a
    # plate has a per-band bending stiffness).
    groups: dict[tuple[int, ...], list[int]] = {}
    for j in range(nb):
        groups.setdefault(tuple(id(pp[j]) for pp in per_plate), []).append(j)
    note = (
        f"; equivalent isotropic plate (same D and m'') for {', '.join(map(repr, equivalent))}"
        if equivalent
        else ""
    )
    # Wave fields present in the model, per plate: bending always, in-plane if declared.
    fields: list[dict[str, Subsystem]] = []
    for e in ends:
        fd: dict[str, Subsystem] = {"bending": e}
        for w in ("longitudinal", "shear"):
            other = subs.get(f"{e.component}.{w}")
            if (
                other is not None
                and other.component == e.component
                and getattr(other.props, "wave_type", None) == w
            ):
                fd[w] = other
        fields.append(fd)
    # Each unordered pair of wave fields is stated once, from the lower to the higher
    # (plate, wave) index: an incident field is needed only if a higher one exists.
    present = [(i, _WAVES.index(a)) for i, fi in enumerate(fields) for a in fi]
    needed = [
        (i, a) for i, fi in enumerate(fields) for a in fi if (i, _WAVES.index(a)) < max(present)
    ]
    taus = {key: np.empty((nb, len(ends), 3)) for key in needed}
    if needed:
        for idx in groups.values():
            plates = [pp[idx[0]] for pp in per_plate]
            tau_many = transmission(f[idx], plates, needed)
            for k, key in enumerate(needed):
                taus[key][idx] = tau_many[k]
    out: list[Connection] = []
    for i, fi in enumerate(fields):
        area_i = float(ends[i].props.area)  # type: ignore[union-attr]
        for a, src in fi.items():
            ia = _WAVES.index(a)
            if (i, a) not in taus:
                continue  # the highest field: every pair with it is stated from the other end
            tau = taus[(i, a)]
            cg = group_speed(src, per_plate[i][0], a, f)
            for j, fj in enumerate(fields):
                for b, dst in fj.items():
                    jb = _WAVES.index(b)
                    if (j, jb) <= (i, ia):
                        continue  # each unordered pair once; reciprocity gives the other
                    eta = per_band(
                        coupling.clf_line_junction(f, cg, length, tau[:, j, jb], area_i), f.size
                    )
                    eta = np.maximum(eta, np.finfo(float).tiny)
                    out.append(
                        Connection(
                            f"{name}[{src.name}->{dst.name}]",
                            src.name,
                            dst.name,
                            eta,
                            kind=kind,
                            provenance={
                                "coupling_loss_factor": (
                                    f"{label}, wave model ({a} -> {b}): "
                                    "c_g L tau_bar/(pi omega S)" + note
                                )
                            },
                        )
                    )
    return out


LINE = Kind(
    "connection", "line",
    "Rigid line junction of two or more plates along a seam (bending and in-plane waves).",
    (
        Param("length", unit="m", doc="length of the seam", required=True, bounds=LENGTH_BOUNDS),
        Param("angles", "array", "deg", "angle of each plate around the seam", default_doc="L, T, X for 2, 3, 4 plates"),
    ),
    _line,
    implicit=BETWEEN,
    extent="line",
)  # fmt: skip
