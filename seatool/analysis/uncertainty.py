"""How sure we are: Monte Carlo spread of the levels from parameter spreads in the model file.

The ``[uncertainty.NAME]`` tables of a model file name a value of the file by its key
path and give it a distribution (``docs/model-format.md``, section "uncertainty"):

* ``lognormal`` with ``factor`` F >= 1: the value is multiplied by F^z, z standard normal,
  so ln(value) has standard deviation ln F; the file value is the median; one standard
  deviation is "times or divided by F".
* ``uniform`` with ``tolerance`` t in [0, 1): the value is multiplied by 1 + t u,
  u uniform on [-1, 1]; or with ``low`` and ``high`` (a single-number parameter): the
  value is drawn uniformly from [low, high].
* ``normal`` with ``sd`` >= 0 (the parameter's unit): value + sd z.

A spectrum is varied as a whole: one draw per sample, the same factor (or shift) in
every band (fully correlated over frequency). Different parameters are independent.

Sampling is vectorised where the structure allows: when every uncertain parameter is a
loss factor, modal density or input power given directly in the file (``damping`` and
``modal_density`` of ``cavity``/``structure`` subsystems, ``coupling_loss_factor`` of
``given`` connections, ``power`` of excitations), the assembled arrays are sampled and
the per-band systems of all samples are solved in batches (stacked dense solves up to
the solver's ``ITERATIVE_ABOVE`` unknowns, then the solver's own batched iterative path
over the samples of each band up to :data:`DENSE_LIMIT` unknowns, otherwise one sparse
solve per sample); no model file is rebuilt. Otherwise each sample is rebuilt with
:func:`seatool.modelfile.build` (slower): the data are copied along the changed key paths
only, the tables whose inputs did not change are taken over from the previous build
(:class:`seatool.kinds.records.Records`), and the samples are solved together by the
stacked dense solves when the model is small enough (one by one otherwise).

Not included here: the ensemble variance of the response over nominally identical builds
(manufacturing scatter of the modes). That comes from the SEA variance theory, without
sampling, in :mod:`seatool.analysis.confidence` (5-95 % confidence bands; Langley & Cotoni
2004, JASA 115(2), 706-718, as read in ``docs/theory/variance.md``); the two spreads answer
different questions and are reported separately.
"""

from __future__ import annotations

import sys
import time
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any, TextIO

import numpy as np
import numpy.typing as npt
import pandas as pd

from .. import levels
from ..errors import InputError, Problem
from ..kinds.records import Records
from ..kinds.spreads import read_uncertainty
from ..levels import db, db_to_ratio
from ..model import Model, Uncertain
from ..modelfile import build
from ..results import Result
from ..solve import ITERATIVE_ABOVE, assemble, drives
from ..solve import solve as core_solve
from ._batched import batched_dense, batched_sparse
from ._keypath import read_data, with_values
from ._system import level_offset, validity_columns

#: The stacked dense route, under the name the treatment search imports.
_batched_dense = batched_dense

__all__ = [
    "DENSE_LIMIT",
    "Spread",
    "Uncertain",
    "read_uncertainty",
    "spread",
    "spread_file",
]

Array = npt.NDArray[np.float64]

#: Largest number of unknowns solved with dense batched solves.
DENSE_LIMIT = 400

# -- direct sampling of the assembled arrays ----------------------------------------------


def _direct_target(data: Mapping[str, Any], model: Model, par: str) -> tuple[str, int] | None:
    """('damping' | 'modal_density' | 'eta_ab' | 'power', index) if ``par`` is such a value."""
    parts = par.split(".")
    if len(parts) != 3:
        return None
    sec, name, key = parts
    table = data.get(sec, {}).get(name, {})
    if not isinstance(table, Mapping):
        return None
    if sec == "subsystems" and table.get("kind") in ("cavity", "structure"):
        if key in ("damping", "modal_density") and name in model.index():
            return key, model.index()[name]
    if sec == "connections" and table.get("kind", "given") == "given":
        names = [c.name for c in model.connections]
        if key == "coupling_loss_factor" and name in names:
            return "eta_ab", names.index(name)
    if sec == "excitations" and key == "power":
        names = [e.name for e in model.excitations]
        if name in names and model.excitations[names.index(name)].drive == "power":
            return "power", names.index(name)
    return None


