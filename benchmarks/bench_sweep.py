"""Benchmark: a sweep of the rail cab over 5 physical parameters, serial and on dask.

The parameters (a Latin hypercube, seed 0; ranges invented for the demonstration): the
thicknesses of the floor, the left wall, the roof and the windscreen, and the cab air's
damping (log scale). Every evaluation rebuilds the model through the reader and solves it.

Timed in one run, on the same samples:

* ``serial``: :func:`seatool.analysis.sweep.sweep` with ``scheduler="serial"`` -- the
  plain loop (copy the data, rebuild, solve) in this process; wall and CPU time;
* ``pool(W)``: the best plain parallel alternative, :class:`multiprocessing.Pool` of W
  processes mapping the same batches (:func:`seatool.analysis.sweep_run.evaluate_rows`);
* ``dask(W)``: a ``LocalCluster`` of W single-threaded worker processes on 127.0.0.1,
  through the sweep's own dask route (batches, the model fetched once per worker); the
  cluster's start-up is timed apart, and each worker's CPU time is read before and after.

Throughput per core = evaluations / CPU seconds spent evaluating (steady on a shared
machine); scaling 1 -> 2 workers = wall(dask 1) / wall(dask 2). The time of 100,000
evaluations is extrapolated from the measured count (linear in the count: independent
batches) and labelled as such. The load average is printed: on a machine shared with
other work, wall-clock scaling says little.

Run: ``python benchmarks/bench_sweep.py [--samples 1000] [--batch 50] [--skip-pool]``.

``--full`` runs the issue's size as it is meant to be used: only the dask route on a
``LocalCluster`` of ``--workers`` processes over all ``--samples`` evaluations (default
100,000), no serial or pool run of the whole design; instead ``--check`` rows drawn at
random (seed 1) are evaluated serially in this process and must equal the cluster's rows
to 1e-12, and every sample index must be present exactly once.
"""

from __future__ import annotations

import argparse
import multiprocessing
import os
import time
from pathlib import Path
from typing import Any

import numpy as np

from seatool.analysis import sweep_run
from seatool.analysis._keypath import read_data
from seatool.analysis.sweep import Parameter, SweepSpec, design, sweep

MODEL = Path(__file__).resolve().parent.parent / "models" / "rail_cab.toml"
TARGET = 100_000

#: The five physical parameters (invented ranges around the file's values).
PARAMETERS = (
    Parameter("subsystems.floor.thickness", 0.004, 0.008),
    Parameter("subsystems.left_wall.thickness", 0.002, 0.004),
    Parameter("subsystems.roof.thickness", 0.002, 0.004),
    Parameter("subsystems.windscreen.thickness", 0.008, 0.016),
    Parameter("subsystems.cab_air.damping.reverberation_time", 0.15, 0.6, scale="log"),
)


def _load() -> str:
    one, five, _ = os.getloadavg()
    return f"load average {one:.1f} (1 min), {five:.1f} (5 min) on {os.cpu_count()} cores"


def _pool(job: Any, values: np.ndarray, batch: int, workers: int) -> tuple[np.ndarray, float]:
    blocks = [(a, values[a : a + batch]) for a in range(0, len(values), batch)]
    ctx = multiprocessing.get_context("spawn")
    with ctx.Pool(workers) as pool:
        pool.starmap(sweep_run.evaluate_rows, [(job, 0, values[:1])] * workers)  # warm imports
        t0 = time.perf_counter()
        out = pool.starmap(sweep_run.evaluate_rows, [(job, a, v) for a, v in blocks])
        wall = time.perf_counter() - t0
    return np.concatenate([o[1] for o in sorted(out, key=lambda x: x[0])]), wall


def _dask(
    data: Any, spec: SweepSpec, batch: int, workers: int, confidence: bool = True
) -> dict[str, float | np.ndarray]:
    from distributed import Client, LocalCluster

    t0 = time.perf_counter()
    with LocalCluster(
        n_workers=workers, threads_per_worker=1, processes=True, host="127.0.0.1",
        dashboard_address="127.0.0.1:0",
    ) as cluster, Client(cluster) as client:  # fmt: skip
        client.run(lambda: __import__("seatool.analysis.sweep"))  # imports, as pool warm-up
        start = time.perf_counter() - t0
        cpu0 = client.run(time.process_time)
        t1 = time.perf_counter()
        s = sweep(data, spec, scheduler=client, batch=batch, confidence=confidence)
        wall = time.perf_counter() - t1
        cpu = sum(client.run(time.process_time).values()) - sum(cpu0.values())
    return {"start": start, "wall": wall, "cpu": cpu, "levels": s.levels}


