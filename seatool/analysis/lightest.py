"""The lightest treatment: the combination of candidate treatments that meets every target
at the least added mass (or cost).

The user lists, per surface, candidate options; each option is a set of changes to the
model file's data by key path (as a design variant: e.g. ``subsystems.floor.treatment`` =
a table, or None for no treatment). The search:

1. Builds the base model and, once per option, the base with that option alone; an
   option's effect is the difference of the assembled source arrays (damping and modal
   densities of the subsystems, stated coupling loss factors, input powers) and of the
   level offsets of the receivers. Options of different surfaces combine by adding their
   differences to the base arrays, which is exact when they change different entries (a
   plate's treatment changes its own damping, modal density and couplings) and for
   damping contributions that add (absorption of one cavity). The answer is verified by
   rebuilding and solving the chosen combination in full.
2. Evaluates combinations exactly (batched dense solves of the power balance of every
   combination, all bands): every combination when there are at most
   ``exhaustive_limit``; otherwise by branch and bound
   (:mod:`seatool.analysis.lightest_bound`): a node fixes some surfaces' options, and a
   proven lower bound of the receivers' band levels over all its completions (interval
   M-matrix bound: Berman & Plemmons 1994, ch. 6) drops the nodes that cannot meet every
   target; best-first in the objective, so the first combination met is the lightest of
   all. When nothing meets, a second branch and bound on the same bound finds the best
   achievable smallest margin (proven, or bracketed after ``max_nodes`` bounded nodes)
   instead of solving every combination. See docs/theory/lightest.md.

The objective is the added mass of the plate treatments
(:func:`seatool.analysis.treatment_mass.total_added_mass`) or, with ``objective='cost'``,
the sum of the options' ``cost`` (given per option, or ``cost_per_kg`` times the option's
added mass).
"""

from __future__ import annotations

import sys
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Literal

import numpy as np
import numpy.typing as npt
import pandas as pd
from tqdm import tqdm

from ..errors import InputError, Problem
from ..kinds.excitations import NONRESONANT_SUFFIX
from ..levels import db
from ..model import Model, Target
from ..modelfile import build
from ..results import Result
from ..solve import assemble
from ..solve import solve as core_solve
from ._system import level_offset
from .lightest_bound import LevelFloor, best_margin_search, lightest_search
from .lightest_joint import JOINT_LIMIT, shared_damping, shared_tables, subsystem_refs
from .targets import margin_table, margins_of_levels, verdicts
from .treatment_mass import total_added_mass
from .uncertainty import _batched_dense
from .variants import apply_changes

__all__ = ["Lightest", "Option", "Surface", "lightest_treatment"]

Array = npt.NDArray[np.float64]


@dataclass(frozen=True)
class Option:
    """One candidate for a surface: changes to the base data by key path (None removes a
    key), and optionally its cost (any currency)."""

    name: str
    changes: Mapping[str, Any] = field(default_factory=dict)
    cost: float | None = None


@dataclass(frozen=True)
class Surface:
    """A surface and its candidate options (the first is usually 'none')."""

    name: str
    options: Sequence[Option]


@dataclass(frozen=True)
class _Arrays:
    damping: Array  # (N, B)
    modal: Array  # (N, B)
    eta_ab: Array  # (C, B)
    power: Array  # (N, B)
    offsets: Array  # (R,) level offsets of the receivers
    mass: float


def _arrays(model: Model, receivers: Sequence[int]) -> _Arrays:
    nb = len(model.bands)
    n = len(model.subsystems)
    power = np.zeros((n, nb))
    idx = model.index()
    for e in model.excitations:
        if e.drive == "power" and e.power is not None:
            power[idx[e.subsystem]] += e.power
    return _Arrays(
        np.vstack([s.damping for s in model.subsystems]),
        np.vstack([s.modal_density for s in model.subsystems]),
        (
            np.vstack([c.coupling_loss_factor for c in model.connections])
            if model.connections
            else np.zeros((0, nb))
        ),
        power,
        np.array([level_offset(model, r) for r in receivers]),
        total_added_mass(model),
    )