@dataclass
class _Progress:
    """A plain stderr progress bar (no dependency)."""

    total: int
    enabled: bool
    stream: TextIO = sys.stderr
    width: int = 30
    _last: float = 0.0
    _start: float = 0.0

    def __post_init__(self) -> None:
        self._start = time.perf_counter()

    def update(self, done: int) -> None:
        if not self.enabled:
            return
        now = time.perf_counter()
        if done < self.total and now - self._last < 0.2:
            return
        self._last = now
        frac = done / max(self.total, 1)
        bar = "#" * int(round(frac * self.width))
        el = now - self._start
        eta = el / frac - el if frac > 0 else float("nan")
        self.stream.write(
            f"\rsamples [{bar:<{self.width}}] {done}/{self.total} {el:5.1f} s, ~{eta:4.0f} s left"
        )
        if done >= self.total:
            self.stream.write("\n")
        self.stream.flush()


# -- the result ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Spread:
    """Monte Carlo samples of every level and their percentiles.

    Attributes
    ----------
    model : Model
        The nominal model.
    nominal : Result
        Its deterministic solve.
    mean_square : ndarray (S, N, B)
        Per sample ``10^(L/10)`` (the level's mean-square ratio to its reference squared);
        percentiles are taken on it and converted to dB (0 gives minus infinity).
    uncertain : list of Uncertain
    seed : int
    method : str
        'direct (batched dense)', 'direct (sparse per sample)' or 'rebuild per sample'.
    """

    model: Model
    nominal: Result
    mean_square: Array
    uncertain: list[Uncertain]
    seed: int
    method: str

    @property
    def samples(self) -> int:
        return int(self.mean_square.shape[0])

    def levels(self) -> Array:
        """Sampled levels (S, N, B) [dB]."""
        return db(self.mean_square)

    def table(self, percentiles: Sequence[float] = (5.0, 50.0, 95.0)) -> pd.DataFrame:
        """Per subsystem (with a level) and band: nominal level and sample percentiles.

        Columns: ``subsystem, band_hz, band_exact_hz, level_ref, nominal_dB``,
        ``p5_dB, p50_dB, p95_dB`` (one per percentile; linear interpolation of the
        mean-square samples, numpy's default), ``mean_dB`` (level of the sample mean of the
        mean square), ``samples``, ``modes_in_band, modal_overlap, valid``.
        """
        m = self.model
        nb = len(m.bands)
        lv, _, refs = self.nominal.level_array()
        asm = assemble(m)
        keep = [i for i, s in enumerate(m.subsystems) if not s.sink]
        q = self.mean_square[:, keep, :]
        pct = np.percentile(q, list(percentiles), axis=0)  # (P, K, B)
        cols: dict[str, Any] = {
            "subsystem": np.repeat([m.names[i] for i in keep], nb),
            "band_hz": np.tile(m.bands.nominal, len(keep)),
            "band_exact_hz": np.tile(m.bands.centre, len(keep)),
            "level_ref": np.repeat([refs[i] for i in keep], nb),
            "nominal_dB": lv[keep].ravel(),
        }
        for p, v in zip(percentiles, pct, strict=True):
            cols[f"p{p:g}_dB"] = db(v).ravel()
        cols["mean_dB"] = db(q.mean(axis=0)).ravel()
        cols["samples"] = self.samples
        val = [validity_columns(m, asm, i) for i in keep]
        for c in ("modes_in_band", "modal_overlap", "valid"):
            cols[c] = np.concatenate([v[c] for v in val])
        return pd.DataFrame(cols)

    def overall(self, percentiles: Sequence[float] = (5.0, 50.0, 95.0)) -> pd.DataFrame:
        """Percentiles of each subsystem's overall (energetic band sum) level."""
        m = self.model
        keep = [i for i, s in enumerate(m.subsystems) if not s.sink]
        tot = self.mean_square[:, keep, :].sum(axis=2)  # (S, K)
        lv, _, refs = self.nominal.level_array()
        cols: dict[str, Any] = {
            "subsystem": [m.names[i] for i in keep],
            "level_ref": [refs[i] for i in keep],
            "nominal_dB": levels.level_sum(lv[keep], axis=1),
        }
        for p, v in zip(percentiles, np.percentile(tot, list(percentiles), axis=0), strict=True):
            cols[f"p{p:g}_dB"] = db(v)
        return pd.DataFrame(cols)


