"""Sector gear kind: teeth from swing and margin, outline and triangles measured, pairs checked
over the whole swing, refusals naming the key."""

import math

import numpy as np
import pytest

from gen.check.project import check
from gen.errors import ParamError
from gen.kinds.base import resolve
from gen.params.project import RawPart

JAWS = """parts:
  jaw_left:  {kind: sector_gear, module: 1, teeth: 30, swing: 60, face_width: 6, bore: 3,
              backlash_allowance: 0.15}
  jaw_right: {kind: sector_gear, module: 1, teeth: 30, swing: 60, face_width: 6, bore: 3,
              backlash_allowance: 0.15}
meshes:
  - {parts: [jaw_left, jaw_right]}
"""


def part(**values):
    raw = RawPart(name="s", kind="sector_gear", values=values, file="t.yaml", train=None,
                  lines={})
    return resolve(raw)


def _iso_contact_ratio(z1, z2, m=1.0, alpha=math.radians(20)):
    """ε_α of an unshifted pair at the standard center distance (ISO 21771, from memory):
    (√(ra1² − rb1²) + √(ra2² − rb2²) − a sin α) / (π m cos α)."""
    r1, r2 = z1 * m / 2, z2 * m / 2
    ra1, ra2 = r1 + m, r2 + m
    rb1, rb2 = r1 * math.cos(alpha), r2 * math.cos(alpha)
    a = r1 + r2
    return (math.sqrt(ra1 ** 2 - rb1 ** 2) + math.sqrt(ra2 ** 2 - rb2 ** 2)
            - a * math.sin(alpha)) / (math.pi * m * math.cos(alpha))


def _tip_runs(poly, ra, tol):
    """Teeth counted as runs of outline vertices on the tip circle (an independent count)."""
    r = np.hypot(poly[:, 0], poly[:, 1])
    on = np.abs(r - ra) < tol
    return int(np.sum(on & ~np.roll(on, 1)))


def test_teeth_from_swing_and_margin():
    p = part(module=1, teeth=30, swing=60, face_width=6, bore=3)
    # computed: 60° of a 30-tooth gear is 60·30/360 = 5 pitches through the pitch point; an
    # identical unshifted mate splits the path of contact evenly, so the reach each side is
    # ε_α/2 pitches and t = ¼: N ≥ 5 + ½ + ε_α − 1 → ⌈4.5 + ε_α⌉, plus 1 margin each end
    eps = _iso_contact_ratio(30, 30)
    assert eps == pytest.approx(p.sizes["sizing_contact_ratio"], abs=1e-9)
    needed = math.ceil(4.5 + eps)
    assert needed == 7
    assert p.sizes["sector_teeth"] == needed + 2 == 9
    assert p.sizes["arc"] == pytest.approx(9 * 12.0)
    # counted on the measured outline: 9 runs of vertices on the tip circle d + 2m = 32 mm
    assert _tip_runs(p.outline, 16.0, 1e-6) == 9
    assert np.hypot(*p.outline.T).max() == pytest.approx(16.0, abs=1e-9)
    assert not p.errors
    # two margin teeth each end: two teeth more
    assert part(module=1, teeth=30, swing=60, margin=2, face_width=6, bore=3
                ).sizes["sector_teeth"] == 11


def test_centre_line_parity():
    # the same swing with a space on the centre line: the count rounds up to even (7 → 8)
    p = part(module=1, teeth=30, swing=60, margin=1, centre_line="space", face_width=6, bore=3)
    assert p.sizes["sector_teeth"] == 10
    # every tooth sits on a multiple of the pitch (tooth on +X): centre line half a pitch off
    assert p.sizes["centre_line"] == pytest.approx(6.0)


def test_swing_too_large_for_the_arc_is_refused():
    # a 40° arc of 30 teeth holds 3 teeth; the 60° swing needs 9
    with pytest.raises(ParamError) as exc:
        part(module=1, teeth=30, swing=60, arc=40, face_width=6, bore=3)
    assert exc.value.key == "swing" and "holds only 3" in str(exc.value)
    # a swing needing more teeth than the full gear has
    with pytest.raises(ParamError) as exc:
        part(module=1, teeth=12, swing=300, face_width=6, bore=3)
    assert exc.value.key == "swing" and "full gear" in str(exc.value)


def test_arc_shorter_than_one_tooth_is_refused():
    # one pitch of a 30-tooth gear is 12°
    with pytest.raises(ParamError) as exc:
        part(module=1, teeth=30, swing=5, margin=0, arc=10, face_width=6, bore=3)
    assert exc.value.key == "arc" and "shorter than one tooth" in str(exc.value)


def test_an_arc_wide_enough_is_kept():
    p = part(module=1, teeth=30, swing=60, arc=130, face_width=6, bore=3)
    assert p.sizes["sector_teeth"] == 10  # ⌊130/12⌋ = 10 teeth fit


@pytest.fixture(scope="module")
def jaws(tmp_path_factory):
    path = tmp_path_factory.mktemp("jaws") / "jaws.yaml"
    path.write_text(JAWS)
    return check([str(path)])


def test_pair_keeps_contact_over_the_swing(jaws):
    pair = jaws.pairs[0]
    n = pair["numbers"]
    assert n["swing"] == pytest.approx(60.0)
    # at least one tooth pair on each flank side at every angle of the swing, and as many as
    # full gears would have (the sector was sized for that)
    assert n["min_pairs_in_contact"] >= 1 and n["full_contact_kept"]
    # the sweep of the real outlines over the whole swing finds no overlap (sweep tolerance
    # 1e-5 mm²) and the backlash it measures is the formula's (thinning 0.15 each,
    # circumferential backlash 0.30 mm on the operating pitch circle at the standard center)
    assert n["overlap_area"] <= 1e-5
    assert n["swept_backlash"] == pytest.approx(0.30, abs=0.01)
    assert n["swept_steps"] >= 45 * 5  # at least the five pitches of the swing
    # the hard stops lie beyond the swing on both sides
    lo, hi = n["stops"]
    assert lo < -30.0 and hi > 30.0
    assert not [f for f in pair["findings"] if f.severity == "error"]


