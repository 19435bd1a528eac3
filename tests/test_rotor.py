"""Rotor math: half-section, mass properties, spinning-disc stresses, balance, sizing, uses.

Sources are named beside each check; "standard" = formulas in any mechanics text.
"""

import math

import numpy as np
import pytest

from gen.errors import GeometryError, ParamError
from gen.geometry.rotor import Holes, Pocket, Rotor, half_section, mass_properties, section_moment
from gen.geometry.rotor_materials import (HANDBOOK, MEMORY, PRACTICE, ROTOR_MATERIALS,
                                          rotor_material)
from gen.geometry.rotor_sizing import max_rim_width, size_rim
from gen.geometry.rotor_stress import (bored_disc_peak, disc_stresses, permissible_unbalance,
                                       rotor_stress, safety_factor_at, solid_disc_peak,
                                       speed_limit, thin_ring_stress)
from gen.geometry.rotor_use import (counter_rotating_pair, gyroscopic_torque, kinetic_energy,
                                    reaction_wheel, rpm_to_rad, spin_up_time)

RHO = 1240.0  # kg/m³ (PLA, common practice)


def annulus(rho, r_out, r_in, length):
    """(mass kg, axial inertia kg·m²) of a hollow cylinder, standard: I = m (R² + r²)/2."""
    m = rho * math.pi * (r_out ** 2 - r_in ** 2) * length * 1e-9
    return m, 0.5 * m * (r_out ** 2 + r_in ** 2) * 1e-6


def shoelace(poly):
    x, y = poly[:, 0], poly[:, 1]
    return 0.5 * float(np.sum(x * np.roll(y, -1) - np.roll(x, -1) * y))


# --- mass properties ---------------------------------------------------------------------------

def test_plain_disc_against_half_m_r_squared():
    # solid disc I = ½ m R², transverse about the centre m (3R² + h²)/12 (standard)
    R, T = 40.0, 12.0
    mp = mass_properties(Rotor(2 * R, T), RHO)
    m = RHO * math.pi * R * R * T * 1e-9
    assert mp.mass == pytest.approx(m, rel=1e-12)
    assert mp.axial_inertia == pytest.approx(0.5 * m * (R * 1e-3) ** 2, rel=1e-12)
    assert mp.transverse_inertia == pytest.approx(m * (3 * R * R + T * T) / 12 * 1e-6, rel=1e-12)
    assert mp.centroid_z == pytest.approx(T / 2)


def test_ring_against_half_m_sum_of_squares():
    # annulus I = ½ m (R² + r²) (standard)
    rotor = Rotor(100.0, 8.0, bore=60.0)
    mp = mass_properties(rotor, 7850.0)
    m, i = annulus(7850.0, 50.0, 30.0, 8.0)
    assert mp.mass == pytest.approx(m, rel=1e-12)
    assert mp.axial_inertia == pytest.approx(i, rel=1e-12)


def test_rim_web_hub_with_pocket_against_sum_of_annuli():
    # computed: the section split by hand into annuli, each I = ½ m (R² + r²) (standard)
    rotor = Rotor(120.0, 16.0, bore=8.0, rim_width=12.0, web_thickness=4.0, hub_diameter=24.0,
                  hub_length=20.0, hub_offset=-2.0, pocket=Pocket(30.0, 5.0))
    # rim 48..60 × 16; web 15..48 × 4 (z 6..10, above the 5 mm pocket);
    # hub 4..12 × 20 (z −2..18) minus its part in the pocket, 4..12 × (−2..5) = 7
    parts = [annulus(RHO, 60, 48, 16), annulus(RHO, 48, 12, 4), annulus(RHO, 12, 4, 20),
             annulus(RHO, 12, 4, -7)]
    mp = mass_properties(rotor, RHO)
    assert mp.mass == pytest.approx(sum(p[0] for p in parts), rel=1e-12)
    assert mp.axial_inertia == pytest.approx(sum(p[1] for p in parts), rel=1e-12)
    poly = half_section(rotor)
    # closed counter-clockwise outline whose area is the sum of the rectangles (computed)
    assert shoelace(poly) == pytest.approx(12 * 16 + 36 * 4 + 8 * 13, rel=1e-12)
    assert poly[:, 0].min() == pytest.approx(4.0) and poly[:, 0].max() == pytest.approx(60.0)
    # Pappus–Guldinus: V = 2π · area · r̄ (standard), r̄ from the shoelace centroid formula
    x, y = poly[:, 0], poly[:, 1]
    cr = x * np.roll(y, -1) - np.roll(x, -1) * y
    rbar = float(np.sum((x + np.roll(x, -1)) * cr)) / (6 * shoelace(poly))
    assert mp.volume == pytest.approx(2 * math.pi * shoelace(poly) * rbar, rel=1e-12)


