"""Benchmark: ISO 532-1 loudness of many 1/3-octave spectra, with the derivative.

Compares, in one run, on the same random spectra (synthetic levels 20 - 90 dB):

* ``zwicker_loudness`` on all spectra at once (batched over the leading axis),
* ``zwicker_loudness`` called once per spectrum,
* mosqito 1.2 (the plain alternative: its core-loudness and slope functions, one spectrum
  per call, loudness only, no derivative).

Run: ``python benchmarks/bench_loudness.py [--spectra 1000] [--repeat 3]``.
"""

from __future__ import annotations

import argparse
import time

import numpy as np

from seatool.loudness import zwicker_loudness


def best(fn, repeat: int) -> float:  # type: ignore[no-untyped-def]
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument("--spectra", type=int, default=1000)
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args()
    rng = np.random.default_rng(0)
    x = rng.uniform(20.0, 90.0, size=(args.spectra, 28))
    batched = best(lambda: zwicker_loudness(x, field="diffuse"), args.repeat)
    looped = best(lambda: [zwicker_loudness(s, field="diffuse") for s in x], args.repeat)
    print(f"{args.spectra} spectra, loudness and dN/dL per band")
    print(f"  batched          {batched:8.3f} s")
    print(f"  one per call     {looped:8.3f} s   ({looped / batched:.1f}x batched)")
    try:
        from mosqito.sq_metrics.loudness.loudness_zwst._calc_slopes import _calc_slopes
        from mosqito.sq_metrics.loudness.loudness_zwst._main_loudness import _main_loudness
    except ImportError:
        print("  mosqito not installed: no comparison")
        return
    mq = best(lambda: [_calc_slopes(_main_loudness(s.copy(), "diffuse")) for s in x], args.repeat)
    print(f"  mosqito per call {mq:8.3f} s   ({mq / batched:.1f}x batched; loudness only)")


if __name__ == "__main__":
    main()
