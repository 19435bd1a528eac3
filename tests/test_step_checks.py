"""Issue 11 items 2 and 4: full shape analysis before STEP export, re-read of the written
STEP, and one product per placed solid in an assembly STEP."""

from __future__ import annotations

import os
import re

import numpy as np
import pytest

cq = pytest.importorskip("cadquery")

from gen.errors import ExportError  # noqa: E402
from gen.export.step import analyse_shape, read_step_shape, write_step  # noqa: E402
from gen.export.step_assembly import write_step_assembly  # noqa: E402
from gen.tolerances import TOL  # noqa: E402


@pytest.fixture(scope="module")
def block():
    return cq.Solid.makeBox(10.0, 20.0, 5.0)


def test_a_box_passes_the_full_analysis(block):
    rep = analyse_shape(block.wrapped)
    assert rep.errors() == [] and rep.warnings() == []
    assert rep.valid and rep.solids == 1 and rep.free_edges == 0 and rep.no_pcurve == 0
    # a box has 12 edges, each bounding 2 faces: 24 edge/face pairs (common practice)
    assert rep.edge_face_pairs == 24
    assert rep.max_curve_on_surface < 1e-9
    assert rep.volume == pytest.approx(1000.0, rel=1e-12)    # a·b·c (computed)


def test_an_open_shell_and_loose_tolerances_are_refused(block, tmp_path):
    from OCP.ShapeFix import ShapeFix_ShapeTolerance

    shell = cq.Shell.makeShell(block.Faces()[:5])            # one face missing
    rep = analyse_shape(shell.wrapped)
    assert rep.free_edges == 4 and any("free edges" in e for e in rep.errors())
    loose = block.copy()
    ShapeFix_ShapeTolerance().SetTolerance(loose.wrapped, 100 * TOL.edge_tolerance)
    rep = analyse_shape(loose.wrapped)
    assert rep.max_edge_tolerance == pytest.approx(100 * TOL.edge_tolerance)
    assert any("tolerance" in e for e in rep.errors())
    path = str(tmp_path / "b.step")
    write_step(block, path, "b")
    good = open(path, "rb").read()
    with pytest.raises(ExportError, match="shape analysis"):
        write_step(loose, path, "b")
    assert open(path, "rb").read() == good                   # the earlier file stays
    assert not [n for n in os.listdir(tmp_path) if n.startswith(".partial-")]


def test_written_step_re_reads_to_the_same_solid(block, tmp_path):
    path = str(tmp_path / "b.step")
    write_step(block, path, "b")
    back = analyse_shape(read_step_shape(path))
    assert back.errors() == [] and back.solids == 1
    assert back.volume == pytest.approx(1000.0, rel=1e-9)


def test_every_placed_solid_is_its_own_product(block, tmp_path):
    # the same solid placed twice (as the two inputs of a differential): two products, each
    # named after its part, not one product the second placement refers to
    items = []
    for i, name in enumerate(("wrist_input_1", "wrist_input_2")):
        T = np.eye(4)
        T[0, 3] = 30.0 * i
        items.append((name, block, T))
    path = str(tmp_path / "pair.step")
    write_step_assembly(items, path, "pair")
    text = open(path, encoding="utf-8", errors="replace").read()
    products = re.findall(r"PRODUCT\('([^']*)'", text)
    assert "wrist_input_1" in products and "wrist_input_2" in products
    back = analyse_shape(read_step_shape(path))
    assert back.solids == 2 and back.volume == pytest.approx(2000.0, rel=1e-9)


def test_bored_herringbone_has_no_c0_curve_or_surface():
    # a full-circle bore used to be two 180° rational arcs with double interior knots: curves
    # and swept faces only C0 in their parameter, flagged by a full shape analysis (issue 11)
    from gen import api
    from gen.build.export import make_solid
    from gen.export.step import analyse_shape

    g = api.make("herringbone_gear", "h", module=1.5, teeth=16, face_width=12, helix_angle=25,
                 bore=5)
    rep = analyse_shape(make_solid(g))   # a TopoDS_Solid
    assert rep.valid and rep.c0_surfaces == 0 and rep.c0_curves == 0


