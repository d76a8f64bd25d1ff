"""The ``seatool`` command line.

Exit codes: 0 success, 2 bad input (one line per problem on stderr), 1 internal error.
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from .errors import InputError, Problem, closest
from .model import Model
from .results import CAUTION, write_text_atomic

__all__ = ["main"]

EXIT_OK, EXIT_INTERNAL, EXIT_INPUT = 0, 1, 2

Handler = Callable[[argparse.Namespace], int]


@dataclass(frozen=True)
class Command:
    """A subcommand added by another module: help text, argument set-up and handler.

    The handler returns an exit code and raises :class:`~seatool.errors.InputError` or
    :class:`~seatool.solve.SolveError` for bad input (exit 2).
    """

    help: str
    arguments: Callable[[argparse.ArgumentParser], None]
    handler: Handler


#: Modules that add subcommands: each defines ``add_commands(registry: dict[str, Command])``.
COMMAND_MODULES: list[str] = ["seatool.panel", "seatool.analysis.commands", "seatool.lowfreq"]


def _commands() -> dict[str, Command]:
    import importlib

    registry: dict[str, Command] = {}
    for mod in COMMAND_MODULES:
        importlib.import_module(mod).add_commands(registry)
    return registry


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="seatool",
        description=(
            "Statistical energy analysis of built-up vibro-acoustic systems: band levels, "
            "power flows and checks from a TOML model file."
        ),
        epilog="Caution: " + CAUTION,
    )
    p.add_argument("--debug", action="store_true", help="show a traceback on internal errors")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    sp = sub.add_parser(
        "solve",
        help="solve a model and print band levels",
        description="Solve the SEA power balance of MODEL in every band and print levels.",
        epilog="Caution: " + CAUTION,
    )
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
    cp = sub.add_parser(
        "check",
        help="validate a model and print a summary",
        description="Validate MODEL and summarise it without solving.",
        epilog="Caution: " + CAUTION,
    )
    cp.add_argument("model", help="model file (.toml)")
    for name, cmd in _commands().items():
        extra = sub.add_parser(
            name, help=cmd.help, description=cmd.help, epilog="Caution: " + CAUTION
        )
        cmd.arguments(extra)
        extra.set_defaults(handler=cmd.handler)
    return p


def _load(path: str) -> Model:
    from .modelfile import load

    return load(path)


load_model = _load


def _names(model: Model, spec: str | None, file: str) -> list[str] | None:
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
    from . import run

    model = _load(args.model)
    names = _names(model, args.show, args.model)
    csv_path = Path(args.csv) if args.csv else None
    from .plot import plot_target

    plot_path = plot_target(args.plot)
    if csv_path is not None and not csv_path.parent.exists():
        raise InputError(
            [Problem(str(csv_path), "--csv", f"folder {str(csv_path.parent)!r} does not exist")]
        )
    metrics_path = Path(args.metrics_csv) if args.metrics_csv else None
    if metrics_path is not None and not metrics_path.parent.exists():
        raise InputError(
            [
                Problem(
                    str(metrics_path),
                    "--metrics-csv",
                    f"folder {str(metrics_path.parent)!r} does not exist",
                )
            ]
        )
    result = run(model)
    print(result.render(names, digits=args.digits))
    from .analysis import comfort

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
            result.to_csv(csv_path)
        except OSError as exc:
            raise InputError(
                [Problem(str(csv_path), "--csv", f"cannot write: {exc.strerror or exc}")]
            ) from None
        print(f"wrote {csv_path}")
    if metrics_path is not None:
        try:
            write_text_atomic(metrics_path, comfort_table.to_csv(index=False, float_format="%.10g"))
        except OSError as exc:
            raise InputError(
                [
                    Problem(
                        str(metrics_path), "--metrics-csv", f"cannot write: {exc.strerror or exc}"
                    )
                ]
            ) from None
        print(f"wrote {metrics_path}")
    if plot_path is not None:
        from .plot import plot_levels

        try:
            plot_levels(result, plot_path, names)
        except OSError as exc:
            raise InputError(
                [Problem(str(plot_path), "--plot", f"cannot write: {exc.strerror or exc}")]
            ) from None
        print(f"wrote {plot_path}")
    print()
    print("Caution: " + CAUTION)
    return EXIT_OK


def _range(a: np.ndarray) -> str:
    lo, hi = float(np.min(a)), float(np.max(a))
    return f"{lo:.3g}" if np.isclose(lo, hi) else f"{lo:.3g} .. {hi:.3g}"


def summary(model: Model) -> str:
    """Plain-text summary of a model (used by ``seatool check``)."""
    b = model.bands
    out = [
        f"model: {model.title or '(untitled)'}  [{model.source}]",
        f"bands: {len(b)} {b.kind} bands, {b.label(0)} - {b.label(-1)}",
        f"subsystems ({len(model.subsystems)}):",
    ]
    w = max(len(s.name) for s in model.subsystems)
    for s in model.subsystems:
        if s.sink:
            out.append(f"  {s.name:<{w}}  {s.kind:<10}  free-field sink")
            continue
        size = (
            f"V = {s.volume:g} m^3"
            if s.volume is not None
            else (f"M = {s.mass:g} kg" if s.mass is not None else "")
        )
        out.append(
            f"  {s.name:<{w}}  {s.kind:<10}  {size:<14}  n(f) = {_range(s.modal_density)} modes/Hz"
            f"  eta = {_range(s.damping)}"
        )
    out.append(f"connections ({len(model.connections)}):")
    for c in model.connections:
        out.append(f"  {c.name}: {c.a} -> {c.b} ({c.kind}), eta = {_range(c.coupling_loss_factor)}")
    out.append(f"excitations ({len(model.excitations)}):")
    overall = 0.0
    for e in model.excitations:
        if e.kind == "power":
            assert e.power is not None
            total = float(np.sum(e.power))
            overall += total
            given = f" from {e.quantity}" if e.quantity not in (None, "power") else ""
            out.append(
                f"  {e.name}: input power into {e.subsystem}{given}, total {total:.3g} W over "
                "the bands"
            )
        else:
            assert e.level is not None
            out.append(f"  {e.name}: {e.subsystem} held at {e.quantity} {_range(e.level)} dB")
    if any(e.kind == "power" for e in model.excitations):
        out.append(f"  total input power of the sources: {overall:.3g} W")
    from .kinds.treatment import summary_lines  # treated plates, linings (mass per area)

    out.extend(summary_lines(model))
    for note in model.notes:
        out.append(f"note: {note}")
    from .validity_report import check_table

    out.append(check_table(model))
    return "\n".join(out)


def _cmd_check(args: argparse.Namespace) -> int:
    model = _load(args.model)
    print(summary(model))
    print("model is valid")
    return EXIT_OK


HANDLERS: dict[str, Callable[[argparse.Namespace], int]] = {
    "solve": _cmd_solve,
    "check": _cmd_check,
}


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code."""
    from .solve import SolveError

    parser = _parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # argparse: usage errors exit 2, --help exits 0
        return int(exc.code or 0)
    if args.command is None:
        parser.print_help()
        return EXIT_INPUT
    try:
        handler = HANDLERS.get(args.command) or args.handler
        return int(handler(args))
    except InputError as exc:
        for p in exc.problems:
            print(f"error: {p}", file=sys.stderr)
        return EXIT_INPUT
    except SolveError as exc:
        print(f"error: {getattr(args, 'model', '')}: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        print("interrupted", file=sys.stderr)
        return EXIT_INTERNAL
    except Exception as exc:  # pragma: no cover - exercised through a test hook
        if args.debug:
            raise
        print(
            f"internal error: {type(exc).__name__}: {exc} (run with --debug for details; "
            "please report it)",
            file=sys.stderr,
        )
        return EXIT_INTERNAL
