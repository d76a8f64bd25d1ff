"""Parameter sweeps: many rebuilds of a model file over key paths, one table of levels.

A sweep varies values of a model file named by their key paths
(``subsystems.floor.thickness``), rebuilds each sample through
:func:`seatool.modelfile.build` (validated like the file) and solves it. Its design is one
of:

* ``grid``: every combination of each parameter's values (``values``, or ``points``
  values from ``low`` to ``high``, evenly spaced or, with ``scale = "log"``, geometric);
* ``list``: the parameters' ``values`` taken together, row by row (equal lengths);
* ``lhs``: a Latin hypercube of ``samples`` points in the box ``[low, high]`` (McKay,
  Beckman & Conover 1979), from :class:`scipy.stats.qmc.LatinHypercube`;
* ``sobol``: the first ``samples`` points (a power of 2) of a scrambled Sobol' sequence
  (:class:`scipy.stats.qmc.Sobol`);
* ``saltelli``: Saltelli's sampling scheme for Sobol' indices (``samples`` base points, a
  power of 2, giving ``samples * (P + 2)`` rows), from SALib; :func:`sobol_indices`
  then estimates first-order and total indices of each receiver's A-weighted level;
* ``uncertainty``: ``samples`` Monte Carlo draws of the file's ``[uncertainty]`` section,
  the same draws as :func:`seatool.analysis.uncertainty.spread` for the same seed.

A parameter whose file value is a single number takes the sweep value; one whose file
value is a spectrum or an array is multiplied by it (a factor, column ``PATH:factor``).
With ``uncertainty``, a spectrum's column holds the standard variate (``PATH:variate``).

The result (:class:`Sweep`) is one row per evaluation: ``sample``, the parameters, then per
receiver its overall level ``RECEIVER.dB``, A-weighted level ``RECEIVER.dBA`` (sound
pressure receivers) and band levels ``RECEIVER.<band>Hz``, the 5 % and 95 % levels of
nominally identical builds of its overall levels ``RECEIVER.dB_p05``, ``RECEIVER.dB_p95``,
``RECEIVER.dBA_p05``, ``RECEIVER.dBA_p95`` (SEA ensemble variance of the sample,
:mod:`seatool.analysis.confidence`; left out with ``confidence=False``), and per target of
those receivers the smallest margin ``TARGET.margin`` (limit - level, positive = met) and
``TARGET.met``. The evaluations themselves run in :mod:`seatool.analysis.sweep_run`
(serially, on the local cores, or on a dask cluster): for a fixed seed the table is the
same whichever way it ran.
"""

from __future__ import annotations

import itertools
import math
import time
import warnings
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import numpy.typing as npt
import pandas as pd
from scipy.stats import qmc

from ..errors import InputError, Problem, closest
from ..levels import CAUTION
from ..metrics import METRICS
from ..model import Model, Uncertain
from ..modelfile import build
from ..outputs import output_file
from ..physics.variance import level_quantiles
from ..results import Result, csv_text, write_text_atomic
from ..solve import solve as core_solve
from ._keypath import read_data, resolve
from .sweep_run import Job, evaluate_rows, run
from .targets import margins_of_levels
from .variants import _receivers

__all__ = [
    "LOCAL_WORTH_S",
    "METHODS",
    "Design",
    "Parameter",
    "Sweep",
    "SweepSpec",
    "design",
    "read_spec",
    "saltelli_unit",
    "sobol_indices",
    "sobol_of",
    "sweep",
    "sweep_file",
    "write_table",
]

Array = npt.NDArray[np.float64]

#: Below this estimated work [s] (the first sample's time x samples) a ``local`` sweep
#: without a stated number of workers runs in this process: starting worker processes
#: and importing the program in each takes some seconds.
LOCAL_WORTH_S = 10.0

#: The designs a sweep can use.
METHODS = ("grid", "list", "lhs", "sobol", "saltelli", "uncertainty")
_SCALES = ("linear", "log")


