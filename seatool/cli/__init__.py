"""The ``seatool`` command line.

Every command is listed once, in :data:`COMMANDS`; each lives in a module of this
package that only parses its options, calls documented functions below the command
layer and prints or writes what they return:

=============  ====================  ===================================================
command        module                Python function(s) it calls
=============  ====================  ===================================================
solve          :mod:`.model`         :func:`seatool.load`, :func:`seatool.run`,
                                     :func:`seatool.analysis.comfort.receiver_metrics`,
                                     :func:`seatool.plot_levels`
check          :mod:`.model`         :func:`seatool.load`, :func:`seatool.model_summary`
panel          :mod:`.panel`         :func:`seatool.panel_table`
paths          :mod:`.analysis`      :func:`seatool.contributions`, :func:`seatool.paths`,
                                     :func:`seatool.connection_powers`,
                                     :func:`seatool.path_ranking`
sensitivity    :mod:`.analysis`      :func:`seatool.analysis.sensitivity.receiver_sensitivities`,
                                     :func:`seatool.ranking`
spread         :mod:`.analysis`      :func:`seatool.spread`
sweep          :mod:`.sweep`         :func:`seatool.analysis.sweep.sweep`,
                                     :func:`seatool.analysis.sweep.sobol_indices`,
                                     :func:`seatool.plot.plot_sweep`
report         :mod:`.report`        :func:`seatool.report.write_report`
=============  ====================  ===================================================

Nothing below this package imports it. A command's options are set up only when that
command runs, so ``seatool --help`` imports neither numpy's users nor pandas.

Exit codes: 0 success, 2 bad input (one line per problem on stderr), 1 internal error.
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Sequence

import seatool

from .._version import __version__
from ..errors import InputError
from ..levels import CAUTION
from . import analysis, decisions, lowfreq, measured, model, panel, report, sweep
from ._common import EXIT_INPUT, EXIT_INTERNAL, Command

__all__ = ["COMMANDS", "main"]

#: The commands, in the order ``seatool --help`` lists them.
COMMANDS: tuple[Command, ...] = (
    model.SOLVE,
    model.CHECK,
    panel.PANEL,
    analysis.PATHS,
    analysis.SENSITIVITY,
    analysis.SPREAD,
    sweep.SWEEP,
    decisions.VARIANTS,
    decisions.LIGHTEST,
    measured.LOSS_FACTORS,
    lowfreq.LOWFREQ,
    report.REPORT,
)


def _selected(argv: Sequence[str]) -> str | None:
    """The command named on the command line (the first word that is a command)."""
    names = {c.name for c in COMMANDS}
    return next((a for a in argv if a in names), None)


def _parser(selected: str | None) -> argparse.ArgumentParser:
    """The argument parser; only the ``selected`` command gets its options set up."""
    p = argparse.ArgumentParser(
        prog="seatool",
        description=(
            "Statistical energy analysis of built-up vibro-acoustic systems: band levels, "
            "power flows and checks from a TOML model file."
        ),
        epilog="Caution: " + CAUTION,
    )
    p.add_argument("--version", action="version", version=f"seatool {__version__}")
    p.add_argument("--debug", action="store_true", help="show a traceback on internal errors")
    p.add_argument(
        "--quiet", action="store_true", help="no progress bars (they show only on a terminal)"
    )
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    for cmd in COMMANDS:
        sp = sub.add_parser(
            cmd.name, help=cmd.help, description=cmd.help, epilog="Caution: " + CAUTION
        )
        if cmd.name == selected:
            cmd.arguments(sp)
        sp.set_defaults(handler=cmd.handler)
    return p


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code."""
    argv = list(sys.argv[1:] if argv is None else argv)
    parser = _parser(_selected(argv))
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # argparse: usage errors exit 2, --help and --version exit 0
        return int(exc.code or 0)
    if args.command is None:
        parser.print_help()
        return EXIT_INPUT
    try:
        if args.quiet:
            seatool.progress.set_quiet(True)
        return int(args.handler(args))
    except InputError as exc:
        for p in exc.problems:
            print(f"error: {p}", file=sys.stderr)
        return EXIT_INPUT
    except seatool.SolveError as exc:  # evaluated only when an error reaches this clause
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
    finally:
        seatool.progress.set_quiet(False)  # the switch lasts one run (main may run again)
