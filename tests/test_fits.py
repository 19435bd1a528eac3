"""Fit profiles: allowances applied to teeth, bores and grooves, and checked after compensation."""

import math

import pytest

from gen.check import check

TEXT = """fits:
  shop: {flank_clearance: 0.08, hole_allowance: 0.25, outline_offset: 0.05, min_feature: 0.8}
parts:
  plain: {kind: spur_gear, module: 2, teeth: 20, face_width: 8, bore: 5}
  fitted: {kind: spur_gear, module: 2, teeth: 20, face_width: 8, bore: 5, fit: shop}
  pulley: {kind: timing_pulley, profile: curv2, teeth: 20, belt_width: 6, fit: shop}
  builtin: {kind: spur_gear, module: 2, teeth: 20, face_width: 8, fit: fdm-0.4}
"""


def test_fit_compensates_teeth_tip_and_bore(write_yaml):
    res = check([write_yaml(TEXT)])
    assert res.ok, [f.message for f in res.findings if f.severity == "error"]
    plain, fitted = res.models["plain"].sizes, res.models["fitted"].sizes
    # thinning 2 × 0.08 on the reference circle; tip radius − 0.05 (fit definitions)
    assert plain["tooth_thickness"] - fitted["tooth_thickness"] == pytest.approx(0.16)
    assert plain["tip_diameter"] - fitted["tip_diameter"] == pytest.approx(0.10)
    assert fitted["fit"]["name"] == "shop"
    # the bore loop is printed 0.25 mm larger
    hole = res.models["fitted"].shape.solids[0].section.holes[0]
    assert hole.curves[0].radius == pytest.approx((5 + 0.25) / 2)


def test_fit_widens_pulley_grooves(write_yaml):
    res = check([write_yaml(TEXT)])
    s = res.models["pulley"].sizes
    # groove allowance moves each flank back by it: outside diameter − 2 × 0.08 (pulley
    # module convention), dp unchanged (ISO 5288 definition, doc)
    assert s["fit_allowance"] == pytest.approx(0.08)
    assert s["pitch_diameter"] == pytest.approx(20 * 2.0 / math.pi)


def test_measured_profile_matches_compensated_formula(write_yaml):
    from gen.validate.gear_checks import measured_sizes

    res = check([write_yaml(TEXT)])
    m = res.models["fitted"]
    got = measured_sizes(m.outline, m.mate.sizes)
    assert got["tip_radius"] == pytest.approx(m.sizes["tip_diameter"] / 2, abs=1e-9)
    assert got["thickness"] == pytest.approx(m.sizes["tooth_thickness"], abs=2e-3)


def test_unknown_fit_lists_the_names(write_yaml):
    res = check([write_yaml(TEXT.replace("fit: fdm-0.4", "fit: fdm04"))])
    msg = [f.message for f in res.findings if f.severity == "error"][0]
    assert "did you mean 'fdm-0.4'" in msg and "resin" in msg
