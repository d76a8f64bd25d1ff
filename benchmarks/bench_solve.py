"""Benchmark: assembly + solve of seatool against the best plain scipy solve, per band.

Two topologies, each at 1,000 and 10,000 subsystems (1/3-octave bands 50 Hz - 10 kHz):

* ``random``: random sparse connectivity (a ring plus random chords, 2N connections, so
  about four per subsystem; synthetic values drawn uniformly: modal densities
  0.05-20 /Hz, damping 1e-3-3e-2, coupling loss factors 1e-4-1e-2), written as a model
  file and read back (the ``load`` column);
* ``lattice``: a 3-D lattice, each subsystem joined to its 6 neighbours, plates and
  cavities alternating (checkerboard), built directly as a :class:`seatool.model.Model`.
  Invented but realistic values from seatool's physics: steel plates 1-3 mm, 0.36-3.2 m^2
  (bending modal density, Leppington radiation efficiency, radiation coupling loss factor
  ``rho c sigma / (omega m'')``, damping 0.003-0.02); cavities 0.5-5 m^3 (modal density
  with surface and edge terms, damping from a Sabine absorption coefficient 0.05-0.3).
  One source (1 mW) per 100 subsystems.

For every model, on the very same symmetric per-band matrices ``C_j = L_j diag(n)``
(prebuilt; the floors do not pay for assembly):

* **direct floor**: the faster of ``scipy.sparse.linalg.splu`` with a symmetric ordering
  (``permc_spec="MMD_AT_PLUS_A"``, ``options={"SymmetricMode": True}``; with the default
  and with zero diagonal pivot threshold) and ``scipy.sparse.linalg.spsolve`` (same ordering;
  the default COLAMD ordering is far slower on these patterns), one band after another;
* **iterative floors**: ``scipy.sparse.linalg.cg`` with a Jacobi preconditioner, and with an
  incomplete LU preconditioner (``spilu``, drop tolerance 1e-5, fill factor 10), at the
  loosest ``rtol`` of 1e-8 ... 1e-14 whose energies agree with the direct solve to 1e-9
  relative entry by entry; a method that reaches no such ``rtol`` is not a floor ("-");
* **seatool**: ``assemble`` + ``solve`` (including the singular-group check, the condition
  number of every band, the per-subsystem balance check and the conservation check).

``ratio = seatool / min(valid floors)``, all figures from one run, best of ``--repeat``
(floors slower than 20 s are timed once). Times are process CPU time
(``time.process_time``) with one BLAS thread (threadpoolctl), steadier than wall time on a
shared machine; ``--wall`` times wall-clock instead. The load average is printed with
every case. Run:
``python benchmarks/bench_solve.py [--sizes 1000 10000] [--topologies random lattice] [--quick]``.
"""

from __future__ import annotations

import argparse
import os
import tempfile
import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

import numpy as np
import scipy.sparse as sp
import scipy.sparse.linalg as spla
from threadpoolctl import threadpool_limits

import seatool
from seatool.bands import BandAxis
from seatool.model import Connection, Excitation, Model, Subsystem
from seatool.physics import acoustic, coupling, plates, radiation
from seatool.solve import assemble, solve

TOL = 1e-9
RTOLS = (1e-8, 1e-9, 1e-10, 1e-11, 1e-12, 1e-13, 1e-14)


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


LATTICE_SHAPES = {1000: (10, 10, 10), 8000: (20, 20, 20), 10000: (25, 20, 20)}


