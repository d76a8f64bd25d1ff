"""What a subsystem physically is: typed, frozen property records and capability checks.

A derived subsystem carries one of these records in :attr:`seatool.model.Subsystem.props`
(given-value subsystems carry none). They are the contract between the kinds that make
subsystems and the kinds that couple or excite them: every field has its unit in the
field metadata (``fields(PanelProps)[i].metadata["unit"]``); arrays have one value per
band. The capability checks at the end (:func:`is_flat_panel`, :func:`radiates`,
:func:`has_point_mobility`, :func:`is_cavity` ...) are the one place that decides what a
subsystem is; readers and reports ask them instead of comparing kind names.
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields
from typing import TYPE_CHECKING, Any

import numpy as np
import numpy.typing as npt

if TYPE_CHECKING:
    from .model import Subsystem

__all__ = [
    "BeamProps",
    "BeamSectionProps",
    "CavityProps",
    "DuctProps",
    "FluidProps",
    "MaterialProps",
    "PanelProps",
    "Lining",
    "Props",
    "ResonatorProps",
    "ShellProps",
    "WaveFieldProps",
    "has_point_mobility",
    "has_thin_plate_limit",
    "is_beam_field",
    "is_cavity",
    "is_curved",
    "is_flat_panel",
    "is_plate_field",
    "is_resonator",
    "is_sandwich",
    "radiates",
    "takes_point_force",
    "unit_of",
]

Array = npt.NDArray[np.float64]


def _q(unit: str, doc: str, **kw: Any) -> Any:
    """A field with its unit [SI] and a one-line meaning in the metadata."""
    return field(metadata={"unit": unit, "doc": doc}, **kw)


@dataclass(frozen=True, kw_only=True)
class MaterialProps:
    """An isotropic solid as used by a subsystem."""

    name: str = _q("", "material name (or a description of an inline or changed one)")
    density: float = _q("kg/m^3", "density")
    youngs_modulus: float = _q("Pa", "Young's modulus")
    poisson_ratio: float = _q("-", "Poisson's ratio")
    loss_factor: float | None = _q("-", "material loss factor (None if unknown)")
    source: str = _q("", "where the values come from")


@dataclass(frozen=True, kw_only=True)
class FluidProps:
    """A fluid (the one a panel radiates into, or a cavity holds)."""

    name: str = _q("", "fluid name")
    density: float = _q("kg/m^3", "density")
    sound_speed: float = _q("m/s", "speed of sound")


@dataclass(frozen=True)
class Lining:
    """A lined part of a cavity's boundary (for the added mass of the treatments)."""

    area: float = _q("m^2", "lined area")
    mass_per_area: float = _q("kg/m^2", "mass per area of the lining's layers")
    description: str = _q("", "what it is")
    #: The treated panel whose trim this lining is; its mass is counted on that panel.
    counted_on: str | None = _q("", "panel whose trim this is (mass counted there)", default=None)


@dataclass(frozen=True, kw_only=True)
class WaveFieldProps:
    """A wave field: its type and its per-band wave speeds."""

    wave_type: str = _q(
        "", "bending, longitudinal, shear, bending_y, bending_z, torsion or acoustic"
    )
    wavenumber: Array = _q("rad/m", "wavenumber per band")
    phase_speed: Array = _q("m/s", "phase speed per band")
    group_speed: Array = _q("m/s", "group speed per band")


@dataclass(frozen=True, kw_only=True)
class PanelProps(WaveFieldProps):
    """A wave field of a flat panel (plate, orthotropic, ribbed or sandwich panel)."""

    area: float = _q("m^2", "surface area of one face")
    lx: float = _q("m", "side length used for radiation")
    ly: float = _q("m", "side length used for radiation (lx ly = area)")
    perimeter: float = _q("m", "perimeter")
    thickness: float = _q("m", "total thickness")
    mass_per_area: float = _q("kg/m^2", "mass per area including bonded treatment mass")
    material: MaterialProps = _q("", "the (skin or face) material")
    fluid: FluidProps = _q("", "fluid for the critical frequency")
    bending_stiffness: float | Array = _q(
        "N m", "bending stiffness D (per band for a sandwich: effective)"
    )
    critical_frequency: float | None = _q(
        "Hz", "coincidence frequency in the panel's fluid (None for in-plane fields)"
    )
    critical_frequency_range: tuple[float, float] | None = _q(
        "Hz", "lowest and highest critical frequency of an orthotropic panel", default=None
    )
    bending_stiffness_x: float | None = _q("N m", "orthotropic D_x", default=None)
    bending_stiffness_y: float | None = _q("N m", "orthotropic D_y", default=None)
    rib_spacing: float | None = _q("m", "rib spacing of a ribbed plate", default=None)
    bay_frequency: float | None = _q("Hz", "first mode of a bay between ribs", default=None)
    section: Any = _q("", "sandwich section (SandwichSection) or None", default=None)
    core_thickness: float | None = _q("m", "sandwich core thickness", default=None)
    face_thickness: float | None = _q("m", "sandwich face thickness", default=None)
    treatment: Any = _q("", "the plate treatment read from the model file, or None", default=None)


@dataclass(frozen=True, kw_only=True)
class ShellProps(PanelProps):
    """A wave field of a cylindrical shell or curved panel (lx axial, ly developed arc)."""

    radius: float = _q("m", "radius of curvature")
    ring_frequency: float = _q("Hz", "ring frequency c_L / (2 pi a)")
    closed: bool = _q("", "True for a closed cylinder")


