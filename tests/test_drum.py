"""Cable drum: groove sizes, turns, bend-ratio refusal, capstan, tension, groove sections."""

import math

import numpy as np
import pytest
from shapely.geometry import Polygon

from gen.errors import GeometryError
from gen.geometry.drum import (capstan_ratio, cable_tension, drum_section, drum_sizes, drum_twist,
                               groove_axial_profile, holding_force, joint_drive, min_ratio)
from gen.geometry.section import signed_area


@pytest.mark.parametrize("wraps,ratio", [(1, 3.51), (2, 12.35), (3, 43.38)])
def test_capstan_ratio(wraps, ratio):
    # capstan equation T1/T2 = e^(μθ) (Euler–Eytelwein, from memory): μ 0.2, 1/2/3 wraps →
    # 3.51 / 12.35 / 43.38 (computed)
    r = capstan_ratio(0.2, 2 * math.pi * wraps)
    assert r == pytest.approx(ratio, abs=0.005)
    # independent route: integrate dT/dθ = μ T (Euler–Eytelwein, from memory) in small steps
    # (Euler steps: T grows by (1 + μ dθ) per step; error ~ μθ·μ dθ/2 < 1e-5 relative)
    steps = 200000
    dth = 2 * math.pi * wraps / steps
    assert r == pytest.approx((1 + 0.2 * dth) ** steps, rel=1e-4)
    assert holding_force(100.0, 0.2, wraps) == pytest.approx(100.0 / r, rel=1e-12)


def test_drum_sizes_defaults():
    s = drum_sizes(1.0, 40.0, 300.0, cable="steel-7x19")
    # common practice: groove pitch 1.1 d_c, groove radius 0.53 d_c, depth 0.35 d_c
    assert s.groove_pitch == pytest.approx(1.1) and s.groove_radius == pytest.approx(0.53)
    assert s.groove_depth == pytest.approx(0.35)
    # computed: D_p = D + d_c = 41; turns = 300 / (π 41) = 2.329; + 2 dead turns
    assert s.pitch_diameter == 41.0
    assert s.active_turns == pytest.approx(2.329, abs=5e-4)
    assert s.total_turns == pytest.approx(4.329, abs=5e-4)
    # the cable paid out equals the pitch circumference times the active turns
    assert s.active_turns * math.pi * s.pitch_diameter == pytest.approx(300.0, rel=1e-12)
    assert s.grooved_length == pytest.approx(4.329 * 1.1, abs=1e-3)
    assert s.length == pytest.approx(s.grooved_length + 2 * 1.1, rel=1e-12)
    # land at the top: pitch − groove chord 2√(r_g² − (r_g − depth)²) (computed)
    assert s.land_width == pytest.approx(1.1 - 2 * math.sqrt(0.53 ** 2 - 0.18 ** 2), abs=1e-12)
    assert s.ratio == 41.0 and s.min_ratio == min_ratio("steel-7x19")


def test_drum_too_small_refused_in_plain_words():
    with pytest.raises(GeometryError) as exc:
        drum_sizes(1.0, 20.0, 100.0, cable="steel-7x19")
    msg = str(exc.value)
    assert "too small" in msg and "20 mm drum" in msg and "at least 30" in msg
    # a braided fibre line bends tighter (common practice): the same drum is accepted
    assert drum_sizes(1.0, 20.0, 100.0, cable="uhmwpe-braid").ratio == 21.0


def test_other_refusals():
    with pytest.raises(GeometryError, match="dead turns"):
        drum_sizes(1.0, 40.0, 100.0, dead_turns=1)
    with pytest.raises(GeometryError, match="run into each other"):
        drum_sizes(1.0, 40.0, 100.0, gap=0.0, groove_depth=0.53)
    with pytest.raises(GeometryError, match="narrower than the"):
        drum_sizes(1.0, 40.0, 100.0, groove_radius=0.45)
    with pytest.raises(GeometryError, match="unknown cable"):
        drum_sizes(1.0, 40.0, 100.0, cable="hemp")


def test_tension_and_joint_drive():
    # computed: 0.5 N·m on a 41 mm pitch diameter → 0.5 / 0.0205 = 24.39 N
    assert cable_tension(0.5, 41.0) == pytest.approx(24.390, abs=1e-3)
    jd = joint_drive(41.0, 82.0, 0.5, drum_rpm=60)
    assert jd.ratio == pytest.approx(2.0)
    # power is conserved without losses: τ_drum ω_drum = τ_joint ω_joint (computed)
    assert jd.joint_torque * jd.joint_speed == pytest.approx(0.5 * 60, rel=1e-12)
    assert jd.joint_speed == pytest.approx(30.0)


def test_groove_axial_profile():
    s = drum_sizes(2.0, 60.0, 500.0)
    prof = groove_axial_profile(s, samples=201)
    assert Polygon(prof).is_valid and signed_area(prof) > 0
    # computed: rectangle to the lands minus the circular segment of the groove,
    # segment area = r² (θ − sin θ)/2 with θ the angle the top chord subtends
    rg, depth = s.groove_radius, s.groove_depth
    theta = 2 * math.acos((rg - depth) / rg)
    seg = rg * rg * (theta - math.sin(theta)) / 2
    expect = s.outer_diameter / 2 * s.groove_pitch - seg
    # the 200 chords on the groove arc cut off 200 · r² (Δ − sin Δ)/2, Δ = θ/200 (computed)
    delta = theta / 200
    chords = 200 * rg * rg * (delta - math.sin(delta)) / 2
    assert signed_area(prof) == pytest.approx(expect + chords, abs=1e-9)


def test_drum_transverse_section_measured():
    s = drum_sizes(2.0, 60.0, 500.0)
    loop = drum_section(s)
    assert loop.gaps() < 1e-12
    poly = loop.polygon(0.0005)
    rad = np.hypot(poly[:, 0], poly[:, 1])
    assert rad.min() == pytest.approx(30.0, abs=1e-9)
    assert rad.max() == pytest.approx(30.0 + 0.7, abs=1e-9)
    assert Polygon(poly).is_valid
    # the land on the outer circle spans 2π · land / p (helicoid relation, computed)
    top = poly[np.abs(rad - rad.max()) < 1e-9]
    ang = np.arctan2(top[:, 1], top[:, 0]) % (2 * math.pi)
    assert ang.max() - ang.min() == pytest.approx(2 * math.pi * s.land_width / s.groove_pitch, abs=1e-9)
    # Pappus route (computed): transverse area = revolved axial profile volume per pitch / p
    ax = Polygon(groove_axial_profile(s, samples=401))
    vol = 2 * math.pi * ax.area * ax.centroid.x
    # tolerance: a polyline sagging ≤ t inside a curve of length ℓ loses ≤ ⅔ t ℓ of area;
    # arcs at t = 0.5 µm and flanks at 0.1 µm, ℓ < 2π·30.7 mm → < 0.08 mm² of 2870 mm²
    assert Polygon(poly).area == pytest.approx(vol / s.groove_pitch, abs=0.08)
    assert drum_twist(s) == pytest.approx(2 * math.pi / s.groove_pitch)
