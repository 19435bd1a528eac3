"""Issue 11 item 9: what build measures on the exported triangles, check measures first.

Each case below passed ``check`` and was refused by ``build``'s slice checks before. Here the
part is resolved (what check does), its triangles are made and sliced (what build does), and
the two must agree; every error names the key to change.
"""

import math

import numpy as np
import pytest

from gen.findings import ERROR, has_errors
from gen.kinds.base import resolve
from gen.params.project import RawPart


def _part(kind, values):
    raw = RawPart(name="p", kind=kind, values=values, file="t.yaml", train=None,
                  lines={None: 1})
    return resolve(raw)


def _slice_findings(part):
    from gen.triangles import triangles
    from gen.triangles.prism import slice_polygons

    mesh = triangles(part.shape, part.chord_tol)
    return [f for c in part.slice_checks for f in c(lambda z: slice_polygons(mesh, z))]


CASES = {
    # the four parts of the issue (values invented for the test, in the keys' ranges)
    "miter m1 z20 b2": ("miter_gear", {"module": 1, "teeth": 20, "face_width": 2}),
    "spur x -1": ("spur_gear", {"module": 1, "teeth": 20, "face_width": 5,
                                "profile_shift": -1}),
    "herringbone x 1.4 k 0.7": ("herringbone_gear", {"module": 1, "teeth": 20, "face_width": 8,
                                                     "profile_shift": 1.4,
                                                     "tip_shortening": 0.7,
                                                     "helix_angle": 30}),
    "helical x 1.4 k 0.7": ("helical_gear", {"module": 1, "teeth": 17, "face_width": 6,
                                             "profile_shift": 1.4, "tip_shortening": 0.7,
                                             "helix_angle": 20}),
    # found by perturbing starter files (fifth round of issue 13): a groove wider than half
    # the face put the size slice (at b/4) inside the groove, and a ring shifted by x = 1 has
    # its tips outside r_p, where the helix slices found no teeth
    "herringbone groove 7 of 12": ("herringbone_gear", {"module": 1.5, "teeth": 30,
                                                        "helix_angle": 20, "face_width": 12,
                                                        "groove": 7}),
    "helical ring x 1": ("ring_gear", {"module": 1.5, "teeth": 51, "helix_angle": 1,
                                       "profile_shift": 1, "tip_shortening": 0.2,
                                       "face_width": 12, "rim_thickness": 5}),
    # a rack shorter than two pitches: its helix is measured on the flanks it has
    "helical rack 8 mm": ("helical_rack", {"module": 2, "helix_angle": 25, "face_width": 10,
                                           "length": 8, "height": 6}),
    # a tooth cut 0.36 mm short by a rack end counted as whole in one slice
    "herringbone rack m 2.522 ends as given": ("herringbone_rack", {
        "module": 2.522, "helix_angle": 25, "face_width": 12, "length": 121, "height": 9,
        "ends": "as_given", "hand": "left"}),
    "herringbone ring x 1 groove 7": ("ring_gear", {"module": 1.422, "teeth": 48,
                                                    "helix_angle": 15, "herringbone": True,
                                                    "groove": 7, "profile_shift": 1,
                                                    "tip_shortening": 0.118, "face_width": 12,
                                                    "rim_thickness": 5}),
}


@pytest.mark.parametrize("case", sorted(CASES))
def test_check_and_build_slices_agree(case):
    part = _part(*CASES[case])
    assert part.shape is not None
    sliced = _slice_findings(part)   # raised or refused before the fix
    assert has_errors(part.findings) == has_errors(sliced), (part.findings, sliced)
    for f in list(part.findings) + sliced:
        if f.severity == ERROR:
            assert f.key, f