def lattice_model(n: int, seed: int = 0) -> Model:
    """Plates and cavities alternating on a 3-D lattice (invented values, see module doc)."""
    shape = LATTICE_SHAPES.get(n)
    if shape is None:
        side = round(n ** (1 / 3))
        shape = (side, side, side)
    rng = np.random.default_rng(seed)
    bands = BandAxis.from_range(50, 10000)
    f = bands.centre
    c0, rho0 = 343.0, 1.2
    idx = np.arange(int(np.prod(shape))).reshape(shape)
    parity = np.indices(shape).sum(axis=0).ravel() % 2
    subs: list[Subsystem] = []
    plate_props: dict[int, tuple[float, Any]] = {}
    for i in range(idx.size):
        if parity[i] == 0:
            h = float(rng.choice([1e-3, 1.5e-3, 2e-3, 3e-3]))
            lx, ly = rng.uniform(0.6, 1.8, 2)
            stiff = plates.bending_stiffness(2.1e11, h, 0.3)
            m2 = 7850.0 * h
            sigma = radiation.radiation_efficiency_leppington(
                f, lx, ly, plates.critical_frequency(stiff, m2, c0)
            )
            plate_props[i] = (m2, sigma)
            subs.append(
                Subsystem(
                    f"s{i}",
                    "structure",
                    plates.plate_bending_modal_density(f, lx * ly, stiff, m2),
                    np.full(f.size, rng.uniform(0.003, 0.02)),
                    quantity="velocity",
                    mass=float(m2 * lx * ly),
                )
            )
        else:
            vol = rng.uniform(0.5, 5.0)
            area, edges = 6 * vol ** (2 / 3), 12 * vol ** (1 / 3)
            alpha = rng.uniform(0.05, 0.3)
            subs.append(
                Subsystem(
                    f"s{i}",
                    "cavity",
                    acoustic.cavity_modal_density(f, vol, area, edges, c0),
                    c0 * area * alpha / (8 * np.pi * f * vol),  # Sabine: eta = c A / (8 pi f V)
                    quantity="sound_pressure",
                    volume=float(vol),
                    density=rho0,
                    sound_speed=c0,
                )
            )
    cons: list[Connection] = []
    for ax in range(3):
        lo = [slice(None)] * 3
        hi = [slice(None)] * 3
        lo[ax], hi[ax] = slice(0, -1), slice(1, None)
        for a, b in zip(idx[tuple(lo)].ravel(), idx[tuple(hi)].ravel(), strict=True):
            p, c = (int(a), int(b)) if parity[a] == 0 else (int(b), int(a))
            m2, sigma = plate_props[p]
            eta = coupling.clf_radiation(f, sigma, m2, rho0=rho0, c0=c0)
            cons.append(Connection(f"c{len(cons)}", f"s{p}", f"s{c}", eta))
    exc = tuple(
        Excitation(f"p{q}", f"s{q}", "power", power=np.full(f.size, 1e-3))
        for q in range(0, idx.size, 100)
    )
    return Model(bands, tuple(subs), tuple(cons), exc)


def symmetric_systems(model: Model) -> tuple[list[sp.csc_matrix], list[Any], Any]:
    """Per band: C_j = L_j diag(n) (CSC), b_j = P / omega; and the modal densities (N, B)."""
    asm = assemble(model)
    modal = np.vstack([s.modal_density for s in model.subsystems])
    mats, rhs = [], []
    for j in range(asm.shape[1]):
        mats.append(sp.csc_matrix(asm.matrix(j) @ sp.diags(modal[:, j])))
        rhs.append(asm.power[:, j] / asm.omega[j])
    return mats, rhs, modal


CLOCK = time.process_time


def best(fn: Callable[[], Any], repeat: int) -> float:
    return best_of(fn, repeat)[0]


def best_of(fn: Callable[[], Any], repeat: int) -> tuple[float, Any]:
    """Least time of ``repeat`` calls (one call if it takes over 20 s) and the last result."""
    times = []
    out = None
    for _ in range(repeat):
        t0 = CLOCK()
        out = fn()
        times.append(CLOCK() - t0)
        if times[-1] > 20.0:
            break
    return min(times), out


def direct_floor(mats: list[Any], rhs: list[Any], repeat: int) -> tuple[float, str, Any]:
    variants: dict[str, Callable[[Any, Any], Any]] = {
        "splu sym": lambda c, b: spla.splu(
            c, permc_spec="MMD_AT_PLUS_A", options={"SymmetricMode": True}
        ).solve(b),
        "splu sym, diag pivots": lambda c, b: spla.splu(
            c, permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=0.0, options={"SymmetricMode": True}
        ).solve(b),
        "spsolve": lambda c, b: spla.spsolve(c, b, permc_spec="MMD_AT_PLUS_A"),
    }
    out = []
    results = {}
    for name, fn in variants.items():
        t, results[name] = best_of(
            lambda fn=fn: np.column_stack([fn(c, b) for c, b in zip(mats, rhs, strict=True)]),
            repeat,
        )
        out.append((t, name))
    t, name = min(out)
    return t, f"{name} ({', '.join(f'{nm} {tt:.3f}' for tt, nm in out)})", results[name]


def _jacobi(c: Any) -> Any:
    d = c.diagonal()
    return spla.LinearOperator(c.shape, matvec=lambda v: v / d)


def _cg_all(mats: list[Any], rhs: list[Any], precs: list[Any], rtol: float) -> Any:
    cols = []
    for c, b, m in zip(mats, rhs, precs, strict=True):
        x, _ = spla.cg(c, b, rtol=rtol, atol=0.0, M=m, maxiter=20 * c.shape[0])
        cols.append(x)
    return np.column_stack(cols)


