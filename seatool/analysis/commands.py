"""Command-line front ends of the analyses: ``seatool paths``, ``sensitivity``, ``spread``."""

from __future__ import annotations

import argparse
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np
import pandas as pd

from ..errors import InputError, Problem
from ..modelfile import build
from ..plot import plot_target
from ..results import CAUTION, Result, write_text_atomic
from ..solve import solve
from ._keypath import read_data
from ._system import receiver_index
from .targets import probability_of_meeting

if TYPE_CHECKING:
    from ..cli import Command

VALIDITY_NOTE = (
    "* = SEA validity not met in that band for the receiver (fewer than 1 mode per band "
    "or modal overlap below 1): treat as a rough estimate"
)


def _csv_target(value: str | None, option: str) -> Path | None:
    if value is None:
        return None
    p = Path(value)
    if not p.parent.exists():
        raise InputError([Problem(str(p), option, f"folder {str(p.parent)!r} does not exist")])
    return p


def write_csv(table: pd.DataFrame, path: Path) -> None:
    """Write a tidy table atomically (no half-written file on failure)."""
    write_text_atomic(path, table.to_csv(index=False, float_format="%.10g"))


def _fmt_table(head: list[str], rows: list[list[str]]) -> list[str]:
    widths = [max(len(r[k]) for r in [head, *rows]) for k in range(len(head))]
    fmt = "  ".join(f"{{:>{w}}}" for w in widths)
    return [fmt.format(*head), fmt.format(*["-" * w for w in widths])] + [
        fmt.format(*r) for r in rows
    ]


def _load(path: str):  # type: ignore[no-untyped-def]
    data, file, base = read_data(path)
    return data, file, base, build(data, file=file, base_dir=base)


# -- paths --------------------------------------------------------------------------------


def _paths_args(p: argparse.ArgumentParser) -> None:
    p.add_argument("model", help="model file (.toml)")
    p.add_argument("--to", required=True, metavar="RECEIVER", help="receiving subsystem")
    p.add_argument("--csv", metavar="FILE", help="write the per-band path table to FILE")
    p.add_argument(
        "--contributions-csv", metavar="FILE", help="write the per-source contributions to FILE"
    )
    p.add_argument(
        "--connections-csv", metavar="FILE", help="write the connection powers into the receiver"
    )
    p.add_argument(
        "--plot",
        metavar="FILE",
        help="draw the receiver's level and each source's share per band to FILE (.png, .pdf, .svg)",
    )
    p.add_argument("--max-length", type=int, default=6, help="longest path, in connections")
    p.add_argument("--top", type=int, default=10, help="paths listed in the overall ranking")


