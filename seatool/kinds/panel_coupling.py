"""``seatool panel`` columns from the coupling physics: radiation efficiency and the
transmission loss a two-room SEA model of the panel predicts.

Importing this module appends :func:`coupling_columns` to
:data:`seatool.panel.PANEL_COLUMNS` and :func:`coupling_arguments` to
:data:`seatool.panel.PANEL_ARGUMENTS`.

The transmission loss is that of a laboratory-like test, computed with the model-file
machinery: a source room, the panel (``kind = "plate"``) and a receiving room
(``kind = "cavity"``), coupled by ``radiation`` on both faces and the
``nonresonant`` path through the panel (see :mod:`seatool.kinds.connections`), solved by
:func:`seatool.solve.solve`; then ``TL = L1 - L2 + 10 lg(S/A2)`` (ISO 10140-2 definition of
the sound reduction index from the level difference) with the receiving room's equivalent
absorption area ``A2 = 8 pi f eta_2 V_2 / c`` (Sabine's ``A = 24 ln(10) V/(c T)`` with the
decay time ``T = 6 ln(10)/(pi f eta)`` of a loss factor ``eta``).
"""

from __future__ import annotations

import argparse
from typing import Any

import numpy as np
import numpy.typing as npt

from .. import panel as _panel
from ..bands import BandAxis
from ..errors import InputError, Problem
from ..physics import radiation

__all__ = ["coupling_arguments", "coupling_columns", "two_room_model"]

Array = npt.NDArray[np.float64]

#: Default room volumes [m^3]: of the order of laboratory rooms (EN ISO 10140-5 asks for
#: at least 50 m^3, from memory), different so that their modes do not coincide.
DEFAULT_ROOM_VOLUMES = (60.0, 75.0)
#: Default reverberation time of both rooms [s] (common practice for test rooms).
DEFAULT_REVERBERATION_TIME = 1.5
#: Shape of the rooms: side ratios (product 1) of a shoebox, common practice.
_ROOM_RATIOS = (0.8, 1.0, 1.25)


def coupling_arguments(p: argparse.ArgumentParser) -> None:
    """Options of the two-room model (room volumes and reverberation time)."""
    p.add_argument(
        "--room-volumes",
        nargs=2,
        metavar=("V1", "V2"),
        default=None,
        help="volumes of the source and receiving rooms of the transmission-loss model "
        f"[m^3] (default {DEFAULT_ROOM_VOLUMES[0]:g} {DEFAULT_ROOM_VOLUMES[1]:g})",
    )
    p.add_argument(
        "--room-reverberation-time",
        metavar="S",
        default=None,
        help="reverberation time of both rooms [s] "
        f"(default {DEFAULT_REVERBERATION_TIME:g})",
    )


def _num(problems: list[Problem], value: Any, option: str) -> float | None:
    try:
        x = float(value)
    except (TypeError, ValueError):
        problems.append(Problem("", option, f"must be a number, got {value!r}"))
        return None
    if not np.isfinite(x) or x <= 0:
        problems.append(Problem("", option, f"must be a finite number > 0, got {value!r}"))
        return None
    return x


def _options(spec: _panel.PanelSpec) -> tuple[tuple[float, float], float]:
    problems: list[Problem] = []
    vols: tuple[float, float] = DEFAULT_ROOM_VOLUMES
    raw = spec.options.get("room_volumes")
    if raw is not None:
        got = []
        for v in raw:
            x = _num(problems, v, "--room-volumes")
            if x is not None:
                got.append(x)
        if len(got) == 2:
            vols = (got[0], got[1])
    t = DEFAULT_REVERBERATION_TIME
    raw_t = spec.options.get("room_reverberation_time")
    if raw_t is not None:
        x = _num(problems, raw_t, "--room-reverberation-time")
        if x is not None:
            t = x
    if problems:
        raise InputError(problems)
    return vols, t


