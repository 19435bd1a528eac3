"""Wall time of one straight bevel gear, STEP + STL, in-process after imports (best of N).

Run from the repository root:  PYTHONPATH=. python benchmarks/bench_bevel.py [--runs N]

Case: miter pair 25/25 teeth, m 2, Σ 90°, face width 10 mm, profile A, bore Ø 8 mm.
"STEP+STL" = solid (validity checked) + STEP bytes + triangles + STL bytes. Target ≤ 0.5 s.
Also printed: STEP size, triangle count, and the STEP and STL volumes (they must agree
within 0.5 %).
"""

from __future__ import annotations

import argparse
import math
import tempfile
import time

T = time.perf_counter


def main(argv=None):
    ap = argparse.ArgumentParser()
    ap.add_argument("--runs", type=int, default=3)
    ap.add_argument("--z", type=int, default=25)
    args = ap.parse_args(argv)

    t = T()
    import cadquery  # noqa: F401
    import manifold3d  # noqa: F401
    import trimesh  # noqa: F401
    from OCP.Message import Message, Message_Gravity

    for p in Message.DefaultMessenger_s().Printers():
        p.SetTraceLevel(Message_Gravity.Message_Fail)
    print(f"imports {T() - t:.2f} s")

    from gen.export.step import step_bytes
    from gen.export.stl import stl_bytes
    from gen.geometry.basic_rack import basic_rack
    from gen.geometry.bevel import bevel_sizes, virtual_flank
    from gen.solid.bevel import build_bevel_solid
    from gen.geometry.body import ApexBody
    from gen.triangles import triangles

    z = args.z
    s = bevel_sizes(z, z, 2.0, math.pi / 2, 10.0, basic_rack("A"))
    flank = virtual_flank(s)
    best = {}
    with tempfile.TemporaryDirectory() as wd:
        for _ in range(args.runs):
            t0 = T()
            solid = build_bevel_solid(s, 8.0, flank=flank)
            t1 = T()
            step = step_bytes(solid, "bevel", wd)
            t2 = T()
            tri = triangles(ApexBody(s, flank, 8.0), 0.01)
            stl = stl_bytes(tri)
            t3 = T()
            for k, v in (("solid", t1 - t0), ("step", t2 - t1), ("stl", t3 - t2),
                         ("total", t3 - t0)):
                best[k] = min(best.get(k, 1e9), v)
    print(f"bevel {z}/{z} m 2: solid {best['solid']:.3f} s, STEP {best['step']:.3f} s, "
          f"triangles+STL {best['stl']:.3f} s, STEP+STL {best['total']:.3f} s (target ≤ 0.5)")
    v_step, v_stl = cadquery.Solid(solid).Volume(), tri.volume   # builder: a TopoDS_Solid
    print(f"STEP {len(step) / 1e6:.2f} MB, STL {len(stl) / 1e6:.2f} MB ({len(tri.faces)} triangles)")
    print(f"volume: solid {v_step:.1f} mm³, triangles {v_stl:.1f} mm³, "
          f"difference {100 * (v_stl - v_step) / v_step:+.3f} % (limit ±0.5 %)")


if __name__ == "__main__":
    main()
