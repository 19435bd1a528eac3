"""Random valid parameter sets: each is refused exactly when closed forms say it must be, with
the finding that names the reason, and otherwise validates and exports."""

import math

import pytest
from hypothesis import HealthCheck, assume, example, given, settings
from hypothesis import strategies as st

from gen.geometry.modules import SERIES_I, SERIES_II
from gen.triangles.prism import body_triangles
from gen.params.project import RawPart
from gen.kinds.base import resolve
from gen.findings import has_errors

MODULES = [m for m in SERIES_I + SERIES_II if 0.3 <= m <= 10]


@st.composite
def gear_params(draw):
    m = draw(st.sampled_from(MODULES))
    z = draw(st.integers(6, 150))
    x = draw(st.floats(-0.5, 1.0).map(lambda v: round(v, 3)))
    alpha = draw(st.sampled_from([14.5, 17.5, 20.0, 22.5, 25.0]))
    profile = draw(st.sampled_from("ABCD"))
    values = {"module": m, "teeth": z, "profile_shift": x, "pressure_angle": alpha,
              "profile": profile, "face_width": round(max(0.5 * m, 3 * m), 3),
              "backlash_allowance": draw(st.sampled_from([0.0, 0.05, 0.1]))}
    if draw(st.booleans()):
        values["bore"] = round(draw(st.floats(0.1, 0.6)) * z * m * 0.8, 2) or 1.0
    return values


# ISO 53:1998 basic rack dedendum h_fP / m (from memory): 1.25 for A, B, C; 1.40 for D
DEDENDUM = {"A": 1.25, "B": 1.25, "C": 1.25, "D": 1.40}


def _inv(a):
    return math.tan(a) - a


def expected_refusals(values, beta_deg=0.0):
    """(codes, margin): the error codes closed forms predict for a cylindrical gear, and how
    far (in modules) the nearest decision is from its threshold.

    Transverse section (ISO 21771, from memory): mt = mn / cos β, tan αt = tan αn / cos β,
    d = z mt, da = d + 2 mn (1 + x), df = d − 2 mn (h_fP* − x), db = d cos αt,
    s = mt (π/2 + 2 x tan αn) − thinning. Tip thickness of an involute tooth (ISO 21771 /
    Niemann–Winter, from memory): s_a = da (s/d + inv αt − inv αa), cos αa = db/da; ≤ 0 is a
    pointed tooth. A bore at or beyond the root circle leaves no rim (geometry, computed).
    """
    mn, z, x = values["module"], values["teeth"], values["profile_shift"]
    an, beta = math.radians(values["pressure_angle"]), math.radians(beta_deg)
    mt = mn / math.cos(beta)
    at = math.atan(math.tan(an) / math.cos(beta))
    d = z * mt
    da, db = d + 2 * mn * (1 + x), d * math.cos(at)
    df = d - 2 * mn * (DEDENDUM[values["profile"]] - x)
    s = mt * (math.pi / 2 + 2 * x * math.tan(an)) - values["backlash_allowance"]
    s_a = da * (s / d + _inv(at) - _inv(math.acos(db / da)))
    codes, margin = set(), abs(s_a) / mn
    if s_a <= 0:
        codes.add("pointed-tip")
        return codes, margin       # a pointed tooth has no outline: nothing else is measured
    # a tooth under one printed line of the default 0.4 mm nozzle cannot be printed (common
    # practice: a line is about the nozzle wide)
    margin = min(margin, abs(s - 0.4) / mn)
    if s < 0.4:
        codes.add("below-min-feature")
    if "bore" in values:
        gap = df / 2 - values["bore"] / 2
        margin = min(margin, abs(gap) / mn)
        if gap <= 0:
            codes.add("bore-too-big")
    return codes, margin


def _model(values):
    raw = RawPart(name="g", kind="spur_gear", values=values, file="random.yaml", train=None,
                  lines={None: 1})
    return resolve(raw)


def _spur(**kw):
    return {"module": 2.0, "teeth": 10, "profile_shift": 0.0, "pressure_angle": 20.0,
            "profile": "A", "face_width": 6.0, "backlash_allowance": 0.0, **kw}


