"""One straight bevel gear through the CAD kernel (a single build, shared by the tests)."""

import math

import pytest

from gen.geometry.basic_rack import basic_rack
from gen.geometry.bevel import bevel_sizes

import cadquery as cq  # noqa: E402

M, Z, ZM, B, BORE = 2.0, 20, 40, 14.0, 8.0


@pytest.fixture(scope="module")
def gear():
    from gen.solid.bevel import build_bevel_solid

    s = bevel_sizes(Z, ZM, M, math.pi / 2, B, basic_rack("A"))
    return s, cq.Solid(build_bevel_solid(s, BORE))   # the builder gives a TopoDS_Solid


def _section_points(solid, angle):
    """Vertices of the solid's section by the half-plane through Z at polar angle ``angle``,
    as (radius, z) pairs."""
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Section
    from OCP.gp import gp_Dir, gp_Pln, gp_Pnt

    c, s = math.cos(angle), math.sin(angle)
    sec = BRepAlgoAPI_Section(solid.wrapped, gp_Pln(gp_Pnt(0, 0, 0), gp_Dir(-s, c, 0)))
    sec.Build()
    pts = []
    for v in cq.Shape.cast(sec.Shape()).Vertices():
        p = v.toTuple()
        along = p[0] * c + p[1] * s
        if along > 0:
            pts.append((along, p[2]))
    return pts


def _on_cone(pts, s, k):
    """Points on the back cone scaled by k about the apex: through k·(pitch point), along
    n = (cos δ, sin δ) in (r, z)."""
    H = s.mounting_distance
    rP, zP = k * s.de / 2, H - k * s.Re * math.cos(s.delta)
    cd, sd = math.cos(s.delta), math.sin(s.delta)
    return [(r, z) for r, z in pts if abs((r - rP) * sd - (z - zP) * cd) < 1e-4]


def test_solid_is_valid_with_back_face_on_z0(gear):
    s, solid = gear
    assert isinstance(solid, cq.Solid) and solid.isValid()
    bb = solid.BoundingBox()
    assert bb.zmin == pytest.approx(0.0, abs=1e-5)
    assert bb.zmax < s.mounting_distance  # teeth toward +Z, below the apex
    # bore through along Z: the axis is empty, the body beside it is material
    assert not solid.isInside(cq.Vector(0, 0, 1.0))
    assert solid.isInside(cq.Vector(BORE / 2 + 1.0, 0, 1.0))


def test_outer_diameter_on_the_solid(gear):
    # ISO 23509: dae = de + 2 ha cos δ; tooth 0 is centred on +X, so the bounding box reaches it
    s, solid = gear
    dae = M * Z + 2 * M * 1.0 * math.cos(math.atan2(Z, ZM))
    bb = solid.BoundingBox()
    assert 2 * bb.xmax == pytest.approx(dae, abs=2e-3)
    rmax = max(math.hypot(*v.toTuple()[:2]) for v in solid.Vertices())
    assert 2 * rmax == pytest.approx(dae, abs=1e-4)


def test_tooth_height_scales_with_cone_distance_on_the_solid(gear):
    s, solid = gear
    k = s.Ri / s.Re
    tooth = _section_points(solid, 0.0)               # through the middle of tooth 0
    space = _section_points(solid, math.pi / s.z)      # through the middle of the next space
    heights = []
    for kk in (1.0, k):
        tip = max(r for r, _ in _on_cone(tooth, s, kk))
        root = max(r for r, _ in _on_cone(space, s, kk))
        heights.append((tip - root) / math.cos(s.delta))   # along the cone generator
    # ISO 53 profile A whole depth 2.25 m at the large end
    # (ISO 53:1998 h_aP + h_fP = 1.0 + 1.25 m, from memory)
    assert heights[0] == pytest.approx(2.25 * M, abs=1e-3)
    assert heights[1] / heights[0] == pytest.approx(k, abs=1e-4)


def test_step_round_trip_is_one_valid_solid(gear, tmp_path):
    s, solid = gear
    path = tmp_path / "bevel.step"
    cq.exporters.export(cq.Workplane().add(solid), str(path))
    back = cq.importers.importStep(str(path))
    solids = back.solids().vals()
    assert len(solids) == 1 and solids[0].isValid()
    assert solids[0].Volume() == pytest.approx(solid.Volume(), rel=1e-6)
