"""Progress bars on stderr for work that can take more than a couple of seconds.

One switch for the whole program: bars show only when stderr is a terminal, not before
:data:`DELAY` seconds have passed (quick runs print nothing), and never after
:func:`set_quiet` (the command line's ``--quiet``). Bars are tqdm's, written to stderr
so that standard output stays clean for tables and redirection.
"""

from __future__ import annotations

import sys
from collections.abc import Iterable, Iterator
from typing import TypeVar

from tqdm import tqdm

__all__ = ["DELAY", "bar", "enabled", "set_quiet"]

T = TypeVar("T")

#: Seconds before a bar appears.
DELAY = 2.0
_quiet = False


def set_quiet(quiet: bool) -> None:
    """Silence (True) or allow (False) every progress bar of this process."""
    global _quiet
    _quiet = bool(quiet)


def enabled() -> bool:
    """Whether bars may show: stderr is a terminal and nobody asked for quiet."""
    return not _quiet and sys.stderr.isatty()


def bar(items: Iterable[T], *, desc: str, total: int | None = None) -> Iterator[T]:
    """Iterate over ``items`` with a progress bar (see the module notes for when it shows)."""
    yield from tqdm(
        items, desc=desc, total=total, file=sys.stderr, disable=not enabled(), delay=DELAY,
        leave=False, unit="",
    )  # fmt: skip
