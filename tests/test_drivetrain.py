"""Drive-train stage math and the differential's pitch/roll torques.

Sources: the speed ratio of a gear pair i = z2/z1 and the power balance with a loss
T_out = T_in·i·η (common practice, any machine-design text); the straight-line DC-motor
characteristic T = T_s(1 − n/n_0) (common practice); kinetic-energy equivalence J/i² for
reflected inertia (common practice); virtual work for the differential (computed, and
recomputed here through the project's own kinematics in gen.geometry.differential, a module
this work did not write). Numbers are worked by hand from those relations ("computed") and
recomputed in the tests by a second route (power balance, energy) where one exists.
"""

import math

import pytest

from gen.errors import GeometryError
from gen.geometry.differential import input_commands
from gen.geometry.differential_torque import (input_torques, pitch_roll_torques,
                                              torque_envelope)
from gen.geometry.drivetrain import (DEFAULT_EFFICIENCY, CurveMotor, LineMotor, Load,
                                     RatedMotor, Stage, cable_drum, gear_stage, lead_screw,
                                     planetary_stage, solve_chain)

RPM = 2 * math.pi / 60


def test_default_efficiencies_are_the_stated_common_practice_values():
    # common practice figures stated in the brief and module text
    assert DEFAULT_EFFICIENCY == {"spur": 0.98, "belt": 0.96, "bevel": 0.97,
                                  "planetary": 0.97, "drum": 1.0}
    with pytest.raises(GeometryError, match="needs its efficiency"):
        solve_chain(LineMotor(1, 100), [Stage("leadscrew", 1000.0)], Load(10))


def test_two_stage_spur_train_operating_point():
    # 12→36 then 15→45: i = 3·3 = 9, η = 0.98² = 0.9604 (computed)
    motor = LineMotor(stall_torque=0.5, no_load_speed=3000)
    stages = [gear_stage(12, 36), gear_stage(15, 45)]
    res = solve_chain(motor, stages, Load(torque=2.0, inertia=0.01))
    assert res.total_ratio == pytest.approx(9.0, rel=1e-12)
    assert res.efficiency == pytest.approx(0.9604, rel=1e-12)
    # by hand: T_m = 2/(9·0.9604) = 0.231385 N·m; n = 3000(1 − T_m/0.5) = 1611.69 rpm
    assert res.motor_torque == pytest.approx(0.231385, abs=1e-6)
    assert res.motor_speed == pytest.approx(1611.69, abs=0.01)
    assert res.output_speed == pytest.approx(1611.69 / 9, abs=0.01)
    # second route, power balance: P_out = η·P_motor (rel 1e-12: float round-off only)
    p_motor = res.motor_torque * res.motor_speed * RPM
    p_out = res.output_torque * res.output_speed * RPM
    assert p_out == pytest.approx(0.9604 * p_motor, rel=1e-12)
    assert res.output_torque == pytest.approx(2.0, rel=1e-12)
    # stage by stage: the middle shaft turns at n/3 with T_m·3·0.98
    s1, s2 = res.stages
    assert s1.speed_out == pytest.approx(res.motor_speed / 3) == s2.speed_in
    assert s1.torque_out == pytest.approx(res.motor_torque * 3 * 0.98) == s2.torque_in
    # reflected inertia 0.01/81 kg·m² (computed); energy route: ½Jω² equal on both sides
    assert res.reflected_inertia == pytest.approx(0.01 / 81, rel=1e-12)
    w_out = 100.0
    assert 0.5 * res.reflected_inertia * (9 * w_out) ** 2 == pytest.approx(0.5 * 0.01 * w_out**2)
    # stall: 0.5·9·0.9604 = 4.3218 N·m moved from standstill; held: 0.5·9/0.9604 (computed)
    assert res.move_limit == pytest.approx(4.3218, rel=1e-12)
    assert res.hold_limit == pytest.approx(0.5 * 9 / 0.9604, rel=1e-12)
    assert res.moves


