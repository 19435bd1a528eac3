"""The fit_coupon part kind: built from a parameter file, measured on its mesh."""

from __future__ import annotations

import math

import numpy as np
import pytest

from gen.errors import ParamError
from gen.params.schema import Where, check_mapping
from gen.validate import measure
from gen.findings import INFO, has_errors

M, Z, BORE, T = 1.5, 18, 5.0, 4.0
STEPS = (0.0, 0.05, 0.10, 0.15, 0.20)        # the kind's default clearances, mm per flank
BORE_STEPS = (0.0, 0.1, 0.2, 0.3, 0.4)       # the kind's default allowances, mm
YAML = f"""
parts:
  calib:
    kind: fit_coupon
    module: {M}
    teeth: {Z}
    bore: {BORE}
    thickness: {T}
"""


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    from gen.triangles.prism import body_triangles
    from gen.check import check

    path = tmp_path_factory.mktemp("coupon") / "coupon.yaml"
    path.write_text(YAML)
    result = check([str(path)])
    model = result.models["calib"]
    return result, model, body_triangles(model.shape, model.chord_tol)


def _area(p):
    x, y = p[:, 0], p[:, 1]
    return abs(x @ np.roll(y, -1) - y @ np.roll(x, -1)) / 2.0


def _centre(p):
    """Area centroid of a closed polygon (shoelace moments)."""
    x, y = p[:, 0], p[:, 1]
    xn, yn = np.roll(x, -1), np.roll(y, -1)
    cr = x * yn - xn * y
    return np.array([((x + xn) * cr).sum(), ((y + yn) * cr).sum()]) / (3.0 * cr.sum())


def test_checks_clean_and_describes_itself(built):
    result, model, _ = built
    assert result.ok and not has_errors(model.findings)
    assert {f.code for f in model.findings if f.severity == INFO} >= {"coupon-steps"}
    assert model.sizes["steps"] == list(STEPS)
    assert model.sizes["hole_diameters"] == pytest.approx([BORE + a for a in BORE_STEPS])
    # tooth thickness on the reference circle: s = m π/2 − thinning, thinning 2c for c per
    # flank (ISO 21771 with x = 0, from memory)
    assert model.sizes["tooth_thickness"] == pytest.approx([M * math.pi / 2 - 2 * c
                                                            for c in STEPS], abs=1e-12)


def test_section_measurements(built):
    _, model, _ = built
    got = model.data["measured"]
    assert [s["teeth"] for s in got["sectors"]] == [5] * len(STEPS)
    for s, c in zip(got["sectors"], STEPS):
        # measured on the chordal polygon: within 2e-3 m of the formula (chordal effect)
        assert s["thickness"] == pytest.approx(M * math.pi / 2 - 2 * c, abs=2e-3 * M)
        assert s["tip"] == pytest.approx(M * (Z + 2) / 2)          # da = m (z + 2)
    assert got["rack"]["teeth"] == 8
    assert got["rack"]["pitch"] == pytest.approx(math.pi * M, abs=1e-9)   # p = π m


def test_mesh_is_one_watertight_piece(built):
    _, model, mesh = built
    assert mesh.is_watertight
    assert mesh.body_count == 1   # the breakaway tabs hold every piece
    assert mesh.bounds[0][2] == pytest.approx(0.0, abs=1e-9)
    assert mesh.bounds[1][2] == pytest.approx(T + 0.6, abs=1e-6)   # dots stand 0.6 mm proud


def test_holes_measured_on_a_slice(built):
    from gen.triangles.prism import slice_polygons

    _, model, mesh = built
    chord = model.chord_tol
    polys = slice_polygons(mesh, T / 2.0)
    d_top = BORE + max(BORE_STEPS)
    holes = []
    for p in polys:
        c = _centre(p)
        r = np.hypot(*(p - c).T)
        if r.max() < d_top / 2.0 + 0.5 and r.max() - r.min() < 0.05:   # small and round
            holes.append((c[0], 2.0 * r.max(), 2.0 * math.sqrt(_area(p) / math.pi)))
    holes.sort()
    assert len(holes) == len(BORE_STEPS)
    for (_, d_vert, d_area), a in zip(holes, BORE_STEPS):
        d = BORE + a
        assert d_vert == pytest.approx(d, abs=1e-4)            # vertices lie on the circle
        assert 0 <= d - d_area <= 2 * chord                    # inscribed polygon, chord tol
    # the kind's own mesh check agrees
    assert [f for check in model.slice_checks for f in check(lambda z: polys)] == []


