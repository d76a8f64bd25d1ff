"""``seatool solve`` and ``seatool check``: parse, call, print.

``solve`` calls :func:`seatool.load`, :func:`seatool.run` and the :class:`seatool.Result`
tables (:meth:`~seatool.results.Result.render`, :meth:`~seatool.results.Result.to_csv`),
:func:`seatool.analysis.comfort.receiver_metrics` and :func:`seatool.plot_levels`, and for a
model with ``[low_frequency]`` boxes :func:`seatool.crossover.solve_low_frequency` (the
merged levels with their method per band); ``check`` calls :func:`seatool.model_summary`. They are
reached through the lazy package attributes of :mod:`seatool`.
"""

from __future__ import annotations

import argparse
from pathlib import Path

import seatool

from ..errors import InputError, Problem, closest
from ._common import EXIT_MISSED, EXIT_OK, Command, cannot_write, output_target, print_caution

__all__ = ["CHECK", "SOLVE"]


def _solve_args(sp: argparse.ArgumentParser) -> None:
    sp.add_argument("model", help="model file (.toml)")
    sp.add_argument(
        "--show",
        metavar="NAMES",
        help="comma-separated subsystems to print (default: all that have a level)",
    )
    sp.add_argument("--csv", metavar="FILE", help="write the tidy per-band table to FILE")
    sp.add_argument(
        "--plot",
        metavar="FILE",
        help="draw the band levels of the shown subsystems to FILE (.png, .pdf or .svg)",
    )
    sp.add_argument(
        "--balance", action="store_true", help="also print each subsystem's power balance"
    )
    sp.add_argument("--digits", type=int, default=1, help="decimals in the level table (default 1)")
    sp.add_argument(
        "--field",
        choices=["diffuse", "free"],
        default="diffuse",
        help="sound field for the loudness of the cavities (default diffuse, as in a cabin)",
    )
    sp.add_argument(
        "--metrics-csv",
        metavar="FILE",
        help="write the cavities' dB, dB(A), dB(C), SIL, sone and phon to FILE",
    )
    sp.add_argument(
        "--no-confidence",
        action="store_true",
        help="leave out the 5-95 %% confidence bands from the SEA ensemble variance (table, "
        "CSV columns, figure shading, confidence of meeting the targets)",
    )
    sp.add_argument(
        "--fail-on-miss",
        action="store_true",
        help=f"exit with code {EXIT_MISSED} when a target of the model is missed "
        "(by default a miss is a result, exit 0)",
    )


def _names(model: seatool.Model, spec: str | None, file: str) -> list[str] | None:
    if spec is None:
        return [s.name for s in model.subsystems if not s.sink]
    names = [n.strip() for n in spec.split(",") if n.strip()]
    problems = [
        Problem(file, "--show", f"unknown subsystem {n!r}" + closest(n, model.names))
        for n in names
        if n not in model.names
    ]
    if problems:
        raise InputError(problems)
    return names


def _cmd_solve(args: argparse.Namespace) -> int:
    model = seatool.load(args.model)
    names = _names(model, args.show, args.model)
    csv_path = Path(args.csv) if args.csv else None
    plot_path = seatool.plot.plot_target(args.plot)
    if csv_path is not None and not csv_path.parent.exists():
        raise InputError(
            [Problem(str(csv_path), "--csv", f"folder {str(csv_path.parent)!r} does not exist")]
        )
    metrics_path = output_target(args.metrics_csv, "--metrics-csv")
    result = seatool.run(model)
    low = seatool.crossover.solve_low_frequency(model, result) if model.low_frequency else None
    merged = low.table if low is not None else None
    print(result.render(names, digits=args.digits, caution=False, merged=merged))
    for note in low.notes if low is not None else ():
        print(f"note: {note}")
    confidence = seatool.analysis.confidence
    r2 = None if args.no_confidence else confidence.relative_variances(model, result.energy)
    conf = None if r2 is None else confidence.confidence_bands(model, result, relative_variance=r2)
    if conf is not None:
        print()
        print(confidence.render_bands(model, conf, names or model.names, digits=args.digits))
    comfort = seatool.analysis.comfort
    comfort_table = comfort.receiver_metrics(result, args.field)
    shown = comfort_table[comfort_table["subsystem"].isin(names or model.names)]
    if len(shown):
        print()
        print(comfort.render(shown, digits=args.digits))
    if args.balance:
        pb = result.power_balance()
        pb = pb[pb["subsystem"].isin(names or model.names)]
        print()
        print("power balance [W] (input = dissipated + net_out)")
        print(
            pb.drop(columns="band_exact_hz").to_string(
                index=False,
                float_format=lambda x: f"{x:.3e}",
                formatters={"band_hz": lambda x: f"{x:g}"},
            )
        )
    if csv_path is not None:
        try:
            table = (
                result.table()
                if conf is None
                else confidence.table_with_confidence(model, result, conf)
            )
            if merged is not None:
                table = seatool.crossover.with_methods(table, merged)
            seatool.results.write_csv(table, csv_path)
        except OSError as exc:
            raise cannot_write(csv_path, "--csv", exc) from None
        print(f"wrote {csv_path}")
    if metrics_path is not None:
        try:
            seatool.results.write_csv(comfort_table, metrics_path)
        except OSError as exc:
            raise cannot_write(metrics_path, "--metrics-csv", exc) from None
        print(f"wrote {metrics_path}")
    if plot_path is not None:
        try:
            seatool.plot_levels(result, plot_path, names, confidence=conf, merged=merged)
        except OSError as exc:
            raise cannot_write(plot_path, "--plot", exc) from None
        print(f"wrote {plot_path}")
    missed = False
    if model.targets:
        targets = seatool.analysis.targets
        print()
        print(targets.render_margins(result, digits=args.digits, field=args.field))
        vs = targets.verdicts(result, field=args.field)
        print()
        print(targets.render_verdicts(vs))
        if r2 is not None:
            pm = targets.probability_from_variance(result, field=args.field, relative_variance=r2)
            print(targets.render_confidence(pm))
        missed = not all(v.met for v in vs)
    print_caution()
    return EXIT_MISSED if missed and args.fail_on_miss else EXIT_OK


def _check_args(cp: argparse.ArgumentParser) -> None:
    cp.add_argument("model", help="model file (.toml)")


def _cmd_check(args: argparse.Namespace) -> int:
    model = seatool.load(args.model)
    print(seatool.model_summary(model))
    print("model is valid")
    return EXIT_OK


SOLVE = Command(
    "solve",
    help="solve a model and print band levels",
    arguments=_solve_args,
    handler=_cmd_solve,
)
CHECK = Command(
    "check",
    help="validate a model and print a summary",
    arguments=_check_args,
    handler=_cmd_check,
)
