"""Bevel differential assembly through the pipeline: kinematics, placement check, outputs."""

import json
import math

import pytest

from gen.cli import main
from gen.check import check

WRIST = """assemblies:
  wrist:
    kind: bevel_differential
    module: 1.5
    input_teeth: 20
    output_teeth: 20
    outputs: {outputs}
    face_width: 6
    backlash_allowance: 0.05
    input_bore: 5
    output_bore: 4
    command: {{pitch: 30, roll: 45}}
{extra}"""


def test_kinematics_round_trip_and_miter_case(write_yaml):
    res = check([write_yaml(WRIST.format(outputs=1, extra=""))])
    assert res.ok, [f.message for f in res.findings if f.severity == "error"]
    k = res.assemblies[0].kinematics
    # carrier = (θ1 + θ2)/2, roll = (θ1 − θ2)/2 · z_in/z_out (differential kinematics,
    # common practice); 1:1 gears: θ1 = pitch + roll, θ2 = pitch − roll
    assert k["command"]["theta1"] == pytest.approx(75.0)
    assert k["command"]["theta2"] == pytest.approx(-15.0)
    from gen.geometry.differential import carrier_and_roll, input_commands

    for zi, zo in ((20, 20), (24, 16), (30, 12)):
        t1, t2 = input_commands(0.3, -0.7, zi, zo)
        assert carrier_and_roll(t1, t2, zi, zo) == pytest.approx((0.3, -0.7))


def test_placed_gears_clear_and_wrong_mounting_is_an_error(write_yaml):
    ok = check([write_yaml(WRIST.format(outputs=2, extra=""))])
    assert ok.ok
    gaps = [r.min_clearance for r in ok.assemblies[0].reports]
    assert len(gaps) == 4 and min(gaps) > 0
    # the frame puts the output gears' back faces 0.3 m too close to the apex
    bad = check([write_yaml(WRIST.format(outputs=1, extra="    output_mounting_error: -0.45\n"))])
    errors = [f for f in bad.findings if f.severity == "error"]
    # both input gears mesh the misplaced output: each pair's apexes sit the mounting error
    # apart, 0.45 mm (computed: the output slides along its own axis, which runs through the
    # common apex), over the placement limit, and the teeth then overlap
    assert {(f.code, f.scope, f.subject, f.key) for f in errors} == {
        ("apex-offset", "assembly", "wrist", "output_mounting_error"),
        ("bevel-overlap", "assembly", "wrist", "output_mounting_error")}
    assert len(errors) == 4
    apex = [f for f in errors if f.code == "apex-offset"]
    assert {f.message.split(":")[0] for f in apex} == {"input_1/output_1", "input_2/output_1"}
    assert all("0.450 mm apart" in f.message for f in apex)


def test_assembly_outputs(tmp_path, write_yaml):
    out = tmp_path / "out"
    assert main(["build", write_yaml(WRIST.format(outputs=1, extra="")), "--out", str(out)]) == 0
    man = json.load(open(out / "manifest.json"))
    gear = man["parts"]["wrist_input_1"]
    # miter pair: δ = 45°, Re = de/(2 sin δ) = 30/(2 sin 45°) = 21.213 mm (ISO 23509, computed)
    assert gear["sizes"]["pitch_cone_angle"] == pytest.approx(45.0)
    assert gear["sizes"]["outer_cone_distance"] == pytest.approx(30 / (2 * math.sin(math.pi / 4)))
    assert gear["sizes"]["mounting_distance"] > 0
    import cadquery as cq
    import trimesh

    shape = cq.importers.importStep(str(out / "wrist.step"))
    solids = shape.solids().vals()
    assert len(solids) == 3 and all(s.isValid() for s in solids)
    text = (out / "wrist.step").read_text(errors="ignore")
    for name in ("wrist_input_1", "wrist_input_2", "wrist_output_1"):
        assert name in text
    # printable STL per gear, laid on its back face
    mesh = trimesh.load(out / "wrist_output_1.stl")
    assert mesh.is_watertight and mesh.bounds[0][2] == pytest.approx(0.0, abs=1e-6)
    # outer (tip) diameter = de + 2 ha cos δ (ISO 23509 conventions, from memory)
    r = max(abs(mesh.bounds[0][0]), mesh.bounds[1][0])
    assert 2 * r == pytest.approx(30 + 2 * 1.5 * math.cos(math.pi / 4), abs=0.02)


