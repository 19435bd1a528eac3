"""Issue 11 items 11 and 14: rattling pairs, torque without speed, belts off their tensioner."""

import math

import pytest

from gen.check.project import check
from gen.findings import WARNING
from gen.validate.pair_checks import iso_min_backlash

PAIR = """parts:
  p: {kind: spur_gear, module: 1, teeth: 20, face_width: 6}
  w: {kind: spur_gear, module: 1, teeth: 40, face_width: 6}
meshes:
  - parts: [p, w]
%s"""

RACK = """parts:
  p: {kind: spur_gear, module: 1, teeth: 20, face_width: 6}
  r: {kind: rack, module: 1, teeth: 12, face_width: 6, height: 8}
meshes:
  - parts: [p, r]
%s"""


def _found(path, code):
    res = check([path])
    return [f for f in res.findings if f.code == code], res


def test_pair_moved_out_rattles_and_says_how_far_to_move(write_yaml):
    # a = m (z1 + z2)/2 = 30 mm (ISO 21771, computed); +0.6 mm gives j_n ≈ 2 Δa sin α
    # = 0.410 mm (ISO/TR 10064-2 relation, from memory), above the default maximum
    # 2 × 0.1 + 2 × j_bn,min with j_bn,min = (2/3)(0.06 + 0.0005 a + 0.03 m) = 0.070 mm
    # (ISO/TR 10064-2, from memory), i.e. 0.341 mm
    a, a_w, alpha = 30.0, 30.6, math.radians(20)
    inv = lambda t: math.tan(t) - t
    alpha_w = math.acos(a * math.cos(alpha) / a_w)          # cos α_w = a cos α / a' (ISO 21771)
    # circumferential backlash on the working circles, no thinning: j_wt = p_w − s_w1 − s_w2,
    # s_w = d_w (s/d + inv α − inv α_w), s = π m / 2 (ISO 21771, computed); j_n = j_wt cos α_w
    dw1, dw2 = 2 * a_w * 20 / 60, 2 * a_w * 40 / 60
    s_w = lambda dw, d: dw * ((math.pi / 2) / d + inv(alpha) - inv(alpha_w))
    j_wt = math.pi * dw1 / 20 - s_w(dw1, 20.0) - s_w(dw2, 40.0)
    jn = j_wt * math.cos(alpha_w)
    assert jn == pytest.approx(2 * 0.6 * math.sin(alpha), rel=0.1)   # first-order relation
    jmax = 2 * 0.1 + 2 * (2 / 3) * (0.06 + 0.0005 * a_w + 0.03 * 1)
    assert jn > jmax + 0.03                       # the case is clearly over the limit
    hits, _ = _found(write_yaml(PAIR % "    center_distance: 30.6\n"), "backlash-high")
    assert len(hits) == 1 and hits[0].severity == WARNING
    assert hits[0].key == "center_distance"
    assert "rattle" in hits[0].message
    # the move: Δa = Δj_n / (2 sin α_w) (first order, ISO/TR 10064-2 relation)
    least = (jn - jmax) / (2 * math.sin(alpha_w))
    got = float(hits[0].message.split("in by at least ")[1].split(" mm")[0])
    assert got == pytest.approx(least, abs=2e-3)


def test_pair_at_working_distance_does_not_rattle(write_yaml):
    hits, res = _found(write_yaml(PAIR % ""), "backlash-high")
    assert hits == [] and res.ok


def test_max_backlash_key_overrides_the_default(write_yaml):
    # +0.2 mm: j_n ≈ 0.137 mm, under the default maximum; a max_backlash of 0.1 mm flags it
    hits, _ = _found(write_yaml(PAIR % "    center_distance: 30.2\n"), "backlash-high")
    assert hits == []
    hits, _ = _found(write_yaml(PAIR % "    center_distance: 30.2\n    max_backlash: 0.1\n"),
                     "backlash-high")
    assert len(hits) == 1 and "max_backlash" in hits[0].message


def test_rack_too_far_out_rattles(write_yaml):
    # datum line at r_p = 10 mm; 0.8 mm further out opens j_n = 2 · 0.8 · sin 20° = 0.547 mm
    # (rack flanks are straight: exact, common practice)
    hits, _ = _found(write_yaml(RACK % "    center_distance: 10.8\n"), "backlash-high")
    assert len(hits) == 1
    least = (2 * 0.8 * math.sin(math.radians(20)) - (0.2 + 2 * iso_min_backlash(10.8, 1.0))) \
        / (2 * math.sin(math.radians(20)))
    got = float(hits[0].message.split("in by at least ")[1].split(" mm")[0])
    assert got == pytest.approx(least, abs=2e-3)


def test_torque_without_speed_warns_rated_at_rest(write_yaml):
    hits, _ = _found(write_yaml(PAIR % "    torque: 0.1\n"), "rated-at-rest")
    assert len(hits) == 1 and hits[0].severity == WARNING and hits[0].key == "speed"
    hits, _ = _found(write_yaml(PAIR % "    torque: 0.1\n    speed: 60\n"), "rated-at-rest")
    assert hits == []


def _belt_C(L, D, d):
    # open belt, exact: L = 2 C cos φ + π (D + d)/2 + φ (D − d), sin φ = (D − d)/(2C)
    # (belt-drive geometry, common practice); solved here by bisection
    lo, hi = (D - d) / 2 + 1e-9, 10 * L
    for _ in range(200):
        C = 0.5 * (lo + hi)
        phi = math.asin((D - d) / (2 * C))
        if 2 * C * math.cos(phi) + math.pi * (D + d) / 2 + phi * (D - d) < L:
            lo = C
        else:
            hi = C
    return C


def test_stocked_belt_outside_the_tensioner_range_warns(write_yaml):
    # curv2: 2 mm pitch, 20/40 teeth → pitch diameters 40/π and 80/π mm (pitch × z / π).
    # At C 60 mm the belt is L = 2 C cos φ + π (D + d)/2 + φ (D − d) ≈ 180.7 mm ≈ 90.3 teeth:
    # a stocked 80-tooth belt moves the center far outside ±1 % of its length (the default
    # tensioner travel), a 90-tooth one stays inside.
    D, d = 80 / math.pi, 40 / math.pi
    phi = math.asin((D - d) / 120)
    L60 = 120 * math.cos(phi) + math.pi * (D + d) / 2 + phi * (D - d)
    assert round(L60 / 2) == 90
    C80, C90 = _belt_C(160.0, D, d), _belt_C(180.0, D, d)
    assert not _belt_C(160 * 0.99, D, d) <= 60 <= _belt_C(160 * 1.01, D, d)
    assert _belt_C(180 * 0.99, D, d) <= 60 <= _belt_C(180 * 1.01, D, d)
    text = ("drives:\n  b: {profile: curv2, teeth: [20, 40], center_distance: 60, "
            "stock: [%s]}\n")
    hits, _ = _found(write_yaml(text % "80"), "center-moved")
    assert len(hits) == 1 and hits[0].severity == WARNING and hits[0].key == "stock"
    assert f"{C80:.3f}" in hits[0].message
    hits, _ = _found(write_yaml(text % "90"), "center-moved")
    assert hits and all(f.severity != WARNING for f in hits)
    assert f"{C90:.3f}" in hits[0].message
