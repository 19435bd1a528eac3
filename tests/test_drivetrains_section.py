"""The ``drivetrains:`` section: chains of declared stages checked from motor to load.

Expected numbers are worked by hand in each test from the stage relations T_out = T_in·i·η,
ω_out = ω_in/i (power balance) and the straight-line motor n = n0 (1 − T/T_stall)
(computed), never read back from the function under test.
"""

import json

import pytest

from gen.check import check
from gen.cli import main

PAIR = """
trains:
  lift:
    module: 2
    parts:
      lift_pinion: {kind: spur_gear, teeth: 12, profile_shift: 0.4, face_width: 10, bore: 5}
      lift_wheel:  {kind: spur_gear, teeth: 30, profile_shift: 0.2, face_width: 10, bore: 8}
      lift_pinion_2: {kind: spur_gear, teeth: 15, profile_shift: 0.3, face_width: 12, bore: 8}
      lift_wheel_2:  {kind: spur_gear, teeth: 45, face_width: 12, bore: 8}
meshes:
  - parts: [lift_pinion, lift_wheel]
  - parts: [lift_pinion_2, lift_wheel_2]
"""


def _write(tmp_path, text):
    p = tmp_path / "dt.yaml"
    p.write_text(PAIR + text)
    return str(p)


def test_two_stage_chain_against_hand_computation(tmp_path):
    path = _write(tmp_path, """
drivetrains:
  lift_drive:
    motor: {stall_torque: 0.5, no_load_speed: 300}
    same_shaft: [[lift_wheel, lift_pinion_2]]
    stages:
      - {mesh: [lift_pinion, lift_wheel]}
      - {mesh: [lift_pinion_2, lift_wheel_2]}
    load: {torque: 2.0}
""")
    res = check([path])
    assert res.ok, [f.message for f in res.findings if f.severity == "error"]
    (d,) = res.drivetrains
    n = d.numbers
    # computed: i = 30/12 · 45/15 = 7.5, η = 0.98² (spur default, common practice)
    i, eta = 30 / 12 * 45 / 15, 0.98 ** 2
    assert n["total_ratio"] == pytest.approx(i, rel=1e-12)
    assert n["efficiency"] == pytest.approx(eta, rel=1e-12)
    t_motor = 2.0 / (i * eta)
    n_motor = 300 * (1 - t_motor / 0.5)
    assert n["motor_torque"] == pytest.approx(t_motor, rel=1e-9)
    assert n["motor_speed"] == pytest.approx(n_motor, rel=1e-9)
    assert n["output_speed"] == pytest.approx(n_motor / i, rel=1e-9)
    # the stage torques follow the chain: first stage out = T_m · 2.5 · 0.98
    s1, s2 = n["stages"]
    assert s1["torque_out"] == pytest.approx(t_motor * 2.5 * 0.98, rel=1e-9)
    assert s2["torque_in"] == pytest.approx(s1["torque_out"], rel=1e-12)


def test_gear_stage_margin_uses_the_mesh_rating(tmp_path):
    path = _write(tmp_path, """
drivetrains:
  lift_drive:
    motor: {stall_torque: 0.5, no_load_speed: 300}
    stages: [{mesh: [lift_pinion, lift_wheel]}]
    load: {torque: 1.0}
""")
    res = check([path])
    (d,) = res.drivetrains
    pin, wheel = res.models["lift_pinion"], res.models["lift_wheel"]
    # the allowable output torque is the smaller of the wheel's rating and the pinion's
    # rating times the ratio (each Lewis rating as the mesh check uses it)
    allow = min(wheel.rating()["rated_torque"], pin.rating()["rated_torque"] * 30 / 12)
    (s,) = d.numbers["stages"]
    assert s["margin"] == pytest.approx(allow / s["torque_out"], rel=1e-12)


def test_stalled_chain_is_an_error(tmp_path):
    path = _write(tmp_path, """
drivetrains:
  weak:
    motor: {stall_torque: 0.01, no_load_speed: 300}
    stages: [{mesh: [lift_pinion, lift_wheel]}, {ratio: 3, kind: belt}]
    load: {torque: 5.0}
""")
    res = check([path])
    codes = {f.code for f in res.findings if f.severity == "error"}
    assert codes == {"chain-stalls"}
    # computed: the most the chain moves is T_stall · i · η = 0.01 · 2.5 · 3 · 0.98 · 0.96
    assert res.drivetrains[0].numbers["move_limit"] == pytest.approx(
        0.01 * 2.5 * 3 * 0.98 * 0.96, rel=1e-12)


def test_unknown_mesh_and_disconnected_chain_are_refused(tmp_path):
    path = _write(tmp_path, """
drivetrains:
  ghost:
    motor: {stall_torque: 0.5, no_load_speed: 300}
    stages: [{mesh: [lift_pinion, nobody]}]
    load: {torque: 1}
  loose:
    motor: {stall_torque: 0.5, no_load_speed: 300}
    stages:
      - {mesh: [lift_pinion, lift_wheel]}
      - {mesh: [lift_pinion_2, lift_wheel_2]}
    load: {torque: 1}
""")
    res = check([path])
    errs = [f.message for f in res.findings if f.severity == "error"]
    assert len(errs) == 2
    assert "drive train 'ghost', key 'stages[0]': names unknown part 'nobody'" in errs[0]
    # lift_pinion_2 is not on lift_wheel's shaft (no same_shaft): two speeds on one shaft
    assert "drive train 'loose'" in errs[1] and "does not connect" in errs[1]


