"""``seatool sweep``: a parameter study over key paths of a model file (parse, call, print).

The work is done by :func:`seatool.analysis.sweep.sweep` (and :func:`~seatool.analysis.sweep.
sobol_indices`, :func:`~seatool.analysis.sweep.write_table`, :func:`seatool.plot.plot_sweep`,
:func:`seatool.plot.plot_sweep_matrix`).
"""

from __future__ import annotations

import argparse
import textwrap
import time
from typing import Any

import seatool

from ..errors import InputError, Problem
from ._common import Command, cannot_write, fmt_table, output_target, print_caution

__all__ = ["SWEEP"]

_METHODS = ("grid", "list", "lhs", "sobol", "saltelli", "uncertainty")


def _args(p: argparse.ArgumentParser) -> None:
    p.add_argument("model", help="model file (.toml)")
    p.add_argument(
        "--spec",
        metavar="FILE",
        help='sweep file (.toml): method, samples, seed, receivers, [vary."KEY.PATH"] tables',
    )
    p.add_argument(
        "--vary",
        action="append",
        default=[],
        metavar="PATH=RANGE",
        help="a value to vary: KEY.PATH=LOW:HIGH (add :log for a log scale) or "
        "KEY.PATH=V1,V2,... (repeat the option for more)",
    )
    p.add_argument("--method", choices=_METHODS, help="the design (default lhs)")
    p.add_argument("--samples", type=int, help="sample points (lhs, sobol, uncertainty) or "
                   "base points (saltelli)")  # fmt: skip
    p.add_argument("--points", type=int, help="grid points of each LOW:HIGH range (default 5)")
    p.add_argument("--seed", type=int, help="seed of the random designs (default 0)")
    p.add_argument(
        "--receiver", action="append", metavar="NAME", help="receiver to report (repeatable)"
    )
    p.add_argument("--out", metavar="FILE", help="write the table to FILE (.parquet or .csv)")
    p.add_argument(
        "--plot", metavar="FILE", help="draw each A-weighted level against each parameter"
    )
    p.add_argument(
        "--matrix", metavar="FILE", help="draw a scatter matrix of parameters and levels"
    )
    p.add_argument("--sobol-csv", metavar="FILE", help="write the Sobol' indices (saltelli)")
    p.add_argument(
        "--scheduler",
        default="local",
        metavar="ADDRESS",
        help="where to run: local (this machine's cores, the default), serial (this "
        "process), or the address of a dask scheduler (tcp://HOST:8786)",
    )
    p.add_argument("--workers", type=int, help="worker processes of the local run (default: cores)")
    p.add_argument("--batch", type=int, help="evaluations per task (default: automatic)")
    p.add_argument(
        "--no-confidence",
        action="store_true",
        help="leave out the 5-95 %% levels of nominally identical builds (SEA ensemble "
        "variance; table columns RECEIVER.dB_p05 ... and the printed range)",
    )


def _parameter(text: str) -> Any:
    Parameter = seatool.analysis.sweep.Parameter
    path, eq, rng = text.partition("=")
    if not eq or not path:
        raise InputError(
            [Problem("", "--vary", f"{text!r}: use KEY.PATH=LOW:HIGH or KEY.PATH=V1,V2")]
        )
    try:
        if ":" in rng:
            parts = rng.split(":")
            scale = parts.pop() if parts[-1] in ("log", "linear") else "linear"
            if len(parts) != 2:
                raise ValueError
            return Parameter(path, float(parts[0]), float(parts[1]), scale=scale)
        return Parameter(path, values=tuple(float(v) for v in rng.split(",")))
    except ValueError:
        raise InputError(
            [Problem("", "--vary", f"{text!r}: numbers expected (KEY.PATH=0.004:0.008 or =1,2,3)")]
        ) from None


def spec_of(args: argparse.Namespace) -> Any:
    """The sweep specification of the command line (a sweep file, then the options)."""
    sw = seatool.analysis.sweep
    spec = sw.read_spec(args.spec) if args.spec else sw.SweepSpec()
    params = {p.path: p for p in spec.parameters}
    for text in args.vary:
        p = _parameter(text)
        params[p.path] = p
    if args.points is not None:
        params = {k: sw.Parameter(p.path, p.low, p.high, p.values, args.points, p.scale)
                  for k, p in params.items()}  # fmt: skip
    return sw.SweepSpec(
        tuple(params.values()),
        args.method or spec.method,
        spec.samples if args.samples is None else args.samples,
        spec.seed if args.seed is None else args.seed,
        tuple(args.receiver) if args.receiver else spec.receivers,
    )


