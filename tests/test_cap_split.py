"""Long straight prisms (racks) get their caps cut into pieces: the kernel's check of one
planar face grows with the square of its edges (measured: benchmarks/bench_rack.py)."""

import numpy as np
import pytest

from gen.geometry.basic_rack import basic_rack
from gen.geometry.body import Prism
from gen.geometry.cap_split import PIECE_CURVES, SPLIT_ABOVE, cap_cuts
from gen.geometry.rack_outline import rack_loop, rack_sizes
from gen.geometry.section import Line, Loop, Section, circle


def _rack(length, holes=()):
    rk = basic_rack("A")   # ISO 53 profile A (common practice)
    rs = rack_sizes(2.0, rk, height=10.0, length=length)
    return Prism(Section(rack_loop(rs, rk), tuple(holes)), 0.0, 12.0)


def _curves(prism):
    from gen.solid.nurbs import oriented_curves

    return oriented_curves(prism.section.outer, True)


def test_short_loops_are_not_cut_and_long_racks_are():
    assert cap_cuts(_curves(_rack(100.0))) is None          # under SPLIT_ABOVE curves
    pr = _rack(400.0)
    curves = _curves(pr)
    assert len(curves) > SPLIT_ABOVE
    cc = cap_cuts(curves)
    assert cc is not None and len(cc.cuts) >= len(curves) // PIECE_CURVES - 1
    # the back is split exactly at the cuts: segments on one line, end to end, left to right
    segs = [cc.curves[i] for i in cc.back]
    assert all(isinstance(s, Line) for s in segs)
    assert all(abs(a.p1[0] - b.p0[0]) < 1e-12 for a, b in zip(segs, segs[1:]))
    assert segs[0].p0[0] < segs[-1].p1[0]
    # every cut runs straight down: its upper end (a junction) right above its lower end
    for top, seg in cc.cuts:
        x_top = float(np.asarray(cc.curves[top].start)[0])
        assert x_top == pytest.approx(cc.curves[seg].p1[0], abs=1e-12)
    # the split loop is the same closed region: equal areas (shoelace), no gaps
    assert Loop(cc.curves).gaps() < 1e-9
    from gen.geometry.section import signed_area

    assert signed_area(Loop(cc.curves).polygon(1e-3)) == pytest.approx(
        signed_area(Loop(tuple(curves)).polygon(1e-3)), rel=1e-12)


def test_cuts_keep_clear_of_holes():
    holes = [circle(2.0, (x, -6.0)) for x in np.arange(20.0, 400.0, 20.0)]
    cc = cap_cuts(_curves(_rack(400.0, holes)), holes)
    assert cc is not None
    for top, _ in cc.cuts:
        x = float(np.asarray(cc.curves[top].start)[0])
        assert all(abs(x - h.curves[0].center[0]) > 2.0 for h in holes)


def test_split_rack_solid_is_valid_and_equals_the_one_cap_solid():
    pytest.importorskip("OCP")
    from gen.export.step import analyse_shape, shape_volume
    from gen.solid.prism import _extruded, _raw_prism

    holes = [circle(2.0, (x, -6.0)) for x in (50.0, 150.0, 250.0, 350.0)]
    pr = _rack(400.0, holes)
    split, whole = _raw_prism(pr), _extruded(pr)
    rep = analyse_shape(split)
    assert rep.errors() == [] and rep.solids == 1 and rep.free_edges == 0
    assert shape_volume(split) == pytest.approx(shape_volume(whole), rel=1e-12)