def test_bevel_stl_tooth_height_scales_with_cone_distance(tmp_path, write_yaml):
    # straight bevel teeth taper to the apex: the tooth height at cone distance R is
    # h(R) = h(Re)·R/Re, so small end / large end = Ri/Re (ISO 23509 conventions, from memory)
    import numpy as np
    import trimesh

    text = "parts:\n  b: {kind: bevel_gear, module: 2, teeth: 20, mating_teeth: 40, face_width: 12}\n"
    out = tmp_path / "o"
    assert main(["build", write_yaml(text), "--out", str(out), "--format", "stl"]) == 0
    res = check([str(tmp_path / "parts.yaml")])
    s = res.models["b"].mate.sizes
    mesh = trimesh.load(out / "b.stl")
    v = mesh.vertices - [0.0, 0.0, s.mounting_distance]           # apex at the origin
    R = np.linalg.norm(v, axis=1)
    phi = np.arccos(np.clip(-v[:, 2] / R, -1, 1))                 # angle from the axis
    band = (phi > s.delta_f - 1e-6) & (phi < s.delta_a + 1e-6)    # between root and tip cones

    def height(r0):
        sel = band & (np.abs(R - r0) < 0.02 * s.Re)
        return float((phi[sel].max() - phi[sel].min()) * r0)

    h_large, h_small = height(s.Re - 0.03 * s.b), height(s.Ri + 0.03 * s.b)
    ratio = (s.Ri + 0.03 * s.b) / (s.Re - 0.03 * s.b)
    assert h_small / h_large == pytest.approx(ratio, rel=0.02)
    # large-end height = addendum + dedendum = 2.25 m (ISO 53 profile A, from memory)
    assert h_large == pytest.approx(2.25 * 2 * (s.Re - 0.03 * s.b) / s.Re, rel=0.03)


def test_placed_gear_meshes_do_not_overlap(tmp_path, write_yaml):
    # independent of the spherical-section check: intersect the exported gear meshes placed
    # by the assembly poses (manifold3d booleans); at rest and half a pitch on, nothing overlaps
    import math as _m

    import manifold3d as m3d
    import numpy as np
    import trimesh

    from gen.geometry.differential import gear_poses

    out = tmp_path / "o"
    assert main(["build", write_yaml(WRIST.format(outputs=1, extra="")), "--out", str(out),
                 "--format", "stl"]) == 0
    asm = check([str(tmp_path / "parts.yaml")]).assemblies[0]
    meshes = {g: trimesh.load(out / f"{p}.stl") for g, p in asm.parts.items()}

    def placed(g, T):
        m = meshes[g].copy()
        m.apply_transform(T)
        return m3d.Manifold(m3d.Mesh(np.asarray(m.vertices, np.float32), np.asarray(m.faces, np.uint32)))

    for t in (0.0, 0.5 * 2 * _m.pi / 20):
        poses = gear_poses(asm.detail, t, -t)
        out1 = placed("output_1", poses["output_1"])
        for g in ("input_1", "input_2"):
            inter = placed(g, poses[g]) ^ out1
            assert inter.volume() < 1e-3, (g, t, inter.volume())
    # and the same check does see an overlap when the output sits 0.3 m too deep
    poses = gear_poses(asm.detail, 0.0, 0.0, axial_shift={"output_1": 0.45})
    inter = placed("input_1", poses["input_1"]) ^ placed("output_1", poses["output_1"])
    assert inter.volume() > 0.05
