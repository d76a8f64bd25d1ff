"""Added mass of the treatments of a model, and the mass-spring resonance of each trim.

Reads the treatments the model reader attached to treated plates (their masses per area,
the trim's layers) and never changes the model.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import pandas as pd

from ..model import Model, Subsystem
from ..physics.air import AIR_DENSITY, AIR_SOUND_SPEED
from ..physics.resonators import mass_spring_mass_frequency

__all__ = ["TreatedSurface", "added_mass_table", "total_added_mass", "treated_surfaces"]

#: Trim layer kinds that are impervious masses (the "m2" of the mass-spring system).
_MASS_KINDS = ("heavy_layer", "viscoelastic")

#: In-plane wave fields of a plate share its treatment with its bending field; the
#: treatment's mass is counted once, on the bending field.
_IN_PLANE = ("longitudinal", "shear")


@dataclass(frozen=True)
class TreatedSurface:
    """One treated plate: its added masses and its trim's mass-spring resonance.

    ``bonded_kg`` is the damping layer (and cover) moving with the plate; ``trim_kg`` the
    trim's mass; ``resonance_hz`` the mass-spring resonance of the trim on the plate
    (None without a trim with a spring layer under a mass layer).
    """

    subsystem: str
    description: str
    area_m2: float
    bonded_kg: float
    trim_kg: float
    face: str | None
    resonance_hz: float | None

    @property
    def added_kg(self) -> float:
        return self.bonded_kg + self.trim_kg


def _treatment(sub: Subsystem) -> Any:
    return getattr(sub.props, "treatment", None)


def trim_resonance(treatment: Any, *, gamma: float = 1.4) -> float | None:
    """Mass-spring resonance [Hz] of a plate's trim: the plate (with its bonded layers) and
    the trim's mass layers on the air stiffness of the layers between them.

    The spring is the air in the layers under the first mass layer, springs in series:
    1/s' = sum d_i / K_i with K = rho0 c0^2 (adiabatic) in an air gap and
    K = rho0 c0^2 / gamma (isothermal) in a porous layer, where heat exchange with the
    fibres makes the compression isothermal at low frequencies (Vigran 2008, Building
    Acoustics, ch. 8, from memory); the frame is assumed no stiffer than its air. m1 is the
    treated plate, m2 the trim's mass layers; f0 of
    :func:`seatool.physics.resonators.mass_spring_mass_frequency`.
    """
    layers = getattr(treatment, "trim", ()) or ()
    compliance = 0.0
    m2 = 0.0
    seen_mass = False
    k_air = AIR_DENSITY * AIR_SOUND_SPEED**2
    for layer in layers:
        if layer.kind in _MASS_KINDS:
            seen_mass = True
            m2 += float(layer.mass_per_area)
        elif not seen_mass:
            k = k_air / gamma if layer.kind == "porous" else k_air
            compliance += float(layer.thickness) / k
    m1 = float(treatment.treated_mass_per_area)
    if not seen_mass or compliance <= 0.0 or m1 <= 0.0 or m2 <= 0.0:
        return None
    return float(mass_spring_mass_frequency(1.0 / compliance, m1, m2))


def treated_surfaces(model: Model) -> list[TreatedSurface]:
    """Every treated plate of ``model`` with its added masses [kg] and trim resonance
    (once per plate: its in-plane wave fields, which share the treatment, are skipped)."""
    out = []
    for s in model.subsystems:
        t = _treatment(s)
        if t is None or getattr(s.props, "wave_type", None) in _IN_PLANE:
            continue
        area = float(getattr(s.props, "area", 0.0) or 0.0)
        out.append(
            TreatedSurface(
                s.name,
                str(t.description),
                area,
                float(t.added_mass_per_area) * area,
                float(t.trim_mass_per_area) * area,
                t.face,
                trim_resonance(t) if t.trim else None,
            )
        )
    return out


def total_added_mass(model: Model) -> float:
    """Added mass of every plate treatment of ``model`` [kg] (bonded layers and trims)."""
    return sum(t.added_kg for t in treated_surfaces(model))


def added_mass_table(model: Model) -> pd.DataFrame:
    """One row per treated plate: ``subsystem, treatment, area_m2, bonded_kg, trim_kg,
    added_kg, trim_resonance_hz``."""
    rows = [
        (t.subsystem, t.description, t.area_m2, t.bonded_kg, t.trim_kg, t.added_kg, t.resonance_hz)
        for t in treated_surfaces(model)
    ]
    cols = ["subsystem", "treatment", "area_m2", "bonded_kg", "trim_kg", "added_kg"]
    return pd.DataFrame(rows, columns=[*cols, "trim_resonance_hz"])