# -- the driver ---------------------------------------------------------------------------


def spread(
    data: Mapping[str, Any],
    *,
    file: str = "<data>",
    base_dir: str | Path = ".",
    samples: int = 1000,
    seed: int = 0,
    progress: bool | None = None,
    chunk: int = 500,
    uncertain: list[Uncertain] | None = None,
    force_rebuild: bool = False,
) -> Spread:
    """Monte Carlo spread of every level from the ``[uncertainty]`` section of ``data``.

    Parameters
    ----------
    data : mapping
        Parsed model file (not changed).
    file, base_dir :
        For messages and relative CSV paths.
    samples : int
        Number of samples (>= 1).
    seed : int
        Seed of :func:`numpy.random.default_rng`; the same seed gives the same samples.
    progress : bool, optional
        Show a progress bar on stderr (default: when stderr is a terminal).
    chunk : int
        Samples per batch of the vectorised route (memory: chunk * N^2 * 8 bytes).
    uncertain : list of Uncertain, optional
        Spreads to use instead of the file's section.
    force_rebuild : bool
        Rebuild every sample through the model reader even when direct sampling would do
        (for testing both routes agree).

    Returns
    -------
    Spread
    """
    if samples < 1:
        raise InputError([Problem(file, "--samples", f"must be >= 1, got {samples}")])
    records = Records()
    model = build(data, file=file, base_dir=base_dir, records=records)
    unc = list(model.uncertainty) if uncertain is None else uncertain
    if not unc:
        raise InputError(
            [Problem(file, "uncertainty", "no [uncertainty.NAME] tables: nothing to vary")]
        )
    nominal = Result(model, core_solve(model))
    rng = np.random.default_rng(seed)
    draws = [u.draw(rng, samples) for u in unc]
    if progress is None:
        progress = sys.stderr.isatty()
    bar = _Progress(samples, bool(progress))
    targets = [_direct_target(data, model, u.parameter) for u in unc]
    n = len(model.subsystems)
    offsets = np.array([level_offset(model, i) for i in range(n)])
    if not force_rebuild and all(t is not None for t in targets):
        _check_direct(model, unc, targets, file)
        asm = assemble(model)
        nf = int((~asm.held).sum())
        if nf <= min(DENSE_LIMIT, ITERATIVE_ABOVE):
            q = _run_dense(model, unc, targets, draws, asm, chunk, bar, batched_dense)
            method = "direct (batched dense)"
        elif nf <= DENSE_LIMIT:
            q = _run_dense(model, unc, targets, draws, asm, chunk, bar, batched_sparse)
            method = "direct (batched sparse)"
        else:
            q = _run_sparse(model, unc, targets, draws, bar)
            method = "direct (sparse per sample)"
        q = q * db_to_ratio(offsets[None, :, None])
    else:
        q = _run_rebuild(data, model, unc, draws, file, base_dir, bar, records)
        method = "rebuild per sample"
    sinks = np.array([s.sink for s in model.subsystems])
    q[:, sinks, :] = 0.0
    return Spread(model, nominal, q, unc, seed, method)


def _check_direct(
    model: Model, unc: list[Uncertain], targets: list[tuple[str, int] | None], file: str
) -> None:
    problems = []
    for u, t in zip(unc, targets, strict=True):
        assert t is not None
        if u.distribution == "normal":
            assert u.sd is not None
            base = _base_array(model, t)
            if np.min(base) - 4.75 * u.sd <= 0:
                problems.append(
                    Problem(
                        file,
                        f"uncertainty.{u.name}.sd",
                        f"{u.sd:g} would draw values <= 0 for {u.parameter!r} (more than 1e-6 "
                        "of samples); use distribution = 'lognormal'",
                    )
                )
        if u.low is not None and u.low <= 0:
            problems.append(
                Problem(file, f"uncertainty.{u.name}.low", f"must be > 0 for {u.parameter!r}")
            )
    if problems:
        raise InputError(problems)


