"""DXF export of a section, re-read with ezdxf: entities, units, extents, flank accuracy."""

from __future__ import annotations

import math
import os
import subprocess
import sys
from collections import Counter

import numpy as np
import pytest

from gen.export.dxf import write_dxf
from gen.params.schema import Where, check_mapping

import ezdxf  # noqa: E402  (a dependency: fail loudly when missing)
ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
M, Z, BORE = 2.0, 20, 6.0


def _model(kind_mod, values):
    where = Where("test.yaml", "g", lambda key: None)
    return kind_mod.make("g", check_mapping(values, kind_mod.KEYS, where), where)


@pytest.fixture(scope="module")
def gear():
    from gen.kinds import spur_gear

    return _model(spur_gear, {"module": M, "teeth": Z, "face_width": 5, "bore": BORE,
                              "pressure_angle": 20})


@pytest.fixture(scope="module")
def gear_dxf(gear, tmp_path_factory):
    path = str(tmp_path_factory.mktemp("dxf") / "g.dxf")
    size = write_dxf(gear.shape.solids[0].section, path, "g")
    return path, size


def test_entities_units_and_layer(gear_dxf):
    path, size = gear_dxf
    assert size == os.path.getsize(path)
    doc = ezdxf.readfile(path)
    assert doc.header["$INSUNITS"] == 4  # DXF reference: 4 = millimetres (doc)
    msp = doc.modelspace()
    counts = Counter(e.dxftype() for e in msp)
    # each tooth of a generated gear: trochoidal root + involute spline on each flank (4),
    # tip arc and root arc (2); the plain bore is one full circle
    assert counts == {"SPLINE": 4 * Z, "ARC": 2 * Z, "CIRCLE": 1}
    assert {e.dxf.layer for e in msp} == {"g"}
    circ = msp.query("CIRCLE")[0]
    assert circ.dxf.radius == pytest.approx(BORE / 2.0, abs=1e-12)


def test_extents_are_the_tip_diameter(gear_dxf):
    from ezdxf import bbox

    doc = ezdxf.readfile(gear_dxf[0])
    box = bbox.extents(doc.modelspace())
    da = M * (Z + 2)  # ISO 21771: da = d + 2 m (1 + x − k), x = k = 0 (from memory, standard)
    # z even, tooth 0 on +X: tip arcs reach ±da/2 on both axes
    assert box.size.x == pytest.approx(da, abs=1e-6)
    assert box.size.y == pytest.approx(da, abs=1e-6)
    assert tuple(doc.header["$EXTMAX"])[:2] == pytest.approx((da / 2.0, da / 2.0), abs=1e-6)


def test_splines_pass_through_fit_points_and_follow_the_involute(gear, gear_dxf):
    from gen.geometry.involute import inv

    doc = ezdxf.readfile(gear_dxf[0])
    sizes, flank = gear.mate.sizes, gear.mate.flank
    rb, rp, s = sizes.rb, sizes.rp, sizes.s
    worst = 0.0
    for e in list(doc.modelspace().query("SPLINE"))[:8]:
        bs = e.construction_tool()
        pts = np.array([(p.x, p.y) for p in bs.points(np.linspace(0.0, bs.max_t, 4000))])
        fit = np.array([(p[0], p[1]) for p in e.fit_points])
        near = [np.min(np.hypot(*(pts - f).T)) for f in fit]
        assert max(near) < 2e-3  # spacing of the 4000 samples is under 1 µm along a flank
        assert np.allclose(pts[[0, -1]], fit[[0, -1]], atol=1e-9)
        r = np.hypot(*pts.T)
        sel = (r > max(rb, flank.r_junction) + 1e-6) & (r < sizes.ra - 1e-6)
        if not sel.any():
            continue  # the trochoidal root spline
        # involute half-thickness angle ψ(r) = s/(2 rp) + inv α − inv α_r, cos α_r = rb/r
        # (ISO 21771 relations, from memory); tooth centre lines every 2π/z
        psi = s / (2 * rp) + inv(sizes.alpha_t) - inv(np.arccos(rb / r[sel]))
        ang = np.arctan2(pts[sel, 1], pts[sel, 0])
        centre = np.round(ang / (2 * math.pi / Z)) * (2 * math.pi / Z)
        dev = r[sel] * (np.abs(ang - centre) - psi)
        worst = max(worst, float(np.max(np.abs(dev))))
    assert 0 < worst < 1e-3  # mm; measured 0.27 µm on m 2, z 20


def test_rack_section_lines_and_fillet_arcs(tmp_path):
    from gen.kinds import rack

    model = _model(rack, {"module": 1.5, "teeth": 6, "face_width": 5, "height": 6,
                          "pressure_angle": 20})
    section = model.shape.solids[0].section
    path = str(tmp_path / "r.dxf")
    write_dxf(section, path, "r")
    msp = ezdxf.readfile(path).modelspace()
    from gen.geometry.section import Arc, Line

    kinds = Counter("LINE" if isinstance(c, Line) else "ARC" if isinstance(c, Arc) else "SPLINE"
                    for c in section.outer.curves)
    assert Counter(e.dxftype() for e in msp) == kinds
    assert kinds["ARC"] == 2 * 6  # two root fillets per tooth space, ISO 53 (from memory)
    from ezdxf import bbox

    box = bbox.extents(msp)
    # rack: length z p = 6 π m; height back face to tip = height + addendum (1.0 m, ISO 53)
    assert box.size.x == pytest.approx(6 * math.pi * 1.5, abs=1e-9)
    assert box.size.y == pytest.approx(6 + 1.5, abs=1e-9)


def test_same_section_same_bytes_and_options_restored(gear, tmp_path):
    before = ezdxf.options.write_fixed_meta_data_for_testing
    a, b = str(tmp_path / "a.dxf"), str(tmp_path / "b.dxf")
    write_dxf(gear.shape.solids[0].section, a, "g")
    write_dxf(gear.shape.solids[0].section, b, "g")
    assert open(a, "rb").read() == open(b, "rb").read()
    assert ezdxf.options.write_fixed_meta_data_for_testing == before


def test_ezdxf_is_imported_only_when_writing():
    code = "import sys, gen.export.dxf; print('ezdxf' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True,
                         env={**os.environ, "PYTHONPATH": ROOT}, check=True)
    assert out.stdout.strip() == "False"
