"""Swept mesh of generated outlines (gen.validate.sweep) and the pair findings."""

import math
from functools import lru_cache

import numpy as np
import pytest

from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.gear_outline import gear_loop
from gen.geometry.generate import generate_flank
from gen.geometry.pair import mesh_pair, mesh_rack
from gen.geometry.rack_outline import rack_loop, rack_sizes
from gen.findings import ERROR, INFO, WARNING, has_errors
from gen.validate.pair_checks import PAIR_LIMITS, pair_findings
from gen.validate.sweep import (CLEAR, INTERFERING, SWEEP_TOL, TOUCHING, sweep_pair,
                                sweep_rack)

RACK_A = basic_rack("A")
A20 = math.radians(20.0)
CHORD = 0.01  # outline polygon tolerance (mm), as the mesh layer uses

# Outline error budget for backlash comparisons (computed): the involute flanks are sampled at
# 40 points, ~0.1 mm apart at m 2; a chord of length s on a flank of curvature radius ρ ≥ 3 mm
# sits s²/(8ρ) ≤ 5e-4 mm inside the curve, and the gap is bounded by two flanks per side.
OUTLINE_TOL = 1e-3


@lru_cache(maxsize=None)
def gear(z, m=2.0, x=0.0, thinning=0.0, beta=0.0):
    s = gear_sizes(z, m, RACK_A, x, beta=beta, thinning=thinning)
    flank = generate_flank(z, s.rp, cutter_for(s, RACK_A), s.ra)
    return s, gear_loop(flank).polygon(CHORD)


@lru_cache(maxsize=None)
def rack(m=2.0, teeth=14, thinning=0.0, height=6.0):
    rs = rack_sizes(m, RACK_A, height=height, teeth=teeth, thinning=thinning)
    return rs, rack_loop(rs, RACK_A).polygon(CHORD)


def test_pair_at_working_distance_is_clear_with_expected_backlash():
    # thinning 0.1 mm (arc, both flanks) on each gear → j_wt = 0.2 cos α_t / cos α_w (pair.py)
    s1, p1 = gear(20, thinning=0.1)
    s2, p2 = gear(40, thinning=0.1)
    pr = mesh_pair(s1, s2)
    r = sweep_pair(p1, p2, pr)
    assert r.status == CLEAR
    assert r.overlap_area == 0.0
    assert r.swept_backlash == pytest.approx(pr.backlash_circumferential, abs=OUTLINE_TOL)
    assert r.backlash_deviation == pytest.approx(r.swept_backlash - r.formula_backlash)
    # the mirror-symmetric start phase centres the backlash: drive gap = coast gap
    assert r.min_clearance_drive == pytest.approx(r.min_clearance_coast, abs=1e-9)
    assert r.min_clearance_drive == pytest.approx(pr.backlash_base / 2.0, abs=OUTLINE_TOL / 2)
    assert r.clear_center_distance is None
    assert not has_errors(pair_findings(pr, r))


def test_small_center_distance_change_against_2_dC_sin_alpha():
    # ISO/TR 10064-2 relation (from memory): jn = 2 ΔC sin α. Tolerance: the relation drops the
    # second-order term, jn_exact/jn − 1 = ΔC/(2 a tan²α) = 0.63 % for ΔC 0.1 mm, a 60 mm
    # (computed in test_pair); 1 % leaves room for the outline chords (≤ OUTLINE_TOL).
    s1, p1 = gear(20)
    s2, p2 = gear(40)
    dC = 0.1
    pr = mesh_pair(s1, s2, 60.0 + dC)
    r = sweep_pair(p1, p2, pr)
    assert r.status == CLEAR
    measured_jn = r.swept_backlash * math.cos(pr.alpha_w)   # spur: j_n = j_bt
    approx = 2.0 * dC * math.sin(A20)
    assert measured_jn == pytest.approx(approx, rel=0.01)
    # and against the exact involute relation, to the outline error
    assert measured_jn == pytest.approx(pr.backlash_normal, abs=OUTLINE_TOL)


def test_pair_too_close_interferes_and_names_the_clearing_distance():
    s1, p1 = gear(12, x=0.4, thinning=0.1)
    s2, p2 = gear(30, x=0.2, thinning=0.1)
    aw = mesh_pair(s1, s2).zero_backlash_center_distance
    pr = mesh_pair(s1, s2, aw - 0.3 * 2.0)       # 0.3 m too close
    r = sweep_pair(p1, p2, pr)
    assert r.status == INTERFERING
    assert r.overlap_area > SWEEP_TOL.overlap_area
    assert r.swept_backlash == 0.0
    # the search lands near the formula's zero-backlash distance (thinning included); the
    # outlines sit a little inside the exact profile and tips may meet fillets first
    assert r.clear_center_distance == pytest.approx(pr.tight_center_distance, abs=0.01)
    again = sweep_pair(p1, p2, mesh_pair(s1, s2, r.clear_center_distance), find_clearing=False)
    assert again.status != INTERFERING
    found = pair_findings(pr, r, subject="demo")
    codes = {f.code for f in found if f.severity == ERROR}
    assert "teeth-interfere" in codes
    msg = next(f.message for f in found if f.code == "teeth-interfere")
    assert f"{r.clear_center_distance:.3f}" in msg
    assert found[0].severity == ERROR   # errors come first


