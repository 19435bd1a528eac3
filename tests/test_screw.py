"""Screw threads: ISO 2904 / ISO 68-1 basic sizes, axial and transverse sections, the nut."""

import math

import numpy as np
import pytest
from shapely.geometry import LineString, Polygon
from shapely.ops import unary_union

from gen.errors import GeometryError
from gen.geometry.screw import (METRIC, TRAPEZOIDAL, nut_axial_profile, nut_polygon, nut_section,
                                nut_thread, screw_axial_profile, screw_polygon, screw_section,
                                screw_twist, thread_sizes, trapezoidal_crest_clearance)
from gen.geometry.section import signed_area

T15 = math.tan(math.radians(15.0))


# ISO 2904 basic dimensions (from memory): Tr 8×2 d2 7.0 d3 5.5;
# Tr 10×2 d2 9.0 d3 7.5; Tr 12×3 d2 10.5 d3 8.5. D1 = d − P, D4 = d + 2 a_c (computed).
@pytest.mark.parametrize("d,p,d2,d3,D1,D4", [
    (8, 2, 7.0, 5.5, 6.0, 8.5), (10, 2, 9.0, 7.5, 8.0, 10.5), (12, 3, 10.5, 8.5, 9.0, 12.5)])
def test_iso2904_basic_dimensions(d, p, d2, d3, D1, D4):
    s = thread_sizes(TRAPEZOIDAL, d, p)
    assert s.d2 == pytest.approx(d2, abs=1e-12)
    assert s.d3 == pytest.approx(d3, abs=1e-12)
    assert s.D1 == pytest.approx(D1, abs=1e-12) and s.D4 == pytest.approx(D4, abs=1e-12)
    # recomputed by another route: thread depth h3 = H1 + a_c with H1 = P/2, a_c = 0.25 for
    # P 2–5 (ISO 2904, from memory)
    assert (s.d - s.d3) / 2 == pytest.approx(p / 2 + 0.25, abs=1e-12)
    # crest flat 0.366 P and root flat 0.366 P − 0.536 a_c (ISO 2904 profile, from memory),
    # recomputed from the 30° flanks: P/2 − 2 (P/4) tan 15° and P/2 − 2 (P/4 + a_c) tan 15°
    assert s.crest_width == pytest.approx(p / 2 - 2 * (p / 4) * T15, abs=1e-12)
    assert s.crest_width == pytest.approx(0.366 * p, abs=1e-3 * p)
    assert s.root_gap == pytest.approx(p / 2 - 2 * (p / 4 + 0.25) * T15, abs=1e-12)
    assert s.root_gap == pytest.approx(0.366 * p - 0.536 * 0.25, abs=1e-3 * p)


def test_crest_clearance_table_and_gaps():
    # ISO 2904 (from memory)
    assert [trapezoidal_crest_clearance(p) for p in (1.5, 2, 5, 6, 12, 14, 40)] == \
        [0.15, 0.25, 0.25, 0.5, 0.5, 1.0, 1.0]
    for p in (1.0, 1.75, 5.5, 13):
        with pytest.raises(GeometryError, match="no crest clearance"):
            trapezoidal_crest_clearance(p)


# ISO 724 (from memory): M6×1 d2 5.350, d1 4.917; M10×1.5 d2 9.026, d1 8.376 (3 decimals).
@pytest.mark.parametrize("d,p,d2,d1", [(6, 1, 5.350, 4.917), (10, 1.5, 9.026, 8.376)])
def test_iso68_metric_sizes(d, p, d2, d1):
    s = thread_sizes(METRIC, d, p)
    assert s.d2 == pytest.approx(d2, abs=6e-4) and s.d3 == pytest.approx(d1, abs=6e-4)
    # ISO 68-1 basic profile (from memory): H = √3/2 P, d2 = d − 2·(3/8)H, d1 = d − 2·(5/8)H;
    # crest flat P/8, root flat P/4 (recomputed from the 60° triangle)
    H = math.sqrt(3) / 2 * p
    assert s.d2 == pytest.approx(d - 0.75 * H, abs=1e-5) and s.d3 == pytest.approx(d - 1.25 * H, abs=1e-5)
    assert s.crest_width == pytest.approx(p / 8, abs=1e-5)
    assert s.root_gap == pytest.approx(p / 4, abs=1e-5)


