"""Running a sweep's evaluations: in this process, on the local cores or on a dask cluster.

The work is cut into batches of consecutive samples (many evaluations per task). The
model data and what to change (:class:`Job`) travel to each worker once: the job is the
result of one task that every batch depends on, copied to every worker before the batches
are placed (each worker receives it once and keeps it; unlike scattered data, the
scheduler can recompute it when a worker holding it is lost);
each task carries only its block of sample values and returns its block of
levels with its first sample number, so the table is put together by sample number: a
task retried after a lost worker replaces nothing and adds nothing, and serial, local and
distributed runs give the same numbers.

dask is imported only when a cluster is used.
"""

from __future__ import annotations

import os
import uuid
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np
import numpy.typing as npt

from .. import progress
from ..bands import BandAxis
from ..errors import InputError, Problem
from ..kinds.records import Records
from ..model import Uncertain
from ..modelfile import build
from ..results import Result
from ..solve import SolveError
from ..solve import solve as core_solve
from .confidence import overall_relative_variance, relative_variances

__all__ = ["Job", "evaluate_rows", "run"]

Array = npt.NDArray[np.float64]

#: Seconds to wait for a cluster to answer (connecting, starting workers).
CONNECT_TIMEOUT = 30.0
#: Largest default batch (evaluations per task).
MAX_BATCH = 500


@dataclass(frozen=True)
class Job:
    """What every evaluation shares: the parsed model data and what each column changes."""

    data: Mapping[str, Any]
    file: str
    base_dir: str
    columns: tuple[str, ...]
    changes: tuple[tuple[str, str, Uncertain | None], ...]
    receivers: tuple[str, ...]
    #: also return the relative variance of each receiver's overall energy (dB and dB(A))
    confidence: bool = False


def _changed(job: Job, row: Array) -> dict[str, Any]:
    """The job's data with one sample's values in place: the tables on the changed paths
    are copied, every other table is shared with ``job.data`` (read, never changed)."""
    out = dict(job.data)
    for (path, mode, unc), x in zip(job.changes, row, strict=True):
        *head, last = path.split(".")
        node: Any = out
        for part in head:
            node[part] = dict(node[part])
            node = node[part]
        old = node[last]
        if mode == "set":
            node[last] = float(x)
            continue
        vals = np.asarray(old["values"] if isinstance(old, Mapping) else old, dtype=float)
        new = vals * float(x) if mode == "factor" else np.asarray(unc.apply(vals, np.asarray(x)))  # type: ignore[union-attr]
        listed = [float(v) for v in np.ravel(new)]
        if isinstance(old, Mapping):
            node[last] = {**old, "values": listed}
        else:
            node[last] = listed
    return out


def _describe(job: Job, row: Array) -> str:
    return ", ".join(f"{c} = {x:g}" for c, x in zip(job.columns, row, strict=True))


def _overall_variances(res: Result, idx: list[int], lv: Array, bands: BandAxis) -> Array:
    """(R, 2): relative variances of the receivers' unweighted and A-weighted overall
    energies from the SEA ensemble variance of this sample."""
    r2 = relative_variances(res.model, res.energy)[idx]
    return np.stack(
        [overall_relative_variance(lv, r2, bands, w) for w in ("Z", "A")], axis=-1
    )


def evaluate_rows(job: Job, start: int, values: Array) -> tuple[int, Array]:
    """Levels (k, R, B + 2) of the receivers for samples ``start ... start + k - 1``.

    The first B entries of the last axis are the band levels; the last two are the
    relative variances of the overall unweighted and A-weighted energies (SEA ensemble
    variance, :func:`seatool.analysis.confidence.overall_relative_variance`), NaN unless
    ``job.confidence``.

    Raises InputError naming the first sample that is not a valid model (in this process;
    on a worker, :func:`_task` returns the problem as data, since an InputError does not
    survive pickling).
    """
    idx: list[int] | None = None
    out: Array | None = None
    records = Records()  # the tables a sample leaves unchanged are derived once per batch
    for k, row in enumerate(np.atleast_2d(values)):
        where = f"sample {start + k} ({_describe(job, row)})"
        try:
            m = build(_changed(job, row), file=job.file, base_dir=job.base_dir, records=records)
            res = Result(m, core_solve(m))
        except InputError as exc:
            first = exc.problems[0].message if exc.problems else str(exc)
            key = exc.problems[0].path if exc.problems else ""
            raise InputError(
                [Problem(job.file, key, f"{where} is not a valid model: {first}")]
            ) from None
        except SolveError as exc:
            raise InputError([Problem(job.file, "", f"{where} cannot be solved: {exc}")]) from None
        lv = res.level_array()[0]
        if idx is None:
            idx = [m.names.index(r) for r in job.receivers]
            out = np.full((len(values), len(idx), lv.shape[1] + 2), np.nan)
        assert out is not None
        out[k, :, :-2] = lv[idx]
        if job.confidence:
            out[k, :, -2:] = _overall_variances(res, idx, lv[idx], m.bands)
    assert out is not None
    return start, out


