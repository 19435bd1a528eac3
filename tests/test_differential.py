"""Bevel differential: kinematics, placement, tooth phase and interference."""

import functools
import math

import numpy as np
import pytest
from shapely.geometry import Point, Polygon

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.bevel import bevel_tooth_outline_3d
from gen.geometry.differential import (apply, bevel_differential, carrier_and_roll, gear_poses,
                                       input_commands, mesh_residual, pitch_point, rot_z)
from gen.tolerances import TOL
from gen.validate import measure
from gen.validate.bevel_interference import (differential_clearance, differential_findings,
                                             interference_findings)
from gen.findings import ERROR

RACK = basic_rack("A")


def test_kinematics_worked_example_and_round_trip():
    # worked by hand (computed): θ1 = 30°, θ2 = 10°, z_in 20, z_out 10 → carrier 20°,
    # roll (30° − 10°)/2 · 2 = 20°
    c, roll = carrier_and_roll(math.radians(30), math.radians(10), 20, 10)
    assert math.degrees(c) == pytest.approx(20.0) and math.degrees(roll) == pytest.approx(20.0)
    rng = np.random.default_rng(3)
    for zi, zo in ((20, 20), (24, 16), (13, 31)):
        for c, roll in rng.uniform(-4, 4, size=(10, 2)):
            t1, t2 = input_commands(c, roll, zi, zo)
            assert carrier_and_roll(t1, t2, zi, zo) == pytest.approx((c, roll), abs=1e-12)


def test_one_to_one_case():
    # miter differential (common practice): equal inputs → pure pitch, opposite → pure roll
    assert carrier_and_roll(0.7, 0.7, 16, 16) == pytest.approx((0.7, 0.0))
    assert carrier_and_roll(0.7, -0.7, 16, 16) == pytest.approx((0.0, 0.7))
    assert input_commands(0.0, 0.7, 16, 16) == pytest.approx((0.7, -0.7))


def _pose_rates(diff, t1, t2, w1, w2, h=1e-6):
    a = gear_poses(diff, t1, t2)
    b = gear_poses(diff, t1 + h * w1, t2 + h * w2)
    return a, b, h


@pytest.mark.parametrize("zi,zo", [(20, 20), (24, 16), (15, 25)])
def test_pitch_points_roll_without_slip(zi, zo):
    # independent of the formulas: finite differences of the poses give the velocity of the
    # pitch point as a point of each gear; pitch cones roll, so both must agree
    diff = bevel_differential(zi, zo, 2.0, 6.0, RACK)
    for t1, t2, w1, w2 in ((0.0, 0.0, 1.0, 0.0), (0.4, -1.1, 0.3, 2.0), (2.0, 0.5, -1.0, 1.0)):
        pa, pb, h = _pose_rates(diff, t1, t2, w1, w2)
        for a, b in diff.meshes:
            P = pitch_point(pa[a], diff.sizes_of(a), pa[b], diff.sizes_of(b))
            vel = []
            for n in (a, b):
                local = np.linalg.solve(pa[n][:3, :3], P - pa[n][:3, 3])
                vel.append((apply(pb[n], local[None, :])[0] - P) / h)
            assert np.linalg.norm(vel[0] - vel[1]) < 1e-4 * (1 + np.linalg.norm(vel[0]))
            assert abs(mesh_residual(pa[a], diff.sizes_of(a).z, pa[b], diff.sizes_of(b).z, P)) < 1e-9


def test_sign_conventions_of_carrier_and_roll():
    diff = bevel_differential(20, 20, 2.0, 6.0, RACK)
    c = 0.3
    poses = gear_poses(diff, c, c)  # equal inputs: carrier turns c about +X, no roll
    out = -poses["output_1"][:3, 2]  # from the apex toward output_1
    assert np.allclose(out, [0.0, -math.sin(c), math.cos(c)], atol=1e-12)
    # pure roll of 0.2 rad: output_1 turns about its outward carrier axis (right-hand rule)
    rest = gear_poses(diff, 0.0, 0.0)["output_1"][:3, :3]
    t1, t2 = input_commands(0.0, 0.2, 20, 20)
    rolled = gear_poses(diff, t1, t2)["output_1"][:3, :3]
    rel = rolled @ rest.T
    axis = np.array([rel[2, 1] - rel[1, 2], rel[0, 2] - rel[2, 0], rel[1, 0] - rel[0, 1]])
    angle = math.atan2(np.linalg.norm(axis) / 2, (np.trace(rel) - 1) / 2)
    assert angle == pytest.approx(0.2)
    assert np.allclose(axis / np.linalg.norm(axis), [0, 0, 1])  # outward axis at carrier 0
    # an output turned off its kinematic angle breaks the mesh: the residual sees it
    P = gear_poses(diff, t1, t2)
    off = np.eye(4)
    off[:3, :3] = rot_z(0.05)
    pp = pitch_point(P["input_1"], diff.input, P["output_1"], diff.output)
    assert abs(mesh_residual(P["input_1"], 20, P["output_1"] @ off, 20, pp)) == pytest.approx(
        0.05 * 20 / (2 * math.pi), rel=1e-9)


