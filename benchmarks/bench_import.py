"""Start-up cost as whole processes: ``import seatool`` and ``seatool --help``.

Each case is a fresh interpreter (``python -c ...``), timed wall-clock from start to exit,
best and median of ``--repeat`` runs, interleaved so that every case sees the same machine
load. The floors are the bare interpreter and ``import numpy`` (what any numerical Python
package pays). Goals (docs/performance.md): ``import seatool`` under 0.25 s and
``seatool --help`` under 0.5 s.

Usage::

    python benchmarks/bench_import.py --repeat 15
    python -X importtime -c "import seatool" 2> importtime.txt   # per-module breakdown
"""

from __future__ import annotations

import argparse
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent

CASES = {
    "python (bare interpreter)": ["-c", "pass"],
    "import numpy": ["-c", "import numpy"],
    "import seatool": ["-c", "import seatool"],
    "seatool --help": ["-m", "seatool", "--help"],
    "import seatool; seatool.run (first use)": ["-c", "import seatool; seatool.run"],
}
GOALS = {"import seatool": 0.25, "seatool --help": 0.5}


def _once(args: list[str]) -> float:
    t0 = time.perf_counter()
    subprocess.run(
        [sys.executable, *args], cwd=ROOT, check=True, stdout=subprocess.DEVNULL
    )
    return time.perf_counter() - t0


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--repeat", type=int, default=15)
    args = p.parse_args()
    times: dict[str, list[float]] = {k: [] for k in CASES}
    for _ in range(args.repeat):
        for name, argv in CASES.items():
            times[name].append(_once(argv))
    print(f"{'case':<42} {'best [s]':>9} {'median [s]':>11} {'goal [s]':>9}")
    for name, ts in times.items():
        goal = GOALS.get(name)
        print(
            f"{name:<42} {min(ts):9.3f} {statistics.median(ts):11.3f} "
            f"{'' if goal is None else f'{goal:.2f}':>9}"
        )


if __name__ == "__main__":
    main()