def test_belt_then_gear_to_a_cable_drum():
    # belt 20→40 (i 2, η 0.96), spur 12→48 (i 4, η 0.98), drum Ø40 mm (i = 1/0.02 m = 50 rad/m)
    # lifting 50 N at 20 mm/s (computed by hand below)
    motor = LineMotor(stall_torque=0.4, no_load_speed=2000)
    stages = [gear_stage(20, 40, kind="belt", name="belt", allowable=0.5),
              gear_stage(12, 48, name="gears", allowable=2.0),
              cable_drum(40.0, name="drum", allowable=200.0)]
    res = solve_chain(motor, stages, Load(torque=50.0, speed=20.0, inertia=3.0))
    assert res.linear
    assert res.total_ratio == pytest.approx(2 * 4 * 50)
    assert res.efficiency == pytest.approx(0.96 * 0.98)
    t_m = 50.0 / (400 * 0.9408)                       # 0.132866 N·m
    assert t_m == pytest.approx(0.132866, abs=1e-6)
    assert res.motor_torque == pytest.approx(t_m, rel=1e-12)
    n_m = 2000 * (1 - t_m / 0.4)
    assert res.motor_speed == pytest.approx(n_m, rel=1e-12)
    # travel speed: ω_m / i · 1000 mm/s (computed); a second route through the drum surface
    # speed: drum rpm · π·40 mm / 60
    assert res.output_speed == pytest.approx(n_m / 8 * math.pi * 40 / 60, rel=1e-12)
    belt, gears, drum = res.stages
    assert belt.torque_out == pytest.approx(t_m * 2 * 0.96)
    assert gears.torque_out == pytest.approx(t_m * 2 * 0.96 * 4 * 0.98)
    # drum torque × radius back to a force: F = T_drum / 0.02 m
    assert drum.torque_out == pytest.approx(gears.torque_out / 0.02) == pytest.approx(50.0)
    # reflected mass: m/i² = 3/400² kg·m² (computed)
    assert res.reflected_inertia == pytest.approx(3.0 / 400**2)
    # at stall the motor gives 0.4 N·m: belt output 0.768 N·m against 0.5 allowed → margin
    # 0.651, the weakest (gears 2.0/2.949 = 0.678, drum 200/150.5 = 1.33) (computed)
    assert res.weakest == "belt"
    assert res.weakest_margin == pytest.approx(0.5 / (0.4 * 2 * 0.96), rel=1e-12)
    assert gears.margin_stall == pytest.approx(2.0 / (0.4 * 8 * 0.9408), rel=1e-12)
    # largest force moved at 20 mm/s: motor speed 20/1000·400 rad/s → rpm, torque from the line
    n_need = 20 / 1000 * 400 / RPM
    assert res.move_limit_at_speed == pytest.approx(0.4 * (1 - n_need / 2000) * 400 * 0.9408)


def test_lead_screw_self_locking_holds_anything():
    # Tr 8×2 lead screw at 35 % efficiency, self-locking (back efficiency ≤ 0): F = T·2π/L·η
    motor = RatedMotor(rated_torque=0.3, rated_speed=600)
    res = solve_chain(motor, [lead_screw(2.0, 0.35, back_efficiency=0.0)], Load(torque=200.0))
    assert res.motor_torque == pytest.approx(200 * 0.002 / (2 * math.pi * 0.35))
    assert res.motor_speed == 600 and res.output_speed == pytest.approx(600 / 60 * 2.0)
    assert res.hold_limit == math.inf
    assert res.move_limit == pytest.approx(0.3 * 2 * math.pi / 0.002 * 0.35)


def test_bevel_stage_and_force_at_radius():
    # 20 N on a 50 mm arm = 1 N·m; a 16→32 bevel pair (i 2, η 0.97 common practice) (computed)
    load = Load.force_at_radius(20.0, 50.0)
    assert load.torque == pytest.approx(1.0)
    res = solve_chain(LineMotor(1.0, 100), [gear_stage(16, 32, kind="bevel")], load)
    assert res.motor_torque == pytest.approx(1.0 / (2 * 0.97))


def test_too_heavy_load_does_not_move():
    res = solve_chain(LineMotor(0.1, 1000), [gear_stage(10, 30)], Load(torque=1.0))
    assert not res.moves and res.motor_speed == 0.0 and res.output_speed == 0.0
    assert res.output_torque == pytest.approx(0.1 * 3 * 0.98)      # stall, short of 1 N·m


def test_curve_motor_matches_its_straight_line_and_interpolates():
    line = LineMotor(0.8, 1200)
    curve = CurveMotor((0, 1200), (0.8, 0.0))
    for t in (0.0, 0.2, 0.55, 0.8):
        assert curve.speed_for(t) == pytest.approx(line.speed_for(t), rel=1e-12)
    # a stepper-like curve: flat 0.5 to 300 rpm, then down to 0.1 at 1500 rpm
    step = CurveMotor((0, 300, 1500), (0.5, 0.5, 0.1))
    assert step.speed_for(0.3) == pytest.approx(300 + (0.5 - 0.3) / 0.4 * 1200)
    assert step.speed_for(0.6) is None and step.torque_at(2000) == 0.0
    res = solve_chain(step, [planetary_stage(12, 48)], Load(torque=0.3 * 5 * 0.97))
    # Willis, ring held: i = 1 + 48/12 = 5 (from memory; computed)
    assert res.total_ratio == pytest.approx(5.0)
    assert res.motor_speed == pytest.approx(900.0)