def iterative_floor(
    mats: list[Any], rhs: list[Any], ref: Any, repeat: int, kind: str
) -> tuple[float, str]:
    """Time of the loosest accurate rtol (inf if none), and a description."""

    def precs() -> list[Any]:
        out = []
        for c in mats:
            if kind == "jacobi":
                d = c.diagonal()
                out.append(spla.LinearOperator(c.shape, matvec=lambda v, d=d: v / d))
            else:
                ilu = spla.spilu(c, drop_tol=1e-5, fill_factor=10)
                out.append(spla.LinearOperator(c.shape, matvec=ilu.solve))
        return out

    # Search the loosest accurate rtol with one set of preconditioners (not timed), then
    # time that rtol including the preconditioners' construction.
    search = precs()
    for rtol in RTOLS:
        x = _cg_all(mats, rhs, search, rtol)
        err = float(np.max(np.abs(x - ref) / ref))
        if err <= TOL:
            t = best(lambda rtol=rtol: _cg_all(mats, rhs, precs(), rtol), repeat)
            return t, f"rtol {rtol:g} (max rel. error {err:.1e})"
    return float("inf"), f"no rtol down to {RTOLS[-1]:g} reaches {TOL:g} (error {err:.1e})"


def run_case(topology: str, n: int, repeat: int, tmp: Path, quick: bool = False) -> None:
    t_load = float("nan")
    if topology == "random":
        path = tmp / f"bench_{n}.toml"
        path.write_text(model_text(n))
        t_load = best(lambda: seatool.load(path), 1)
        model = seatool.load(path)
    else:
        model = lattice_model(n)
    mats, rhs, modal = symmetric_systems(model)
    t_ours = best(lambda: solve(model, assemble(model)), repeat)
    sol = solve(model, assemble(model))
    if quick:
        # Reference: Jacobi CG at rtol 1e-15 (near round-off); direct and ILU not timed.
        precs = [_jacobi(c) for c in mats]
        x_ref = _cg_all(mats, rhs, precs, 1e-15)
        t_dir, dir_desc = float("inf"), "not timed (--quick); reference: Jacobi CG, rtol 1e-15"
        t_ilu, ilu_desc = float("inf"), "not timed (--quick)"
    else:
        t_dir, dir_desc, x_ref = direct_floor(mats, rhs, repeat)
    e_ref = x_ref * modal
    err_ours = float(np.max(np.abs(sol.energy - e_ref) / e_ref))
    t_jac, jac_desc = iterative_floor(mats, rhs, x_ref, repeat, "jacobi")
    if not quick:
        t_ilu, ilu_desc = iterative_floor(mats, rhs, x_ref, repeat, "ilu")
    t_floor = min(t_dir, t_jac, t_ilu)
    rng_db = 10 * np.log10(e_ref.max(axis=0) / e_ref.min(axis=0)).max()
    print(f"\n{topology}, {n} subsystems, {len(model.bands)} bands "
          f"(energies span up to {rng_db:.0f} dB in a band); load average "
          f"{os.getloadavg()[0]:.1f}")
    print(f"  load                 {t_load:8.3f} s")
    print(f"  seatool asm+solve    {t_ours:8.3f} s  method {sol.method}; "
          f"max rel. difference from the reference {err_ours:.1e}")
    print(f"  direct floor         {t_dir:8.3f} s  {dir_desc}")
    print(f"  CG + Jacobi          {t_jac:8.3f} s  {jac_desc}")
    print(f"  CG + ILU             {t_ilu:8.3f} s  {ilu_desc}")
    print(f"  ratio seatool / min(floors) = {t_ours / t_floor:.2f}")


def main() -> None:
    global CLOCK
    ap = argparse.ArgumentParser(description=(__doc__ or "").splitlines()[0])
    ap.add_argument("--sizes", type=int, nargs="+", default=[1000, 10000])
    ap.add_argument("--topologies", nargs="+", default=["random", "lattice"])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--wall", action="store_true", help="wall-clock time, default BLAS threads")
    ap.add_argument(
        "--quick",
        action="store_true",
        help="time only seatool and the Jacobi CG floor (the direct and ILU floors take "
        "minutes at 10,000 random subsystems); reference energies from Jacobi CG at rtol 1e-15",
    )
    args = ap.parse_args()
    if args.wall:
        CLOCK = time.perf_counter
    with tempfile.TemporaryDirectory() as tmp, threadpool_limits(None if args.wall else 1):
        for topology in args.topologies:
            for n in args.sizes:
                run_case(topology, n, args.repeat, Path(tmp), args.quick)


if __name__ == "__main__":
    main()
