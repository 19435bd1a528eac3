"""Straight bevel gear sizes, Tredgold tooth outline in 3-D, blank, and findings."""

import math

import numpy as np
import pytest

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.bevel import (bevel_sizes, bevel_tooth_outline_3d, blank_profile, mating_sizes,
                                pitch_cone_angles, virtual_flank)
from gen.geometry.section import Arc
from gen.tolerances import TOL
from gen.validate import measure
from gen.validate.bevel_checks import bevel_findings, small_end_tip_land
from gen.findings import ERROR, WARNING

RACK = basic_rack("A")
RIGHT = math.pi / 2


def test_reference_pair_m3_z20_40():
    # ISO 23509 conventions (from memory): tan δ1 = z1/z2 at Σ 90°, Re = de/(2 sin δ), b ≤ Re/3,
    # Tredgold zv = z/cos δ: m 3, z 20/40 → δ 26.565°/63.435°, Re 67.082,
    # b ≤ 22.36, zv 22.36/89.44 (computed)
    s1 = bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK)
    s2 = mating_sizes(s1)
    assert math.degrees(s1.delta) == pytest.approx(26.565, abs=5e-4)
    assert math.degrees(s2.delta) == pytest.approx(63.435, abs=5e-4)
    assert s1.Re == pytest.approx(67.082, abs=5e-4) and s2.Re == pytest.approx(s1.Re)
    assert s1.b_max == pytest.approx(22.36, abs=5e-3)
    assert s1.zv == pytest.approx(22.36, abs=5e-3)
    assert s2.zv == pytest.approx(89.44, abs=5e-3)
    # independent route (computed): for Σ = 90° the pitch radii are the legs of a right
    # triangle with hypotenuse Re, so Re = ½√(de1² + de2²), cos δ1 = z2/√(z1² + z2²)
    hyp = math.hypot(20, 40)
    assert s1.Re == pytest.approx(0.5 * math.hypot(60.0, 120.0), rel=1e-12)
    assert s1.zv == pytest.approx(20 * hyp / 40, rel=1e-12)
    assert s2.zv == pytest.approx(40 * hyp / 20, rel=1e-12)
    assert s1.b_max == pytest.approx(min(0.5 * math.hypot(60.0, 120.0) / 3.0, 30.0), rel=1e-12)


def test_reference_miter_m2_z25():
    # same relations (ISO 23509, from memory): miter m 2, z 25 → Re 35.355, b ≤ 11.79, zv 35.36 (computed)
    s = bevel_sizes(25, 25, 2.0, RIGHT, 10.0, RACK)
    assert math.degrees(s.delta) == pytest.approx(45.0, abs=1e-12)
    assert s.Re == pytest.approx(35.355, abs=5e-4)
    assert s.b_max == pytest.approx(11.79, abs=5e-3)
    assert s.zv == pytest.approx(35.36, abs=5e-3)
    # independent (computed): Re = de/√2, zv = z √2 for δ = 45°
    assert s.Re == pytest.approx(50.0 / math.sqrt(2.0), rel=1e-12)
    assert s.zv == pytest.approx(25 * math.sqrt(2.0), rel=1e-12)


@pytest.mark.parametrize("sigma_deg", [60.0, 90.0])
@pytest.mark.parametrize("z1,z2", [(20, 40), (17, 23), (25, 25)])
def test_cone_angles_add_up_and_roll(sigma_deg, z1, z2):
    sigma = math.radians(sigma_deg)
    d1, d2 = pitch_cone_angles(z1, z2, sigma)
    assert d1 + d2 == pytest.approx(sigma, abs=1e-12)
    # independent route (computed): the pitch cones touch along one generator, so both
    # large-end pitch radii belong to one cone distance: z1 m/(2 sin δ1) = z2 m/(2 sin δ2)
    assert z1 / math.sin(d1) == pytest.approx(z2 / math.sin(d2), rel=1e-12)
    s1 = bevel_sizes(z1, z2, 2.0, sigma, 5.0, RACK)
    assert s1.Re == pytest.approx(mating_sizes(s1).Re, rel=1e-12)


def test_face_width_limit_raises_with_the_limit():
    with pytest.raises(GeometryError, match=r"22\.361"):
        bevel_sizes(20, 40, 3.0, RIGHT, 22.5, RACK)
    # the 10 m side of the limit (computed): z 60/60 m 1 → Re/3 = 14.14 > 10 m = 10
    with pytest.raises(GeometryError, match=r"10\.000"):
        bevel_sizes(60, 60, 1.0, RIGHT, 10.5, RACK)
    assert bevel_sizes(60, 60, 1.0, RIGHT, 10.0, RACK).b_max == pytest.approx(10.0)