def test_teeth_and_dots_counted_on_slices(built):
    from gen.triangles.prism import slice_polygons

    _, model, mesh = built
    layout = model.data["layout"]
    mid = slice_polygons(mesh, T / 2.0)
    rp = M * Z / 2.0
    for s in layout["sectors"]:
        local = [p - s["centre"] for p in mid]
        # the sector's outline is the slice polygon whose points reach the tip circle nearby
        own = [p for p in local if np.max(np.hypot(*p.T)) < rp + M + 0.01
               and np.min(np.hypot(*p.T)) < 1e-3]
        assert len(own) == 1
        assert measure.tooth_count(own[0], rp) == 5
    top = slice_polygons(mesh, T + 0.3)
    centres = np.array([_centre(p) for p in top])
    assert len(centres) == 2 * sum(range(1, len(STEPS) + 1))
    rf = M * (Z - 2.5) / 2.0   # df = m (z − 2·1.25), ISO 53 profile A (from memory)
    for k, s in enumerate(layout["sectors"]):
        # a sector's dots lie inside its root circle, on the apex side (y < 0)
        near = (np.hypot(*(centres - s["centre"]).T) < rf) & (centres[:, 1] < 0)
        assert np.count_nonzero(near) == k + 1
    for k, h in enumerate(layout["holes"]):
        near = (np.abs(centres[:, 0] - h["centre"][0]) < 4.0) & (centres[:, 1] > 2.0)
        assert np.count_nonzero(near) == k + 1


def test_one_step_build(built, tmp_path):
    import cadquery as cq

    from gen.export.step import read_step
    from gen.build import export_part

    _, model, mesh = built
    out = export_part(model, str(tmp_path), ("step",))
    assert out.ok, out.findings
    shape = cq.Shape.cast(read_step(str(tmp_path / out.files["step"]["path"])))
    assert shape.Volume() == pytest.approx(mesh.volume, rel=1e-3)


def test_starter_file_checks(tmp_path):
    from gen.cli.new import starter_text
    from gen.check import check

    path = tmp_path / "starter.yaml"
    path.write_text(starter_text("fit_coupon", "cal"))
    assert check([str(path)]).ok


def _make(values):
    from gen.kinds import coupon

    where = Where("test.yaml", "c", lambda key: None)
    return coupon.make("c", check_mapping(values, coupon.KEYS, where), where)


def test_bad_step_lists_are_refused():
    with pytest.raises(ParamError, match="ascending"):
        _make({"module": 1.5, "bore": 5, "steps": [0.1, 0.05]})
    with pytest.raises(ParamError, match="at most 8"):
        _make({"module": 1.5, "bore": 5, "bore_steps": [0.1 * i for i in range(9)]})
    with pytest.raises(ParamError, match="pointed"):
        _make({"module": 0.5, "bore": 2, "steps": [0.0, 0.2]})


def test_custom_steps_through_make():
    model = _make({"module": 1.0, "bore": 3, "steps": [0.0, 0.1, 0.2],
                   "bore_steps": [0.0, 0.2]})
    assert not has_errors(model.findings)
    assert [s["teeth"] for s in model.data["measured"]["sectors"]] == [5, 5, 5]
    assert len(model.data["measured"]["holes"]) == 2


def test_step_list_written_in_the_file(tmp_path):
    from gen.params.project import load_project
    from gen.kinds.base import resolve

    path = tmp_path / "c.yaml"
    path.write_text(YAML + "    steps: [0.0, 0.1]\n")
    model = resolve(load_project([str(path)]).parts["calib"])
    assert model.sizes["steps"] == [0.0, 0.1]
