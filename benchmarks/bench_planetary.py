"""Wall time of building a whole planetary set vs its four members alone (best of N runs).

Run from the repository root:  PYTHONPATH=. python benchmarks/bench_planetary.py [--runs N]

Case: the demo stage params/turntable_stage.yaml (herringbone, m 1.5, β 25°, sun 12,
planets 18, ring 48, 3 planets, 12 mm face, carrier plate). Timed after imports and after
`check` (outlines, meshes and sweeps are made by check, not by the build):

* "set": every part of the set as STEP + STL (sun, 3 planets, ring, carrier) and the
  assembly STEP, as `pitchline build` does (one process, parts in turn);
* "members": sun, one planet, ring and carrier as STEP + STL, nothing else.

Target (issue 14): set ≤ 2 × members. Prints the figures and the ratio; asserts nothing.
"""

from __future__ import annotations

import argparse
import os
import sys
import tempfile
import time

T = time.perf_counter
ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))


def main(argv=None) -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--runs", type=int, default=2)
    args = ap.parse_args(argv)
    sys.path.insert(0, ROOT)
    from gen.build.assembly import assembly_step
    from gen.build.export import export_part
    from gen.check import check
    from gen.solid import preload

    t = T()
    preload()
    print(f"kernel import {T() - t:.2f} s")
    t = T()
    res = check([os.path.join(ROOT, "params", "turntable_stage.yaml")])
    print(f"check (outlines, both meshes swept) {T() - t:.2f} s")
    asm = res.assemblies[0]
    names = list(asm.parts.values())
    members = [asm.parts[k] for k in ("sun", "planet_1", "ring", "carrier")]
    best = {"set": float("inf"), "members": float("inf")}
    per_part = {}
    for _ in range(args.runs):
        with tempfile.TemporaryDirectory() as out:
            t = T()
            for n in members:
                t1 = T()
                export_part(res.models[n], out, ("step", "stl"))
                per_part[n] = min(per_part.get(n, float("inf")), T() - t1)
            best["members"] = min(best["members"], T() - t)
        with tempfile.TemporaryDirectory() as out:
            t = T()
            for n in names:
                export_part(res.models[n], out, ("step", "stl"))
            t1 = T()
            assembly_step(asm, res.models, os.path.join(out, asm.name + ".step"), out)
            per_part["assembly STEP"] = min(per_part.get("assembly STEP", float("inf")),
                                            T() - t1)
            best["set"] = min(best["set"], T() - t)
    for n, s in per_part.items():
        print(f"  {n:<28} {s:7.2f} s")
    print(f"members alone (4 parts)      {best['members']:7.2f} s")
    print(f"whole set + assembly STEP    {best['set']:7.2f} s")
    print(f"ratio set / members          {best['set'] / best['members']:7.2f}  (target ≤ 2)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
