"""Benchmark: `pitchline check` on the demo, in a fresh process (target ≤ 1 s), and proof
that it never loads the CAD kernel.

Run: python benchmarks/bench_check.py
"""

from __future__ import annotations

import os
import subprocess
import sys
import time

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CODE = ("import sys, time; t = time.perf_counter(); from gen.cli import main; "
        "rc = main(['check', 'params']); dt = time.perf_counter() - t; "
        "heavy = [m for m in ('cadquery', 'OCP', 'trimesh') if m in sys.modules]; "
        "print('RESULT', rc, round(dt, 3), heavy, file=sys.stderr)")


def main():
    runs = []
    for _ in range(5):
        t = time.perf_counter()
        r = subprocess.run([sys.executable, "-c", CODE], cwd=ROOT, capture_output=True, text=True)
        wall = time.perf_counter() - t
        line = [ln for ln in r.stderr.splitlines() if ln.startswith("RESULT")][-1].split(" ", 3)
        runs.append((wall, float(line[2]), line[3]))
    best = min(runs)
    print(f"check on params/: in-process {best[1]:.3f} s, whole process {best[0]:.3f} s "
          f"(best of {len(runs)}); heavy modules loaded: {best[2]}")


if __name__ == "__main__":
    main()