@dataclass(frozen=True)
class Parameter:
    """One swept value of the model file: its key path and its range or values."""

    path: str
    low: float | None = None
    high: float | None = None
    values: tuple[float, ...] | None = None
    points: int = 5
    scale: str = "linear"


@dataclass(frozen=True)
class SweepSpec:
    """What to sweep and how: parameters, design, number of samples, seed, receivers."""

    parameters: tuple[Parameter, ...] = ()
    method: str = "lhs"
    samples: int = 64
    seed: int = 0
    receivers: tuple[str, ...] | None = None


@dataclass(frozen=True)
class Design:
    """The sample points: column names, how each enters the model, values (S, P)."""

    columns: tuple[str, ...]
    changes: tuple[tuple[str, str, Uncertain | None], ...]  # (path, mode, spread)
    values: Array
    spec: SweepSpec


# -- the design -----------------------------------------------------------------------------


def _unit_to_range(u: Array, p: Parameter) -> Array:
    assert p.low is not None and p.high is not None
    if p.scale == "log":
        return np.exp(np.log(p.low) + u * (np.log(p.high) - np.log(p.low)))
    return p.low + u * (p.high - p.low)


def _check_parameters(spec: SweepSpec, data: Mapping[str, Any], file: str) -> list[Problem]:
    problems = []
    if spec.method not in METHODS:
        problems.append(
            Problem(file, "method", f"unknown design {spec.method!r}; one of {', '.join(METHODS)}"
                    + closest(spec.method, METHODS))
        )  # fmt: skip
        return problems
    if spec.method != "grid" and spec.method != "list" and spec.samples < 1:
        problems.append(Problem(file, "samples", "must be >= 1"))
    if spec.method in ("sobol", "saltelli") and spec.samples & (spec.samples - 1):
        up = 2 ** math.ceil(math.log2(max(spec.samples, 1)))
        problems.append(
            Problem(file, "samples", f"{spec.method} needs a power of 2 (the sequence's "
                    f"balance); try {up // 2 if up > 1 else 1} or {up}")
        )  # fmt: skip
    if spec.method == "uncertainty":
        return problems
    if not spec.parameters:
        problems.append(Problem(file, "vary", "no parameter to vary; name a key path"))
    seen = set()
    for p in spec.parameters:
        where = f"vary.{p.path}"
        if p.path in seen:
            problems.append(Problem(file, where, "named twice"))
        seen.add(p.path)
        _, msg = resolve(data, p.path)
        if msg is not None:
            problems.append(Problem(file, where, msg))
        if p.scale not in _SCALES:
            problems.append(Problem(file, f"{where}.scale", "must be 'linear' or 'log'"))
        needs_values = spec.method == "list" or (spec.method == "grid" and p.low is None)
        if needs_values:
            if not p.values:
                problems.append(Problem(file, where, f"{spec.method} needs a list of values"))
            continue
        if p.low is None or p.high is None:
            problems.append(Problem(file, where, "needs low and high (the range to sample)"))
            continue
        if not p.low < p.high:
            problems.append(Problem(file, where, f"low {p.low:g} must be below high {p.high:g}"))
        if p.scale == "log" and p.low <= 0:
            problems.append(Problem(file, where, "a log scale needs low > 0"))
        if spec.method == "grid" and p.points < 2:
            problems.append(Problem(file, f"{where}.points", "must be >= 2"))
    if spec.method == "list" and not problems:
        lengths = {len(p.values or ()) for p in spec.parameters}
        if len(lengths) > 1:
            problems.append(Problem(file, "vary", "list: every parameter needs as many values"))
    return problems


def _columns(data: Mapping[str, Any], path: str) -> tuple[str, str]:
    value, _ = resolve(data, path)
    return (path, "set") if isinstance(value, int | float) else (f"{path}:factor", "factor")


