"""Benchmark: full build of the demo (target ≤ 5 s) vs an unchanged rebuild (target ≤ 5 %),
the demo with ``--force --jobs 2`` vs ``--jobs 1`` (target ≥ 1.6×), an unchanged rebuild with
STEP, STL and 3MF vs ``check`` of the same files (target ≤ 1.5×), and --jobs 2 vs --jobs 1 on
eight parts. All in one run, so ratios compare.

Run: python benchmarks/bench_build.py
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
import tempfile
import time

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
EIGHT = """trains:
  bench:
    module: 1.5
    parts:
""" + "".join(f"      g{z}: {{kind: spur_gear, teeth: {z}, face_width: 8, bore: 5}}\n"
              for z in (14, 18, 22, 26, 30, 34, 38, 42))


def timed(args, cwd=ROOT):
    t = time.perf_counter()
    r = subprocess.run([sys.executable, "-m", "gen"] + args, cwd=cwd, capture_output=True,
                       text=True)
    if r.returncode != 0:
        raise SystemExit(r.stdout + r.stderr)
    return time.perf_counter() - t


def main():
    sys.path.insert(0, ROOT)
    tmp = tempfile.mkdtemp()
    try:
        out = os.path.join(tmp, "demo")
        full = timed(["build", "params", "--out", out])   # one process per CPU (default)
        again = timed(["build", "params", "--out", out])
        print(f"demo full build {full:.2f} s (target ≤ 5 s); unchanged rebuild {again:.2f} s "
              f"= {100 * again / full:.1f} % of the full build (target ≤ 5 %)")
        f1 = timed(["build", "params", "--out", out, "--force", "--jobs", "1"])
        f2 = timed(["build", "params", "--out", out, "--force", "--jobs", "2"])
        print(f"demo --force: --jobs 1 {f1:.2f} s, --jobs 2 {f2:.2f} s, speed-up {f1 / f2:.2f}× "
              f"(target ≥ 1.6×)")
        out3 = os.path.join(tmp, "demo3")
        fm = ["--format", "step,stl,3mf"]
        timed(["build", "params", "--out", out3] + fm)
        re3 = min(timed(["build", "params", "--out", out3] + fm) for _ in range(3))
        chk = min(timed(["check", "params"]) for _ in range(3))
        print(f"unchanged rebuild (step,stl,3mf) {re3:.2f} s vs check {chk:.2f} s = "
              f"{re3 / chk:.2f}× (target ≤ 1.5×)")
        src = os.path.join(tmp, "eight.yaml")
        with open(src, "w") as fh:
            fh.write(EIGHT)
        one = timed(["build", src, "--out", os.path.join(tmp, "j1"), "--jobs", "1"])
        two = timed(["build", src, "--out", os.path.join(tmp, "j2"), "--jobs", "2"])
        print(f"8 spur gears STEP+STL, whole command: --jobs 1 {one:.2f} s, --jobs 2 "
              f"{two:.2f} s, speed-up {one / two:.2f}× ({os.cpu_count()} cores)")
        # the export phase alone, in-process (kernel imported once beforehand, as the
        # build does before forking its workers)
        import cadquery  # noqa: F401

        import io

        from gen.build import Progress, build
        from gen.check import check

        quiet = Progress(8, stream=io.StringIO(), enabled=False)

        res = check([src])
        t = time.perf_counter()
        build(res, os.path.join(tmp, "k1"), ["step", "stl"], jobs=1, progress=quiet)
        e1 = time.perf_counter() - t
        t = time.perf_counter()
        build(res, os.path.join(tmp, "k2"), ["step", "stl"], jobs=2, progress=quiet)
        e2 = time.perf_counter() - t
        print(f"8 spur gears STEP+STL, export phase: --jobs 1 {e1:.2f} s, --jobs 2 {e2:.2f} s, "
              f"speed-up {e1 / e2:.2f}× (target ≥ 1.6×)")
    finally:
        shutil.rmtree(tmp, ignore_errors=True)


if __name__ == "__main__":
    main()
