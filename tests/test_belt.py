"""Open belt drive: length, center distance, wrap, teeth in mesh, drive solution."""

import json
import math

import numpy as np
import pytest
from shapely.geometry import MultiPoint

from gen.errors import GeometryError
from gen.geometry.belt import (belt_length, belt_length_approx, center_for_length,
                               min_center, shortest_belt, solve_drive, span_angle,
                               teeth_in_mesh, wrap_angle)


def dp(z, p):
    return z * p / math.pi


def tangent_route(C, D, d):
    """Belt length and small-pulley wrap from the outer tangent points (independent route).

    Small circle at the origin, large at (C, 0). The outer tangent's unit normal n obeys
    n·(c2 − c1) = r1 − r2; tangent points r1·n and c2 + r2·n; the belt runs the two spans,
    the small circle outside the normal pair and the large circle between them.
    """
    r1, r2 = d / 2.0, D / 2.0
    psi = math.acos((r1 - r2) / C)               # angle of n from +X
    n = np.array([math.cos(psi), math.sin(psi)])
    t1, t2 = r1 * n, np.array([C, 0.0]) + r2 * n
    span = float(np.hypot(*(t2 - t1)))
    wrap_small = 2.0 * math.pi - 2.0 * psi
    wrap_large = 2.0 * psi
    return 2.0 * span + r1 * wrap_small + r2 * wrap_large, wrap_small


def hull_length(C, D, d, n=20000):
    """Perimeter of the convex hull of the two pitch circles, sampled (independent route)."""
    t = np.linspace(0.0, 2.0 * math.pi, n, endpoint=False)
    ring = np.column_stack([np.cos(t), np.sin(t)])
    pts = np.vstack([ring * d / 2.0, ring * D / 2.0 + [C, 0.0]])
    return MultiPoint(pts).convex_hull.length


# open-belt length L = 2C cos φ + π(D+d)/2 + φ(D−d) (from memory): 2 mm pitch, 20/60 teeth,
# C 40 → L 164.088 mm,
# wrap 142.88°, 7.94 teeth in mesh (computed; recomputed here from tangent points and hull)
def test_reference_2mm_20_60_c40():
    d, D = dp(20, 2.0), dp(60, 2.0)
    L = belt_length(40.0, D, d)
    L_t, wrap_t = tangent_route(40.0, D, d)
    assert L == pytest.approx(L_t, abs=1e-9)
    assert L == pytest.approx(hull_length(40.0, D, d), abs=1e-4)
    assert L == pytest.approx(164.088, abs=5e-4)
    theta = wrap_angle(40.0, D, d)
    assert theta == pytest.approx(wrap_t, abs=1e-12)
    assert math.degrees(theta) == pytest.approx(142.88, abs=5e-3)
    assert teeth_in_mesh(20, theta) == pytest.approx(7.94, abs=5e-3)


# same formula (from memory): 5 mm pitch, 15/45 teeth, C 60 → L 279.631 mm, 5.55 teeth in mesh (computed)
@pytest.mark.parametrize("profile", ["T5", "curv5"])
def test_reference_5mm_15_45_c60_warns(profile):
    d, D = dp(15, 5.0), dp(45, 5.0)
    L = belt_length(60.0, D, d)
    L_t, wrap_t = tangent_route(60.0, D, d)
    assert L == pytest.approx(L_t, abs=1e-9)
    assert L == pytest.approx(hull_length(60.0, D, d), abs=1e-4)
    assert L == pytest.approx(279.631, abs=5e-4)
    assert teeth_in_mesh(15, wrap_t) == pytest.approx(5.55, abs=5e-3)

    sol = solve_drive(profile, 15, 45, center=60.0)
    assert sol.requested_length == pytest.approx(L, abs=1e-12)
    assert sol.belt_teeth == round(L / 5.0) == 56
    codes = {f.code: f.severity for f in sol.findings}
    assert codes["few-teeth-in-mesh"] == "warning"      # < 6 in mesh: common practice
    assert sol.teeth_in_mesh < 6.0


def test_wrap_and_mesh_of_equal_pulleys():
    # equal pulleys: straight spans, half wrap each, exactly half the teeth in mesh
    D = dp(30, 3.0)
    assert belt_length(50.0, D, D) == pytest.approx(100.0 + math.pi * D, abs=1e-12)
    assert math.degrees(wrap_angle(50.0, D, D)) == pytest.approx(180.0, abs=1e-12)
    assert teeth_in_mesh(30, wrap_angle(50.0, D, D)) == pytest.approx(15.0, abs=1e-12)


@pytest.mark.parametrize("C,D,d", [(40, 38.2, 12.7), (60, 71.6, 23.9), (25, 40.0, 8.0),
                                   (200, 60.0, 15.0), (31, 50.0, 10.0)])
def test_approximation_error(C, D, d):
    # exact − approx = 2C (√(1−s²) + s·asin s − 1 − s²/2) = 2C(s⁴/24 + s⁶/80 + …), all terms
    # positive, s = (D−d)/(2C): bounded by C·s⁴/12 · [1, 1 + s²] (series, computed)
    s = (D - d) / (2.0 * C)
    gap = belt_length(C, D, d) - belt_length_approx(C, D, d)
    lead = C * s ** 4 / 12.0
    assert lead * (1 - 1e-9) <= gap <= lead * (1.0 + s * s)


@pytest.mark.parametrize("D,d", [(38.197, 12.732), (71.620, 23.873), (20.0, 20.0),
                                 (120.0, 9.0)])