def test_zero_backlash_pair_touches_without_overlap():
    s1, p1 = gear(20)
    s2, p2 = gear(40)
    pr = mesh_pair(s1, s2)
    r = sweep_pair(p1, p2, pr)
    assert r.status in (TOUCHING, CLEAR)
    assert r.overlap_area <= SWEEP_TOL.overlap_area
    assert min(r.min_clearance_drive, r.min_clearance_coast) < OUTLINE_TOL
    codes = {f.code for f in pair_findings(pr, r) if f.severity == WARNING}
    assert "backlash-low" in codes


def test_helical_pair_with_print_allowance():
    # transverse outlines of a 20°/15° helical pair; the allowance erodes each outline by
    # c / cos β_b in the transverse plane, adding exactly 4c of normal backlash (pair.py)
    beta = math.radians(15.0)
    s1, p1 = gear(20, beta=beta)
    s2, p2 = gear(40, beta=-beta)
    pr = mesh_pair(s1, s2, flank_allowance=0.05, face_width=20.0)
    r = sweep_pair(p1, p2, pr)
    assert r.status == CLEAR
    assert r.swept_backlash == pytest.approx(pr.backlash_circumferential, abs=2 * OUTLINE_TOL)


def test_pinion_rack_at_mounting_height_is_clear():
    # pinion and rack each thinned 0.1 mm → j_t = 0.2 mm at H₀ = r_p + x m (pair.py)
    ps, pp = gear(20, x=0.2, thinning=0.1)
    rs, rp = rack(thinning=0.1)
    pr = mesh_rack(ps, rs)
    assert pr.center_distance == pytest.approx(ps.rp + 0.2 * 2.0)
    r = sweep_rack(pp, rp, pr, rs)
    assert r.status == CLEAR
    # the rack's sharp tip corner passes the pinion's root fillet a little closer than the
    # flank gap (the fillet normal leans more than α), so the swept value may read low by a
    # few per cent; the mismatch limit of the checks covers it
    assert r.swept_backlash == pytest.approx(pr.backlash_circumferential, rel=0.03)
    assert r.swept_backlash <= pr.backlash_circumferential + OUTLINE_TOL
    assert not has_errors(pair_findings(pr, r))
    # without thinning the rack at H₀ touches but does not cut in
    ps0, pp0 = gear(20, x=0.2)
    rs0, rp0 = rack()
    r0 = sweep_rack(pp0, rp0, mesh_rack(ps0, rs0), rs0)
    assert r0.overlap_area <= SWEEP_TOL.overlap_area


def test_pinion_rack_too_close_interferes():
    ps, pp = gear(20, thinning=0.1)
    rs, rp = rack(thinning=0.1)
    h0 = mesh_rack(ps, rs).center_distance
    pr = mesh_rack(ps, rs, h0 - 0.3 * 2.0)
    r = sweep_rack(pp, rp, pr, rs)
    assert r.status == INTERFERING
    # the involute-only formula would let the rack come in to tight_center_distance, but the
    # rack's tip corners reach the pinion's root fillet first (its form circle sits exactly at
    # the rack tip height, ISO 53 A: h_fP − ρ(1 − sin α) = 1.0 m), so the sweep clears later
    assert r.clear_center_distance > pr.tight_center_distance
    assert r.clear_center_distance < h0
    at = mesh_rack(ps, rs, r.clear_center_distance)
    assert sweep_rack(pp, rp, at, rs, find_clearing=False).status != INTERFERING
    inside = mesh_rack(ps, rs, r.clear_center_distance - 2 * SWEEP_TOL.center)
    assert sweep_rack(pp, rp, inside, rs, find_clearing=False).status == INTERFERING
    assert any(f.code == "teeth-interfere" for f in pair_findings(pr, r))


def test_rack_moved_out_opens_backlash_linearly():
    ps, pp = gear(20, thinning=0.1)
    rs, rp = rack(thinning=0.1)
    h0 = mesh_rack(ps, rs).center_distance
    pr = mesh_rack(ps, rs, h0 + 0.2)
    r = sweep_rack(pp, rp, pr, rs)
    # exact for straight rack flanks: j_t = 0.2 + 2 Δ tan α
    assert r.swept_backlash == pytest.approx(0.2 + 0.4 * math.tan(A20), abs=OUTLINE_TOL)


