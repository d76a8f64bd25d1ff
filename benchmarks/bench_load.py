"""Benchmark: loading model files against the bare TOML parse, and a Monte Carlo rebuild.

* Shipped models: :func:`seatool.modelfile.load` of every file in ``models/`` (reading,
  validation and the derivation of every subsystem and coupling from materials and
  dimensions) against :func:`tomllib.load` of the same file. The line-junction results
  are remembered per process, so each timed load starts with an empty memo
  (:func:`seatool.physics.memo.clear`) -- a first load; a repeated load of the
  same file ("warm") is shown too.
* A generated 10,000-subsystem file (``benchmarks/bench_solve.py``'s ``model_text``:
  subsystems given by mass, modal density and damping, 20,000 given coupling loss
  factors; synthetic values) against :func:`tomllib.loads` of the same text.
  Goal: within 2x the bare parse.
* Monte Carlo with physical parameters on the rail cab: every sample rebuilds the model
  through the reader (:func:`seatool.analysis.uncertainty.spread`, route "rebuild per
  sample"). Per-sample time = (time of S2 samples - time of S1 samples)/(S2 - S1), so
  the nominal build and solve cancel; also the rebuild alone as `spread` does it (the
  unchanged tables' records taken over, :class:`seatool.kinds.records.Records`) and a
  full read of the changed file. Goal: under 10 ms per sample.

Every ratio is taken from timings in one run (best of ``--repeat``).
Run: ``python benchmarks/bench_load.py [--repeat 5] [--size 10000] [--cpu]``.
"""

from __future__ import annotations

import argparse
import os
import sys
import time
import tomllib
from collections.abc import Callable
from pathlib import Path
from typing import Any

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))

from bench_solve import model_text

from seatool import modelfile
from seatool.analysis._keypath import with_value, with_values
from seatool.analysis.uncertainty import Uncertain, spread
from seatool.kinds.records import Records

try:
    from seatool.physics.memo import clear as clear_memo
except ImportError:  # a tree without the memo (timing an older version)

    def clear_memo() -> None:
        pass


MODELS = Path(__file__).resolve().parent.parent / "models"

#: Physical-parameter spreads of the rail cab for the Monte Carlo timing (invented).
RAIL_CAB_SPREADS = {
    "floor thickness": [
        Uncertain("floor_h", "subsystems.floor.thickness", "uniform", tolerance=0.05)
    ],
    "roof thickness": [Uncertain("roof_h", "subsystems.roof.thickness", "uniform", tolerance=0.05)],
    "cab damping": [Uncertain("air", "subsystems.cab_air.damping.reverberation_time", "lognormal", factor=1.5)],
    "all plates + cab damping": [
        Uncertain(f"{s}_h", f"subsystems.{s}.thickness", "uniform", tolerance=0.05)
        for s in ("floor", "left_wall", "right_wall", "roof", "windscreen")
    ]
    + [Uncertain("air", "subsystems.cab_air.damping.reverberation_time", "lognormal", factor=1.5)],
}


#: Clock of every timing: wall time, or with ``--cpu`` the process CPU time (steadier on a
#: shared machine; everything timed here runs in one thread).
CLOCK: Callable[[], float] = time.perf_counter


def best(fn: Callable[[], Any], repeat: int, before: Callable[[], Any] | None = None) -> float:
    times = []
    for _ in range(repeat):
        if before is not None:
            before()
        t0 = CLOCK()
        fn()
        times.append(CLOCK() - t0)
    return min(times)


def shipped_models(repeat: int) -> None:
    print("Shipped models: seatool load (first, empty memo) and repeated, against tomllib")
    print(f"{'model':<24} {'tomllib ms':>10} {'load ms':>9} {'ratio':>7} {'warm ms':>8}")
    for path in sorted(MODELS.glob("*.toml")):
        modelfile.load(path)  # imports and first-use costs out of the way

        def parse(p: Path = path) -> None:
            with p.open("rb") as fh:
                tomllib.load(fh)

        t_toml = best(parse, repeat)
        t_load = best(lambda p=path: modelfile.load(p), repeat, before=clear_memo)
        t_warm = best(lambda p=path: modelfile.load(p), repeat)
        print(
            f"{path.name:<24} {1e3 * t_toml:>10.2f} {1e3 * t_load:>9.2f} "
            f"{t_load / t_toml:>7.1f} {1e3 * t_warm:>8.2f}"
        )


def generated(n: int, repeat: int) -> None:
    text = model_text(n)
    t_toml = best(lambda: tomllib.loads(text), repeat)
    t_load = best(lambda: modelfile.loads(text), repeat)
    print(
        f"\nGenerated file, {n} subsystems ({len(text) / 1e6:.1f} MB): tomllib {t_toml:.3f} s, "
        f"load {t_load:.3f} s, ratio {t_load / t_toml:.2f} (goal <= 2)"
    )


def monte_carlo(repeat: int, s1: int = 2, s2: int = 22) -> None:
    path = MODELS / "rail_cab.toml"
    with path.open("rb") as fh:
        data = tomllib.load(fh)
    print("\nRail cab Monte Carlo, rebuild per sample (memo kept between samples, as in use)")
    print(f"{'spread':<26} {'per sample ms':>13} {'rebuild only ms':>15} {'full read ms':>15}")
    rng = np.random.default_rng(1)
    for name, unc in RAIL_CAB_SPREADS.items():

        def run(ns: int, u: list[Uncertain] = unc) -> None:
            sp = spread(
                data, file=str(path), base_dir=MODELS, samples=ns, uncertain=u, progress=False
            )
            assert sp.method == "rebuild per sample", sp.method

        t1 = best(lambda: run(s1), repeat, before=clear_memo)
        t2 = best(lambda: run(s2), repeat, before=clear_memo)
        per_sample = (t2 - t1) / (s2 - s1)

        records = Records()

        def rebuild(u: list[Uncertain] = unc, records: Records = records) -> None:
            # the route of `spread`: changed copies along the changed paths, the records
            # of the unchanged tables taken over
            changes = []
            for x in u:
                z = float(x.draw(rng, 1)[0])
                changes.append((x.parameter, lambda v, x=x, z=z: x.apply(v, np.asarray(z))))
            d = with_values(data, changes)
            modelfile.build(d, file=str(path), base_dir=MODELS, records=records)

        def full(u: list[Uncertain] = unc) -> None:
            d: Any = data
            for x in u:
                z = float(x.draw(rng, 1)[0])
                d = with_value(d, x.parameter, lambda v, x=x, z=z: x.apply(v, np.asarray(z)))
            modelfile.build(d, file=str(path), base_dir=MODELS)

        modelfile.build(data, file=str(path), base_dir=MODELS, records=records)
        t_rebuild = best(rebuild, max(repeat, 10))
        t_full = best(full, max(repeat, 10))
        print(
            f"{name:<26} {1e3 * per_sample:>13.1f} {1e3 * t_rebuild:>15.1f} {1e3 * t_full:>15.1f}"
        )


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=5)
    ap.add_argument("--size", type=int, default=10000)
    ap.add_argument("--cpu", action="store_true", help="time process CPU instead of wall time")
    args = ap.parse_args()
    global CLOCK
    if args.cpu:
        CLOCK = time.process_time
    print(f"clock: {'process CPU' if args.cpu else 'wall'}; load average {os.getloadavg()[0]:.1f}")
    shipped_models(args.repeat)
    generated(args.size, args.repeat)
    monte_carlo(args.repeat)


if __name__ == "__main__":
    main()
