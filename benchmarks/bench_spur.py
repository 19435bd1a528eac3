"""Benchmark: generate + export a 20-tooth and a 100-tooth spur gear (in-process wall times).

Run: python benchmarks/bench_spur.py
Imports are timed separately; each figure is the best of 3 runs.
"""

from __future__ import annotations

import os
import tempfile
import time


def best(fn, n=3):
    times = []
    for _ in range(n):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return min(times)


def main():
    t = time.perf_counter()
    import cadquery  # noqa: F401
    t_cq = time.perf_counter() - t
    t = time.perf_counter()
    import trimesh  # noqa: F401
    t_tm = time.perf_counter() - t

    from gen.export.step import write_step
    from gen.export.stl import write_stl
    from gen.triangles.prism import body_triangles
    from gen.params.project import RawPart
    from gen.kinds.base import resolve
    from gen.solid.prism import body_solid

    out = tempfile.mkdtemp()
    print(f"imports: cadquery {t_cq:.2f} s, trimesh {t_tm:.2f} s")
    print(f"{'teeth':>5} {'profile':>9} {'mesh+STL':>9} {'solid+STEP':>11} {'total':>7}")
    for z in (20, 100):
        values = {"module": 2, "teeth": z, "face_width": 10, "bore": 8}
        raw = RawPart("g", "spur_gear", values, "bench.yaml", None, {None: 1})
        t_prof = best(lambda: resolve(raw))
        model = resolve(raw)
        t_stl = best(lambda: write_stl(body_triangles(model.shape, 0.01), os.path.join(out, "g.stl")))
        t_step = best(lambda: write_step(body_solid(model.shape), os.path.join(out, "g.step"), "g"))
        print(f"{z:>5} {t_prof:>8.3f}s {t_stl:>8.3f}s {t_step:>10.3f}s "
              f"{t_prof + t_stl + t_step:>6.2f}s")


if __name__ == "__main__":
    main()