@dataclass(frozen=True, kw_only=True)
class BeamSectionProps:
    """Cross-section of a beam."""

    area: float = _q("m^2", "cross-section area")
    I_y: float = _q("m^4", "second moment of area for bending_y")
    I_z: float = _q("m^4", "second moment of area for bending_z")
    J: float = _q("m^4", "torsion constant")
    I_p: float = _q("m^4", "polar moment of area")


@dataclass(frozen=True, kw_only=True)
class BeamProps(WaveFieldProps):
    """A wave field of a beam."""

    length: float = _q("m", "length")
    mass_per_length: float = _q("kg/m", "mass per length")
    section: BeamSectionProps = _q("", "cross-section")
    material: MaterialProps = _q("", "material")


@dataclass(frozen=True, kw_only=True)
class CavityProps(WaveFieldProps):
    """An acoustic cavity."""

    density: float = _q("kg/m^3", "fluid density")
    sound_speed: float = _q("m/s", "fluid sound speed")
    fluid: FluidProps = _q("", "the fluid")
    volume: float = _q("m^3", "volume")
    surface_area: float | None = _q("m^2", "boundary area (None if not given)", default=None)
    edge_length: float | None = _q("m", "total edge length (None if not given)", default=None)
    dimensions: tuple[float, float, float] | None = _q("m", "box sides, if given", default=None)
    linings: tuple[Lining, ...] = _q("", "lined surfaces (damping surfaces, facing trims)", default=())


@dataclass(frozen=True, kw_only=True)
class DuctProps(CavityProps):
    """A one-dimensional acoustic duct."""

    length: float = _q("m", "length")
    section_area: float = _q("m^2", "cross-section area")
    mass_per_length: float = _q("kg/m", "fluid mass per length")
    cut_on_frequency: float = _q("Hz", "first cross-mode cut-on frequency")


@dataclass(frozen=True, kw_only=True)
class ResonatorProps:
    """A single-degree-of-freedom resonator (mass on a spring)."""

    wave_type: str = _q("", "always 'resonator'", default="resonator")
    mass: float = _q("kg", "moving mass")
    stiffness: float = _q("N/m", "spring stiffness")
    natural_frequency: float = _q("Hz", "natural frequency")
    loss_factor: float = _q("-", "loss factor")


Props = PanelProps | BeamProps | CavityProps | ResonatorProps


def unit_of(cls: type, name: str) -> str:
    """The unit of field ``name`` of a property record class."""
    for f in fields(cls):
        if f.name == name:
            return str(f.metadata.get("unit", ""))
    raise KeyError(name)


# -- capability checks (the one place that decides what a subsystem is) ----------------------


def is_plate_field(sub: Subsystem) -> bool:
    """Any wave field of a flat panel or shell (bending or in-plane)."""
    return isinstance(sub.props, PanelProps)


def radiates(sub: Subsystem) -> bool:
    """The bending field of a flat panel or shell: it couples to a fluid by radiation."""
    return isinstance(sub.props, PanelProps) and sub.props.wave_type == "bending"


def is_flat_panel(sub: Subsystem) -> bool:
    """The bending field of a flat panel (plate, orthotropic, ribbed or sandwich)."""
    return radiates(sub) and not isinstance(sub.props, ShellProps)


def is_curved(sub: Subsystem) -> bool:
    """The bending field of a cylindrical shell or curved panel."""
    return radiates(sub) and isinstance(sub.props, ShellProps)


def is_sandwich(sub: Subsystem) -> bool:
    """A sandwich panel field (its bending stiffness is per band)."""
    return isinstance(sub.props, PanelProps) and sub.props.section is not None


def is_beam_field(sub: Subsystem) -> bool:
    """Any wave field of a beam."""
    return isinstance(sub.props, BeamProps)


def is_resonator(sub: Subsystem) -> bool:
    """A single-degree-of-freedom resonator."""
    return isinstance(sub.props, ResonatorProps)


def is_cavity(sub: Subsystem) -> bool:
    """An acoustic cavity or duct with a volume and a fluid (not the exterior sink)."""
    return (
        not sub.sink
        and sub.quantity == "sound_pressure"
        and (isinstance(sub.props, CavityProps) or sub.volume is not None)
        and (isinstance(sub.props, CavityProps) or sub.density is not None)
        and (isinstance(sub.props, CavityProps) or sub.sound_speed is not None)
    )


def has_point_mobility(sub: Subsystem) -> bool:
    """A drive-point force mobility is known: a panel's bending field or a beam's bending
    or longitudinal field."""
    if radiates(sub):
        return True
    return is_beam_field(sub) and sub.props.wave_type in (  # type: ignore[union-attr]
        "bending_y",
        "bending_z",
        "longitudinal",
    )


def takes_point_force(sub: Subsystem) -> bool:
    """A point force excitation is modelled: the bending field of a homogeneous, orthotropic
    or ribbed flat panel (not a sandwich or shell), or a beam's bending or longitudinal field."""
    if is_flat_panel(sub) and not is_sandwich(sub):
        return True
    return has_point_mobility(sub) and is_beam_field(sub)


def has_thin_plate_limit(sub: Subsystem) -> bool:
    """Bending field of a homogeneous-skin plate or shell (the thin-plate frequency limit applies)."""
    return radiates(sub) and not is_sandwich(sub)
