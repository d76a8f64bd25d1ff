"""Connection kind ``resilient_line``: plates joined along a seam through an elastic strip.

A glazing bead, a rubber strip under a partition or an elastomer bearing under a wall:
the plates named in ``on_layer`` rest on a strip of dynamic stiffness per unit length
``k'`` [N/m^2] (compression), ``k'_s`` (shear) and ``k' b^2/12`` (rocking, strip width
``b``), the others are joined rigidly to the seam. The wave model of the rigid line
junction with the strip's springs in series with those plates' edges
(:func:`seatool.physics.junctions.line_junction_transmission_diffuse_many` with
:func:`seatool.physics.junction_waves.interlayer_compliance`, remembered by value like the
rigid junction) gives the diffuse-field transmission coefficients; ``eta_ij = c_g,i L tau_ij / (pi omega S_i)``
(:func:`seatool.physics.coupling.clf_line_junction`). A very stiff strip is the rigid
``line`` junction.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import Any

import numpy as np
import numpy.typing as npt

from ..model import Connection, Subsystem
from ..physics import junction_waves, junctions
from .fields import LENGTH_BOUNDS
from .junction_lines import line_connections
from .links import BETWEEN
from .params import Kind, Param
from .reader import Reader

__all__ = ["RESILIENT_LINE"]

Array = npt.NDArray[np.float64]

#: Dynamic stiffness per unit length of seam [N/m^2]: from a soft strip (s' = 1 MN/m^3,
#: 5 mm wide) to a hard bearing (s' = 10 GN/m^3, 0.5 m wide), with margin.
_STIFFNESS_BOUNDS = (1e2, 1e12)

#: Gauss-Legendre nodes per sub-interval of the diffuse-field average (as for ``line``).
_NODES = 48


def _on_layer(rd: Reader, s: Mapping[str, Any], path: str, names: list[str]) -> list[int] | None:
    """Indexes in ``between`` of the plates resting on the strip (default: the second)."""
    if "on_layer" not in s:
        return [1]
    p = f"{path}.on_layer"
    got = s["on_layer"]
    if not isinstance(got, list) or not got or any(not isinstance(x, str) for x in got):
        rd.error(p, "must be a non-empty array of subsystem names from 'between'")
        return None
    out: list[int] = []
    for x in got:
        if x not in names:
            rd.error(p, f"{x!r} is not named in 'between' ({', '.join(map(repr, names))})")
            return None
        if names.index(x) in out:
            rd.error(p, f"{x!r} is named twice")
            return None
        out.append(names.index(x))
    return out


def _resilient_line(
    rd: Reader,
    name: str,
    v: dict[str, Any],
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
    path: str,
) -> list[Connection] | None:
    resting = _on_layer(rd, s, path, [e.name for e in ends])
    if resting is None:
        return None
    stiffness, shear, width = v["stiffness"], v["shear_stiffness"], v["width"]

    def transmission(
        f: Array,
        plate_list: Sequence[junctions.JunctionPlate],
        incidents: Sequence[tuple[int, str]],
    ) -> Array:
        compliance = np.zeros((len(plate_list), 4), dtype=np.complex128)
        for k in resting:
            compliance[k] = junction_waves.interlayer_compliance(
                stiffness,
                width=plate_list[k].thickness if width is None else width,
                shear_stiffness=shear,
            )
        return junctions.line_junction_transmission_diffuse_many(
            f,
            [[p] * f.size for p in plate_list],
            incidents,  # type: ignore[arg-type]
            n_points=_NODES,
            compliance=compliance,
        )

    on = ", ".join(repr(ends[k].name) for k in resting)
    label = f"line junction through an elastic strip under {on} (k' = {stiffness:g} N/m^2)"
    return line_connections(rd, name, v, s, ends, subs, path, "resilient_line", label, transmission)


RESILIENT_LINE = Kind(
    "connection", "resilient_line",
    "Line junction of two or more plates along a seam where some plates rest on an elastic strip "
    "(glazing bead, rubber strip or bearing under a wall); a very stiff strip is the rigid line.",
    (
        Param("length", unit="m", doc="length of the seam", required=True, bounds=LENGTH_BOUNDS),
        Param("angles", "array", "deg", "angle of each plate around the seam", default_doc="L, T, X for 2, 3, 4 plates"),
        Param("stiffness", unit="N/m^2", doc="dynamic stiffness of the strip per length of seam in compression (s' b: stiffness per area times width)", required=True, bounds=_STIFFNESS_BOUNDS),
        Param("shear_stiffness", unit="N/m^2", doc="dynamic stiffness of the strip per length of seam in shear", default_doc="stiffness/3 (elastomer)", bounds=_STIFFNESS_BOUNDS),
        Param("width", unit="m", doc="width of the strip across the seam (sets its rocking stiffness k' b^2/12)", default_doc="thickness of the plate resting on it", bounds=(1e-4, 2.0)),
        Param("on_layer", "array", "", "names of the plates in 'between' whose edge rests on the strip", default_doc="the second plate"),
    ),
    _resilient_line,
    implicit=BETWEEN,
    extent="line",
)  # fmt: skip
