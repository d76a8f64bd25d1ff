"""The benchmark scripts stay runnable: each one imports and answers ``--help``.

Benchmarks are not timed in the test suite (speed goals live in ``benchmarks/`` and
docs/performance.md); this only catches a script that no longer imports after the package
moves a function (a renamed physics module broke ``bench_solve.py`` and ``bench_load.py``
once without any test noticing).
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

BENCHMARKS = Path(__file__).resolve().parents[1] / "benchmarks"
SCRIPTS = sorted(p.name for p in BENCHMARKS.glob("*.py"))


def test_scripts_found() -> None:
    assert "bench_solve.py" in SCRIPTS and "bench_load.py" in SCRIPTS


@pytest.mark.parametrize("script", SCRIPTS)
def test_benchmark_script_answers_help(script: str) -> None:
    proc = subprocess.run(
        [sys.executable, script, "--help"],
        cwd=BENCHMARKS,
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert proc.returncode == 0, proc.stderr[-2000:]
    assert "usage" in proc.stdout.lower()
