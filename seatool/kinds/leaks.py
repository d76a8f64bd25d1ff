"""Connection kind ``leak``: an aperture between two cavities.

``eta = c S_a tau_a / (4 omega V)`` (:func:`seatool.physics.coupling.clf_aperture`) with the
transmission coefficient of circular holes through a wall of given depth
(:func:`seatool.physics.coupling.aperture_transmission_circular`) or of an open area
(tau = 1).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from typing import Any

import numpy as np

from ..model import Connection, Subsystem
from ..physics import coupling
from ..properties import is_cavity
from .links import BETWEEN, cavity_pair_clf, describe, need_two, per_band, shared_fluid, volume_of
from .params import Kind, Param
from .reader import Reader
from .validate import check_derived

__all__ = ["LEAK", "LEAK_MODELS"]

LEAK_MODELS = ("circular", "open")


def _leak(
    rd: Reader,
    name: str,
    v: dict[str, Any],
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Mapping[str, Subsystem],
    path: str,
) -> Connection | None:
    if not need_two(rd, path, ends, "leak"):
        return None
    ok = True
    for k, e in enumerate(ends):
        if not is_cavity(e):
            rd.error(
                f"{path}.between[{k}]",
                f"{describe(e)} is not a cavity; a leak joins two cavities",
            )
            ok = False
    model, area, holes = v["model"], v["area"], v["holes"]
    depth = v["depth"]
    if model == "circular" and depth is None:
        rd.error(
            f"{path}.depth",
            "missing required key for model = 'circular' (wall thickness [m]; "
            "model = 'open' takes tau = 1)",
        )
        ok = False
    elif model == "open":
        if "depth" in s:
            rd.error(f"{path}.depth", "is not used by model = 'open' (tau = 1); remove it")
            ok = False
        depth = 0.0
    if not ok:
        return None
    fluids = shared_fluid(rd, path, ends, "leak model")
    if fluids is None:
        return None
    f1, _ = fluids
    assert rd.bands is not None
    f = np.asarray(rd.bands.centre, dtype=float)
    rho, c = f1
    if model == "circular":
        radius = math.sqrt(area / (holes * math.pi))
        tau: Any = coupling.aperture_transmission_circular(f, radius, depth, rho0=rho, c0=c)
        if not check_derived(rd, path, {"hole radius": radius}, (f"{path}.area", f"{path}.holes")):
            return None
        desc = f"{holes} circular hole(s), tube with piston-radiation ends"
    else:
        tau = 1.0
        desc = "open area, tau = 1"
    v1, v2 = volume_of(ends[0]), volume_of(ends[1])
    assert v1 is not None and v2 is not None
    eta = cavity_pair_clf(
        per_band(coupling.clf_aperture(f, area, v1, tau, c0=c), f.size),
        per_band(coupling.clf_aperture(f, area, v2, tau, c0=c), f.size),
        ends[0].modal_density,
        ends[1].modal_density,
    )
    eta = np.maximum(eta, np.finfo(float).tiny)
    return Connection(
        name,
        ends[0].name,
        ends[1].name,
        eta,
        kind="leak",
        provenance={"coupling_loss_factor": f"leak: c S_a tau/(4 omega V_1), {desc}"},
    )


LEAK = Kind(
    "connection", "leak", "Aperture (circular holes or an open area) between two cavities.",
    (
        Param("area", unit="m^2", doc="total open area", required=True, bounds=(1e-10, 1e6)),
        Param("model", "choice", doc="circular holes through a wall, or an open area (tau = 1)", choices=LEAK_MODELS, default="circular"),
        Param("depth", unit="m", doc="wall thickness at the holes (model = 'circular')", strict=False, bounds=(0.0, 10.0)),
        Param("holes", "integer", doc="number of equal circular holes", default=1, minimum=1, bounds=(1, 1e9)),
    ),
    _leak,
    implicit=BETWEEN,
    extent="area",
)  # fmt: skip
