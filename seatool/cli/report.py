"""``seatool report``: a model's report as one HTML file with its JSON companion.

Parses the options, calls :func:`seatool.report.write_report` and prints what it wrote.
"""

from __future__ import annotations

import argparse

import seatool

from ._common import Command, print_caution


def _args(p: argparse.ArgumentParser) -> None:
    p.add_argument("model", help="model file (.toml)")
    p.add_argument(
        "-o", "--output", required=True, metavar="FILE",
        help="report file (.html); the tables go beside it as FILE with .json",
    )  # fmt: skip
    p.add_argument(
        "--to", metavar="RECEIVER",
        help="subsystem whose paths, sensitivities and spread are shown "
        "(default: the first cavity without an excitation of its own)",
    )  # fmt: skip
    p.add_argument(
        "--band", type=float, metavar="HZ",
        help="nominal band of the energy-flow diagram (default: summed over the bands)",
    )  # fmt: skip
    p.add_argument(
        "--samples", type=int, default=300,
        help="Monte Carlo samples where the model has an [uncertainty] section (default 300)",
    )  # fmt: skip
    p.add_argument("--seed", type=int, default=0, help="random seed of the spread (default 0)")
    p.add_argument(
        "--variants", metavar="FILE",
        help="a design-variants file (.toml) whose comparison the report shows",
    )  # fmt: skip
    p.add_argument(
        "--candidates", metavar="FILE",
        help="a candidate-treatments file (.toml) whose lightest answer the report shows",
    )  # fmt: skip
    p.add_argument("--quiet", action="store_true", help="no progress bar")


def _cmd(args: argparse.Namespace) -> int:
    if args.quiet:
        seatool.progress.set_quiet(True)
    files = seatool.report.write_report(
        args.model, args.output, receiver=args.to, band=args.band, samples=args.samples,
        seed=args.seed, variants=args.variants, candidates=args.candidates,
    )  # fmt: skip
    print(f"wrote {files.html}")
    print(f"wrote {files.json}")
    print_caution()
    return 0


REPORT = Command(
    "report",
    help="write a report of a model: one self-contained HTML file (levels, energy flow, "
    "paths, sensitivities, spread, validity, references) and its tables as JSON",
    arguments=_args,
    handler=_cmd,
)
