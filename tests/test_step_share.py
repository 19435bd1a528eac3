"""One instance per geometric value in written STEP files (gen.export.step_share), and the
flanks of a gear as re-read from its STEP within 1 µm of the exact curves."""

from __future__ import annotations

import math
import re
from collections import Counter

import numpy as np
import pytest

from gen.export.step_share import share_geometry

TEXT = b"""ISO-10303-21;
HEADER;
FILE_NAME('a #1 name','1970-01-01T00:00:00',('x'),('y'),'p','q','r');
ENDSEC;
DATA;
#1 = SHAPE_REPRESENTATION('',(#5,#9),#20);
#2 = EDGE_CURVE('',#3,#4,#7,.T.);
#3 = VERTEX_POINT('',#6);
#4 = VERTEX_POINT('',#8);
#5 = AXIS2_PLACEMENT_3D('',#6,#10,#11);
#6 = CARTESIAN_POINT('',(0.,0.,0.));
#7 = LINE('',#12,#13);
#8 = CARTESIAN_POINT('',(1.,0.,0.));
#9 = AXIS2_PLACEMENT_3D('',#14,#15,#16);
#10 = DIRECTION('',(0.,0.,1.));
#11 = DIRECTION('',(1.,0.,0.));
#12 = CARTESIAN_POINT('',(0.,0.,
    0.));
#13 = VECTOR('',#16,1.);
#14 = CARTESIAN_POINT('',(0.,0.,0.));
#15 = DIRECTION('',(0.,0.,1.));
#16 = DIRECTION('',(1.,0.,0.));
#17 = VERTEX_POINT('',#14);
#18 = PRODUCT('gear #2','gear #2','',(#19));
#19 = PRODUCT_CONTEXT('',#20,'mechanical');
#20 = APPLICATION_CONTEXT('design');
ENDSEC;
END-ISO-10303-21;
"""


def _entities(data: bytes) -> dict:
    return {int(m.group(1)): re.sub(rb"\s+", b"", m.group(2))
            for m in re.finditer(rb"^#(\d+) = (.*?);\n", data, re.M | re.S)}


def test_equal_geometric_values_become_one_instance():
    out = share_geometry(TEXT)
    ents = _entities(out)
    # numbered from 1 in file order, every reference resolving to an instance
    assert sorted(ents) == list(range(1, len(ents) + 1))
    refs = {int(r) for b in ents.values() for r in re.findall(rb"#(\d+)",
                                                               re.sub(rb"'[^']*'", b"", b))}
    assert refs <= set(ents)
    texts = Counter(ents.values())
    # the points (0,0,0) #6, #12, #14 are one instance; #6 is the representation placement's
    # own point, but a point is merged wherever geometry or a vertex uses it
    assert sum(1 for b in ents.values() if b.startswith(b"CARTESIAN_POINT")) == 2
    # both placements stay: each is an item of the representation (never merged)
    assert sum(1 for b in ents.values() if b.startswith(b"AXIS2_PLACEMENT_3D")) == 2
    # directions: (0,0,1) and (1,0,0) once each
    assert sum(1 for b in ents.values() if b.startswith(b"DIRECTION")) == 2
    # topology is never merged: three vertices (two of them on the same point) stay
    assert sum(1 for b in ents.values() if b.startswith(b"VERTEX_POINT")) == 3
    assert max(texts.values()) == 2   # the two vertices on one point: equal text, kept
    # strings are left alone, '#' inside them included
    assert b"FILE_NAME('a #1 name'" in out and b"PRODUCT('gear #2','gear #2'" in out


def test_a_text_that_does_not_parse_is_left_alone():
    broken = TEXT.replace(b"#13 = VECTOR('',#16,1.);\n", b"")   # #7 refers to no instance
    assert share_geometry(broken) == broken
    assert share_geometry(b"not a step file") == b"not a step file"


