"""Excitation kinds: the key of an ``[excitations.NAME]`` table that says what is given.

Each kind converts its per-band values into an input power [W] or a prescribed (held)
energy [J]: ``derive(reader, subsystem, values, key_path, table)`` returns
``("power", W)`` or ``("prescribed", J)``, or None after reporting a problem. Level
references are those of :data:`seatool.levels.REFERENCE` (ISO 1683).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import Any

import numpy as np
import numpy.typing as npt

from .. import levels
from ..model import Connection, Subsystem
from ..physics import mobility as mob
from ..physics import plates, sandwich, transmission
from ..physics.radiation import radiation_efficiency_band
from ..properties import BeamProps, PanelProps, is_flat_panel, takes_point_force
from .fields import bands_of
from .links import treatment_factor
from .params import Kind, Param
from .reader import Reader
from .validate import read_fluid

__all__ = ["EXCITATION_KINDS", "NONRESONANT_SUFFIX", "diffuse_nonresonant"]

Array = npt.NDArray[np.float64]

#: Appended to a diffuse field's name for its non-resonant (mass-law) part.
NONRESONANT_SUFFIX = " (non-resonant)"

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
    return "power", levels.REFERENCE["power"] * levels.db_to_ratio(v)


def _spl(
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
) -> tuple[str, Array] | None:
    if not _need(rd, sub, path, "sound_pressure"):
        return None
    assert sub.volume is not None and sub.density is not None and sub.sound_speed is not None
    p_sq = levels.REFERENCE["sound_pressure"] ** 2 * levels.db_to_ratio(v)
    return "prescribed", p_sq * sub.volume / (sub.density * sub.sound_speed**2)


def _velocity(
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
) -> tuple[str, Array] | None:
    if not _need(rd, sub, path, "velocity"):
        return None
    assert sub.mass is not None
    return "prescribed", sub.mass * levels.REFERENCE["velocity"] ** 2 * levels.db_to_ratio(v)


def _acceleration(
    rd: Reader, sub: Subsystem, v: Array, path: str, t: dict[str, Any]
) -> tuple[str, Array] | None:
    if not _need(rd, sub, path, "velocity"):
        return None
    assert sub.mass is not None and rd.bands is not None
    a_sq = levels.REFERENCE["acceleration"] ** 2 * levels.db_to_ratio(v)
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


def _incident_fluid(
    rd: Reader, p: PanelProps, path: str, t: dict[str, Any]
) -> tuple[float, float, float] | None:
    """Density, sound speed of the incident field's fluid and the critical frequency in it."""
    fpath = path.rsplit(".", 1)[0] + ".fluid"
    fluid = read_fluid(rd, t["fluid"], fpath) if "fluid" in t else p.fluid
    if fluid is None:
        return None
    c0 = fluid.sound_speed
    if p.section is not None:
        f_c = sandwich.sandwich_critical_frequency(p.section, c0)
    else:
        f_c = float(plates.critical_frequency(p.bending_stiffness, p.mass_per_area, c0))
    return float(fluid.density), float(c0), float(f_c)


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
    got = _incident_fluid(rd, p, path, t)
    if got is None:
        return None
    _, c0, f_c = got
    b = bands_of(rd)
    sigma = radiation_efficiency_band(
        b.centre, p.lx, p.ly, f_c, f_lower=b.lower, f_upper=b.upper, c0=c0
    )
    p2 = levels.REFERENCE["sound_pressure"] ** 2 * levels.db_to_ratio(v)
    power = mob.diffuse_field_power_input(
        b.centre, p2, sigma, sub.modal_density, p.mass_per_area, c0
    )
    return "power", power