@dataclass(frozen=True)
class Lightest:
    """The answer of :func:`lightest_treatment`.

    Attributes
    ----------
    found : bool
        True if a combination meets every target.
    choice : dict
        Surface -> option name of the answer (the lightest meeting every target; if none
        does, the one with the best smallest margin).
    objective : float
        Its added mass [kg] (or cost).
    mass_kg : float
        Its added mass [kg].
    result : Result
        The chosen combination rebuilt and solved in full (verification).
    margins : DataFrame
        :func:`seatool.analysis.targets.margin_table` of ``result``.
    binding : str
        The target and limit with the smallest margin (``target: limit``), in words.
    alternatives : DataFrame
        The next-best combinations meeting every target (one column per surface,
        ``objective, mass_kg, smallest_margin``), lightest first.
    method : str
        'exhaustive' or 'branch and bound (...)' with its counts.
    evaluated : int
        Combinations solved exactly.
    combinations : int
        Combinations in the search space.
    verification_db : float
        Largest difference between the combined levels and the full rebuild [dB].
    best_margin : float
        The best smallest margin found (the best achievable when nothing meets the targets).
    margin_bound : float
        Proven upper bound of the best achievable smallest margin when nothing meets the
        targets (equal to ``best_margin`` when the search proved it); ``best_margin``
        otherwise.
    """

    found: bool
    choice: dict[str, str]
    objective: float
    mass_kg: float
    result: Result
    margins: pd.DataFrame
    binding: str
    alternatives: pd.DataFrame
    method: str
    evaluated: int
    combinations: int
    verification_db: float
    best_margin: float
    margin_bound: float

    def summary(self) -> str:
        """Plain-text answer: the choice, its mass, the binding limit, or why none."""
        picks = ", ".join(f"{s} = {o}" for s, o in self.choice.items())
        head = (
            f"lightest treatment meeting every target: {picks}"
            if self.found
            else "no combination of the candidates meets every target; the best achievable "
            f"smallest margin is {self.best_margin:.1f} with {picks}"
            + (
                ""
                if self.margin_bound <= self.best_margin + 0.05
                else f" (search stopped: no combination can exceed {self.margin_bound:.1f})"
            )
        )
        lines = [
            head,
            f"added mass {self.mass_kg:.2f} kg (objective {self.objective:.4g}); binding: "
            f"{self.binding}",
            f"{self.method}: {self.evaluated} of {self.combinations} combinations solved "
            f"exactly; rebuild agrees to {self.verification_db:.1e} dB",
        ]
        lines += [v.line for v in verdicts(self.result)]
        return "\n".join(lines)


def _log_ratio(x: Array, x0: Array) -> Array:
    """ln(x / x0) where both are positive and finite, else 0 (sinks: n = inf)."""
    ok = np.isfinite(x) & np.isfinite(x0) & (x > 0) & (x0 > 0)
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(ok, np.log(np.where(ok, x, 1.0) / np.where(ok, x0, 1.0)), 0.0)


def _table_names(model_names: Sequence[str], table: str) -> list[int]:
    """Indices of the model entries a table produced (``NAME`` or ``NAME[...]``)."""
    return [i for i, n in enumerate(model_names) if n == table or n.startswith(table + "[")]


