"""Benchmark: one pair sweep (gen.validate.sweep.sweep_pair) of m 2, z 20/40 spur outlines
drawn at 0.01 mm chords (≥ 2500 vertices each), 90 steps over one pitch. Earlier budget: well
under 0.3 s. Prints figures only.

Run: python benchmarks/bench_sweep.py
"""

from __future__ import annotations

import time

from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.gear_outline import gear_loop
from gen.geometry.generate import generate_flank
from gen.geometry.pair import mesh_pair
from gen.validate.sweep import sweep_pair


def outline(z, m=2.0, thinning=0.1):
    rack = basic_rack("A")
    s = gear_sizes(z, m, rack, thinning=thinning)
    return s, gear_loop(generate_flank(z, s.rp, cutter_for(s, rack), s.ra)).polygon(0.01)


def main():
    s1, p1 = outline(20)
    s2, p2 = outline(40)
    pair = mesh_pair(s1, s2)
    sweep_pair(p1, p2, pair, steps=10)  # warm-up
    for steps in (30, 90, 180):
        times = []
        for _ in range(5):
            t = time.perf_counter()
            sweep_pair(p1, p2, pair, steps=steps)
            times.append(time.perf_counter() - t)
        print(f"sweep z 20/40, {len(p1)}/{len(p2)} vertices, {steps:3d} steps: "
              f"best {min(times):.3f} s, median {sorted(times)[2]:.3f} s (of 5)")


if __name__ == "__main__":
    main()
