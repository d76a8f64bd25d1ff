"""Benchmark: load, assembly and solve of synthetic SEA models against a bare sparse solve.

Builds random models of 100, 1,000 and 10,000 subsystems (about four connections per
subsystem, 1/3-octave bands 50 Hz - 10 kHz, synthetic values: a benchmark, not physics),
writes each as a model file, and times

* load: reading and validating the TOML file,
* assemble + solve: :func:`seatool.solve.assemble` and :func:`seatool.solve.solve`
  (including the conditioning and conservation checks),
* bare CG: ``scipy.sparse.linalg.cg`` with a Jacobi preconditioner on the symmetric form of
  the same matrices, one solve per band (what seatool uses above ``ITERATIVE_ABOVE``
  unknowns; seatool does two such solves per band, the second for the condition number),
* floor: ``scipy.sparse.linalg.spsolve`` of the very same per-band matrices, prebuilt,
  with the symmetric-structure ordering ``MMD_AT_PLUS_A`` (the default COLAMD ordering is
  far slower on these patterns: minutes per band at 10,000 subsystems).

Run: ``python benchmarks/bench_solve.py [--sizes 100 1000 10000] [--repeat 3]``.
"""

from __future__ import annotations

import argparse
import tempfile
import time
from pathlib import Path

import numpy as np
import scipy.sparse.linalg as spla

import seatool
from seatool.solve import assemble, solve


def model_text(n: int, seed: int = 0) -> str:
    rng = np.random.default_rng(seed)
    lines = ['title = "synthetic benchmark"', "[bands]", "lowest = 50", "highest = 10000"]
    for i in range(n):
        lines += [
            f"[subsystems.s{i}]",
            'kind = "structure"',
            f"mass = {rng.uniform(1, 50):.6g}",
            f"modal_density = {rng.uniform(0.05, 20):.6g}",
            f"damping = {rng.uniform(1e-3, 3e-2):.6g}",
        ]
    # ~4 connections per subsystem: 2n edges, a ring for connectivity plus random chords.
    edges = {(i, (i + 1) % n) for i in range(n)}
    while len(edges) < 2 * n:
        a, b = rng.choice(n, 2, replace=False)
        edges.add((int(min(a, b)), int(max(a, b))))
    for k, (a, b) in enumerate(sorted(edges)):
        lines += [
            f"[connections.c{k}]",
            f'between = ["s{a}", "s{b}"]',
            f"coupling_loss_factor = {rng.uniform(1e-4, 1e-2):.6g}",
        ]
    for k in range(max(1, n // 100)):
        lines += [f"[excitations.p{k}]", f'subsystem = "s{k * 100}"', "power = 1e-3"]
    return "\n".join(lines) + "\n"


def floor_matrices(asm):  # type: ignore[no-untyped-def]
    mats = [asm.matrix(j) for j in range(asm.shape[1])]
    rhs = [asm.power[:, j] / asm.omega[j] for j in range(asm.shape[1])]
    return mats, rhs


def symmetric_systems(model, mats, rhs):  # type: ignore[no-untyped-def]
    import scipy.sparse as sp

    out = []
    for j, (a, b) in enumerate(zip(mats, rhs, strict=True)):
        n = np.array([s.modal_density[j] for s in model.subsystems])
        c = (a @ sp.diags(n)).tocsr()
        out.append((c, b, c.diagonal()))
    return out


def best(fn, repeat: int) -> float:  # type: ignore[no-untyped-def]
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", type=int, nargs="+", default=[100, 1000, 10000])
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args()
    print(
        f"{'subsystems':>10} {'bands':>5} {'load s':>8} {'asm+solve s':>11} {'bare cg s':>9} "
        f"{'floor s':>8} {'ratio':>6}"
    )
    with tempfile.TemporaryDirectory() as tmp:
        for n in args.sizes:
            path = Path(tmp) / f"bench_{n}.toml"
            path.write_text(model_text(n))
            t_load = best(lambda p=path: seatool.load(p), 1)
            model = seatool.load(path)
            asm = assemble(model)
            mats, rhs = floor_matrices(asm)

            def ours(m=model):  # type: ignore[no-untyped-def]
                solve(m, assemble(m))

            def floor(mats=mats, rhs=rhs):  # type: ignore[no-untyped-def]
                for a, b in zip(mats, rhs, strict=True):
                    spla.spsolve(a, b, permc_spec="MMD_AT_PLUS_A")

            systems = symmetric_systems(model, mats, rhs)

            def bare_cg(systems=systems):  # type: ignore[no-untyped-def]
                for c, b, d in systems:
                    prec = spla.LinearOperator(c.shape, matvec=lambda v, d=d: v / d)
                    spla.cg(c, b, rtol=1e-14, atol=0.0, M=prec)

            t_ours = best(ours, args.repeat)
            t_cg = best(bare_cg, args.repeat)
            t_floor = best(floor, args.repeat)
            # same answer as the floor
            e = solve(model, asm).energy
            e0 = np.column_stack(
                [
                    spla.spsolve(a, b, permc_spec="MMD_AT_PLUS_A")
                    for a, b in zip(mats, rhs, strict=True)
                ]
            )
            assert np.allclose(e, e0, rtol=1e-9), "benchmark solve disagrees with the floor"
            print(
                f"{n:>10} {len(model.bands):>5} {t_load:>8.3f} {t_ours:>11.3f} {t_cg:>9.3f} "
                f"{t_floor:>8.3f} "
                f"{t_ours / t_floor:>6.2f}"
            )


if __name__ == "__main__":
    main()
