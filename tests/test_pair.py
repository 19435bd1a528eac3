"""Mesh relations (gen.geometry.pair) against handbook values and independent recomputation."""

import math

import numpy as np
import pytest

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.generate import generate_flank
from gen.geometry.involute import half_thickness_angle
from gen.geometry.pair import (PairResult, form_radius, mesh_pair, mesh_rack,
                               operating_pressure_angle, rack_mounting_distance,
                               working_pressure_angle)
from gen.geometry.rack_outline import rack_sizes

RACK_A = basic_rack("A")
A20 = math.radians(20.0)
INCH = 25.4


def _inv(a):
    return math.tan(a) - a


def _solve_inv(v):
    """inv α = v by plain bisection (independent of gen.geometry.involute.inv_inverse)."""
    lo, hi = 0.0, 1.5
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if _inv(mid) < v else (lo, mid)
    return 0.5 * (lo + hi)


def _contact_ratio_by_intersection(rb1, ra1, rb2, ra2, C, aw, pb):
    """ε_α from the contact path measured geometrically: intersect the line of action with
    both tip circles (quadratics), take the stretch between them; independent of the
    √(r_a² − r_b²) form."""
    p = np.array([C * rb1 / (rb1 + rb2), 0.0])           # pitch point
    u = np.array([math.sin(aw), math.cos(aw)])            # along the line of action
    def hit(center, r):
        d = p - center
        b = np.dot(d, u)
        c = np.dot(d, d) - r * r
        return np.array([-b - math.sqrt(b * b - c), -b + math.sqrt(b * b - c)])
    t1 = hit(np.array([0.0, 0.0]), ra1)   # gear 1 tip circle: recess end is the + root
    t2 = hit(np.array([C, 0.0]), ra2)     # gear 2 tip circle: approach end is the − root
    return (t1.max() - t2.min()) / pb


def _shifted_pair(tip_shortening=0.0):
    return (gear_sizes(12, 2.0, RACK_A, 0.4, tip_shortening=tip_shortening),
            gear_sizes(30, 2.0, RACK_A, 0.2, tip_shortening=tip_shortening))


def test_profile_shifted_pair_reference():
    # ISO 21771 profile-shifted pair (relations from memory, values computed): m 2, α 20°, z 12/30,
    # x +0.4/+0.2 → inv αw 0.025304, αw 23.693°, a 42.000, aw 43.100, y 0.5500, k 0.0500
    g1, g2 = _shifted_pair()
    r = mesh_pair(g1, g2)
    assert _inv(r.alpha_wt) == pytest.approx(0.025304, abs=1e-6)
    assert math.degrees(r.alpha_wt) == pytest.approx(23.693, abs=5e-4)
    assert r.working_pressure_angle == pytest.approx(23.693, abs=5e-4)
    assert r.reference_center_distance == pytest.approx(42.000, abs=5e-4)
    assert r.zero_backlash_center_distance == pytest.approx(43.100, abs=5e-4)
    assert r.y == pytest.approx(0.5500, abs=5e-5)
    assert r.k == pytest.approx(0.0500, abs=5e-5)
    # recomputed here by an independent route: own bisection of the involute equation
    inv_w = _inv(A20) + 2.0 * math.tan(A20) * (0.4 + 0.2) / (12 + 30)
    aw = _solve_inv(inv_w)
    assert r.alpha_wt == pytest.approx(aw, abs=1e-12)
    assert r.zero_backlash_center_distance == pytest.approx(42.0 * math.cos(A20) / math.cos(aw),
                                                            abs=1e-9)


