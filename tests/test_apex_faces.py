"""Straight bevel gear built face by face (gen.solid.apex_faces) and its directly placed
triangles (gen.triangles.apex): exactness of the ruled flanks, agreement with the older
boolean routes, closed meshes. One solid per session (module fixture)."""

import math

import numpy as np
import pytest

from gen.geometry.basic_rack import basic_rack
from gen.geometry.bevel import bevel_sizes, bevel_tooth_outline_3d, virtual_flank
from gen.geometry.body import ApexBody

M, Z, ZM, B, BORE = 2.0, 14, 21, 8.0, 6.0


@pytest.fixture(scope="module")
def gear():
    s = bevel_sizes(Z, ZM, M, math.pi / 2, B, basic_rack("A"))
    return s, virtual_flank(s)


@pytest.fixture(scope="module")
def solid(gear):
    import cadquery as cq

    from gen.solid.bevel import build_bevel_solid

    s, fl = gear
    return cq.Solid(build_bevel_solid(s, BORE, flank=fl))   # the builder gives a TopoDS_Solid


def test_flank_faces_are_ruled_through_the_apex(gear, solid):
    # a straight bevel flank is a ruled surface whose rulings meet at the cone apex
    # (ISO 23509 "standard taper", common practice): every iso-u line of each B-spline face
    # must pass through (0, 0, H) — checked on 5 rulings per face, to 1e-9 mm
    from OCP.BRep import BRep_Tool

    s, _ = gear
    apex = np.array([0.0, 0.0, s.mounting_distance])
    worst, faces = 0.0, 0
    for f in solid.Faces():
        if f.geomType() != "BSPLINE":
            continue
        surf = BRep_Tool.Surface_s(f.wrapped)
        u0, u1, v0, v1 = surf.Bounds()
        for u in np.linspace(u0, u1, 5):
            a = np.array(surf.Value(u, v0).Coord())
            b = np.array(surf.Value(u, v1).Coord())
            d = (b - a) / np.linalg.norm(b - a)
            off = (apex - a) - np.dot(apex - a, d) * d
            worst = max(worst, float(np.linalg.norm(off)))
        faces += 1
    assert faces == 4 * Z          # root fillet and involute on both sides of every tooth
    assert worst < 1e-9


def test_large_end_flank_within_a_micrometre_of_the_tredgold_samples(gear, solid):
    # every large-end sample of the back-cone outline (gen.geometry.bevel, computed there by
    # wrapping the generated virtual-gear flank) lies on the solid within 1 µm
    from OCP.BRepExtrema import BRepExtrema_DistShapeShape
    from OCP.BRepBuilderAPI import BRepBuilderAPI_MakeVertex
    from OCP.gp import gp_Pnt

    s, fl = gear
    out = bevel_tooth_outline_3d(s, fl)
    pts = np.concatenate([c.points[::5] for c in out.curves[:6] if c.kind == "spline"])
    worst = 0.0
    for p in pts:
        v = BRepBuilderAPI_MakeVertex(gp_Pnt(*map(float, p))).Vertex()
        d = BRepExtrema_DistShapeShape(v, solid.wrapped)
        worst = max(worst, d.Value())
    assert worst < 1e-6


def test_solid_volume_equals_the_boolean_route(gear, solid):
    # independent route (computed): the revolved blank intersected with the ruled tooth loft
    # by the kernel's boolean (the former builder), same sizes
    import cadquery as cq
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Common

    from gen.geometry.bevel import blank_profile

    s, fl = gear
    H = s.mounting_distance
    prof = blank_profile(s, BORE / 2)
    wire = cq.Wire.makePolygon([cq.Vector(r, 0.0, z) for r, z in prof], close=True)
    blank = cq.Solid.revolve(wire, [], 360.0, cq.Vector(0, 0, 0), cq.Vector(0, 0, 1))
    z_top = blank.BoundingBox().zmax
    outline = bevel_tooth_outline_3d(s, fl)
    wires = []
    for zp in (-s.module, z_top + 0.5 * (H - z_top)):
        loop = outline.on_plane(zp)
        edges = []
        for c in loop.curves:
            if hasattr(c, "radius"):
                edges.append(cq.Edge.makeThreePointArc(*(cq.Vector(p[0], p[1], zp)
                                                         for p in (c.start, c.mid, c.end))))
            else:
                edges.append(cq.Edge.makeSpline([cq.Vector(x, y, zp) for x, y in c.points]))
        wires.append(cq.Wire.assembleEdges(edges))
    teeth = cq.Solid.makeLoft(wires, ruled=True)
    ref = cq.Shape.cast(BRepAlgoAPI_Common(blank.wrapped, teeth.wrapped).Shape())
    assert solid.isValid()
    # cadquery's Volume() is off by ~1e-4 relative on B-spline faces: adaptive integration
    assert _volume(solid) == pytest.approx(_volume(ref), rel=1e-5)


def _volume(shape) -> float:
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps

    g = GProp_GProps()
    BRepGProp.VolumeProperties_s(shape.wrapped, g, 1e-9)
    return g.Mass()


def test_triangles_closed_and_agree_with_the_solid(gear, solid):
    from gen.triangles.apex import apex_triangles

    s, fl = gear
    tm = apex_triangles(ApexBody(s, fl, BORE), 0.01)
    assert tm.is_watertight and tm.is_winding_consistent
    # chords inside a convex-ish surface lose a little volume: within 0.2 % (issue 13 asks
    # 0.5 %); the tip is a vertex ring on the outer tip circle, dae = de + 2 ha cos δ
    # (ISO 23509, from memory)
    assert tm.volume == pytest.approx(solid.Volume(), rel=2e-3)
    dae = s.de + 2 * M * math.cos(s.delta)
    assert 2 * np.max(np.hypot(tm.vertices[:, 0], tm.vertices[:, 1])) == pytest.approx(dae, abs=1e-9)


def test_triangles_follow_the_tolerance(gear):
    from gen.triangles.apex import apex_mesh_arrays

    s, fl = gear
    counts = [len(apex_mesh_arrays(s, BORE / 2, fl, t)[1]) for t in (0.05, 0.02, 0.01, 0.005)]
    assert counts == sorted(counts) and counts[-1] > counts[0]


def test_triangles_without_bore_and_mating_gear(gear):
    from gen.geometry.bevel import mating_sizes
    from gen.triangles.apex import apex_triangles

    s, _ = gear
    m = mating_sizes(s)
    tm = apex_triangles(ApexBody(m, virtual_flank(m), 0.0), 0.01)
    assert tm.is_watertight and tm.volume > 0