def _cmd(args: argparse.Namespace) -> int:
    out = output_target(args.out, "--out")
    sob = output_target(args.sobol_csv, "--sobol-csv")
    fig = seatool.plot.plot_target(args.plot)
    mat = seatool.plot.plot_target(args.matrix, "--matrix")
    spec = spec_of(args)
    if sob is not None and spec.method != "saltelli":
        raise InputError([Problem("", "--sobol-csv", "Sobol' indices need --method saltelli")])
    sw = seatool.analysis.sweep
    data, file, base = seatool.analysis.read_data(args.model)
    t0 = time.perf_counter()
    res = sw.sweep(data, spec, file=file, base_dir=base, scheduler=args.scheduler,
                   workers=args.workers, batch=args.batch,
                   confidence=not args.no_confidence)  # fmt: skip
    took = time.perf_counter() - t0
    table = res.table()
    where = "this process" if args.scheduler == "serial" else (
        "this machine's cores" if args.scheduler == "local" else args.scheduler)  # fmt: skip
    print(f"sweep of {file}: {spec.method}, {res.samples} evaluations in {took:.1f} s ({where})")
    print("parameters: " + ", ".join(res.design.columns))
    print()
    rows = []
    conf = res.overall_variance is not None
    for r, ref in zip(res.receivers, res.references, strict=True):
        for metric in ("dB", "dBA"):
            v = table[f"{r}.{metric}"].astype(float)
            if len(v) and v.notna().all():
                band = []
                if conf:  # the 5-95 % levels of builds, medians over the samples
                    lo, hi = (table[f"{r}.{metric}_{p}"].astype(float).median()
                              for p in ("p05", "p95"))  # fmt: skip
                    band = [f"{lo:.1f}..{hi:.1f}"]
                rows.append([r, metric, f"{v.min():.1f}", f"{v.median():.1f}", f"{v.max():.1f}",
                             *band, ref])  # fmt: skip
    head = ["receiver", "level", "min", "median", "max"]
    head += ["builds 5-95 % (median)"] if conf else []
    print("\n".join(fmt_table([*head, "reference"], rows)))
    if conf:
        print("\n".join(textwrap.wrap(seatool.analysis.confidence.BAND_NOTE, 92)))
    met = [c for c in table.columns if c.endswith(".met")]
    if met:
        print()
        for c in met:
            share = float(table[c].mean())
            print(f"target {c[:-4]}: met in {100 * share:.1f} % of the samples")
    if spec.method == "saltelli":
        si = sw.sobol_indices(res)
        print()
        print("Sobol' indices of the A-weighted levels (first order S1, total ST, +- 95 %)")
        rows = [[str(x.receiver), str(x.parameter), f"{x.S1:.3f} +- {x.S1_conf:.3f}",
                 f"{x.ST:.3f} +- {x.ST_conf:.3f}"] for x in si.itertuples()]  # fmt: skip
        print("\n".join(fmt_table(["receiver", "parameter", "S1", "ST"], rows)))
        if sob is not None:
            _write(lambda: seatool.results.write_csv(si, sob), sob, "--sobol-csv")
    if out is not None:
        _write(lambda: sw.write_table(res, out), out, "--out")
    levels = [f"{r}.dBA" for r, q in zip(res.receivers, res.quantities, strict=True)
              if q == "sound_pressure"] or [f"{r}.dB" for r in res.receivers]  # fmt: skip
    if fig is not None:
        _write(
            lambda: seatool.plot.plot_sweep(table, res.design.columns, levels, fig), fig, "--plot"
        )
    if mat is not None:
        cols = [*res.design.columns, *levels]
        _write(lambda: seatool.plot.plot_sweep_matrix(table, cols, mat), mat, "--matrix")
    print_caution()
    return 0


def _write(do: Any, path: Any, option: str) -> None:
    try:
        do()
    except OSError as exc:
        raise cannot_write(path, option, exc) from None
    print(f"wrote {path}")


SWEEP = Command(
    "sweep",
    "parameter study over key paths of a model file (grid, lists, Latin hypercube, Sobol', "
    "Saltelli with Sobol' indices, the [uncertainty] section) on this machine's cores or a "
    "dask cluster",
    _args,
    _cmd,
)