def design(
    spec: SweepSpec, data: Mapping[str, Any], *, file: str = "<data>", base_dir: str | Path = "."
) -> Design:
    """The sample points of ``spec`` over parsed model data (InputError for a bad spec)."""
    problems = _check_parameters(spec, data, file)
    if problems:
        raise InputError(problems)
    if spec.method == "uncertainty":
        model = build(data, file=file, base_dir=base_dir)
        unc = list(model.uncertainty)
        if not unc:
            raise InputError(
                [Problem(file, "uncertainty", "no [uncertainty.NAME] tables: nothing to vary")]
            )
        rng = np.random.default_rng(spec.seed)
        draws = [u.draw(rng, spec.samples) for u in unc]  # as spread(): same seed, same draws
        cols: list[str] = []
        changes: list[tuple[str, str, Uncertain | None]] = []
        vals: list[Array] = []
        for u, d in zip(unc, draws, strict=True):
            base, _ = resolve(data, u.parameter)
            if isinstance(base, int | float):
                cols.append(u.parameter)
                changes.append((u.parameter, "set", None))
                vals.append(np.asarray(u.apply(np.asarray(float(base)), d), dtype=float))
            else:
                cols.append(f"{u.parameter}:variate")
                changes.append((u.parameter, "spread", u))
                vals.append(d)
        return Design(tuple(cols), tuple(changes), np.column_stack(vals), spec)
    ps = spec.parameters
    n = len(ps)
    if spec.method == "grid":
        axes = []
        for p in ps:
            if p.low is None:
                axes.append(np.asarray(p.values, dtype=float))
            else:
                assert p.high is not None
                f = np.geomspace if p.scale == "log" else np.linspace
                axes.append(f(p.low, p.high, p.points))
        values = np.array(list(itertools.product(*axes)), dtype=float).reshape(-1, n)
    elif spec.method == "list":
        values = np.column_stack([np.asarray(p.values, dtype=float) for p in ps])
    elif spec.method in ("lhs", "sobol"):
        gen: qmc.QMCEngine = (
            qmc.LatinHypercube(n, rng=spec.seed)
            if spec.method == "lhs"
            else qmc.Sobol(n, scramble=True, rng=spec.seed)
        )
        unit = gen.random(spec.samples)
        values = np.column_stack([_unit_to_range(unit[:, k], p) for k, p in enumerate(ps)])
    else:
        unit = saltelli_unit(n, spec.samples, spec.seed)
        values = np.column_stack([_unit_to_range(unit[:, k], p) for k, p in enumerate(ps)])
    cols_modes = [_columns(data, p.path) for p in ps]
    return Design(
        tuple(c for c, _ in cols_modes),
        tuple((p.path, m, None) for p, (_, m) in zip(ps, cols_modes, strict=True)),
        values,
        spec,
    )


def _salib_problem(n: int) -> dict[str, Any]:
    return {"num_vars": n, "names": [f"x{k}" for k in range(n)], "bounds": [[0.0, 1.0]] * n}


# -- the result -----------------------------------------------------------------------------


