"""Issue 11 item 12: minimum wall, rim and feature checks run for every gear, with the default
0.4 mm nozzle when no fit is named; the fit's size compensation stays opt-in."""

import math

from gen.check.project import check
from gen.findings import ERROR, WARNING


def _run(write_yaml, text):
    res = check([write_yaml(text)])
    return res, [f for f in res.findings if f.code in ("below-min-feature", "below-min-wall")]


def test_thin_rim_is_reported_without_a_fit(write_yaml):
    # m 0.5, z 14, x 0.3: d_f = d − 2 m (1.25 − x) = 7 − 0.95 = 6.05 mm (ISO 21771, computed);
    # a 5 mm bore leaves a 0.525 mm rim, under two 0.4 mm lines (common practice)
    rim = (7 - 2 * 0.5 * (1.25 - 0.3)) / 2 - 2.5
    assert abs(rim - 0.525) < 1e-12
    res, hits = _run(write_yaml, "parts:\n  g: {kind: spur_gear, module: 0.5, teeth: 14, "
                                 "profile_shift: 0.3, face_width: 3, bore: 5}\n")
    walls = [f for f in hits if f.code == "below-min-wall"]
    assert len(walls) == 1 and walls[0].severity == WARNING and walls[0].key == "bore"
    assert "0.525" in walls[0].message and "0.4 mm nozzle" in walls[0].source
    # the fit's compensation is not applied: sizes are the plain ISO 21771 ones
    assert math.isclose(res.models["g"].sizes["tooth_thickness"],
                        0.5 * (math.pi / 2 + 2 * 0.3 * math.tan(math.radians(20))))


def test_teeth_thinner_than_a_line_are_refused(write_yaml):
    # m 0.2: s = π m / 2 = 0.314 mm < 0.4 mm (one line of the default nozzle)
    res, hits = _run(write_yaml, "parts:\n  g: {kind: spur_gear, module: 0.2, teeth: 40, "
                                 "face_width: 3}\n")
    errs = [f for f in hits if f.severity == ERROR]
    assert not res.ok and errs and errs[0].key == "module"
    # a resin fit (min_feature 0.4 mm → one line 0.2 mm) accepts them
    res, hits = _run(write_yaml, "parts:\n  g: {kind: spur_gear, module: 0.2, teeth: 40, "
                                 "face_width: 3, fit: resin}\n")
    assert not [f for f in hits if f.severity == ERROR]


def test_tiny_differential_is_refused_by_check(write_yaml):
    # m 0.05: small-end teeth ≈ π m / 2 · R_i/R_e ≈ 0.06 mm, far under a printed line
    res, hits = _run(write_yaml, "assemblies:\n  w: {kind: bevel_differential, module: 0.05, "
                                 "input_teeth: 24, output_teeth: 16, face_width: 0.2}\n")
    assert not res.ok
    assert {f.subject for f in hits if f.severity == ERROR} == {"w_input_1", "w_input_2",
                                                                "w_output_1"}
