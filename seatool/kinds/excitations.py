"""Excitation kinds: the key of an ``[excitations.NAME]`` table that says what is given.

Each kind converts its per-band values into an input power [W] or a prescribed (held)
energy [J]: ``derive(reader, subsystem, values, key_path, table)`` returns
``("power", W)`` or ``("prescribed", J)``, or None after reporting a problem. Level
references are those of :data:`seatool.levels.REFERENCE` (ISO 1683).
"""

from __future__ import annotations

from typing import Any

import numpy as np
import numpy.typing as npt

from .. import levels
from ..model import Subsystem
from ..physics import mobility as mob
from ..physics import plates
from ..physics.radiation import radiation_efficiency_band
from ..properties import BeamProps, PanelProps, is_flat_panel, takes_point_force
from .fields import bands_of
from .params import Kind, Param
from .plates import sandwich_critical_frequency
from .reader import Reader
from .validate import read_fluid

__all__ = ["EXCITATION_KINDS"]

Array = npt.NDArray[np.float64]

#: Keys every excitation table takes.
IMPLICIT = ("subsystem", "description")


def _need(rd: Reader, sub: Subsystem, path: str, quantity: str) -> bool:
    if sub.quantity != quantity:
        key = path.rsplit(".", 1)[-1]
        rd.error(
            path,
            f"{key} needs a subsystem whose level is {quantity.replace('_', ' ')}; "
            f"{sub.name!r} is a {sub.kind}",
        )
        return False
    return True


def _power(rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]) -> tuple[str, Array]:
    return "power", v


def _power_level(
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
) -> tuple[str, Array]:
    return "power", levels.REFERENCE["power"] * 10.0 ** (v / 10.0)


def _spl(
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
) -> tuple[str, Array] | None:
    if not _need(rd, sub, path, "sound_pressure"):
        return None
    assert sub.volume is not None and sub.density is not None and sub.sound_speed is not None
    p_sq = levels.REFERENCE["sound_pressure"] ** 2 * 10.0 ** (v / 10.0)
    return "prescribed", p_sq * sub.volume / (sub.density * sub.sound_speed**2)


def _velocity(
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
) -> tuple[str, Array] | None:
    if not _need(rd, sub, path, "velocity"):
        return None
    assert sub.mass is not None
    return "prescribed", sub.mass * levels.REFERENCE["velocity"] ** 2 * 10.0 ** (v / 10.0)


def _acceleration(
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
) -> tuple[str, Array] | None:
    if not _need(rd, sub, path, "velocity"):
        return None
    assert sub.mass is not None and rd.bands is not None
    a_sq = levels.REFERENCE["acceleration"] ** 2 * 10.0 ** (v / 10.0)
    return "prescribed", sub.mass * a_sq / rd.bands.omega**2


def _force(
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
) -> tuple[str, Array] | None:
    """Rms point force per band [N] -> P = F^2 Re(Y_infinite) (Cremer et al. 2005)."""
    p = sub.props
    b = bands_of(rd)
    ppath = path.rsplit(".", 1)[0] + ".position"
    pos = t.get("position", "interior")
    if not takes_point_force(sub):
        wave = getattr(p, "wave_type", None)
        what = f"of kind {sub.kind}" + (f" ({wave} field)" if wave else "")
        rd.error(
            path,
            f"a point force needs the bending field of a plate or the bending or longitudinal "
            f"field of a beam; {sub.name!r} is {what}",
        )
        return None
    if isinstance(p, PanelProps):
        if pos == "end":
            rd.error(ppath, "'end' is available for beams only")
            return None
        y: Any = mob.plate_point_mobility(p.bending_stiffness, p.mass_per_area)
        return "power", mob.point_force_power(v, np.broadcast_to(y, v.shape))
    assert isinstance(p, BeamProps)
    mat, sec = p.material, p.section
    if p.wave_type == "longitudinal":
        fn = mob.rod_end_mobility if pos == "end" else mob.rod_point_mobility
        y = fn(mat.youngs_modulus, mat.density, sec.area)
    else:
        i = sec.I_y if p.wave_type == "bending_y" else sec.I_z
        fb = mob.beam_end_mobility if pos == "end" else mob.beam_point_mobility
        y = fb(b.centre, mat.youngs_modulus, i, p.mass_per_length)
    return "power", mob.point_force_power(v, np.broadcast_to(y, v.shape))