def _cmd_paths(args: argparse.Namespace) -> int:
    from .paths import connection_powers, contributions, path_ranking, paths

    outs = [
        _csv_target(args.csv, "--csv"),
        _csv_target(args.contributions_csv, "--contributions-csv"),
        _csv_target(args.connections_csv, "--connections-csv"),
    ]
    if args.max_length < 1:
        raise InputError([Problem(args.model, "--max-length", "must be >= 1")])
    plot_path = plot_target(args.plot)
    _, _, _, model = _load(args.model)
    r = receiver_index(model, args.to)
    result = Result(model, solve(model))
    con = contributions(model, args.to)
    pt = paths(model, args.to, max_length=args.max_length)
    cp = connection_powers(result, args.to)
    sink = model.subsystems[r].sink
    bands = model.bands
    valid = con.drop_duplicates("band_hz")["valid"].to_numpy() if len(con) else np.ones(0, bool)
    lv, _, refs = result.level_array()
    print(model.title or model.source)
    what = "absorbed power [W]" if sink else f"level [dB {refs[r]}]"
    print(f"contributions to {model.names[r]}: {what}, share of the total in %")
    srcs = list(dict.fromkeys(con["source"]))
    head = ["band", "total"] + srcs
    rows = []
    for j in range(len(bands)):
        total = f"{result.solution.dissipated_power[r, j]:.3g}" if sink else f"{lv[r, j]:.1f}"
        cells = [bands.label(j) + ("" if valid[j] else " *"), total]
        for s in srcs:
            row = con[(con["source"] == s) & (con["band_hz"] == bands.nominal[j])].iloc[0]
            cells.append(f"{100 * row['share']:.1f} %")
        rows.append(cells)
    print("\n".join(_fmt_table(head, rows)))
    print()
    print(f"strongest paths into {model.names[r]} over all bands (share of the band-summed total)")
    rk = path_ranking(pt).head(args.top)
    rows = [
        [str(int(x["rank"])), str(x["source"]), str(x["path"]), f"{100 * x['share']:.2f} %",
         str(int(x["bands_invalid"]))]
        for _, x in rk.iterrows()
    ]  # fmt: skip
    print("\n".join(_fmt_table(["rank", "source", "path", "share", "bands *"], rows)))
    print()
    print("strongest path per band")
    rows = []
    for j in range(len(bands)):
        top = pt[(pt["band_hz"] == bands.nominal[j]) & (pt["rank"] == 1)]
        if top.empty:
            rows.append([bands.label(j), "-", "(nothing arrives)", "-"])
            continue
        x = top.iloc[0]
        rows.append(
            [bands.label(j) + ("" if valid[j] else " *"), str(x["source"]), str(x["path"]),
             f"{100 * x['share']:.1f} %"]
        )  # fmt: skip
    print("\n".join(_fmt_table(["band", "source", "path", "share"], rows)))
    print()
    print(f"net power into {model.names[r]} per connection (adds up to what it dissipates)")
    conns = list(dict.fromkeys(cp["connection"]))
    rows = []
    for j in range(len(bands)):
        sel = cp[cp["band_hz"] == bands.nominal[j]]
        rows.append(
            [bands.label(j)]
            + [f"{v:.3g}" for v in sel["power_in_W"].to_numpy()]
            + [f"{float(sel['dissipated_W'].iloc[0]):.3g}"]
        )
    print("\n".join(_fmt_table(["band", *conns, "dissipated"], rows)))
    if not valid.all():
        print()
        print(VALIDITY_NOTE)
    for table, path in zip((pt, con, cp), outs, strict=True):
        if path is not None:
            write_csv(table, path)
            print(f"wrote {path}")
    if plot_path is not None:
        from ..plot import plot_contributions

        try:
            plot_contributions(con, result, model.names[r], plot_path)
        except OSError as exc:
            raise InputError(
                [Problem(str(plot_path), "--plot", f"cannot write: {exc.strerror or exc}")]
            ) from None
        print(f"wrote {plot_path}")
    print()
    print("Caution: " + CAUTION)
    return 0


# -- sensitivity --------------------------------------------------------------------------


def _sens_args(p: argparse.ArgumentParser) -> None:
    p.add_argument("model", help="model file (.toml)")
    p.add_argument("--to", required=True, metavar="RECEIVER", help="receiving subsystem")
    p.add_argument(
        "--params",
        metavar="KEYS",
        help="comma-separated key paths of physical parameters in the model file "
        "(e.g. subsystems.floor.thickness,connections.seam.length)",
    )
    p.add_argument("--csv", metavar="FILE", help="write the per-band sensitivity table to FILE")
    p.add_argument("--top", type=int, default=15, help="parameters listed (default 15)")


def _cmd_sensitivity(args: argparse.Namespace) -> int:
    from .sensitivity import add_levels, parameter_sensitivities, ranking, sensitivities

    out = _csv_target(args.csv, "--csv")
    data, file, base, model = _load(args.model)
    r = receiver_index(model, args.to)
    result = Result(model, solve(model))
    tables = [sensitivities(model, args.to, result=result)]
    if args.params:
        params = [x.strip() for x in args.params.split(",") if x.strip()]
        tables.append(
            parameter_sensitivities(data, args.to, params, file=file, base_dir=base, model=model)
        )
    table = add_levels(pd.concat(tables, ignore_index=True), model, result)
    rk = ranking(table)
    print(model.title or model.source)
    print(
        f"sensitivity of the level of {model.names[r]}: dB per dB of each parameter "
        "(overall = energetic band sum)"
    )
    rows = [
        [str(int(x["rank"])), str(x["parameter"]), f"{x['overall_db_per_db']:+.3f}",
         f"{x['max_abs_db_per_db']:.3f}",
         f"{x['band_of_max']:g} Hz" + ("" if x["valid_at_max"] else " *")]
        for _, x in rk.head(args.top).iterrows()
    ]  # fmt: skip
    print("\n".join(_fmt_table(["rank", "parameter", "overall", "max |band|", "at band"], rows)))
    if len(rk) > args.top:
        print(f"({len(rk) - args.top} more in the CSV table)")
    if not rk["valid_at_max"].all():
        print(VALIDITY_NOTE)
    if out is not None:
        write_csv(table, out)
        print(f"wrote {out}")
    print()
    print("Caution: " + CAUTION)
    return 0


