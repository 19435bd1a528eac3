"""Pinion-in-ring mesh numbers and the internal-pair interference checks."""

import math

import numpy as np
import pytest

from gen.errors import GeometryError
from gen.geometry import pair as ext_pair
from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import gear_sizes
from gen.geometry.internal import ring_sizes
from gen.geometry.internal_pair import (mesh_internal, radial_assembly, trochoid_margin,
                                        working_pressure_angle)

RACK_A = basic_rack("A")
A20 = math.radians(20.0)


def invf(a):
    return math.tan(a) - a


def bisect_inv(target):
    """Solve tan α − α = target by bisection (independent of the Newton solver)."""
    lo, hi = 0.0, 1.3
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if invf(mid) < target else (lo, mid)
    return 0.5 * (lo + hi)


def pair(z1, z2, m=2.0, x1=0.0, x2=0.0, k2=0.0, th1=0.0, th2=0.0, C=None, **kw):
    p = gear_sizes(z1, m, RACK_A, x=x1, thinning=th1)
    r = ring_sizes(z2, m, RACK_A, x=x2, tip_shortening=k2, thinning=th2)
    return p, r, mesh_internal(p, r, C, **kw)


def test_recalled_worked_example_16_in_24():
    # Internal-gear worked example recalled from gear handbooks (from memory, source not at
    # hand): m 3, α 20°, z 16/24, x 0/+0.516 → inv α_w = 0.061857, α_w ≈ 31.32°.
    # Centre distance (computed): a = 3(24 − 16)/2 = 12, a_w = a cos α/cos α_w = 13.200 mm.
    p, r, res = pair(16, 24, m=3.0, x2=0.516, check_radial=False)
    assert invf(res.alpha_wt) == pytest.approx(0.061857, abs=5e-7)
    assert res.working_pressure_angle == pytest.approx(31.32, abs=0.005)
    assert res.reference_center_distance == pytest.approx(12.0, abs=1e-12)
    assert res.zero_backlash_center_distance == pytest.approx(13.200, abs=5e-4)
    # independent route: bisection on inv α_w, then a_w = a cos α / cos α_w
    aw = bisect_inv(invf(A20) + 2 * math.tan(A20) * 0.516 / 8)
    assert res.zero_backlash_center_distance == pytest.approx(12 * math.cos(A20) / math.cos(aw),
                                                               abs=1e-9)
    assert res.y == pytest.approx((res.zero_backlash_center_distance - 12.0) / 3.0, abs=1e-12)


@pytest.mark.parametrize("z1,z2,x1,x2", [(20, 60, 0.3, 0.5), (18, 48, 0.0, 0.0),
                                         (12, 40, 0.4, 0.1), (24, 36, -0.2, 0.3)])
def test_working_center_distance_with_shifts(z1, z2, x1, x2):
    # inv α_w = inv α + 2 tan α (x₂ − x₁)/(z₂ − z₁), a_w = (z₂ − z₁) m cos α/(2 cos α_w)
    # (ISO 21771 signed form, from memory); recomputed by bisection ...
    p, r, res = pair(z1, z2, x1=x1, x2=x2, check_radial=False)
    aw = bisect_inv(invf(A20) + 2 * math.tan(A20) * (x2 - x1) / (z2 - z1))
    assert res.alpha_wt == pytest.approx(aw, abs=1e-12)
    assert res.zero_backlash_center_distance == pytest.approx(
        (z2 - z1) * 2.0 * math.cos(A20) / (2 * math.cos(aw)), abs=1e-9)
    # ... and by the external-pair code fed ISO's signed ring values (z₂ → −z₂, x₂ → −x₂)
    signed = ext_pair.working_pressure_angle(z1, -z2, x1, -x2, A20, A20)
    assert signed == pytest.approx(res.alpha_wt, abs=1e-12)


def test_coaxial_planetary_center_distances():
    # coaxial standard planetary z_r = z_s + 2 z_p (from memory);
    # sun 12 / planet 18 / ring 48 → the planet–ring distance equals the sun–planet one
    # (m(12 + 18)/2 = m(48 − 18)/2 = 15 m, computed)
    p, r, res = pair(18, 48, check_radial=False)
    assert res.reference_center_distance == pytest.approx(2.0 * (12 + 18) / 2, abs=1e-12)


