"""``seatool lowfreq``: the modal solution of a box-shaped cavity and its panels below the
SEA range, merged with SEA above (:func:`seatool.crossover.solve_crossover`)."""

from __future__ import annotations

import argparse
from pathlib import Path

import numpy as np

import seatool

from ..errors import InputError, Problem
from ._common import Command, print_caution

__all__ = ["LOWFREQ"]


def _args(p: argparse.ArgumentParser) -> None:
    p.add_argument("model", help="model file (.toml) with a [low_frequency.CAVITY] table")
    p.add_argument("--csv", metavar="FILE", help="write the merged per-band table to FILE")
    p.add_argument("--plot", metavar="FILE",
                   help="draw the modal and SEA solutions per band to FILE (.png, .pdf, .svg)")  # fmt: skip


def _cmd(args: argparse.Namespace) -> int:
    plot_path = seatool.plot.plot_target(args.plot)
    csv_path = None
    if args.csv is not None:
        csv_path = Path(args.csv)
        if not csv_path.parent.exists():
            raise InputError([Problem(str(csv_path), "--csv",
                                      f"folder {str(csv_path.parent)!r} does not exist")])  # fmt: skip
    model = seatool.load(args.model)
    requests = model.low_frequency
    if not requests:
        raise InputError([Problem(args.model, "low_frequency", "add a [low_frequency.CAVITY] "
                                  "table naming a cavity and its panels")])  # fmt: skip
    merged = seatool.crossover.solve_low_frequency(model)
    for rq, res in zip(requests, merged.boxes, strict=True):
        t = res.table[res.table["subsystem"].isin([rq.cavity, *rq.panels])]
        print(model.title or model.source)
        bands = model.bands
        for name in [rq.cavity, *rq.panels]:
            rows = t[t["subsystem"] == name]
            print()
            print(f"{name} [dB {rows['level_ref'].iloc[0]}]")
            print(f"{'band':>8}  {'method':>6}  {'level':>6}  {'modal':>6}  {'SEA':>6}")
            for j, (_, r) in enumerate(rows.iterrows()):
                mod = "-" if np.isnan(r["modal_level_dB"]) else f"{r['modal_level_dB']:.1f}"
                print(f"{bands.label(j):>8}  {r['method']:>6}  {r['level_dB']:6.1f}  {mod:>6}  "
                      f"{r['sea_level_dB']:6.1f}")  # fmt: skip
        for note in res.notes:
            print(f"note: {note}")
        if plot_path is not None:
            target = plot_path if len(requests) == 1 else plot_path.with_stem(
                f"{plot_path.stem}_{rq.cavity}")  # fmt: skip
            seatool.crossover.plot_crossover(res, target)
            print(f"wrote {target}")
    if csv_path is not None:
        seatool.results.write_csv(merged.box_rows(requests), csv_path)
        print(f"wrote {csv_path}")
    print_caution()
    return 0


LOWFREQ = Command(
    name="lowfreq",
    help="modal solution of a box-shaped cavity and its panels below the SEA range, "
    "merged with SEA above (method per band)",
    arguments=_args,
    handler=_cmd,
)
