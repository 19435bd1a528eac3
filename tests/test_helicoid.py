"""Transverse section of a helicoid from its axial profile."""

import math

import numpy as np
import pytest
from shapely.geometry import Polygon

from gen.errors import GeometryError
from gen.geometry.helicoid import flank_samples, helicoid_loop, twist_rate


def test_square_thread_section():
    # a square thread (axial width P/2 at every radius) maps to lobes of constant angular
    # width 2π (P/2)/L = π/n: radial flanks (computed from θ = 2π z / L)
    r = np.linspace(4.0, 5.0, 5)
    for n in (1, 2, 4):
        loop = helicoid_loop(r, np.full(5, 1.0), lead=2.0 * n, starts=n, phase=0.3)
        assert loop.gaps() < 1e-12
        poly = loop.polygon(1e-6)
        p = Polygon(poly)
        assert p.is_valid
        # exact area: half of the annulus plus the core (computed); chords sagging 1e-6 mm
        # lose < ⅔ · 1e-6 · 2π·5 ≈ 2e-5 mm² of the 64 mm²
        assert p.area == pytest.approx(math.pi * 16 + math.pi * (25 - 16) / 2, abs=3e-5)
        # the first flank is radial at angle phase − π/(2n)
        first = loop.curves[0].points
        ang = np.arctan2(first[:, 1], first[:, 0])
        assert np.allclose(ang, 0.3 - math.pi / (2 * n), atol=1e-12)


def test_refusals_and_twist():
    r = np.linspace(4.0, 5.0, 5)
    with pytest.raises(GeometryError, match="between 0 and the pitch"):
        helicoid_loop(r, np.full(5, 2.5), lead=2.0)
    with pytest.raises(GeometryError, match="strictly increasing"):
        helicoid_loop(r[::-1], np.full(5, 1.0), lead=2.0)
    with pytest.raises(GeometryError, match="hand"):
        twist_rate(2.0, "up")
    assert twist_rate(4.0) == pytest.approx(math.pi / 2) and twist_rate(4.0, "left") < 0


def test_flank_samples_meet_the_sag():
    # an arc of radius 30 through 1 rad in k equal steps sags 30 (1 − cos(Δ/2)) ≈ 30 Δ²/8
    k = flank_samples(1.0, 30.0, sag=1e-4) - 1
    assert 30 * (1 - math.cos(1.0 / k / 2)) <= 1e-4