def test_lead_and_lead_angle():
    # computed: Tr 8×2 single start, tan λ = 2 / (π 7) → λ = 5.197°; two starts: L = 4
    s = thread_sizes(TRAPEZOIDAL, 8, 2)
    assert math.degrees(s.lead_angle) == pytest.approx(5.197, abs=1e-3)
    s2 = thread_sizes(TRAPEZOIDAL, 8, 2, starts=2)
    assert s2.lead == 4.0
    # the unrolled helix on d2 is the hypotenuse of (π d2, L): λ = atan2(L, π d2)
    assert s2.lead_angle == pytest.approx(math.atan2(4.0, math.pi * 7.0), abs=1e-12)


def test_bad_thread_refused():
    with pytest.raises(GeometryError, match="unknown thread form"):
        thread_sizes("acme", 10, 2)
    with pytest.raises(GeometryError, match="too coarse"):
        thread_sizes(TRAPEZOIDAL, 4, 5)
    with pytest.raises(GeometryError, match="starts"):
        thread_sizes(TRAPEZOIDAL, 10, 2, starts=0)


def test_axial_profile_area():
    s = thread_sizes(TRAPEZOIDAL, 12, 3)
    prof = screw_axial_profile(s)
    assert signed_area(prof) > 0 and Polygon(prof).is_valid
    # computed: core r3·P plus the trapezoid (depth × mean of root and crest widths)
    r3, ra = s.d3 / 2, s.d / 2
    w3 = 3 - s.root_gap
    expect = r3 * 3 + (ra - r3) * (w3 + s.crest_width) / 2
    assert signed_area(prof) == pytest.approx(expect, rel=1e-12)


def _crossings(poly, r):
    """Polar angles where the closed polygon crosses the circle of radius r."""
    out = []
    n = len(poly)
    for i in range(n):
        p0, p1 = poly[i], poly[(i + 1) % n]
        d = p1 - p0
        a, b, c = d @ d, 2 * p0 @ d, p0 @ p0 - r * r
        disc = b * b - 4 * a * c
        if a == 0 or disc < 0:
            continue
        for t in ((-b - math.sqrt(disc)) / (2 * a), (-b + math.sqrt(disc)) / (2 * a)):
            if 0 <= t < 1:
                q = p0 + t * d
                out.append(math.atan2(q[1], q[0]))
    return np.array(out)


@pytest.mark.parametrize("d,p,n", [(8, 2, 1), (12, 3, 2), (10, 2, 3)])
def test_transverse_section_measured(d, p, n):
    s = thread_sizes(TRAPEZOIDAL, d, p, starts=n)
    loop = screw_section(s)
    assert loop.gaps() < 1e-12
    poly = screw_polygon(s, tol=0.002)
    rad = np.hypot(poly[:, 0], poly[:, 1])
    # measured: crest on the major, root on the minor diameter
    assert rad.max() == pytest.approx(d / 2, abs=1e-9)
    assert rad.min() == pytest.approx(s.d3 / 2, abs=1e-9)
    assert Polygon(poly).is_valid and signed_area(poly) > 0
    # angular width of each thread on d2 = axial thickness P/2 mapped by 2π/L (helicoid
    # relation θ = 2π z / L, computed) = π / n; measured where the polygon crosses d2
    ang = np.sort(_crossings(poly, s.d2 / 2))
    assert len(ang) == 2 * n
    widths = []
    for k in range(n):  # lobe k centred at 2πk/n: the crossings either side of it
        c = 2 * math.pi * k / n
        rel = (ang - c + math.pi) % (2 * math.pi) - math.pi
        widths.append(rel[rel > 0].min() - rel[rel < 0].max())
    # tolerance: the flank is an Archimedean spiral whose polyline sags < 0.1 µm; allowed
    # here: 1 µm along the d2 circle, i.e. 1e-3 / r2 rad
    tol = 1e-3 / (s.d2 / 2)
    assert widths == pytest.approx([2 * math.pi * (p / 2) / s.lead] * n, abs=tol)
    assert widths[0] == pytest.approx(math.pi / n, abs=tol)