def test_differential_envelope_by_virtual_work(tmp_path):
    p = tmp_path / "wrist.yaml"
    p.write_text("""
assemblies:
  wrist:
    kind: bevel_differential
    module: 1.5
    input_teeth: 24
    output_teeth: 16
    face_width: 7
drivetrains:
  wrist_motors:
    differential: wrist
    motors: [{stall_torque: 0.2, no_load_speed: 100}, {stall_torque: 0.3, no_load_speed: 100}]
""")
    res = check([str(p)])
    (d,) = res.drivetrains
    # computed (virtual work): carrier = (θ1+θ2)/2 → pitch torque τ1 + τ2; roll =
    # (θ1−θ2)/2 · z_in/z_out → roll torque (τ1 − τ2)·z_out/z_in. Both motors at the smaller
    # stall torque 0.2 N·m: pitch 0.4 N·m; opposite: roll 0.4 · 16/24
    assert d.numbers["max_pitch"] == pytest.approx(0.4, rel=1e-12)
    assert d.numbers["max_roll"] == pytest.approx(0.4 * 16 / 24, rel=1e-12)


def test_check_prints_the_stage_table_and_json(tmp_path, capsys):
    path = _write(tmp_path, """
drivetrains:
  lift_drive:
    motor: {rated_torque: 0.3, rated_speed: 200}
    stages: [{mesh: [lift_pinion, lift_wheel]}]
    load: {torque: 0.5, speed: 50}
""")
    assert main(["check", path]) == 0
    out = capsys.readouterr().out
    assert "drive train lift_drive: ratio 2.5" in out
    assert "lift_pinion→lift_wheel" in out
    assert main(["check", "--json", path]) == 0
    doc = json.loads(capsys.readouterr().out)
    (d,) = doc["drivetrains"]
    assert d["total_ratio"] == pytest.approx(2.5)
    assert d["stages"][0]["kind"] == "spur"


SCREW = """
parts:
  mast_screw: {kind: lead_screw, thread: trapezoidal, diameter: 8, pitch: 2, starts: 1,
               length: 60, load: 50, free_length: 60}
  drive_pinion: {kind: spur_gear, module: 1, teeth: 15, profile_shift: 0.3, face_width: 6}
  drive_wheel: {kind: spur_gear, module: 1, teeth: 30, face_width: 6, bore: 8}
meshes:
  - parts: [drive_pinion, drive_wheel]
drivetrains:
  mast:
    motor: {stall_torque: 0.2, no_load_speed: 300}
    stages: [{mesh: [drive_pinion, drive_wheel]}, {screw: mast_screw}]
    load: {force: 50}
"""


def test_lead_screw_stage_against_shigley(tmp_path):
    p = tmp_path / "s.yaml"
    p.write_text(SCREW)
    res = check([str(p)])
    assert res.ok, [f.message for f in res.findings if f.severity == "error"]
    n = res.drivetrains[0].numbers
    assert n["linear"] and n["units"] == {"torque": "N", "speed": "mm/s"}
    # computed (Shigley, Mechanical Engineering Design §8-2, power screws, from memory):
    # Tr 8×2 single start: d2 = 7 mm, L = 2 mm, α = 15°, f from the part; thread efficiency
    # e = F L / (2π T_R) with T_R = F d2/2 (L + π f d2 sec α)/(π d2 − f L sec α)
    import math
    f = res.models["mast_screw"].sizes["friction"]
    d2, L, sec = 7.0, 2.0, 1 / math.cos(math.radians(15))
    TR = 50 * d2 / 2 / 1000 * (L + math.pi * f * d2 * sec) / (math.pi * d2 - f * L * sec)
    e = 50 * L / 1000 / (2 * math.pi * TR)
    assert n["efficiency"] == pytest.approx(0.98 * e, rel=1e-9)
    # i = 2 · 2π/L (rad per m): speed (mm/s) = n_motor / 2 / 60 · L
    assert n["output_speed"] == pytest.approx(n["motor_speed"] / 2 / 60 * L, rel=1e-9)
    # π f d2 sec α > L: self-locking, the load holds with the motor off
    assert math.pi * f * d2 * sec > L and n["hold_limit"] is None


def test_a_torque_load_after_a_screw_is_refused(tmp_path):
    p = tmp_path / "s.yaml"
    p.write_text(SCREW.replace("load: {force: 50}", "load: {torque: 1}"))
    res = check([str(p)])
    (err,) = [f for f in res.findings if f.severity == "error"]
    assert "key 'load.torque': after a screw or drum the load is a force (N)" in err.message


def test_belt_stage_margin_from_a_stated_tension_per_width(tmp_path):
    p = tmp_path / "b.yaml"
    p.write_text("""
parts:
  m_pulley: {kind: timing_pulley, profile: curv2, teeth: 20, belt_width: 6}
  d_pulley: {kind: timing_pulley, profile: curv2, teeth: 40, belt_width: 6}
drives:
  belt: {pulleys: [m_pulley, d_pulley], center_distance: 60}
drivetrains:
  belted:
    motor: {stall_torque: 0.5, no_load_speed: 300}
    stages: [{drive: belt, allowable_tension: 10}]
    load: {torque: 0.5}
""")
    res = check([str(p)])
    (s,) = res.drivetrains[0].numbers["stages"]
    # computed: r = 40 · 2 mm / (2π); allowable output torque = 10 N/mm · 6 mm · r
    r = 40 * 2 / (2 * 3.141592653589793)
    assert s["margin"] == pytest.approx(10 * 6 * r / 1000 / s["torque_out"], rel=1e-12)