def test_section_moment_of_a_triangle():
    # ∫∫ r³ dA over the triangle (0,0) (a,0) (0,b): ∫0^a r³ b(1 − r/a) dr = b a⁴/20 (computed)
    a, b = 3.0, 2.0
    tri = np.array([[0, 0], [a, 0], [0, b]], dtype=float)
    assert section_moment(tri, 3, 0) == pytest.approx(b * a ** 4 / 20, rel=1e-12)
    assert section_moment(tri, 0, 0) == pytest.approx(a * b / 2, rel=1e-12)


def test_lightening_holes_subtracted_exactly():
    base = dict(outer_diameter=100.0, thickness=10.0, bore=8.0, rim_width=10.0,
                web_thickness=3.0, hub_diameter=20.0)
    holes = Holes(6, 10.0, 27.0)
    full = mass_properties(Rotor(**base), RHO)
    cut = mass_properties(Rotor(**base, holes=holes), RHO)
    # independent route: midpoint quadrature of ∫ (x² + y²) dA over one hole disc
    n = 1200
    s = (np.arange(n) + 0.5) / n * 10.0 - 5.0
    X, Y = np.meshgrid(s, s)
    inside = X ** 2 + Y ** 2 <= 25.0
    dA = (10.0 / n) ** 2
    area = inside.sum() * dA
    r2 = ((X + 27.0) ** 2 + Y ** 2)[inside].sum() * dA
    rho = RHO * 1e-9
    assert full.mass - cut.mass == pytest.approx(6 * rho * area * 3.0, rel=2e-3)
    assert (full.axial_inertia - cut.axial_inertia) == pytest.approx(6 * rho * r2 * 3.0 * 1e-6,
                                                                      rel=2e-3)


def test_thin_rotor_with_holes_obeys_perpendicular_axis_theorem():
    # thin plate: I_z = I_x + I_y, and with ≥ 3 equally spaced holes I_x = I_y (standard)
    rotor = Rotor(100.0, 0.001, bore=8.0, rim_width=10.0, web_thickness=0.001, hub_diameter=20.0,
                  holes=Holes(5, 12.0, 26.0))
    mp = mass_properties(rotor, RHO)
    assert mp.transverse_inertia == pytest.approx(mp.axial_inertia / 2, rel=1e-6)


def test_bad_rotors_refused():
    with pytest.raises(ParamError, match="web"):
        half_section(Rotor(100, 5, rim_width=10, web_thickness=6, hub_diameter=20))
    with pytest.raises(ParamError):  # holes reach the hub
        mass_properties(Rotor(100, 10, rim_width=10, web_thickness=3, hub_diameter=20,
                              holes=Holes(4, 12, 14)), RHO)
    with pytest.raises(ParamError):  # two holes only
        mass_properties(Rotor(100, 10, rim_width=10, web_thickness=3, hub_diameter=20,
                              holes=Holes(2, 8, 27)), RHO)
    with pytest.raises(GeometryError):  # pocket deeper than the web cuts the hub off the rim
        half_section(Rotor(100, 10, rim_width=10, web_thickness=3, hub_diameter=20,
                           pocket=Pocket(60, 8)))


# --- stresses ----------------------------------------------------------------------------------

