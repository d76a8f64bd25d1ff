"""Command-line front end of the power injection method: ``seatool loss-factors``.

Input: a CSV of measurements, one row per band, experiment and subsystem::

    band_hz,driven,input_W,subsystem,energy_J
    500,plate,0.012,plate,3.1e-4
    500,plate,0.012,room,2.2e-6
    ...

``driven`` names the subsystem driven in that experiment and ``input_W`` the measured input
power (the same on every row of an experiment and band). Every subsystem must be driven
once and measured in every experiment and band.
"""

from __future__ import annotations

import argparse
from pathlib import Path

import seatool

from ..errors import InputError, Problem
from ._common import Command
from ._common import output_target as _csv_target


def _args(p: argparse.ArgumentParser) -> None:
    p.add_argument("measurements", help="CSV: band_hz,driven,input_W,subsystem,energy_J")
    p.add_argument("--toml", metavar="FILE", help="write the estimates as model-file TOML")
    p.add_argument("--csv", metavar="FILE", help="write the estimates as a tidy CSV table")


def _cmd(args: argparse.Namespace) -> int:
    toml_path = _csv_target(args.toml, "--toml")
    csv_path = _csv_target(args.csv, "--csv")
    measured = seatool.analysis.measured
    bands, power, energy, names = measured.read_measurements(Path(args.measurements))
    try:
        est = measured.power_injection(bands, power, energy, names=names)
    except ValueError as exc:
        raise InputError([Problem(args.measurements, "", str(exc))]) from None
    table = est.table()
    print("loss factors by the power injection method (sensitivity: relative error per")
    print("relative energy error; condition: normalised energy matrix)")
    print(
        table.to_string(
            index=False,
            formatters={
                "band_hz": lambda x: f"{x:g}",
                "loss_factor": lambda x: f"{x:.4g}",
                "sensitivity": lambda x: f"{x:.3g}",
                "condition": lambda x: f"{x:.3g}",
            },
        )
    )
    for w in est.warnings:
        print("warning: " + w)
    for path, text in ((toml_path, measured.estimate_toml(est) if toml_path else ""),):
        if path is not None:
            try:
                seatool.results.write_text_atomic(path, text)
            except OSError as exc:
                raise InputError(
                    [Problem(str(path), "--toml", f"cannot write: {exc.strerror or exc}")]
                ) from None
            print(f"wrote {path}")
    if csv_path is not None:
        try:
            seatool.results.write_csv(table, csv_path)
        except OSError as exc:
            raise InputError(
                [Problem(str(csv_path), "--csv", f"cannot write: {exc.strerror or exc}")]
            ) from None
        print(f"wrote {csv_path}")
    return 0


LOSS_FACTORS = Command(
    name="loss-factors",
    help="damping and coupling loss factors from power injection measurements "
    "(condition number and sensitivity of every estimate)",
    arguments=_args,
    handler=_cmd,
    loads_model=False,
)
