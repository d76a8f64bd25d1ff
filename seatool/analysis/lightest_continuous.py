"""The lightest treatment over continuous parameters (e.g. a damping-layer thickness).

Minimises the added mass of the plate treatments over parameters named by key path, each
within bounds, subject to every margin of the targets being >= 0, with SLSQP
(:func:`scipy.optimize.minimize`). The margins' gradients come from the adjoint band-level
sensitivities (:func:`seatool.analysis.sensitivity.parameter_sensitivities`) chained
through each metric's gradient; the mass gradient is a central difference of the model
building (mass is linear in a layer thickness). The answer is a local optimum: run the
discrete search (:mod:`seatool.analysis.lightest`) for choices between build-ups, and this
for the thickness of a chosen one.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt
from scipy.optimize import minimize

from ..errors import InputError, Problem
from ..metrics import METRICS
from ..modelfile import build
from ..results import Result
from ..solve import solve as core_solve
from ._keypath import resolve, with_value
from .sensitivity import parameter_sensitivities
from .targets import margin_table
from .treatment_mass import total_added_mass

__all__ = ["Bounded", "ContinuousAnswer", "lightest_continuous"]

Array = npt.NDArray[np.float64]

#: A margin above -this [dB] counts as met (the optimum sits on the active limit).
MARGIN_TOLERANCE = 1e-6


@dataclass(frozen=True)
class Bounded:
    """A number of the model file (key path) free within [low, high] (low > 0)."""

    path: str
    low: float
    high: float


@dataclass(frozen=True)
class ContinuousAnswer:
    """Values found (key path -> value), added mass [kg], the solved model, the verdicts,
    whether every target is met, and the optimiser's message."""

    values: dict[str, float]
    mass_kg: float
    result: Result
    met: bool
    message: str


def lightest_continuous(
    data: Mapping[str, Any],
    params: Sequence[Bounded],
    *,
    file: str = "<data>",
    base_dir: str | Path = ".",
    field: str = "diffuse",
    start: Sequence[float] | None = None,
) -> ContinuousAnswer:
    """Least added mass over ``params`` with every target met (local, gradient-based)."""
    problems = []
    for p in params:
        _, msg = resolve(data, p.path)
        if msg is not None:
            problems.append(Problem(file, p.path, msg))
        elif not 0 < p.low < p.high:
            problems.append(
                Problem(file, p.path, f"bounds must satisfy 0 < low < high, got {p.low}, {p.high}")
            )
    if problems:
        raise InputError(problems)
    paths = [p.path for p in params]
    lo = np.array([p.low for p in params])
    hi = np.array([p.high for p in params])

    def data_at(x: Array) -> dict[str, Any]:
        d: dict[str, Any] = dict(data)
        for path, v in zip(paths, x, strict=True):
            d = with_value(d, path, lambda _old, v=v: np.asarray(v))  # type: ignore[misc]
        return d

    base = build(data, file=file, base_dir=base_dir)
    targets = list(base.targets)
    if not targets:
        raise InputError([Problem(file, "targets", "no [targets.NAME] to meet")])
    cache: dict[bytes, tuple[Array, Array]] = {}

    def margins(x: Array) -> tuple[Array, Array]:
        key = np.asarray(x, dtype=float).tobytes()
        if key in cache:
            return cache[key]
        d = data_at(x)
        m = build(d, file=file, base_dir=base_dir)
        res = Result(m, core_solve(m))
        lv_all = res.level_array()[0]
        recs = list(dict.fromkeys(t.receiver for t in targets))
        sens = parameter_sensitivities(d, recs, paths, file=file, base_dir=base_dir, model=m)
        nb = len(m.bands)
        vals: list[float] = []
        jac: list[Array] = []
        for t in targets:
            lv = lv_all[m.index()[t.receiver]]
            s = sens[sens["receiver"] == t.receiver]
            # dL_k / dp_j (B, P) from dL/d ln p / p
            dldp = np.column_stack(
                [s[s["parameter"] == path]["dL_dlnx_dB"].to_numpy() / xj for path, xj in zip(paths, x, strict=True)]
            )  # fmt: skip
            for name, limit in t.limits.items():
                mv = METRICS[name](lv, m.bands, field=field)
                vals.append(float(limit) - float(mv.value))
                jac.append(-(np.asarray(mv.gradient) @ dldp))
            if t.band_limit is not None:
                for k in range(nb):
                    vals.append(float(t.band_limit[k] - lv[k]))
                    jac.append(-dldp[k])
        out = (np.array(vals), np.vstack(jac))
        cache[key] = out
        return out

    def mass(x: Array) -> tuple[float, Array]:
        m0 = total_added_mass(build(data_at(x), file=file, base_dir=base_dir))
        g = np.zeros(len(x))
        for j in range(len(x)):
            h = 1e-6 * max(abs(x[j]), 1e-12)
            xp, xm = np.array(x, dtype=float), np.array(x, dtype=float)
            xp[j] += h
            xm[j] -= h
            mp = total_added_mass(build(data_at(xp), file=file, base_dir=base_dir))
            mm = total_added_mass(build(data_at(xm), file=file, base_dir=base_dir))
            g[j] = (mp - mm) / (2 * h)
        return m0, g

    # optimise over u in [0, 1]^P, x = lo + u (hi - lo), so that the scales are comparable
    span = hi - lo

    def to_x(u: Array) -> Array:
        return lo + np.clip(np.asarray(u, dtype=float), 0.0, 1.0) * span

    def f(u: Array) -> tuple[float, Array]:
        m0, g = mass(to_x(u))
        return m0, g * span

    x0 = np.asarray(start, dtype=float) if start is not None else hi.copy()
    sol = minimize(
        f,
        (x0 - lo) / span,
        jac=True,
        method="SLSQP",
        bounds=[(0.0, 1.0)] * len(params),
        constraints=[
            {
                "type": "ineq",
                "fun": lambda u: margins(to_x(u))[0],
                "jac": lambda u: margins(to_x(u))[1] * span[None, :],
            }
        ],
        options={"ftol": 1e-10, "maxiter": 100},
    )
    sol_x = to_x(sol.x)
    x = np.clip(sol_x, lo, hi)
    model = build(data_at(x), file=file, base_dir=base_dir)
    result = Result(model, core_solve(model))
    met = bool((margin_table(result, field=field)["margin"] >= -MARGIN_TOLERANCE).all())
    return ContinuousAnswer(
        dict(zip(paths, (float(v) for v in x), strict=True)),
        total_added_mass(model),
        result,
        met,
        str(sol.message),
    )
