"""Cost of loading the CAD kernel, and of a small build over it (issue 13).

Fresh processes, best of N each (time: wall clock of the whole process; peak RSS: the
child's own ``ru_maxrss`` from ``os.wait4``):

* ``python -c pass`` and ``import cadquery`` (what every STEP build paid before);
* the build's kernel: the OCP modules ``gen.solid.kernel.preload_kernel`` imports;
* a process that imports that kernel and writes a cylinder (Ø 40 × 20 mm) STEP with the
  kernel's plain writer;
* ``pitchline build`` of a herringbone gear m_n 2, z 40, 2 × 10 mm, β 30°, bore 8 mm,
  STEP+STL, ``--jobs 1 --force`` into a temporary folder.

Target: herringbone build ≤ 1.1× the cylinder process. Also prints whether the build
process loaded cadquery or vtk.

Run from the repository root:  PYTHONPATH=. python benchmarks/bench_kernel.py [--runs N]
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time

HERRINGBONE = """parts:
  hb40:
    kind: herringbone_gear
    module: 2
    teeth: 40
    helix_angle: 30
    face_width: 20
    bore: 8
"""

KERNEL = "from gen.solid.kernel import preload_kernel; preload_kernel()"

CYLINDER = KERNEL + """
import sys
from OCP.BRepPrimAPI import BRepPrimAPI_MakeCylinder
from OCP.IFSelect import IFSelect_RetDone
from OCP.STEPControl import STEPControl_AsIs, STEPControl_Writer
w = STEPControl_Writer()
w.Transfer(BRepPrimAPI_MakeCylinder(20.0, 20.0).Shape(), STEPControl_AsIs)
assert w.Write(sys.argv[1]) == IFSelect_RetDone
"""

BUILD = """
import sys
from gen.cli import main
rc = main(['build', sys.argv[1], '--out', sys.argv[2], '--format', 'step,stl', '--jobs', '1',
           '--force'])
heavy = sorted({m.split('.')[0] for m in sys.modules
                if m.split('.')[0] == 'cadquery' or m.startswith('vtk')})
sys.stderr.write(f'HEAVY {heavy}\\n')
sys.exit(rc)
"""


def run(args, env):
    """(seconds, peak RSS MiB, stderr) of one fresh process."""
    t = time.perf_counter()
    p = subprocess.Popen([sys.executable, *args], stdout=subprocess.DEVNULL,
                         stderr=subprocess.PIPE, env=env)
    err = p.stderr.read()
    _, status, usage = os.wait4(p.pid, 0)
    p.returncode = os.waitstatus_to_exitcode(status)
    dt = time.perf_counter() - t
    if p.returncode != 0:
        raise SystemExit(f"{args[:2]} failed ({p.returncode}): {err.decode()[-2000:]}")
    return dt, usage.ru_maxrss / 1024.0, err.decode()


def best(args, env, runs):
    results = [run(args, env) for _ in range(runs)]
    return min(r[0] for r in results), min(r[1] for r in results), results[-1][2]


def main(argv=None):
    ap = argparse.ArgumentParser()
    ap.add_argument("--runs", type=int, default=3)
    a = ap.parse_args(argv)
    env = dict(os.environ, PYTHONPATH=os.getcwd())
    with tempfile.TemporaryDirectory() as tmp:
        yaml = os.path.join(tmp, "hb40.yaml")
        with open(yaml, "w") as fh:
            fh.write(HERRINGBONE)
        rows = [("python -c pass", ["-c", "pass"]),
                ("import cadquery", ["-c", "import cadquery"]),
                ("import the build's OCP kernel", ["-c", KERNEL]),
                ("kernel + cylinder STEP", ["-c", CYLINDER, os.path.join(tmp, "cyl.step")]),
                ("pitchline build hb40 STEP+STL", ["-c", BUILD, yaml, os.path.join(tmp, "out")])]
        got = {}
        for label, args in rows:
            got[label] = best(args, env, a.runs)
            t, rss, _ = got[label]
            print(f"{label:32s} {t:6.2f} s   peak RSS {rss:7.1f} MiB")
    heavy = [ln for ln in got["pitchline build hb40 STEP+STL"][2].splitlines()
             if ln.startswith("HEAVY")]
    cq_t, cq_rss = got["import cadquery"][:2]
    k_t, k_rss = got["import the build's OCP kernel"][:2]
    ratio = got["pitchline build hb40 STEP+STL"][0] / got["kernel + cylinder STEP"][0]
    print(f"OCP kernel vs import cadquery: {k_t / cq_t:.2f}× time, {k_rss / cq_rss:.2f}× RSS")
    print(f"herringbone build vs kernel + cylinder: {ratio:.2f}× (target ≤ 1.1×)")
    print(f"build process loaded cadquery/vtk: {heavy[-1][6:] if heavy else '?'}")


if __name__ == "__main__":
    main()
