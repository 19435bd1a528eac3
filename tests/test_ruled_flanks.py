"""Involute flanks of twisted prisms meshed along their straight lines
(gen/triangles/ruled_flanks.py): the involute is recognised, the lines are straight on the
exact surface, and the zipped patches are sound. The meshes' distance from the exact
surface is measured densely in tests/test_prism_mesh.py."""

from __future__ import annotations

import math

import numpy as np
import pytest

from gen.geometry.basic_rack import basic_rack
from gen.geometry.body import Prism, gear_twist
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.gear_outline import gear_loop
from gen.geometry.generate import generate_flank
from gen.geometry.section import Section, Spline
from gen.triangles.ruled_flanks import (INVOLUTE_FIT, involute_params, involute_points,
                                        level_rolls, roll, zip_patch)

BETA = math.radians(30)


@pytest.fixture(scope="module")
def gear24():
    rk = basic_rack("A")
    sz = gear_sizes(24, 2.0, rk, x=0.2, beta=BETA)
    return gear_loop(generate_flank(24, sz.rp, cutter_for(sz, rk), sz.ra)), sz


def test_involute_flanks_are_recognised(gear24):
    loop, sz = gear24
    # base radius r_b = r_p cos α_t, tan α_t = tan α_n / cos β (ISO 21771, computed)
    rb_want = sz.rp * math.cos(math.atan(math.tan(math.radians(20)) / math.cos(BETA)))
    found = [(c, involute_params(c)) for c in loop.curves if isinstance(c, Spline)]
    inv = [(c, p) for c, p in found if p is not None]
    assert len(inv) == 2 * 24                        # the involute piece of every flank
    assert len(found) - len(inv) == 2 * 24           # the trochoidal roots are not involutes
    assert {p[1] for _, p in inv} == {1.0, -1.0}     # the two flanks run opposite ways
    for c, (rb, eps, a0) in inv:
        assert rb == pytest.approx(rb_want, rel=1e-9)
        pts = c.exact.at(np.linspace(0.0, 1.0, 17))
        back = involute_points(roll(pts, rb), rb, eps, a0)
        assert np.max(np.hypot(*(back - pts).T)) <= INVOLUTE_FIT


def test_lines_of_the_twisted_flank_are_straight(gear24):
    # s = t + ε κ (z − z_a) constant: the exact surface points along it are collinear
    loop, sz = gear24
    pr = Prism(Section(loop), 0.0, 12.0, twist=gear_twist(BETA, sz.rp))
    c = next(c for c in loop.curves if isinstance(c, Spline) and involute_params(c))
    rb, eps, a0 = involute_params(c)
    kappa = pr.twist
    t_mid = float(np.mean(roll(c.exact.at(np.array([0.3, 0.7])), rb)))
    z = np.linspace(0.0, 3.0, 7)
    t = t_mid - eps * kappa * z
    p = involute_points(t, rb, eps, a0)
    q = np.column_stack([pr.place(p[i:i + 1], zi)[0] for i, zi in enumerate(z)]).T
    pts = np.column_stack([q, z])
    d = pts[-1] - pts[0]
    off = np.cross(pts - pts[0], d) / np.linalg.norm(d)
    assert np.max(np.linalg.norm(off, axis=1)) < 1e-9
    # and the other sign of the roll change is not a line (the check can fail)
    t_bad = t_mid + eps * kappa * z
    p = involute_points(t_bad, rb, eps, a0)
    q = np.column_stack([pr.place(p[i:i + 1], zi)[0] for i, zi in enumerate(z)]).T
    pts = np.column_stack([q, z])
    d = pts[-1] - pts[0]
    assert np.max(np.linalg.norm(np.cross(pts - pts[0], d), axis=1)) / np.linalg.norm(d) > 1e-3


