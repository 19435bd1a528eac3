"""timing_pulley parts and declared belt drives through the pipeline; STL measurements."""

import math

import numpy as np
import pytest
import trimesh

from gen.cli import main
from gen.check import check

PULLEYS = """parts:
  a: {kind: timing_pulley, profile: %s, teeth: %d, belt_width: 6, bore: 5, hub: {diameter: 16, length: 6}, set_screw: {size: M3}}
"""

# ISO 5288 definitions (doc): dp = z p / π, do = dp − 2a; a per side from ISO 5296 / DIN 7721
# (from memory) and common practice for the curvilinear pitches (shared references)
CASES = [("MXL", 20, 2.032, 0.254), ("XL", 15, 5.080, 0.254), ("L", 12, 9.525, 0.381),
         ("T5", 20, 5.0, 0.5), ("T2.5", 24, 2.5, 0.3), ("curv2", 20, 2.0, 0.254),
         ("curv3", 30, 3.0, 0.381), ("curv5", 24, 5.0, 0.5715)]


@pytest.mark.parametrize("profile,z,p,a", CASES)
def test_pulley_sizes_in_manifest(profile, z, p, a, write_yaml):
    res = check([write_yaml(PULLEYS % (profile, z))])
    assert res.ok, [f.message for f in res.findings]
    s = res.models["a"].sizes
    assert s["pitch_diameter"] == pytest.approx(z * p / math.pi, abs=1e-9)
    assert s["outside_diameter"] == pytest.approx(z * p / math.pi - 2 * a, abs=1e-9)


@pytest.mark.parametrize("profile,z,p,a", [CASES[1], CASES[5]])
def test_pulley_stl_measures_outside_diameter_and_grooves(profile, z, p, a, tmp_path, write_yaml):
    out = tmp_path / "o"
    assert main(["build", write_yaml(PULLEYS % (profile, z)), "--out", str(out), "--format", "stl"]) == 0
    mesh = trimesh.load(out / "a.stl")
    assert mesh.is_watertight
    assert mesh.bounds[0][2] == pytest.approx(0.0, abs=1e-6)
    from gen.triangles.prism import slice_polygons
    from gen.validate.pulley_checks import measure_pulley

    z_mid = 6 + 1.0 + (6 + 1.0) / 2  # hub, flange, half the toothed band
    got = measure_pulley(max(slice_polygons(mesh, z_mid), key=len))
    do = z * p / math.pi - 2 * a
    assert got.outside_diameter == pytest.approx(do, abs=0.02)
    assert got.groove_count == z


def test_set_screw_hole_goes_through_the_hub(write_yaml):
    from gen.triangles.prism import body_triangles

    with_screw = check([write_yaml(PULLEYS % ("curv2", 20))]).models["a"]
    plain = check([write_yaml((PULLEYS % ("curv2", 20)).replace(", set_screw: {size: M3}", ""))]).models["a"]
    removed = body_triangles(plain.shape).volume - body_triangles(with_screw.shape).volume
    # an M3 tap-drill hole (2.5 mm, from memory) through the wall from the 5 mm bore to the
    # 16 mm hub: π r² (8 − 2.5) mm³, ends curved (within 5 %; computed)
    expected = math.pi * 1.25**2 * (8.0 - 2.5)
    assert removed == pytest.approx(expected, rel=0.05)


DRIVES = """drives:
  d: {profile: %s, teeth: [%d, %d], %s}
"""


def test_drive_reference_cases(write_yaml):
    # shared references (computed): 2 mm pitch, 20/60 teeth, C 40 → L 164.088 mm, wrap
    # 142.88°, 7.94 teeth in mesh; 5 mm pitch, 15/45, C 60 → 5.55 in mesh (warning < 6,
    # common practice)
    res = check([write_yaml(DRIVES % ("curv2", 20, 60, "center_distance: 40"))])
    sol = res.drives[0]["solution"]
    assert sol.requested_length == pytest.approx(164.088, abs=1e-3)
    assert sol.belt_teeth == 82
    res = check([write_yaml(DRIVES % ("curv5", 15, 45, "center_distance: 60"))])
    assert any(f.code.startswith("teeth-in-mesh") or "mesh" in f.message for f in res.findings
               if f.severity == "warning")


@pytest.mark.parametrize("text,words", [
    (PULLEYS % ("GT9", 20), ["profile", "MXL", "curv2"]),
    (PULLEYS % ("MXL", 6), ["teeth", "minimum"]),
    (DRIVES % ("curv2", 20, 40, "center_distance: 10"), ["center_distance", "d"]),
    ("parts:\n  a: {kind: timing_pulley, profile: curv2, teeth: 20, belt_width: 6, bore: 12,"
     " hub: {diameter: 14, length: 6}}\n", ["hub", "bore"]),
    ("parts:\n  a: {kind: timing_pulley, profile: curv2, teeth: 16, belt_width: 6, bore: 9}\n",
     ["bore", "groove root"]),
    ("parts:\n  a: {kind: timing_pulley, profile: curv2, teeth: 20, belt_width: 6, set_screw: {size: M3}}\n",
     ["set_screw", "hub"]),
])
def test_pulley_and_drive_bad_input(text, words, write_yaml, capsys):
    path = write_yaml(text)
    assert main(["check", path]) == 1
    out = capsys.readouterr()
    lines = [ln for ln in (out.out + out.err).splitlines() if "ERR" in ln]
    assert any(all(w in ln for w in words) for ln in lines), out.out + out.err
