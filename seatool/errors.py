"""Input problems reported to people: one line each, with file and key path."""

from __future__ import annotations

import difflib
from collections.abc import Iterable
from dataclasses import dataclass

__all__ = ["InputError", "Problem", "closest"]


@dataclass(frozen=True)
class Problem:
    """One thing wrong with an input: where (file, key path) and what."""

    file: str
    path: str
    message: str

    def __str__(self) -> str:
        where = f"{self.file}: " if self.file else ""
        key = f"{self.path}: " if self.path else ""
        return f"{where}{key}{self.message}"


class InputError(ValueError):
    """Bad input; holds every problem found (the CLI prints one line each, exit code 2)."""

    def __init__(self, problems: Iterable[Problem]):
        self.problems = list(problems)
        super().__init__("\n".join(str(p) for p in self.problems))


def closest(name: str, choices: Iterable[str]) -> str:
    """' (did you mean 'x'?)' for the closest choice, or '' if none is close."""
    match = difflib.get_close_matches(name, list(choices), n=1, cutoff=0.6)
    return f" (did you mean {match[0]!r}?)" if match else ""