def _task(job: Job, start: int, values: Array) -> tuple[int, Array | list[str]]:
    """:func:`evaluate_rows` on a worker: a bad sample comes back as (start, [key, message])."""
    try:
        return evaluate_rows(job, start, values)
    except InputError as exc:
        p = exc.problems[0]
        return start, [p.path, p.message]


def _shared(job: Job) -> Job:
    """The job, as a task's result (see :func:`_run_dask`)."""
    return job


def _batches(n: int, batch: int) -> list[tuple[int, int]]:
    return [(s, min(n, s + batch)) for s in range(0, n, batch)]


def run(
    job: Job,
    values: Array,
    *,
    scheduler: Any = "local",
    workers: int | None = None,
    batch: int | None = None,
    on_batch: Callable[[int, int], None] | None = None,
) -> Array:
    """Levels (S, R, B + 2) of every sample row of ``values`` (S, P), as
    :func:`evaluate_rows`; see :func:`seatool.analysis.sweep.sweep` for the options."""
    n = len(values)
    if workers is not None and workers < 1:
        raise InputError([Problem(job.file, "--workers", "must be >= 1")])
    if batch is not None and batch < 1:
        raise InputError([Problem(job.file, "--batch", "must be >= 1")])
    nw = workers or os.cpu_count() or 1
    size = batch or max(1, min(MAX_BATCH, -(-n // (4 * nw))))
    blocks = _batches(n, size)
    if scheduler == "serial" or (scheduler == "local" and len(blocks) <= 1):
        return _run_serial(job, values, blocks, on_batch)
    return _run_dask(job, values, blocks, scheduler, nw, on_batch)


def _run_serial(
    job: Job,
    values: Array,
    blocks: list[tuple[int, int]],
    on_batch: Callable[[int, int], None] | None,
) -> Array:
    parts = []
    for done, (a, b) in enumerate(progress.bar(blocks, desc="sweep", total=len(blocks)), 1):
        parts.append(evaluate_rows(job, a, values[a:b])[1])
        if on_batch is not None:
            on_batch(done, len(blocks))
    return np.concatenate(parts)


def _client(scheduler: Any, workers: int) -> tuple[Any, Any, bool]:
    """(client, cluster or None, whether this function owns the client)."""
    from distributed import Client, LocalCluster  # optional heavy dependency

    if isinstance(scheduler, Client):
        return scheduler, None, False
    if scheduler == "local":
        cluster = LocalCluster(
            n_workers=workers,
            threads_per_worker=1,
            processes=True,
            host="127.0.0.1",
            dashboard_address="127.0.0.1:0",  # its status page: loopback, any free port
        )
        return Client(cluster, timeout=CONNECT_TIMEOUT), cluster, True
    try:
        return Client(str(scheduler), timeout=CONNECT_TIMEOUT), None, True
    except (OSError, TimeoutError, ValueError) as exc:
        raise InputError(
            [Problem("", "--scheduler", f"cannot reach a dask scheduler at {scheduler!r}: {exc}"
                     " (start one with `dask scheduler`, or leave --scheduler out to use this"
                     " machine)")]
        ) from None  # fmt: skip


def _run_dask(
    job: Job,
    values: Array,
    blocks: list[tuple[int, int]],
    scheduler: Any,
    workers: int,
    on_batch: Callable[[int, int], None] | None,
) -> Array:
    from distributed import as_completed  # optional heavy dependency

    client, cluster, owned = _client(scheduler, workers)
    token = uuid.uuid4().hex[:12]
    try:
        # The job is the result of a task (not scattered data): each worker fetches it once
        # and keeps it while its batches run, and if the worker holding it is lost the
        # scheduler recomputes it from the task instead of failing the run.
        shared = client.submit(_shared, job, key=f"sweep-{token}-model", pure=False)
        # A copy on every worker before the batches are placed: the scheduler puts a task
        # where its inputs are, so with one copy every batch would queue on one worker.
        client.replicate([shared])
        futures = [
            client.submit(
                _task, shared, a, values[a:b], key=f"sweep-{token}-{a}", retries=3, pure=False
            )
            for a, b in blocks
        ]
        where = {a: (a, b) for a, b in blocks}
        parts: dict[int, Array] = {}
        it = progress.bar(as_completed(futures), desc="sweep", total=len(blocks))
        for done, fut in enumerate(it, 1):
            start, out = fut.result()
            if isinstance(out, list):
                raise InputError([Problem(job.file, out[0], out[1])])
            if start in parts:
                raise RuntimeError(f"batch at sample {start} came back twice")
            a, b = where[start]
            if out.shape[0] != b - a:
                raise RuntimeError(f"batch at sample {start} has {out.shape[0]} rows, not {b - a}")
            parts[start] = out
            if on_batch is not None:
                on_batch(done, len(blocks))
    finally:
        if owned:
            client.close()
        if cluster is not None:
            cluster.close()
    missing = [a for a, _ in blocks if a not in parts]
    if missing:
        raise RuntimeError(f"batches at samples {missing} never came back")
    return np.concatenate([parts[a] for a, _ in blocks])
