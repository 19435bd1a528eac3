"""ISO 21771 sizes, measured on the generated outline polygon."""

import math

import numpy as np
import pytest

from conftest import spur_flank
from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import gear_sizes
from gen.geometry.gear_outline import gear_loop
from gen.validate import measure


def test_shifted_pair_reference_sizes():
    # ISO 21771 (from memory): da = d + 2m(1 + x − k), df = d − 2m(1.25 − x), ISO 53 A
    # (from memory): m 2, α 20°, z 12/30, x +0.4/+0.2 with k 0.05
    # → da 29.400/64.600, df 20.600/55.800 (computed by hand: 24 + 4·1.35, 60 + 4·1.15;
    # 24 − 4·0.85, 60 − 4·1.05)
    rack = basic_rack("A")
    g1 = gear_sizes(12, 2.0, rack, x=0.4, tip_shortening=0.05)
    g2 = gear_sizes(30, 2.0, rack, x=0.2, tip_shortening=0.05)
    assert (g1.da, g2.da) == (pytest.approx(29.4), pytest.approx(64.6))
    assert (g1.df, g2.df) == (pytest.approx(20.6), pytest.approx(55.8))
    # standard center distance a = m (z1 + z2) / 2 = 42.000 (computed)
    assert (g1.d + g2.d) / 2 == pytest.approx(42.0)


def test_basic_relations():
    # ISO 21771 (from memory, standard): d = z m, p = π m, db = d cos α
    g = gear_sizes(20, 2.5, basic_rack("A"))
    assert g.d == pytest.approx(50.0)
    assert g.p == pytest.approx(math.pi * 2.5)
    assert g.db == pytest.approx(50.0 * math.cos(math.radians(20)))
    assert g.da == pytest.approx(55.0) and g.df == pytest.approx(43.75)


# ISO 53:1998 basic rack (from memory): h_aP = 1.0 m for all profiles; h_fP = 1.25 m for
# A, B, C and 1.40 m for D. Written here, not read from gen.geometry.basic_rack.
ISO53_DEDENDUM = {"A": 1.25, "B": 1.25, "C": 1.25, "D": 1.40}


@pytest.mark.parametrize("m,z,x,profile", [
    (1.0, 13, 0.3, "A"), (1.5, 16, 0.0, "A"), (2.0, 12, 0.4, "B"), (2.0, 30, 0.2, "A"),
    (0.8, 45, -0.2, "C"), (3.0, 25, 0.1, "D"), (1.25, 80, 0.0, "A"), (5.0, 19, 0.5, "B"),
])
def test_measured_outline_matches_iso21771(m, z, x, profile):
    _, _, flank = spur_flank(z, m=m, x=x, profile=profile)
    poly = gear_loop(flank).polygon(0.01)
    # expected sizes by the ISO 21771 closed forms (from memory), written in the test:
    # d = z m, da = d + 2 m (1 + x), df = d − 2 m (h_fP* − x), s = m (π/2 + 2 x tan α)
    d = z * m
    ra = d / 2 + m * (1.0 + x)
    rf = d / 2 - m * (ISO53_DEDENDUM[profile] - x)
    s = m * (math.pi / 2 + 2 * x * math.tan(math.radians(20.0)))
    r = measure.radii(poly)
    # tip and root circles are exact arcs in the outline: measured to rounding
    assert r.max() == pytest.approx(ra, abs=1e-9)
    assert r.min() == pytest.approx(rf, abs=1e-9)
    assert measure.tooth_count(poly) == z
    # arc thickness on d; polygon chords cost < 0.001 m
    thick = measure.arc_thickness(poly, d / 2)
    assert len(thick) == z
    assert np.abs(thick - s).max() < 1e-3 * m
    # chordal thickness on d: s̄ = d sin(s/d) (ISO 21771, from memory)
    chord = measure.chordal_thickness(poly, d / 2)
    assert np.abs(chord - d * math.sin(s / d)).max() < 1e-3 * m
    pitch = measure.angular_pitch(poly, d / 2)
    assert np.abs(pitch - 2 * math.pi / z).max() < 1e-9


def test_outline_closes_exactly():
    _, _, flank = spur_flank(17, m=1.0)
    assert gear_loop(flank).gaps() < 1e-12