def _option_arrays(
    data: Mapping[str, Any],
    changed: Mapping[str, Any],
    base: Model,
    a0: _Arrays,
    r_idx: Sequence[int],
    file: str,
    base_dir: str | Path,
    where: str,
) -> tuple[_Arrays, set[int]]:
    """The arrays of the base model with one option applied, and the connection rows it
    rebuilt.

    Only the connections and excitations that touch a changed subsystem (or changed
    themselves) are rebuilt; coupling loss factors and input powers depend only on the
    subsystems they join, so the others keep their base values. Any other change (bands,
    materials, fluids) rebuilds the whole model.
    """
    sections = ("subsystems", "connections", "excitations")
    others = {k for k in set(data) | set(changed) if k not in (*sections, "targets")}
    if any(data.get(k) != changed.get(k) for k in others):
        m = build(changed, file=file, base_dir=base_dir)
        _check(m, base, where, file)
        got = _arrays(m, r_idx)
        return got, set(np.flatnonzero(np.any(got.eta_ab != a0.eta_ab, axis=1)).tolist())
    subs_old = data.get("subsystems", {}) or {}
    subs_new = changed.get("subsystems", {}) or {}
    moved = {n for n in set(subs_old) | set(subs_new) if subs_old.get(n) != subs_new.get(n)}

    def touched(section: str, ends: Any) -> dict[str, Any]:
        old = data.get(section, {}) or {}
        new = changed.get(section, {}) or {}
        out = {}
        for name, t in new.items():
            refs = set(ends(t)) if isinstance(t, dict) else set()
            if old.get(name) != t or refs & moved:
                out[name] = t
        return out

    cons = touched("connections", subsystem_refs)
    exs = touched("excitations", lambda t: [t.get("subsystem")])
    part = {k: v for k, v in changed.items() if k not in ("connections", "excitations", "targets")}
    part["connections"] = cons
    part["excitations"] = exs
    m = build(part, file=file, base_dir=base_dir)
    if m.names != base.names:
        raise InputError(
            [Problem(file, where, "this option changes the model's subsystems; options may "
                     "only change values (treatments, thicknesses, damping)")]
        )  # fmt: skip
    sub = _arrays(m, r_idx)
    eta = a0.eta_ab.copy()
    base_cons = [c.name for c in base.connections]
    part_cons = [c.name for c in m.connections]
    rows: set[int] = set()
    for table in cons:
        bi, pi = _table_names(base_cons, table), _table_names(part_cons, table)
        if [base_cons[i] for i in bi] != [part_cons[i] for i in pi]:
            raise InputError([Problem(file, where, f"this option changes connection {table!r}")])
        eta[bi] = sub.eta_ab[pi]
        rows.update(bi)
    power = a0.power.copy()
    idx = base.index()
    for e in base.excitations:
        # a diffuse field's non-resonant part is rebuilt with its table
        table = e.name.removesuffix(NONRESONANT_SUFFIX) if e.through else e.name
        if table in exs or any(e.name.startswith(t + "[") for t in exs):
            if e.drive == "power" and e.power is not None:
                power[idx[e.subsystem]] -= e.power
    for e in m.excitations:
        if e.drive == "power" and e.power is not None:
            power[idx[e.subsystem]] += e.power
        elif e.drive != "power":
            raise InputError(
                [Problem(file, where, "options may not change a held (prescribed) level")]
            )
    return _Arrays(sub.damping, sub.modal, eta, power, sub.offsets, sub.mass), rows


def _check(model: Model, ref: Model, where: str, file: str) -> None:
    if ref.names != model.names or [c.name for c in ref.connections] != [
        c.name for c in model.connections
    ]:
        raise InputError(
            [
                Problem(
                    file,
                    where,
                    "this option changes the model's subsystems or connections; options may "
                    "only change values (treatments, thicknesses, damping)",
                )
            ]
        )
    if [e.subsystem for e in ref.excitations] != [e.subsystem for e in model.excitations]:
        raise InputError([Problem(file, where, "this option changes the excitations")])


def _progress(total: int, show: bool | None) -> Any:
    disable = not (sys.stderr.isatty() if show is None else show)
    return tqdm(total=total, file=sys.stderr, disable=disable, unit="comb", leave=False)


