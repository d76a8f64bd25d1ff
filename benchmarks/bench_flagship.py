"""Benchmark: derive and solve the flagship demo (models/wheelhouse.toml, 54 subsystems).

Times, best of ``--repeat``, in one run:

* derive: reading the model file and deriving every modal density and loss factor from
  the materials and dimensions (:func:`seatool.load`);
* solve: :func:`seatool.solve.solve` (assembly, singular-group check, exact condition
  number per band, conservation check);
* floor: the plainest alternative for the solve, ``numpy.linalg.solve`` of the very same
  prebuilt dense per-band matrices (no checks); at 54 unknowns dense is the fastest way;
* report: ``seatool report`` from the file to the written HTML and JSON (everything).

Run: ``python benchmarks/bench_flagship.py [--repeat 3]``.
"""

from __future__ import annotations

import argparse
import tempfile
import time
from pathlib import Path

import numpy as np

import seatool
from seatool.physics.memo import clear as clear_memo
from seatool.report import write_report
from seatool.solve import assemble, solve

MODEL = Path(__file__).resolve().parent.parent / "models" / "wheelhouse.toml"


def best(fn, repeat: int, before=None) -> float:  # type: ignore[no-untyped-def]
    times = []
    for _ in range(repeat):
        if before is not None:
            before()
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def dense_floor(model: seatool.Model) -> float:
    """Time of numpy.linalg.solve on the assembled per-band matrices (built beforehand)."""
    asm = assemble(model)
    n = len(model.subsystems)
    nb = len(model.bands)
    free = ~asm.held
    mats, rhs = [], []
    for j in range(nb):
        a = np.zeros((n, n))
        for c in range(len(asm.a)):
            i, k = asm.a[c], asm.b[c]
            a[i, k] -= asm.eta_ba[c, j]
            a[k, i] -= asm.eta_ab[c, j]
        np.fill_diagonal(a, asm.diag[:, j])
        a = a * model.bands.omega[j]
        mats.append(a[np.ix_(free, free)])
        rhs.append(np.ones(int(free.sum())))
    t = time.perf_counter()
    for a, b in zip(mats, rhs, strict=True):
        np.linalg.solve(a, b)
    return time.perf_counter() - t


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--repeat", type=int, default=3)
    args = p.parse_args()
    model = seatool.load(MODEL)
    t_derive = best(lambda: seatool.load(MODEL), args.repeat, before=clear_memo)
    t_warm = best(lambda: seatool.load(MODEL), args.repeat)
    t_solve = best(lambda: solve(model), args.repeat)
    t_floor = min(dense_floor(model) for _ in range(args.repeat))
    with tempfile.TemporaryDirectory() as d:
        out = Path(d) / "wheelhouse.html"
        t_report = best(
            lambda: write_report(MODEL, out, progress=False), args.repeat, before=clear_memo
        )
    print(f"{MODEL.name}: {len(model.subsystems)} subsystems, {len(model.connections)} "
          f"connections, {len(model.bands)} bands")  # fmt: skip
    print(f"derive (load) {t_derive:.3f} s (empty physics memo); repeated {t_warm:.3f} s")
    print(f"solve         {t_solve:.4f} s")
    print(f"floor (dense numpy.linalg.solve per band, no checks) {t_floor:.4f} s "
          f"-> solve / floor = {t_solve / t_floor:.1f}")  # fmt: skip
    print(f"report        {t_report:.2f} s")


if __name__ == "__main__":
    main()
