"""Whole processes: start-up (``import seatool``, ``seatool --help``) and ``seatool solve``
of every shipped model.

Each case is a fresh interpreter, timed from start to exit: wall clock, and the CPU time
of the child process (user + system, from ``resource.getrusage(RUSAGE_CHILDREN)``; BLAS
threads included). Best and median of ``--repeat`` runs, interleaved so that every case
sees the same machine load; the load average is printed before and after. The floors are
the bare interpreter and ``import numpy`` (what any numerical Python package pays).
Goals (docs/performance.md): ``import seatool`` under 0.25 s, ``seatool --help`` under
0.5 s, ``seatool solve models/rail_cab.toml`` under 2 s of CPU.

An installed package runs from compiled bytecode, so the children may write and read
``__pycache__`` even when ``PYTHONDONTWRITEBYTECODE`` is set here (``--no-bytecode`` keeps
the environment as it is: every process then compiles seatool's sources again). One
untimed run of every case comes first.

Usage::

    python benchmarks/bench_import.py --repeat 5
    python -X importtime -c "import seatool" 2> importtime.txt   # per-module breakdown
"""

from __future__ import annotations

import argparse
import os
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
MODELS = ROOT / "models"

START_CASES = {
    "python (bare interpreter)": ["-c", "pass"],
    "import numpy": ["-c", "import numpy"],
    "import seatool": ["-c", "import seatool"],
    "seatool --help": ["-m", "seatool", "--help"],
    "import seatool; seatool.run (first use)": ["-c", "import seatool; seatool.run"],
}
GOALS = {
    "import seatool": ("wall", 0.25),
    "seatool --help": ("wall", 0.5),
    "seatool solve rail_cab.toml": ("cpu", 2.0),
}


def cases() -> dict[str, list[str]]:
    out = dict(START_CASES)
    for model in sorted(MODELS.glob("*.toml")):
        out[f"seatool solve {model.name}"] = ["-m", "seatool", "solve", str(model)]
    return out


def _once(args: list[str], env: dict[str, str], cwd: str) -> tuple[float, float]:
    """(wall, CPU) seconds of one child process."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    t0 = time.perf_counter()
    subprocess.run([sys.executable, *args], cwd=cwd, env=env, check=True,
                   stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)  # fmt: skip
    wall = time.perf_counter() - t0
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    return wall, cpu


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--repeat", type=int, default=5)
    p.add_argument("--no-bytecode", action="store_true",
                   help="keep PYTHONDONTWRITEBYTECODE as set (no compiled bytecode)")  # fmt: skip
    p.add_argument("--only", default="", help="run only the cases whose name contains this")
    args = p.parse_args()
    env = dict(os.environ)
    env["PYTHONPATH"] = os.pathsep.join(filter(None, [str(ROOT), env.get("PYTHONPATH", "")]))
    if not args.no_bytecode:
        env.pop("PYTHONDONTWRITEBYTECODE", None)
    todo = {k: v for k, v in cases().items() if args.only in k}
    print(f"load average before: {os.getloadavg()[0]:.1f}; bytecode: "
          f"{'as the environment says' if args.no_bytecode else 'written and read'}")  # fmt: skip
    with tempfile.TemporaryDirectory() as cwd:  # `solve` writes nothing by default; be sure
        for argv in todo.values():  # untimed: bytecode, disk caches
            _once(argv, env, cwd)
        times: dict[str, list[tuple[float, float]]] = {k: [] for k in todo}
        for _ in range(args.repeat):
            for name, argv in todo.items():
                times[name].append(_once(argv, env, cwd))
    print(f"load average after: {os.getloadavg()[0]:.1f}")
    print(f"{'case':<42} {'wall best':>9} {'median':>7} {'CPU best':>9} {'median':>7} "
          f"{'goal':>10}")  # fmt: skip
    for name, ts in times.items():
        wall = [t[0] for t in ts]
        cpu = [t[1] for t in ts]
        goal = GOALS.get(name)
        gtext = "" if goal is None else f"{goal[1]:.2f} {goal[0]}"
        print(f"{name:<42} {min(wall):9.3f} {statistics.median(wall):7.3f} "
              f"{min(cpu):9.3f} {statistics.median(cpu):7.3f} {gtext:>10}")  # fmt: skip


if __name__ == "__main__":
    main()
