"""Wall times of twisted gear and rack builds, after imports (best of N runs).

Run from the repository root:  PYTHONPATH=. python benchmarks/bench_twisted.py [--runs N]

Cases: herringbone gears m_n 2, 20/40/100 teeth, 2 × 10 mm face, β 30°, 8 mm bore; the
40-tooth one also with a D-bore (no boolean) and with a keyway cut across the round bore
(boolean); a helical and a herringbone rack, m_n 2, β 30°, 20 teeth, 20 mm face.
"STEP+STL" = outline + kernel solid (validity checked) + STEP file + mesh + STL file;
"STL only" = outline + mesh + STL file. Targets: 40-tooth herringbone STEP+STL ≤ 1.0 s,
STL only ≤ 0.3 s.
"""

from __future__ import annotations

import argparse
import gc
import math
import os
import sys
import tempfile
import time

T = time.perf_counter


def _imports():
    t = T()
    import manifold3d  # noqa: F401
    import numpy  # noqa: F401
    import trimesh  # noqa: F401

    t_light = T() - t
    import cadquery  # noqa: F401
    from OCP.Message import Message, Message_Gravity

    for p in Message.DefaultMessenger_s().Printers():  # keep the STEP writer quiet
        p.SetTraceLevel(Message_Gravity.Message_Fail)
    return t_light, T() - t - t_light


def gear_section(z: int, bore: str = "round"):
    from gen.geometry.basic_rack import basic_rack
    from gen.geometry.cylindrical import cutter_for, gear_sizes
    from gen.geometry.gear_outline import gear_loop
    from gen.geometry.generate import generate_flank
    from gen.geometry.section import Section, circle

    rk = basic_rack("A")
    sz = gear_sizes(z, 2.0, rk, beta=math.radians(30))
    loop = gear_loop(generate_flank(z, sz.rp, cutter_for(sz, rk), sz.ra))
    holes = (circle(4.0),) if bore in ("round", "keyway") else ()
    return Section(loop, holes), sz


def d_bore(r: float = 4.0, flat: float = 3.5):
    """Loop of a D-shaped bore: circle r with a flat at x = flat (demo sizes)."""
    from gen.geometry.section import Arc, Line, Loop

    a = math.acos(flat / r)
    arc = Arc((0.0, 0.0), r, a, 2 * math.pi - a)
    return Loop((arc, Line(tuple(arc.end), tuple(arc.start))))


def key_slot(r: float = 4.0, depth: float = 1.0, width: float = 2.0):
    """Rectangle of a hub keyway across the bore edge (DIN 6885-1, shaft 6–8 mm: b 2, t2 1.0)."""
    from gen.geometry.section import Line, Loop

    x0, x1, h = 0.0, r + depth, width / 2
    p = [(x0, -h), (x1, -h), (x1, h), (x0, h)]
    return Loop(tuple(Line(p[i], p[(i + 1) % 4]) for i in range(4)))


def gear_body(z: int, bore: str = "round"):
    from gen.geometry.body import Body, Prism, gear_twist
    from gen.geometry.section import Section

    sec, sz = gear_section(z, bore)
    tw = gear_twist(math.radians(30), sz.rp)
    cuts = ()
    if bore == "d":
        cuts = (Prism(Section(d_bore()), 0.0, 20.0),)
    elif bore == "keyway":
        cuts = (Prism(Section(key_slot()), 0.0, 20.0),)
    return Body((Prism(sec, 0.0, 20.0, twist=tw, chevron=True),), cuts)


def rack_body(chevron: bool):
    from gen.geometry.basic_rack import basic_rack
    from gen.geometry.body import Body, Prism, rack_shear
    from gen.geometry.rack_outline import rack_loop, rack_sizes
    from gen.geometry.section import Section

    rk = basic_rack("A")
    rs = rack_sizes(2.0, rk, height=10.0, teeth=20, beta=math.radians(30))
    sec = Section(rack_loop(rs, rk))
    return Body((Prism(sec, 0.0, 20.0, shear=rack_shear(math.radians(30)), chevron=chevron),))


def run_case(make, tmp: str, runs: int) -> dict:
    import cadquery

    from gen.triangles.prism import body_triangles
    from gen.solid.prism import body_solid

    best: dict = {}
    for _ in range(runs):
        gc.collect()  # free the previous run's shapes outside the timed region
        r = {}
        t = T()
        body = make()
        r["outline"] = T() - t
        t = T()
        solid = cadquery.Solid(body_solid(body, check=False))   # builder: a TopoDS_Solid
        r["solid"] = T() - t
        t = T()
        if not solid.isValid():
            raise SystemExit("invalid solid")
        r["check"] = T() - t
        t = T()
        solid.exportStep(os.path.join(tmp, "part.step"))
        r["step"] = T() - t
        t = T()
        mesh = body_triangles(body, tol=0.01)
        r["mesh"] = T() - t
        t = T()
        mesh.export(os.path.join(tmp, "part.stl"))
        r["stl"] = T() - t
        r["step+stl"] = sum(r[k] for k in ("outline", "solid", "check", "step", "mesh", "stl"))
        r["stl only"] = r["outline"] + r["mesh"] + r["stl"]
        r["faces"] = len(solid.Faces())
        r["triangles"] = len(mesh.faces)
        r["step MB"] = os.path.getsize(os.path.join(tmp, "part.step")) / 1e6
        r["watertight"] = mesh.is_watertight
        r["dV %"] = 100.0 * (mesh.volume - solid.Volume()) / solid.Volume()
        del solid, mesh, body
        for k, v in r.items():
            if k not in best or (isinstance(v, float) and k not in ("dV %", "step MB")
                                 and v < best[k]):
                best[k] = v
    return best


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--runs", type=int, default=3)
    args = ap.parse_args(argv)
    t_light, t_cq = _imports()
    print(f"imports: numpy+trimesh+manifold3d {t_light:.2f} s, cadquery {t_cq:.2f} s (not counted)")
    cases = [
        ("herringbone z40 (target)", lambda: gear_body(40)),
        ("herringbone z20", lambda: gear_body(20)),
        ("herringbone z100", lambda: gear_body(100)),
        ("herringbone z40, D-bore cut", lambda: gear_body(40, "d")),
        ("herringbone z40, keyway cut (boolean)", lambda: gear_body(40, "keyway")),
        ("helical rack 20 teeth", lambda: rack_body(False)),
        ("herringbone rack 20 teeth", lambda: rack_body(True)),
    ]
    cols = ["outline", "solid", "check", "step", "mesh", "stl", "step+stl", "stl only"]
    print(f"{'case':40s}" + "".join(f"{c:>9s}" for c in cols)
          + f"{'faces':>7s}{'tris':>8s}{'MB':>6s}{'dV %':>9s}")
    with tempfile.TemporaryDirectory() as tmp:
        run_case(lambda: gear_body(12), tmp, 1)  # warm-up: lazy imports, first-call caches
        for name, make in cases:
            r = run_case(make, tmp, args.runs)
            print(f"{name:40s}" + "".join(f"{r[c]:9.3f}" for c in cols)
                  + f"{r['faces']:7d}{r['triangles']:8d}{r['step MB']:6.1f}{r['dV %']:9.4f}"
                  + ("" if r["watertight"] else "  NOT WATERTIGHT"))
    return 0


if __name__ == "__main__":
    sys.exit(main())
