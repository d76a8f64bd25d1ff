"""Convergence study of the quadratures a model load runs, on every shipped model.

For each quadrature on the path from a model file to its couplings, the node count is set
to a trial value and every shipped model (``models/*.toml``) is loaded and solved again
from an empty memo; every coupling loss factor and every band energy is compared with a
reference computed at a much larger count. The quadratures:

* ``line``: Gauss-Legendre nodes per sub-interval (between cut-offs) of the diffuse-field
  average of line-junction transmission
  (:func:`seatool.physics.junction_waves.diffuse_transmission_many`; rigid and resilient
  lines); current count 48.
* ``angle`` / ``wavenumber``: nodes per angular and per wavenumber sub-interval of the
  curved-panel radiation efficiency
  (:func:`seatool.physics.radiation_curved.radiation_efficiency_curved_panel`); current
  24 and 12.
* ``flat``: nodes per half band of the flat-panel band-averaged radiation efficiency
  (:func:`seatool.physics.radiation.radiation_efficiency_band`, for radiation couplings and
  diffuse-field excitations); current 48.
* ``shell``: nodes per half band of the band-averaged shell modal density
  (``seatool.kinds.shells._SHELL_NODES``); current 24.

A relative difference is ``|x - x_ref| / max(|x_ref|, 1e-12 max_band)``, where
``max_band`` is the largest coupling loss factor of the model in that band (couplings
that are zero in exact arithmetic, about 1e-33, are not compared relatively). Printed: the
largest over the model, with the coupling or energy where it occurs.

``--peak`` adds the reason the line-junction rule converges slowly and what would resolve
it, on the rail cab's floor-wall junction (6 mm and 3 mm steel at 90 deg): the
transmitted bending power has a sharp peak just above the last in-plane cut-off. Printed
per band: the peak's position and half-width (from a parabola through 1/tau, which is
quadratic near a simple pole), the error of the current rule, and of a trial rule (not
used by seatool) with the peak as an extra break, ``s = s_p + d tan(t)`` on
``s_p -+ 20 d`` and the usual end-clustered rule elsewhere, each against
``scipy.integrate.quad`` (adaptive, relative tolerance 1e-12).

Run: ``python benchmarks/study_quadrature.py [--which line angle wavenumber flat shell]
[--peak]``.
"""

from __future__ import annotations

import argparse
import math
import sys
from collections.abc import Callable
from pathlib import Path
from typing import Any

import numpy as np
from scipy import integrate

from seatool import modelfile
from seatool.kinds import excitations as kind_excitations
from seatool.kinds import shells as kind_shells
from seatool.physics import junction_waves, junctions, memo, radiation, radiation_curved
from seatool.physics.quadrature import gauss_legendre
from seatool.solve import solve

MODELS = Path(__file__).resolve().parent.parent / "models"

#: Current count, trial counts and the reference count of each quadrature.
STUDY: dict[str, tuple[int, tuple[int, ...], int]] = {
    "line": (48, (8, 12, 16, 24, 32, 64, 96), 192),
    "angle": (24, (8, 12, 16, 32, 48), 96),
    "wavenumber": (12, (4, 6, 8, 16, 24), 48),
    "flat": (48, (8, 12, 16, 24, 32), 192),
    "shell": (24, (8, 12, 16, 32, 48), 96),
}

_COUNTS: dict[str, int] = {}
_ORIG_LINE = junction_waves.diffuse_transmission_many
_ORIG_CURVED = radiation_curved.radiation_efficiency_curved_panel
_ORIG_FLAT = radiation.radiation_efficiency_band
_ORIG_SHELL = kind_shells._SHELL_NODES


def _line(*args: Any, **kw: Any) -> Any:
    if "line" in _COUNTS:
        kw["n_points"] = _COUNTS["line"]
    return _ORIG_LINE(*args, **kw)