@pytest.mark.parametrize("extra", [0.5, 7.0, 60.0, 900.0])
def test_length_center_round_trip(D, d, extra):
    C = min_center(D, d) + extra
    L = belt_length(C, D, d)
    C2 = center_for_length(L, D, d)
    assert C2 == pytest.approx(C, abs=1e-6)
    assert belt_length(C2, D, d) == pytest.approx(L, abs=1e-6)   # 1 µm


def test_center_too_small_and_belt_too_short():
    d, D = dp(20, 2.0), dp(60, 2.0)
    c0 = min_center(D, d)
    assert c0 == pytest.approx((D + d) / 2.0)
    with pytest.raises(GeometryError, match="too small"):
        belt_length(c0, D, d)
    with pytest.raises(GeometryError, match="must exceed"):
        span_angle(c0 - 1.0, D, d)
    with pytest.raises(GeometryError, match="too small"):
        belt_length(c0 + 1.0, D, d, clearance=2.0)
    with pytest.raises(GeometryError, match="too short"):
        center_for_length(shortest_belt(D, d), D, d)
    with pytest.raises(GeometryError, match="too short"):
        center_for_length(100.0, D, d)
    with pytest.raises(GeometryError, match="too small"):
        solve_drive("curv2", 20, 60, center=20.0)
    with pytest.raises(GeometryError):
        belt_length(40.0, -1.0, d)


def test_solve_from_belt_teeth_and_tensioner_range():
    sol = solve_drive("T5", 16, 40, belt_teeth=80, adjust_pct=2.0)
    assert sol.belt_length == pytest.approx(400.0)
    assert sol.ratio == pytest.approx(2.5)
    D, d = dp(40, 5.0), dp(16, 5.0)
    assert belt_length(sol.center_distance, D, d) == pytest.approx(400.0, abs=1e-6)
    assert belt_length(sol.center_min, D, d) == pytest.approx(392.0, abs=1e-6)
    assert belt_length(sol.center_max, D, d) == pytest.approx(408.0, abs=1e-6)
    assert sol.center_min < sol.center_distance < sol.center_max
    assert sol.wrap_angle == pytest.approx(math.degrees(wrap_angle(sol.center_distance, D, d)))
    assert sol.teeth_in_mesh == pytest.approx(16 * sol.wrap_angle / 360.0)
    assert sol.requested_center is None
    assert not [f for f in sol.findings if f.severity != "info"]


def test_nearest_stock_belt():
    # 2 mm, 20/60 at C 40 needs 82.04 teeth: default picks 82, a stock list its nearest
    sol = solve_drive("curv2", 20, 60, center=40.0)
    assert sol.belt_teeth == 82
    assert sol.center_distance < 40.0
    sol = solve_drive("curv2", 20, 60, center=40.0, stock=[70, 85, 90, 100])
    assert sol.belt_teeth == 85
    assert belt_length(sol.center_distance, dp(60, 2), dp(20, 2)) == pytest.approx(170.0)
    # a stock belt shorter than the pulleys allow is never chosen
    sol = solve_drive("curv2", 20, 60, center=40.0, stock=[40, 200])
    assert sol.belt_teeth == 200
    with pytest.raises(GeometryError, match="no stock belt"):
        solve_drive("curv2", 20, 60, center=40.0, stock=[30, 40])
    sol = solve_drive("curv2", 20, 60, belt_teeth=83, stock=[82, 90])
    assert "not-in-stock" in {f.code for f in sol.findings}


def test_pulley_order_does_not_matter_for_wrap():
    a = solve_drive("XL", 12, 30, belt_teeth=60)
    b = solve_drive("XL", 30, 12, belt_teeth=60)
    assert a.center_distance == pytest.approx(b.center_distance, abs=1e-9)
    assert a.wrap_angle == pytest.approx(b.wrap_angle)
    assert a.teeth_in_mesh == pytest.approx(b.teeth_in_mesh)
    assert b.ratio == pytest.approx(12 / 30)


def test_bad_drive_input():
    with pytest.raises(GeometryError) as exc:
        solve_drive("GT9", 20, 40, center=50.0)
    for name in ("MXL", "XL", "L", "H", "T2.5", "T5", "T10", "curv2", "curv3", "curv5"):
        assert name in str(exc.value)
    with pytest.raises(GeometryError, match="not both"):
        solve_drive("T5", 20, 40, center=50.0, belt_teeth=60)
    with pytest.raises(GeometryError, match="not both or neither"):
        solve_drive("T5", 20, 40)
    with pytest.raises(GeometryError):
        solve_drive("T5", 20, 40, belt_teeth=0)
    with pytest.raises(GeometryError):
        solve_drive("T5", 20, 40, belt_teeth=60, adjust_pct=-1)


def test_below_minimum_teeth_is_an_error_unless_forced():
    sol = solve_drive("H", 12, 30, belt_teeth=80)       # H minimum 14 (from memory)
    errs = [f for f in sol.findings if f.code == "below-min-teeth"]
    assert [f.severity for f in errs] == ["error"]
    sol = solve_drive("H", 12, 30, belt_teeth=80, force=True)
    assert [f.severity for f in sol.findings if f.code == "below-min-teeth"] == ["warning"]


def test_as_dict_is_json_ready():
    sol = solve_drive("curv3", 18, 36, center=80.0, stock=[100, 110, 120])
    d = json.loads(json.dumps(sol.as_dict()))
    for key in ("belt_length", "belt_teeth", "center_distance", "ratio", "wrap_angle",
                "teeth_in_mesh", "requested_length", "center_min", "center_max", "findings"):
        assert key in d
    assert d["belt_teeth"] == sol.belt_teeth
    assert d["belt_length"] == pytest.approx(3.0 * sol.belt_teeth)
