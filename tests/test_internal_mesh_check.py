"""A declared mesh of a pinion inside a ring gear through `check`: numbers, the internal
interferences as findings, hands, the sweep and the strength estimate."""

import json
import math

import pytest

from gen.check import check

A20 = math.radians(20.0)

PAIR = """parts:
  pin: {{kind: {pkind}, module: 1.5, teeth: {z1}, face_width: 10, backlash_allowance: 0.15{pextra}}}
  ring: {{kind: ring_gear, module: 1.5, teeth: {z2}, face_width: 10, rim_thickness: 5,
          backlash_allowance: 0.15{rextra}}}
meshes:
  inner: {{parts: [pin, ring]{mextra}}}
"""


def run(write_yaml, z1=18, z2=48, pkind="spur_gear", pextra="", rextra="", mextra=""):
    res = check([write_yaml(PAIR.format(z1=z1, z2=z2, pkind=pkind, pextra=pextra,
                                        rextra=rextra, mextra=mextra))])
    codes = {f.code: f for f in res.findings if f.scope == "mesh"}
    errors = [f for f in res.findings if f.severity == "error"]
    return res, codes, errors


def test_numbers_of_a_clean_internal_mesh(write_yaml):
    res, codes, errors = run(write_yaml)
    assert not errors, [e.message for e in errors]
    n = res.pairs[0]["numbers"]
    # standard internal pair: a = m (z2 − z1)/2 = 1.5·30/2 = 22.5 mm, α_w = α (ISO 21771,
    # from memory; computed)
    assert n["working_center_distance"] == pytest.approx(22.5, abs=1e-9)
    assert n["working_pressure_angle"] == pytest.approx(20.0, abs=1e-9)
    # ε_α of an internal pair from the line of action (any gear handbook, from memory):
    # [√(r_a1² − r_b1²) − √(r_a2² − r_b2²) + a sin α] / (π m cos α)  (computed here)
    m, z1, z2 = 1.5, 18, 48
    ra1, rb1 = m * (z1 + 2) / 2, m * z1 * math.cos(A20) / 2
    ra2, rb2 = m * (z2 - 2 * (1 - 0.2)) / 2, m * z2 * math.cos(A20) / 2   # ring k = 0.2 default
    eps = (math.sqrt(ra1**2 - rb1**2) - math.sqrt(ra2**2 - rb2**2) + 22.5 * math.sin(A20)) \
        / (math.pi * m * math.cos(A20))
    assert n["contact_ratio"] == pytest.approx(eps, abs=1e-9)
    # backlash from thinning alone at a_w: (Δs1 + Δs2) = 0.3 mm circumferential (computed)
    assert n["backlash_circumferential"] == pytest.approx(0.3, abs=1e-9)
    # the swept outlines agree with the formula (outline error budget 1e-3 mm per flank pair)
    assert n["swept_backlash"] == pytest.approx(0.3, abs=2e-3)
    # tip clearances: r_f2 − C − r_a1 = 37.875 − 22.5 − 15 = 0.375 mm (computed)
    assert n["tip_clearance"] == pytest.approx(0.375, abs=1e-9)
    assert n["internal"] is True and n["radial_assembly"] is True
    assert "mesh-sweep" in codes and "teeth-interfere" not in codes


def test_full_ring_tips_give_involute_interference(write_yaml):
    # ring tips unshortened: the tip circle must reach no further in than the interference
    # point √(r_b2² + (a sin α)²) (gear handbooks, from memory): 33.829.. vs r_a2 = 34.5 (computed)
    res, codes, errors = run(write_yaml, rextra=", tip_shortening: 0")
    rb2 = 1.5 * 48 * math.cos(A20) / 2
    need = math.hypot(rb2, 22.5 * math.sin(A20))
    assert 1.5 * 46 / 2 < need   # the case really is inside (computed)
    assert "involute-interference" in codes and codes["involute-interference"].severity == "error"
    assert f"{2 * need:.3f}" in codes["involute-interference"].message


def test_small_tooth_difference_gives_trochoid_interference(write_yaml):
    # 20 in 24 (difference 4): far below the 8–9 the tip-circle condition needs for 20°
    # full-depth rings (gear handbooks, from memory); the sweep finds the overlap as well
    res, codes, errors = run(write_yaml, z1=20, z2=24)
    assert "teeth-interfere" in codes and codes["teeth-interfere"].severity == "error"
    assert "tooth-difference" in codes
    # (the ring's tips lie inside its base circle here, so the tip-circle condition is
    # reported as not evaluable rather than failed)
    assert "trochoid-interference" in codes and "ring-tip-inside-base" in codes
    # 34 in 40: the tip-circle condition (which leaves backlash out) fails
    res, codes, errors = run(write_yaml, z1=34, z2=40)
    assert codes["trochoid-interference"].severity == "error"
    # and a safe difference is free of both
    res, codes, errors = run(write_yaml, z1=28, z2=40)
    assert "trochoid-interference" not in codes and "teeth-interfere" not in codes


def test_internal_helical_pair_needs_the_same_hand(write_yaml):
    same = run(write_yaml, pkind="helical_gear", pextra=", helix_angle: 20, hand: right",
               rextra=", helix_angle: 20, hand: right")
    assert not same[2], [e.message for e in same[2]]
    # overlap ratio b sin β/(π m_n) = 10 sin 20°/(1.5π) (ISO 21771, from memory; computed)
    assert same[0].pairs[0]["numbers"]["overlap_ratio"] == pytest.approx(
        10 * math.sin(math.radians(20)) / (1.5 * math.pi), abs=1e-9)
    opposite = run(write_yaml, pkind="helical_gear", pextra=", helix_angle: 20, hand: left",
                   rextra=", helix_angle: 20, hand: right")
    assert "internal-hand" in opposite[1]


def test_torque_rates_both_members(write_yaml):
    res, codes, errors = run(write_yaml, mextra=", torque: 0.2")
    msgs = [f.message for f in res.findings if f.code.startswith("strength")]
    assert any(m.startswith("pin:") for m in msgs) and any(m.startswith("ring:") for m in msgs)
    # the ring carries the torque scaled by z2/z1 = 48/18 (computed)
    ring_msg = next(m for m in msgs if m.startswith("ring:"))
    assert f"{0.2 * 48 / 18:.3g}" in ring_msg


def test_check_json_lists_the_internal_mesh(write_yaml, capsys):
    from gen.cli import main

    main(["check", "--json", write_yaml(PAIR.format(z1=18, z2=48, pkind="spur_gear",
                                                    pextra="", rextra="", mextra=""))])
    doc = json.loads(capsys.readouterr().out)
    mesh = doc["meshes"][0]
    assert mesh["status"] == "ok" and mesh["internal"] is True
    assert mesh["center_distance"] == pytest.approx(22.5)
