"""Triangle counts against the chord tolerance (no CAD kernel): spur gears of 20, 40 and 80
teeth and herringbones of the same teeth (m_n 2, β 30°, 2 × 10 mm, 8 mm bore), at
0.04 … 0.002 mm, and the herringbone's mesh time (best of 5). Counts must not fall as the
tolerance tightens; target: herringbone ≤ 3× the spur (z 40) at 0.01 mm.

Run from the repository root:  PYTHONPATH=. python benchmarks/bench_triangles.py
"""

from __future__ import annotations

import os
import sys
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))


def main():
    from bench_twisted import gear_body, gear_section

    from gen.geometry.body import Body, Prism
    from gen.triangles.prism import body_triangles

    tols = (0.04, 0.02, 0.01, 0.005, 0.002)
    rows = {}
    for z in (20, 40, 80):
        sec, _ = gear_section(z)
        rows[f"spur z {z}"] = [len(body_triangles(Body((Prism(sec, 0.0, 20.0),)), t).faces)
                               for t in tols]
    for z in (20, 40, 80):
        rows[f"herringbone z {z}"] = [len(body_triangles(gear_body(z), t).faces) for t in tols]
    print("tolerance (mm)      " + "".join(f"{t:>9}" for t in tols))
    for name, counts in rows.items():
        mono = all(b >= a for a, b in zip(counts, counts[1:]))
        print(f"{name:<20}" + "".join(f"{c:>9}" for c in counts)
              + ("" if mono else "   NOT monotonic"))
    i = tols.index(0.01)
    for z in (20, 40, 80):
        print(f"herringbone / spur (z {z}) at 0.01 mm: "
              f"{rows[f'herringbone z {z}'][i] / rows[f'spur z {z}'][i]:.2f}×"
              + (" (target ≤ 3×)" if z == 40 else ""))
    body = gear_body(40)
    for t in (0.01, 0.002):
        best = min(_timed(body_triangles, body, t) for _ in range(5))
        print(f"herringbone z 40 mesh at {t} mm: {1000 * best:.1f} ms (best of 5)")


def _timed(f, *args):
    t = time.perf_counter()
    f(*args)
    return time.perf_counter() - t


if __name__ == "__main__":
    main()