def test_level_rolls_hold_the_images_of_both_neighbours():
    inner = np.array([0.2, 0.3, 0.4])
    lv = level_rolls(inner, (0.1, 0.5), [0.05, -0.05], merge=0.01)   # a chevron's two stages
    assert len(lv) == 3
    for j, d in enumerate([0.05, -0.05]):
        lo, hi = lv[j], lv[j + 1]
        for t in lo:                          # every bottom roll, moved up, is a top roll
            if 0.11 < t - d < 0.49:
                assert np.min(np.abs(hi - (t - d))) < 1e-12
        for t in hi:
            if 0.11 < t + d < 0.49:
                assert np.min(np.abs(lo - (t + d))) < 1e-12
    assert np.allclose(lv[0], lv[2])          # the chevron's ends agree


def test_zipped_patch_covers_the_parallelogram_once():
    # a parallelogram in (s, z): bottom 0…1 at z 0, top 0.3…1.3 at z 1, uneven vertices
    bottom = np.array([0.0, 0.2, 0.55, 1.0])
    right = np.array([0.25, 0.5, 0.75, 1.0])      # heights on the side s = 1 + 0.3 z
    top = np.array([0.9, 0.6, 0.3])                # back along the top, to the corner 0.3
    left = np.array([0.5])                         # down the side s = 0.3 z
    s = np.concatenate([bottom, 1.0 + 0.3 * right, top, 0.3 * left])
    z = np.concatenate([np.zeros(4), right, np.ones(3), left])
    tris = zip_patch(s, z, 1.0)
    a = ((s[tris[:, 1]] - s[tris[:, 0]]) * (z[tris[:, 2]] - z[tris[:, 0]])
         - (s[tris[:, 2]] - s[tris[:, 0]]) * (z[tris[:, 1]] - z[tris[:, 0]])) / 2.0
    assert np.all(a > 0)                            # counter-clockwise, none degenerate
    assert a.sum() == pytest.approx(1.0)            # the parallelogram's area (base × height)
    assert len(tris) == len(s) - 2                  # a triangulation of a convex polygon
    edges = np.sort(np.concatenate([tris[:, [0, 1]], tris[:, [1, 2]], tris[:, [2, 0]]]), axis=1)
    _, count = np.unique(edges, axis=0, return_counts=True)
    assert count.max() == 2                         # no edge used by three triangles


def test_helical_ring_flanks_found_on_samples_and_walls_keep_tol():
    # a ring gear's generated flanks carry samples only: the involute is found on them
    # (r_b = r_p cos α_t, ISO 21771, computed), and the ruled walls keep the tolerance
    from test_prism_mesh import wall_deviation

    from gen.api import make
    from gen.triangles.prism import prism_triangles

    part = make("ring_gear", module=1.5, teeth=48, face_width=12, helix_angle=20,
                rim_thickness=6)
    pr = part.shape.solids[0]
    hole = pr.section.holes[0]
    found = [involute_params(c) for c in hole.curves if isinstance(c, Spline)]
    found = [p for p in found if p is not None]
    rp = 1.5 * 48 / math.cos(math.radians(20)) / 2.0
    rb = rp * math.cos(math.atan(math.tan(math.radians(20)) / math.cos(math.radians(20))))
    assert len(found) == 2 * 48
    assert all(p[0] == pytest.approx(rb, rel=1e-7) for p in found)
    m = prism_triangles(pr, tol=0.01)
    assert m.is_watertight and m.is_winding_consistent
    d = wall_deviation(m, pr, [pr.section.outer, hole], k=4)
    assert d.max() + 1e-4 <= 0.01


@pytest.mark.parametrize("flip", [False, True])
def test_zipped_patch_when_least_and_most_s_are_neighbours(flip):
    # a quadrilateral whose least-s and most-s vertices share an edge: one chain is that edge
    s = np.array([0.0, 1.0, 0.7, 0.3])
    z = np.array([0.0, 0.0, 1.0, 1.0])
    if flip:
        s, z = s[::-1].copy(), z[::-1].copy()
    tris = zip_patch(s, z, 1.0)
    a = ((s[tris[:, 1]] - s[tris[:, 0]]) * (z[tris[:, 2]] - z[tris[:, 0]])
         - (s[tris[:, 2]] - s[tris[:, 0]]) * (z[tris[:, 1]] - z[tris[:, 0]])) / 2.0
    assert len(tris) == 2 and np.all(a > 0)
    assert a.sum() == pytest.approx(0.7)             # trapezoid: (1 + 0.4) / 2 × 1
