"""Planetary gearset math: ratios, coaxial distances, spacing, neighbours, tooth phase, loads."""

import math

import pytest

from gen.findings import ERROR
from gen.geometry.planetary import (LOAD_SHARING, member_speeds, mesh_loads, phasing,
                                    planet_spacing, planetary_set, shift_sum_for, willis_ratio,
                                    working_distance)

A20 = math.radians(20.0)


def _inv(a):
    return math.tan(a) - a


def _inv_inverse(v):
    """Bisection on [0, 1.5] rad: a different route from the project's Newton solver."""
    lo, hi = 0.0, 1.5
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if _inv(mid) < v else (lo, mid)
    return 0.5 * (lo + hi)


def _codes(s):
    return {f.code for f in s.findings}


# --- ratios ------------------------------------------------------------------------------------

def test_ring_held_sun_in_ratio_five():
    # sun 12 / planets 18 / ring 48: ring held, sun in, carrier out → i = 1 + 48/12 = 5
    # (Willis equation, from memory; computed)
    assert willis_ratio(12, 48, "ring", "sun", "carrier") == pytest.approx(1 + 48 / 12)
    # carrier held: i = −zr/zs = −4; sun held, ring in: (1 + k)/k = 1.25 (computed, Willis)
    assert willis_ratio(12, 48, "carrier", "sun", "ring") == pytest.approx(-4.0)
    assert willis_ratio(12, 48, "sun", "ring", "carrier") == pytest.approx(1.25)


@pytest.mark.parametrize("held", ["sun", "ring", "carrier"])
def test_every_arrangement_satisfies_willis(held):
    # (ωs − ωc) = −(zr/zs)(ωr − ωc), Willis (from memory), checked on the solved speeds
    zs, zr = 17, 61
    for driver in {"sun", "ring", "carrier"} - {held}:
        w = member_speeds(zs, zr, held, driver, 3.7)
        assert w[held] == 0.0 and w[driver] == 3.7
        assert (w["sun"] - w["carrier"]) == pytest.approx(-(zr / zs) * (w["ring"] - w["carrier"]))


# --- centre distances --------------------------------------------------------------------------

def test_working_distance_against_shifted_reference_pair():
    # ISO 21771 working center distance (from memory; computed): m 2, z 12/30, x +0.4/+0.2 → aw 43.100 mm
    assert working_distance(12, 30, 0.4, 0.2, 2.0, A20) == pytest.approx(43.100, abs=5e-4)


def test_standard_set_is_coaxial():
    s = planetary_set(12, 18, 48, 3, 1.0)
    # standard gears: a = m(zs + zp)/2 = m(zr − zp)/2 = 15 mm when zr = zs + 2zp (common practice)
    assert s.coaxial.coaxial and s.coaxial.sun_planet == pytest.approx(15.0)
    assert s.coaxial.planet_ring == pytest.approx(15.0)
    assert s.findings == ()


def test_not_coaxial_reports_the_shift_sum_that_fixes_it():
    s = planetary_set(12, 18, 49, 3, 1.0)
    assert "planetary-not-coaxial" in _codes(s)
    assert s.coaxial.planet_ring == pytest.approx(15.5)          # m (49 − 18)/2 (computed)
    x = s.coaxial.ring_pair_shift_sum
    # recompute the internal pair independently at that shift sum (signed ISO 21771 relations,
    # z2 = −49): inv αw = inv α + 2 tan α · x/(18 − 49); aw = |a| cos α / cos αw → 15.0 mm
    aw = _inv_inverse(_inv(A20) + 2 * math.tan(A20) * x / (18 - 49))
    assert 15.5 * math.cos(A20) / math.cos(aw) == pytest.approx(15.0, abs=1e-9)
    assert shift_sum_for(18, -49, 1.0, A20, 15.0) == pytest.approx(x)


# --- spacing and neighbours --------------------------------------------------------------------

def test_equal_spacing_condition():
    sp = planet_spacing(12, 48, 3)
    assert sp.equal and sp.quotient == 20              # (12 + 48)/3 = 20 whole (computed)
    assert [math.degrees(a) for a in sp.angles] == pytest.approx([0, 120, 240])


def test_unequal_spacing_reports_nearest_angles_and_count():
    # 14 / 17 / 48, N 3: (14 + 48)/3 = 20.67 not whole; planets at 2π n/62 nearest 120°, 240°:
    # n = 21 → 121.935°, n = 41 → 238.065°; 62 = 2 · 31 so the nearest working N is 2 (computed)
    s = planetary_set(14, 17, 48, 3, 1.0)
    assert not s.spacing.equal and "planet-spacing-unequal" in _codes(s)
    assert [math.degrees(a) for a in s.spacing.angles] == pytest.approx(
        [0.0, 360 * 21 / 62, 360 * 41 / 62])
    assert s.nearest_count == 2


