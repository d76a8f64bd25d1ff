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

import numpy as np
import pandas as pd

from ..analysis.measured import estimate_toml, power_injection
from ..errors import InputError, Problem
from ..results import write_csv, write_text_atomic
from ._common import Command
from ._common import output_target as _csv_target

COLUMNS = ("band_hz", "driven", "input_W", "subsystem", "energy_J")


def read_measurements(path: Path) -> tuple[np.ndarray, np.ndarray, np.ndarray, list[str]]:
    """Bands (B,), input powers (N, B), energies (N, N, B) and names from the CSV."""
    file = str(path)
    try:
        df = pd.read_csv(path)
    except FileNotFoundError:
        raise InputError([Problem(file, "", "file not found")]) from None
    except (OSError, ValueError, pd.errors.ParserError) as exc:
        raise InputError([Problem(file, "", f"cannot read as CSV: {exc}")]) from None
    missing = [c for c in COLUMNS if c not in df.columns]
    if missing:
        raise InputError(
            [
                Problem(
                    file,
                    "header",
                    f"missing column(s) {', '.join(missing)}; expected {','.join(COLUMNS)}",
                )
            ]
        )
    for col in ("band_hz", "input_W", "energy_J"):
        vals = pd.to_numeric(df[col], errors="coerce")
        bad = vals.isna() | ~np.isfinite(vals) | (vals < 0) | ((vals <= 0) & (col == "band_hz"))
        if bad.any():
            row = int(np.flatnonzero(bad.to_numpy())[0]) + 2
            raise InputError(
                [Problem(file, f"line {row}, {col}", "must be a finite number >= 0 (band_hz > 0)")]
            )
        df[col] = vals
    names = sorted(set(df["subsystem"].astype(str)))
    drivers = sorted(set(df["driven"].astype(str)))
    if drivers != names:
        raise InputError(
            [
                Problem(
                    file,
                    "driven",
                    "every measured subsystem must be driven once: driven "
                    f"{drivers}, measured {names}",
                )
            ]
        )
    bands = np.sort(df["band_hz"].unique())
    n, nb = len(names), bands.size
    idx = {s: i for i, s in enumerate(names)}
    bidx = {b: j for j, b in enumerate(bands)}
    energy = np.full((n, n, nb), np.nan)
    power = np.full((n, nb), np.nan)
    for sub, drv, fb, e_j, p_w in zip(
        df["subsystem"].astype(str),
        df["driven"].astype(str),
        df["band_hz"],
        df["energy_J"],
        df["input_W"],
        strict=True,
    ):
        i, k, j = idx[sub], idx[drv], bidx[fb]
        energy[i, k, j] = e_j
        power[k, j] = p_w
    if np.isnan(energy).any():
        i, k, j = (int(x[0]) for x in np.nonzero(np.isnan(energy)))
        raise InputError(
            [
                Problem(
                    file,
                    "rows",
                    f"no energy of {names[i]} with {names[k]} driven at "
                    f"{bands[j]:g} Hz; every subsystem is measured in every experiment",
                )
            ]
        )
    return bands, power, energy, names


def _args(p: argparse.ArgumentParser) -> None:
    p.add_argument("measurements", help="CSV: band_hz,driven,input_W,subsystem,energy_J")
    p.add_argument("--toml", metavar="FILE", help="write the estimates as model-file TOML")
    p.add_argument("--csv", metavar="FILE", help="write the estimates as a tidy CSV table")


def _cmd(args: argparse.Namespace) -> int:
    toml_path = _csv_target(args.toml, "--toml")
    csv_path = _csv_target(args.csv, "--csv")
    bands, power, energy, names = read_measurements(Path(args.measurements))
    try:
        est = power_injection(bands, power, energy, names=names)
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
    for path, text in ((toml_path, estimate_toml(est) if toml_path else ""),):
        if path is not None:
            try:
                write_text_atomic(path, text)
            except OSError as exc:
                raise InputError(
                    [Problem(str(path), "--toml", f"cannot write: {exc.strerror or exc}")]
                ) from None
            print(f"wrote {path}")
    if csv_path is not None:
        try:
            write_csv(table, csv_path)
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
