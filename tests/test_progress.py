"""Progress bars: on stderr for a terminal only, silent with --quiet and when redirected."""

from __future__ import annotations

import io
import sys
from pathlib import Path

from seatool import progress

RAIL = str(Path(__file__).resolve().parent.parent / "models" / "rail_cab.toml")


class _Terminal(io.StringIO):
    def isatty(self) -> bool:
        return True


def test_bar_shows_on_a_terminal_only(monkeypatch):
    monkeypatch.setattr(progress, "DELAY", 0.0)
    term = _Terminal()
    monkeypatch.setattr(sys, "stderr", term)
    assert list(progress.bar(range(5), desc="work")) == [0, 1, 2, 3, 4]
    assert "work" in term.getvalue()
    progress.set_quiet(True)
    try:
        quiet = _Terminal()
        monkeypatch.setattr(sys, "stderr", quiet)
        assert list(progress.bar(range(3), desc="work")) == [0, 1, 2]
        assert quiet.getvalue() == ""
    finally:
        progress.set_quiet(False)
    redirected = io.StringIO()  # not a terminal
    monkeypatch.setattr(sys, "stderr", redirected)
    assert list(progress.bar(range(3), desc="work")) == [0, 1, 2]
    assert redirected.getvalue() == ""


def test_quiet_option_of_the_command_line(tmp_path, capsys, monkeypatch):
    from seatool.cli import main

    monkeypatch.setattr(progress, "DELAY", 0.0)
    monkeypatch.setattr(sys, "stderr", _Terminal())
    try:
        assert main(["--quiet", "check", RAIL]) == 0
        assert sys.stderr.getvalue() == ""
        assert main(["check", RAIL]) == 0
        assert "deriving connections" in sys.stderr.getvalue()
    finally:
        progress.set_quiet(False)