def test_timoshenko_solid_and_bored_disc_peaks_and_hand_case():
    # Timoshenko, Strength of Materials II (from memory): solid centre (3+ν)/8 ρω²R²;
    # bore hoop (3+ν)/4 ρω² (R² + (1−ν)/(3+ν) r²).
    # Hand case (computed): PLA ρ 1240, ν 0.36, R 50 mm, 10 000 rpm →
    # ω = 1047.198 rad/s, σ = 0.42 · 1240 · 1096623 · 0.0025 Pa = 1.42780 MPa
    w = 10000 * 2 * math.pi / 60
    assert solid_disc_peak(w, 1240.0, 0.36, 50.0) == pytest.approx(1.42780, rel=1e-5)
    sr, st = disc_stresses(np.array([0.0]), w, 1240.0, 0.36, 50.0)
    assert sr[0] == pytest.approx(1.42780, rel=1e-5) and st[0] == pytest.approx(sr[0])
    # bored disc, SI by hand: r 10 mm → (3.36/4) ρω² (0.05² + 0.64/3.36 · 0.01²)
    want = 3.36 / 4 * 1240 * w * w * (0.0025 + 0.64 / 3.36 * 1e-4) / 1e6
    assert bored_disc_peak(w, 1240.0, 0.36, 50.0, 10.0) == pytest.approx(want, rel=1e-12)
    sr, st = disc_stresses(np.array([10.0, 50.0]), w, 1240.0, 0.36, 50.0, 10.0)
    assert st[0] == pytest.approx(want, rel=1e-12)
    assert sr == pytest.approx([0.0, 0.0], abs=1e-12)     # free edges
    # a thin ring is the limit of a disc whose bore nears the rim: ρω²R² (standard)
    assert bored_disc_peak(w, 1240.0, 0.36, 50.0, 49.999) == pytest.approx(
        thin_ring_stress(w, 1240.0, 50.0), rel=1e-4)


def test_disc_stress_distribution_against_numerical_solution():
    # independent route (standard plane-stress theory): solve
    # u'' + u'/r − u/r² = −(1−ν²) ρω² r / E with σ_r = 0 at both edges by finite differences
    a, b, nu, rho, w, E = 10.0, 50.0, 0.36, 1240.0, 1500.0, 3500.0
    n = 801
    r = np.linspace(a, b, n)
    h = r[1] - r[0]
    A = np.zeros((n, n))
    rhs = -(1 - nu ** 2) * rho * w * w * 1e-12 * r / E
    for i in range(1, n - 1):
        A[i, i - 1] = 1 / h ** 2 - 1 / (2 * h * r[i])
        A[i, i] = -2 / h ** 2 - 1 / r[i] ** 2
        A[i, i + 1] = 1 / h ** 2 + 1 / (2 * h * r[i])
    for i, sgn in ((0, 1), (n - 1, -1)):           # one-sided second-order u' + ν u/r = 0
        j = [i, i + sgn, i + 2 * sgn]
        A[i, j] = np.array([-3, 4, -1]) / (2 * h) * sgn
        A[i, i] += nu / r[i]
        rhs[i] = 0.0
    u = np.linalg.solve(A, rhs)
    du = np.gradient(u, h, edge_order=2)
    sr_num = E / (1 - nu ** 2) * (du + nu * u / r)
    st_num = E / (1 - nu ** 2) * (u / r + nu * du)
    sr, st = disc_stresses(r, w, rho, nu, b, a)
    assert np.max(np.abs(st - st_num)) < 1e-3 * st.max()
    assert np.max(np.abs(sr - sr_num)) < 1e-3 * st.max()


def test_rotor_stress_layouts_speed_limit_and_safety():
    pla = rotor_material("PLA")
    disc = Rotor(100.0, 10.0)
    s = rotor_stress(disc, pla, 1000.0)
    assert s.where == "centre"
    # speed limit of a solid disc, computed: ω = √(σ/S · 8 / ((3+ν) ρ R²)) in SI
    want = math.sqrt(12e6 / 2 * 8 / (3.36 * 1240 * 0.05 ** 2))
    assert speed_limit(disc, pla, 2.0) == pytest.approx(want, rel=1e-12)
    assert safety_factor_at(disc, pla, want) == pytest.approx(2.0, rel=1e-12)
    # rim + web: the thin-ring estimate at the outer radius governs (ρω²R² ≥ bore hoop)
    wheel = Rotor(100.0, 10.0, bore=8.0, rim_width=10.0, web_thickness=3.0, hub_diameter=20.0)
    s = rotor_stress(wheel, pla, 1000.0)
    assert s.where == "rim" and s.peak == pytest.approx(1240 * 1e6 * 0.05 ** 2 / 1e6)
    assert s.web < s.peak


