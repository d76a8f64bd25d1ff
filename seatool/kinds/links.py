"""What the connection kinds share: looking at their ends, fluids, the panel a path uses.

Every connection kind states each coupling loss factor in one direction only; the solver
derives the other by reciprocity (``n_a eta_ab = n_b eta_ba``). What an end *is* is
decided by the capability checks of :mod:`seatool.properties`.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
import numpy.typing as npt

from ..model import Subsystem
from ..physics import plates
from ..properties import CavityProps, PanelProps, radiates
from .reader import Reader

__all__ = [
    "BETWEEN",
    "cavity_pair_clf",
    "critical_frequency_per_band",
    "describe",
    "fluid_of",
    "need_two",
    "panel_of",
    "per_band",
    "shared_fluid",
    "treated",
    "treatment_factor",
    "volume_of",
]

Array = npt.NDArray[np.float64]

#: Keys every connection table takes (read by the section reader).
BETWEEN = ("kind", "description", "between")

#: Relative tolerance within which two fluids count as the same.
_SAME_FLUID = 1e-6


def per_band(value: Any, nb: int) -> Array:
    arr = np.asarray(value, dtype=float)
    return np.array(np.broadcast_to(arr, (nb,)), dtype=float)


def fluid_of(sub: Subsystem) -> tuple[float, float] | None:
    """``(density, sound_speed)`` of a cavity (its properties first, then attributes)."""
    if isinstance(sub.props, CavityProps):
        return float(sub.props.density), float(sub.props.sound_speed)
    if sub.density is None or sub.sound_speed is None:
        return None
    return float(sub.density), float(sub.sound_speed)


def volume_of(sub: Subsystem) -> float | None:
    if isinstance(sub.props, CavityProps):
        return float(sub.props.volume)
    return None if sub.volume is None else float(sub.volume)


def describe(sub: Subsystem) -> str:
    wt = getattr(sub.props, "wave_type", None)
    return f"{sub.name!r} ({sub.kind}" + (f", {wt} field)" if wt else ")")


def shared_fluid(
    rd: Reader, path: str, ends: list[Subsystem], what: str
) -> tuple[tuple[float, float], tuple[float, float]] | None:
    """The (density, sound speed) of two cavities, or None after one error if they differ."""
    f1, f2 = fluid_of(ends[0]), fluid_of(ends[1])
    assert f1 is not None and f2 is not None
    if not all(math.isclose(x, y, rel_tol=_SAME_FLUID) for x, y in zip(f1, f2, strict=True)):
        rd.error(
            f"{path}.between",
            f"cavities {ends[0].name!r} and {ends[1].name!r} hold different fluids; the "
            f"{what} assumes the same fluid on both sides",
        )
        return None
    return f1, f2


def need_two(rd: Reader, path: str, ends: list[Subsystem], what: str) -> bool:
    if len(ends) != 2:
        rd.error(f"{path}.between", f"a {what} joins two subsystems, got {len(ends)}")
        return False
    return True


def cavity_pair_clf(eta_12: Array, eta_21: Array, n_1: Array, n_2: Array) -> Array:
    """The CLF 1 -> 2 of a cavity-to-cavity path, independent of the stated direction.

    The diffuse-field relations (intensity ``c E/(4 V)`` on a wall) give ``eta_12`` from
    ``V_1`` and ``eta_21`` from ``V_2``; they obey ``n_1 eta_12 = n_2 eta_21`` exactly only
    with the volume term of the cavity modal density. With the surface and edge terms of
    the cavities' own ``n`` (which the solver uses for reciprocity) the two differ slightly,
    so the connection states the geometric mean ``sqrt(eta_12 eta_21 n_2 / n_1)``: the same
    model results whichever cavity is named first, and each physical value is recovered
    when the cavities' ``n/V`` are equal.

    References
    ----------
    .. [1] Lyon, R.H., DeJong, R.G. (1995). Theory and Application of Statistical Energy
       Analysis, 2nd ed., Butterworth-Heinemann (consistency relation n_1 eta_12 = n_2 eta_21;
       room-to-room coupling through a wall; from memory). The geometric mean is this
       project's choice to make the stated direction irrelevant.
    """
    return np.asarray(np.sqrt(eta_12 * eta_21 * n_2 / n_1), dtype=float)


def panel_of(rd: Reader, path: str, sub: Subsystem) -> PanelProps | None:
    """The bending-field properties a panel coupling needs, or None after one error."""
    if not radiates(sub):
        rd.error(
            path,
            f"{describe(sub)} is not the bending field of a plate or shell "
            "(use a plate or shell subsystem kind derived from dimensions)",
        )
        return None
    assert isinstance(sub.props, PanelProps)
    return sub.props


def critical_frequency_per_band(props: PanelProps, sound_speed: float, nb: int) -> Array:
    """Critical frequency of a panel in a fluid of the given sound speed, per band [Hz].

    Recomputed from the properties' ``bending_stiffness`` and ``mass_per_area`` with
    :func:`seatool.physics.plates.critical_frequency`, so it holds for the fluid on
    the radiating side even when that is not the panel's own fluid (for which the
    properties' ``critical_frequency`` was computed). A per-band (sandwich, effective)
    bending stiffness gives a per-band value: the coincidence ratio k_B/k_0 of that band.
    """
    d = per_band(props.bending_stiffness, nb)
    m = float(props.mass_per_area)
    return per_band(plates.critical_frequency(d, m, sound_speed), nb)


def treatment_factor(props: PanelProps, face: str | None, nb: int) -> Array:
    """Power factor ``10^(-IL/10)`` of a panel's treatment, per band (1 where none).

    ``props.treatment`` (if any) has ``insertion_loss_db`` (per band or None) and ``face``
    (the name of the subsystem its treated face looks into). With ``face=None`` the factor
    applies whatever face is treated (the non-resonant path crosses the whole build-up).
    Reducing a coupling loss factor by the trim's insertion loss is common practice in SEA
    trim modelling (the insertion loss is by definition the reduction of transmitted power
    caused by the layer); it assumes the trim changes the transmitted power but not the
    panel's modal energy.
    """
    t = props.treatment
    if t is None:
        return np.ones(nb)
    il = getattr(t, "insertion_loss_db", None)
    tface = getattr(t, "face", None)
    if il is None or (face is not None and tface != face):
        return np.ones(nb)
    return np.asarray(10.0 ** (-per_band(il, nb) / 10.0), dtype=float)


def treated(props: PanelProps, face: Subsystem | None) -> bool:
    t = props.treatment
    if t is None or getattr(t, "insertion_loss_db", None) is None:
        return False
    return face is None or getattr(t, "face", None) == face.name