def test_step_bytes_do_not_depend_on_the_writers_session_counters():
    # the kernel's writer numbers products and assembly occurrences per process and wraps
    # lines at a width those numbers change (seen on the demo: --jobs 1 against a worker
    # pool); two such texts of one model must normalise to the same bytes
    from gen.export.step import normalise

    head = b"FILE_NAME('x','2026-01-01T10:00:00',('a'),(\n"
    a = (head + b"#7 = PRODUCT('wheel 10','wheel 10','',(\n    #8));\n"
         b"#9 = NEXT_ASSEMBLY_USAGE_OCCURRENCE('7','wheel','',#5,\n  #6,$);\n"
         b"#10 = NEXT_ASSEMBLY_USAGE_OCCURRENCE('8','pin','',#5,#11,$);\n")
    b = (head + b"#7 = PRODUCT('wheel 2','wheel 2','',(#8)\n  );\n"
         b"#9 = NEXT_ASSEMBLY_USAGE_OCCURRENCE('1','wheel','',#5,#6,\n  $);\n"
         b"#10 = NEXT_ASSEMBLY_USAGE_OCCURRENCE('2','pin','',#5,#11,$);\n")
    na, nb = normalise(a, "m"), normalise(b, "m")
    assert na == nb
    assert b"PRODUCT('wheel','wheel','',(#8));\n" in na
    assert b"NEXT_ASSEMBLY_USAGE_OCCURRENCE('1','wheel'" in na
    assert b"NEXT_ASSEMBLY_USAGE_OCCURRENCE('2','pin'" in na
    assert b"FILE_NAME('m','1970-01-01T00:00:00'" in na


def _face_with_pcurve_of_edge(shift_u: float, lift: float):
    """A 10 × 10 planar face whose bottom edge's curve on the face is moved along itself by
    ``shift_u`` (the same points, other parameters) and whose 3-D curve is raised ``lift``
    off the plane."""
    from OCP.BRep import BRep_Builder
    from OCP.BRepBuilderAPI import BRepBuilderAPI_MakeEdge, BRepBuilderAPI_MakeFace, \
        BRepBuilderAPI_MakePolygon
    from OCP.Geom2d import Geom2d_Line
    from OCP.gp import gp_Dir2d, gp_Pnt, gp_Pnt2d, gp_Pln
    from OCP.TopAbs import TopAbs_EDGE
    from OCP.TopExp import TopExp_Explorer
    from OCP.TopoDS import TopoDS

    poly = BRepBuilderAPI_MakePolygon(gp_Pnt(0, 0, 0), gp_Pnt(10, 0, 0), gp_Pnt(10, 10, 0),
                                      gp_Pnt(0, 10, 0), True)
    face = BRepBuilderAPI_MakeFace(gp_Pln(), poly.Wire()).Face()
    ex = TopExp_Explorer(face, TopAbs_EDGE)
    edge = TopoDS.Edge_s(ex.Current())                         # (0,0,0) → (10,0,0)
    b = BRep_Builder()
    if lift:
        from OCP.Geom import Geom_Line
        from OCP.gp import gp_Dir

        b.UpdateEdge(edge, Geom_Line(gp_Pnt(0, 0, lift), gp_Dir(1, 0, 0)), 1e-7)
    b.UpdateEdge(edge, Geom2d_Line(gp_Pnt2d(shift_u, 0), gp_Dir2d(1, 0)), face, 1e-7)
    return face


def test_curve_on_face_by_distance_where_parameters_differ():
    from gen.export.shape_analysis import _curve_on_surface, _distance_to_face_surface
    from OCP.TopAbs import TopAbs_EDGE
    from OCP.TopExp import TopExp_Explorer
    from OCP.TopoDS import TopoDS

    def first_edge(face):
        return TopoDS.Edge_s(TopExp_Explorer(face, TopAbs_EDGE).Current())

    # same points, parameters shifted by 1e-3: equal-parameter distance 1e-3 mm (computed),
    # distance from the plane 0: the edge lies on its face and is not counted off it
    moved = _face_with_pcurve_of_edge(1e-3, 0.0)
    assert _curve_on_surface(first_edge(moved), moved) == pytest.approx(1e-3, rel=1e-4)
    assert _distance_to_face_surface(first_edge(moved), moved) < 1e-12
    rep = analyse_shape(moved)
    assert rep.edges_off_surface == 0 and rep.max_curve_on_surface < 1e-12
    # the 3-D curve 1e-3 mm above the plane: off by both measures, and counted
    lifted = _face_with_pcurve_of_edge(1e-3, 1e-3)
    assert _distance_to_face_surface(first_edge(lifted), lifted) == pytest.approx(1e-3, rel=1e-9)
    rep = analyse_shape(lifted)
    assert rep.edges_off_surface == 1
    assert rep.max_curve_on_surface == pytest.approx(1e-3, rel=1e-4)
