"""STEP file sizes of a 40-tooth spur and herringbone gear, and what fills them.

Run from the repository root:  PYTHONPATH=. python benchmarks/bench_step_size.py

Cases: spur gear m 2, 40 teeth, face 10 mm, bore 8; herringbone gear m_n 2, 40 teeth, β 30°,
face 2 × 10 mm, bore 8. Each is made through the public API, written with the build's STEP
writer (re-read and analysed as in a build) and measured: bytes, instances by type, the
largest distance of the flank edges from the exact curve is in tests/test_step_share.py.
Targets (issue): 0.3 MB spur, 0.6 MB herringbone.
"""

from __future__ import annotations

import os
import re
import sys
import tempfile
import time
from collections import Counter

CASES = [
    ("spur z40", "spur_gear", dict(module=2, teeth=40, face_width=10, bore=8)),
    ("herringbone z40", "herringbone_gear",
     dict(module=2, teeth=40, helix_angle=30, face_width=20, bore=8)),
]


def main() -> int:
    from gen import api
    from gen.build.export import make_solid
    from gen.export.step import write_step
    from gen.solid.kernel import preload_kernel

    preload_kernel()
    with tempfile.TemporaryDirectory() as tmp:
        for label, kind, values in CASES:
            part = api.make(kind, "g", **values)
            t = time.perf_counter()
            solid = make_solid(part)
            path = os.path.join(tmp, "g.step")
            size = write_step(solid, path, "g")
            dt = time.perf_counter() - t
            text = open(path, "rb").read()
            kinds = Counter(m.group(1).decode() or "(complex)" for m in
                            re.finditer(rb"^#\d+ = ([A-Z_0-9]*)", text, re.M))
            top = ", ".join(f"{k} {v}" for k, v in kinds.most_common(4))
            print(f"{label:18s} {size / 1e6:6.3f} MB  {sum(kinds.values()):6d} instances "
                  f"({top})  solid+STEP+re-read {dt:.2f} s")
    return 0


if __name__ == "__main__":
    sys.exit(main())