def _contact_ratio_by_intersections(p, r, C):
    """ε_α from the intersections of the tip circles with the line of action, in coordinates."""
    # ring axis O₂ = 0, pinion axis O₁ = (C, 0); the line of action is tangent to both base
    # circles on the same side: unit normal n with n·O₂ = −r_b2 + ..., solve for it
    rb1, rb2 = p.rb, r.rb
    # common tangent: n·X = c with n·O₁ − c = −rb1 ... both centres on the same side
    # |c| = rb2 and |n·O₁ − c| = rb1 with the same sign: n_x C = rb2 − rb1
    nx = (rb2 - rb1) / C
    n = np.array([nx, math.sqrt(1 - nx * nx)])
    t = np.array([-n[1], n[0]])
    base = rb2 * n                                  # T₂, on the line, t its direction
    if (np.array([C, 0.0]) + rb1 * n - base) @ t < 0:
        t = -t                                      # run from T₂ towards T₁

    def hits(centre, radius):
        # |base + s t − centre| = radius
        d = base - centre
        b = d @ t
        c = d @ d - radius ** 2
        disc = math.sqrt(b * b - c)
        return np.array([-b - disc, -b + disc])

    s_ring = hits(np.zeros(2), r.ra)               # ring tip circle crossings
    s_pin = hits(np.array([C, 0.0]), p.ra)          # pinion tip circle crossings
    s_t1 = (np.array([C, 0.0]) + rb1 * n - base) @ t  # T₁
    # the path runs from the ring tip crossing beyond T₁ to the pinion tip crossing beyond T₁
    start = s_ring[s_ring > s_t1].min() if np.any(s_ring > s_t1) else s_t1
    end = s_pin.max()
    return (end - start) / p.pb


@pytest.mark.parametrize("z1,z2,x1,x2,dC", [(24, 48, 0, 0, 0.0), (20, 60, 0.3, 0.5, 0.0),
                                            (30, 50, 0.0, 0.2, 0.15)])
def test_contact_ratio_against_the_line_of_action(z1, z2, x1, x2, dC):
    # internal ε_α = [√(r_a1² − r_b1²) − √(r_a2² − r_b2²) + C sin α'_w]/p_b (from memory);
    # recomputed from the tip-circle crossings of the line of action in coordinates
    p, r, res0 = pair(z1, z2, x1=x1, x2=x2, check_radial=False)
    C = res0.center_distance + dC
    res = mesh_internal(p, r, C, check_radial=False)
    assert res.contact_ratio == pytest.approx(_contact_ratio_by_intersections(p, r, C), abs=1e-9)
    assert 1.0 < res.contact_ratio < 3.0


def test_backlash_from_tooth_thicknesses_on_the_working_circles():
    # j_wt = e₂(r_w2) − s₁(r_w1), thicknesses from s_r = 2r(s/d + inv α − inv α_r)
    # (ISO 21771 thickness relation, from memory), at a moved centre and with thinning
    p, r, res0 = pair(20, 60, x1=0.3, x2=0.5, th1=0.08, th2=0.06, check_radial=False)
    for dC in (0.0, -0.1, 0.05):
        C = res0.zero_backlash_center_distance + dC
        res = mesh_internal(p, r, C, check_radial=False)
        aw = math.acos((r.rb - p.rb) / C)
        rw1, rw2 = p.rb / math.cos(aw), r.rb / math.cos(aw)
        s1 = 2 * rw1 * (p.s / p.d + invf(A20) - invf(aw))
        e2 = 2 * rw2 * (r.e / r.d + invf(A20) - invf(aw))
        assert res.backlash_circumferential == pytest.approx(e2 - s1, abs=1e-9)
        assert res.backlash_base == pytest.approx((e2 - s1) * math.cos(aw), abs=1e-9)
    # moving the pinion away from the ring axis tightens an internal mesh; small-change
    # relation j_n ≈ −2 ΔC sin α (ISO/TR 10064-2 form with the internal sign, from memory)
    a = mesh_internal(p, r, res0.center_distance + 0.01, check_radial=False)
    assert a.backlash_normal - res0.backlash_normal == pytest.approx(-2 * 0.01 * math.sin(
        res0.alpha_w), rel=0.02)
    # at the tight center distance the backlash is zero
    t = mesh_internal(p, r, res0.tight_center_distance, check_radial=False)
    assert t.backlash_circumferential == pytest.approx(0.0, abs=1e-9)
    assert res0.tight_center_distance > res0.zero_backlash_center_distance


def test_tip_clearances():
    # pinion tip → ring root r_f2 − C − r_a1, ring tip → pinion root r_a2 − C − r_f1:
    # standard pair: both 0.25 m (ISO 53 A: h_f − h_a = 0.25 m, from memory)
    p, r, res = pair(24, 48, check_radial=False)
    assert res.tip_clearances == pytest.approx((0.5, 0.5), abs=1e-12)


def test_involute_interference_limit():
    # z₁/z₂ ≥ 1 − tan α_a2 / tan α_w (gear handbooks, from memory): ring 48 unshifted,
    # cos α_a2 = r_b2 / r_a2 → the pinion needs z₁ ≥ 21.6 (computed here)
    r = ring_sizes(48, 2.0, RACK_A)
    aa2 = math.acos(r.rb / r.ra)
    z_min = 48 * (1 - math.tan(aa2) / math.tan(A20))
    assert z_min == pytest.approx(21.6, abs=0.01)
    for z1 in (18, 21, 22, 26):
        _, _, res = pair(z1, 48, check_radial=False)
        assert (res.involute_margin >= 0) == (z1 >= z_min)
        assert any("involute interference" in s for s in res.problems) == (z1 < z_min)