def full_run(samples: int, batch: int, workers: int, check: int, confidence: bool) -> None:
    """The whole design on dask only; a random subset re-evaluated serially."""
    data, file, base = read_data(MODEL)
    spec = SweepSpec(PARAMETERS, "lhs", samples, seed=0, receivers=("cab_air",))
    print(f"rail cab, 5 parameters, {samples:,} evaluations (Latin hypercube), batch {batch}, "
          f"dask({workers}) only, confidence columns {'on' if confidence else 'off'}")  # fmt: skip
    print(_load())
    r = _dask(data, spec, batch, workers, confidence)
    levels = np.asarray(r["levels"])
    assert levels.shape[0] == samples, f"{levels.shape[0]} rows for {samples} samples"
    dsg = design(spec, data, file=file, base_dir=base)
    job = sweep_run.Job(dict(data), file, str(base), dsg.columns, dsg.changes, ("cab_air",))
    rows = np.sort(
        np.random.default_rng(1).choice(samples, size=min(check, samples), replace=False)
    )
    diff = 0.0
    for i in rows:
        _, lv = sweep_run.evaluate_rows(job, int(i), dsg.values[i : i + 1])
        diff = max(diff, float(np.max(np.abs(lv[0][..., :-2] - levels[i]))))
    assert diff <= 1e-12, f"cluster rows differ from serial re-evaluation by {diff}"
    print(f"dask({workers})    wall {r['wall']:7.1f} s  worker cpu {r['cpu']:7.1f} s  "
          f"{samples / float(r['cpu']):6.1f} evaluations per CPU second  "
          f"{samples / float(r['wall']):6.1f} evaluations per wall second "
          f"(cluster start-up {r['start']:.1f} s)")  # fmt: skip
    print(f"rows {levels.shape[0]:,} (one per sample, in sample order); {len(rows)} random rows "
          f"re-evaluated serially: max |diff| {diff:.1e} dB")  # fmt: skip
    print(_load())


def main() -> None:
    ap = argparse.ArgumentParser(description=(__doc__ or "").splitlines()[0])
    ap.add_argument("--samples", type=int, default=None)
    ap.add_argument("--batch", type=int, default=50)
    ap.add_argument("--skip-pool", action="store_true")
    ap.add_argument("--full", action="store_true", help="dask only, all samples (default 100,000)")
    ap.add_argument("--workers", type=int, default=2, help="worker processes of --full")
    ap.add_argument("--check", type=int, default=200, help="rows re-evaluated serially (--full)")
    ap.add_argument(
        "--no-confidence", action="store_true", help="leave out the confidence columns (--full)"
    )
    args = ap.parse_args()
    if args.full:
        full_run(
            args.samples or TARGET, args.batch, args.workers, args.check, not args.no_confidence
        )
        return
    args.samples = args.samples or 1000
    data, file, base = read_data(MODEL)
    spec = SweepSpec(PARAMETERS, "lhs", args.samples, seed=0, receivers=("cab_air",))
    n = args.samples
    print(f"rail cab, 5 parameters, {n} evaluations (Latin hypercube), batch {args.batch}")
    print(_load())

    c0, t0 = time.process_time(), time.perf_counter()
    ser = sweep(data, spec, file=file, base_dir=base, scheduler="serial")
    s_wall, s_cpu = time.perf_counter() - t0, time.process_time() - c0
    print(f"serial     wall {s_wall:7.1f} s  cpu {s_cpu:7.1f} s  "
          f"{n / s_cpu:6.1f} evaluations per CPU second")  # fmt: skip

    dsg = design(spec, data, file=file, base_dir=base)
    job = sweep_run.Job(
        dict(data), file, str(base), dsg.columns, dsg.changes, ("cab_air",), confidence=True
    )
    walls: dict[str, float] = {}
    if not args.skip_pool:
        for w in (1, 2):
            lv, wall = _pool(job, dsg.values, args.batch, w)
            assert np.array_equal(lv[..., :-2], ser.levels), "pool differs from serial"
            walls[f"pool({w})"] = wall
            print(f"pool({w})    wall {wall:7.1f} s")
    for w in (1, 2):
        r = _dask(data, spec, args.batch, w)
        diff = float(np.max(np.abs(np.asarray(r["levels"]) - ser.levels)))
        assert diff <= 1e-12, f"dask({w}) differs from serial by {diff}"
        walls[f"dask({w})"] = float(r["wall"])
        print(f"dask({w})    wall {r['wall']:7.1f} s  worker cpu {r['cpu']:7.1f} s  "
              f"{n / float(r['cpu']):6.1f} evaluations per CPU second  "
              f"(cluster start-up {r['start']:.1f} s; max |diff| to serial {diff:.1e} dB)")  # fmt: skip
    print(_load())
    print()
    print(f"scaling 1 -> 2 workers (wall): dask {walls['dask(1)'] / walls['dask(2)']:.2f}x", end="")
    if "pool(1)" in walls:
        print(f", pool {walls['pool(1)'] / walls['pool(2)']:.2f}x", end="")
    print()
    per_core = n / s_cpu
    print(f"extrapolated, not measured: {TARGET:,} evaluations = {TARGET / per_core / 3600:.2f} "
          f"CPU hours at {per_core:.0f} per CPU second; "
          f"{TARGET / n * walls['dask(2)'] / 60:.0f} min wall on dask(2) at this load")  # fmt: skip


if __name__ == "__main__":
    main()
