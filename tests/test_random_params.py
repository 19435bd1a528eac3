"""Random valid parameter sets: each validates and exports, or is refused with a named finding."""

import math

from hypothesis import HealthCheck, given, settings
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


def _model(values):
    raw = RawPart(name="g", kind="spur_gear", values=values, file="random.yaml", train=None,
                  lines={None: 1})
    return resolve(raw)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(gear_params())
def test_random_gear_validates_or_is_refused(values):
    model = _model(values)  # a ParamError here would fail the test: all values are in range
    if has_errors(model.findings):
        assert all(f.code and f.message for f in model.findings)
        return
    mesh = body_triangles(model.shape, model.chord_tol)
    assert mesh.is_watertight and mesh.volume > 0
    # measured on the mesh as on the profile: ISO 21771 sizes (slice_check compares them)
    from gen.triangles.prism import slice_polygons
    for check in model.slice_checks:
        assert not has_errors(check(lambda z: slice_polygons(mesh, z)))


@settings(max_examples=8, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(gear_params())
def test_random_gear_solid_is_valid(values):
    model = _model(values)
    if has_errors(model.findings):
        return
    from gen.solid.prism import body_solid

    solid = body_solid(model.shape)
    assert solid.isValid()
    mesh = body_triangles(model.shape, model.chord_tol)
    assert math.isclose(solid.Volume(), mesh.volume, rel_tol=5e-3)


@st.composite
def helical_params(draw):
    values = draw(gear_params())
    values["helix_angle"] = draw(st.sampled_from([8.0, 15.0, 22.5, 30.0, 45.0]))
    values["hand"] = draw(st.sampled_from(["right", "left"]))
    return draw(st.sampled_from(["helical_gear", "herringbone_gear"])), values


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(helical_params())
def test_random_helical_gear_validates_or_is_refused(kind_values):
    kind, values = kind_values
    raw = RawPart(name="h", kind=kind, values=values, file="random.yaml", train=None,
                  lines={None: 1})
    model = resolve(raw)
    if has_errors(model.findings):
        assert all(f.code and f.message for f in model.findings)
        return
    from gen.triangles.prism import slice_polygons

    mesh = body_triangles(model.shape, model.chord_tol)
    assert mesh.is_watertight and mesh.volume > 0
    # sizes on a slice, and the helix measured on the mesh (Δθ = Δz tan β / r_p within 0.05°)
    assert len(model.slice_checks) == 2
    for check in model.slice_checks:
        assert not has_errors(check(lambda z: slice_polygons(mesh, z)))
