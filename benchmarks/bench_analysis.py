"""Benchmark: cost of the analyses against one solve, on synthetic models.

* Sensitivities: all adjoint sensitivities of one receiver (every damping and coupling
  loss factor, modal density and input power, all bands) of a 1,000-subsystem model,
  against one :func:`seatool.solve.solve` of the same model, measured in the same run.
  Target: no more than 3x one solve.
* Monte Carlo: 10,000 samples of a 100-subsystem model with loss-factor spreads (the
  damping of every subsystem and 20 coupling loss factors, lognormal), direct batched
  route. Target: under a minute on 2 cores.

Models from ``benchmarks/bench_solve.py``'s ``model_text(n)`` (synthetic values: a
benchmark, not physics). Run: ``python benchmarks/bench_analysis.py [--repeat 3]``.
"""

from __future__ import annotations

import argparse
import os
import sys
import time
import tomllib
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from bench_solve import model_text

from seatool.analysis.sensitivity import sensitivities
from seatool.analysis.uncertainty import spread
from seatool.modelfile import build
from seatool.solve import solve


def best(fn, repeat: int) -> float:  # type: ignore[no-untyped-def]
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--samples", type=int, default=10000)
    args = ap.parse_args()
    print(f"cores available: {os.cpu_count()}")

    data = tomllib.loads(model_text(1000))
    model = build(data)
    t_solve = best(lambda: solve(model), args.repeat)
    t_sens = best(lambda: sensitivities(model, "s500"), args.repeat)
    t = sensitivities(model, "s500")
    print(
        f"sensitivities, 1000 subsystems x {len(model.bands)} bands: {t['parameter'].nunique()} "
        f"parameters; solve {t_solve:.3f} s, all sensitivities {t_sens:.3f} s, "
        f"ratio {t_sens / t_solve:.2f} (target <= 3)"
    )

    data = tomllib.loads(model_text(100))
    unc = {}
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
    t0 = time.perf_counter()
    sp = spread(data, samples=args.samples, seed=0, progress=True)
    t_mc = time.perf_counter() - t0
    print(
        f"Monte Carlo, 100 subsystems x {len(sp.model.bands)} bands, {len(unc)} loss-factor "
        f"spreads: {sp.samples} samples in {t_mc:.1f} s ({sp.method}; target < 60 s)"
    )


if __name__ == "__main__":
    main()