def test_profile_shifted_contact_ratio_with_and_without_tip_shortening():
    # contact ratio from the line of action (from memory; computed): εα 1.334 with tip
    # shortening k (da 29.400/64.600),
    # 1.395 without (da = d + 2m(1 + x))
    plain = mesh_pair(*_shifted_pair())
    assert plain.contact_ratio == pytest.approx(1.395, abs=5e-4)
    short = mesh_pair(*_shifted_pair(tip_shortening=plain.k))
    assert short.contact_ratio == pytest.approx(1.334, abs=5e-4)
    # ISO 21771 (from memory; computed): da 29.400/64.600, df 20.600/55.800 with tip shortening
    g1, g2 = _shifted_pair(tip_shortening=plain.k)
    assert (2 * g1.ra, 2 * g2.ra) == pytest.approx((29.400, 64.600), abs=5e-4)
    assert (2 * g1.rf, 2 * g2.rf) == pytest.approx((20.600, 55.800), abs=5e-4)
    for r, (a, b) in ((plain, _shifted_pair()), (short, (g1, g2))):
        again = _contact_ratio_by_intersection(a.rb, a.ra, b.rb, b.ra, r.center_distance,
                                               r.alpha_w, a.pb)
        assert r.contact_ratio == pytest.approx(again, abs=1e-9)


@pytest.mark.parametrize("m, z1, z2, expected", [
    (2.0, 20, 40, 1.635),   # line of action (from memory; computed): m 2, z 20/40 → 1.635
    (1.0, 20, 20, 1.557),   # line of action (from memory; computed): m 1, z 20/20 → 1.557
])
def test_standard_contact_ratio(m, z1, z2, expected):
    g1, g2 = gear_sizes(z1, m, RACK_A), gear_sizes(z2, m, RACK_A)
    r = mesh_pair(g1, g2)
    assert r.center_distance == pytest.approx(m * (z1 + z2) / 2.0, abs=1e-12)
    assert r.contact_ratio == pytest.approx(expected, abs=5e-4)
    again = _contact_ratio_by_intersection(g1.rb, g1.ra, g2.rb, g2.ra, r.center_distance,
                                           r.alpha_w, g1.pb)
    assert r.contact_ratio == pytest.approx(again, abs=1e-9)


def test_shigley_example_13_1_mounted_wide():
    # Shigley, Mechanical Engineering Design, Example 13-1 (inputs doc, results computed):
    # 16/40 teeth, P = 2 teeth/in, 20° → C = 14.000 in; mounted at 14.25 in → φ′ = 22.60°
    m = INCH / 2.0
    g1, g2 = gear_sizes(16, m, RACK_A), gear_sizes(40, m, RACK_A)
    std = mesh_pair(g1, g2)
    assert std.reference_center_distance / INCH == pytest.approx(14.000, abs=5e-4)
    wide = mesh_pair(g1, g2, 14.25 * INCH)
    assert wide.working_pressure_angle == pytest.approx(22.60, abs=5e-3)
    # independent route: operating pitch radius r1′ = C′ z1/(z1+z2), cos φ′ = r_b1 / r1′
    r1w = 14.25 * INCH * 16 / 56
    assert wide.alpha_w == pytest.approx(math.acos(g1.rb / r1w), abs=1e-12)
    assert wide.pitch_radii[0] == pytest.approx(r1w, rel=1e-12)