def test_ring_tip_inside_base_circle_is_reported():
    # 20 in 24 unshifted: d_a2 44 < d_b2 45.105 (computed): no involute at the ring tip,
    # the trochoid check cannot be evaluated, involute interference
    _, r, res = pair(20, 24, check_radial=False)
    assert r.da < r.db
    assert res.trochoid_margin is None
    assert res.involute_margin < 0
    assert any("inside its base circle" in s for s in res.problems)


def test_trochoid_condition():
    # Classic condition (gear handbooks, from memory):
    # z₁(ε₁ + inv α_a1) − z₂(ε₂ + inv α_a2) + (z₂ − z₁) inv α_w ≥ 0,
    # cos ε₁ = (r_a2² − r_a1² − a²)/(2 a r_a1), cos ε₂ = (a² + r_a2² − r_a1²)/(2 a r_a2).
    # Written out here in that published form and compared with the module's.
    for z1, z2, k2 in [(30, 40, 0.0), (33, 40, 0.2), (18, 48, 0.2), (40, 48, 0.2)]:
        p, r, res = pair(z1, z2, k2=k2, check_radial=False)
        a, ra1, ra2 = res.center_distance, p.ra, r.ra
        e1 = math.acos((ra2 ** 2 - ra1 ** 2 - a * a) / (2 * a * ra1))
        e2 = math.acos((a * a + ra2 ** 2 - ra1 ** 2) / (2 * a * ra2))
        aa1, aa2 = math.acos(p.rb / ra1), math.acos(r.rb / ra2)
        ref = z1 * (e1 + invf(aa1)) - z2 * (e2 + invf(aa2)) + (z2 - z1) * invf(res.alpha_w)
        assert res.trochoid_margin == pytest.approx(ref, abs=1e-12)
    # 33 in 40 (k₂ 0.2) fails, 32 in 40 passes (computed; the sweep confirms it on outlines)
    assert pair(33, 40, k2=0.2, check_radial=False)[2].trochoid_margin < 0
    assert pair(32, 40, k2=0.2, check_radial=False)[2].trochoid_margin > 0
    res = pair(33, 40, k2=0.2, check_radial=False)[2]
    assert any("trochoid interference" in s for s in res.problems)
    # a safe difference: 18 in 48
    assert pair(18, 48, k2=0.2, check_radial=False)[2].trochoid_margin > 0.5


def test_tooth_difference_limits_agree_with_the_margins():
    p, r, res = pair(30, 48, k2=0.2, check_radial=False)
    lo, hi = res.min_tooth_difference, res.max_tooth_difference
    assert lo is not None and hi is not None and lo < hi
    for d, ok in ((lo, True), (lo - 1, False)):
        q = gear_sizes(48 - d, 2.0, RACK_A)
        m = mesh_internal(q, r, check_radial=False)
        assert (m.trochoid_margin >= 0) == ok
    # practice says 10–12 teeth at 20° unshifted (common practice); the condition allows a
    # little less, 8 here: the rule of thumb is a safe side of it
    assert 6 <= lo <= 12
    q = gear_sizes(48 - hi, 2.0, RACK_A)
    assert mesh_internal(q, r, check_radial=False).involute_margin >= 0
    q = gear_sizes(48 - hi - 1, 2.0, RACK_A)
    assert mesh_internal(q, r, check_radial=False).involute_margin < 0


def test_radial_assembly():
    # a large tooth-count difference goes in along a radius; a small one only axially
    # (common practice); the outline sweep confirms both in test_internal_sweep
    p, r, _ = pair(18, 48, k2=0.2, check_radial=False)
    ok, phase = radial_assembly(p, r, 30.0)
    assert ok and phase is not None
    p, r, _ = pair(32, 40, k2=0.2, check_radial=False)
    ok, phase = radial_assembly(p, r, 8.0)
    assert not ok and phase is None


def test_bad_pairs_are_refused():
    with pytest.raises(GeometryError):
        working_pressure_angle(30, 30, 0.0, 0.0, A20, A20)
    p = gear_sizes(20, 2.0, RACK_A)
    r = ring_sizes(40, 1.5, RACK_A)
    with pytest.raises(GeometryError):
        mesh_internal(p, r)
    r = ring_sizes(40, 2.0, RACK_A)
    with pytest.raises(GeometryError):
        mesh_internal(p, r, center_distance=1.0)   # below the base-radius difference
    assert trochoid_margin(20, 24, 21.0, 22.0, 18.8, 22.55, 4.0, A20) is None