def test_iso_21940_g63_at_3000_rpm():
    # ISO 21940-11 (from memory): G 6.3 at 3000 rpm → e_per ≈ 20 µm; U_per = m e (computed)
    u = permissible_unbalance(6.3, rpm_to_rad(3000), 0.5)
    assert u.specific * 1000 == pytest.approx(20.0, rel=0.01)
    assert u.unbalance == pytest.approx(500 * 6.3 / (100 * math.pi), rel=1e-12)


def test_material_table_has_status_words():
    words = {PRACTICE, HANDBOOK, MEMORY}
    for m in ROTOR_MATERIALS.values():
        assert {m.status_of(f) for f in ("density", "strength", "poisson", "youngs")} <= words
        assert m.strength_kind in ("allowable", "yield")
    # steel 7850 kg/m³, E 210 GPa (handbook values, from memory)
    assert rotor_material("steel").density == 7850.0
    assert rotor_material("aluminium").name.startswith("aluminium 6061")
    with pytest.raises(ParamError):
        rotor_material("unobtainium")


# --- sizing ------------------------------------------------------------------------------------

ENV = Rotor(100.0, 10.0, bore=8.0, web_thickness=3.0, hub_diameter=20.0,
            holes=Holes(5, 10.0, 27.0))


def _inertia_by_annuli(w):
    """Computed independently: rim, web (less holes, I_h = m_h (R_c² + d_h²/8)), hub annuli."""
    ri = 50.0 - w
    i = annulus(RHO, 50, ri, 10)[1] + annulus(RHO, ri, 10, 3)[1] + annulus(RHO, 10, 4, 10)[1]
    mh = RHO * 1e-9 * math.pi * 25.0 * 3.0
    return i - 5 * mh * (27.0 ** 2 + 100.0 / 8) * 1e-6


def test_sizing_meets_target_within_one_percent():
    target = 8.0e-5
    res = size_rim(ENV, RHO, target)
    assert res.met and res.rim_width is not None
    i = _inertia_by_annuli(res.rim_width)
    assert target <= i * (1 + 1e-9) and i <= 1.01 * target
    # same target as momentum at a speed: h = I ω
    res2 = size_rim(ENV, RHO, target_momentum=target * 600.0, omega=600.0)
    assert res2.rim_width == pytest.approx(res.rim_width, rel=1e-6)


def test_impossible_target_reports_largest_reachable():
    res = size_rim(ENV, RHO, 1.0e-3)
    # widest rim stops at the holes' outer edge, 27 + 5 = 32 mm → w 18 mm (computed)
    assert max_rim_width(ENV) == pytest.approx(18.0)
    assert not res.met and res.rim_width is None
    assert res.max_inertia == pytest.approx(_inertia_by_annuli(18.0), rel=1e-12)
    assert "beyond" in res.message


# --- uses --------------------------------------------------------------------------------------

def test_spin_figures_and_uses():
    # computed by hand: I 1e-4 kg·m², 600 rad/s → h 0.06 N·m·s, E 18 J, t at 0.02 N·m 3 s
    assert kinetic_energy(1e-4, 600.0) == pytest.approx(18.0)
    assert spin_up_time(1e-4, 600.0, 0.02) == pytest.approx(3.0)
    rw = reaction_wheel(1e-4, 0.05, 0.02, 600.0)
    assert rw.body_acceleration == pytest.approx(0.4)          # T/I_b
    assert rw.saturation_time == pytest.approx(3.0)            # I_w ω_max / T
    assert rw.body_rate_at_saturation == pytest.approx(1.2)    # momentum exchange
    assert gyroscopic_torque(0.06, 2.0) == pytest.approx(0.12)  # τ = h Ω
    pair = counter_rotating_pair(1e-4, 600.0, 1e-4, -600.0, 0.02, -0.02, transverse_rate=2.0)
    assert pair.net_momentum == pytest.approx(0.0) and pair.reaction_direction == "none"
    assert pair.gyroscopic_torque == pytest.approx(0.0)
    lop = counter_rotating_pair(1e-4, 600.0, 0.5e-4, -600.0, 0.02, -0.01)
    assert lop.net_momentum == pytest.approx(0.03) and lop.reaction_direction == "-z"