@pytest.fixture(scope="module")
def spur_step(tmp_path_factory):
    """A 40-tooth m 2 spur gear (ISO 53 profile A) with an 8 mm bore, written as STEP."""
    pytest.importorskip("OCP")
    from gen.export.step import write_step
    from gen.geometry.basic_rack import basic_rack
    from gen.geometry.body import Body, Prism
    from gen.geometry.cylindrical import cutter_for, gear_sizes
    from gen.geometry.gear_outline import gear_loop
    from gen.geometry.generate import generate_flank
    from gen.geometry.section import Section, circle
    from gen.solid.prism import body_solid

    rk = basic_rack("A")
    sz = gear_sizes(40, 2.0, rk)
    cutter = cutter_for(sz, rk)
    flank = generate_flank(40, sz.rp, cutter, sz.ra)
    body = Body((Prism(Section(gear_loop(flank), (circle(4.0),)), 0.0, 10.0),))
    path = tmp_path_factory.mktemp("share") / "spur.step"
    write_step(body_solid(body), str(path), "spur")     # re-read and analysed as it writes
    return path, sz, cutter, flank


def test_written_step_has_one_instance_per_point(spur_step):
    path, *_ = spur_step
    ents = _entities(path.read_bytes())
    points = [b for b in ents.values() if b.startswith(b"CARTESIAN_POINT")]
    assert len(points) == len(set(points))
    curves = [b for b in ents.values() if b.startswith(b"B_SPLINE_CURVE_WITH_KNOTS")]
    assert len(curves) == len(set(curves))


def test_flanks_in_the_step_lie_within_1_um_of_the_exact_curves(spur_step):
    # Every B-spline edge of the gear as re-read from its STEP file, 101 points each.
    # Involute part: the involute of the base circle with ψ(r) = s/(2 r_p) + inv α − inv α_r
    # (ISO 21771 tooth thickness relation, from memory); a point whose ψ differs by δ lies
    # rb·δ from it along the common normal (computed). Trochoidal root: the generated flank
    # evaluated afresh at the point's radius (gen.geometry.generate.psi_exact: the rack
    # rolling envelope, computed), the angular miss turned into a normal distance by the
    # local slope. Bound: 1 µm, the exactness the STEP files promise.
    from OCP.BRepAdaptor import BRepAdaptor_Curve
    from OCP.GeomAbs import GeomAbs_BSplineCurve
    from OCP.TopAbs import TopAbs_EDGE
    from OCP.TopExp import TopExp
    from OCP.TopoDS import TopoDS
    from OCP.TopTools import TopTools_IndexedMapOfShape

    from gen.export.step import read_step_shape
    from gen.geometry.generate import psi_exact

    path, sz, cutter, flank = spur_step
    rb, rp, z = sz.rb, sz.rp, 40
    pitch = 2.0 * math.pi / z
    alpha = math.acos(rb / rp)
    tan_inv = math.tan(alpha) - alpha
    worst = {"involute": 0.0, "root": 0.0}
    counted = Counter()
    edges = TopTools_IndexedMapOfShape()
    TopExp.MapShapes_s(read_step_shape(str(path)), TopAbs_EDGE, edges)
    for i in range(1, edges.Extent() + 1):
        a = BRepAdaptor_Curve(TopoDS.Edge_s(edges.FindKey(i)))
        if a.GetType() != GeomAbs_BSplineCurve:
            continue
        t = np.linspace(a.FirstParameter(), a.LastParameter(), 101)
        P = np.array([[a.Value(float(x)).X(), a.Value(float(x)).Y()] for x in t])
        r = np.hypot(P[:, 0], P[:, 1])
        th = np.arctan2(P[:, 1], P[:, 0])
        k = np.round(np.median(th) / pitch)
        psi = np.abs((th - k * pitch + math.pi) % (2.0 * math.pi) - math.pi)
        if r.max() > flank.r_junction + 1e-3:
            ar = np.arccos(np.clip(rb / r, -1.0, 1.0))
            want = sz.s / (2.0 * rp) + tan_inv - (np.tan(ar) - ar)
            worst["involute"] = max(worst["involute"], float(np.max(rb * np.abs(psi - want))))
            counted["involute"] += 1
        else:
            ok = r - flank.r_root > 1e-6       # the slope is infinite on the root circle
            rr, h = r[ok], 1e-6
            slope = (psi_exact(cutter, rp, z, rr + h) - psi_exact(cutter, rp, z, rr - h)) / (2 * h)
            miss = rr * np.abs(psi[ok] - psi_exact(cutter, rp, z, rr))
            worst["root"] = max(worst["root"], float(np.max(miss / np.hypot(1.0, rr * slope))))
            counted["root"] += 1
    # both flanks of 40 teeth, bottom and top edges
    assert counted == {"involute": 160, "root": 160}
    assert worst["involute"] <= 1e-6 and worst["root"] <= 1e-6, worst