def test_chain_that_does_not_connect_is_refused_in_plain_words():
    a = gear_stage(12, 36, name="first", input_shaft="motor", output_shaft="idler")
    b = gear_stage(15, 45, name="second", input_shaft="output", output_shaft="arm")
    with pytest.raises(GeometryError) as exc:
        solve_chain(LineMotor(1, 100), [a, b], Load(1.0), motor_shaft="motor")
    msg = str(exc.value)
    assert "second does not connect" in msg and "'idler'" in msg and "'output'" in msg
    with pytest.raises(GeometryError, match="starts on shaft 'x'"):
        solve_chain(LineMotor(1, 100), [gear_stage(10, 20, input_shaft="x")], Load(1.0),
                    motor_shaft="motor")
    with pytest.raises(GeometryError, match="must be the last stage"):
        solve_chain(LineMotor(1, 100), [cable_drum(30), gear_stage(10, 20)], Load(1.0))
    with pytest.raises(GeometryError, match="efficiency must be in"):
        solve_chain(LineMotor(1, 100), [gear_stage(10, 20, efficiency=1.2)], Load(1.0))
    # connected names pass
    b_ok = gear_stage(15, 45, name="second", input_shaft="idler")
    assert solve_chain(LineMotor(1, 100), [a, b_ok], Load(1.0), motor_shaft="motor").moves


def _virtual_work(tau1, tau2, z_in, z_out, eps=1e-6):
    """(τp, τr) by virtual work through the project's kinematics: the work of the inputs over a
    small pitch-only, then roll-only move, divided by that move (computed)."""
    out = []
    for dp, dr in ((eps, 0.0), (0.0, eps)):
        d1, d2 = input_commands(dp, dr, z_in, z_out)
        out.append((tau1 * d1 + tau2 * d2) / eps)
    return tuple(out)


@pytest.mark.parametrize("z_in,z_out", [(24, 16), (20, 20), (18, 30)])
def test_differential_equal_and_opposite_motor_torques(z_in, z_out):
    k = z_out / z_in
    # equal torques: all pitch, no roll; opposite torques: all roll (virtual work, computed)
    p, r = pitch_roll_torques(0.4, 0.4, z_in, z_out)
    assert (p, r) == (pytest.approx(0.8), pytest.approx(0.0, abs=1e-15))
    p, r = pitch_roll_torques(0.4, -0.4, z_in, z_out)
    assert p == pytest.approx(0.0, abs=1e-15) and r == pytest.approx(0.8 * k)
    for t1, t2 in ((0.4, 0.4), (0.4, -0.4), (0.3, -0.1)):
        vw = _virtual_work(t1, t2, z_in, z_out)
        assert pitch_roll_torques(t1, t2, z_in, z_out) == pytest.approx(vw, rel=1e-9)
        assert input_torques(*vw, z_in, z_out) == pytest.approx((t1, t2), rel=1e-9)


def test_differential_envelope():
    # two 0.3 N·m motors through 2:1 belts (the wrist's 24/16 bevels), η 0.9: inputs 0.6 N·m;
    # pitch 2·0.9·0.6 = 1.08 N·m, roll 2·0.9·(16/24)·0.6 = 0.72 N·m (computed)
    env = torque_envelope(0.3, 0.3, 24, 16, input_ratio=2.0, efficiency=0.9)
    assert env.max_pitch == pytest.approx(1.08) and env.max_roll == pytest.approx(0.72)
    assert env.corners[0] == pytest.approx([1.08, 0.0], abs=1e-12)
    assert env.corners[1] == pytest.approx([0.0, 0.72], abs=1e-12)
    assert env.holds(1.08, 0.0) and env.holds(0.54, 0.36) and not env.holds(0.6, 0.4)
    # unequal motors: the weaker sets both axis limits
    env2 = torque_envelope(0.5, 0.2, 20, 20)
    assert env2.max_pitch == pytest.approx(0.4) and env2.max_roll == pytest.approx(0.4)
    assert env2.holds(0.7, 0.3) and not env2.holds(0.71, 0.3)
