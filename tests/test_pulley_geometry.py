"""Timing pulley profiles, sizes and toothed outlines, measured on the polygon."""

import math

import numpy as np
import pytest
from shapely.geometry import Polygon

from gen.errors import GeometryError
from gen.geometry.pulley import PROFILES, lookup_profile, pulley_loop, pulley_sizes
from gen.geometry.section import signed_area
from gen.validate import measure
from gen.validate.pulley_checks import measure_pulley, pulley_findings

INCH = 25.4
CHORD = 0.005


# Pitch and a per side: ISO 5296 (from memory); DIN 7721 (from memory, medium
# confidence; curvilinear: common practice).
@pytest.mark.parametrize("name,p,a", [
    ("MXL", 2.032, 0.254), ("XL", 5.080, 0.254), ("L", 9.525, 0.381), ("H", 12.700, 0.686),
    ("T2.5", 2.5, 0.3), ("T5", 5.0, 0.5), ("T10", 10.0, 1.0),
    ("curv2", 2.0, 0.254), ("curv3", 3.0, 0.381), ("curv5", 5.0, 0.5715)])
def test_profile_table(name, p, a):
    prof = lookup_profile(name.lower())
    assert prof is lookup_profile(name.upper()) is PROFILES[name.swapcase()]
    assert prof.name == name
    assert prof.pitch == p and prof.differential == a
    assert prof.min_teeth >= 10
    assert any(w in prof.note for w in ("from memory", "common practice", "doc"))


def test_unknown_profile_lists_valid_names():
    with pytest.raises(GeometryError) as exc:
        lookup_profile("S3X")
    for name in PROFILES:
        assert name in str(exc.value)
    assert "s3x" not in PROFILES and "t5" in PROFILES


# Pulley catalog sizes in inch (from memory, trade catalog tables): XL 10 teeth PD 0.637 /
# OD 0.617 in; H 14 teeth PD 2.228 / OD 2.174 in; L 10 teeth PD 1.194 / OD 1.164 in.
# 2 mm round-tooth, 20 teeth: PD 12.73 / OD 12.22 mm (common practice). T5 10 teeth:
# dp 15.92 / do 14.92 mm (computed by hand from dp = z·p/π, do = dp − 2a).
@pytest.mark.parametrize("name,z,pd,od,tol", [
    ("XL", 10, 0.637 * INCH, 0.617 * INCH, 0.0006 * INCH),
    ("H", 14, 2.228 * INCH, 2.174 * INCH, 0.0006 * INCH),
    ("L", 10, 1.194 * INCH, 1.164 * INCH, 0.0006 * INCH),
    ("curv2", 20, 12.73, 12.22, 0.006),
    ("T5", 10, 15.92, 14.92, 0.006)])
def test_pitch_and_outside_diameter(name, z, pd, od, tol):
    s = pulley_sizes(name, z)
    assert s.pitch_diameter == pytest.approx(pd, abs=tol)
    assert s.outside_diameter == pytest.approx(od, abs=tol)
    # pitch circle carries z pitches (ISO 5288 definition, computed)
    assert math.pi * s.pitch_diameter == pytest.approx(z * s.pitch, rel=1e-12)
    assert s.root_diameter == pytest.approx(s.outside_diameter - 2 * s.groove_depth)


def test_fit_allowance_sizes():
    s = pulley_sizes("T5", 20, fit_allowance=0.1)
    assert s.fit_outside_diameter == pytest.approx(s.outside_diameter - 0.2)
    assert s.fit_root_diameter == pytest.approx(s.root_diameter - 0.2)
    with pytest.raises(GeometryError):
        pulley_sizes("T5", 2)
    with pytest.raises(GeometryError):
        pulley_sizes("T5", 12.5)


def _sample(prof):
    zs = {prof.min_teeth, prof.min_teeth + 1, prof.min_teeth + 7, 40, 97, 150}
    return sorted(zs)