def test_pair_contact_ratio_over_the_swing_above_one(jaws):
    from gen.geometry.sector_pair import sector_contact

    a, b = jaws.models["jaw_left"], jaws.models["jaw_right"]
    c = sector_contact(a.mate.sizes, b.mate.sizes, 9, 9, math.radians(60))
    # same parity (9 and 9): gear 2 sits half a pitch off the line of centres at mid-swing,
    # so the pair is not mirror-symmetric and its stops differ in size
    assert c.offset2 == 0.5
    lo, hi = jaws.pairs[0]["numbers"]["stops"]
    assert abs(hi + lo) > 1.0
    # time average of the pairs in contact over the swing (piecewise constant between the
    # samples, which include every engagement and separation) stays above 1 on both sides
    for counts in (c.pairs_leading, c.pairs_trailing):
        mean = np.sum(counts[:-1] * np.diff(c.angles)) / (c.angles[-1] - c.angles[0])
        assert mean > 1.0
        assert counts.min() >= 1


def test_short_sector_reported_in_the_pair(tmp_path):
    # a sector sized for 20° with no margin cannot follow its mate through 60°: the pair is
    # checked over the larger swing and says the teeth run out inside it
    text = """parts:
  a: {kind: sector_gear, module: 1, teeth: 30, swing: 20, margin: 0, face_width: 6, bore: 3,
      backlash_allowance: 0.15}
  b: {kind: sector_gear, module: 1, teeth: 30, swing: 60, face_width: 6, bore: 3,
      backlash_allowance: 0.15}
meshes:
  - {parts: [a, b]}
"""
    path = tmp_path / "short.yaml"
    path.write_text(text)
    res = check([str(path)])
    codes = {f.code for f in res.pairs[0]["findings"]}
    assert "sector-contact-lost" in codes and "sector-swing" in codes
    assert res.pairs[0]["numbers"]["min_pairs_in_contact"] == 0


def test_sector_with_full_gear(tmp_path):
    text = """parts:
  flap: {kind: sector_gear, module: 1, teeth: 40, swing: 45, mate_teeth: 15, face_width: 6,
         bore: 4, backlash_allowance: 0.1}
  pinion: {kind: spur_gear, module: 1, teeth: 15, face_width: 6, bore: 3, backlash_allowance: 0.1}
meshes:
  - {parts: [pinion, flap]}
"""
    path = tmp_path / "flap.yaml"
    path.write_text(text)
    res = check([str(path)])
    n = res.pairs[0]["numbers"]
    # the sector is taken as gear 1 whatever the order in the file
    assert n["gear_order"] == ["flap", "pinion"]
    assert n["swing"] == pytest.approx(45.0)
    assert n["full_contact_kept"] and n["overlap_area"] <= 1e-5
    assert not [f for f in res.findings if f.severity == "error"]


def test_triangles_measure_the_sector():
    from gen.triangles import triangles
    from gen.triangles.prism import slice_polygons

    p = part(module=1, teeth=30, swing=60, face_width=6, bore=3,
             arm={"radius": 22, "width": 5, "hole": 2}, boss_diameter=10)
    mesh = triangles(p.shape, p.chord_tol)
    assert mesh.is_watertight
    for slice_check in p.slice_checks:
        assert slice_check(lambda z: slice_polygons(mesh, z)) == []
    outer = max(slice_polygons(mesh, 3.0), key=len)
    r = np.hypot(*outer.T)
    ang = np.degrees(np.arctan2(outer[:, 1], outer[:, 0]))
    # ISO 21771: tip circle 16 mm, root 13.75 mm (d − 2·1.25 m) inside the toothed arc
    # (9 teeth × 12° = ±54° about +X); the facets stay within the 0.01 mm chord tolerance
    inside = np.abs(ang) < 54.0
    assert r[inside].max() == pytest.approx(16.0, abs=0.011)
    assert r[inside].min() == pytest.approx(13.75, abs=0.011)
    # teeth on the slice, counted as runs of vertices within 0.02 mm of the tip circle
    assert _tip_runs(outer[inside], 16.0, 0.02) == 9
    # the arm reaches 22 + 2.5 mm, opposite the teeth
    assert r.max() == pytest.approx(24.5, abs=0.011)
    assert abs(ang[np.argmax(r)]) > 170.0


def test_opposite_parities_are_symmetric(tmp_path):
    # a tooth on one centre line and a space on the other: the pair is its own mirror image
    # about the line of centres at mid-swing, so the stops are ± the same angle (computed:
    # mirror symmetry swaps the two flank sides and the two ends of the swing)
    text = JAWS.replace("swing: 60, face_width", "swing: 60, centre_line: tooth, face_width", 1)
    text = text.replace("jaw_right: {kind: sector_gear, module: 1, teeth: 30, swing: 60,",
                        "jaw_right: {kind: sector_gear, module: 1, teeth: 30, swing: 60, "
                        "centre_line: space,")
    path = tmp_path / "sym.yaml"
    path.write_text(text)
    res = check([str(path)])
    assert [res.models[n].sizes["sector_teeth"] for n in ("jaw_left", "jaw_right")] == [9, 10]
    lo, hi = res.pairs[0]["numbers"]["stops"]
    assert hi == pytest.approx(-lo, abs=1e-9) and hi > 30.0
    assert res.pairs[0]["numbers"]["full_contact_kept"]
