"""Involute function and its inverse."""

import math

import numpy as np
import pytest

from gen.geometry.involute import half_thickness_angle, inv, inv_inverse, involute_points


def test_inv_20_degrees():
    # inv 20° = 0.014904 (involute function tables, from memory; = tan 20° − 20° in rad)
    assert inv(math.radians(20)) == pytest.approx(0.0149044, abs=1e-7)
    # independent route: series inv α = α³/3 + 2α⁵/15 + 17α⁷/315 + 62α⁹/2835 (computed)
    a = math.radians(20)
    series = a**3 / 3 + 2 * a**5 / 15 + 17 * a**7 / 315 + 62 * a**9 / 2835 + 1382 * a**11 / 155925
    assert inv(a) == pytest.approx(series, rel=1e-5)


@pytest.mark.parametrize("deg", [0.5, 5, 14.5, 20, 25, 30, 45, 60, 80])
def test_inverse_round_trip(deg):
    a = math.radians(deg)
    assert inv_inverse(inv(a)) == pytest.approx(a, abs=1e-12)


def test_inverse_vectorised():
    a = np.radians(np.linspace(1, 70, 50))
    assert np.allclose(inv_inverse(inv(a)), a, atol=1e-12)


def test_shifted_pair_working_angle():
    # ISO 21771 (from memory): inv αw = inv α + 2 tan α (x1 + x2)/(z1 + z2); m 2, z 12/30,
    # x 0.4/0.2 → inv αw = 0.025304, αw = 23.693° (computed)
    a = math.radians(20)
    inv_w = inv(a) + 2 * math.tan(a) * (0.4 + 0.2) / (12 + 30)
    assert inv_w == pytest.approx(0.025304, abs=5e-7)
    assert math.degrees(inv_inverse(inv_w)) == pytest.approx(23.693, abs=5e-4)


def test_involute_points_unwind_the_base_circle():
    # defining property (common practice): the tangent from the point to the base circle has
    # the length of the unwound arc, rb·(θ + α_r) = √(r² − rb²)
    rb = 10.0
    r = np.linspace(10.0, 14.0, 9)
    p = involute_points(rb, r)
    th = np.arctan2(p[:, 1], p[:, 0])
    alpha_r = np.arccos(rb / r)
    assert np.allclose(rb * (th + alpha_r), np.sqrt(r**2 - rb**2), atol=1e-12)


def test_half_thickness_on_reference_circle():
    # ψ(rp) = s/(2 rp) by definition (ISO 21771)
    rp, a, s = 20.0, math.radians(20), 3.3
    assert half_thickness_angle(rp, rp=rp, rb=rp * math.cos(a), s=s) == pytest.approx(s / (2 * rp))