def test_neighbour_condition_just_passing_and_failing():
    # 12 / 18 / 48, m 1, N 4: planet centres 15 mm out, 90° apart; tip diameter m(18 + 2) = 20.
    # Centre-to-centre by coordinates (computed): |(15, 0) − (0, 15)| = 21.2132 → gap 1.2132 mm
    gap = math.hypot(15.0, -15.0) - 20.0
    ok = planetary_set(12, 18, 48, 4, 1.0, margin=gap - 0.01)
    bad = planetary_set(12, 18, 48, 4, 1.0, margin=gap + 0.01)
    assert min(ok.tip_gaps) == pytest.approx(gap, abs=1e-9)
    assert "planets-collide" not in _codes(ok)
    assert "planets-collide" in _codes(bad)
    assert any(f.severity == ERROR for f in bad.findings)
    # five planets cannot fit: 2·15·sin 36° = 17.63 < 20 (computed)
    assert "planets-collide" in _codes(planetary_set(12, 18, 48, 5, 1.0))


# --- tooth phase -------------------------------------------------------------------------------

def _nearest_offset(phase, z, direction, half):
    """Angle (rad, in (−π/z, π/z]) from ``direction`` to the nearest tooth (half=0) or space
    (half=0.5) centre of a gear with tooth 0 at ``phase``."""
    p = 2 * math.pi / z
    d = (phase + half * p - direction) % p
    return d - p if d > p / 2 else d


def _meshes(zs, zp, zr, m, sun, ring, psi, planet):
    """World check: at each pitch point, does a tooth of one gear face a space of the other?

    Arc offsets along each pitch circle (standard gears, radii m z/2), counter-clockwise about
    each gear; at the sun–planet contact the two tangents are opposite, at the ring contact
    they agree. Returns the two mismatches in mm, folded to a circular pitch π m.
    """
    p = math.pi * m
    u_sun = _nearest_offset(sun, zs, psi, 0.0) * m * zs / 2
    u_pl_space = _nearest_offset(planet, zp, psi + math.pi, 0.5) * m * zp / 2
    e1 = (u_sun + u_pl_space + p / 2) % p - p / 2
    u_pl_tooth = _nearest_offset(planet, zp, psi, 0.0) * m * zp / 2
    u_ring_space = _nearest_offset(ring, zr, psi, 0.5) * m * zr / 2
    e2 = (u_pl_tooth - u_ring_space + p / 2) % p - p / 2
    return e1, e2


@pytest.mark.parametrize("zs,zp,zr,n", [(12, 18, 48, 3), (13, 17, 47, 3), (20, 15, 50, 5)])
def test_phasing_lines_up_teeth_and_spaces(zs, zp, zr, n):
    sp = planet_spacing(zs, zr, n)
    assert sp.equal
    for carrier in (0.0, 0.3, 2.0):
        ph = phasing(zs, zp, zr, sp.angles, ring=0.0, carrier=carrier)
        # the sun turned by the carrier with the ring held: (1 + zr/zs) c (Willis, computed);
        # the planet by c − (ωs − ωc) zs/zp = c (1 − zr/zp)
        ph0 = phasing(zs, zp, zr, sp.angles)
        assert ph.sun - ph0.sun == pytest.approx(carrier * (1 + zr / zs))
        for k in range(n):
            assert ph.planets[k] - ph0.planets[k] == pytest.approx(carrier * (1 - zr / zp))
            e1, e2 = _meshes(zs, zp, zr, 1.0, ph.sun, ph.ring, ph.positions[k], ph.planets[k])
            assert abs(e1) < 1e-9 and abs(e2) < 1e-9
            assert abs(ph.sun_residual[k]) < 1e-9 and abs(ph.ring_residual[k]) < 1e-9


def test_planet_off_the_assembly_angles_does_not_mesh():
    # 14 / 17 / 48 with planets forced to 0°, 120°, 240°: 120° is 20.67 steps of 360°/62,
    # 0.33 sun pitch off (computed); the world check sees a tooth against a tooth
    ph = phasing(14, 17, 48, [0.0, 2 * math.pi / 3, 4 * math.pi / 3])
    e1, _ = _meshes(14, 17, 48, 1.0, ph.sun, ph.ring, ph.positions[1], ph.planets[1])
    assert abs(e1) == pytest.approx(math.pi * (1 / 3), abs=1e-9)
    assert abs(ph.sun_residual[1]) == pytest.approx(1 / 3, abs=1e-9)
    # on the assemblable angles it meshes
    good = phasing(14, 17, 48, planet_spacing(14, 48, 3).angles)
    assert max(abs(v) for v in good.sun_residual) < 1e-9


# --- loads -------------------------------------------------------------------------------------

def test_mesh_loads_hand_case():
    # 1 N·m on the sun of 12 / 18 / 48, m 1, 3 planets, Kγ 1.15 (common practice, from memory):
    # r_sun 6 mm → F = 1.15 · 1 / 3 / 0.006 = 63.889 N (computed)
    loads = mesh_loads(12, 18, 48, 3, 1.0, 15.0, 15.0)
    assert LOAD_SHARING[3] == 1.15 and loads.load_sharing == 1.15
    assert loads.sun_mesh_force == pytest.approx(1.15 / 3 / 0.006)
    # ideal torque balance Ts + Tr + Tc = 0 with Tr = (zr/zs) Ts (computed, Willis)
    assert loads.ring_torque == pytest.approx(4.0) and loads.carrier_torque == pytest.approx(-5.0)
    # ring torque rebuilt from the ring-mesh forces on ring pitch radius 24 mm (computed)
    assert 3 * loads.ring_mesh_force * 0.024 / 1.15 == pytest.approx(4.0)