# -- spread -------------------------------------------------------------------------------


def _spread_args(p: argparse.ArgumentParser) -> None:
    p.add_argument("model", help="model file (.toml) with [uncertainty.NAME] tables")
    p.add_argument("--samples", type=int, default=1000, help="Monte Carlo samples (default 1000)")
    p.add_argument("--seed", type=int, default=0, help="random seed (default 0)")
    p.add_argument("--csv", metavar="FILE", help="write the per-band percentile table to FILE")
    p.add_argument("--show", metavar="NAMES", help="comma-separated subsystems to print")


def _cmd_spread(args: argparse.Namespace) -> int:
    from .uncertainty import spread

    out = _csv_target(args.csv, "--csv")
    data, file, base, model = _load(args.model)
    names = [s.name for s in model.subsystems if not s.sink]
    if args.show:
        names = [x.strip() for x in args.show.split(",") if x.strip()]
        for n in names:
            receiver_index(model, n, option="--show")
    sp = spread(data, file=file, base_dir=base, samples=args.samples, seed=args.seed)
    t = sp.table()
    print(model.title or model.source)
    print(
        f"{sp.samples} samples (seed {sp.seed}, {sp.method}); "
        "levels in dB: nominal, then 5 / 50 / 95 % percentiles"
    )
    for u in sp.uncertain:
        if u.distribution == "lognormal":
            spec = f"factor {u.factor:g}"
        elif u.distribution == "normal":
            spec = f"sd {u.sd:g}"
        elif u.low is None:
            spec = f"+-{u.tolerance:g} relative"
        else:
            spec = f"{u.low:g} .. {u.high:g}"
        print(f"  {u.parameter}: {u.distribution}, {spec}")
    bands = model.bands
    for n in names:
        sel = t[t["subsystem"] == n]
        if sel.empty:
            continue
        print()
        print(f"{n} [{sel['level_ref'].iloc[0]}]")
        rows = [
            [bands.label(j) + ("" if bool(x["valid"]) else " *"), f"{x['nominal_dB']:.1f}",
             f"{x['p5_dB']:.1f}", f"{x['p50_dB']:.1f}", f"{x['p95_dB']:.1f}"]
            for j, (_, x) in enumerate(sel.iterrows())
        ]  # fmt: skip
        print("\n".join(_fmt_table(["band", "nominal", "5 %", "50 %", "95 %"], rows)))
    ov = sp.overall()
    print()
    print("overall (energetic band sum)")
    rows = [
        [str(x["subsystem"]), f"{x['nominal_dB']:.1f}", f"{x['p5_dB']:.1f}", f"{x['p50_dB']:.1f}",
         f"{x['p95_dB']:.1f}"]
        for _, x in ov.iterrows() if x["subsystem"] in names
    ]  # fmt: skip
    print("\n".join(_fmt_table(["subsystem", "nominal", "5 %", "50 %", "95 %"], rows)))
    if not t[t["subsystem"].isin(names)]["valid"].all():
        print(VALIDITY_NOTE.replace("the receiver", "that subsystem"))
    if model.targets:
        pm = probability_of_meeting(sp)
        print()
        print("probability of meeting each target (fraction of the samples)")
        rows = [[str(x["target"]), str(x["receiver"]), f"{x['probability']:.3f}",
                 f"{x['standard_error']:.3f}", "met" if x["nominal_met"] else "missed"]
                for _, x in pm.iterrows()]  # fmt: skip
        print("\n".join(_fmt_table(["target", "receiver", "probability", "+-", "nominal"], rows)))
    if out is not None:
        write_csv(t, out)
        print(f"wrote {out}")
    print()
    print("Caution: " + CAUTION)
    return 0


def add_commands(registry: dict[str, Command]) -> None:
    """Register ``paths``, ``sensitivity`` and ``spread`` with the command line."""
    from ..cli import Command

    registry["paths"] = Command(
        help="contributions of each source and the transmission paths into a receiver",
        arguments=_paths_args,
        handler=_cmd_paths,
    )
    registry["sensitivity"] = Command(
        help="sensitivity (dB per dB) of a receiver's level to every loss factor, power and "
        "chosen physical parameters (adjoint method)",
        arguments=_sens_args,
        handler=_cmd_sensitivity,
    )
    registry["spread"] = Command(
        help="Monte Carlo spread (5th/50th/95th percentiles) of every level from the model's "
        "[uncertainty] section",
        arguments=_spread_args,
        handler=_cmd_spread,
    )
