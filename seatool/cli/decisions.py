"""Command-line front ends of the design decisions: ``seatool variants`` and ``lightest``."""

from __future__ import annotations

import argparse
from typing import Any

import seatool

from ..errors import InputError, Problem
from ._common import EXIT_MISSED, Command, print_caution
from ._common import fmt_table as _fmt_table
from ._common import output_target as _csv_target


def write_csv(table: object, path: object) -> None:
    """Write a tidy table atomically, the caution first."""
    seatool.results.write_csv(table, path)  # type: ignore[arg-type]



def _wrote(path: object) -> None:
    print(f"wrote {path}")


def _variants_args(p: argparse.ArgumentParser) -> None:
    p.add_argument("variants", help="variants file (.toml): base = MODEL, [variants.NAME] tables")
    p.add_argument("--csv", metavar="FILE", help="write the band-by-band differences to FILE")
    p.add_argument(
        "--margins-csv", metavar="FILE", help="write the margins of every variant to FILE"
    )
    p.add_argument(
        "--plot", metavar="FILE", help="draw the differences to the base per band to FILE"
    )


def _confidence_of_meeting(results: Any) -> dict[tuple[str, str], float]:
    """(variant, target) -> probability of meeting it from the SEA ensemble variance."""
    out: dict[tuple[str, str], float] = {}
    for name, result in results.items():
        if not result.model.targets:
            continue
        pm = seatool.analysis.targets.probability_from_variance(result)
        for _, r in pm.iterrows():
            out[(str(name), str(r["target"]))] = float(r["probability"])
    return out


def _cmd_variants(args: argparse.Namespace) -> int:
    out = _csv_target(args.csv, "--csv")
    out_m = _csv_target(args.margins_csv, "--margins-csv")
    fig = seatool.plot.plot_target(args.plot)
    data, file, folder, variants = seatool.analysis.variants.load_variants(args.variants)
    c = seatool.analysis.variants.compare(data, variants, file=file, base_dir=folder)
    print(f"design variants of {file}")
    for v in variants:
        print(f"  {v.name}: {v.description or ', '.join(v.changes)}")
    print()
    rows = [
        [str(r["variant"]), str(r["receiver"]), f"{r['overall_dB']:.1f}",
         f"{r['overall_dBA']:.1f}", f"{r['worst_band_hz']:g}", f"{r['added_mass_kg']:.2f}"]
        for _, r in c.levels.iterrows()
    ]  # fmt: skip
    head = ["variant", "receiver", "dB", "dB(A)", "worst band Hz", "added kg"]
    print("\n".join(_fmt_table(head, rows)))
    if len(c.margins):
        print()
        print("margins to the targets (limit - level; positive = met)")
        summary = c.margins.groupby(["variant", "target"], sort=False)["margin"].min()
        confidence = _confidence_of_meeting(c.results)
        rows = []
        for key, m in summary.items():
            names = [str(x) for x in key] if isinstance(key, tuple) else [str(key), ""]
            p = confidence.get((names[0], names[1]))
            rows.append([*names, f"{m:+.1f}", "met" if m >= 0 else "MISSED",
                         "-" if p is None else f"{100 * p:.0f} %"])  # fmt: skip
        head = ["variant", "target", "smallest margin", "verdict", "confidence"]
        print("\n".join(_fmt_table(head, rows)))
        print("confidence: probability of meeting the target over nominally identical builds "
              "(SEA variance estimate, seatool.analysis.targets.probability_from_variance)")
    if len(c.masses):
        print()
        print("added mass per treatment")
        rows = [[str(r["variant"]), str(r["subsystem"]), f"{r['added_kg']:.2f}",
                 "" if r["trim_resonance_hz"] != r["trim_resonance_hz"] else f"{r['trim_resonance_hz']:.0f}"]
                for _, r in c.masses.iterrows()]  # fmt: skip
        print("\n".join(_fmt_table(["variant", "plate", "kg", "trim f0 Hz"], rows)))
    print()
    if c.flags:
        for f in c.flags:
            print(f"warning: {f}")
    else:
        print("no variant raises any band of a receiver by more than 1 dB")
    if out is not None:
        write_csv(c.difference, out)
        _wrote(out)
    if out_m is not None:
        write_csv(c.margins, out_m)
        _wrote(out_m)
    if fig is not None:
        _wrote(seatool.plot.plot_variants(c.difference, fig))
    print()
    print_caution()
    return 0


def _lightest_args(p: argparse.ArgumentParser) -> None:
    p.add_argument(
        "candidates",
        help="candidates file (.toml): base = MODEL, [surfaces.SURFACE.OPTION] tables",
    )
    p.add_argument(
        "--alternatives", type=int, default=3, help="next-best combinations to show (default 3)"
    )
    p.add_argument("--csv", metavar="FILE", help="write the margins of the answer to FILE")
    p.add_argument("--plot", metavar="FILE", help="draw the answer's margin per band to FILE")
    p.add_argument(
        "--fail-on-miss",
        action="store_true",
        help=f"exit with code {EXIT_MISSED} when no combination meets every target",
    )


def _cmd_lightest(args: argparse.Namespace) -> int:
    if args.alternatives < 0:
        raise InputError([Problem("", "--alternatives", "must be >= 0")])
    out = _csv_target(args.csv, "--csv")
    fig = seatool.plot.plot_target(args.plot)
    data, file, folder, surfaces, settings = seatool.analysis.candidates.load_candidates(args.candidates)
    ans = seatool.analysis.lightest.lightest_treatment(
        data,
        surfaces,
        file=file,
        base_dir=folder,
        alternatives=args.alternatives,
        **settings,
    )
    print(ans.summary())
    if ans.found:
        pm = seatool.analysis.targets.probability_from_variance(ans.result)
        print(seatool.analysis.targets.render_confidence(pm))
    if len(ans.alternatives):
        print()
        print("next-best combinations meeting every target")
        cols = [s.name for s in surfaces]
        rows = [[*(str(r[c]) for c in cols), f"{r['mass_kg']:.2f}", f"{r['smallest_margin']:+.2f}"]
                for _, r in ans.alternatives.iterrows()]  # fmt: skip
        print("\n".join(_fmt_table([*cols, "added kg", "smallest margin"], rows)))
    if out is not None:
        write_csv(ans.margins, out)
        _wrote(out)
    if fig is not None:
        _wrote(seatool.plot.plot_band_margins(ans.margins, fig))
    print()
    print_caution()
    return EXIT_MISSED if args.fail_on_miss and not ans.found else 0


VARIANTS = Command(
    name="variants",
    help="solve design variants of a base model side by side (levels, margins, added "
    "mass, differences to the base, rises above 1 dB named)",
    arguments=_variants_args,
    handler=_cmd_variants,
)
LIGHTEST = Command(
    name="lightest",
    help="the lightest combination of candidate treatments that meets every target",
    arguments=_lightest_args,
    handler=_cmd_lightest,
)
