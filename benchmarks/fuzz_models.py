"""Long fuzz run of random model files: valid ones solved, broken ones refused cleanly.

    PYTHONPATH=$PWD python benchmarks/fuzz_models.py --count 5000 --seed 0

A third of the models are valid random models (tests/modelgen.py) solved through the Python
API and checked: the energy balance closes per band to 1e-9, every energy of a damped
subsystem is finite and positive; every fifth also with its subsystems written in a
shuffled order (same energies to 1e-9) and for SEA reciprocity (modal energy of j with
1 W into i equals that of i with 1 W into j, to 1e-9). The other two thirds get one
numeric value replaced by a bad one -- in a random model, or in one of the shipped models
(models/*.toml) or the every-kind model of tests/test_every_kind.py, which reach every
kind -- (nan, inf, negative, zero, huge, tiny, a string, a boolean,
an array, a table) and run through ``seatool solve ... --csv``: exit code 0 or 2 is
expected, with every stderr line an ``error:`` or ``warning:`` line naming the file, the
table's key path (or name) in an error, and no CSV written on exit 2.

Outcomes counted: solved, clean error, error without key path (exit 2, but no line names
the mutated table), accepted (a mutated value that is valid), crash (exit 1, a traceback,
an unexpected exit code, a malformed message or a CSV left on exit 2) and invariant
violation. Prints the counts and the first cases of each failure; exit code 1 if any
crash or violation. Not part of the test suite (it runs for minutes); its counts are
recorded in docs/validation.md.
"""

from __future__ import annotations

import argparse
import collections
import contextlib
import io
import random
import sys
import tempfile
import time
import tomllib
from pathlib import Path
from typing import Any

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "tests"))

import modelgen  # noqa: E402  (the generators shared with tests/test_properties.py)
import test_every_kind  # noqa: E402  (a model with every subsystem and coupling kind)

import seatool  # noqa: E402
from seatool.cli import main  # noqa: E402


def _solve(data: dict[str, Any], order: list[str] | None = None) -> seatool.Result:
    return seatool.run(seatool.loads(modelgen.to_toml(data, order)))


def check_valid(rng: random.Random, data: dict[str, Any], deep: bool) -> str:
    """'solved', or a description of the violated invariant."""
    r = _solve(data)
    pb = r.power_balance()
    for band, g in pb.groupby("band_hz"):
        p_in, p_out = float(g["input_W"].sum()), float(g["dissipated_W"].sum())
        if abs(p_in - p_out) > 1e-9 * max(abs(p_in), 1e-300):
            return f"energy balance at {band} Hz: in {p_in:.6g} W, out {p_out:.6g} W"
    for s, e in zip(r.model.subsystems, r.solution.energy, strict=True):
        if not s.sink and not (np.all(np.isfinite(e)) and np.all(e > 0)):
            return f"energy of {s.name} not finite and positive"
    if not deep:
        return "solved"
    order = list(data["subsystems"])
    shuffled = order[:]
    rng.shuffle(shuffled)
    r2 = _solve(data, shuffled)
    for name in order:
        a = r.solution.energy[r.model.names.index(name)]
        b = r2.solution.energy[r2.model.names.index(name)]
        if not np.allclose(a, b, rtol=1e-9, atol=0.0):
            return f"order changes the energy of {name}"
    names = [n for n, s in data["subsystems"].items() if s["kind"] != "exterior"]
    i, j = rng.sample(names, 2)

    def modal(src: str, at: str) -> np.ndarray:
        d = dict(data)
        d["excitations"] = {"unit": {"subsystem": src, "power": 1.0}}
        x = _solve(d)
        k = x.model.names.index(at)
        return np.asarray(x.solution.energy[k] / x.model.subsystems[k].modal_density)

    if not np.allclose(modal(i, j), modal(j, i), rtol=1e-9, atol=0.0):
        return f"reciprocity between {i} and {j}"
    return "solved"


def corpus() -> list[dict[str, Any]]:
    """The shipped models and the every-kind test model, as parsed data."""
    texts = [p.read_text(encoding="utf-8") for p in sorted((ROOT / "models").glob("*.toml"))]
    return [tomllib.loads(t) for t in [*texts, test_every_kind.MODEL]]


def check_invalid(rng: random.Random, data: dict[str, Any], tmp: Path) -> tuple[str, str]:
    """('clean error' | 'accepted' | 'crash', detail) for one mutated model."""
    path = rng.choice(list(modelgen.numeric_paths(data)))
    bad = rng.choice(modelgen.BAD_VALUES)
    f = tmp / "model.toml"
    out = tmp / "out.csv"
    out.unlink(missing_ok=True)
    f.write_text(modelgen.to_toml(modelgen.mutated(data, path, bad)), encoding="utf-8")
    err = io.StringIO()
    try:
        with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(err):
            code = main(["solve", str(f), "--csv", str(out)])
    except BaseException as exc:
        return "crash", f"{modelgen.dotted(path)} = {bad!r}: {type(exc).__name__}: {exc}"
    text = err.getvalue()
    what = f"{modelgen.dotted(path)} = {bad!r}"
    if code == 0:
        return "accepted", what
    lines = [x for x in text.strip().splitlines() if not x.startswith(f"warning: {f}: ")]
    where = (modelgen.dotted(path[:2]), f"'{path[1]}'", f" {path[1]}")
    if code != 2:
        return "crash", f"{what}: exit {code}: {text.strip()[:300]}"
    if not lines or not all(x.startswith(f"error: {f}") for x in lines):
        return "crash", f"{what}: malformed message: {text.strip()[:300]}"
    if not any(w in x for x in lines for w in where):
        return "error without key path", f"{what}: {text.strip()[:300]}"
    if out.exists():
        return "crash", f"{what}: a CSV was written on exit 2"
    return "clean error", what


def main_(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--count", type=int, default=5000, help="models (default 5000)")
    ap.add_argument("--seed", type=int, default=0)
    args = ap.parse_args(argv)
    rng = random.Random(args.seed)
    counts: collections.Counter[str] = collections.Counter()
    examples: dict[str, list[str]] = collections.defaultdict(list)
    t0 = time.perf_counter()
    with tempfile.TemporaryDirectory() as tmpdir:
        tmp = Path(tmpdir)
        shipped = corpus()
        for k in range(args.count):
            data = modelgen.valid_model(rng) if k % 3 != 2 else rng.choice(shipped)
            if k % 3 == 0:
                try:
                    outcome = check_valid(rng, data, deep=k % 15 == 0)
                except Exception as exc:
                    counts["crash"] += 1
                    examples["crash"].append(f"valid model {k}: {type(exc).__name__}: {exc}")
                    continue
                key = "solved" if outcome == "solved" else "invariant violation"
                counts[key] += 1
                if key != "solved":
                    examples[key].append(f"model {k}: {outcome}")
            else:
                key, detail = check_invalid(rng, data, tmp)
                counts[key] += 1
                examples[key].append(detail)
    dt = time.perf_counter() - t0
    print(f"{args.count} models, seed {args.seed}, {dt:.0f} s")
    keys = ("solved", "clean error", "error without key path", "accepted", "crash",
            "invariant violation")  # fmt: skip
    for key in keys:
        print(f"  {key:20s} {counts[key]}")
    for key in ("crash", "invariant violation", "error without key path", "accepted"):
        for line in examples[key][:8]:
            print(f"{key}: {line}")
    return 1 if counts["crash"] or counts["invariant violation"] else 0


if __name__ == "__main__":
    sys.exit(main_())
