"""Benchmark: the coupled modal equations, about 1,000 modes x 2,000 frequency lines.

A rigid-walled box with one simply supported panel (synthetic sizes chosen for the mode
counts: a benchmark, not a design) driven by a point force. Times, in one run:

* coupled modes: :func:`seatool.physics.modal_eigen.coupled_modes` (one symmetric
  eigendecomposition of the coupled undamped system) and
  :func:`seatool.physics.modal_eigen.solve_coupled_modes` (modal damping with the
  damping-coupled clusters, O(n) per line), the path the low-frequency solution uses;
* reduced (exact): :func:`seatool.physics.modal_coupled.solve_coupled` with the smaller mode set
  kept (the larger, diagonal set eliminated: two real matrix products per block of lines
  form the reduced matrices, batched LU solves them);
* full: :func:`seatool.physics.modal_coupled.solve_coupled_full`, the plain alternative,
  one dense (K + N) complex system per line with batched LU, timed on a subset of lines and
  scaled to all of them (it takes minutes for all lines);

and checks that the exact paths agree on the subset and how far the coupled-mode path is
from them (per line and in the line average of the mean-square responses).

Run: ``python benchmarks/bench_modal.py [--lines 2000] [--split 150 850] [--subset 40]
[--repeat 3]``.

``--rail-cab`` times instead the shipped rail cab's ``[low_frequency]`` box as
``seatool solve`` solves it (:func:`seatool.crossover.solve_low_frequency`: 340 cavity and
185 floor modes, 280 lines, a point force, a cavity source and a diffuse field of 72 plane
waves, with the convergence re-solve), process CPU time with one BLAS thread, and compares
the exact path with the coupled-mode path in one run.
"""

from __future__ import annotations

import argparse
import os
import time
from pathlib import Path

import numpy as np
from threadpoolctl import threadpool_limits

from seatool import crossover, modal, modelfile
from seatool.physics import modal_box as mb
from seatool.physics import modal_coupled as mc
from seatool.physics import modal_eigen as me
from seatool.results import Result
from seatool.solve import solve


def case(n_plate: int, n_cavity: int) -> tuple[mb.PlateModes, mb.CavityModes, np.ndarray]:
    """Panel and box with about the asked mode counts below a common truncation."""
    dims, c = (1.6, 1.2, 1.0), 343.0
    volume = dims[0] * dims[1] * dims[2]
    f_top = (3.0 * n_cavity * c**3 / (4.0 * np.pi * volume)) ** (1.0 / 3.0)
    cav = mb.cavity_modes(*dims, c, f_top)
    cav = mb.CavityModes(cav.index[:n_cavity], cav.frequency[:n_cavity], cav.norm[:n_cavity],
                         cav.dims)  # fmt: skip
    a, b, m = 0.8, 0.6, 7.85
    # asymptotic plate mode count N(f) = (S / 2) sqrt(m'' / D) f  ->  D for n_plate modes
    d = m * (a * b * f_top / (2.0 * n_plate)) ** 2
    plate = mb.plate_modes(a, b, d, m, 3.0 * f_top)
    plate = mb.PlateModes(plate.p[:n_plate], plate.q[:n_plate], plate.frequency[:n_plate],
                          plate.modal_mass, a, b)  # fmt: skip
    return plate, cav, mb.coupling_matrix(plate, cav, "z0", (0.4, 0.3))


