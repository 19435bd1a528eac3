"""Meshes of straight, twisted, sheared and chevron prisms (no CAD kernel).

Reference values are computed in each test from closed forms (area of a circle or square,
Cavalieri's principle, the helix relation Δθ = Δz·tan β / r_p) or by an independent route
(shapely polygon areas and distances).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import shapely
import trimesh
from shapely.geometry import Polygon

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.body import Body, Prism, gear_twist, plan_cuts, rack_shear
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.gear_outline import gear_loop
from gen.geometry.generate import generate_flank
from gen.geometry.rack_outline import rack_loop, rack_sizes
from gen.geometry.section import Arc, Line, Loop, Section, circle, signed_area
from gen.triangles.prism import (TWISTED_PROFILE_SHARE, body_triangles, loop_polygon,
                                 prism_triangles)
from gen.triangles.twist_walls import column_counts, strip_pattern, strip_steps
from gen.validate import helix

BETA = math.radians(30)


def square(a: float, cx: float = 0.0, cy: float = 0.0) -> Loop:
    h = a / 2
    p = [(cx - h, cy - h), (cx + h, cy - h), (cx + h, cy + h), (cx - h, cy + h)]
    return Loop(tuple(Line(p[i], p[(i + 1) % 4]) for i in range(4)))


def d_bore(r: float = 4.0, flat: float = 3.5) -> Loop:
    a = math.acos(flat / r)
    arc = Arc((0.0, 0.0), r, a, 2 * math.pi - a)
    return Loop((arc, Line(tuple(arc.end), tuple(arc.start))))


@pytest.fixture(scope="module")
def gear20():
    rk = basic_rack("A")
    sz = gear_sizes(20, 2.0, rk, beta=BETA)
    return gear_loop(generate_flank(20, sz.rp, cutter_for(sz, rk), sz.ra)), sz


@pytest.fixture(scope="module")
def rack10():
    rk = basic_rack("A")
    rs = rack_sizes(2.0, rk, height=8.0, teeth=10, beta=BETA)
    return rack_loop(rs, rk), rs


def outer_slice(mesh: trimesh.Trimesh, z: float) -> np.ndarray:
    """Outer loop (ccw) of the mesh cut by the plane at height z."""
    path = mesh.section(plane_origin=[0, 0, z], plane_normal=[0, 0, 1])
    flat, _ = path.to_2D(to_2D=np.eye(4))
    loops = [np.asarray(d)[:-1] for d in flat.discrete]
    o = max(loops, key=lambda q: abs(signed_area(q)))
    return o if signed_area(o) > 0 else o[::-1]


# --------------------------------------------------------------------------- closed forms
@pytest.mark.parametrize("tol", [0.1, 0.01, 0.001])
def test_disc_volume_matches_pi_r2_h(tol):
    r, h = 10.0, 5.0
    m = prism_triangles(Prism(Section(circle(r)), 0.0, h), tol=tol)
    assert m.is_watertight and m.is_winding_consistent
    exact = math.pi * r * r * h  # computed: cylinder volume
    # an inscribed polygon within tol loses at most perimeter × tol of area
    assert exact - 2 * math.pi * r * tol * h <= m.volume <= exact


@pytest.mark.parametrize("chevron", [False, True])
@pytest.mark.parametrize("twist", [0.05, -0.2])
def test_twisted_square_keeps_its_volume(twist, chevron):
    a, h, tol = 10.0, 12.0, 0.01
    m = prism_triangles(Prism(Section(square(a)), 0.0, h, twist=twist, chevron=chevron), tol=tol)
    assert m.is_watertight and m.is_volume
    exact = a * a * h  # computed: every section is the same square (Cavalieri)
    assert abs(m.volume - exact) <= 4 * a * h * tol  # lateral area × tolerance


@pytest.mark.parametrize("chevron", [False, True])
def test_sheared_square_is_exact(chevron):
    a, h = 6.0, 9.0
    m = prism_triangles(Prism(Section(square(a)), 1.0, 1.0 + h, shear=0.7, chevron=chevron))
    assert m.is_watertight
    assert m.volume == pytest.approx(a * a * h, rel=1e-12)  # computed: planar walls, exact
    top = m.vertices[np.isclose(m.vertices[:, 2], 1.0 + h)]
    shift = 0.0 if chevron else 0.7 * h
    assert top[:, 0].min() == pytest.approx(-a / 2 + shift, abs=1e-12)


def test_square_with_straight_hole_in_twisted_prism():
    # an off-axis square cut stays straight while the outer square turns (no boolean)
    body = Body((Prism(Section(circle(20.0)), 0.0, 10.0, twist=0.1),),
                (Prism(Section(square(4.0, cx=8.0)), 0.0, 10.0),))
    plan = plan_cuts(body)
    assert not plan.booleans and len(plan.holes[0]) == 1
    m = body_triangles(body, tol=0.01)
    assert m.is_watertight
    exact = (math.pi * 20.0 ** 2 - 16.0) * 10.0  # computed: disc minus square, times height
    walls = (2 * math.pi * 20.0 + 16.0) * 10.0
    assert abs(m.volume - exact) <= walls * 0.01  # wall area × tolerance
    lo = m.vertices[np.isclose(m.vertices[:, 2], 0.0)]
    hi = m.vertices[np.isclose(m.vertices[:, 2], 10.0)]
    assert np.any(np.all(np.isclose(lo[:, :2], [6.0, -2.0]), axis=1))
    assert np.any(np.all(np.isclose(hi[:, :2], [6.0, -2.0]), axis=1))  # not rotated


# --------------------------------------------------------------------------- tolerance bound
def wall_deviation(mesh, prism, loops, k=6):
    """In-plane distance (mm) from points spread over every wall triangle to the exact section.

    Method (untwisting, computed): a barycentric grid of (k+1)(k+2)/2 points on each wall
    triangle; each point turned back by −θ(z) and shifted back by −s(z) of its own height
    (``Prism.motion``) lands in the base section plane, where the exact wall is the section
    curve itself, so its distance there to the curve bounds the 3-D distance to the twisted
    wall from above. The curves are taken as ``Loop.polygon(1e-4)`` (arcs within 0.1 µm,
    splines through their own samples, which are what the triangle layer treats as exact),
    searched with a shapely STRtree of its segments."""
    walls = np.abs(mesh.face_normals[:, 2]) < 0.999
    tri = mesh.triangles[walls]
    bary = np.array([(i / k, j / k, 1 - (i + j) / k) for i in range(k + 1)
                     for j in range(k + 1 - i)])
    pts = np.einsum("gk,tkd->tgd", bary, tri).reshape(-1, 3)
    th, sh = prism.motion(pts[:, 2])
    c, s = np.cos(-th), np.sin(-th)
    x = pts[:, 0] - sh
    back = np.column_stack([c * x - s * pts[:, 1], s * x + c * pts[:, 1]])
    segs = []
    for loop in loops:
        q = loop.polygon(1e-4)
        segs.append(np.stack([q, np.roll(q, -1, axis=0)], axis=1))
    tree = shapely.STRtree(shapely.linestrings(np.concatenate(segs)))
    (hit, _), d = tree.query_nearest(shapely.points(back), max_distance=1.0,
                                     return_distance=True, all_matches=False)
    out = np.full(len(back), np.inf)   # a point farther than 1 mm counts as a failure
    out[hit] = d
    return out


@pytest.mark.parametrize("chevron", [False, True])
@pytest.mark.parametrize("tol", [0.04, 0.01, 0.004])
def test_gear_walls_stay_within_tol_of_the_helicoid(gear20, tol, chevron):
    loop, sz = gear20
    pr = Prism(Section(loop, (circle(5.0),)), 0.0, 16.0, twist=gear_twist(BETA, sz.rp),
               chevron=chevron)
    m = prism_triangles(pr, tol=tol)
    assert m.is_watertight and m.is_winding_consistent
    d = wall_deviation(m, pr, [loop, circle(5.0)])
    print(f"worst wall deviation {d.max():.5f} mm for tol {tol}")
    # the reference curves lie within 1e-4 mm of the exact ones: distance ≤ d + 1e-4
    assert d.max() + 1e-4 <= tol
    assert d.max() > 0.3 * tol  # the step counts are not wastefully high


def test_herringbone_40_walls_stay_within_tol():
    # the benchmark's gear: m_n 2, z 40, β 30°, 2 × 10 mm, 8 mm bore (dense check at 0.01 mm)
    rk = basic_rack("A")
    sz = gear_sizes(40, 2.0, rk, beta=BETA)
    loop = gear_loop(generate_flank(40, sz.rp, cutter_for(sz, rk), sz.ra))
    pr = Prism(Section(loop, (circle(4.0),)), 0.0, 20.0, twist=gear_twist(BETA, sz.rp),
               chevron=True)
    m = prism_triangles(pr, tol=0.01)
    assert m.is_watertight and m.is_winding_consistent
    d = wall_deviation(m, pr, [loop, circle(4.0)], k=4)
    assert d.max() + 1e-4 <= 0.01


def _strip_deviation(p_a, p_b, k, za, zb, heights_a, heights_b, a_leads):
    """Largest |Y − chord| over one strip, Y = Σ λ_i R(k (z_i − z)) P_i (brute force)."""
    pat = strip_pattern(len(heights_a) - 1, len(heights_b) - 1, a_leads)
    pa, pb = np.asarray(p_a, float), np.asarray(p_b, float)
    t = (pb - pa) / np.hypot(*(pb - pa))
    n = np.array([t[1], -t[0]])
    worst = 0.0
    g = np.linspace(0.0, 1.0, 41)
    lam = np.array([(u, v, 1 - u - v) for u in g for v in g if u + v <= 1 + 1e-12])
    for tri in pat:
        P = np.array([pa if side == 0 else pb for side, _ in tri])
        Z = np.array([(heights_a if side == 0 else heights_b)[lvl] for side, lvl in tri])
        z = lam @ Z
        phi = k * (Z[None, :] - z[:, None])
        c, s = np.cos(phi), np.sin(phi)
        Y = np.stack([(lam * (c * P[:, 0] - s * P[:, 1])).sum(1),
                      (lam * (s * P[:, 0] + c * P[:, 1])).sum(1)], axis=1)
        worst = max(worst, float(np.max(np.abs((Y - pa) @ n))))
    return worst


def test_quad_diagonal_sign_rule():
    # a flank-like chord (c = P·n > 0, ℓ 0.8 mm at 45 mm) turning k > 0: the rule picks the
    # diagonal "a leads" for c k > 0; the bound of gen/triangles/twist_walls.py then is
    # max(|c| δ²/8, ℓ δ/4) + s δ³/24, the other diagonal reaches nearly their sum
    pa, pb = np.array([45.0, 0.0]), np.array([45.2, 0.775])
    k, h, steps = 0.0125, 10.0, 4
    zs = np.linspace(0.0, h, steps + 1)
    good = _strip_deviation(pa, pb, k, 0.0, h, zs, zs, True)
    bad = _strip_deviation(pa, pb, k, 0.0, h, zs, zs, False)
    t = (pb - pa) / np.hypot(*(pb - pa))
    c = abs(pa @ np.array([t[1], -t[0]]))      # computed: distance of the chord's line
    ell, delta = float(np.hypot(*(pb - pa))), k * h / steps
    s = max(abs(pa @ t), abs(pb @ t))
    assert good <= max(c * delta ** 2 / 8, ell * delta / 4) + s * delta ** 3 / 24
    assert bad > 1.5 * good
    assert bad <= c * delta ** 2 / 8 + ell * delta / 4 + s * delta ** 3 / 24


def test_zipper_strip_stays_within_the_sum_bound():
    pa, pb = np.array([30.0, 0.0]), np.array([29.9, 0.6])
    k, h = -0.02, 8.0
    ha, hb = np.linspace(0.0, h, 4), np.linspace(0.0, h, 7)   # 3 and 6 steps: zipper
    got = _strip_deviation(pa, pb, k, 0.0, h, ha, hb, True)
    t = (pb - pa) / np.hypot(*(pb - pa))
    c = abs(pa @ np.array([t[1], -t[0]]))
    ell, delta = float(np.hypot(*(pb - pa))), abs(k) * h / 3   # larger step of the two
    s = max(abs(pa @ t), abs(pb @ t))
    assert got <= c * delta ** 2 / 8 + ell * delta / 4 + s * delta ** 3 / 24
    assert got > 0.3 * (c * delta ** 2 / 8)   # the bound is not loose by orders


def test_strip_patterns_are_zippers():
    for na, nb in [(1, 1), (3, 3), (2, 5), (5, 2), (4, 6)]:
        for lead in (False, True):
            pat = strip_pattern(na, nb, lead)
            assert len(pat) == na + nb  # each triangle advances one level on one side
            for side, n in ((0, na), (1, nb)):
                lv = sorted({lvl for tri in pat for s, lvl in tri if s == side})
                assert lv == list(range(n + 1))


def test_column_steps_follow_the_radius_and_tol(gear20):
    loop, sz = gear20
    theta = gear_twist(BETA, sz.rp) * 10.0
    totals = []
    for tol in (0.02, 0.005, 0.001):
        poly = loop_polygon(circle(4.0), tol)
        bore = column_counts(*strip_steps(poly, theta, tol), theta)
        poly = loop_polygon(loop, tol)
        n = column_counts(*strip_steps(poly, theta, tol), theta)
        r = np.hypot(*poly.T)
        # the helix sagitta r δ²/8 grows with the radius: the tip land (r_a) needs the most
        # steps, a bore of 4 mm radius fewer than the tooth columns on average
        assert n[r > sz.ra - 1e-6].max() == n.max() > bore.max()
        assert bore.mean() < n.mean()
        totals.append(n.mean())
    assert totals[0] < totals[1] < totals[2]


def test_chevron_apex_is_a_layer_of_every_column(gear20):
    loop, sz = gear20
    pr = Prism(Section(loop), 0.0, 20.0, twist=gear_twist(BETA, sz.rp), chevron=True)
    m = prism_triangles(pr, tol=0.01)
    poly = loop_polygon(loop, TWISTED_PROFILE_SHARE * 0.01)   # the polygon of a twisted prism
    apex = m.vertices[np.isclose(m.vertices[:, 2], 10.0, atol=1e-12), :2]
    # every polygon vertex, turned to the apex, is a vertex there (the involute flanks add
    # the images of the end vertices along their straight lines: gen.triangles.ruled_flanks)
    want = pr.place(poly, 10.0)
    gap = np.min(np.hypot(*(want[:, None, :] - apex[None, :, :]).transpose(2, 0, 1)), axis=1)
    assert gap.max() < 1e-9 and len(apex) > len(poly)


def test_spline_thinning_keeps_tol(gear20):
    loop, _ = gear20
    for tol in (0.01, 0.001):
        poly = loop_polygon(loop, tol)
        dense = loop.polygon(1e-4)
        assert len(poly) < len(dense)
        d = shapely.distance(shapely.points(dense), shapely.LinearRing(poly))
        assert d.max() <= tol * 1.001


# --------------------------------------------------------------------------- watertight grid
@pytest.mark.parametrize("twist,shear,chevron", [
    (0.0, 0.0, False), (0.02, 0.0, False), (-0.02, 0.0, True), (0.0, 0.5, False),
    (0.0, -0.5, True), (0.01, 0.2, False), (0.01, 0.2, True)])
def test_gear_meshes_are_closed(gear20, twist, shear, chevron):
    loop, _ = gear20
    m = prism_triangles(Prism(Section(loop, (circle(5.0),)), -3.0, 9.0, twist=twist, shear=shear,
                         chevron=chevron))
    assert m.is_watertight and m.is_winding_consistent and m.volume > 0
    assert m.bounds[0, 2] == pytest.approx(-3.0) and m.bounds[1, 2] == pytest.approx(9.0)


def test_twist_does_not_change_gear_volume(gear20):
    loop, sz = gear20
    sec = Section(loop, (circle(5.0),))
    v0 = prism_triangles(Prism(sec, 0.0, 20.0)).volume
    v1 = prism_triangles(Prism(sec, 0.0, 20.0, twist=gear_twist(BETA, sz.rp), chevron=True)).volume
    assert v1 == pytest.approx(v0, rel=2e-4)  # computed: Cavalieri, within the mesh tolerance


# --------------------------------------------------------------------------- helix on slices
@pytest.mark.parametrize("hand", ["right", "left"])
def test_measured_helix_on_helical_gear_slices(gear20, hand):
    loop, sz = gear20
    tw = gear_twist(BETA, sz.rp, hand)
    m = prism_triangles(Prism(Section(loop, (circle(5.0),)), 0.0, 20.0, twist=tw))
    za, zb = 2.3, 9.1
    a, b = outer_slice(m, za), outer_slice(m, zb)
    got = helix.angular_offset(a, b, sz.rp)
    want = (zb - za) * math.tan(BETA) / sz.rp * (1 if hand == "right" else -1)  # ISO 21771
    assert abs(helix.fold(got - want, 2 * math.pi / 20)) < math.radians(0.05)
    f = helix.check_gear_helix(a, b, zb - za, BETA if hand == "right" else -BETA, sz.rp)
    assert f[0].severity == "info"
    f = helix.check_gear_helix(a, b, zb - za, math.radians(25), sz.rp)
    assert f[0].severity == "error"
    # with the allowance of a 0.01 mm mesh (gen.validate.helix.mesh_angle_tol, what the
    # parts' slice checks use) a 1° error of β and the wrong hand are still refused
    tol = helix.mesh_angle_tol(0.01, sz.rp)
    sign = 1 if hand == "right" else -1
    assert helix.check_gear_helix(a, b, zb - za, sign * BETA, sz.rp, tol=tol)[0].severity == "info"
    for beta in (sign * math.radians(29), sign * math.radians(31), -sign * BETA):
        assert helix.check_gear_helix(a, b, zb - za, beta, sz.rp, tol=tol)[0].severity == "error"


def test_herringbone_halves_are_mirror_images(gear20):
    loop, sz = gear20
    m = prism_triangles(Prism(Section(loop), 0.0, 20.0, twist=gear_twist(BETA, sz.rp), chevron=True))
    pairs = [(outer_slice(m, 10.0 - t), outer_slice(m, 10.0 + t)) for t in (1.3, 4.0, 8.7)]
    assert helix.check_herringbone_mirror(pairs, sz.rp)[0].severity == "info"
    # and each half has the helix: 0 → 8.7 below the apex turns by 8.7·tan β / r_p
    pitch = 2 * math.pi / 20
    want = 8.7 * math.tan(BETA) / sz.rp  # ISO 21771, more than one pitch: compare folded
    got = helix.angular_offset(outer_slice(m, 0.5), outer_slice(m, 9.2), sz.rp)
    assert abs(helix.fold(got - want, pitch)) < math.radians(0.05)
    got = helix.angular_offset(outer_slice(m, 10.8), outer_slice(m, 19.5), sz.rp)
    assert abs(helix.fold(got + want, pitch)) < math.radians(0.05)


def test_helical_rack_slices_shift_by_tan_beta(rack10):
    loop, rs = rack10
    m = prism_triangles(Prism(Section(loop), 0.0, 15.0, shear=rack_shear(BETA)))
    a, b = outer_slice(m, 1.0), outer_slice(m, 4.0)
    assert helix.linear_offset(a, b, 0.0, rs.pitch) == pytest.approx(3.0 * math.tan(BETA),
                                                                     abs=1e-6)


def test_offset_helpers_on_exact_polygons(gear20):
    loop, sz = gear20
    poly = loop.polygon(1e-3)
    pr = Prism(Section(loop), 0.0, 1.0, twist=1.0)
    for turn in (0.0, 0.01, -0.07, 0.3):  # 0.3 rad is more than one 18° pitch
        got = helix.angular_offset(poly, pr.place(poly, turn), sz.rp)
        assert got == pytest.approx(helix.fold(turn, 2 * math.pi / 20), abs=1e-9)
    assert helix.helix_angle(helix.expected_turn(7.0, BETA, sz.rp), 7.0, sz.rp) == \
        pytest.approx(BETA)


# --------------------------------------------------------------------------- bodies and cuts
def test_d_bore_goes_into_the_section(gear20):
    loop, sz = gear20
    body = Body((Prism(Section(loop), 0.0, 12.0, twist=gear_twist(BETA, sz.rp), chevron=True),),
                (Prism(Section(d_bore()), -1.0, 13.0),))
    assert plan_cuts(body).booleans == ()
    m = body_triangles(body)
    assert m.is_watertight
    ref = (Polygon(loop_polygon(loop, 0.005)).area - Polygon(loop_polygon(d_bore(), 0.005)).area)
    assert m.volume == pytest.approx(ref * 12.0, rel=2e-4)  # shapely areas, computed


def test_keyway_across_the_bore_needs_a_boolean(gear20):
    loop, sz = gear20
    key = Loop(tuple(Line(p, q) for p, q in [((0, -1), (5, -1)), ((5, -1), (5, 1)),
                                             ((5, 1), (0, 1)), ((0, 1), (0, -1))]))
    body = Body((Prism(Section(loop, (circle(4.0),)), 0.0, 10.0, twist=gear_twist(BETA, sz.rp)),),
                (Prism(Section(key), -1.0, 11.0),))
    assert len(plan_cuts(body).booleans) == 1
    m = body_triangles(body)
    assert m.is_watertight
    hole = Polygon(loop_polygon(circle(4.0), 0.005)).union(Polygon(loop_polygon(key, 0.005)))
    ref = (Polygon(loop_polygon(loop, 0.005)).area - hole.area) * 10.0  # shapely union area
    assert m.volume == pytest.approx(ref, rel=3e-4)


def test_gear_with_hub_union(gear20):
    loop, sz = gear20
    gear = Prism(Section(loop, (circle(4.0),)), 0.0, 10.0, twist=gear_twist(BETA, sz.rp))
    hub = Prism(Section(circle(9.0), (circle(4.0),)), 10.0, 16.0)
    m = body_triangles(Body((gear, hub)))
    assert m.is_watertight
    ref = prism_triangles(gear).volume + prism_triangles(hub).volume  # touching only on the face
    assert m.volume == pytest.approx(ref, rel=1e-9)


def test_cut_planning_rules(gear20, rack10):
    loop, sz = gear20
    tw = gear_twist(BETA, sz.rp)
    gear = Prism(Section(loop), 0.0, 10.0, twist=tw)
    # a hole reaching past the root circle would meet the turning teeth: boolean
    far = Prism(Section(circle(3.0, center=(sz.rf - 2.0, 0.0))), 0.0, 10.0)
    assert len(plan_cuts(Body((gear,), (far,))).booleans) == 1
    # a blind hole does not span the height: boolean
    blind = Prism(Section(circle(3.0)), 0.0, 5.0)
    assert len(plan_cuts(Body((gear,), (blind,))).booleans) == 1
    # a twisted cut is never a straight hole
    tw_cut = Prism(Section(circle(3.0, center=(5.0, 0.0))), 0.0, 10.0, twist=0.1)
    assert len(plan_cuts(Body((gear,), (tw_cut,))).booleans) == 1
    # two holes that overlap: the second goes to a boolean
    h1 = Prism(Section(circle(2.0, center=(6.0, 0.0))), 0.0, 10.0)
    h2 = Prism(Section(circle(2.0, center=(8.0, 0.0))), 0.0, 10.0)
    plan = plan_cuts(Body((gear,), (h1, h2)))
    assert len(plan.holes[0]) == 1 and len(plan.booleans) == 1
    # rack: a hole in the back, clear of the teeth over the whole shear, is a plain hole
    rl, rs = rack10
    rack = Prism(Section(rl), 0.0, 10.0, shear=rack_shear(BETA), chevron=True)
    back = Prism(Section(circle(1.5, center=(30.0, -6.0))), 0.0, 10.0)
    assert plan_cuts(Body((rack,), (back,))).booleans == ()
    m = body_triangles(Body((rack,), (back,)))
    assert m.is_watertight
    near_end = Prism(Section(circle(1.5, center=(1.0, -6.0))), 0.0, 10.0)
    assert len(plan_cuts(Body((rack,), (near_end,))).booleans) == 1


def test_bad_input_raises():
    with pytest.raises(GeometryError):
        Prism(Section(circle(1.0)), 2.0, 2.0)
    with pytest.raises(GeometryError):
        prism_triangles(Prism(Section(circle(1.0)), 0.0, 1.0), tol=0.0)
    with pytest.raises(GeometryError):
        Body(())
    with pytest.raises(GeometryError):
        gear_twist(BETA, 10.0, "up")


def test_round_bore_on_the_axis_stays_straight(gear20):
    # a circle about the axis turned by any angle is the same circle (computed), so its wall
    # needs no twist steps: bore vertices only at the two ends, the top ones not turned
    loop, sz = gear20
    pr = Prism(Section(loop, (circle(5.0),)), 0.0, 12.0, twist=gear_twist(BETA, sz.rp))
    m = prism_triangles(pr, tol=0.01)
    assert m.is_watertight and m.is_winding_consistent
    v = m.vertices[np.isclose(np.hypot(m.vertices[:, 0], m.vertices[:, 1]), 5.0, atol=1e-9)]
    assert set(np.round(v[:, 2], 9)) == {0.0, 12.0}
    lo, hi = v[v[:, 2] == 0.0], v[v[:, 2] == 12.0]
    assert len(lo) == len(hi) and np.allclose(np.sort(lo[:, :2], axis=0),
                                              np.sort(hi[:, :2], axis=0), atol=1e-12)
    # an off-axis round hole of the section turns with it
    off = Prism(Section(loop, (circle(2.0, center=(8.0, 0.0)),)), 0.0, 12.0,
                twist=gear_twist(BETA, sz.rp))
    w = prism_triangles(off, tol=0.01).vertices
    near = w[np.isclose(np.hypot(w[:, 0] - 8.0, w[:, 1]), 2.0, atol=1e-9)]
    assert set(np.round(near[:, 2], 9)) == {0.0}