def _base_array(model: Model, t: tuple[str, int]) -> Array:
    kind, i = t
    if kind == "damping":
        return np.asarray(model.subsystems[i].damping)
    if kind == "modal_density":
        return np.asarray(model.subsystems[i].modal_density)
    if kind == "eta_ab":
        return np.asarray(model.connections[i].coupling_loss_factor)
    p = model.excitations[i].power
    assert p is not None
    return np.asarray(p)


def _samples_of(base: Array, s: int) -> Array:
    """``s`` copies of ``base`` (K, B) as an (s, K, B) view of band-major memory (B, K, s):
    the batched solves read every band's samples as one contiguous block."""
    out = np.empty((base.shape[1], base.shape[0], s))
    out[...] = base.T[:, :, None]
    return out.transpose(2, 1, 0)


def _run_dense(
    model: Model,
    unc: list[Uncertain],
    targets: list[tuple[str, int] | None],
    draws: list[Array],
    asm: Any,
    chunk: int,
    bar: _Progress,
    batched: Callable[..., Array],
) -> Array:
    n, nb = asm.shape
    ns = draws[0].size
    base_damp = np.vstack([s.damping for s in model.subsystems])
    base_modal = np.vstack([s.modal_density for s in model.subsystems])
    base_eta = (
        np.vstack([c.coupling_loss_factor for c in model.connections])
        if model.connections
        else np.zeros((0, nb))
    )
    exc_sub = model.index()
    out = np.empty((ns, n, nb))
    for start in range(0, ns, chunk):
        stop = min(ns, start + chunk)
        s = stop - start
        damp, modal, eta = _samples_of(base_damp, s), _samples_of(base_modal, s), _samples_of(
            base_eta, s
        )
        exc_power = [
            np.broadcast_to(e.power, (s, nb)).copy() if e.power is not None else None
            for e in model.excitations
        ]
        for u, t, d in zip(unc, targets, draws, strict=True):
            assert t is not None
            kind, i = t
            dd = d[start:stop, None]
            if kind == "damping":
                damp[:, i] = u.apply(damp[:, i], dd)
            elif kind == "modal_density":
                modal[:, i] = u.apply(modal[:, i], dd)
            elif kind == "eta_ab":
                eta[:, i] = u.apply(eta[:, i], dd)
            else:
                p = exc_power[i]
                assert p is not None
                exc_power[i] = u.apply(p, dd)
        power = _samples_of(np.zeros((n, nb)), s)
        for e, p in zip(model.excitations, exc_power, strict=True):
            if p is not None:
                power[:, exc_sub[e.subsystem]] += p
        out[start:stop] = batched(model, damp, modal, eta, power, asm.held, asm.held_energy)
        bar.update(stop)
    return out


def _sampled_model(
    model: Model, unc: list[Uncertain], targets: list[tuple[str, int] | None], d: list[float]
) -> Model:
    subs = list(model.subsystems)
    cons = list(model.connections)
    exs = list(model.excitations)
    for u, t, x in zip(unc, targets, d, strict=True):
        assert t is not None
        kind, i = t
        dx = np.asarray(x)
        if kind == "damping":
            subs[i] = replace(subs[i], damping=u.apply(np.asarray(subs[i].damping), dx))
        elif kind == "modal_density":
            subs[i] = replace(
                subs[i], modal_density=u.apply(np.asarray(subs[i].modal_density), dx)
            )
        elif kind == "eta_ab":
            cons[i] = replace(
                cons[i], coupling_loss_factor=u.apply(np.asarray(cons[i].coupling_loss_factor), dx)
            )
        else:
            p = exs[i].power
            assert p is not None
            exs[i] = replace(exs[i], power=u.apply(np.asarray(p), dx))
    return replace(model, subsystems=tuple(subs), connections=tuple(cons), excitations=tuple(exs))


