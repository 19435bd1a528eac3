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

# ISO 5288 definitions (doc): dp = z p / π, do = dp − 2a; a per side: MXL, XL, L from ISO 5296
# (from memory), T5, T2.5 from DIN 7721 (from memory), the curvilinear pitches common practice
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


def _open_belt_length(dp1, dp2, c):
    """Open belt pitch length, exact: L = 2C cos φ + π(D + d)/2 + φ(D − d),
    φ = asin((D − d)/(2C)) (belt-drive geometry, from memory)."""
    phi = math.asin((max(dp1, dp2) - min(dp1, dp2)) / (2 * c))
    return 2 * c * math.cos(phi) + math.pi * (dp1 + dp2) / 2 + phi * abs(dp2 - dp1)


def _teeth_in_mesh(z1, dp1, dp2, c):
    """z1 θ / 360 with the wrap θ = 180° − 2φ on the small pulley (from memory)."""
    phi = math.degrees(math.asin(abs(dp2 - dp1) / (2 * c)))
    return z1 * (180.0 - 2 * phi) / 360.0


def test_drive_reference_cases(write_yaml):
    # 2 mm pitch, 20/60 teeth, C 40 → L 164.088 mm (computed, recomputed here by the exact
    # open-belt formula): a belt of 82 teeth (164 mm)
    dp = [z * 2.0 / math.pi for z in (20, 60)]
    assert _open_belt_length(*dp, 40.0) == pytest.approx(164.088, abs=1e-3)
    res = check([write_yaml(DRIVES % ("curv2", 20, 60, "center_distance: 40"))])
    sol = res.drives[0]["solution"]
    assert sol.requested_length == pytest.approx(_open_belt_length(*dp, 40.0), abs=1e-9)
    assert sol.belt_teeth == 82
    # 5 mm pitch, 15/45, C 60 → L 279.631 mm, so a 56-tooth (280 mm) belt; the center that
    # belt sets, by bisection on the same formula, leaves 5.55 teeth in mesh on the small
    # pulley (computed): under the 6 of common practice, a warning about the drive
    dp = [z * 5.0 / math.pi for z in (15, 45)]
    lo, hi = 50.0, 70.0
    for _ in range(100):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if _open_belt_length(*dp, mid) < 280.0 else (lo, mid)
    assert _teeth_in_mesh(15, *dp, lo) == pytest.approx(5.55, abs=5e-3)
    res = check([write_yaml(DRIVES % ("curv5", 15, 45, "center_distance: 60"))])
    sol = res.drives[0]["solution"]
    assert sol.center_distance == pytest.approx(lo, abs=1e-6)
    assert sol.teeth_in_mesh == pytest.approx(_teeth_in_mesh(15, *dp, lo), abs=1e-6)
    found = {(f.severity, f.code, f.scope, f.subject) for f in res.findings}
    assert ("warning", "few-teeth-in-mesh", "drive", "d") in found
    assert not [f for f in res.findings if f.severity == "error"]


# Each bad input is refused with exactly these error findings (code, key). Expected values:
# curv2 (2 mm, a 0.254, groove depth 0.75 mm; common practice): z 20 → root radius
# (12.732 − 0.508 − 1.5)/2 = 5.362 mm, z 16 → 4.089 mm (computed), so bores of radius 6 and
# 4.5 mm reach the groove root; MXL z 6 is under the 10 teeth of the profile's minimum and its
# root radius is ~1 mm (computed); a 14 mm hub around a 12 mm bore leaves 1 mm of wall, under
# 1.5 mm (common practice); a 20/40 curv2 drive needs C > (12.732 + 25.465)/2 = 19.099 mm
# (computed) for the pitch circles not to touch. Parameter errors carry the key in the message.
BAD = [
    (PULLEYS % ("GT9", 20), {("parameter", "")}, ["key 'profile'", "MXL", "curv2"]),
    (PULLEYS % ("MXL", 6), {("below-min-teeth", "teeth"), ("bore-too-big", "bore")}, []),
    (DRIVES % ("curv2", 20, 40, "center_distance: 10"), {("parameter", "")},
     ["drive 'd'", "key 'center_distance'", "%.3f" % ((20 + 40) * 2.0 / math.pi / 2)]),
    ("parts:\n  a: {kind: timing_pulley, profile: curv2, teeth: 20, belt_width: 6, bore: 12,"
     " hub: {diameter: 14, length: 6}}\n", {("bore-too-big", "bore"), ("bore-too-big-for-hub", "hub")}, []),
    ("parts:\n  a: {kind: timing_pulley, profile: curv2, teeth: 16, belt_width: 6, bore: 9}\n",
     {("bore-too-big", "bore")}, []),
    ("parts:\n  a: {kind: timing_pulley, profile: curv2, teeth: 20, belt_width: 6, set_screw: {size: M3}}\n",
     {("set-screw-needs-hub", "set_screw")}, []),
]


@pytest.mark.parametrize("text,errors,words", BAD)
def test_pulley_and_drive_bad_input(text, errors, words, write_yaml, capsys):
    path = write_yaml(text)
    got = [f for f in check([path]).findings if f.severity == "error"]
    assert {(f.code, f.key) for f in got} == errors
    if words:
        assert any(all(w in f.message for w in words) for f in got), [f.message for f in got]
    # and the command line refuses it, printing one ERR line per error
    assert main(["check", path]) == 1
    out = capsys.readouterr()
    assert len([ln for ln in (out.out + out.err).splitlines() if "ERR" in ln]) == len(got)
