"""The ``edge_seal`` key of a ``plate``: a resilient, lossy strip on each face along its edges.

``edge_seal = { youngs_modulus, loss_factor, width, thickness, length }`` adds to the
plate's bending damping the loss factor of the bending waves its sealed edges absorb
(:func:`seatool.physics.edge_mounting.seal_absorption_diffuse` in the edge term of
EN ISO 12354-1 Annex C, :func:`seatool.physics.installed_damping.edge_absorption_loss_factor`).
It is for a plate whose edges are not modelled as junctions and that sits in a rigid frame
through gaskets or sealant (glazing); where its edges are modelled, the junctions carry
those losses and no seal is added.
"""

from __future__ import annotations

import dataclasses
from typing import Any

import numpy as np

from ..model import Subsystem
from ..physics import edge_mounting, installed_damping
from ..properties import PanelProps
from .params import Kind, Param
from .reader import Reader
from .validate import check

__all__ = ["EDGE_SEAL", "EDGE_SEAL_KEY", "add_edge_seal"]


def _no_derive(*args: Any) -> None:
    """Read by :func:`add_edge_seal` (the declaration drives the key checks and docs)."""


#: The ``edge_seal`` table of a plate.
EDGE_SEAL = Kind(
    "treatment",
    "edge_seal",
    "A resilient, lossy strip on each face of a ``plate`` along its edges, between the plate "
    "and a rigid frame (glazing gasket, sealant bead, perimeter strip): "
    "``edge_seal = { youngs_modulus = 5e6, loss_factor = 0.2, width = 0.010, "
    "thickness = 0.004 }`` adds the bending-wave absorption of the sealed edges to the "
    "plate's damping (docs/theory/subsystems.md, section 11.1).",
    (
        Param("youngs_modulus", unit="Pa", doc="effective compression modulus of the strips", required=True, bounds=(1e4, 1e10), typical=(3e5, 3e7), why="glazing gaskets and sealants lie about 0.5 - 10 MPa (from memory)"),
        Param("loss_factor", doc="loss factor of the strip material", required=True, strict=False, bounds=(0.0, 3.0), typical=(0.02, 1.0), why="rubbers and sealants lie about 0.05 - 0.5, putty and butyl up to about 1 (from memory)"),
        Param("width", unit="m", doc="contact width of each strip on the plate face", required=True, bounds=(1e-4, 0.5), typical=(0.002, 0.05), why="a strip wider than a few centimetres is no longer a line support"),
        Param("thickness", unit="m", doc="thickness of each strip between plate and frame", required=True, bounds=(1e-5, 0.1), typical=(5e-4, 0.02), why="the thin-layer stiffness E w / t assumes a thin strip"),
        Param("length", unit="m", doc="sealed length of the edges", default_doc="the whole perimeter 2 (lx + ly)", bounds=(1e-3, 1e4)),
    ),
    _no_derive,
    implicit=("description",),
)  # fmt: skip

#: The key of the ``plate`` kind.
EDGE_SEAL_KEY = Param(
    "edge_seal",
    "table",
    doc="resilient, lossy strips on both faces along the edges: adds their edge absorption "
    "to the damping; see the edge_seal table",
)


def add_edge_seal(
    rd: Reader, value: Any, path: str, bend: Subsystem, poisson_ratio: float
) -> Subsystem | None:
    """The bending subsystem ``bend`` with the loss factor of its sealed edges added.

    ``value`` is the ``edge_seal`` table at ``path``; problems are reported on ``rd`` (one
    line each, key paths under ``path``) and None returned.
    """
    table = rd.table(value, path)
    if table is None:
        return None
    v = check(rd, EDGE_SEAL, table, path)
    if v is None:
        return None
    props = bend.props
    assert isinstance(props, PanelProps)
    assert rd.bands is not None
    f = rd.bands.centre
    length = v["length"] if v["length"] is not None else props.perimeter
    alpha = edge_mounting.seal_absorption_diffuse(
        f,
        props.bending_stiffness,
        props.mass_per_area,
        poisson_ratio,
        v["youngs_modulus"],
        v["loss_factor"],
        v["width"],
        v["thickness"],
    )
    assert props.critical_frequency is not None
    edge = installed_damping.edge_absorption_loss_factor(
        f, props.area, length * alpha, props.critical_frequency, c0=props.fluid.sound_speed
    )
    damping = np.asarray(bend.damping + edge, dtype=np.float64)
    damping.flags.writeable = False
    prov = dict(bend.provenance)
    prov["damping"] = f"{prov.get('damping', 'given')} + edge seal ({path})"
    return dataclasses.replace(bend, damping=damping, provenance=prov)