def lightest_treatment(
    data: Mapping[str, Any],
    surfaces: Sequence[Surface],
    *,
    file: str = "<data>",
    base_dir: str | Path = ".",
    targets: Sequence[str] | None = None,
    objective: Literal["mass", "cost"] = "mass",
    cost_per_kg: float | None = None,
    alternatives: int = 3,
    exhaustive_limit: int = 20000,
    method: Literal["auto", "exhaustive", "bound"] = "auto",
    max_nodes: int = 200_000,
    chunk: int = 2000,
    max_verify: int = 20,
    field: str = "diffuse",
    progress: bool | None = None,
) -> Lightest:
    """Find the combination of options (one per surface) meeting every target at the least
    objective. See the module notes for the method and its assumptions.

    Raises
    ------
    InputError
        No targets, an empty surface, an option that fails to build or changes the model's
        structure, a cost objective without costs.
    """
    base = build(data, file=file, base_dir=base_dir)
    tg: list[Target] = [t for t in base.targets if targets is None or t.name in targets]
    if not tg:
        raise InputError([Problem(file, "targets", "no [targets.NAME] to meet")])
    if not surfaces or any(not s.options for s in surfaces):
        raise InputError([Problem(file, "surfaces", "every surface needs at least one option")])
    recs = list(dict.fromkeys(t.receiver for t in tg))
    idx = base.index()
    r_idx = [idx[r] for r in recs]
    a0 = _arrays(base, r_idx)
    deltas: list[list[_Arrays]] = []
    obj: list[list[float]] = []
    touched: list[set[int]] = []
    for s in surfaces:
        touched.append(set())
        row, orow = [], []
        for o in s.options:
            where = f"surfaces.{s.name}.{o.name}"
            d = apply_changes(data, o.changes, file=file, where=f"{where}: ")
            ao, rows = _option_arrays(
                data, d, base, a0, r_idx, f"{file} ({where})", base_dir, where
            )
            touched[-1] |= rows
            row.append(
                _Arrays(
                    ao.damping - a0.damping,
                    _log_ratio(ao.modal, a0.modal),
                    _log_ratio(ao.eta_ab, a0.eta_ab),
                    ao.power - a0.power,
                    ao.offsets - a0.offsets,
                    ao.mass - a0.mass,
                )
            )
            if objective == "cost":
                if o.cost is not None:
                    orow.append(float(o.cost))
                elif cost_per_kg is not None:
                    orow.append(cost_per_kg * (ao.mass - a0.mass))
                else:
                    raise InputError([Problem(file, f"{where}.cost", "give a cost or cost_per_kg")])
            else:
                orow.append(ao.mass - a0.mass)
        deltas.append(row)
        obj.append(orow)
    shared = shared_tables(data, surfaces, touched, base, file, base_dir)
    damped = [
        {
            int(i)
            for i in np.flatnonzero(np.any([np.any(dl.damping != 0, axis=1) for dl in row], axis=0))
        }
        for row in deltas
    ]
    approx: list[str] = []
    shared_d = shared_damping(data, surfaces, damped, base, file, base_dir, approx)
    # their values come from the tables, not from sums or products
    for _, rows_g, _ in shared:
        for row in deltas:
            for dl in row:
                dl.eta_ab[rows_g] = 0.0
    for _, rows_g, _ in shared_d:
        for row in deltas:
            for dl in row:
                dl.damping[rows_g] = 0.0
    sizes = [len(s.options) for s in surfaces]
    total = int(np.prod(sizes))
    asm0 = assemble(base)
    held = asm0.held
    held_energy = asm0.held_energy

    def exact(combos: npt.NDArray[np.int64]) -> Array:
        """Receiver levels (K, R, B) of combinations (K, S)."""
        k = combos.shape[0]
        damp = np.broadcast_to(a0.damping, (k, *a0.damping.shape)).copy()
        modal = np.zeros((k, *a0.modal.shape))
        eta = np.zeros((k, *a0.eta_ab.shape))
        power = np.broadcast_to(a0.power, (k, *a0.power.shape)).copy()
        off = np.broadcast_to(a0.offsets, (k, len(r_idx))).copy()
        for si, row in enumerate(deltas):
            ch = combos[:, si]
            damp += np.stack([d.damping for d in row])[ch]
            modal += np.stack([d.modal for d in row])[ch]
            eta += np.stack([d.eta_ab for d in row])[ch]
            power += np.stack([d.power for d in row])[ch]
            off += np.stack([d.offsets for d in row])[ch]
        modal = a0.modal * np.exp(modal)
        eta = a0.eta_ab * np.exp(eta)
        for group, rows_g, table in shared:
            eta[:, rows_g] = table[tuple(combos[:, g] for g in group)]
        for group, rows_g, table in shared_d:
            damp[:, rows_g] = table[tuple(combos[:, g] for g in group)]
        e = _batched_dense(base, damp, modal, eta, power, held, held_energy)
        with np.errstate(divide="ignore"):
            return db(e[:, r_idx, :]) + off[:, :, None]

    def judge(levels: Array) -> tuple[npt.NDArray[np.bool_], Array]:
        met = np.ones(levels.shape[0], dtype=bool)
        small = np.full(levels.shape[0], np.inf)
        for t in tg:
            mg = margins_of_levels(levels[:, recs.index(t.receiver), :], base.bands, t, field=field)
            met &= mg.met
            small = np.minimum(small, mg.smallest)
        return met, small

    obj_arr = [np.asarray(o) for o in obj]
    mass_arr = [np.array([d.mass for d in row]) for row in deltas]

    def combos_of(flat: npt.NDArray[np.int64]) -> npt.NDArray[np.int64]:
        return np.stack(np.unravel_index(flat, sizes), axis=1).astype(np.int64)

    offset = a0.mass if objective == "mass" else 0.0

    def objective_of(combos: npt.NDArray[np.int64]) -> Array:
        return offset + np.sum([obj_arr[s][combos[:, s]] for s in range(len(sizes))], axis=0)

    use = method
    if use == "auto":
        use = "exhaustive" if total <= exhaustive_limit else "bound"
    feasible: list[tuple[float, float, int]] = []  # (objective, -margin, flat index)
    best = (-np.inf, -1)
    evaluated = 0
    margin_bound = -np.inf  # above the best found only when a search stopped unproven
    bar = _progress(total, progress)
    try:
        if use == "exhaustive":
            for start in range(0, total, chunk):
                flat = np.arange(start, min(total, start + chunk), dtype=np.int64)
                combos = combos_of(flat)
                met, small = judge(exact(combos))
                evaluated += flat.size
                bar.update(flat.size)
                ob = objective_of(combos)
                for k in np.flatnonzero(met):
                    feasible.append((float(ob[k]), -float(small[k]), int(flat[k])))
                kb = int(np.argmax(small))
                if small[kb] > best[0]:
                    best = (float(small[kb]), int(flat[kb]))
            method_name = "exhaustive"
        else:
            floor = LevelFloor(
                base,
                (a0.damping, a0.modal, a0.eta_ab, a0.power, a0.offsets),
                [
                    tuple(np.stack([getattr(d, k) for d in row]) for k in _FIELDS)  # type: ignore[misc]
                    for row in deltas
                ],
                r_idx,
                [("eta", *g) for g in shared] + [("damping", *g) for g in shared_d],
            )

            def exact_small(combos: npt.NDArray[np.int64]) -> Array:
                return judge(exact(combos))[1]

            def bound_small(combos: npt.NDArray[np.int64]) -> Array:
                return judge(floor.levels(combos))[1]

            order = _surface_order(sizes, exact_small)
            got = lightest_search(
                sizes, obj_arr, exact_small, bound_small, order, keep=alternatives + 1,
                tick=bar.update,
            )  # fmt: skip
            if not got.found:
                got = best_margin_search(
                    sizes, exact_small, bound_small, order, max_nodes=max_nodes, tick=bar.update
                )
                margin_bound = got.margin_bound
            evaluated = got.evaluated
            for ob_v, neg_m, c in got.found:
                feasible.append((ob_v, neg_m, int(np.ravel_multi_index(c, sizes))))
            if got.best_combo is not None:
                best = (got.best_margin, int(np.ravel_multi_index(got.best_combo, sizes)))
            method_name = (
                f"branch and bound ({got.bounded} partial combinations bounded, "
                f"{evaluated} of {total} combinations solved)"
            )
    finally:
        bar.close()
    feasible.sort()
    names = [t.name for t in tg]

    def rebuild(flat_i: int) -> tuple[npt.NDArray[np.int64], Result, float]:
        c = combos_of(np.array([flat_i], dtype=np.int64))[0]
        changes: dict[str, Any] = {}
        for s, ci in zip(surfaces, c, strict=True):
            changes.update(s.options[int(ci)].changes)
        m = build(apply_changes(data, changes, file=file), file=file, base_dir=base_dir)
        res = Result(m, core_solve(m))
        lv_full = res.level_array()[0][r_idx]
        return c, res, float(np.max(np.abs(lv_full - exact(c[None, :])[0])))

    # Verify in order: the first combination whose full rebuild meets every target.
    found = False
    rejected = 0
    for kv, (_, _, flat_i) in enumerate(feasible[:max_verify]):
        combo, result, ver = rebuild(flat_i)
        if all(v.met for v in verdicts(result, names, field=field)):
            found = True
            feasible = feasible[kv:]
            break
        rejected += 1
    if not found:
        combo, result, ver = rebuild(best[1] if best[1] >= 0 else 0)
        feasible = []
    model = result.model
    choice = {s.name: s.options[int(c)].name for s, c in zip(surfaces, combo, strict=True)}
    vs = verdicts(result, names, field=field)
    worst = min(vs, key=lambda v: v.margin)
    binding = f"{worst.target}: {worst.binding} (margin {worst.margin:.2f} {worst.unit})"
    if approx:
        method_name += (
            f"; the damping of {', '.join(approx)} (Eyring, lined by more than "
            f"{JOINT_LIMIT} combinations of options) was combined additively, then verified"
        )
    if rejected:
        method_name += (
            f"; {rejected} lighter combination(s) met the targets only in the combined "
            "arrays and missed them in the full rebuild"
        )
    alt_rows = []
    for ob_v, neg_m, flat_i in feasible[1 : 1 + alternatives]:
        c = combos_of(np.array([flat_i], dtype=np.int64))[0]
        alt: dict[str, Any] = {
            s.name: s.options[int(ci)].name for s, ci in zip(surfaces, c, strict=True)
        }
        alt["objective"] = ob_v
        alt["mass_kg"] = a0.mass + float(sum(mass_arr[k][c[k]] for k in range(len(sizes))))
        alt["smallest_margin"] = -neg_m
        alt_rows.append(alt)
    return Lightest(
        found=found,
        choice=choice,
        objective=float(objective_of(combo[None, :])[0]),
        mass_kg=total_added_mass(model),
        result=result,
        margins=margin_table(result, [t.name for t in tg], field=field),
        binding=binding,
        alternatives=pd.DataFrame(
            alt_rows,
            columns=[*(s.name for s in surfaces), "objective", "mass_kg", "smallest_margin"],
        ),
        method=method_name,
        evaluated=evaluated,
        combinations=total,
        verification_db=ver,
        best_margin=float(best[0]) if not found else float(worst.margin),
        margin_bound=float(worst.margin) if found else max(float(best[0]), margin_bound),
    )


_FIELDS = ("damping", "modal", "eta_ab", "power", "offsets")


def _surface_order(sizes: Sequence[int], exact_small: Any) -> list[int]:
    """Surfaces in decreasing spread of the smallest margin over their options alone (one
    at a time, the others at option 0): the strongest surfaces are fixed first, which
    narrows the bound fastest. Any order gives the same answer."""
    spread = []
    for si, n in enumerate(sizes):
        combos = np.zeros((n, len(sizes)), dtype=np.int64)
        combos[:, si] = np.arange(n)
        small = exact_small(combos)
        spread.append(float(np.ptp(small[np.isfinite(small)])) if np.isfinite(small).any() else 0.0)
    return sorted(range(len(sizes)), key=lambda s: -spread[s])
