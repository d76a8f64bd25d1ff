"""Plain-text summary of a model (what ``seatool check`` prints).

Reads a model only: title, bands, every subsystem with its size, modal density and loss
factor, connections, excitations, treatments and linings (with their masses), notes and
the SEA validity table (:func:`seatool.validity_report.check_table`).
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

from .kinds.plate_treatment import summary_lines
from .model import Model
from .validity_report import check_table

__all__ = ["model_summary"]


def _range(a: npt.ArrayLike) -> str:
    lo, hi = float(np.min(a)), float(np.max(a))
    # relative comparison only: np.isclose's absolute tolerance (1e-8) would call any two
    # loss factors below 1e-8 equal
    same = np.isclose(lo, hi, rtol=1e-5, atol=0.0)
    return f"{lo:.3g}" if same else f"{lo:.3g} .. {hi:.3g}"


def model_summary(model: Model) -> str:
    """Plain-text summary of ``model`` with its SEA validity table (no solve)."""
    b = model.bands
    out = [
        f"model: {model.title or '(untitled)'}  [{model.source}]",
        f"bands: {len(b)} {b.spacing} bands, {b.label(0)} - {b.label(-1)}",
        f"subsystems ({len(model.subsystems)}):",
    ]
    w = max(len(s.name) for s in model.subsystems)
    for s in model.subsystems:
        if s.sink:
            out.append(f"  {s.name:<{w}}  {s.kind:<10}  free-field sink")
            continue
        size = (
            f"V = {s.volume:g} m^3"
            if s.volume is not None
            else (f"M = {s.mass:g} kg" if s.mass is not None else "")
        )
        out.append(
            f"  {s.name:<{w}}  {s.kind:<10}  {size:<14}  n(f) = {_range(s.modal_density)} modes/Hz"
            f"  eta = {_range(s.damping)}"
        )
    out.append(f"connections ({len(model.connections)}):")
    for c in model.connections:
        out.append(f"  {c.name}: {c.a} -> {c.b} ({c.kind}), eta = {_range(c.coupling_loss_factor)}")
    out.append(f"excitations ({len(model.excitations)}):")
    overall = 0.0
    for e in model.excitations:
        if e.drive == "power":
            assert e.power is not None
            total = float(np.sum(e.power))
            overall += total
            given = f" from {e.quantity}" if e.quantity not in (None, "power") else ""
            out.append(
                f"  {e.name}: input power into {e.subsystem}{given}, total {total:.3g} W over "
                "the bands"
            )
        else:
            assert e.level is not None
            out.append(f"  {e.name}: {e.subsystem} held at {e.quantity} {_range(e.level)} dB")
    if any(e.drive == "power" for e in model.excitations):
        out.append(f"  total input power of the sources: {overall:.3g} W")
    out.extend(summary_lines(model))  # treated plates, linings (mass per area)
    for note in model.notes:
        out.append(f"note: {note}")
    out.append(check_table(model))
    return "\n".join(out)