def diffuse_nonresonant(
    rd: Reader,
    sub: Subsystem,
    v: Array,
    path: str,
    t: dict[str, Any],
    subs: Mapping[str, Subsystem],
    connections: Sequence[Connection],
    declared_nonresonant: Sequence[tuple[str, str, tuple[str, ...]]],
) -> tuple[str, Array] | None:
    """The non-resonant (mass-law) part of a diffuse field on a panel face.

    Returns ``(receiver, power)``: the cavity on the panel's other side and the power the
    forced (non-resonant) wave carries into it, W = tau_NR S <p^2> / (4 rho c)
    (:func:`seatool.physics.mobility.diffuse_field_transmitted_power`) with tau_NR of
    :func:`seatool.physics.transmission.transmission_nonresonant` in the incident fluid
    (zero at and above coincidence, where the resonant path carries the transmission),
    reduced by the panel's treatment insertion loss if any (the forced wave crosses the
    whole build-up, as for the ``nonresonant`` connection). None when switched off
    (``nonresonant = false``), when no cavity is on the other side (a note), or after
    reporting a problem.

    The receiver is ``nonresonant_into`` if given, else the one cavity the panel radiates
    into (a ``radiation`` connection). A ``nonresonant`` connection through the same panel
    into the same receiver from a cavity models the same forced path from a source room:
    that is refused as declared twice.
    """
    if not t.get("nonresonant", True):
        return None
    p = sub.props
    assert isinstance(p, PanelProps)
    base = path.rsplit(".", 1)[0]
    partners = [
        c.b if c.a == sub.name else c.a
        for c in connections
        if c.kind == "radiation" and sub.name in (c.a, c.b)
    ]
    if "nonresonant_into" in t:
        recv = str(t["nonresonant_into"])
        if recv not in subs:
            return None  # an unknown name, already reported
        if recv not in partners:
            rd.error(
                f"{base}.nonresonant_into",
                f"{recv!r} is not on a face of {sub.name!r}: name a cavity or the exterior "
                f"that {sub.name!r} radiates into (a radiation connection); it radiates into "
                + (", ".join(repr(x) for x in partners) if partners else "nothing"),
            )
            return None
    else:
        cavities = [x for x in dict.fromkeys(partners) if not subs[x].sink]
        if len(cavities) > 1:
            rd.error(
                base,
                f"{sub.name!r} radiates into {', '.join(repr(x) for x in cavities)}; say which "
                "one is on the other side of the diffuse field with nonresonant_into = NAME "
                "(or nonresonant = false)",
            )
            return None
        if not cavities:
            rd.notes.append(
                f"{base}: {sub.name!r} radiates into no cavity, so the diffuse field's "
                "non-resonant (mass-law) transmission is not added; name the receiving "
                "space with nonresonant_into"
            )
            return None
        recv = cavities[0]
    for cname, through, between in declared_nonresonant:
        if through != sub.name or recv not in between:
            continue
        others = [x for x in between if x != recv]
        if any(x in subs and not subs[x].sink for x in others):
            rd.error(
                f"{base}.nonresonant",
                f"the non-resonant transmission through {sub.name!r} into {recv!r} is "
                f"declared twice: by this diffuse field and by connection {cname!r}; set "
                "nonresonant = false here or remove the connection",
            )
            return None
    got = _incident_fluid(rd, p, path, t)
    if got is None:
        return None
    rho0, c0, f_c = got
    b = bands_of(rd)
    tau = transmission.transmission_nonresonant(
        b.centre, p.mass_per_area, p.lx, p.ly, f_c, rho0=rho0, c0=c0
    )
    tau = tau * treatment_factor(p, None, len(b))
    p2 = levels.REFERENCE["sound_pressure"] ** 2 * levels.db_to_ratio(v)
    power = mob.diffuse_field_transmitted_power(p2, p.area, tau, rho0, c0)
    return recv, power


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
    Kind("excitation", "diffuse_sound_pressure_level", "Diffuse sound field on one face of a flat panel (resonant input power by SEA reciprocity, and the non-resonant transmission into the space on the other side).", (
        Param("diffuse_sound_pressure_level", "spectrum", "dB re 20 uPa", "sound pressure level of the diffuse field", minimum=None, bounds=_DB),
        Param("fluid", "string", doc="fluid of the incident field", default_doc="the panel's"),
        Param("nonresonant", "flag", doc="also add the non-resonant (mass-law) transmission through the panel into the space on its other side", default=True),
        Param("nonresonant_into", "subsystem", doc="the cavity (or exterior) on the panel's other side that receives the non-resonant transmission", default_doc="the one cavity the panel radiates into"),
    ), _diffuse, implicit=IMPLICIT),
)  # fmt: skip