def test_backlash_exact_against_thickness_sum_and_small_change_relation():
    # exact relation in pair.py vs an independent route: tooth thicknesses on the operating
    # pitch circle from the ISO 21771 thickness relation (involute.half_thickness_angle)
    g1 = gear_sizes(20, 2.0, RACK_A, 0.1, thinning=0.08)
    g2 = gear_sizes(40, 2.0, RACK_A, -0.1, thinning=0.12)
    aw = mesh_pair(g1, g2).zero_backlash_center_distance
    for dC in (0.0, 0.05, 0.3):
        r = mesh_pair(g1, g2, aw + dC)
        rw1, rw2 = r.pitch_radii
        s1 = 2 * rw1 * half_thickness_angle(rw1, rp=g1.rp, rb=g1.rb, s=g1.s)
        s2 = 2 * rw2 * half_thickness_angle(rw2, rp=g2.rp, rb=g2.rb, s=g2.s)
        pw = 2 * math.pi * rw1 / g1.z
        assert r.backlash_circumferential == pytest.approx(pw - s1 - s2, abs=1e-12)
        assert r.backlash_base == pytest.approx((pw - s1 - s2) * math.cos(r.alpha_w), abs=1e-12)
    # ISO/TR 10064-2 (from memory): jn = 2 Δa sin α for a small center-distance increase.
    # The exact involute relation exceeds it by the second-order factor
    # 1 + ΔC/(2 a tan²α) (Taylor expansion of inv α′(C): d²/dC² = cot α′/C², computed).
    g1, g2 = gear_sizes(20, 2.0, RACK_A), gear_sizes(40, 2.0, RACK_A)
    for dC in (0.01, 0.1):
        r = mesh_pair(g1, g2, 60.0 + dC)
        approx = 2.0 * dC * math.sin(A20)
        assert r.backlash_normal == pytest.approx(approx, rel=dC / (60.0 * math.tan(A20) ** 2))
        assert r.backlash_normal / approx - 1.0 == pytest.approx(
            dC / (2 * 60.0 * math.tan(A20) ** 2), rel=0.02)


def test_tight_center_distance_zeroes_backlash():
    g1 = gear_sizes(17, 1.5, RACK_A, 0.2, thinning=0.1)
    g2 = gear_sizes(33, 1.5, RACK_A, 0.0, thinning=0.1)
    r = mesh_pair(g1, g2, flank_allowance=0.05)
    again = mesh_pair(g1, g2, r.tight_center_distance, flank_allowance=0.05)
    assert again.backlash_base == pytest.approx(0.0, abs=1e-12)
    assert r.tight_center_distance < r.zero_backlash_center_distance


def test_helical_pair_transverse_values():
    # ISO 21771 helical relations (from memory; computed): mn 2, β 15°, z 20/40 → mt 2.0706,
    # αt 20.647°, a 62.117 mm;
    # εβ = b sin β/(π mn) (from memory)
    beta = math.radians(15.0)
    g1 = gear_sizes(20, 2.0, RACK_A, beta=beta)
    g2 = gear_sizes(40, 2.0, RACK_A, beta=-beta)
    r = mesh_pair(g1, g2, face_width=20.0, flank_allowance=0.05)
    assert math.degrees(r.alpha_t) == pytest.approx(20.647, abs=5e-4)
    assert r.reference_center_distance == pytest.approx(62.117, abs=5e-4)
    assert r.zero_backlash_center_distance == pytest.approx(r.reference_center_distance, abs=1e-9)
    assert r.overlap_ratio == pytest.approx(20.0 * math.sin(beta) / (2.0 * math.pi), rel=1e-12)
    assert r.total_contact_ratio == pytest.approx(r.contact_ratio + r.overlap_ratio)
    # the allowance is normal to the flanks: four flanks → exactly 4c of normal backlash
    assert r.backlash_normal == pytest.approx(4 * 0.05, abs=1e-12)
    # independent check of εα with transverse values (geometric route)
    again = _contact_ratio_by_intersection(g1.rb, g1.ra, g2.rb, g2.ra, r.center_distance,
                                           r.alpha_w, g1.pb)
    assert r.contact_ratio == pytest.approx(again, abs=1e-9)


def test_tip_clearance_both_ways():
    # standard pair: c = C − ra1 − rf2 = (hfP − haP) m = 0.25 m both ways (ISO 53, from memory)
    r = mesh_pair(gear_sizes(20, 2.0, RACK_A), gear_sizes(40, 2.0, RACK_A))
    assert r.tip_clearances == pytest.approx((0.5, 0.5), abs=1e-12)
    # shifted pair without tip shortening: a_w − a < (x1+x2) m, so the tips lose k m
    r = mesh_pair(*_shifted_pair())
    assert r.tip_clearance == pytest.approx((0.25 - r.k) * 2.0, abs=1e-9)


