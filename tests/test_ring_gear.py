"""Kind ring_gear: ISO 21771 internal sizes, measured outline, rim and bolt holes, helix hands,
and the exported STL measured on slices."""

import math

import numpy as np
import pytest

from gen.errors import ParamError
from gen.kinds.base import Role, resolve
from gen.params.project import RawPart
from gen.validate.measure import radii

A20 = math.radians(20.0)


def ring(**values):
    base = {"module": 2.0, "teeth": 40, "face_width": 8.0, "rim_thickness": 5.0}
    base.update(values)
    base = {k: v for k, v in base.items() if v is not None}
    return resolve(RawPart("r", "ring_gear", base, "t.yaml", None, {}))


@pytest.fixture(scope="module")
def lone_ring():
    # the parameter form: m 2, z 40, face 8, rim 5, full ISO tip (k = 0)
    return ring(tip_shortening=0.0)


def test_sizes_follow_iso21771_internal_relations(lone_ring):
    # ISO 21771 (from memory), internal gear written with z < 0: d = z m, d_a = d + 2m(1 + x),
    # d_f = d − 2m(1.25 − x) with ISO 53 profile A; z = −40, m 2, x 0 → |d| 80, |d_a| 76,
    # |d_f| 85 (computed: −80 + 4 = −76, −80 − 5 = −85)
    s = lone_ring.sizes
    z_iso, m = -40, 2.0
    assert s["pitch_diameter"] == pytest.approx(abs(z_iso * m), abs=1e-12)
    assert s["tip_diameter"] == pytest.approx(abs(z_iso * m + 2 * m * 1.0), abs=1e-12)
    assert s["root_diameter"] == pytest.approx(abs(z_iso * m - 2 * m * 1.25), abs=1e-12)
    assert s["base_diameter"] == pytest.approx(80.0 * math.cos(A20), abs=1e-12)
    # space width = tooth thickness = p/2 for x = 0 (ISO 21771, from memory)
    assert s["space_width"] == pytest.approx(math.pi, abs=1e-12)
    assert s["rim_outside_diameter"] == pytest.approx(85.0 + 10.0, abs=1e-12)
    assert lone_ring.role is Role.INTERNAL_GEAR
    assert not lone_ring.errors


def test_shift_and_tip_shortening_move_the_tip_outward():
    # positive shift moves the ring profile away from the axis (ISO signed x = −0.3):
    # |d_a| = |−80 + 2·2(1 − 0.3 − 0.2)| = 78, |d_f| = |−80 − 2·2(1.25 + 0.3)| = 86.2 (computed)
    r = ring(profile_shift=0.3, tip_shortening=0.2)
    assert r.sizes["tip_diameter"] == pytest.approx(78.0, abs=1e-12)
    assert r.sizes["root_diameter"] == pytest.approx(86.2, abs=1e-12)
    # e = m(π/2 + 2x tan α) (ISO 21771 for the space of an internal gear, from memory)
    assert r.sizes["space_width"] == pytest.approx(2.0 * (math.pi / 2 + 0.6 * math.tan(A20)))


def test_outline_measures_teeth_and_radii(lone_ring):
    poly = lone_ring.outline
    r = radii(poly)
    # tip and root are exact arcs: the polygon vertices lie on them (round-off only)
    assert r.min() == pytest.approx(38.0, abs=1e-9)
    assert r.max() == pytest.approx(42.5, abs=1e-9)
    # 40 spaces → 80 crossings of a circle between the tip and root circles
    from gen.validate.measure import circle_crossings

    ang, _ = circle_crossings(poly, 40.0)
    assert len(ang) == 80


def test_default_tip_shortening_and_rim():
    r = ring(rim_thickness=None)
    # default k = 0.2: |d_a| = 80 − 2·2(1 − 0.2) = 76.8 (computed)
    assert r.sizes["tip_diameter"] == pytest.approx(76.8, abs=1e-12)
    # default rim: 1.2 tooth depths (2.25 m = 4.5 mm) under the root (ISO 6336-3 backup
    # ratio 1.2, from memory) → 5.4 mm
    assert r.sizes["rim_thickness"] == pytest.approx(1.2 * 4.5, abs=1e-12)


def test_thin_rim_is_reported():
    r = ring(rim_thickness=2.0)   # under 1.2 × 4.5 mm
    assert any(f.code == "thin-rim" for f in r.findings)