@dataclass(frozen=True)
class Sweep:
    """A sweep's evaluations.

    Attributes
    ----------
    design : Design
    model : Model
        The nominal model (the file as it is).
    receivers : list of str
    levels : ndarray (S, R, B)
        Band levels of each receiver for every sample [dB re its reference].
    references : list of str
        The level reference of each receiver (``dB re 20 uPa`` ...).
    overall_variance : ndarray (S, R, 2), optional
        Relative variance of each receiver's unweighted and A-weighted overall energy over
        nominally identical builds (SEA ensemble variance), per sample; None without
        confidence.
    """

    design: Design
    model: Model
    receivers: list[str]
    levels: Array
    references: list[str]
    quantities: list[str] = field(default_factory=list)
    overall_variance: Array | None = None

    @property
    def samples(self) -> int:
        return int(self.levels.shape[0])

    def overall(self, receiver: str, metric: str = "dBA") -> Array:
        """Overall ``metric`` (``dB``, ``dBA``...) of ``receiver`` for every sample."""
        k = self.receivers.index(receiver)
        return np.asarray(METRICS[metric](self.levels[:, k], self.model.bands).value, float)

    def table(self) -> pd.DataFrame:
        """One row per evaluation: sample, parameters, levels, margins (module notes)."""
        cols: dict[str, Any] = {"sample": np.arange(self.samples)}
        for k, c in enumerate(self.design.columns):
            cols[c] = self.design.values[:, k]
        bands = self.model.bands
        for k, r in enumerate(self.receivers):
            cols[f"{r}.dB"] = self.overall(r, "dB")
            pressure = self.quantities[k] == "sound_pressure" if self.quantities else True
            cols[f"{r}.dBA"] = self.overall(r, "dBA") if pressure else np.nan
            for j, hz in enumerate(bands.nominal):
                cols[f"{r}.{hz:g}Hz"] = self.levels[:, k, j]
            if self.overall_variance is not None:
                for w, metric in enumerate(("dB", "dBA")):
                    q = level_quantiles(self.overall_variance[:, k, w], [0.05, 0.95])
                    for p, name in enumerate(("p05", "p95")):
                        cols[f"{r}.{metric}_{name}"] = cols[f"{r}.{metric}"] + q[:, p]
        for t in self.model.targets:
            if t.receiver in self.receivers:
                m = margins_of_levels(self.levels[:, self.receivers.index(t.receiver)], bands, t)
                cols[f"{t.name}.margin"] = m.smallest
                cols[f"{t.name}.met"] = m.met
        return pd.DataFrame(cols)


def saltelli_unit(n: int, base: int, seed: int) -> Array:
    """Saltelli's sampling scheme on the unit cube [0, 1]^n: ``base * (n + 2)`` rows.

    Rows come in blocks of ``n + 2``: A, then A with column i from B (i = 1..n), then B,
    A and B being two scrambled Sobol' sequences (SALib ``sample.sobol``, no second-order
    terms). ``base`` must be a power of 2.

    References
    ----------
    Saltelli, A. et al. (2010). Variance based sensitivity analysis of model output. Design
    and estimator for the total sensitivity index. Computer Physics Communications 181(2),
    259-270, section 3. Herman, J. & Usher, W. (2017). SALib: An open-source Python library
    for sensitivity analysis. Journal of Open Source Software 2(9), 97.
    """
    from SALib.sample import sobol as salib_sample  # optional heavy dependency, used here only

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", FutureWarning)
        u = salib_sample.sample(_salib_problem(n), base, calc_second_order=False, seed=seed)
    return np.asarray(u, dtype=float)


def sobol_of(y: npt.ArrayLike, n: int, seed: int) -> dict[str, Array]:
    """First-order (S1) and total (ST) Sobol' indices of outputs ``y`` of a
    :func:`saltelli_unit` design over ``n`` inputs, with bootstrap 95 % confidence
    half-widths (``S1_conf``, ``ST_conf``; resampled with ``seed``).

    Notes
    -----
    S1_i = V[E(Y|X_i)] / V(Y) and ST_i = E[V(Y|X_~i)] / V(Y), estimated with Saltelli's
    (2010, table 2 (b)) estimator for S1 and Jansen's (1999; Saltelli 2010, table 2 (f))
    for ST, as implemented by SALib (``analyze.sobol``).

    References
    ----------
    Saltelli, A. et al. (2010), see :func:`saltelli_unit`. Jansen, M. J. W. (1999).
    Analysis of variance designs for model output. Computer Physics Communications
    117(1-2), 35-43. Herman & Usher (2017), see :func:`saltelli_unit`.
    """
    from SALib.analyze import sobol as salib_analyze  # optional heavy dependency

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", FutureWarning)
        si = salib_analyze.analyze(
            _salib_problem(n), np.asarray(y, dtype=float), calc_second_order=False, seed=seed
        )
    return {k: np.asarray(si[k], dtype=float) for k in ("S1", "S1_conf", "ST", "ST_conf")}


