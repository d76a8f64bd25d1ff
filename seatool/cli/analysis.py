"""``seatool paths``, ``seatool sensitivity``, ``seatool spread``: parse, call, print.

The work is done by the documented functions of :mod:`seatool.analysis`
(:func:`~seatool.analysis.paths.contributions`, :func:`~seatool.analysis.paths.paths`,
:func:`~seatool.analysis.paths.connection_powers`,
:func:`~seatool.analysis.sensitivity.receiver_sensitivities`,
:func:`~seatool.analysis.uncertainty.spread`), reached through the lazy package
attributes of :mod:`seatool` so that ``seatool --help`` does not import them.
"""

from __future__ import annotations

import argparse
from typing import Any

import seatool

from ..errors import InputError, Problem
from ._common import Command, cannot_write, fmt_table, output_target, print_caution

__all__ = ["PATHS", "SENSITIVITY", "SPREAD"]

VALIDITY_NOTE = (
    "* = SEA validity not met in that band for the receiver (fewer than 1 mode per band "
    "or modal overlap below 1): treat as a rough estimate"
)


def _write_csv(table: Any, path: Any) -> None:
    """Write a tidy table atomically, the caution on its first line."""
    seatool.results.write_csv(table, path)


def _load(path: str) -> tuple[dict[str, Any], str, Any, Any]:
    data, file, base = seatool.analysis.read_data(path)
    return data, file, base, seatool.modelfile.build(data, file=file, base_dir=base)


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
    outs = [
        output_target(args.csv, "--csv"),
        output_target(args.contributions_csv, "--contributions-csv"),
        output_target(args.connections_csv, "--connections-csv"),
    ]
    if args.max_length < 1:
        raise InputError([Problem(args.model, "--max-length", "must be >= 1")])
    plot_path = seatool.plot.plot_target(args.plot)
    _, _, _, model = _load(args.model)
    r = seatool.analysis.receiver_index(model, args.to)
    result = seatool.run(model)
    con = seatool.contributions(model, args.to)
    pt = seatool.paths(model, args.to, max_length=args.max_length)
    cp = seatool.connection_powers(result, args.to)
    sink = model.subsystems[r].sink
    bands = model.bands
    valid = [bool(v) for v in con.drop_duplicates("band_hz")["valid"]] if len(con) else []
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
    print("\n".join(fmt_table(head, rows)))
    print()
    print(f"strongest paths into {model.names[r]} over all bands (share of the band-summed total)")
    rk = seatool.path_ranking(pt).head(args.top)
    rows = [
        [str(int(x["rank"])), str(x["source"]), str(x["path"]), f"{100 * x['share']:.2f} %",
         str(int(x["bands_invalid"]))]
        for _, x in rk.iterrows()
    ]  # fmt: skip
    print("\n".join(fmt_table(["rank", "source", "path", "share", "bands *"], rows)))
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
    print("\n".join(fmt_table(["band", "source", "path", "share"], rows)))
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
    print("\n".join(fmt_table(["band", *conns, "dissipated"], rows)))
    if not all(valid):
        print()
        print(VALIDITY_NOTE)
    for table, path in zip((pt, con, cp), outs, strict=True):
        if path is not None:
            _write_csv(table, path)
            print(f"wrote {path}")
    if plot_path is not None:
        try:
            seatool.plot_contributions(con, result, model.names[r], plot_path)
        except OSError as exc:
            raise cannot_write(plot_path, "--plot", exc) from None
        print(f"wrote {plot_path}")
    print_caution()
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
    p.add_argument(
        "--plot", metavar="FILE",
        help="draw the largest overall sensitivities to FILE (.png, .pdf or .svg)",
    )  # fmt: skip
    p.add_argument(
        "--metric", choices=sorted(seatool.metrics.METRICS),
        help="also rank the parameters by their effect on this metric of the receiver "
        "(chain rule through the metric: dB(A), dB(C), SIL, sone, phon, dB)",
    )  # fmt: skip
    p.add_argument(
        "--field", choices=("diffuse", "free"), default="diffuse",
        help="sound field of the loudness metrics (default diffuse)",
    )  # fmt: skip


def _print_metric_ranking(model: Any, table: Any, receiver: str, metric: str, field: str,
                          top: int) -> None:  # fmt: skip
    if model.subsystem(receiver).quantity != "sound_pressure":
        raise InputError(
            [Problem(model.source, "--metric", f"{receiver!r} is not a cavity; metrics of "
                     "what the occupants hear need a sound pressure level")]
        )  # fmt: skip
    result = seatool.run(model)
    ms = seatool.analysis.comfort.metric_sensitivities(result, table, metric, field=field)
    ms = ms.reindex(ms["dM_dlnx"].abs().sort_values(ascending=False, kind="stable").index)
    value, unit = float(ms["value"].iloc[0]), str(ms["unit"].iloc[0])
    print()
    print(f"sensitivity of {metric} of {receiver} ({value:.2f} {unit}): change for a 1 % "
          "increase of each parameter (chain rule through the metric)")  # fmt: skip
    rows = [
        [str(i + 1), str(x["parameter"]), f"{x['dM_per_percent']:+.4f} {unit}"]
        for i, (_, x) in enumerate(ms.head(top).iterrows())
    ]
    print("\n".join(fmt_table(["rank", "parameter", "per +1 %"], rows)))