def _curved(*args: Any, **kw: Any) -> Any:
    if "angle" in _COUNTS:
        kw["n_angle"] = _COUNTS["angle"]
    if "wavenumber" in _COUNTS:
        kw["n_wavenumber"] = _COUNTS["wavenumber"]
    return _ORIG_CURVED(*args, **kw)


def _flat(*args: Any, **kw: Any) -> Any:
    if "flat" in _COUNTS:
        kw["n_points"] = _COUNTS["flat"]
    return _ORIG_FLAT(*args, **kw)


def install() -> None:
    """Route the studied functions through the count overrides (this process only)."""
    junction_waves.diffuse_transmission_many = _line  # type: ignore[assignment]
    radiation_curved.radiation_efficiency_curved_panel = _curved  # type: ignore[assignment]
    radiation.radiation_efficiency_band = _flat  # type: ignore[assignment]
    kind_excitations.radiation_efficiency_band = _flat  # type: ignore[assignment]


Result = tuple[dict[str, np.ndarray], np.ndarray, list[str]]


def results(path: Path, counts: dict[str, int]) -> Result:
    """Coupling loss factors (by connection) and energies (N, B) of a model at ``counts``."""
    _COUNTS.clear()
    _COUNTS.update(counts)
    kind_shells._SHELL_NODES = counts.get("shell", _ORIG_SHELL)
    memo.clear()
    try:
        model = modelfile.load(path)
        sol = solve(model)
    finally:
        kind_shells._SHELL_NODES = _ORIG_SHELL
        _COUNTS.clear()
    clf = {c.name: np.asarray(c.coupling_loss_factor, dtype=float) for c in model.connections}
    return clf, np.asarray(sol.energy), [s.name for s in model.subsystems]


def worst(res: Result, ref: Result) -> tuple[float, str, float, str]:
    """Largest relative difference of the CLFs and of the energies, and where."""
    clf, e, names = res
    clf0, e0, _ = ref
    scale = np.max(np.abs(np.stack(list(clf0.values()))), axis=0) if clf0 else 0.0
    c_err, c_at = 0.0, "-"
    for k, v0 in clf0.items():
        d = np.abs(clf[k] - v0) / np.maximum(np.abs(v0), 1e-12 * scale + 1e-300)
        if d.max() > c_err:
            c_err, c_at = float(d.max()), k
    d = np.abs(e - e0) / np.maximum(np.abs(e0), 1e-300)
    i = int(np.argmax(d.max(axis=1)))
    return c_err, c_at, float(d.max()), names[i]


def study(which: str, models: list[Path], out: Callable[[str], None] = print) -> None:
    current, trials, reference = STUDY[which]
    out(f"\n{which}: current {current}, reference {reference}")
    out("| model | nodes | CLF max rel. diff. | where | energy max rel. diff. | where |")
    out("|---|---:|---:|---|---:|---|")
    for path in models:
        ref = results(path, {which: reference})
        for n in sorted({*trials, current}):
            c_err, c_at, e_err, e_at = worst(results(path, {which: n}), ref)
            mark = " (current)" if n == current else ""
            out(f"| {path.stem} | {n}{mark} | {c_err:.1e} | {c_at} | {e_err:.1e} | {e_at} |")


def _floor_wall() -> list[junctions.JunctionPlate]:
    e, rho, nu = 2.1e11, 7850.0, 0.30  # steel as in seatool/data/materials.csv
    return [
        junctions.JunctionPlate(0.006, e, rho, nu, 0.0),
        junctions.JunctionPlate(0.003, e, rho, nu, 0.5 * math.pi),
    ]


