"""Growth of the rack build cost with length: straight racks m 2, profile A, 20 mm face,
10 mm high, 400 / 800 / 1,600 mm long; STEP+STL in-process after imports (best of N).
Prints each stage (solid, kernel check, STEP bytes, triangles + STL) and the growth exponent
log2(t(1600) / t(800)) (target ≤ 1.1).

Run from the repository root:  PYTHONPATH=. python benchmarks/bench_rack.py [--runs N]
"""

from __future__ import annotations

import argparse
import math
import tempfile
import time

T = time.perf_counter


def rack_body(length: float):
    from gen.geometry.basic_rack import basic_rack
    from gen.geometry.body import Body, Prism
    from gen.geometry.rack_outline import rack_loop, rack_sizes
    from gen.geometry.section import Section

    rk = basic_rack("A")
    rs = rack_sizes(2.0, rk, height=10.0, length=length)
    return Body((Prism(Section(rack_loop(rs, rk)), 0.0, 20.0),))


def main(argv=None):
    ap = argparse.ArgumentParser()
    ap.add_argument("--runs", type=int, default=2)
    args = ap.parse_args(argv)
    import cadquery  # noqa: F401
    import trimesh  # noqa: F401
    from OCP.Message import Message, Message_Gravity

    for p in Message.DefaultMessenger_s().Printers():
        p.SetTraceLevel(Message_Gravity.Message_Fail)
    from gen.export.step import step_bytes
    from gen.export.stl import stl_bytes
    from gen.solid.kernel import check_solid
    from gen.solid.prism import body_solid
    from gen.triangles.prism import body_triangles

    totals = {}
    with tempfile.TemporaryDirectory() as wd:
        for L in (400.0, 800.0, 1600.0):
            best = {}
            for _ in range(args.runs):
                r = {}
                t = T()
                body = rack_body(L)
                solid = body_solid(body, check=False)
                r["solid"] = T() - t
                t = T()
                check_solid(solid, "rack")   # the builder gives a TopoDS_Solid
                r["check"] = T() - t
                t = T()
                data = step_bytes(solid, "rack", wd)
                r["step"] = T() - t
                t = T()
                stl_bytes(body_triangles(body, 0.01))
                r["stl"] = T() - t
                r["total"] = sum(r.values())
                for k, v in r.items():
                    best[k] = min(best.get(k, 1e9), v)
            totals[L] = best["total"]
            print(f"rack {L:6.0f} mm: " + ", ".join(f"{k} {v:.3f} s" for k, v in best.items())
                  + f", STEP {len(data) / 1e6:.2f} MB")
    print(f"growth exponent 800 → 1600 mm: {math.log2(totals[1600.0] / totals[800.0]):.2f}, "
          f"400 → 1600 mm: {math.log2(totals[1600.0] / totals[400.0]) / 2:.2f} (target ≤ 1.1)")


if __name__ == "__main__":
    main()