@pytest.mark.parametrize("name", list(PROFILES))
def test_outline_measures_like_formula(name):
    prof = PROFILES[name]
    for z in _sample(prof):
        loop = pulley_loop(name, z)
        assert loop.gaps() < 1e-12
        poly = loop.polygon(CHORD)
        assert signed_area(poly) > 0                      # counter-clockwise
        assert Polygon(poly).is_valid
        s = pulley_sizes(name, z)
        m = measure_pulley(poly)
        assert m.groove_count == z
        assert measure.tooth_count(poly) == z             # lands = grooves
        assert m.outside_diameter == pytest.approx(s.outside_diameter, abs=1e-9)
        assert m.groove_depth == pytest.approx(prof.groove.depth, abs=1e-9)
        assert m.pitch_spread < 1e-9
        # groove 0 is centred on +X: its bottom point sits on the axis at the root radius
        r = measure.radii(poly)
        i = int(np.argmin(np.abs(np.arctan2(poly[:, 1], poly[:, 0]))))
        assert poly[i, 1] == pytest.approx(0.0, abs=1e-12)
        assert r[i] == pytest.approx(s.root_diameter / 2.0, abs=1e-12)
        assert not [f for f in pulley_findings(name, z, loop) if f.severity == "error"]


@pytest.mark.parametrize("name", list(PROFILES))
def test_outline_builds_min_to_150_teeth(name):
    # every tooth count from the minimum to 150, with and without a fit allowance; the
    # builder raises on any overlap of fillets or grooves, so building is the check
    prof = PROFILES[name]
    for z in range(prof.min_teeth, 151):
        for f in (0.0, 0.1):
            loop = pulley_loop(name, z, f)
            assert len(loop.curves) >= 3 * z


@pytest.mark.parametrize("name,z", [("T10", 30), ("MXL", 25), ("curv3", 24)])
def test_fit_allowance_opens_the_gap(name, z):
    # inward offset by f: on a circle through the straight flanks the land (material) chord
    # shrinks by about 2 f / cos γ (γ the flank angle), the rim by 2 f (computed)
    prof = PROFILES[name]
    f = 0.1
    s = pulley_sizes(name, z)
    g = prof.groove
    # a radius on the straight flank part, clear of both fillets
    R = s.root_diameter / 2.0 + 0.55 * g.depth
    base = measure.chordal_thickness(pulley_loop(name, z).polygon(0.001), R)
    fit_loop = pulley_loop(name, z, f)
    fitted = measure.chordal_thickness(fit_loop.polygon(0.001), R)
    assert len(base) == len(fitted) == z
    expected = 2.0 * f / math.cos(g.flank_angle)
    assert np.mean(base - fitted) == pytest.approx(expected, rel=0.03)
    m = measure_pulley(fit_loop.polygon(CHORD))
    assert m.outside_diameter == pytest.approx(s.outside_diameter - 2 * f, abs=1e-9)
    assert m.groove_depth == pytest.approx(g.depth, abs=1e-9)
    assert not [x for x in pulley_findings(name, z, fit_loop, f) if x.severity == "error"]


def test_findings_below_minimum_and_mismatch():
    prof = PROFILES["T10"]
    z = prof.min_teeth - 1
    loop = pulley_loop("T10", z)
    codes = {f.code: f.severity for f in pulley_findings("T10", z, loop)}
    assert codes["below-min-teeth"] == "error"
    codes = {f.code: f.severity for f in pulley_findings("T10", z, loop, force=True)}
    assert codes["below-min-teeth"] == "warning"
    # an outline for 21 teeth checked as a 20-tooth pulley: count and diameter disagree
    codes = {f.code for f in pulley_findings("T5", 20, pulley_loop("T5", 21))
             if f.severity == "error"}
    assert {"groove-count", "outside-diameter"} <= codes
    # the wrong allowance shows up as a diameter error
    codes = {f.code for f in pulley_findings("T5", 20, pulley_loop("T5", 20, 0.2), 0.0)
             if f.severity == "error"}
    assert codes == {"outside-diameter"}


def test_grooves_that_cannot_fit_raise():
    with pytest.raises(GeometryError, match="rim"):
        pulley_loop("MXL", 10, fit_allowance=0.3)