def test_rim_keys_and_refusals():
    with pytest.raises(ParamError, match="not both"):
        ring(rim_outside_diameter=100.0)
    with pytest.raises(ParamError, match="root diameter"):
        ring(rim_thickness=None, rim_outside_diameter=84.0)
    with pytest.raises(ParamError, match="helix angle"):
        ring(herringbone=True)
    with pytest.raises(ParamError):
        ring(cutter_teeth=40)   # the cutter must be smaller than the ring


def test_a_cutter_that_cannot_reach_the_spaces_is_refused_by_name():
    # inv α_w0 = inv α_t + 2 tan α_n (x₂ − x₀)/(z₂ − z₀) (the internal-pair relation, from
    # memory): m 1.5, z 34, x −0.3, 14.5°, default 17-tooth cutter → 0.00554 − 0.00913 < 0,
    # no working pressure angle; this was an internal error (a traceback) before
    with pytest.raises(ParamError, match="cannot cut this ring") as err:
        ring(module=1.5, teeth=34, profile_shift=-0.3, pressure_angle=14.5, profile="B")
    assert err.value.key == "cutter_teeth"
    # the first remedy the message names: x₀ = x₂ gives α_w0 = α_t
    fixed = ring(module=1.5, teeth=34, profile_shift=-0.3, pressure_angle=14.5, profile="B",
                 cutter_shift=-0.3)
    assert fixed.sizes["cutter_shift"] == -0.3


def test_mounting_holes_fit_the_rim_or_are_refused():
    r = ring(rim_thickness=8.0, mounting_holes={"count": 6, "diameter": 3.0, "bolt_circle": 93.0})
    # the DXF section: rim circle, toothed hole and six bolt holes
    assert len(r.section.holes) == 7
    centres = [np.mean(h.polygon(0.01), axis=0) for h in r.section.holes[1:]]
    assert [float(np.hypot(*c)) for c in centres] == pytest.approx([46.5] * 6, abs=1e-3)
    # 93 − 3 = 90 mm reaches inside 85 + 2·1 mm? no; 97 + 3 = 100 > 101 − 2: refused (computed)
    with pytest.raises(ParamError, match="do not fit the rim"):
        ring(rim_thickness=8.0, mounting_holes={"count": 6, "diameter": 3.0, "bolt_circle": 98.0})
    with pytest.raises(ParamError, match="do not fit the rim"):
        ring(rim_thickness=8.0, mounting_holes={"count": 6, "diameter": 3.0, "bolt_circle": 88.0})


def test_helical_ring_twists_with_its_hand():
    right = ring(helix_angle=20.0, hand="right")
    left = ring(helix_angle=20.0, hand="left")
    # twist = tan β / r_p (shared helix relation, from memory), + for a right hand
    rp = right.sizes["pitch_diameter"] / 2.0
    assert right.shape.solids[0].twist == pytest.approx(math.tan(math.radians(20)) / rp)
    assert left.shape.solids[0].twist == pytest.approx(-math.tan(math.radians(20)) / rp)
    # d = z m_n / cos β (ISO 21771, from memory)
    assert right.sizes["pitch_diameter"] == pytest.approx(80.0 / math.cos(math.radians(20)))


@pytest.fixture(scope="module")
def exported(tmp_path_factory):
    """Herringbone ring with bolt holes exported to STL and read back (triangles only)."""
    import trimesh

    from gen.build.export import make_triangles

    part = ring(helix_angle=20.0, herringbone=True, rim_thickness=8.0,
                mounting_holes={"count": 6, "diameter": 3.0, "bolt_circle": 96.0})
    path = tmp_path_factory.mktemp("ring") / "ring.stl"
    make_triangles(part).export(path)
    return part, trimesh.load(path)


def test_exported_stl_measures_teeth_and_radii(exported):
    from gen.triangles.prism import slice_polygons
    from gen.validate.ring_checks import measure_ring, toothed_hole

    part, mesh = exported
    assert mesh.is_watertight
    s = part.sizes
    for z in (1.0, 2.0, 6.0):   # lower half, the mid-plane, upper half
        polys = slice_polygons(mesh, z)
        # rim, toothed hole and six bolt holes
        assert len(polys) == 8
        got = measure_ring(toothed_hole(polys))
        assert got["teeth"] == 40
        # chord tolerance 0.01 mm plus slicing round-off (TOL.slice_extra)
        assert got["tip_radius"] == pytest.approx(s["tip_diameter"] / 2, abs=0.012)
        assert got["root_radius"] == pytest.approx(s["root_diameter"] / 2, abs=0.012)
    # the part's own slice checks pass on the exported triangles
    for check in part.slice_checks:
        assert not [f for f in check(lambda z: slice_polygons(mesh, z)) if f.severity == "error"]