def two_room_model(
    spec: _panel.PanelSpec,
    bands: BandAxis,
    volumes: tuple[float, float] = DEFAULT_ROOM_VOLUMES,
    reverberation_time: float = DEFAULT_REVERBERATION_TIME,
) -> Any:
    """The room-panel-room :class:`seatool.model.Model` of the panel (read from data).

    The laboratory arrangement of ISO 10140-2 (two diffuse rooms, the panel between them)
    as an SEA model: room damping from the reverberation time through the model file's
    ``reverberation_time`` damping form (eta = 2.2/(f T), common practice); rooms are
    shoeboxes of side ratios 0.8 : 1 : 1.25 for the modal density's surface and edge
    terms; the panel keeps the loss factor of ``spec``. References: ISO 10140-2:2021
    (sound reduction index from the level difference, TL = L1 - L2 + 10 lg(S/A2));
    Crocker & Price (1969), "Sound transmission using statistical energy analysis",
    JSV 9(3), 469-486 (the three-subsystem model; from memory).
    """
    from .. import modelfile

    rooms = {}
    for name, v in zip(("source_room", "receiving_room"), volumes, strict=True):
        side = v ** (1.0 / 3.0)
        rooms[name] = {
            "kind": "cavity",
            "fluid": "panel_fluid",
            "dimensions": [side * r for r in _ROOM_RATIOS],
            "damping": {"reverberation_time": reverberation_time},
        }
    mat = spec.material
    data = {
        "bands": {
            "kind": bands.kind,
            "lowest": float(bands.nominal[0]),
            "highest": float(bands.nominal[-1]),
        },
        "fluids": {
            "panel_fluid": {"density": spec.fluid.density, "sound_speed": spec.fluid.sound_speed}
        },
        "subsystems": {
            **rooms,
            "panel": {
                "kind": "plate",
                "material": {
                    "density": mat.density,
                    "youngs_modulus": mat.youngs_modulus,
                    "poisson_ratio": mat.poisson_ratio,
                },
                "thickness": spec.thickness,
                "lx": spec.lx,
                "ly": spec.ly,
                "fluid": "panel_fluid",
                "damping": spec.loss_factor,
            },
        },
        "connections": {
            "panel_source": {"kind": "radiation", "between": ["panel", "source_room"]},
            "panel_receiving": {"kind": "radiation", "between": ["panel", "receiving_room"]},
            "mass_law": {
                "kind": "nonresonant",
                "between": ["source_room", "receiving_room"],
                "through": "panel",
            },
        },
        "excitations": {"source": {"subsystem": "source_room", "power": 1e-3}},
    }
    return modelfile.build(data, file="<seatool panel two-room model>")


def coupling_columns(spec: _panel.PanelSpec, bands: BandAxis) -> dict[str, Array]:
    """``radiation_efficiency`` (band-averaged, Leppington) and ``transmission_loss_sea_dB``."""
    from ..solve import solve

    volumes, t60 = _options(spec)
    f = bands.centre
    sigma = radiation.radiation_efficiency_band(
        f,
        spec.lx,
        spec.ly,
        spec.critical_frequency,
        f_lower=bands.lower,
        f_upper=bands.upper,
        c0=spec.fluid.sound_speed,
    )
    model = two_room_model(spec, bands, volumes, t60)
    sol = solve(model)
    idx = model.index()
    s1, s2 = model.subsystem("source_room"), model.subsystem("receiving_room")
    assert s1.volume is not None and s2.volume is not None and s2.sound_speed is not None
    # <p^2> = rho c^2 E / V; rho c^2 is the same in both rooms and cancels
    p1 = sol.energy[idx["source_room"]] / s1.volume
    p2 = sol.energy[idx["receiving_room"]] / s2.volume
    a2 = 8.0 * np.pi * f * s2.damping * s2.volume / s2.sound_speed
    tl = 10.0 * np.log10(p1 / p2) + 10.0 * np.log10(spec.area / a2)
    return {
        "radiation_efficiency": np.asarray(sigma, dtype=float),
        "transmission_loss_sea_dB": np.asarray(tl, dtype=float),
    }


_panel.PANEL_COLUMNS.append(coupling_columns)
_panel.PANEL_ARGUMENTS.append(coupling_arguments)
