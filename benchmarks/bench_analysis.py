"""Benchmark: cost of the analyses against one solve of the same model, in the same run.

* Sensitivities: all adjoint sensitivities of one receiver (every damping and coupling
  loss factor, modal density and input power, all bands) against one
  :func:`seatool.solve.solve` of the same model, on the 3-D lattice of plates and cavities
  of ``bench_solve.py`` (10,000 subsystems by default) and on its random model.
  Target: no more than 3x one solve.
* Monte Carlo: samples of a 100-subsystem random model with loss-factor spreads (the
  damping of every subsystem and 20 coupling loss factors, lognormal), direct batched
  route; the cost per sample against one standalone solve, measured on a quiet machine
  and again while a background process keeps every core busy with multithreaded BLAS.
  Target: under 0.5x a solve per sample in both.

Times are process CPU time (``time.process_time``: what this process pays, whatever else
runs; ``--wall`` for wall-clock), the load average is printed with every figure.
Synthetic values (a benchmark, not physics). Run:
``python benchmarks/bench_analysis.py [--repeat 3] [--samples 10000] [--size 10000]``.
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import time
import tomllib
from collections.abc import Callable
from pathlib import Path
from typing import Any

sys.path.insert(0, str(Path(__file__).resolve().parent))

from bench_solve import lattice_model, model_text

from seatool.analysis.sensitivity import sensitivities
from seatool.analysis.uncertainty import spread
from seatool.modelfile import build
from seatool.solve import solve

BUSY = (
    "import numpy as np, time\n"
    "a = np.random.default_rng(0).random((1500, 1500))\n"
    "t = time.time()\n"
    "while time.time() - t < 600: a @ a\n"
)


CLOCK = time.process_time


def best(fn: Callable[[], Any], repeat: int) -> float:
    times = []
    for _ in range(repeat):
        t0 = CLOCK()
        fn()
        times.append(CLOCK() - t0)
    return min(times)


def load() -> str:
    return f"load average {os.getloadavg()[0]:.1f}"


def bench_sensitivities(name: str, model: Any, receiver: str, repeat: int) -> None:
    t_solve = best(lambda: solve(model), repeat)
    t_sens = best(lambda: sensitivities(model, receiver), repeat)
    t = sensitivities(model, receiver)
    print(
        f"sensitivities, {name}, {len(model.subsystems)} subsystems x {len(model.bands)} bands: "
        f"{t['parameter'].nunique()} parameters; solve {t_solve:.3f} s "
        f"({solve(model).method}), all sensitivities of {receiver} {t_sens:.3f} s, "
        f"ratio {t_sens / t_solve:.2f} (target <= 3); {load()}"
    )


def bench_monte_carlo(samples: int, repeat: int, busy: bool) -> None:
    data = tomllib.loads(model_text(100))
    unc: dict[str, Any] = {}
    for i in range(100):
        unc[f"d{i}"] = {
            "parameter": f"subsystems.s{i}.damping",
            "distribution": "lognormal",
            "factor": 1.5,
        }
    for k in range(20):
        unc[f"c{k}"] = {
            "parameter": f"connections.c{5 * k}.coupling_loss_factor",
            "distribution": "lognormal",
            "factor": 1.3,
        }
    data["uncertainty"] = unc
    model = build(data)
    proc = None
    if busy:
        proc = subprocess.Popen([sys.executable, "-c", BUSY])
        time.sleep(1.0)
    try:
        t_solve = best(lambda: solve(model), repeat)
        t0 = CLOCK()
        sp = spread(data, samples=samples, seed=0, progress=False)
        t_mc = CLOCK() - t0
        busy_load = load()
    finally:
        if proc is not None:
            proc.kill()
            proc.wait()
    per = t_mc / samples
    print(
        f"Monte Carlo ({'busy: a multithreaded BLAS process on every core' if busy else 'quiet'}),"
        f" 100 subsystems x {len(sp.model.bands)} bands, {len(unc)} loss-factor spreads: "
        f"{samples} samples in {t_mc:.2f} s ({sp.method}); {per * 1e3:.2f} ms per sample, "
        f"one solve {t_solve * 1e3:.2f} ms ({solve(model).method}): "
        f"{per / t_solve:.2f}x a solve per sample (target < 0.5); {busy_load}"
    )


def main() -> None:
    ap = argparse.ArgumentParser(description=(__doc__ or "").splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--samples", type=int, default=10000)
    ap.add_argument("--size", type=int, default=10000)
    ap.add_argument("--wall", action="store_true", help="wall-clock time instead of CPU time")
    args = ap.parse_args()
    global CLOCK
    if args.wall:
        CLOCK = time.perf_counter
    print(f"cores available: {os.cpu_count()}")
    bench_sensitivities("3-D lattice", lattice_model(args.size), f"s{args.size // 2 + 1}",
                        args.repeat)
    random_model = build(tomllib.loads(model_text(args.size)))
    bench_sensitivities("random", random_model, f"s{args.size // 2}", args.repeat)
    bench_monte_carlo(args.samples, args.repeat, busy=False)
    bench_monte_carlo(args.samples, args.repeat, busy=True)


if __name__ == "__main__":
    main()
