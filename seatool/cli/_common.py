"""What every command shares: the :class:`Command` record, exit codes, output helpers.

Light on purpose (standard library and :mod:`seatool.errors`, :mod:`seatool.levels`
only): ``seatool --help`` imports it.
"""

from __future__ import annotations

import argparse
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

from ..errors import InputError, Problem
from ..levels import CAUTION

EXIT_OK, EXIT_INTERNAL, EXIT_INPUT, EXIT_MISSED = 0, 1, 2, 3

Handler = Callable[[argparse.Namespace], int]


@dataclass(frozen=True)
class Command:
    """One subcommand: its name, help text, argument set-up and handler.

    The handler returns an exit code and raises :class:`~seatool.errors.InputError` or
    :class:`~seatool.solve.SolveError` for bad input (exit 2).
    """

    name: str
    help: str
    arguments: Callable[[argparse.ArgumentParser], None]
    handler: Handler
    #: The command reads a model file: it takes the input options of
    #: :func:`input_options` (``--strict``, ``--allow-outside-files``).
    loads_model: bool = True


def input_options(p: argparse.ArgumentParser) -> None:
    """Options of every command that reads a model file."""
    p.add_argument(
        "--strict",
        action="store_true",
        help="treat plausibility warnings (unusual but possible values) as errors (exit 2)",
    )
    p.add_argument(
        "--allow-outside-files",
        action="store_true",
        help="read spectrum files outside the model file's folder tree too",
    )


def print_caution() -> None:
    """The closing caution of every command that shows a level (one wording, one place)."""
    print()
    print("Caution: " + CAUTION)


def output_target(value: str | None, option: str) -> Path | None:
    """A file name given for an output option; InputError if its folder does not exist."""
    if value is None:
        return None
    p = Path(value)
    if not p.parent.exists():
        raise InputError([Problem(str(p), option, f"folder {str(p.parent)!r} does not exist")])
    return p


def cannot_write(path: Path, option: str, exc: OSError) -> InputError:
    """The one-line error for an output file that could not be written."""
    return InputError([Problem(str(path), option, f"cannot write: {exc.strerror or exc}")])


def fmt_table(head: list[str], rows: list[list[str]]) -> list[str]:
    """Right-aligned text table: header, rule, rows."""
    widths = [max(len(r[k]) for r in [head, *rows]) for k in range(len(head))]
    fmt = "  ".join(f"{{:>{w}}}" for w in widths)
    return [fmt.format(*head), fmt.format(*["-" * w for w in widths])] + [
        fmt.format(*r) for r in rows
    ]
