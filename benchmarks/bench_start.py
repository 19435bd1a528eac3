"""Start-up cost of the command line: ``pitchline --help`` against ``python -c pass`` and a
bare ``import numpy`` (best of N fresh processes each; target: --help ≤ 3× ``pass``).

Run from the repository root:  PYTHONPATH=. python benchmarks/bench_start.py [--runs N]
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import time


def best(cmd, runs: int) -> float:
    t_best = float("inf")
    env = dict(os.environ, PYTHONPATH=os.getcwd())
    for _ in range(runs):
        t = time.perf_counter()
        subprocess.run(cmd, check=False, stdout=subprocess.DEVNULL, env=env)
        t_best = min(t_best, time.perf_counter() - t)
    return t_best


def main(argv=None):
    ap = argparse.ArgumentParser()
    ap.add_argument("--runs", type=int, default=7)
    args = ap.parse_args(argv)
    py = sys.executable
    t_pass = best([py, "-c", "pass"], args.runs)
    t_np = best([py, "-c", "import numpy"], args.runs)
    t_help = best([py, "-m", "gen", "--help"], args.runs)
    print(f"python -c pass {t_pass:.3f} s, import numpy {t_np:.3f} s, "
          f"pitchline --help {t_help:.3f} s = {t_help / t_pass:.2f}× pass (target ≤ 3×)")


if __name__ == "__main__":
    main()