def _diffuse(
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
) -> tuple[str, Array] | None:
    """Diffuse-field SPL on one face -> resonant input power by SEA reciprocity."""
    p = sub.props
    if not is_flat_panel(sub):
        rd.error(
            path,
            "a diffuse sound field acts on the bending field of a flat panel "
            f"(plate, orthotropic_plate, ribbed_plate, sandwich_panel); {sub.name!r} is of kind {sub.kind}",
        )
        return None
    assert isinstance(p, PanelProps)
    fpath = path.rsplit(".", 1)[0] + ".fluid"
    fluid = read_fluid(rd, t["fluid"], fpath) if "fluid" in t else p.fluid
    if fluid is None:
        return None
    c0 = fluid.sound_speed
    if p.section is not None:
        f_c = sandwich_critical_frequency(p.section, c0)
    else:
        f_c = float(plates.critical_frequency(p.bending_stiffness, p.mass_per_area, c0))
    b = bands_of(rd)
    sigma = radiation_efficiency_band(
        b.centre, p.lx, p.ly, f_c, f_lower=b.lower, f_upper=b.upper, c0=c0
    )
    p2 = levels.REFERENCE["sound_pressure"] ** 2 * 10.0 ** (v / 10.0)
    power = mob.diffuse_field_power_input(
        b.centre, p2, sigma, sub.modal_density, p.mass_per_area, c0
    )
    return "power", power


_DB = (-100.0, 300.0)  # levels [dB] beyond any physical sound or vibration (common practice)

#: The excitation kinds, by the key that states them (exactly one per excitation).
EXCITATION_KINDS: tuple[Kind, ...] = (
    Kind("excitation", "power", "Input power per band.", (
        Param("power", "spectrum", "W", "input power", strict=False, bounds=(0.0, 1e9)),
    ), _power, implicit=IMPLICIT),
    Kind("excitation", "sound_power_level", "Input sound power level per band.", (
        Param("sound_power_level", "spectrum", "dB re 1 pW", "sound power level", minimum=None, bounds=_DB),
    ), _power_level, implicit=IMPLICIT),
    Kind("excitation", "sound_pressure_level", "Measured sound pressure level: holds a cavity's level.", (
        Param("sound_pressure_level", "spectrum", "dB re 20 uPa", "sound pressure level", minimum=None, bounds=_DB),
    ), _spl, implicit=IMPLICIT),
    Kind("excitation", "velocity_level", "Measured velocity level: holds a structure's level.", (
        Param("velocity_level", "spectrum", "dB re 1e-9 m/s", "velocity level", minimum=None, bounds=_DB),
    ), _velocity, implicit=IMPLICIT),
    Kind("excitation", "acceleration_level", "Measured acceleration level: holds a structure's level.", (
        Param("acceleration_level", "spectrum", "dB re 1e-6 m/s^2", "acceleration level", minimum=None, bounds=_DB),
    ), _acceleration, implicit=IMPLICIT),
    Kind("excitation", "force", "Rms point force on a plate's bending field or a beam's bending or longitudinal field.", (
        Param("force", "spectrum", "N", "rms point force", strict=False, bounds=(0.0, 1e9)),
        Param("position", "choice", doc="where the force acts ('end': beams only)", choices=("interior", "end"), default="interior"),
    ), _force, implicit=IMPLICIT),
    Kind("excitation", "diffuse_sound_pressure_level", "Diffuse sound field on one face of a flat panel (resonant input power by SEA reciprocity).", (
        Param("diffuse_sound_pressure_level", "spectrum", "dB re 20 uPa", "sound pressure level of the diffuse field", minimum=None, bounds=_DB),
        Param("fluid", "string", doc="fluid of the incident field", default_doc="the panel's"),
    ), _diffuse, implicit=IMPLICIT),
)  # fmt: skip
