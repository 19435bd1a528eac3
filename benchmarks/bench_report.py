"""Benchmark: the whole-build report for the demo (issue 18). Targets: written in ≤ 10 % of
the demo's build time, page ≤ 2 MB. Builds the demo once (STEP + STL, as `pitchline build`
does, one process per CPU), then times the report alone (best of three) from the files written, the check-mode
page (outlines, no files), and the section and sector-swing drawings on their own. Prints the
figures.

Run: python benchmarks/bench_report.py [--out DIR]   (DIR keeps the build; default a
temporary folder)
"""

from __future__ import annotations

import argparse
import os
import shutil
import sys
import tempfile
import time

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))


def main():
    sys.path.insert(0, ROOT)
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", default=None)
    args = ap.parse_args()
    from gen.api import check_files
    from gen.build import build
    from gen.export.registry import parse_formats
    from gen.export.report_build import write

    tmp = tempfile.mkdtemp()
    out = args.out or os.path.join(tmp, "demo")
    try:
        t = time.perf_counter()
        result = check_files(os.path.join(ROOT, "params"))
        t_check = time.perf_counter() - t
        t = time.perf_counter()
        from gen.cli.build import default_jobs

        jobs = default_jobs()   # as `pitchline build` runs by default
        # the parts' shaded views are drawn by the build's workers, as `pitchline build` asks
        rep = build(result, out, parse_formats("step,stl"), force=True, jobs=jobs,
                    options={"pictures": True})
        t_build = time.perf_counter() - t + t_check
        page = os.path.join(out, "report.html")
        times = []
        for _ in range(3):
            t = time.perf_counter()
            write(page, result, out_dir=out, outcomes=rep.outcomes)
            times.append(time.perf_counter() - t)
        size = os.path.getsize(page)
        check_page = os.path.join(tmp, "check.html")
        t = time.perf_counter()
        write(check_page, result)
        t_checkpage = time.perf_counter() - t
        best = min(times)
        print(f"demo build (check + export, {jobs} processes): {t_build:.1f} s")
        print(f"report from the files: best {best:.2f} s of {', '.join(f'{x:.2f}' for x in times)}"
              f" = {100 * best / t_build:.1f} % of the build (target ≤ 10 %)")
        print(f"page size: {size / 1e6:.2f} MB (target ≤ 2 MB)")
        print(f"check-mode page (outlines): {t_checkpage:.2f} s, "
              f"{os.path.getsize(check_page) / 1e6:.2f} MB")
        # the drawings of issues 15, 16 and 18 item 2 on their own
        from gen.export.report_build import mesh_item, section_items

        t = time.perf_counter()
        cuts = section_items(result.models, result.drivetrains)
        t_cuts = time.perf_counter() - t
        sectors = [p for p in result.pairs if "swing" in (p.get("numbers") or {})]
        t = time.perf_counter()
        swings = [mesh_item(p, result.models) for p in sectors]
        t_swing = time.perf_counter() - t
        print(f"screw, nut and rotor sections: {len(cuts)} drawings, {t_cuts:.3f} s, "
              f"{sum(map(len, cuts)) / 1e3:.0f} kB")
        print(f"sector pairs over the swing: {len(swings)} items, {t_swing:.3f} s, "
              f"{sum(map(len, swings)) / 1e3:.0f} kB")
    finally:
        shutil.rmtree(tmp, ignore_errors=True)   # --out DIR is kept


if __name__ == "__main__":
    main()