def test_heights_angles_and_shift():
    # ISO 53:1998 profile A: ha = 1.0 m, hf = 1.25 m (from memory)
    s = bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK, x=0.2)
    assert s.ha == pytest.approx(3.0 * 1.2) and s.hf == pytest.approx(3.0 * 1.05)
    mate = mating_sizes(s)
    assert mate.x == -0.2 and mate.ha == pytest.approx(3.0 * 0.8)
    assert s.theta_a == pytest.approx(math.atan(s.ha / s.Re))
    assert s.dae == pytest.approx(s.de + 2 * s.ha * math.cos(s.delta))
    assert s.small_end_scale == pytest.approx((s.Re - 20.0) / s.Re)


def _tip_root_points(s, outline, k=1.0):
    pts = outline.polyline(k)
    r = np.hypot(pts[:, 0], pts[:, 1])
    return pts[np.isclose(r, r.max(), atol=1e-9)], pts[np.isclose(r, r.min(), atol=1e-9)]


def test_outline_tip_diameter_and_cones():
    s = bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK)
    o = bevel_tooth_outline_3d(s)
    pts = o.polyline()
    r = np.hypot(pts[:, 0], pts[:, 1])
    assert 2 * r.max() == pytest.approx(s.de + 2 * s.ha * math.cos(s.delta), abs=TOL.size)
    assert 2 * r.min() == pytest.approx(s.de - 2 * s.hf * math.cos(s.delta), abs=TOL.size)
    # every large-end point lies on the back cone: perpendicular to the pitch generator at the
    # pitch circle, i.e. (p − P)·u = 0 with u the generator direction (ISO 23509 back cone)
    zP = s.mounting_distance - s.Re * math.cos(s.delta)
    u = np.array([math.sin(s.delta), -math.cos(s.delta)])
    rel = np.column_stack([r - s.de / 2, pts[:, 2] - zP])
    assert np.max(np.abs(rel @ u)) < 1e-9
    # standard taper: tip and root points of both ends see the axis under δ + θa and δ − θf
    for k in (1.0, o.small_end_scale):
        tips, roots = _tip_root_points(s, o, k)
        for p, cone in ((tips, s.delta + math.atan(s.ha / s.Re)), (roots, s.delta - math.atan(s.hf / s.Re))):
            v = p - o.apex
            ang = np.arctan2(np.hypot(v[:, 0], v[:, 1]), -v[:, 2])
            assert np.allclose(ang, cone, atol=1e-9)
    # the chain is closed with no gaps
    n = len(o.curves)
    assert max(np.linalg.norm(o.curves[i].end - o.curves[(i + 1) % n].start) for i in range(n)) < 1e-9


def test_tooth_height_scales_with_cone_distance():
    s = bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK)
    o = bevel_tooth_outline_3d(s)
    heights = []
    for k in (1.0, o.small_end_scale):
        tips, roots = _tip_root_points(s, o, k)
        # measured along the (scaled) back-cone generator: distance from tip to root line
        t, f = tips[0], roots[0]
        heights.append(abs((np.hypot(t[0], t[1]) - np.hypot(f[0], f[1])) / math.cos(s.delta)))
    assert heights[0] == pytest.approx(s.ha + s.hf, abs=1e-9)
    assert heights[1] / heights[0] == pytest.approx(s.Ri / s.Re, rel=1e-9)


def test_tredgold_mapping_keeps_pitch_and_thickness():
    # the developed back cone is the virtual spur gear: on the large-end pitch circle the arc
    # tooth thickness is s = π m/2 − thinning, and the angular pitch is 2π/z (ISO 21771 s)
    s = bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK, thinning=0.1)
    o = bevel_tooth_outline_3d(s)
    zP = s.mounting_distance - s.Re * math.cos(s.delta)
    poly = o.on_plane(zP).polygon(TOL.chord)
    assert measure.tooth_count(poly, s.de / 2) == 20
    assert np.allclose(measure.angular_pitch(poly, s.de / 2), 2 * math.pi / 20, atol=1e-6)
    sp = measure.arc_thickness(poly, s.de / 2)
    assert np.allclose(sp, math.pi * 3.0 / 2 - 0.1, atol=TOL.thickness_rel * 3.0)