def test_fine_sweep_on_dense_outlines():
    # 90 steps over one pitch on outlines of ≥ 2500 vertices (timing: benchmarks/bench_sweep.py).
    # Thinning 0.1 mm on each gear at the standard center distance: the reference circles are
    # the operating pitch circles, so the circumferential backlash is the sum of the
    # thinnings, j_t = 0.1 + 0.1 mm (ISO 21771 tooth thickness on d, computed)
    s1, p1 = gear(20, thinning=0.1)
    s2, p2 = gear(40, thinning=0.1)
    assert len(p1) >= 2500 and len(p2) >= 2500
    pr = mesh_pair(s1, s2)
    assert pr.center_distance == pytest.approx(2.0 * (20 + 40) / 2)
    r = sweep_pair(p1, p2, pr, steps=90)
    assert r.steps == 90
    assert r.status == CLEAR
    assert r.swept_backlash == pytest.approx(0.2, abs=OUTLINE_TOL)


def test_findings_contact_ratio_and_tip_clearance():
    # tips cut back by k = 0.45 → εα under 1.1 (error, common practice limit)
    g1 = gear_sizes(14, 2.0, RACK_A, 0.3, tip_shortening=0.45)
    g2 = gear_sizes(14, 2.0, RACK_A, 0.3, tip_shortening=0.45)
    pr = mesh_pair(g1, g2)
    assert pr.contact_ratio < PAIR_LIMITS.min_contact_ratio
    assert "contact-ratio-low" in {f.code for f in pair_findings(pr) if f.severity == ERROR}
    # long tips (k = −0.2) leave 0.05 m tip clearance: warning under 0.1 m (common practice)
    g1 = gear_sizes(20, 2.0, RACK_A, tip_shortening=-0.2, thinning=0.3)
    g2 = gear_sizes(40, 2.0, RACK_A, tip_shortening=-0.2, thinning=0.3)
    pr = mesh_pair(g1, g2)
    assert pr.tip_clearance == pytest.approx(0.05 * 2.0, abs=1e-12)
    found = pair_findings(pr, print_clearance=0.1)
    assert "tip-clearance-low" in {f.code for f in found if f.severity == WARNING}
    assert "backlash-low" not in {f.code for f in found}
    assert {f.code for f in found if f.severity == INFO} >= {"mesh-geometry", "mesh-contact",
                                                              "mesh-backlash"}
    # without a sweep, negative formula backlash is an interference error
    too_close = mesh_pair(g1, g2, 59.0)
    assert "teeth-interfere" in {f.code for f in pair_findings(too_close) if f.severity == ERROR}


def test_findings_flag_contact_below_form_circle():
    # long-tipped gear 2 driving into an unshifted 18-tooth pinion's fillet zone
    g1 = gear_sizes(18, 2.0, RACK_A)
    g2 = gear_sizes(60, 2.0, RACK_A, tip_shortening=-0.25)
    from gen.geometry.pair import form_radius
    pr = mesh_pair(g1, g2, form_radii=(form_radius(g1, RACK_A), form_radius(g2, RACK_A)))
    assert pr.active_start_radii[0] < pr.form_radii[0]
    assert "contact-below-form" in {f.code for f in pair_findings(pr)}
    # the standard pair stays on its involutes
    pr = mesh_pair(g1, gear_sizes(60, 2.0, RACK_A),
                   form_radii=(form_radius(g1, RACK_A), None))
    assert "contact-below-form" not in {f.code for f in pair_findings(pr)}


def test_pose_places_outlines_in_mesh():
    s1, p1 = gear(20, thinning=0.1)
    s2, p2 = gear(40, thinning=0.1)
    pr = mesh_pair(s1, s2)
    r = sweep_pair(p1, p2, pr, steps=30)
    w1, w2 = r.pose.at(p1, p2, r.angle_at_min)
    # gear 2 is centred at (C, 0): its vertices' distances from there match its own radii
    assert np.allclose(np.hypot(w2[:, 0] - pr.center_distance, w2[:, 1]),
                       np.hypot(p2[:, 0], p2[:, 1]))
    # the tightest segment joins gear 1's outline to gear 2's
    (ax, ay), (bx, by) = r.tight_segment
    assert math.hypot(bx - ax, by - ay) == pytest.approx(
        min(r.min_clearance_drive, r.min_clearance_coast), abs=1e-9)
    assert math.hypot(ax, ay) <= pr.tip_radii[0] + 1e-9


def test_members_out_of_reach_raise():
    from gen.errors import GeometryError
    s1, p1 = gear(20)
    s2, p2 = gear(40)
    with pytest.raises(GeometryError):
        sweep_pair(p1, p2, mesh_pair(s1, s2, s1.ra + s2.ra + 0.5))
    ps, pp = gear(20)
    rs, rp = rack()
    with pytest.raises(GeometryError):
        sweep_rack(pp, rp, mesh_rack(ps, rs, ps.ra + rs.addendum + 0.5), rs)
