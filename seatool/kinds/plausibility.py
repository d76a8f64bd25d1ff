"""Plausibility warnings over a whole model: values inside the physical bounds but unusual.

The declarations warn about one value outside its typical range
(:func:`seatool.kinds.validate.check_value`); the checks here need what the kinds derived:

* a subsystem loss factor above :data:`HIGH_LOSS_FACTOR` in some band;
* the mean absorption coefficient a cavity's loss factor implies (Sabine's picture,
  :func:`seatool.physics.damping.absorption_area_from_loss_factor` over the boundary area)
  above 1 or below :data:`LOW_ALPHA`, with the implied reverberation time and coefficient
  per band;
* a line junction (seam) longer than the longest edge of a plate it joins;
* a trim whose insertion loss is negative in some band (the treatment raises that band).

Each warning is one line: file, key path, value, the usual range and why it matters. They
are never errors (``--strict`` on the command line turns them into errors).
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import numpy as np

from ..model import Subsystem
from ..physics import damping as dmp
from ..properties import CavityProps, PanelProps
from .reader import Reader

__all__ = ["HIGH_LOSS_FACTOR", "LOW_ALPHA", "check_model"]

#: Loss factor above which a subsystem is unusually damped (common practice: highly damped
#: polymers reach 0.1 .. 1; SEA's modal picture assumes light damping).
HIGH_LOSS_FACTOR = 0.5

#: Mean absorption coefficient below which a cavity is more reverberant than a
#: reverberation room (common practice: bare concrete and tiles absorb about 0.01 .. 0.02).
LOW_ALPHA = 0.01


def _bands_text(rd: Reader, idx: np.ndarray, parts: list[str]) -> str:
    assert rd.bands is not None
    shown = [f"{rd.bands.label(int(j))}: {p}" for j, p in zip(idx, parts, strict=True)]
    return "; ".join(shown)


def _component_path(s: Subsystem, key: str) -> str:
    return f"subsystems.{s.component or s.name}.{key}"


def _damping(rd: Reader, s: Subsystem) -> None:
    eta = np.asarray(s.damping, dtype=float)
    if eta.size and np.maximum.reduce(eta, axis=None) <= HIGH_LOSS_FACTOR:
        return  # the common case, one reduction
    high = np.flatnonzero(eta > HIGH_LOSS_FACTOR)
    if not high.size:
        return
    assert rd.bands is not None
    lo, hi = rd.bands.label(int(high[0])), rd.bands.label(int(high[-1]))
    where = lo if lo == hi else f"{lo} .. {hi}"
    rd.warn(
        _component_path(s, "damping"),
        f"loss factor {eta[high].max():.3g} of {s.name!r} is above {HIGH_LOSS_FACTOR:g} "
        f"({where}; common practice: even highly damped panels stay below): SEA assumes "
        "lightly damped modes, and such damping is more often a slip (a percentage typed as "
        "a fraction?)",
    )


def _cavity_absorption(rd: Reader, s: Subsystem) -> None:
    p = s.props
    if not isinstance(p, CavityProps) or not p.surface_area or not p.volume:
        return
    assert rd.bands is not None
    f = rd.bands.centre
    eta = np.asarray(s.damping, dtype=float)
    if not np.all(eta > 0):
        return  # no damping at all: the solver refuses it where it matters
    c = float(p.sound_speed)
    alpha = dmp.absorption_area_from_loss_factor(f, p.volume, eta, c0=c) / p.surface_area
    t60 = dmp.t60_from_loss_factor(f, eta, exact=True)
    for bad, what in ((alpha > 1.0, "above 1"), (alpha < LOW_ALPHA, f"below {LOW_ALPHA:g}")):
        idx = np.flatnonzero(bad)
        if not idx.size:
            continue
        per_band = _bands_text(
            rd, idx, [f"alpha {alpha[j]:.3g}, T60 {t60[j]:.3g} s" for j in idx]
        )
        why = (
            "no boundary absorbs more than it receives: the cavity is damped more than "
            "possible, its level too low"
            if what == "above 1"
            else "more reverberant than a bare reverberation room: the level may be too high"
        )
        rd.warn(
            _component_path(s, "damping"),
            f"the loss factor of {s.name!r} implies a mean absorption coefficient {what} "
            f"(Sabine, over its boundary of {p.surface_area:.3g} m^2) in "
            f"{idx.size} band(s): {per_band}; {why}",
        )


def _seams(rd: Reader, raw_connections: Any, subs: Mapping[str, Subsystem]) -> None:
    if not isinstance(raw_connections, dict):
        return
    for cname, t in raw_connections.items():
        if not isinstance(t, dict) or t.get("kind") != "line":
            continue
        length, between = t.get("length"), t.get("between")
        if not isinstance(length, int | float) or not isinstance(between, list):
            continue
        edges = {}
        for name in between:
            s = subs.get(name) if isinstance(name, str) else None
            if s is not None and isinstance(s.props, PanelProps):
                edges[name] = max(float(s.props.lx), float(s.props.ly))
        if not edges:
            continue
        name = min(edges, key=lambda n: edges[n])  # the plate with the shortest longest edge
        if float(length) > edges[name] * (1.0 + 1e-9):
            rd.warn(
                f"connections.{cname}.length",
                f"seam of {float(length):g} m is longer than the longest edge of "
                f"{name!r} ({edges[name]:g} m): the coupling grows with the seam's length, "
                "so the transmission is overstated (a length in millimetres, or several "
                "edges in one junction?)",
            )


def _treatments(rd: Reader, s: Subsystem) -> None:
    t = getattr(s.props, "treatment", None)
    il = getattr(t, "insertion_loss_db", None)
    if il is None:
        return
    il = np.asarray(il, dtype=float)
    idx = np.flatnonzero(il < 0.0)
    if not idx.size:
        return
    per_band = _bands_text(rd, idx, [f"{il[j]:+.1f} dB" for j in idx])
    rd.warn(
        _component_path(s, "treatment.trim"),
        f"the trim of {s.name!r} raises the transmitted sound in {idx.size} band(s) "
        f"(negative insertion loss: {per_band}); near the trim's mass-spring resonance a "
        "treatment can make a band worse: check it is intended",
    )


def check_model(rd: Reader, subs: Mapping[str, Subsystem], raw_connections: Any) -> None:
    """Add the model-wide plausibility warnings to ``rd.warnings``."""
    for s in subs.values():
        if s.sink:
            continue
        _damping(rd, s)
        _cavity_absorption(rd, s)
        if s.component in (None, "", s.name):
            _treatments(rd, s)
    _seams(rd, raw_connections, subs)
