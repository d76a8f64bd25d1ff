"""Derived records remembered by their inputs, for rebuilding one model many times.

A physical-parameter Monte Carlo (or any study that rebuilds a model file with a few
values changed) reads the same file again and again; most of its subsystems, couplings and
excitations do not depend on the values that changed. :class:`Records` remembers, for each
table of the file, what its reader produced last time together with everything the reader
looked at:

* the table itself (compared by value);
* the subsystem records it was handed (compared by identity: a record re-derived in this
  build is a new object, one taken over unchanged is the same object);
* the subsystems it looked up by name in the mapping of all subsystems, and the raw
  tables of other subsystems it read through :attr:`Reader.declared` (both tracked while
  the reader runs, so the dependencies are the ones actually used, not declared by hand);
* a context: file, folder, options, the ``bands``, ``fluids`` and ``materials`` sections
  and the subsystem names (any change there forgets everything).

When all of it is unchanged, :meth:`Records.derive` hands back the remembered result and
repeats what the reader reported (problems, notes, reports, warnings), so a rebuild gives
the same model as a full read; otherwise it runs the reader and remembers the new result.
Derived records are immutable (frozen records with read-only arrays), so sharing them
between models is safe. The tables are remembered by reference, not copied: the data of
every build must not be changed in place afterwards (the analyses build changed copies,
:func:`seatool.analysis._keypath.with_values`).
"""

from __future__ import annotations

import copy
from collections.abc import Callable, Iterator, Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any, TypeVar

from .reader import Reader

__all__ = ["Records"]

T = TypeVar("T")

_ALL = object()


class _Tracked(Mapping[str, Any]):
    """A read-only view of a mapping that notes which values were read."""

    def __init__(self, inner: Mapping[str, Any]) -> None:
        self._inner = inner
        self.read: set[str] = set()
        self.everything = False

    def __getitem__(self, key: str) -> Any:
        value = self._inner[key]
        self.read.add(key)
        return value

    def get(self, key: str, default: Any = None) -> Any:
        if key in self._inner:
            return self[key]
        return default

    def __contains__(self, key: object) -> bool:
        return key in self._inner

    def __iter__(self) -> Iterator[str]:
        return iter(self._inner)

    def __len__(self) -> int:
        return len(self._inner)

    def values(self) -> Any:
        self.everything = True
        return self._inner.values()

    def items(self) -> Any:
        self.everything = True
        return self._inner.items()


@dataclass
class _Entry:
    table: Any
    ends: tuple[Any, ...]
    subs_read: dict[str, Any] | None  # None: every subsystem (compared as a whole)
    subs_all: tuple[Any, ...]
    declared_read: dict[str, Any]
    extra: Any
    value: Any
    problems: list[Any] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    reports: list[str] = field(default_factory=list)
    warnings: list[Any] = field(default_factory=list)


def _same_objects(a: Sequence[Any], b: Sequence[Any]) -> bool:
    return len(a) == len(b) and all(x is y for x, y in zip(a, b, strict=True))


class Records:
    """What each table of a model file derived last time, keyed by what it read.

    Pass one instance to every :func:`seatool.modelfile.build` of the same file (the first
    build fills it). Not thread-safe: one instance per loop.
    """

    def __init__(self) -> None:
        self._context: Any = None
        self._store: dict[str, _Entry] = {}
        #: Tables derived anew / taken over in the builds so far (for tests and profiles).
        self.derived = 0
        self.reused = 0

    def begin(self, rd: Reader, data: Mapping[str, Any], options: Any) -> None:
        """Start a build: forget everything if the context of the tables changed."""
        ctx = (
            rd.file,
            str(rd.base_dir),
            rd.allow_outside_files,
            options,
            data.get("bands"),
            data.get("fluids"),
            data.get("materials"),
            tuple(rd.declared),
        )
        if ctx != self._context:
            self._store.clear()
            self._context = copy.deepcopy(ctx)

    def derive(
        self,
        rd: Reader,
        slot: str,
        table: Any,
        compute: Callable[[Mapping[str, Any] | None], T],
        *,
        ends: Sequence[Any] = (),
        subs: Mapping[str, Any] | None = None,
        extra: Any = None,
    ) -> T:
        """The result of ``compute(tracked_subs)`` for table ``slot``, remembered.

        ``table`` is the raw table (compared by value), ``ends`` the records handed to the
        reader (compared by identity), ``subs`` the mapping of all subsystems (the reader
        gets a tracking view of it; the values it reads are compared by identity), and
        ``extra`` any further input (compared by value).
        """
        entry = self._store.get(slot)
        if entry is not None and self._matches(entry, rd, table, ends, subs, extra):
            self.reused += 1
            rd.problems.extend(entry.problems)
            rd.notes.extend(entry.notes)
            rd.reports.extend(entry.reports)
            for w in entry.warnings:
                if w not in rd.warnings:
                    rd.warnings.append(w)
            return entry.value
        self.derived += 1
        marks = (len(rd.problems), len(rd.notes), len(rd.reports), len(rd.warnings))
        declared = rd.declared
        tracked_declared = _Tracked(declared)
        tracked_subs = _Tracked(subs) if subs is not None else None
        rd.declared = tracked_declared
        try:
            value = compute(tracked_subs)
        finally:
            rd.declared = declared
        if tracked_declared.everything:
            declared_read = dict(declared.items())
        else:
            declared_read = {k: declared[k] for k in tracked_declared.read}
        subs_read: dict[str, Any] | None = None
        subs_all: tuple[Any, ...] = ()
        if subs is not None and tracked_subs is not None:
            if tracked_subs.everything:
                subs_all = tuple(subs.values())
            else:
                subs_read = {k: subs[k] for k in tracked_subs.read}
        self._store[slot] = _Entry(
            table=table,
            ends=tuple(ends),
            subs_read=subs_read,
            subs_all=subs_all,
            declared_read=declared_read,
            extra=extra,
            value=value,
            problems=rd.problems[marks[0] :],
            notes=rd.notes[marks[1] :],
            reports=rd.reports[marks[2] :],
            warnings=rd.warnings[marks[3] :],
        )
        return value

    @staticmethod
    def _matches(
        entry: _Entry,
        rd: Reader,
        table: Any,
        ends: Sequence[Any],
        subs: Mapping[str, Any] | None,
        extra: Any,
    ) -> bool:
        if not _same_objects(entry.ends, tuple(ends)):
            return False
        if subs is not None:
            if entry.subs_read is None:
                if not _same_objects(entry.subs_all, tuple(subs.values())):
                    return False
            elif any(subs.get(k, _ALL) is not v for k, v in entry.subs_read.items()):
                return False
        for k, v in entry.declared_read.items():
            if rd.declared.get(k, _ALL) != v:
                return False
        return bool(entry.table == table and entry.extra == extra)
