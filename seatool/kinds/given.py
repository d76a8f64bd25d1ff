"""Kinds stated by their SEA values, the exterior sink and the resonator.

``structure`` (mass, modal density, damping given), ``exterior`` (a free-field sink),
``resonator`` (a mass on a spring: one mode) and the connection kind ``given`` (a coupling
loss factor stated in one direction).
"""

from __future__ import annotations

from typing import Any

import numpy as np

from ..model import Connection, Subsystem
from ..physics import resonators
from ..properties import ResonatorProps
from .damping_forms import read_damping
from .fields import bands_of
from .params import Kind, Param
from .reader import Reader

__all__ = ["EXTERIOR", "GIVEN", "RESONATOR", "STRUCTURE"]

_MASS = Param("mass", unit="kg", doc="mass", required=True, bounds=(1e-9, 1e9))


def _structure(
    rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str
) -> Subsystem | None:
    eta = read_damping(rd, s["damping"], f"{path}.damping")
    if eta is None:
        return None
    return Subsystem(
        name=name,
        kind="structure",
        modal_density=v["modal_density"],
        damping=eta,
        quantity="velocity",
        mass=v["mass"],
        provenance={"modal_density": "given", "damping": "given"},
    )


def _exterior(rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str) -> Subsystem:
    nb = len(bands_of(rd))
    return Subsystem(
        name=name,
        kind="exterior",
        modal_density=np.full(nb, np.inf),
        damping=np.zeros(nb),
        quantity="energy",
        sink=True,
        provenance={"modal_density": "free field (sink)"},
    )


def _resonator(
    rd: Reader, name: str, v: dict[str, Any], s: dict[str, Any], path: str
) -> Subsystem | None:
    m, k, eta = v["mass"], v["stiffness"], v["loss_factor"]
    b = bands_of(rd)
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
        props=ResonatorProps(mass=m, stiffness=k, natural_frequency=f0, loss_factor=eta),
    )


def _given(
    rd: Reader,
    name: str,
    v: dict[str, Any],
    s: dict[str, Any],
    ends: list[Subsystem],
    subs: Any,
    path: str,
) -> Connection | None:
    if len(ends) != 2:
        rd.error(
            f"{path}.between", f"a given coupling loss factor joins two subsystems, got {len(ends)}"
        )
        return None
    a, b = ends
    if a.sink:
        rd.error(
            f"{path}.between",
            f"put the exterior {a.name!r} second: a coupling loss factor is stated from the "
            "structure into the exterior",
        )
        return None
    return Connection(
        name, a.name, b.name, v["coupling_loss_factor"], kind="given",
        provenance={"coupling_loss_factor": "given"},
    )  # fmt: skip


STRUCTURE = Kind(
    "subsystem", "structure", "A structure given by its SEA values.",
    (
        _MASS,
        Param("modal_density", "spectrum", "modes/Hz", "modal density n(f)", required=True, bounds=(0.0, 1e12), basis="common practice: a 1e9 m^3 room has about 1e11 modes per Hz at 20 kHz"),
        Param("damping", "damping", doc="damping loss factor (>= 0)", required=True),
    ),
    _structure,
)  # fmt: skip

EXTERIOR = Kind(
    "subsystem", "exterior",
    "The free field around the model: a sink held at zero energy that returns nothing.",
    (), _exterior,
)  # fmt: skip

RESONATOR = Kind(
    "subsystem", "resonator", "Single degree of freedom: a mass on a spring (one mode).",
    (
        _MASS,
        Param("stiffness", unit="N/m", doc="spring stiffness", required=True, bounds=(1e-6, 1e15)),
        Param("loss_factor", doc="its damping loss factor (every band)", required=True, bounds=(0.0, 1.0)),
    ),
    _resonator,
)  # fmt: skip

GIVEN = Kind(
    "connection", "given", "A coupling loss factor stated from the first to the second subsystem.",
    (Param("coupling_loss_factor", "spectrum", doc="eta_12 per band (> 0)", required=True, bounds=(0.0, 1.0)),),
    _given,
    implicit=("kind", "description", "between"),
)  # fmt: skip
