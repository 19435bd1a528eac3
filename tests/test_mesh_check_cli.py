"""`pitchline check` on declared meshes: the JSON numbers and refusal of a binding pair."""

import json

import pytest

from gen.cli import main

PAIR = """parts:
  p: {kind: spur_gear, module: 2, teeth: 12, profile_shift: 0.4, face_width: 8}
  w: {kind: spur_gear, module: 2, teeth: 30, profile_shift: 0.2, face_width: 8}
meshes:
  - parts: [p, w]
%s"""


def test_json_numbers_for_the_shifted_pair(write_yaml, capsys):
    # ISO 21771 (from memory) inv αw and aw = a cos α / cos αw; contact ratio from the line of
    # action (from memory): m 2, z 12/30, x 0.4/0.2 → aw 43.100 mm, αw 23.693°,
    # εα 1.395 without tip shortening (these gears keep da = d + 2m(1 + x)) (computed)
    assert main(["check", write_yaml(PAIR % ""), "--json"]) == 0
    mesh = json.loads(capsys.readouterr().out)["meshes"][0]
    for key in ("center_distance", "working_pressure_angle", "contact_ratio",
                "backlash_normal", "min_clearance", "overlap_area", "status"):
        assert key in mesh
    assert mesh["center_distance"] == pytest.approx(43.100, abs=5e-4)
    assert mesh["working_pressure_angle"] == pytest.approx(23.693, abs=5e-4)
    assert mesh["contact_ratio"] == pytest.approx(1.395, abs=5e-4)
    assert mesh["overlap_area"] == 0.0 and mesh["status"] == "ok"


def test_pair_too_close_is_refused_with_the_clearing_distance(write_yaml, capsys):
    # 0.3 m = 0.6 mm closer than aw: the real outlines overlap in the sweep
    assert main(["check", write_yaml(PAIR % "    center_distance: 42.5\n")]) == 1
    out = capsys.readouterr().out
    line = next(ln for ln in out.splitlines() if "ERR" in ln and "overlap" in ln)
    assert "clear at a center distance of" in line


def test_pair_moved_out_reports_more_backlash(write_yaml, capsys):
    # jn = 2 Δa sin α for a small center-distance increase (ISO/TR 10064-2 relation, from
    # memory); the exact involute value differs by the second-order term (< 2 % here)
    assert main(["check", write_yaml(PAIR % "    center_distance: 43.2\n"), "--json"]) == 0
    mesh = json.loads(capsys.readouterr().out)["meshes"][0]
    assert main(["check", write_yaml(PAIR % ""), "--json"]) == 0
    base = json.loads(capsys.readouterr().out)["meshes"][0]
    import math
    jn = mesh["backlash_normal"] - base["backlash_normal"]
    assert jn == pytest.approx(2 * 0.1 * math.sin(math.radians(23.693)), rel=0.02)


def test_table_says_whether_the_tip_shortening_is_applied(tmp_path, capsys):
    # ISO 21771: the shifted pair z 12/30, x +0.4/+0.2, m 2 has k = x1 + x2 − y = 0.05
    # (computed: y = (43.100 − 42)/2 = 0.55); a * marks a k the gears do not apply
    from gen.cli import main

    text = """
trains:
  t:
    module: 2
    parts:
      a: {kind: spur_gear, teeth: 12, profile_shift: 0.4, face_width: 8%s}
      b: {kind: spur_gear, teeth: 30, profile_shift: 0.2, face_width: 8%s}
meshes:
  - parts: [a, b]
"""
    for extra, mark in (("", "0.050*"), (", tip_shortening: auto", "0.050 ")):
        p = tmp_path / "k.yaml"
        p.write_text(text % (extra, extra))
        main(["check", str(p)])
        row = next(line for line in capsys.readouterr().out.splitlines() if "a+b" in line)
        assert mark in row + " ", row
