"""Bevel differential assembly through the pipeline: kinematics, placement check, outputs."""

import json
import math

import pytest

from gen.cli import main
from gen.pipeline import check

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
    assert errors and any("overlap" in f.message or "apex" in f.message for f in errors)


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