def sobol_indices(result: Sweep, metric: str = "dBA") -> pd.DataFrame:
    """First-order and total Sobol' indices (:func:`sobol_of`) of each receiver's overall
    level ``metric`` over a ``saltelli`` sweep (``dB`` for a receiver that is not a sound
    pressure, whose weighted levels are not defined).

    Returns
    -------
    DataFrame
        ``receiver, metric, parameter, S1, S1_conf, ST, ST_conf``.
    """
    d = result.design
    if d.spec.method != "saltelli":
        raise InputError(
            [Problem(result.model.source, "method", "Sobol' indices need method = 'saltelli'")]
        )
    rows = []
    for k_r, r in enumerate(result.receivers):
        q = result.quantities[k_r] if result.quantities else "sound_pressure"
        used = "dB" if metric != "dB" and q != "sound_pressure" else metric
        si = sobol_of(result.overall(r, used), len(d.columns), d.spec.seed)
        for k, c in enumerate(d.columns):
            rows.append([r, used, c, si["S1"][k], si["S1_conf"][k], si["ST"][k], si["ST_conf"][k]])
    return pd.DataFrame(
        rows, columns=["receiver", "metric", "parameter", "S1", "S1_conf", "ST", "ST_conf"]
    )


def write_table(result: Sweep, path: str | Path) -> Path:
    """Write :meth:`Sweep.table` atomically as Parquet (``.parquet``) or CSV (otherwise).

    The caution and each receiver's level reference travel with the numbers: CSV as ``#``
    lines before the header (``pandas.read_csv(path, comment="#")``), Parquet in the schema
    metadata (keys ``seatool.caution`` and ``seatool.levels``).
    """
    out = Path(path)
    refs = "; ".join(f"{r}: {q}" for r, q in zip(result.receivers, result.references, strict=True))
    table = result.table()
    if out.suffix.lower() != ".parquet":
        text = csv_text(table)
        head, _, rest = text.partition("\n")
        write_text_atomic(out, f"{head}\n# levels: {refs}\n{rest}")
        return out
    import pyarrow as pa  # optional heavy dependency, used here only
    import pyarrow.parquet as pq

    tab = pa.Table.from_pandas(table, preserve_index=False)
    meta = dict(tab.schema.metadata or {})
    meta[b"seatool.caution"] = CAUTION.encode()
    meta[b"seatool.levels"] = refs.encode()
    tab = tab.replace_schema_metadata(meta)
    with output_file(out) as tmp:
        pq.write_table(tab, tmp)
    return out


# -- the driver -----------------------------------------------------------------------------


def sweep(
    data: Mapping[str, Any],
    spec: SweepSpec,
    *,
    file: str = "<data>",
    base_dir: str | Path = ".",
    scheduler: Any = "local",
    workers: int | None = None,
    batch: int | None = None,
    on_batch: Callable[[int, int], None] | None = None,
    confidence: bool = True,
) -> Sweep:
    """Evaluate a sweep of parsed model data (not changed).

    Parameters
    ----------
    data : mapping
        Parsed model file.
    spec : SweepSpec
    file, base_dir :
        For messages and relative paths inside the model file.
    scheduler : {'serial', 'local'}, str or distributed.Client
        ``serial``: in this process. ``local`` (default): a dask ``LocalCluster`` of
        ``workers`` processes on 127.0.0.1 (this machine's cores), started and stopped
        here; without ``workers``, a sweep whose first sample suggests less than
        :data:`LOCAL_WORTH_S` of work in all runs serially instead. An address (``tcp://host:8786``)
        or a ``Client``: an existing dask.distributed cluster.
    workers : int, optional
        Worker processes of the local cluster (default: the number of cores).
    batch : int, optional
        Evaluations per task (default: enough for about four tasks per worker, at most
        500).
    on_batch : callable, optional
        Called with (batches done, batches) as results arrive (progress, tests).
    confidence : bool, optional
        Add the 5 % and 95 % levels of each receiver's overall levels over nominally
        identical builds (default True; costs about a third of a rebuild and solve).
    """
    model = build(data, file=file, base_dir=base_dir)
    dsg = design(spec, data, file=file, base_dir=base_dir)
    receivers = _receivers(model, spec.receivers)
    if not receivers:
        raise InputError([Problem(file, "receivers", "the model has no receiver to report")])
    nominal = Result(model, core_solve(model))
    _, quantity, refs = nominal.level_array()
    idx = [model.names.index(r) for r in receivers]
    job = Job(
        dict(data), file, str(base_dir), dsg.columns, dsg.changes, tuple(receivers), confidence
    )
    if len(dsg.values):  # the first sample in this process: a bad design fails before any cluster
        t0 = time.perf_counter()
        evaluate_rows(job, 0, dsg.values[:1])
        guess = (time.perf_counter() - t0) * len(dsg.values)
        if scheduler == "local" and workers is None and guess < LOCAL_WORTH_S:
            scheduler = "serial"  # quicker than starting the worker processes
    out = run(job, dsg.values, scheduler=scheduler, workers=workers, batch=batch, on_batch=on_batch)
    return Sweep(
        dsg,
        model,
        receivers,
        out[..., :-2],
        [refs[i] for i in idx],
        [quantity[i] for i in idx],
        out[..., -2:] if confidence else None,
    )