def test_form_radius_matches_generator():
    # the closed form against the rack-rolling generator's involute start (independent route)
    for z, x in ((12, 0.4), (30, 0.2), (20, 0.0), (40, -0.3)):
        s = gear_sizes(z, 2.0, RACK_A, x)
        flank = generate_flank(z, s.rp, cutter_for(s, RACK_A), s.ra)
        assert form_radius(s, RACK_A) == pytest.approx(flank.r_junction, abs=1e-5)
    # z 14 unshifted is undercut (z_min = 2/sin²α = 17.1 at 20°, from memory; computed): no closed form
    assert form_radius(gear_sizes(14, 2.0, RACK_A), RACK_A) is None


def test_rack_mounting_and_contact_ratio():
    pin = gear_sizes(20, 2.0, RACK_A, 0.3, thinning=0.06)
    rack = rack_sizes(2.0, RACK_A, height=8.0, teeth=15, thinning=0.04)
    r = mesh_rack(pin, rack, face_width=12.0)
    assert r.center_distance == pytest.approx(pin.rp + 0.3 * 2.0)
    assert rack_mounting_distance(pin) == pytest.approx(20.6)
    assert r.rack_back_distance == pytest.approx(20.6 + 8.0)
    assert r.working_pressure_angle == pytest.approx(20.0)
    assert r.backlash_circumferential == pytest.approx(0.06 + 0.04, abs=1e-12)
    # tip clearances 0.25 m both ways for the ISO 53 A rack (hfP − haP = 0.25, from memory)
    assert r.tip_clearances == pytest.approx((0.5, 0.5), abs=1e-12)
    # independent route: a rack is the limit of a gear with z2 → ∞ (x2 = 0)
    huge = mesh_pair(gear_sizes(20, 2.0, RACK_A, 0.3), gear_sizes(2_000_000, 2.0, RACK_A, 0.0))
    assert r.contact_ratio == pytest.approx(huge.contact_ratio, abs=1e-4)
    moved = mesh_rack(pin, rack, r.center_distance + 0.2)
    wide = mesh_pair(gear_sizes(20, 2.0, RACK_A, 0.3), gear_sizes(2_000_000, 2.0, RACK_A, 0.0),
                     huge.center_distance + 0.2)
    assert moved.backlash_from_center == pytest.approx(wide.backlash_from_center, abs=1e-4)
    assert moved.contact_ratio == pytest.approx(wide.contact_ratio, abs=1e-4)
    # the rack relation is exact and linear: 2 Δ tan α circumferential
    assert moved.backlash_from_center == pytest.approx(0.4 * math.tan(A20), abs=1e-12)


def test_result_is_frozen_and_dict_has_degrees():
    r = mesh_pair(*_shifted_pair(), face_width=10.0)
    assert isinstance(r, PairResult)
    with pytest.raises(Exception):
        r.center_distance = 1.0  # frozen
    d = r.as_dict()
    for key in ("center_distance", "working_pressure_angle", "contact_ratio", "overlap_ratio",
                "backlash_normal", "backlash_circumferential", "tip_clearance", "y", "k"):
        assert key in d
    assert d["alpha_wt_deg"] == pytest.approx(23.693, abs=5e-4)
    assert "alpha_wt" not in d


def test_mismatched_or_impossible_pairs_raise():
    with pytest.raises(GeometryError):
        mesh_pair(gear_sizes(20, 2.0, RACK_A), gear_sizes(40, 2.5, RACK_A))
    with pytest.raises(GeometryError):
        mesh_pair(gear_sizes(20, 2.0, RACK_A, beta=0.2), gear_sizes(40, 2.0, RACK_A, beta=0.3))
    with pytest.raises(GeometryError):
        operating_pressure_angle(60.0, A20, 50.0)
    assert working_pressure_angle(20, 40, 0.0, 0.0, A20, A20) == pytest.approx(A20, abs=1e-12)