# Random draws seldom reach a refusal, so both sides of each threshold are also given as
# examples. m 2, z 10, 20°: the tip comes to a point at x ≈ 0.700 (computed by bisection on
# the s_a closed form) → x 0.67 builds, x 0.73 is pointed; m 2, z 20, A: root diameter
# df = 40 − 5 = 35 mm (computed) → bore 34 builds, bore 36 is refused.
@settings(max_examples=60, deadline=None, derandomize=True,
          suppress_health_check=[HealthCheck.too_slow])
@given(gear_params())
@example(_spur(profile_shift=0.67))
@example(_spur(profile_shift=0.73))
@example(_spur(teeth=20, bore=34.0))
@example(_spur(teeth=20, bore=36.0))
def test_random_gear_validates_or_is_refused(values):
    want, margin = expected_refusals(values)
    assume(margin > 0.01)          # too close to a threshold for the sampled outline to decide
    model = _model(values)  # a ParamError here would fail the test: all values are in range
    assert {f.code for f in model.findings if f.severity == "error"} == want
    if want:
        return
    mesh = body_triangles(model.shape, model.chord_tol)
    assert mesh.is_watertight and mesh.volume > 0
    # measured on the mesh as on the profile: ISO 21771 sizes (slice_check compares them)
    from gen.triangles.prism import slice_polygons
    for check in model.slice_checks:
        assert not has_errors(check(lambda z: slice_polygons(mesh, z)))


@settings(max_examples=8, deadline=None, derandomize=True,
          suppress_health_check=[HealthCheck.too_slow])
@given(gear_params())
def test_random_gear_solid_is_valid(values):
    want, margin = expected_refusals(values)
    assume(not want and margin > 0.01)    # only gears the closed forms accept
    model = _model(values)
    assert not has_errors(model.findings)
    import cadquery as cq

    from gen.solid.prism import body_solid

    solid = cq.Solid(body_solid(model.shape))   # the builder gives a TopoDS_Solid
    assert solid.isValid()
    mesh = body_triangles(model.shape, model.chord_tol)
    assert math.isclose(solid.Volume(), mesh.volume, rel_tol=5e-3)


def test_spur_gear_at_an_exact_shift_is_not_refused():
    # Found by the random test above: m 0.3, z 133, x 0.7, 25°, profile B builds by every
    # closed form (no pointed tip, no bore), yet was refused with size-mismatch: one flank
    # sample lay 6.5 nm above r_p, where the envelope's search fell back to a grid value
    # 0.5 µm off (tests/test_generate.py checks the envelope there to 1 nm).
    values = _spur(module=0.3, teeth=133, profile_shift=0.7, pressure_angle=25.0,
                   profile="B", face_width=0.9)
    assert expected_refusals(values)[0] == set()
    assert {f.code for f in _model(values).findings if f.severity == "error"} == set()


@st.composite
def helical_params(draw):
    values = draw(gear_params())
    values["helix_angle"] = draw(st.sampled_from([8.0, 15.0, 22.5, 30.0, 45.0]))
    values["hand"] = draw(st.sampled_from(["right", "left"]))
    return draw(st.sampled_from(["helical_gear", "herringbone_gear"])), values


# helical, mn 2, z 6, β 15°, 20°: the tip points at x ≈ 0.482 (computed by bisection on the
# closed form) → x 0.45 builds, x 0.52 is refused
@settings(max_examples=25, deadline=None, derandomize=True,
          suppress_health_check=[HealthCheck.too_slow])
@given(helical_params())
@example(("helical_gear", _spur(teeth=6, profile_shift=0.45, helix_angle=15.0, hand="right")))
@example(("herringbone_gear", _spur(teeth=6, profile_shift=0.52, helix_angle=15.0, hand="left")))
def test_random_helical_gear_validates_or_is_refused(kind_values):
    kind, values = kind_values
    raw = RawPart(name="h", kind=kind, values=values, file="random.yaml", train=None,
                  lines={None: 1})
    want, margin = expected_refusals(values, values["helix_angle"])
    assume(margin > 0.01)
    model = resolve(raw)
    assert {f.code for f in model.findings if f.severity == "error"} == want
    if want:
        return
    from gen.triangles.prism import slice_polygons

    mesh = body_triangles(model.shape, model.chord_tol)
    assert mesh.is_watertight and mesh.volume > 0
    # sizes on a slice, and the helix measured on the mesh (Δθ = Δz tan β / r_p within 0.05°)
    assert len(model.slice_checks) == 2
    for check in model.slice_checks:
        assert not has_errors(check(lambda z: slice_polygons(mesh, z)))