def test_transverse_area_matches_revolved_axial_profile():
    # Independent route (computed): a helical sweep occupies, at each radius, the same
    # fraction of the circle as the axial profile does of one pitch, so transverse area =
    # volume per pitch / P = (Pappus) 2π · A_axial · r̄ / P.
    s = thread_sizes(TRAPEZOIDAL, 12, 3, starts=2)
    ax = Polygon(screw_axial_profile(s))
    vol_per_pitch = 2 * math.pi * ax.area * ax.centroid.x
    area = Polygon(screw_polygon(s, tol=0.0005)).area
    # tolerance: arcs as chords at 0.5 µm and the spiral flanks as polylines (0.1 µm sag)
    assert area == pytest.approx(vol_per_pitch / s.pitch, rel=2e-4)


def test_twist_sign():
    s = thread_sizes(TRAPEZOIDAL, 10, 2, starts=2)
    # right hand: counter-clockwise as z grows (gen.geometry.body convention), one turn per lead
    assert screw_twist(s) == pytest.approx(2 * math.pi / 4.0)
    assert screw_twist(s, "left") == pytest.approx(-2 * math.pi / 4.0)


def test_nut_with_clearance_sizes_and_fit():
    s = thread_sizes(TRAPEZOIDAL, 12, 3)
    nut = nut_thread(s, 0.15)
    assert nut.minor_diameter == pytest.approx(9.3) and nut.root_diameter == pytest.approx(12.8)
    # end play from both flanks moved back 0.15 mm normal to a 15° flank (computed)
    assert nut.axial_play == pytest.approx(2 * 0.15 / math.cos(math.radians(15)), abs=1e-12)
    hole = Polygon(nut_polygon(nut, tol=0.001))
    screw = Polygon(screw_polygon(s, tol=0.001))
    assert hole.is_valid and hole.contains(screw)
    # measured gap between screw and nut in the transverse plane: positive everywhere
    assert hole.exterior.distance(screw.exterior) > 0.05
    rad = np.hypot(*nut_polygon(nut).T)
    assert rad.min() == pytest.approx(9.3 / 2, abs=1e-9) and rad.max() == pytest.approx(12.8 / 2, abs=1e-9)
    prof = nut_axial_profile(nut, 10.0)
    assert Polygon(prof).is_valid and signed_area(prof) > 0
    assert nut_section(nut).gaps() < 1e-12


def _nut_tooth_width_shapely(s, c):
    """Width of the nut's tooth at its crest radius, by buffering the screw's axial profile
    (with its neighbours one pitch away) by c with mitred corners: an independent route."""
    prof = screw_axial_profile(s)
    shapes = [Polygon(prof + [0, k * s.pitch]) for k in (-1, 0, 1)]
    grown = unary_union(shapes).buffer(c, join_style=2, mitre_limit=10)
    r = s.D1 / 2 + c + 1e-6
    line = LineString([(r, 0), (r, s.pitch)])
    free = line.difference(grown)
    return free.length


def test_nut_clearance_limit_and_refusal():
    s = thread_sizes(TRAPEZOIDAL, 12, 3)
    nut = nut_thread(s, 0.3)
    assert nut.tooth_crest == pytest.approx(_nut_tooth_width_shapely(s, 0.3), abs=1e-5)
    # bisection on the shapely route for the clearance that closes the thread
    lo, hi = 0.0, 1.5
    for _ in range(40):
        mid = (lo + hi) / 2
        lo, hi = (mid, hi) if _nut_tooth_width_shapely(s, mid) > 1e-9 else (lo, mid)
    assert nut.max_clearance == pytest.approx(lo, abs=1e-4)
    with pytest.raises(GeometryError) as exc:
        nut_thread(s, lo + 0.01)
    assert "closes the thread" in str(exc.value) and "largest clearance" in str(exc.value)
    with pytest.raises(GeometryError, match="negative"):
        nut_thread(s, -0.05)


def test_metric_nut_clearance_limit():
    s = thread_sizes(METRIC, 10, 1.5)
    nut = nut_thread(s, 0.1)
    assert nut.tooth_crest == pytest.approx(_nut_tooth_width_shapely(s, 0.1), abs=1e-5)
    with pytest.raises(GeometryError, match="closes the thread"):
        nut_thread(s, nut.max_clearance * 1.01)