def test_thickness_circle_inside_band_matches_involute_relation():
    # x = −1: d_a = d + 2 m (1 + x) = d, the tip is on the reference circle (ISO 21771,
    # computed), so the thickness is measured on a circle inside the involute band, against
    # s_y = d_y (s/d + inv α − inv α_y) recomputed here with tan α − α.
    from gen.validate.gear_checks import thickness_circle

    part = _part(*CASES["spur x -1"])
    s, fl = part.mate.sizes, part.mate.flank
    assert math.isclose(s.da, s.d, abs_tol=1e-12)
    R, s_R = thickness_circle(s, fl.r_junction, 0.012)
    assert max(fl.r_junction, s.rb) + 0.012 <= R <= s.ra - 0.012
    alpha = math.radians(20.0)
    s_ref = 1.0 * (math.pi / 2 - 2 * math.tan(alpha))          # s = m (π/2 + 2 x tan α)
    a_y = math.acos(s.rb / R)
    inv = lambda a: math.tan(a) - a
    want = 2 * R * (s_ref / s.d + inv(alpha) - inv(a_y))
    assert math.isclose(s_R, want, rel_tol=1e-9)
    # and the generated profile shows that thickness (material arc on R)
    from gen.validate import measure
    got = measure.arc_thickness(part.outline, R).mean()
    assert abs(got - want) < 2e-3                              # TOL.thickness_rel · m


def test_helix_measured_on_a_circle_that_crosses_the_teeth():
    # x = 1.4: d_f = d − 2 m (1.25 − x) > d (ISO 21771, computed): no tooth on the reference
    # circle, so the helix check may not look there
    from gen.kinds.helical import helix_measure_radius

    part = _part(*CASES["herringbone x 1.4 k 0.7"])
    s = part.mate.sizes
    assert s.rf > s.rp
    r = helix_measure_radius(s, part.mate.flank.r_junction)
    assert s.rf < r < s.ra


def test_bevel_large_end_sizes_measured_against_iso_23509():
    # ISO 23509 straight bevel, 90° shafts: tan δ1 = z1/z2; d_ae = m z + 2 m (1 + x) cos δ,
    # d_fe = m z − 2 m (1.25 − x) cos δ, s = m (π/2 + 2 x tan α) − thinning (from memory of
    # the standard's formulas; recomputed here from δ, not from the code under test)
    from gen.validate.bevel_measure import large_end_sizes

    m, z1, z2, x, th = 1.0, 13, 40, 0.4, 0.1
    part = _part("bevel_gear", {"module": m, "teeth": z1, "mating_teeth": z2, "face_width": 5,
                                "profile_shift": x, "backlash_allowance": th})
    got = large_end_sizes(part.mate.sizes, part.mate.flank)
    d = math.atan(z1 / z2)
    assert got["teeth"] == z1
    assert abs(got["tip_diameter"] - (m * z1 + 2 * m * (1 + x) * math.cos(d))) < 2e-4
    assert abs(got["root_diameter"] - (m * z1 - 2 * m * (1.25 - x) * math.cos(d))) < 2e-4
    s = m * (math.pi / 2 + 2 * x * math.tan(math.radians(20))) - th
    assert abs(got["thickness"] - s) < 2e-3
    assert not [f for f in part.findings if f.code in ("size-mismatch", "tooth-count")]


def test_bevel_plane_section_counts_teeth_where_the_slice_will():
    # a miter with face 2 mm < tooth depth: the old mid-face plane missed the teeth; the plan
    # is the plane crossing the most depth of the tooth band, and its exact section (central
    # projection of the large-end outline) shows every tooth on the counting circle
    from gen.validate import measure
    from gen.validate.bevel_measure import plane_section, slice_plan, tooth_band

    part = _part(*CASES["miter m1 z20 b2"])
    s, fl = part.mate.sizes, part.mate.flank
    plan = slice_plan(s, fl)
    quad = tooth_band(s, fl)
    assert quad[:, 1].min() < plan.z < quad[:, 1].max()
    assert plan.depth > 0.5 * (fl.r_tip - fl.r_root) * math.cos(s.delta)
    poly = plane_section(s, fl, plan.z, 0.01)
    assert measure.tooth_count(poly, plan.r_count) == 20


def test_bevel_face_too_narrow_to_measure_is_refused_with_the_key():
    # a 0.01 mm face leaves no plane crossing enough tooth depth to count on the triangles
    part = _part("miter_gear", {"module": 1, "teeth": 20, "face_width": 0.01})
    bad = [f for f in part.findings if f.severity == ERROR and f.code == "tooth-count"]
    assert bad and bad[0].key == "face_width"