def sweep_file(path: str | Path, spec: SweepSpec, **kwargs: Any) -> Sweep:
    """:func:`sweep` of a model file."""
    data, file, base = read_data(path)
    return sweep(data, spec, file=file, base_dir=base, **kwargs)


def read_spec(path: str | Path) -> SweepSpec:
    """A sweep file (TOML): ``method``, ``samples``, ``seed``, ``receivers`` and
    ``[vary."KEY.PATH"]`` tables with ``low``/``high`` (``points``, ``scale``) or ``values``.
    """
    data, file, _ = read_data(path)
    problems = []
    known = {"method", "samples", "seed", "receivers", "vary"}
    for k in data:
        if k not in known:
            problems.append(Problem(file, k, "unknown key" + closest(k, known)))
    params = []
    vary = data.get("vary", {})
    if not isinstance(vary, Mapping):
        problems.append(Problem(file, "vary", 'must be tables: [vary."KEY.PATH"]'))
        vary = {}
    for name, t in vary.items():
        if not isinstance(t, Mapping):
            problems.append(Problem(file, f"vary.{name}", "must be a table (low, high or values)"))
            continue
        extra = set(t) - {"low", "high", "values", "points", "scale"}
        for k in sorted(extra):
            problems.append(Problem(file, f"vary.{name}.{k}", "unknown key"
                                    + closest(k, ["low", "high", "values", "points", "scale"])))  # fmt: skip
        try:
            params.append(
                Parameter(
                    name,
                    None if t.get("low") is None else float(t["low"]),
                    None if t.get("high") is None else float(t["high"]),
                    None if t.get("values") is None else tuple(float(v) for v in t["values"]),
                    int(t.get("points", 5)),
                    str(t.get("scale", "linear")),
                )
            )
        except (TypeError, ValueError):
            problems.append(
                Problem(file, f"vary.{name}", "low, high, values and points must be numbers")
            )
    rec = data.get("receivers")
    for key in ("samples", "seed"):
        if key in data and (isinstance(data[key], bool) or not isinstance(data[key], int)):
            problems.append(Problem(file, key, "must be a whole number"))
    if "method" in data and not isinstance(data["method"], str):
        problems.append(Problem(file, "method", f"must be one of {', '.join(METHODS)}"))
    if rec is not None and (not isinstance(rec, list) or not all(isinstance(r, str) for r in rec)):
        problems.append(Problem(file, "receivers", 'must be a list of names, e.g. ["cab_air"]'))
    if problems:
        raise InputError(problems)
    return SweepSpec(
        tuple(params),
        str(data.get("method", "lhs")),
        int(data.get("samples", 64)),
        int(data.get("seed", 0)),
        None if rec is None else tuple(rec),
    )
