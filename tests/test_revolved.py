"""The shared solid of revolution: description, triangles (manifold3d) and B-rep (OCP).

Closed forms (standard, any mechanics text): a solid disc of radius R and height h has
V = πR²h, I_z = ½ m R², I_x (centre) = m (3R² + h²)/12; a hollow cylinder (R₂ outside, R₁
inside) I_z = ½ m (R₁² + R₂²). Triangles inscribe every circle, so they fall short of these by
at most the chord-tolerance bound of :func:`gen.validate.rotor_checks.polygon_error_bound`.
"""

import math

import numpy as np
import pytest

from gen.errors import GeometryError
from gen.geometry.body import HoleCircle, Revolved
from gen.validate.rotor_checks import polygon_error_bound

RHO = 7.85  # g/cm³, steel (common practice)
TOL = 0.01  # mm, the project's default chord tolerance


def rect(r0, r1, z0, z1):
    return [(r0, z0), (r1, z0), (r1, z1), (r0, z1)]


def polygon_polar(n, R=1.0):
    """Area and polar moment of the inscribed regular n-gon, summed numerically over its
    vertices by the shoelace and second-moment polygon formulas (an independent route)."""
    a = 2 * np.pi * np.arange(n) / n
    x, y = R * np.cos(a), R * np.sin(a)
    xn, yn = np.roll(x, -1), np.roll(y, -1)
    c = x * yn - xn * y
    area = 0.5 * c.sum()
    j = (c * (x * x + x * xn + xn * xn + y * y + y * yn + yn * yn)).sum() / 12
    return area, j


# --- the description --------------------------------------------------------------------------

def test_profile_is_stored_counter_clockwise():
    cw = rect(0, 10, 0, 5)[::-1]
    shape = Revolved(cw)
    p = shape.profile
    area = 0.5 * np.sum(p[:, 0] * np.roll(p[:, 1], -1) - np.roll(p[:, 0], -1) * p[:, 1])
    assert area == pytest.approx(50.0)
    assert shape.r_max == 10 and shape.z_range == (0.0, 5.0)


@pytest.mark.parametrize("profile", [[(0, 0), (1, 0)], rect(-1, 10, 0, 5),
                                     [(0, 0), (1, 0), (2, 0)]])
def test_bad_profiles_refused(profile):
    with pytest.raises(GeometryError):
        Revolved(profile)


def test_hole_past_the_rim_refused():
    with pytest.raises(GeometryError):
        Revolved(rect(0, 20, 0, 5), (HoleCircle(4, 6, 18),))


@pytest.mark.parametrize("radius,tol", [(60, 0.01), (4, 0.01), (200, 0.001), (1, 0.3)])
def test_segments_keep_the_sagitta_within_the_tolerance(radius, tol):
    # sagitta of a chord spanning 2π/n on radius R: s = R (1 − cos(π/n)) (standard)
    n = Revolved.segments(radius, tol)
    assert n % 4 == 0 and n >= 16
    assert radius * (1 - math.cos(math.pi / n)) <= tol * (1 + 1e-12)
    # and no more sides than needed: four fewer would break the tolerance (or the minimum)
    assert n == 16 or radius * (1 - math.cos(math.pi / (n - 4))) > tol


@pytest.mark.parametrize("n", [16, 64, 300])
def test_polygon_ratios_against_summed_polygon(n):
    area, j = polygon_polar(n)
    ra, rj = Revolved.polygon_ratios(n)
    assert ra == pytest.approx(area / math.pi, rel=1e-12)
    assert rj == pytest.approx(j / (math.pi / 2), rel=1e-12)
    # the relative bounds used by the rotor cross-check hold (θ²/6 and θ²/3, computed)
    theta = 2 * math.pi / n
    assert 0 < 1 - ra <= theta ** 2 / 6 and 0 < 1 - rj <= theta ** 2 / 3


def test_hole_centres_on_their_circle():
    c = HoleCircle(6, 4, 20, angle=0.1).centers()
    assert np.allclose(np.hypot(c[:, 0], c[:, 1]), 20)
    assert math.atan2(c[0, 1], c[0, 0]) == pytest.approx(0.1)


# --- triangles --------------------------------------------------------------------------------

@pytest.fixture(scope="module")
def disc():
    from gen.triangles import triangles
    from gen.triangles.mass import mass_properties

    R, h = 50.0, 12.0
    tm = triangles(Revolved(rect(0, R, 0, h)), TOL)
    return R, h, tm, mass_properties(tm, RHO)


