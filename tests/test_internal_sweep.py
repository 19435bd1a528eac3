"""Pinion and ring outlines rolled through one pitch (gen.validate.internal_sweep)."""

from functools import lru_cache

import pytest

from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.gear_outline import gear_loop
from gen.geometry.generate import generate_flank
from gen.geometry.internal_outline import ring_outline
from gen.geometry.internal_pair import mesh_internal
from gen.validate.internal_sweep import (CLEAR, INTERFERING, SWEEP_TOL, TOUCHING,
                                         radial_insertion, sweep_internal)

RACK_A = basic_rack("A")
CHORD = 0.01
# Outline error budget for backlash (computed, as in test_sweep): involute flanks sampled
# ~0.1 mm apart with curvature radii ≥ 3 mm sit ≤ 5e-4 mm off the curve, two flanks per gap.
OUTLINE_TOL = 1e-3


@lru_cache(maxsize=None)
def pinion(z, m=2.0, thinning=0.0):
    s = gear_sizes(z, m, RACK_A, thinning=thinning)
    f = generate_flank(z, s.rp, cutter_for(s, RACK_A), s.ra)
    return s, f, gear_loop(f).polygon(CHORD)


@lru_cache(maxsize=None)
def ring(z, m=2.0, k=0.0, thinning=0.0, z0=None):
    r, cut, fl, loop = ring_outline(z, m, RACK_A, tip_shortening=k, thinning=thinning,
                                    cutter_teeth=z0)
    return r, fl, loop.polygon(CHORD)


def run(z1, z2, k=0.0, thinning=0.0, z0=None, C=None):
    s, f, p = pinion(z1, thinning=thinning)
    r, fl, h = ring(z2, k=k, thinning=thinning, z0=z0)
    pr = mesh_internal(s, r, C, pinion_form_radius=f.r_junction,
                       ring_involute_end=fl.r_involute[1], check_radial=False)
    return pr, sweep_internal(p, h, pr), p, h


def test_clear_mesh_with_the_formula_backlash():
    # 24 in 48, ring tips shortened 0.2 m, 0.1 mm thinning on each: the swept backlash equals
    # j_wt = 0.2 cos α / cos α_w (internal_pair notes) within the outline budget
    pr, res, _, _ = run(24, 48, k=0.2, thinning=0.1, z0=24)
    assert not pr.problems
    assert res.status == CLEAR and res.overlap_area == 0.0
    assert res.swept_backlash == pytest.approx(pr.backlash_circumferential, abs=OUTLINE_TOL)
    assert pr.backlash_circumferential == pytest.approx(0.2, abs=1e-12)
    # the mirror-symmetric start phase centres the backlash
    assert res.min_clearance_drive == pytest.approx(res.min_clearance_coast, abs=1e-6)
    assert res.min_clearance_drive == pytest.approx(pr.backlash_base / 2, abs=OUTLINE_TOL / 2)


def test_moving_the_pinion_out_tightens_the_mesh():
    # internal pairs: C larger → less backlash (internal_pair notes)
    pr0, res0, _, _ = run(24, 48, k=0.2, thinning=0.1, z0=24)
    pr, res, _, _ = run(24, 48, k=0.2, thinning=0.1, z0=24, C=pr0.center_distance + 0.1)
    assert res.swept_backlash < res0.swept_backlash
    assert res.swept_backlash == pytest.approx(pr.backlash_circumferential, abs=OUTLINE_TOL)
    # pushed out to the formula's tight distance (+0.26 mm) the tips reach the other member's
    # fillet before the flanks close: the pair check names it and the outlines overlap
    pr, res, _, _ = run(24, 48, k=0.2, thinning=0.1, z0=24, C=pr0.tight_center_distance)
    assert any("below its involute start" in s for s in pr.problems)
    assert res.status == INTERFERING


def test_small_tooth_difference_interferes():
    # 20 in 24, no shift: far below the 10–12 tooth difference of practice (common practice)
    pr, res, _, _ = run(20, 24, z0=12)
    assert res.status == INTERFERING
    assert res.overlap_area > 0.1          # mm², a gross overlap, not a grazing contact
    assert pr.problems


def test_safe_difference_is_free():
    # 18 in 48 with the ring tips shortened 0.2 m (the unshortened ring has involute
    # interference, test_internal_pair): no overlap, zero-backlash contact only
    pr, res, _, _ = run(18, 48, k=0.2, z0=24)
    assert pr.trochoid_margin > 0 and pr.involute_margin > 0
    assert res.status in (TOUCHING, CLEAR)
    assert res.overlap_area < SWEEP_TOL.overlap_area


def test_trochoid_condition_matches_the_outlines():
    # the tip-circle condition says 33 in 40 (k 0.2) strikes tip to tip and 32 in 40 does
    # not (test_internal_pair); the real outlines agree
    pr, res, _, _ = run(33, 40, k=0.2, z0=20)
    assert pr.trochoid_margin < 0
    assert res.status == INTERFERING
    pr, res, _, _ = run(32, 40, k=0.2, z0=20)
    assert pr.trochoid_margin > 0
    assert res.overlap_area < SWEEP_TOL.overlap_area


def test_ring_tip_in_the_pinion_fillet_is_found():
    # standard 24 in 48: contact would run below the pinion's involute start (its rack-cut
    # form circle); the pair check says so and the outlines overlap there
    pr, res, _, _ = run(24, 48, z0=24)
    assert any("below its involute start" in s for s in pr.problems)
    assert res.status == INTERFERING


def test_radial_insertion_agrees_with_the_pair_check():
    from gen.geometry.internal_pair import radial_assembly
    for z1, z2, z0, expected in ((18, 48, 24, True), (32, 40, 20, False)):
        pr, _, p, h = run(z1, z2, k=0.2, z0=z0)
        s, _, _ = pinion(z1)
        r, _, _ = ring(z2, k=0.2, z0=z0)
        ok, _ = radial_assembly(s, r, pr.center_distance)
        ok_poly, phase, worst = radial_insertion(p, h, pr, phases=6, steps=40)
        assert ok == ok_poly == expected
        if not expected:
            assert worst > 0.01    # mm²: blocked, not grazing
