"""Benchmark: tooth-count search for a ratio (in-process wall times, best of 5).

Run: python benchmarks/bench_ratio.py
Target: a three-stage spur search with tooth counts 10–100 answers in ≤ 1 s on 2 cores.
"""

from __future__ import annotations

import math
import os
import sys
import time

sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))


def best(fn, n=5):
    times = []
    for _ in range(n):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def main():
    from gen.geometry.ratio_search import SearchLimits, search_ratio

    lim = SearchLimits(min_teeth=10, max_teeth=100)
    cases = [
        ("pi, 3 stages, spur", math.pi, 3, ("spur",), None),
        ("37, 3 stages, spur", 37.0, 3, ("spur",), None),
        ("123.456, 3 stages, spur", 123.456, 3, ("spur",), None),
        ("pi, 3 stages, spur+belt+planetary", math.pi, 3, ("spur", "belt", "planetary"), None),
        ("e, 3 stages, spur, tol 1e-6", math.e, 3, ("spur",), 1e-6),
        ("pi, 2 stages, spur", math.pi, 2, ("spur",), None),
    ]
    print(f"{'case':<38} {'time':>8} {'best ratio':>16} {'error':>10}")
    worst = 0.0
    for label, target, stages, kinds, tol in cases:
        res = None

        def run():
            nonlocal res
            res = search_ratio(target, max_stages=stages, kinds=kinds, tolerance=tol,
                               limits=lim, count=10)

        t = best(run)
        if stages == 3 and kinds == ("spur",):
            worst = max(worst, t)
        b = res.best
        print(f"{label:<38} {t:>7.3f}s {b.ratio:>16.10g} {b.error:>+10.2e}")
    print(f"three-stage spur search, teeth 10-100: worst {worst:.3f} s (target <= 1 s): "
          + ("ok" if worst <= 1.0 else "SLOW"))


if __name__ == "__main__":
    main()