def test_disc_triangles_against_half_m_r_squared(disc):
    R, h, tm, mp = disc
    assert tm.is_watertight
    ev, ej = polygon_error_bound(R, TOL)
    m = RHO * 1e-3 * math.pi * R * R * h          # g
    # inscribed polygons fall short, never over; by no more than the bound
    assert 0 < m - mp["mass_g"] <= ev * m
    i_exact = 0.5 * m * R * R
    assert 0 < i_exact - mp["izz_origin_g_mm2"] <= ej * i_exact
    ix = mp["inertia_center_g_mm2"][0][0]
    ix_exact = m * (3 * R * R + h * h) / 12
    assert abs(ix - ix_exact) <= ej * ix_exact
    assert mp["center_of_mass_mm"][2] == pytest.approx(h / 2, abs=1e-9)


def test_thin_ring_triangles_against_sum_of_squares():
    from gen.triangles import triangles
    from gen.triangles.mass import mass_properties

    r1, r2, h = 45.0, 50.0, 8.0
    mp = mass_properties(triangles(Revolved(rect(r1, r2, 0, h)), TOL), RHO)
    ev, ej = polygon_error_bound(r2, TOL)
    m = RHO * 1e-3 * math.pi * (r2 ** 2 - r1 ** 2) * h
    assert abs(mp["mass_g"] - m) <= ev * m
    i_exact = 0.5 * m * (r1 ** 2 + r2 ** 2)
    assert abs(mp["izz_origin_g_mm2"] - i_exact) <= ej * i_exact


def test_holes_remove_their_cylinders():
    from gen.triangles import triangles

    R, h, n, d, rc = 50.0, 6.0, 5, 10.0, 30.0
    tm = triangles(Revolved(rect(0, R, 0, h), (HoleCircle(n, d, rc),)), TOL)
    assert tm.is_watertight
    exact = math.pi * R * R * h - n * math.pi * d * d / 4 * h
    ev, _ = polygon_error_bound(R, TOL)
    evh, _ = polygon_error_bound(d / 2, TOL)
    assert abs(tm.volume - exact) <= ev * math.pi * R * R * h + evh * n * math.pi * d * d / 4 * h
    # the holes are really there: the slice at mid-height has the outer loop and n holes
    from gen.triangles.prism import slice_polygons

    assert len(slice_polygons(tm, h / 2)) == n + 1


# --- B-rep, one kernel session: disc with bore and holes, written to STEP and read back ------

@pytest.fixture(scope="module")
def solid_roundtrip(tmp_path_factory):
    import cadquery as cq

    from gen.export.step import read_step, write_step
    from gen.solid import solid

    R, a, h, n, d, rc = 40.0, 4.0, 10.0, 6, 8.0, 24.0
    s = solid(Revolved(rect(a, R, 0, h), (HoleCircle(n, d, rc),)))
    path = tmp_path_factory.mktemp("rev") / "disc.step"
    write_step(s, str(path), "disc")
    # the builder and the reader give TopoDS shapes: wrapped for cadquery's measurements
    return (R, a, h, n, d, rc), cq.Solid(s), cq.Shape.cast(read_step(str(path)))


def test_solid_is_exact_and_valid(solid_roundtrip):
    (R, a, h, n, d, rc), s, _ = solid_roundtrip
    assert s.isValid()
    exact = math.pi * (R * R - a * a) * h - n * math.pi * d * d / 4 * h
    assert s.Volume() == pytest.approx(exact, rel=1e-7)   # exact surfaces: kernel precision


def test_solid_inertia_against_closed_forms(solid_roundtrip):
    # I_z = ½ m (R² + a²) for the bored disc, minus each hole's ½ m_h (d/2)² + m_h r_c²
    # (standard, parallel-axis theorem); density 1 so the kernel's "mass" is the volume
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps

    (R, a, h, n, d, rc), s, _ = solid_roundtrip
    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(s.wrapped, props)
    izz = props.MatrixOfInertia().Value(3, 3)
    m = math.pi * (R * R - a * a) * h
    mh = math.pi * d * d / 4 * h
    exact = 0.5 * m * (R * R + a * a) - n * (0.5 * mh * (d / 2) ** 2 + mh * rc * rc)
    assert izz == pytest.approx(exact, rel=1e-7)


def test_step_round_trip_keeps_one_solid_of_the_same_volume(solid_roundtrip):
    _, s, back = solid_roundtrip
    assert len(back.Solids()) == 1 and back.isValid()
    assert back.Volume() == pytest.approx(s.Volume(), rel=1e-9)
