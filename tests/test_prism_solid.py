"""Kernel solids of twisted and sheared prisms (few builds: each costs 0.02–0.4 s).

Each solid must be valid, one solid, survive a STEP round trip as one valid solid, and agree
in volume with the mesh route's STL (within 0.2 %). Reference relations: Cavalieri's
principle (a twisted prism has the volume of the straight one, computed) and the helix
relation Δθ = Δz·tan β / r_p (ISO 21771, from memory).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import trimesh

import cadquery as cq  # noqa: E402

from gen.geometry.basic_rack import basic_rack  # noqa: E402
from gen.geometry.body import Body, Prism, gear_twist, rack_shear  # noqa: E402
from gen.geometry.cylindrical import cutter_for, gear_sizes  # noqa: E402
from gen.geometry.gear_outline import gear_loop  # noqa: E402
from gen.geometry.generate import generate_flank  # noqa: E402
from gen.geometry.rack_outline import rack_loop, rack_sizes  # noqa: E402
from gen.geometry.section import Arc, Line, Loop, Section, circle  # noqa: E402
from gen.triangles.prism import body_triangles  # noqa: E402
from gen.solid.prism import HELIX_FIT  # noqa: E402
from gen.solid import prism as _prism  # noqa: E402


def body_solid(body: Body, check: bool = True) -> cq.Solid:
    """The builder's TopoDS_Solid wrapped for cadquery's measuring methods."""
    return cq.Solid(_prism.body_solid(body, check))


def prism_solid(prism: Prism, check: bool = True) -> cq.Solid:
    """The builder's TopoDS_Solid wrapped for cadquery's measuring methods."""
    return cq.Solid(_prism.prism_solid(prism, check))

BETA = math.radians(30)


@pytest.fixture(scope="module")
def gear20():
    rk = basic_rack("A")
    sz = gear_sizes(20, 2.0, rk, beta=BETA)
    return gear_loop(generate_flank(20, sz.rp, cutter_for(sz, rk), sz.ra)), sz


def d_bore(r: float = 4.0, flat: float = 3.5) -> Loop:
    a = math.acos(flat / r)
    arc = Arc((0.0, 0.0), r, a, 2 * math.pi - a)
    return Loop((arc, Line(tuple(arc.end), tuple(arc.start))))


def precise_volume(shape) -> float:
    """Volume by adaptive Gauss integration (cadquery's Volume() is off by ~1e-4 relative
    on these B-spline faces, measured)."""
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps

    g = GProp_GProps()
    BRepGProp.VolumeProperties_s(shape.wrapped, g, 1e-9)
    return g.Mass()


def solid_count(shape) -> int:
    return len(shape.Solids())


def round_trip(body: Body, tmp_path, name: str):
    """Build, check, write STEP and STL; return (solid, re-imported solid, STL mesh)."""
    s = body_solid(body)
    assert s.isValid() and solid_count(s) == 1
    step = tmp_path / f"{name}.step"
    s.exportStep(str(step))
    back = cq.importers.importStep(str(step))
    solids = back.solids().vals()
    assert len(solids) == 1 and solids[0].isValid()
    stl = tmp_path / f"{name}.stl"
    body_triangles(body, tol=0.01).export(str(stl))
    mesh = trimesh.load(str(stl))
    assert mesh.is_watertight
    assert mesh.volume == pytest.approx(solids[0].Volume(), rel=2e-3)
    return s, solids[0], mesh


def test_helical_gear_with_d_bore(gear20, tmp_path):
    loop, sz = gear20
    body = Body((Prism(Section(loop), 0.0, 15.0, twist=gear_twist(BETA, sz.rp)),),
                (Prism(Section(d_bore()), 0.0, 15.0),))
    s, back, _ = round_trip(body, tmp_path, "helical")
    assert back.Volume() == pytest.approx(s.Volume(), rel=1e-7)
    # no boolean: 6 lateral faces per tooth (two fillets, two involutes, tip, root), the
    # D-bore's flat and its arc in pieces of at most 90° (each one rational span, so no face
    # is only C0), and the two caps
    arc = next(c for c in d_bore().curves if hasattr(c, "radius"))
    pieces = math.ceil(abs(arc.a1 - arc.a0) / (math.pi / 2) - 1e-9)
    assert len(s.Faces()) == 6 * 20 + pieces + 1 + 2


def test_herringbone_gear(gear20, tmp_path):
    loop, sz = gear20
    tw = gear_twist(BETA, sz.rp)
    sec = Section(loop, (circle(4.0),))
    pr = Prism(sec, 0.0, 20.0, twist=tw, chevron=True)
    s, _, _ = round_trip(Body((pr,)), tmp_path, "herringbone")
    straight = prism_solid(Prism(sec, 0.0, 20.0))
    # Cavalieri (computed): equal volumes, up to the integration noise (~1e-5 relative)
    assert precise_volume(s) == pytest.approx(precise_volume(straight), rel=2e-5)
    worst, checked = helicoid_error(s, pr, min_radius=10.0)
    assert checked == 2 * 4 * 20  # both halves of every flank face (fillet and involute)
    assert worst <= HELIX_FIT
    # tip and root lands, and the bore, are exact cylinders about the axis: radius r_a,
    # r_f (ISO 21771, computed by gear_sizes) and 4 mm, read from the faces' own geometry
    radii = sorted(round(cylinder_radius(f), 12) for f in s.Faces() if f.geomType() == "CYLINDER")
    assert radii == sorted([round(sz.rf, 12)] * 40 + [round(sz.ra, 12)] * 40 + [4.0] * 4)


def cylinder_radius(face) -> float:
    """Radius of a cylindrical face, whose axis must be the Z axis."""
    from OCP.BRepAdaptor import BRepAdaptor_Surface

    cyl = BRepAdaptor_Surface(face.wrapped).Cylinder()
    ax = cyl.Axis()
    assert ax.Direction().IsParallel(cq.Vector(0, 0, 1).toDir(), 1e-15)
    assert math.hypot(ax.Location().X(), ax.Location().Y()) < 1e-15
    return cyl.Radius()


def helicoid_error(s, pr: Prism, min_radius: float):
    """Largest |S(u, z) − R(θ(z) − θ(z_a)) S(u, z_a)| over the B-spline lateral faces."""
    from OCP.BRep import BRep_Tool

    worst, checked = 0.0, 0
    for f in s.Faces():
        if f.geomType() != "BSPLINE":
            continue
        surf = BRep_Tool.Surface_s(f.wrapped)
        u0, u1, za, zb = surf.Bounds()
        mid = surf.Value(0.5 * (u0 + u1), 0.5 * (za + zb))
        if math.hypot(mid.X(), mid.Y()) < min_radius:
            continue  # straight faces (bores) do not turn
        for u in np.linspace(u0, u1, 5):
            p0 = surf.Value(u, za)
            for z in np.linspace(za, zb, 41):
                th = float(pr.motion(z)[0] - pr.motion(za)[0])
                c, sn = math.cos(th), math.sin(th)
                p = surf.Value(u, z)
                want = (c * p0.X() - sn * p0.Y(), sn * p0.X() + c * p0.Y(), z)
                worst = max(worst, math.dist((p.X(), p.Y(), p.Z()), want))
        checked += 1
    return worst, checked


def test_long_twist_needs_several_spans():
    # a 20 mm square turned by 3 rad over 60 mm: the v-direction fit needs many spans
    h = 10.0
    sq = Loop(tuple(Line(p, q) for p, q in [((-h, -h), (h, -h)), ((h, -h), (h, h)),
                                            ((h, h), (-h, h)), ((-h, h), (-h, -h))]))
    pr = Prism(Section(sq, (circle(3.0),)), 0.0, 60.0, twist=0.05)
    s = prism_solid(pr)
    assert s.isValid() and solid_count(s) == 1
    worst, checked = helicoid_error(s, pr, min_radius=5.0)
    assert checked == 4 and worst <= HELIX_FIT
    from OCP.BRep import BRep_Tool
    from OCP.GeomAdaptor import GeomAdaptor_Surface

    spans = [GeomAdaptor_Surface(BRep_Tool.Surface_s(f.wrapped)).BSpline().NbVKnots() - 1
             for f in s.Faces() if f.geomType() == "BSPLINE"]
    assert max(spans) > 5
    assert precise_volume(s) == pytest.approx((400.0 - math.pi * 9.0) * 60.0, rel=1e-6)


def test_helical_rack(tmp_path):
    rk = basic_rack("A")
    rs = rack_sizes(2.0, rk, height=8.0, teeth=8, beta=BETA)
    pr = Prism(Section(rack_loop(rs, rk)), 0.0, 12.0, shear=rack_shear(BETA))
    s, _, mesh = round_trip(Body((pr,)), tmp_path, "rack")
    bb = s.BoundingBox()
    assert bb.xmax == pytest.approx(rs.length + 12.0 * math.tan(BETA), abs=1e-6)  # computed
    # root fillets are true arcs: the mesh's chords (0.01 mm) cost < 2e-4 of the volume
    assert mesh.volume == pytest.approx(s.Volume(), rel=2e-4)


def test_herringbone_rack_and_boolean_fallbacks(gear20):
    rk = basic_rack("A")
    rs = rack_sizes(2.0, rk, height=8.0, teeth=6, beta=BETA)
    rack = Prism(Section(rack_loop(rs, rk)), 0.0, 12.0, shear=rack_shear(BETA), chevron=True)
    r = prism_solid(rack)
    assert r.isValid() and solid_count(r) == 1
    assert r.BoundingBox().xmax == pytest.approx(rs.length + 6.0 * math.tan(BETA), abs=1e-6)
    # a straight hole through the back stays straight while the teeth shear (no boolean)
    hole = Prism(Section(circle(1.5, center=(0.5 * rs.length, -5.0))), 0.0, 12.0)
    body = Body((rack,), (hole,))
    s = body_solid(body)
    assert s.isValid() and solid_count(s) == 1
    # computed: minus a straight cylinder (kernel volume integration good to ~1e-6 here)
    assert precise_volume(s) == pytest.approx(precise_volume(r) - math.pi * 1.5 ** 2 * 12.0,
                                              rel=1e-6)
    # a keyway across a round bore cannot be a plain hole: boolean with a straight prism
    loop, sz = gear20
    key = Loop(tuple(Line(p, q) for p, q in [((0, -1), (5, -1)), ((5, -1), (5, 1)),
                                             ((5, 1), (0, 1)), ((0, 1), (0, -1))]))
    body = Body((Prism(Section(loop, (circle(4.0),)), 0.0, 8.0, twist=gear_twist(BETA, sz.rp)),),
                (Prism(Section(key), -1.0, 9.0),))
    s = body_solid(body)
    assert s.isValid() and solid_count(s) == 1
    assert body_triangles(body).volume == pytest.approx(s.Volume(), rel=2e-3)
    # a straight hub on the twisted gear's top face: boolean union
    hub = Prism(Section(circle(9.0), (circle(4.0),)), 8.0, 14.0)
    body = Body((body.solids[0], hub))
    s = body_solid(body)
    assert s.isValid() and solid_count(s) == 1
    assert body_triangles(body).volume == pytest.approx(s.Volume(), rel=2e-3)


def test_arcs_become_cylinders_only_where_they_stay_on_one():
    """An arc turned about its own centre sweeps a cylinder; off the axis it sweeps a helical
    tube, and a face wrapping more than half a turn stays a B-spline (the kernel's booleans
    lose faces whose parameters exceed the cylinder's period: seen as an empty cut)."""
    from gen.solid.faces import Track, circle_arc
    from gen.solid.nurbs import loop_nurbs

    sec = Section(circle(5.0))
    on_axis = loop_nurbs(sec.outer, True)[0]                  # a quarter circle about 0
    off = loop_nurbs(Loop((Arc((1.0, 0.0), 5.0, 0.0, 2 * math.pi),)), True)[0]
    assert on_axis.arc is not None and off.arc is not None

    def arc_of(nb, twist, chevron=False):
        pr = Prism(sec, 0.0, 10.0, twist=twist, chevron=chevron)
        tr = Track([nb], None if twist == 0.0 else pr, 5.0)
        return circle_arc(tr, nb, tr.levels(0.0, 10.0))

    assert arc_of(on_axis, 0.0) == on_axis.arc and arc_of(off, 0.0) == off.arc
    assert arc_of(on_axis, 0.1) == on_axis.arc                # 1 rad + π/2 ≤ π
    assert arc_of(on_axis, 0.1, chevron=True) == on_axis.arc  # 0.5 + π/2 ≤ π per stage
    assert arc_of(on_axis, 0.2) is None                       # 2 rad + π/2 > π
    assert arc_of(off, 0.01) is None                          # a turn about another point