def rail_cab(repeat: int) -> None:
    """The rail cab's low-frequency box: exact (direct) and coupled-mode paths, CPU time."""
    model = modelfile.load(Path(__file__).resolve().parent.parent / "models" / "rail_cab.toml")
    sea = Result(model, solve(model))
    lf = model.low_frequency[0]
    box = crossover.modal_box_from_model(model, lf.cavity, lf.dims, lf.panels)
    exs, _ = crossover._excitations(model, box, lf.panels)
    up_to = float(lf.up_to) if lf.up_to is not None else 160.0
    j = int(np.count_nonzero(model.bands.centre <= up_to * (1 + 1e-9))) + 2  # overlap bands
    f_max = float(model.bands.centre[j - 1])
    print(f"rail cab box, load average {os.getloadavg()[0]:.1f}")
    got = {}
    with threadpool_limits(limits=1, user_api="blas"):
        t0 = time.process_time()
        crossover.solve_low_frequency(model, sea)
        print(f"solve_low_frequency (as `seatool solve`): {time.process_time() - t0:.2f} s CPU")
        for solver in ("direct", "coupled_modes"):
            best = np.inf
            for _ in range(repeat):
                c0 = time.process_time()
                res = modal.solve_modal(box, exs, f_max, solver=solver)
                best = min(best, time.process_time() - c0)
            got[solver] = res
            print(f"solve_modal {solver} (best of {repeat}): {best:.2f} s CPU; {res.notes[0]}")
    diff = max(float(np.max(np.abs(got["direct"].level(n) - got["coupled_modes"].level(n))))
               for n in got["direct"].mean_square)  # fmt: skip
    print(f"coupled modes against direct: band levels within {diff:.4f} dB")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument("--lines", type=int, default=2000)
    ap.add_argument("--split", type=int, nargs=2, default=(150, 850),
                    metavar=("PLATE", "CAVITY"))  # fmt: skip
    ap.add_argument("--subset", type=int, default=40)
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--rail-cab", action="store_true", help="time the rail cab's box instead")
    args = ap.parse_args()
    if args.rail_cab:
        rail_cab(args.repeat)
        return
    plate, cav, c = case(*args.split)
    f_hi = float(cav.frequency[-1]) / 2.0
    f = np.linspace(f_hi / 20.0, f_hi, args.lines)
    w = 2 * np.pi * f
    force = mb.plate_mode_shape(plate, 0.31 * plate.a, 0.27 * plate.b)
    t0 = time.perf_counter()
    z = mc.modal_impedance(w, plate.frequency, plate.modal_mass, 0.01)
    y = mc.cavity_modal_admittance_term(w, cav.frequency, cav.norm, 0.01, density=1.2,
                                        sound_speed=343.0)  # fmt: skip
    t_setup = time.perf_counter() - t0
    fast = fast_cpu = np.inf
    for _ in range(args.repeat):
        t0, c0 = time.perf_counter(), time.process_time()
        modes = me.coupled_modes(plate.frequency, plate.modal_mass, 0.01, cav.frequency,
                                 cav.norm, 0.01, c, density=1.2, sound_speed=343.0)  # fmt: skip
        v_fast, p_fast = me.solve_coupled_modes(modes, w, force)
        fast = min(fast, time.perf_counter() - t0)
        fast_cpu = min(fast_cpu, time.process_time() - c0)
    best = cpu = np.inf
    for _ in range(args.repeat):
        t0, c0 = time.perf_counter(), time.process_time()
        v, p = mc.solve_coupled(z, y, c, force)
        best = min(best, time.perf_counter() - t0)
        cpu = min(cpu, time.process_time() - c0)
    sub = np.linspace(0, args.lines - 1, args.subset).astype(int)
    t0 = time.perf_counter()
    v_full, p_full = mc.solve_coupled_full(z[sub], y[sub], c, force)
    t_full = (time.perf_counter() - t0) * args.lines / args.subset
    err = float(np.max(np.abs(v[sub] - v_full)) / np.max(np.abs(v_full)))
    n_modes = len(plate) + len(cav)
    err_fast = float(np.max(np.abs(v_fast - v)) / np.max(np.abs(v)))
    ms_v, ms_v0 = np.sum(np.abs(v_fast) ** 2, axis=(1, 2)), np.sum(np.abs(v) ** 2, axis=(1, 2))
    ms_p = np.sum(cav.norm[None, :] * np.abs(p_fast[:, :, 0]) ** 2, axis=1)
    ms_p0 = np.sum(cav.norm[None, :] * np.abs(p[:, :, 0]) ** 2, axis=1)
    line_db = max(np.max(np.abs(10 * np.log10(ms_v / ms_v0))),
                  np.max(np.abs(10 * np.log10(ms_p / ms_p0))))  # fmt: skip
    mean_db = max(abs(10 * np.log10(ms_v.mean() / ms_v0.mean())),
                  abs(10 * np.log10(ms_p.mean() / ms_p0.mean())))  # fmt: skip
    clusters = sum(ix.shape[0] for ix, _ in modes.clusters)
    print(f"{len(plate)} plate + {len(cav)} cavity = {n_modes} modes, {args.lines} lines")
    print(f"impedances: {t_setup:.3f} s")
    print(f"coupled modes (best of {args.repeat}): {fast:.2f} s wall, {fast_cpu:.2f} s CPU "
          f"({clusters} damping-coupled clusters)")  # fmt: skip
    print(f"reduced / coupled modes: {best / fast:.1f}x")
    print(f"coupled modes against reduced: largest relative difference {err_fast:.1e}; "
          f"mean-square velocity and pressure per line within {line_db:.3f} dB, "
          f"their mean over all lines within {mean_db:.4f} dB")  # fmt: skip
    print(f"reduced (best of {args.repeat}): {best:.2f} s wall, {cpu:.2f} s CPU (all threads)")
    print(f"full system (scaled from {args.subset} lines): {t_full:.1f} s")
    print(f"full / reduced: {t_full / best:.1f}x; largest relative difference {err:.1e}")


if __name__ == "__main__":
    main()