def _cmd_sensitivity(args: argparse.Namespace) -> int:
    out = output_target(args.csv, "--csv")
    plot_path = seatool.plot.plot_target(args.plot)
    params = [x.strip() for x in (args.params or "").split(",") if x.strip()]
    model, table = seatool.analysis.sensitivity.receiver_sensitivities(
        args.model, args.to, params
    )
    r = model.index()[args.to]
    rk = seatool.ranking(table)
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
    print("\n".join(fmt_table(["rank", "parameter", "overall", "max |band|", "at band"], rows)))
    if len(rk) > args.top:
        print(f"({len(rk) - args.top} more in the CSV table)")
    if not rk["valid_at_max"].all():
        print(VALIDITY_NOTE)
    if args.metric is not None:
        _print_metric_ranking(model, table, args.to, args.metric, args.field, args.top)
    if out is not None:
        _write_csv(table, out)
        print(f"wrote {out}")
    if plot_path is not None:
        seatool.plot.plot_sensitivity(rk, model.names[r], plot_path, top=args.top)
        print(f"wrote {plot_path}")
    print_caution()
    return 0


# -- spread -------------------------------------------------------------------------------


def _spread_args(p: argparse.ArgumentParser) -> None:
    p.add_argument("model", help="model file (.toml) with [uncertainty.NAME] tables")
    p.add_argument("--samples", type=int, default=1000, help="Monte Carlo samples (default 1000)")
    p.add_argument("--seed", type=int, default=0, help="random seed (default 0)")
    p.add_argument("--csv", metavar="FILE", help="write the per-band percentile table to FILE")
    p.add_argument("--show", metavar="NAMES", help="comma-separated subsystems to print")
    p.add_argument(
        "--plot", metavar="FILE",
        help="draw the 5-95 %% band of the first shown subsystem to FILE (.png, .pdf or .svg)",
    )  # fmt: skip


def _cmd_spread(args: argparse.Namespace) -> int:
    out = output_target(args.csv, "--csv")
    plot_path = seatool.plot.plot_target(args.plot)
    data, file, base, model = _load(args.model)
    names = [s.name for s in model.subsystems if not s.sink]
    if args.show:
        names = [x.strip() for x in args.show.split(",") if x.strip()]
        for n in names:
            seatool.analysis.receiver_index(model, n, option="--show")
    sp = seatool.spread(
        data, file=file, base_dir=base, samples=args.samples, seed=args.seed,
        progress=seatool.progress.enabled(),
    )  # fmt: skip
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
        print("\n".join(fmt_table(["band", "nominal", "5 %", "50 %", "95 %"], rows)))
    ov = sp.overall()
    print()
    print("overall (energetic band sum)")
    rows = [
        [str(x["subsystem"]), f"{x['nominal_dB']:.1f}", f"{x['p5_dB']:.1f}", f"{x['p50_dB']:.1f}",
         f"{x['p95_dB']:.1f}"]
        for _, x in ov.iterrows() if x["subsystem"] in names
    ]  # fmt: skip
    print("\n".join(fmt_table(["subsystem", "nominal", "5 %", "50 %", "95 %"], rows)))
    if not t[t["subsystem"].isin(names)]["valid"].all():
        print(VALIDITY_NOTE.replace("the receiver", "that subsystem"))
    if model.targets:
        pm = seatool.analysis.targets.probability_of_meeting(sp)
        print()
        print("probability of meeting each target (fraction of the samples)")
        rows = [[str(x["target"]), str(x["receiver"]), f"{x['probability']:.3f}",
                 f"{x['standard_error']:.3f}", "met" if x["nominal_met"] else "missed"]
                for _, x in pm.iterrows()]  # fmt: skip
        print("\n".join(fmt_table(["target", "receiver", "probability", "+-", "nominal"], rows)))
    if out is not None:
        _write_csv(t, out)
        print(f"wrote {out}")
    if plot_path is not None:
        seatool.plot.plot_spread(t, names[0], bands, plot_path)
        print(f"wrote {plot_path}")
    print_caution()
    return 0


PATHS = Command(
    "paths",
    help="contributions of each source and the transmission paths into a receiver",
    arguments=_paths_args,
    handler=_cmd_paths,
)
SENSITIVITY = Command(
    "sensitivity",
    help="sensitivity (dB per dB) of a receiver's level to every loss factor, power and "
    "chosen physical parameters (adjoint method)",
    arguments=_sens_args,
    handler=_cmd_sensitivity,
)
SPREAD = Command(
    "spread",
    help="Monte Carlo spread (5th/50th/95th percentiles) of every level from the model's "
    "[uncertainty] section",
    arguments=_spread_args,
    handler=_cmd_spread,
)
