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
    from shapely.geometry import Polygon

    from gen.validate import measure

    text = TEXT + "  bare_pulley: {kind: timing_pulley, profile: curv2, teeth: 20, belt_width: 6}\n"
    res = check([write_yaml(text)])
    fitted, bare = res.models["pulley"], res.models["bare_pulley"]
    # the groove allowance moves every flank back by it: the fitted outline is the bare one
    # offset inward by 0.08 mm. Second route: shapely's own offset of the bare polygon
    # (buffer, an independent construction); both polygons are drawn at the 0.01 mm chord
    # tolerance, so they agree within it. Ignoring the fit would leave them 0.08 mm apart.
    offset = Polygon(bare.outline).buffer(-0.08, quad_segs=64)
    assert offset.hausdorff_distance(Polygon(fitted.outline)) < 0.01
    # outside diameter do = z p/π − 2a (ISO 5288 definition, doc), a = 0.254 mm for the 2 mm
    # curvilinear pitch (common practice), less 2 × 0.08 for the allowance (computed)
    do = 20 * 2.0 / math.pi - 2 * 0.254
    assert 2 * measure.radii(bare.outline).max() == pytest.approx(do, abs=1e-6)
    assert 2 * measure.radii(fitted.outline).max() == pytest.approx(do - 2 * 0.08, abs=1e-6)
    # dp unchanged by the fit (ISO 5288 definition, doc)
    assert fitted.sizes["fit_allowance"] == pytest.approx(0.08)
    assert fitted.sizes["pitch_diameter"] == pytest.approx(20 * 2.0 / math.pi)


def test_measured_profile_matches_compensated_formula(write_yaml):
    from gen.validate import measure

    res = check([write_yaml(TEXT)])
    poly = res.models["fitted"].outline
    # expected by closed forms written here, not read from the part (computed):
    # ISO 21771 (from memory) m 2, z 20, x 0: d = 40 mm, da = d + 2 m = 44 mm, s = π m / 2;
    # the fit 'shop' cuts the tip radius by outline_offset 0.05 mm and thins each flank by
    # flank_clearance 0.08 mm on the reference circle (fit definitions above)
    assert measure.radii(poly).max() == pytest.approx(44.0 / 2 - 0.05, abs=1e-9)
    thick = measure.arc_thickness(poly, 40.0 / 2)
    assert len(thick) == 20
    # polygon chords at 0.01 mm cost < 2e-3 mm of arc thickness
    assert thick == pytest.approx([math.pi * 2.0 / 2 - 2 * 0.08] * 20, abs=2e-3)


def test_unknown_fit_lists_the_names(write_yaml):
    res = check([write_yaml(TEXT.replace("fit: fdm-0.4", "fit: fdm04"))])
    msg = [f.message for f in res.findings if f.severity == "error"][0]
    assert "did you mean 'fdm-0.4'" in msg and "resin" in msg