def test_plane_sections_are_homothetic_about_apex():
    s = bevel_sizes(20, 40, 2.0, RIGHT, 12.0, RACK)
    o = bevel_tooth_outline_3d(s)
    H = s.mounting_distance
    k = (H - 10.0) / (H + 2.0)
    low, high = o.on_plane(-2.0), o.on_plane(10.0)
    assert len(low.curves) == len(high.curves) == len(o.curves)
    for a, b in zip(low.curves, high.curves):
        if isinstance(a, Arc):
            assert (b.radius, b.a0, b.a1) == pytest.approx((a.radius * k, a.a0, a.a1), abs=1e-9)
        else:
            assert np.allclose(b.points, a.points * k, atol=1e-9)
    assert low.gaps() < 1e-9 and high.gaps() < 1e-9


def test_mounting_distance_and_blank():
    s = bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK)
    # default: back face through the back-cone rim, land 0.5 m below the root circle
    assert s.mounting_distance == pytest.approx(
        s.Re * math.cos(s.delta) + (s.hf + 1.5) * math.sin(s.delta))
    prof = blank_profile(s, 5.0)
    assert prof[:, 1].min() == 0.0 and prof[0, 0] == 5.0
    assert prof[:, 1].max() < s.mounting_distance
    longer = bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK, mounting_distance=s.mounting_distance + 4)
    assert len(blank_profile(longer, 5.0)) == len(prof) + 1  # a cylindrical shoulder appears
    with pytest.raises(GeometryError, match="least allowed"):
        bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK, mounting_distance=s.mounting_distance - 1.0)
    with pytest.raises(GeometryError, match="bore"):
        blank_profile(s, 25.0)
    man = s.manifest()
    assert man["pitch_cone_angle"] == pytest.approx(26.565, abs=5e-4)
    assert man["outer_cone_distance"] == s.Re and man["mounting_distance"] == s.mounting_distance


def test_undercut_judged_on_virtual_teeth():
    # rack-generation undercut limit z_min = 2/sin²α (from memory) = 17.1 at 20° (computed), here for zv:
    # miter z 12 → zv 16.97 (undercut), z 13 → zv 18.38 (not), computed zv = z √2
    codes = {}
    for z in (12, 13):
        s = bevel_sizes(z, z, 2.0, RIGHT, 3.0, RACK)
        codes[z] = {f.code: f.severity for f in bevel_findings(s, virtual_flank(s))}
    assert codes[12].get("undercut") == WARNING
    assert "undercut" not in codes[13]
    # shift removes it: x ≥ 1 − zv sin²α / 2 (rack-generation undercut condition, from memory)
    xmin = 1 - 12 * math.sqrt(2) * math.sin(math.radians(20)) ** 2 / 2
    s = bevel_sizes(12, 12, 2.0, RIGHT, 3.0, RACK, x=xmin + 0.01)
    assert "undercut" not in {f.code for f in bevel_findings(s, virtual_flank(s))}


def test_small_end_tip_land():
    s = bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK)
    f = virtual_flank(s)
    sa = small_end_tip_land(s, f)
    # measured on the small-end section of the 3-D outline, projected to a plane (the tip arc
    # keeps its angle): arc width on the tip circle there
    o = bevel_tooth_outline_3d(s, f)
    tips, _ = _tip_root_points(s, o, o.small_end_scale)
    zt = tips[0, 2]
    poly = o.on_plane(zt).polygon(TOL.chord)
    r_tip = np.hypot(tips[0, 0], tips[0, 1])
    arcs = measure.material_arcs(poly, r_tip * (1 - 1e-9))
    ang = arcs[:, 1].mean()
    # arc on the cone at that circle = angle × circle radius (scaled back-cone arc)
    assert sa == pytest.approx(ang * r_tip, rel=1e-5)
    fs = bevel_findings(s, f)
    assert not any(x.severity == ERROR for x in fs)
    # a heavily positive shift makes the small-end tips thin: 2ψρ·Ri/Re < 0.2 m·Ri/Re
    thin = bevel_sizes(20, 40, 3.0, RIGHT, 20.0, RACK, x=1.1)
    tf = virtual_flank(thin)
    assert small_end_tip_land(thin, tf) < 0.2 * 3.0 * thin.small_end_scale
    assert {x.code: x.severity for x in bevel_findings(thin, tf)}["thin-tip"] == WARNING