def test_placement_common_apex_and_axes():
    diff = bevel_differential(24, 16, 2.0, 8.0, RACK)
    poses = gear_poses(diff, 0.2, -0.5)
    for name, T in poses.items():
        s = diff.sizes_of(name)
        assert np.allclose(apply(T, np.array([[0.0, 0.0, s.mounting_distance]])), 0.0, atol=1e-12)
        assert np.allclose(T[:3, :3].T @ T[:3, :3], np.eye(3), atol=1e-12)
        assert np.linalg.det(T[:3, :3]) == pytest.approx(1.0)
    assert np.allclose(poses["input_1"][:3, 2], [1, 0, 0]) and np.allclose(poses["input_2"][:3, 2], [-1, 0, 0])
    assert abs(poses["output_1"][:3, 2] @ poses["input_1"][:3, 2]) < 1e-12
    assert np.allclose(poses["output_1"][:3, 2], -poses["output_2"][:3, 2])


@functools.lru_cache(maxsize=None)
def _outline(sizes):
    return bevel_tooth_outline_3d(sizes)


def _centre_offset(sizes, T, P, material: bool) -> float:
    """Angle from P to the middle of the tooth (material) or space containing it, measured on
    the gear's own large-end pitch circle section (own frame)."""
    o = _outline(sizes)
    q = np.linalg.solve(T[:3, :3], P - T[:3, 3])
    zP = sizes.mounting_distance - sizes.Re * math.cos(sizes.delta)
    assert q[2] == pytest.approx(zP, abs=1e-9)
    poly = o.on_plane(zP).polygon(TOL.chord)
    inside = Polygon(poly).contains(Point(q[0], q[1]))
    assert inside == material
    arcs = measure.material_arcs(poly, sizes.de / 2)
    beta = math.atan2(q[1], q[0])
    if material:
        mids = arcs[:, 0] + arcs[:, 1] / 2
    else:
        mids = arcs[:, 0] + arcs[:, 1] + (2 * math.pi / sizes.z - arcs[:, 1]) / 2
    d = (mids - beta + math.pi) % (2 * math.pi) - math.pi
    return float(np.min(np.abs(d)))


@pytest.mark.parametrize("zi,zo", [(20, 20), (17, 12)])
def test_tooth_enters_space_on_every_mesh(zi, zo):
    diff = bevel_differential(zi, zo, 2.0, 5.0, RACK)
    poses = gear_poses(diff, 0.0, 0.0)
    for a, b in diff.meshes:
        P = pitch_point(poses[a], diff.sizes_of(a), poses[b], diff.sizes_of(b))
        # one gear has a tooth centred on P, the other a space centred on it
        tooth_a = _has_tooth(diff, poses, a, P)
        assert _centre_offset(diff.sizes_of(a), poses[a], P, material=tooth_a) < 1e-6
        assert _centre_offset(diff.sizes_of(b), poses[b], P, material=not tooth_a) < 1e-6


def _has_tooth(diff, poses, name, P) -> bool:
    s = diff.sizes_of(name)
    o = _outline(s)
    q = np.linalg.solve(poses[name][:3, :3], P - poses[name][:3, 3])
    zP = s.mounting_distance - s.Re * math.cos(s.delta)
    return Polygon(o.on_plane(zP).polygon(TOL.chord)).contains(Point(q[0], q[1]))


def test_interference_clear_at_right_mounting_distance():
    diff = bevel_differential(20, 20, 2.0, 7.0, RACK)
    reports = differential_clearance(diff, steps=4)
    assert len(reports) == 4
    for r in reports:
        assert r.overlap_area == 0.0 and r.apex_offset < 1e-9
        assert r.min_clearance < 0.01  # zero-backlash teeth touch
    assert not any(f.severity == ERROR for f in interference_findings(reports, 2.0))


def test_interference_reports_designed_backlash():
    diff = bevel_differential(24, 16, 2.0, 7.0, RACK, thinning=0.1)
    reports, found = differential_findings(diff, steps=3)
    # gap per side at the large end (computed): (0.1 + 0.1)·cos 20° / 2 = 0.094 mm, scaled by
    # R/Re on the smallest check sphere
    r = reports[0]
    expect = 0.5 * 0.2 * math.cos(math.radians(20)) * min(r.radii) / diff.input.Re
    assert r.min_clearance == pytest.approx(expect, rel=0.03)
    assert {f.code for f in found} == {"bevel-clearance"}


@pytest.mark.parametrize("shift,code", [(0.6, "bevel-overlap"), (-0.6, "apex-offset")])
def test_wrong_mounting_distance_is_an_error(shift, code):
    # output_1 moved 0.3 m along its axis, toward the apex (jams) or away (apex off)
    diff = bevel_differential(20, 20, 2.0, 7.0, RACK)
    reports = differential_clearance(diff, steps=4, axial_shift={"output_1": shift})
    found = interference_findings(reports, 2.0)
    bad = {(f.code, f.message.split(":")[0]) for f in found if f.severity == ERROR}
    assert (code, "input_1/output_1") in bad and (code, "input_2/output_1") in bad
    assert not any(n.endswith("output_2") for _, n in bad)


def test_single_output_differential():
    diff = bevel_differential(18, 12, 1.5, 5.0, RACK, outputs=1)
    assert diff.names == ("input_1", "input_2", "output_1")
    assert diff.meshes == (("input_1", "output_1"), ("input_2", "output_1"))
    reports = differential_clearance(diff, steps=2)
    assert [r.pair for r in reports] == list(diff.meshes)
    assert not any(f.severity == ERROR for f in interference_findings(reports, 1.5))
    with pytest.raises(GeometryError, match="one or two"):
        bevel_differential(18, 12, 1.5, 5.0, RACK, outputs=3)
