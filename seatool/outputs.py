"""Output files: written whole or not at all, all outputs of a run together.

Every file seatool writes (CSV tables, figures, TOML estimates) goes through
:func:`output_file`: the content is written to a temporary file beside the target, then
renamed over it (an atomic step on one file system), with the permissions a newly created
file gets under the process's umask (``0o666 & ~umask``; :func:`tempfile.mkstemp` alone
gives ``0o600``). Inside an :class:`OutputBatch` (the command line opens one per command)
the renames wait for the end of the batch: if anything fails before, no output of the run
is written (a figure that cannot be drawn leaves no CSV behind).
"""

from __future__ import annotations

import errno
import os
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path
from types import TracebackType

from .errors import InputError, Problem

__all__ = ["OutputBatch", "file_mode", "immediate", "output_file", "write_text_atomic"]

#: Open batches, innermost last; None marks an :func:`immediate` block.
_ACTIVE: list[OutputBatch | None] = []


def file_mode() -> int:
    """Permissions of a new file under the current umask (``0o666 & ~umask``)."""
    mask = os.umask(0o022)
    os.umask(mask)
    return 0o666 & ~mask


class OutputBatch:
    """Outputs written to temporary files and committed (renamed) together.

    Use as a context manager: on a normal exit every file is committed; on an exception
    every temporary file is removed and no target is touched.
    """

    def __init__(self) -> None:
        self._pending: list[tuple[Path, Path]] = []

    def reserve(self, target: str | os.PathLike[str]) -> Path:
        """A new temporary file beside ``target`` (same suffix), committed over it later."""
        t = Path(target)
        if t.is_dir():  # refused now, while the caller can still name its option
            raise IsADirectoryError(errno.EISDIR, os.strerror(errno.EISDIR), str(t))
        fd, tmp = tempfile.mkstemp(prefix=".seatool-", suffix=t.suffix, dir=t.parent)
        os.close(fd)
        self._pending.append((Path(tmp), t))
        return Path(tmp)

    def drop(self, tmp: Path) -> None:
        """Forget and remove one temporary file (its content failed)."""
        self._pending = [(p, t) for p, t in self._pending if p != tmp]
        tmp.unlink(missing_ok=True)

    def commit(self) -> None:
        """Rename every temporary file over its target.

        If one cannot be renamed, the targets renamed before it are removed as well and
        :class:`~seatool.errors.InputError` names the file (all or nothing).
        """
        mode = file_mode()
        pending, self._pending = self._pending, []
        for k, (tmp, target) in enumerate(pending):
            try:
                os.chmod(tmp, mode)
                os.replace(tmp, target)
            except OSError as exc:
                # all or nothing: the outputs renamed before go too, the rest is not written
                for rest, _ in pending[k:]:
                    rest.unlink(missing_ok=True)
                for _, done in pending[:k]:
                    done.unlink(missing_ok=True)
                raise InputError(
                    [Problem(str(target), "", f"cannot write: {exc.strerror or exc}")]
                ) from None

    def discard(self) -> None:
        """Remove every temporary file; no target is written."""
        pending, self._pending = self._pending, []
        for tmp, _ in pending:
            tmp.unlink(missing_ok=True)

    def __enter__(self) -> OutputBatch:
        _ACTIVE.append(self)
        return self

    def __exit__(
        self,
        exc_type: type[BaseException] | None,
        exc: BaseException | None,
        tb: TracebackType | None,
    ) -> None:
        _ACTIVE.remove(self)
        if exc_type is None:
            self.commit()
        else:
            self.discard()


@contextmanager
def output_file(target: str | os.PathLike[str]) -> Iterator[Path]:
    """A temporary path to write ``target``'s content to.

    Committed with the active :class:`OutputBatch` (or at once when none is open); removed
    if the ``with`` block fails.
    """
    batch = _ACTIVE[-1] if _ACTIVE else None
    if batch is not None:
        tmp = batch.reserve(target)
        try:
            yield tmp
        except BaseException:
            batch.drop(tmp)
            raise
        return
    with OutputBatch() as own:
        yield own.reserve(target)


@contextmanager
def immediate() -> Iterator[None]:
    """Inside this block files are committed at once, not with the open batch (for an
    intermediate file the program reads back, e.g. a figure embedded in a report)."""
    _ACTIVE.append(None)
    try:
        yield
    finally:
        _ACTIVE.pop()


def write_text_atomic(path: str | os.PathLike[str], text: str) -> None:
    """Write ``text`` (UTF-8, newlines as given) to ``path`` through :func:`output_file`."""
    with output_file(path) as tmp, open(tmp, "w", encoding="utf-8", newline="") as fh:
        fh.write(text)
