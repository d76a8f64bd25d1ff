"""What the receiver's level is sensitive to: adjoint sensitivities of the power balance.

For the free block of one band, ``L_UU E_U = b`` with
``b = P_U / omega + sum_held eta_hu E_h``. The receiver r (free) has
``dE_r = lam^T (db - dL_UU E_U)`` with the adjoint ``L_UU^T lam = e_r``. Because
``C = L_UU diag(n_U)`` is symmetric, ``L_UU^T = diag(1/n_U) C`` and the adjoint is
``C lam = n_r e_r``: the same matrix as the forward solve, one more solve with the same
factorisation (Giles & Pierce 2000, "An introduction to the adjoint approach to design",
Flow Turbul. Combust. 65, 393-415, from memory, for the adjoint method in general).

With lam set to zero on held subsystems, the derivatives of E_r with respect to the
assembled arrays are (derivation in ``docs/theory/analysis.md``)::

    dE_r/d eta_i   = -lam_i E_i                      (damping loss factor, free i)
    dE_r/d eta_ab  = -(lam_a - lam_b) E_a            (eta_ba held fixed)
    dE_r/d eta_ba  = -(lam_b - lam_a) E_b            (eta_ab held fixed)
    dE_r/d P_i     =  lam_i / omega
    dE_r/d E_h     =  sum over connections of h: lam_other eta_(h -> other)

A stated coupling loss factor eta_ab drags eta_ba = eta_ab n_a / n_b with it
(reciprocity), so d/d ln eta_ab = eta_ab dE/d eta_ab + eta_ba dE/d eta_ba
= -(lam_a - lam_b) q_ab / omega (q_ab the net connection power). A modal density enters
only through eta_ba (d ln eta_ba / d ln n_a = 1, d ln eta_ba / d ln n_b = -1).

Units. ``dL_dlnx_dB`` is dL / d(ln x) [dB per unit of ln x]; ``db_per_db`` is
dL / d(10 lg x) = (ln 10 / 10) dL/d(ln x), dimensionless (= d ln E_r / d ln x plus the
level-conversion term); ``db_per_percent`` is the linearised change for a 1 % increase,
dL/d(ln x) / 100 [dB].

Physical parameters (key paths into the model file) follow by the chain rule
``dL/d ln p = sum_k dL/dX_k dX_k/d ln p + d offset/d ln p``, where X runs over the
assembled arrays (damping, both coupling directions, input powers, held energies) and
``offset`` is the receiver's energy-to-level conversion (volume, density, mass). The
derivatives dX/d ln p are central differences of the *model building only* (the model is
rebuilt with ``p exp(+-h)`` through :func:`seatool.modelfile.build`; no re-solve).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt
import pandas as pd

from ..bandsolve import SingularBandError, add_rows
from ..errors import InputError, Problem
from ..levels import db_to_ratio
from ..model import Model
from ..modelfile import build
from ..results import Result
from ..solve import Assembly, FreeBlock, SolveError, assemble, solve_free
from ..solve import solve as core_solve
from ._keypath import read_data, resolve, with_value
from ._system import level_offset, receiver_index, validity_columns

__all__ = [
    "Gradients",
    "add_levels",
    "gradients",
    "parameter_sensitivities",
    "ranking",
    "receiver_sensitivities",
    "sensitivities",
]

Array = npt.NDArray[np.float64]

DB_PER_NEPER = 10.0 / np.log(10.0)


@dataclass(frozen=True)
class Gradients:
    """Derivatives of the receiver energy E_r (B,) with respect to the assembled arrays."""

    receiver: int
    energy: Array  # (N, B) energies of the solved model [J]
    damping: Array  # (N, B) dE_r / d eta_i
    eta_ab: Array  # (C, B) dE_r / d eta_ab (eta_ba fixed)
    eta_ba: Array  # (C, B) dE_r / d eta_ba (eta_ab fixed)
    power: Array  # (N, B) dE_r / d P_i
    held_energy: Array  # (N, B) dE_r / d E_h

    @property
    def receiver_energy(self) -> Array:
        return self.energy[self.receiver]


def gradients(
    model: Model, receiver: str, *, result: Result | None = None, asm: Assembly | None = None
) -> Gradients:
    """Adjoint derivatives of the receiver's energy, all bands (one factorisation each).

    If ``result`` is given its energies are used and each band needs only the adjoint
    solve; otherwise the forward and the adjoint solve share one factorisation per band.
    """
    r = receiver_index(model, receiver)
    if model.subsystems[r].sink:
        raise InputError(
            [
                Problem(
                    model.source,
                    "--to",
                    f"{receiver!r} is the exterior sink and has no level; choose a subsystem "
                    "with a level",
                )
            ]
        )
    asm = assemble(model) if asm is None else asm
    n, nb = asm.shape
    nc = asm.a.size
    blk = FreeBlock.of(model, asm)
    lam = np.zeros((n, nb))
    if result is not None:
        energy = np.array(result.energy, dtype=float)
    else:
        energy = np.array(asm.held_energy, dtype=float)
    held_r = bool(asm.held[r])
    if not held_r and blk.nf:
        # Forward and adjoint (C lam = n_r e_r) on the forward solve's path: one batched
        # solve of all bands (iterative or sparse LU, as chosen by the solver).
        pr = int(blk.pos[r])
        cols = []
        if result is None:
            cols.append(blk.rhs(asm.power, asm.held_energy))
        e_r = np.zeros((blk.nf, nb))
        e_r[pr] = blk.n_free[pr]
        cols.append(e_r)
        mats = blk.mats
        try:
            sol, _ = solve_free(mats, np.stack(cols, axis=2))
        except SingularBandError as exc:
            raise SolveError(
                f"band {model.bands.label(exc.band)}: the power balance is singular to "
                "working precision"
            ) from None
        if result is None:
            energy[blk.free] = blk.n_free * sol[:, :, 0]
        lam[blk.free] = sol[:, :, -1]
    a, b = asm.a, asm.b
    g_damp = np.where(asm.held[:, None], 0.0, -lam * energy)
    g_ab = -(lam[a] - lam[b]) * energy[a] if nc else np.zeros((0, nb))
    g_ba = -(lam[b] - lam[a]) * energy[b] if nc else np.zeros((0, nb))
    g_p = lam / asm.omega
    g_h = np.zeros((n, nb))
    np.add.at(g_h, a, lam[b] * asm.eta_ab)
    np.add.at(g_h, b, lam[a] * asm.eta_ba)
    g_h = np.where(asm.held[:, None], g_h, 0.0)
    if held_r:
        g_h[r] = 1.0
    return Gradients(r, energy, g_damp, g_ab, g_ba, g_p, g_h)


def _labels(names: Sequence[str], nb: int) -> Any:
    """Each of ``names`` repeated ``nb`` times, as a pandas string array (one ``take``)."""
    if not names:
        return np.repeat(np.asarray(names, dtype=str), nb)
    return pd.Series(list(names)).array.take(np.repeat(np.arange(len(names)), nb))


def _rows(
    model: Model,
    asm: Assembly,
    g: Gradients,
    names: list[str],
    parameter_types: list[str],
    targets: list[str],
    d_e: list[Array] | Array,
    d_offset: list[float] | None = None,
) -> pd.DataFrame:
    nb = len(model.bands)
    er = g.receiver_energy
    k = len(names)
    if isinstance(d_e, np.ndarray):
        rel = d_e
    else:
        rel = np.vstack(d_e) if d_e else np.zeros((0, nb))
    with np.errstate(divide="ignore", invalid="ignore"):
        rel = np.where(er > 0, rel / er, np.nan)
    dl = DB_PER_NEPER * rel
    if d_offset is not None:
        dl = dl + np.asarray(d_offset)[:, None]
    valid = validity_columns(model, asm, g.receiver)
    return pd.DataFrame(
        {
            "receiver": _labels([model.subsystems[g.receiver].name], nb * k),
            "parameter": _labels(names, nb),
            "parameter_type": _labels(parameter_types, nb),
            "target": _labels(targets, nb),
            "band_hz": np.tile(model.bands.nominal, k),
            "band_exact_hz": np.tile(model.bands.centre, k),
            "dL_dlnx_dB": dl.ravel(),
            "db_per_db": (dl / DB_PER_NEPER).ravel(),
            "db_per_percent": (dl / 100.0).ravel(),
            **{c: np.tile(v, k) for c, v in valid.items()},
        },
        copy=False,  # fresh arrays: no copy into consolidated blocks
    )


def sensitivities(
    model: Model, receiver: str, *, result: Result | None = None
) -> pd.DataFrame:
    """Sensitivity of the receiver's band level to every quantity of the assembled model.

    Parameters: ``damping:NAME`` (damping loss factor of a subsystem),
    ``coupling:NAME`` (stated coupling loss factor of a connection, reverse direction
    tied by reciprocity), ``modal_density:NAME``, ``power:EXCITATION`` (input power),
    ``held_level:EXCITATION`` (a prescribed level's energy; db_per_db = dB of receiver
    per dB of the held level).

    Returns
    -------
    pandas.DataFrame
        One row per parameter and band: ``receiver, parameter, parameter_type, target, band_hz,
        band_exact_hz, dL_dlnx_dB, db_per_db, db_per_percent, modes_in_band,
        modal_overlap, valid``. NaN where the receiver gets no energy (its level is
        minus infinity).
    """
    asm = assemble(model)
    g = gradients(model, receiver, result=result, asm=asm)
    n, nb = asm.shape
    sinks = np.array([s.sink for s in model.subsystems], dtype=bool)
    kept = np.flatnonzero(~sinks)
    sub_names = [model.subsystems[i].name for i in kept]
    con_names = [c.name for c in model.connections]
    names = [f"damping:{nm}" for nm in sub_names] + [f"coupling:{nm}" for nm in con_names]
    names += [f"modal_density:{nm}" for nm in sub_names]
    parameter_types = ["damping"] * kept.size + ["coupling"] * len(con_names)
    parameter_types += ["modal_density"] * kept.size
    targets = sub_names + con_names + sub_names
    # dE_r / d ln eta_ba (C, B); a modal density enters through eta_ba of its connections
    # (+1 where it is the stating end a, unless b is a sink; -1 where it is the end b).
    term = asm.eta_ba * g.eta_ba
    d_modal = np.zeros((n, nb))
    as_a = ~sinks[asm.b]
    add_rows(d_modal, asm.a[as_a], term[as_a])
    add_rows(d_modal, asm.b, -term)
    blocks = [
        (asm.damping * g.damping)[kept],
        asm.eta_ab * g.eta_ab + asm.eta_ba * g.eta_ba,
        d_modal[kept],
    ]
    idx = model.index()
    extra: list[Array] = []
    for e in model.excitations:
        i = idx[e.subsystem]
        if e.drive == "power":
            assert e.power is not None
            names.append(f"power:{e.name}")
            parameter_types.append("power")
            extra.append(e.power * g.power[i])
        else:
            assert e.energy is not None
            names.append(f"held_level:{e.name}")
            parameter_types.append("held_level")
            extra.append(e.energy * g.held_energy[i])
        targets.append(e.name)
    if extra:
        blocks.append(np.vstack(extra))
    return _rows(model, asm, g, names, parameter_types, targets, np.vstack(blocks))


def _same_structure(m0: Model, m1: Model, a0: Assembly, a1: Assembly) -> str | None:
    if m0.names != m1.names:
        return "changes the set of subsystems"
    if [(c.name, c.a, c.b) for c in m0.connections] != [
        (c.name, c.a, c.b) for c in m1.connections
    ]:
        return "changes the set of connections"
    if not np.array_equal(a0.held, a1.held):
        return "changes which subsystems are held"
    return None


def _dx(x0: Array, xp: Array, xm: Array, h: float) -> Array:
    """dX/d ln p from X(p e^h), X(p e^-h): in log space where X > 0 (exact for power laws)."""
    pos = (x0 > 0) & (xp > 0) & (xm > 0)
    with np.errstate(divide="ignore", invalid="ignore"):
        logd = x0 * (np.log(np.where(pos, xp, 1.0)) - np.log(np.where(pos, xm, 1.0))) / (2 * h)
    return np.where(pos, logd, (xp - xm) / (2 * h))


def parameter_sensitivities(
    data: Mapping[str, Any],
    receiver: str | Sequence[str],
    params: Sequence[str],
    *,
    file: str = "<data>",
    base_dir: str | Path = ".",
    step: float = 1e-4,
    model: Model | None = None,
) -> pd.DataFrame:
    """Sensitivity of the receiver's band level to physical parameters of the model file.

    Parameters
    ----------
    data : mapping
        Parsed model file (as from ``tomllib``); not changed.
    receiver : str or sequence of str
        Receiving subsystem(s); the model is rebuilt once for all of them.
    params : sequence of str
        Key paths of numbers or spectra in the file, e.g. ``subsystems.floor.thickness``
        (a spectrum is scaled as a whole, the same factor in every band).
    file, base_dir :
        Passed to :func:`seatool.modelfile.build` (messages, relative CSV paths).
    step : float, optional
        Log step h of the central differences of the model building (default 1e-4).
    model : Model, optional
        The model built from ``data`` (built here if not given).

    Returns
    -------
    pandas.DataFrame
        As :func:`sensitivities`, ``parameter_type = 'parameter'``, ``parameter`` = the key path.

    Notes
    -----
    ``dL/d ln p = (10 / ln 10) (1 / E_r) sum_k (dE_r/dX_k) dX_k/d ln p
    + (offset(p e^h) - offset(p e^-h)) / (2h)``, with the adjoint derivatives dE_r/dX of
    :func:`gradients` and X the assembled arrays. ``dX/d ln p`` is the central
    difference of ``ln X`` times X where X > 0 (exact for a power law X ~ p^k, which most
    SEA quantities are locally), else of X. The model is rebuilt twice per parameter but
    solved once in all.

    References
    ----------
    .. [1] Giles, M.B., Pierce, N.A. (2000). "An introduction to the adjoint approach to
       design." Flow, Turbulence and Combustion 65, 393-415 (adjoint derivatives of an output
       of a linear system; from memory). The physics of each X is in the functions that
       :func:`seatool.modelfile.build` calls.
    """
    if not 0 < step < 0.1:
        raise ValueError("step must be in (0, 0.1)")
    problems = []
    for p in params:
        _, msg = resolve(data, p)
        if msg is not None:
            problems.append(Problem(file, p, msg))
    if problems:
        raise InputError(problems)
    m0 = build(data, file=file, base_dir=base_dir) if model is None else model
    a0 = assemble(m0)
    receivers = [receiver] if isinstance(receiver, str) else list(receiver)
    grads = [gradients(m0, r, asm=a0) for r in receivers]
    fields = ("damping", "eta_ab", "eta_ba", "power", "held_energy")
    d_e: list[list[Array]] = [[] for _ in receivers]
    d_off: list[list[float]] = [[] for _ in receivers]
    h2 = 2.0 * step
    for p in params:
        built = []
        for sign in (1.0, -1.0):
            factor = float(np.exp(sign * step))
            d = with_value(data, p, lambda v, f=factor: v * f)  # type: ignore[misc]
            try:
                m = build(d, file=file, base_dir=base_dir)
            except InputError as exc:
                first = exc.problems[0] if exc.problems else None
                raise InputError(
                    [Problem(file, p, f"cannot vary this parameter by {step:g} in ln: {first}")]
                ) from None
            asm = assemble(m)
            why = _same_structure(m0, m, a0, asm)
            if why is not None:
                raise InputError([Problem(file, p, f"varying this parameter {why}")])
            built.append((m, asm))
        (mp, ap), (mm, am) = built
        dxs = {f: _dx(getattr(a0, f), getattr(ap, f), getattr(am, f), step) for f in fields}
        for k, g in enumerate(grads):
            de = np.zeros(len(m0.bands))
            for f in fields:
                de += (getattr(g, f) * dxs[f]).sum(axis=0)
            d_e[k].append(de)
            d_off[k].append((level_offset(mp, g.receiver) - level_offset(mm, g.receiver)) / h2)
    n = len(params)
    tables = [
        _rows(m0, a0, g, list(params), ["parameter"] * n, list(params), d_e[k], d_off[k])
        for k, g in enumerate(grads)
    ]
    return pd.concat(tables, ignore_index=True)


def ranking(table: pd.DataFrame) -> pd.DataFrame:
    """Rank the parameters of a sensitivity table by their effect on the overall level.

    ``overall_db_per_db`` is the sensitivity of the receiver's overall (energetic band
    sum) level: the band sensitivities weighted by each band's share of the overall mean
    square, ``w_b = 10^(L_b/10) / sum 10^(L/10)`` (the derivative of
    ``10 lg sum_b 10^(L_b/10)``). The table needs the receiver's band levels in a
    ``level_dB`` column (:func:`add_levels`). ``max_abs_db_per_db`` is the largest band
    value in magnitude, ``band_of_max`` its band and ``valid_at_max`` whether the receiver
    meets the validity conditions there.
    """
    t = table.copy()
    if "level_dB" not in t.columns:
        raise ValueError("ranking needs a level_dB column (use add_levels first)")
    lv = t["level_dB"].to_numpy(dtype=float)
    t["_q"] = np.where(np.isfinite(lv), db_to_ratio(lv), 0.0)
    out = []
    for (param, ptype), grp in t.groupby(["parameter", "parameter_type"], sort=False):
        q = grp["_q"].to_numpy()
        s = grp["db_per_db"].to_numpy(dtype=float)
        w = q / q.sum() if q.sum() > 0 else np.zeros_like(q)
        ok = np.isfinite(s)
        overall = float(np.sum(w[ok] * s[ok])) if ok.any() else float("nan")
        k = int(np.nanargmax(np.abs(s))) if ok.any() else 0
        out.append(
            {
                "parameter": param,
                "parameter_type": ptype,
                "overall_db_per_db": overall,
                "max_abs_db_per_db": float(np.abs(s[k])) if ok.any() else float("nan"),
                "band_of_max": float(grp["band_hz"].to_numpy()[k]),
                "valid_at_max": bool(grp["valid"].to_numpy()[k]),
            }
        )
    df = pd.DataFrame(out)
    if df.empty:
        return df
    df = df.sort_values(
        "overall_db_per_db", key=lambda x: -np.abs(x.fillna(0.0)), kind="stable"
    ).reset_index(drop=True)
    df.insert(0, "rank", np.arange(1, len(df) + 1))
    return df


def add_levels(table: pd.DataFrame, model: Model, result: Result | None = None) -> pd.DataFrame:
    """Join the receiver's band level (``level_dB``) to a sensitivity table."""
    result = Result(model, core_solve(model)) if result is None else result
    lv, _, _ = result.level_array()
    idx = model.index()
    nb = len(model.bands)
    r = idx[str(table["receiver"].iloc[0])] if len(table) else 0
    band_pos = {float(f): j for j, f in enumerate(model.bands.nominal)}
    del nb
    return table.assign(
        level_dB=[float(lv[r, band_pos[float(f)]]) for f in table["band_hz"].to_numpy()]
    )


def receiver_sensitivities(
    path: str | Path, receiver: str, params: Sequence[str] = ()
) -> tuple[Model, pd.DataFrame]:
    """Every sensitivity of ``receiver``'s level in the model file ``path`` (``seatool
    sensitivity``).

    :func:`sensitivities` (loss factors, powers, held levels) followed by
    :func:`parameter_sensitivities` of the key paths ``params``, with the receiver's band
    level joined (:func:`add_levels`). Returns the model and the table; rank it with
    :func:`ranking`. Raises :class:`~seatool.errors.InputError` for a bad file, receiver or
    key path.
    """
    data, file, base = read_data(path)
    model = build(data, file=file, base_dir=base)
    receiver_index(model, receiver)
    result = Result(model, core_solve(model))
    tables = [sensitivities(model, receiver, result=result)]
    if params:
        tables.append(
            parameter_sensitivities(data, receiver, params, file=file, base_dir=base, model=model)
        )
    return model, add_levels(pd.concat(tables, ignore_index=True), model, result)