def _run_sparse(
    model: Model,
    unc: list[Uncertain],
    targets: list[tuple[str, int] | None],
    draws: list[Array],
    bar: _Progress,
) -> Array:
    ns = draws[0].size
    out = np.empty((ns, len(model.subsystems), len(model.bands)))
    for k in range(ns):
        m = _sampled_model(model, unc, targets, [float(d[k]) for d in draws])
        out[k] = core_solve(m).energy
        bar.update(k + 1)
    return out


def _changer(u: Uncertain, x: float) -> Callable[[Array], Array]:
    def change(v: Array) -> Array:
        return np.asarray(u.apply(v, np.asarray(x)), dtype=float)

    return change


def _balance_arrays(m: Model) -> tuple[Array, Array, Array, Array, Any, Array]:
    """Damping, modal densities (N, B), stated coupling loss factors (C, B), input powers,
    held subsystems and held energies of a model, as :func:`seatool.solve.assemble` reads
    them (the arrays the batched solves take)."""
    damping = np.array([s.damping for s in m.subsystems], dtype=float)
    modal = np.array([s.modal_density for s in m.subsystems], dtype=float)
    eta = (
        np.array([c.coupling_loss_factor for c in m.connections], dtype=float)
        if m.connections
        else np.zeros((0, len(m.bands)))
    )
    held, held_energy, power = drives(m)
    return damping, modal, eta, power, held, held_energy


def _run_rebuild(
    data: Mapping[str, Any],
    model: Model,
    unc: list[Uncertain],
    draws: list[Array],
    file: str,
    base_dir: str | Path,
    bar: _Progress,
    records: Records,
) -> Array:
    """Energies times level offsets (S, N, B) of models rebuilt sample by sample.

    Each sample's model is rebuilt through the reader with ``records`` (only the tables
    whose inputs changed are derived again: :class:`seatool.kinds.records.Records`). Samples
    with the nominal model's structure (same connections, same held subsystems and held
    energies) are solved together at the end by the stacked dense solves of the direct
    route when the model is small enough; others one by one by :func:`seatool.solve.solve`.
    """
    ns = draws[0].size
    n, nb = len(model.subsystems), len(model.bands)
    _, _, _, _, held0, held_energy0 = _balance_arrays(model)
    links0 = [(c.a, c.b) for c in model.connections]
    stack = int((~held0).sum()) <= min(DENSE_LIMIT, ITERATIVE_ABOVE)
    out = np.empty((ns, n, nb))
    offsets = np.empty((ns, n))
    nc = len(model.connections)
    damp, modal, power = (_samples_of(np.zeros((n, nb)), ns) for _ in range(3))
    eta = _samples_of(np.zeros((nc, nb)), ns)
    batch: list[int] = []
    for k in range(ns):
        d = with_values(
            data,
            [(u.parameter, _changer(u, float(dr[k]))) for u, dr in zip(unc, draws, strict=True)],
        )
        try:
            m = build(d, file=file, base_dir=base_dir, records=records)
        except InputError as exc:
            first = exc.problems[0] if exc.problems else ""
            raise InputError(
                [Problem(file, "uncertainty", f"sample {k + 1} is not a valid model: {first}")]
            ) from None
        if m.names != model.names:
            raise InputError(
                [Problem(file, "uncertainty", f"sample {k + 1} changes the set of subsystems")]
            )
        offsets[k] = [level_offset(m, i) for i in range(n)]
        arrays = _balance_arrays(m)
        same = (
            stack
            and [(c.a, c.b) for c in m.connections] == links0
            and bool(np.array_equal(arrays[4], held0))
            and bool(np.array_equal(arrays[5], held_energy0))
        )
        if same:
            damp[k], modal[k], eta[k], power[k] = arrays[:4]
            batch.append(k)
        else:
            out[k] = core_solve(m).energy
        bar.update(k + 1)
    if batch:
        rows = np.array(batch)
        out[rows] = batched_dense(
            model, damp[rows], modal[rows], eta[rows], power[rows], held0, held_energy0
        )
    return out * db_to_ratio(offsets[:, :, None])


def spread_file(path: str | Path, **kwargs: Any) -> Spread:
    """:func:`spread` of a model file (its ``[uncertainty]`` section)."""
    data, file, base = read_data(path)
    return spread(data, file=file, base_dir=base, **kwargs)