def _rule(kind: str, a: float, b: float, n: int, c: float = 0.0, d: float = 1.0) -> Any:
    """Nodes and weights on [a, b]: end-clustered ("cos") or peak-centred ("tan")."""
    x, w = gauss_legendre(n)
    if kind == "cos":
        u = 0.5 * np.pi * (x + 1.0)
        return a + (b - a) * (1.0 - np.cos(u)) / 2.0, w * (b - a) / 2.0 * np.sin(u) * np.pi / 2.0
    ta, tb = math.atan((a - c) / d), math.atan((b - c) / d)
    t = ta + (tb - ta) * (x + 1.0) / 2.0
    return c + d * np.tan(t), w * (tb - ta) / 2.0 * d / np.cos(t) ** 2


def peak_study(out: Callable[[str], None] = print) -> None:
    plates = _floor_wall()

    def tau(f: float, s: Any) -> Any:
        th = np.arcsin(np.clip(s, 0.0, 1.0))
        return junctions.line_junction_transmission(f, th, plates)[..., 1, 0]

    out("\nfloor-wall junction, transmitted bending wave: peak, and errors against quad")
    out("| f [Hz] | s_S | peak s_p | half-width d | 48 nodes (current) | trial 16 | 24 | 32 |")
    out("|---:|---:|---:|---:|---:|---:|---:|---:|")
    for f in (158.0, 501.0, 1995.0):
        k = [junctions.wavenumbers(f, p) for p in plates]
        k_in = k[0][0]
        cuts = sorted({float(x / k_in) for kk in k for x in kk if x < k_in})
        pts = [0.0, *cuts, 1.0]
        ref = sum(
            integrate.quad(
                lambda x, f=f: float(tau(f, x)), a, b, limit=2000, epsabs=0.0, epsrel=1e-12
            )[0]
            for a, b in zip(pts[:-1], pts[1:], strict=False)
        )
        cur = junctions.line_junction_transmission_diffuse(f, plates)[1, 0]
        s_s = cuts[-1]
        grid = np.linspace(s_s * 1.0001, min(1.0, s_s * 1.2), 400)
        i = int(np.argmax(tau(f, grid)))
        fine = np.linspace(grid[max(i - 2, 0)], grid[min(i + 2, grid.size - 1)], 400)
        tf = tau(f, fine)
        j = int(np.argmax(tf))
        h = fine[1] - fine[0]
        y = 1.0 / tf[j - 1 : j + 2]
        c2 = (y[0] - 2.0 * y[1] + y[2]) / (2.0 * h * h)
        c1 = (y[2] - y[0]) / (2.0 * h)
        sp = float(fine[j] - c1 / (2.0 * c2))
        d = math.sqrt((y[1] - c1**2 / (4.0 * c2)) / c2)
        errs = []
        for n in (16, 24, 32):
            total = 0.0
            for a, b in zip(pts[:-1], pts[1:], strict=False):
                if a < sp < b:
                    m = min(20.0 * d, 0.5 * (sp - a), 0.5 * (b - sp))
                    pieces = [("cos", a, sp - m), ("tan", sp - m, sp + m), ("cos", sp + m, b)]
                else:
                    pieces = [("cos", a, b)]
                for kind, lo, hi in pieces:
                    x, w = _rule(kind, lo, hi, n, sp, d)
                    total += float((w * tau(f, x)).sum())
            errs.append(f"{abs(total / ref - 1.0):.1e}")
        out(
            f"| {f:.0f} | {s_s:.5f} | {sp:.5f} | {d:.1e} | {abs(cur / ref - 1.0):.1e} | "
            + " | ".join(errs)
            + " |"
        )


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--which", nargs="+", choices=sorted(STUDY), default=sorted(STUDY))
    ap.add_argument("--models", nargs="*", default=None, help="model stems (default: all)")
    ap.add_argument("--peak", action="store_true", help="the line-junction peak and a trial rule")
    args = ap.parse_args()
    models = sorted(MODELS.glob("*.toml"))
    if args.models:
        models = [p for p in models if p.stem in args.models]
    if args.peak:
        peak_study()
    install()
    for which in args.which:
        study(which, models)
        sys.stdout.flush()


if __name__ == "__main__":
    main()
