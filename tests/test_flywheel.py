"""flywheel parts and the rotors: section through check, their triangles, and refusals.

Sources beside each check: "standard" = rigid-body and mass formulas of any mechanics text;
Timoshenko's rotating-disc formulas (Strength of Materials, Part II) and ISO 21940-11's
e_per = G/ω are from memory; "computed" values are worked again here by another route.
"""

import json
import math

import numpy as np
import pytest

from gen.check import check
from gen.cli import main
from gen.errors import ParamError

STEEL = 7850.0  # kg/m³; ν 0.30; yield 235 MPa (S235, the rotor table's steel)

DISC = """parts:
  rover_rotor: {kind: flywheel, outer_diameter: 120, thickness: 20, material: steel,
                max_speed: 3000, bore: 8%s}
"""

RIM = """parts:
  w:
    kind: flywheel
    layout: rim_web
    material: %s
    outer_diameter: 120
    thickness: 20
    max_speed: 3000
    bore: 8
    web_thickness: 4
    hub_diameter: 20
    %s
"""


def one(path):
    res = check([path])
    assert len(res.models) == 1, [f.message for f in res.findings]
    return res, next(iter(res.models.values()))


def refused(path):
    """The single ParamError line of a part that is refused."""
    res = check([path])
    assert not res.ok and not res.models
    errs = [f for f in res.findings if f.severity == "error"]
    assert len(errs) == 1
    return errs[0].message


# --- the parameter form -----------------------------------------------------------------

@pytest.fixture(scope="module")
def disc(tmp_path_factory):
    p = tmp_path_factory.mktemp("fw") / "disc.yaml"
    p.write_text(DISC % ", motor_torque: 0.5")
    return one(str(p))


def test_disc_mass_and_inertia_against_closed_forms(disc):
    # bored disc: m = ρ π (R² − a²) T, I_z = ½ m (R² + a²) (standard), SI units throughout
    _, part = disc
    R, a, T = 0.060, 0.004, 0.020
    m = STEEL * math.pi * (R * R - a * a) * T
    s = part.sizes
    assert s["mass"] == pytest.approx(m, rel=1e-12)
    assert s["inertia_axial"] == pytest.approx(0.5 * m * (R * R + a * a), rel=1e-12)
    # across the axis through the centre: m (3 (R² + a²) + T²)/12 (standard, hollow cylinder)
    assert s["inertia_transverse"] == pytest.approx(m * (3 * (R * R + a * a) + T * T) / 12,
                                                    rel=1e-12)


def test_disc_momentum_energy_and_spin_up(disc):
    # h = I ω, E = ½ I ω², t = I ω / T (standard); ω = 2π·3000/60 = 100π rad/s (computed)
    _, part = disc
    s = part.sizes
    w = 100 * math.pi
    assert s["angular_momentum"] == pytest.approx(s["inertia_axial"] * w, rel=1e-12)
    assert s["kinetic_energy"] == pytest.approx(0.5 * s["inertia_axial"] * w * w, rel=1e-12)
    assert s["spin_up_time"] == pytest.approx(s["inertia_axial"] * w / 0.5, rel=1e-12)


def test_disc_peak_stress_hand_computed(disc):
    # Timoshenko, bored rotating disc (from memory): hoop stress at the bore
    #   σ = (3+ν)/4 ρω² (b² + (1−ν)/(3+ν) a²)
    # by hand, SI: ρω² = 7850 · (100π)² = 7.7476e8; b² + 0.7/3.3 a² = 3.6e-3 + 3.3939e-6
    # → σ = 0.825 · 7.7476e8 · 3.60339e-3 = 2.3033e6 Pa = 2.303 MPa (computed)
    _, part = disc
    assert part.sizes["peak_stress"] == pytest.approx(2.303, abs=0.001)
    assert part.sizes["peak_stress_at"] == "bore"
    rho_w2 = 7850 * (100 * math.pi) ** 2
    sigma = 0.825 * rho_w2 * (0.060 ** 2 + 0.7 / 3.3 * 0.004 ** 2) / 1e6
    assert part.sizes["peak_stress"] == pytest.approx(sigma, rel=1e-12)
    # safety factor = strength / peak; the speed limit scales as √(strength / σ) since σ ∝ ω²
    assert part.sizes["safety_factor"] == pytest.approx(235.0 / sigma, rel=1e-12)
    assert part.sizes["speed_limit"] == pytest.approx(3000 * math.sqrt(235.0 / sigma), rel=1e-9)


def test_solid_disc_peak_at_the_centre(write_yaml):
    # Timoshenko, solid rotating disc (from memory): σ_r = σ_θ = (3+ν)/8 ρω²R² at the centre
    _, part = one(write_yaml(DISC.replace("bore: 8", "bore: 0") % ""))
    sigma = 3.3 / 8 * STEEL * (100 * math.pi) ** 2 * 0.060 ** 2 / 1e6
    assert part.sizes["peak_stress_at"] == "centre"
    assert part.sizes["peak_stress"] == pytest.approx(sigma, rel=1e-12)


def test_permissible_unbalance_iso_21940(disc):
    # ISO 21940-11 (from memory): e_per = G/ω; G 6.3 mm/s at 3000 rpm → 6.3/(100π) mm
    # = 20.05 µm (computed); U_per = m e_per in g·mm
    _, part = disc
    e_mm = 6.3 / (100 * math.pi)
    assert part.sizes["permissible_eccentricity"] == pytest.approx(e_mm * 1000, rel=1e-12)
    assert part.sizes["permissible_eccentricity"] == pytest.approx(20.05, abs=0.01)
    assert part.sizes["permissible_unbalance"] == pytest.approx(part.sizes["mass"] * 1000 * e_mm,
                                                                rel=1e-12)


def test_every_flywheel_carries_the_cautions(disc):
    _, part = disc
    notes = [f for f in part.findings if f.code == "rotor-cautions"]
    assert len(notes) == 1 and notes[0].severity == "info"
    text = notes[0].message
    for word in ("containment", "never exceed max_speed", "creep", "guard", "local codes",
                 "qualified"):
        assert word in text
    assert f"{part.sizes['kinetic_energy']:.3g} J" in text


# --- the generated triangles re-measured ---------------------------------------------------------

@pytest.fixture(scope="module")
def demo_triangles():
    from conftest import PARAMS
    from gen.triangles import triangles

    res = check([f"{PARAMS}/rover_rotor.yaml"])
    assert res.ok, [f.message for f in res.findings]
    part = res.models["rover_rotor"]
    return res, part, triangles(part.shape, part.chord_tol)


def test_demo_slice_check_passes_and_agrees_with_triangle_mass(demo_triangles):
    from gen.geometry.rotor import cell_grid
    from gen.triangles.mass import mass_properties
    from gen.triangles.prism import slice_polygons
    from gen.validate.rotor_checks import slice_mass

    _, part, tm = demo_triangles
    slicer = lambda z: slice_polygons(tm, z)  # noqa: E731
    assert [f for c in part.slice_checks for f in c(slicer)] == []
    # two routes over the same triangles: slices (per-band prisms) and the divergence-theorem
    # sums of gen/triangles/mass.py (Eberly) agree to float round-off
    got = slice_mass(slicer, cell_grid(part.data["rotor"]).z, STEEL)
    mp = mass_properties(tm, STEEL / 1000)
    assert got.mass * 1000 == pytest.approx(mp["mass_g"], rel=1e-7)
    assert got.axial_inertia * 1e9 == pytest.approx(mp["izz_origin_g_mm2"], rel=1e-7)
    it = 0.5 * (mp["inertia_center_g_mm2"][0][0] + mp["inertia_center_g_mm2"][1][1])
    assert got.transverse_inertia * 1e9 == pytest.approx(it, rel=1e-6)
    # and the triangles sit within the chord tolerance's error of the section's numbers
    assert mp["mass_g"] / 1000 == pytest.approx(part.sizes["mass"], rel=1e-3)


def test_slice_check_catches_a_wrong_section(demo_triangles, write_yaml):
    # the same triangles measured against a rotor 1 mm thinner: the check must object
    from gen.triangles.prism import slice_polygons

    _, part, tm = demo_triangles
    other = check([write_yaml(open(part.file).read().replace("thickness: 20", "thickness: 19")
                              .replace("web_offset: 16", "web_offset: 15")
                              .replace("hub_offset: 12", "hub_offset: 11"))])
    assert other.ok, [f.message for f in other.findings]
    bad = [f for c in other.models["rover_rotor"].slice_checks
           for f in c(lambda z: slice_polygons(tm, z))]
    assert bad and {f.code for f in bad} == {"mass-mismatch"}


def test_plain_disc_and_thin_ring_triangles_against_closed_forms(write_yaml):
    # triangles of generated flywheels, via gen/triangles/mass.py: ½ m R² (disc) and
    # ½ m (R₁² + R₂²) (ring), standard, within the inscribed-polygon bound of the chord tolerance
    from gen.triangles import triangles
    from gen.triangles.mass import mass_properties
    from gen.validate.rotor_checks import polygon_error_bound

    for bore in (0, 110):
        _, part = one(write_yaml(DISC.replace("bore: 8", f"bore: {bore}") % ""))
        mp = mass_properties(triangles(part.shape, part.chord_tol), STEEL / 1000)
        R, a, T = 60.0, bore / 2, 20.0
        m = STEEL * 1e-6 * math.pi * (R * R - a * a) * T          # g
        i = 0.5 * m * (R * R + a * a)                             # g·mm²
        ev, ej = polygon_error_bound(R, part.chord_tol)
        assert abs(mp["mass_g"] - m) <= ev * m
        assert abs(mp["izz_origin_g_mm2"] - i) <= ej * i
        assert mp["mass_g"] < m      # inscribed polygons: short, never over


# --- sizing --------------------------------------------------------------------------------------

def ring_inertia(r1, r2, t, rho=STEEL):
    """½ m (r₁² + r₂²) in kg·m² for radii and length in mm (standard)."""
    m = rho * math.pi * (r2 ** 2 - r1 ** 2) * t * 1e-9
    return 0.5 * m * (r1 ** 2 + r2 ** 2) * 1e-6


@pytest.mark.parametrize("target", ["{inertia: 0.0012}", "{angular_momentum: 0.5}"])
def test_sized_rim_meets_the_target_within_one_percent(target, write_yaml):
    res, part = one(write_yaml(RIM % ("steel", f"target: {target}")))
    s = part.sizes
    got = s["inertia_axial"] if "inertia" in target else s["angular_momentum"]
    want = 0.0012 if "inertia" in target else 0.5
    assert want <= got <= 1.01 * want
    assert any(f.code == "rotor-sizing" for f in part.findings)
    # the thinnest: 2 % less rim width falls short (the inertia grows with the rim width)
    thinner = one(write_yaml(RIM % ("steel", f"rim_width: {0.98 * s['rim_width']:.6f}"),
                             "thin.yaml"))[1].sizes
    assert (thinner["inertia_axial"] if "inertia" in target else
            thinner["angular_momentum"]) < want


def test_unreachable_target_refused_with_the_largest_reachable(write_yaml):
    # widest rim: out to the hub (r 10 mm), so the rotor is a hub-to-rim ring of the full
    # thickness plus nothing else: I_max = ½ m (10² + 60²) less the bore's ring (computed)
    i_max = ring_inertia(10, 60, 20) + ring_inertia(4, 10, 20)
    msg = refused(write_yaml(RIM % ("steel", "target: {inertia: 0.05}")))
    assert "key 'target.inertia'" in msg and "cannot be reached" in msg
    reported = float(msg.split("gives at most ")[1].split()[0])
    assert reported == pytest.approx(i_max, rel=1e-3)


# --- refusals ------------------------------------------------------------------------------------

def test_speed_above_the_burst_estimate_is_an_error_with_the_limit(write_yaml, capsys):
    # PLA allowable 12 MPa (rotor table); solid disc R 60 mm: ω_lim = √(8σ/((3+ν)ρR²))
    # (Timoshenko, from memory; ν 0.36, ρ 1240) → n_lim = 60 ω_lim / 2π (computed)
    path = write_yaml("parts:\n  p: {kind: flywheel, outer_diameter: 120, thickness: 10, "
                      "material: PLA, max_speed: 30000}\n")
    res, part = one(path)
    w_lim = math.sqrt(8 * 12e6 / (3.36 * 1240 * 0.06 ** 2))
    n_lim = 60 * w_lim / (2 * math.pi)
    errs = [f for f in res.findings if f.severity == "error"]
    assert [f.code for f in errs] == ["rotor-overspeed"] and errs[0].key == "max_speed"
    assert f"{n_lim:.0f} rpm" in errs[0].message
    assert part.sizes["speed_limit"] == pytest.approx(n_lim, rel=1e-9)
    assert main(["check", path]) == 1


def test_low_margin_is_a_warning(write_yaml):
    # PLA solid disc at 20000 rpm: σ = 3.36/8 · 1240 · (2094 rad/s)² · 0.06² m² = 8.2 MPa
    # (Timoshenko, from memory; computed) against the 12 MPa allowable: factor 1.46, under 2
    path = write_yaml("parts:\n  p: {kind: flywheel, outer_diameter: 120, thickness: 10, "
                      "material: PLA, max_speed: 20000}\n")
    res, part = one(path)
    assert 1 < part.sizes["safety_factor"] < 2
    assert [f.code for f in res.findings if f.severity != "info"] == ["rotor-margin"]


ORIGINAL = {"outer_diameter": "120", "thickness": "20", "max_speed": "3000", "bore": "8"}


def disc_with(field, value, extra=""):
    return (DISC % extra).replace(f"{field}: {ORIGINAL[field]}", f"{field}: {value}", 1)


@pytest.mark.parametrize("extra,key", [
    (", pocket: {diameter: 30, depth: 25}", "pocket.depth"),      # deeper than the rotor
    (", pocket: {diameter: 30, depth: 20}", "pocket.depth"),      # as deep: no floor left
    (", pocket: {diameter: 130, depth: 5}", "pocket.diameter"),   # no wall outside it
    (", pocket: {diameter: 30, depth: -1}", "pocket.depth"),
])
def test_bad_pocket_names_the_key(extra, key, write_yaml):
    msg = refused(write_yaml(DISC % extra))
    assert f"key '{key}'" in msg and "rover_rotor" in msg


@pytest.mark.parametrize("field,value", [("thickness", -20), ("thickness", 0),
                                         ("outer_diameter", 0), ("max_speed", -5),
                                         ("bore", -1), ("bore", 120), ("bore", 130)])
def test_negative_or_zero_walls_refused(field, value, write_yaml):
    msg = refused(write_yaml(disc_with(field, value)))
    assert f"key '{field}'" in msg


RIM_BAD = [
    ("rim_width: 0", "rim_width"),
    ("rim_width: -3", "rim_width"),
    ("rim_width: 55", "hub_diameter"),                  # rim runs over the hub
    ("rim_width: 10\n    web_offset: 18", "web_offset"),  # web sticks out of the rim
    ("rim_width: 10\n    target: {inertia: 0.001}", "rim_width"),
    ("target: {inertia: 0.001, angular_momentum: 0.3}", "target"),
    ("rim_width: 10\n    holes: {count: 6, diameter: 12, circle: 110}", "holes.circle"),
    ("rim_width: 10\n    holes: {count: 16, diameter: 12, circle: 60}", "holes.diameter"),
]


@pytest.mark.parametrize("extra,key", RIM_BAD)
def test_bad_rim_input_names_the_key(extra, key, write_yaml):
    msg = refused(write_yaml(RIM % ("steel", extra)))
    assert f"key '{key}'" in msg


def test_disc_refuses_rim_keys_and_unknown_material(write_yaml):
    assert "key 'web_thickness'" in refused(write_yaml(DISC % ", web_thickness: 4"))
    assert "key 'material'" in refused(write_yaml(DISC.replace("steel", "unobtainium") % ""))


def test_hub_smaller_than_bore_refused(write_yaml):
    msg = refused(write_yaml((RIM % ("steel", "rim_width: 10")).replace("bore: 8", "bore: 24")))
    assert "key 'hub_diameter'" in msg


# --- the rotors: section -------------------------------------------------------------------------

ROTORS = DISC % "" + """rotors:
  rw: {use: reaction_wheel, rotor: rover_rotor, body_inertia: 0.05, motor_torque: 0.2}
  gyro: {use: gyroscope, rotor: rover_rotor, gimbal_rate: 90}
  pair: {use: counter_pair, rotors: [rover_rotor, rover_rotor], torques: [0.1, 0.1],
         transverse_rate: 30}
  inline: {use: gyroscope, inertia: 0.002, max_speed: 6000, gimbal_rate: 45}
"""


def test_rotor_uses_against_rigid_body_relations(write_yaml):
    res = check([write_yaml(ROTORS)])
    assert res.ok, [f.message for f in res.findings]
    by = {r["name"]: r for r in res.rotors}
    i_w = res.models["rover_rotor"].sizes["inertia_axial"]
    w = 100 * math.pi
    # reaction wheel (standard): α_b = T/I_b; saturation t = I_w ω_max / T; body rate I_w ω/I_b
    rw = by["rw"]
    assert rw["body_acceleration"] == pytest.approx(0.2 / 0.05)
    assert rw["saturation_time"] == pytest.approx(i_w * w / 0.2)
    assert rw["body_rate_at_saturation"] == pytest.approx(i_w * w / 0.05)
    # gyroscope (standard): τ = h Ω with Ω in rad/s
    assert by["gyro"]["output_torque"] == pytest.approx(i_w * w * math.pi / 2)
    assert by["inline"]["output_torque"] == pytest.approx(0.002 * 200 * math.pi * math.pi / 4)
    # counter pair (standard): opposite equal spins cancel; both motors +z → body gets −z
    pair = by["pair"]
    assert pair["speeds"] == [3000.0, -3000.0]
    assert abs(pair["net_momentum"]) < 1e-15 and abs(pair["gyroscopic_torque"]) < 1e-15
    assert pair["net_reaction_torque"] == pytest.approx(-0.2)
    assert pair["reaction_direction"] == "-z"


def test_rotors_printed_and_in_json(write_yaml, capsys):
    path = write_yaml(ROTORS)
    assert main(["check", path]) == 0
    out = capsys.readouterr().out
    assert "rotor rw (reaction wheel, rover_rotor)" in out and "output torque" in out
    assert main(["check", path, "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert {r["name"] for r in doc["rotors"]} == {"rw", "gyro", "pair", "inline"}


@pytest.mark.parametrize("entry,key", [
    ("{use: reaction_wheel, rotor: nobody, body_inertia: 0.05, motor_torque: 0.2}", "rotor"),
    ("{use: reaction_wheel, rotor: rover_rotor, motor_torque: 0.2}", "body_inertia"),
    ("{use: gyroscope, rotor: rover_rotor, gimbal_rate: 9, body_inertia: 1}", "body_inertia"),
    ("{use: gyroscope, inertia: 0.01, gimbal_rate: 9}", "max_speed"),
    ("{use: spinner, rotor: rover_rotor}", "use"),
])
def test_bad_rotor_entries_name_the_key(entry, key, write_yaml):
    res = check([write_yaml(DISC % "" + f"rotors:\n  x: {entry}\n")])
    errs = [f for f in res.findings if f.severity == "error"]
    assert len(errs) == 1 and f"key '{key}'" in errs[0].message and "rotor 'x'" in errs[0].message
    assert not res.rotors


# --- starter file and demo -----------------------------------------------------------------------

def test_new_flywheel_checks(tmp_path):
    assert main(["new", "flywheel", "fw", "--dir", str(tmp_path)]) == 0
    res = check([str(tmp_path / "fw.yaml")])
    assert res.ok and res.models["fw"].sizes["material"] == "steel"


def test_demo_rotor_is_sized_and_safe(demo_triangles):
    res, part, _ = demo_triangles
    s = part.sizes
    # the demo asks for 0.6 N·m·s at 3000 rpm (params/rover_rotor.yaml)
    assert 0.6 <= s["angular_momentum"] <= 0.606
    assert s["safety_factor"] > 2
    assert {r["name"] for r in res.rotors} == {"righting", "steering_gyro"}
    assert np.isfinite(s["spin_up_time"])


def test_rim_web_hub_against_sum_of_annuli(write_yaml):
    # computed: the section split by hand into three rings — rim r 50…60 × 20 mm, web r 4…50
    # × 4 mm (centred, z 8…12), hub r 4…10 from hub_offset 12 to the far face (8 mm) — each
    # I = ½ m (r₁² + r₂²) (standard)
    _, part = one(write_yaml(RIM % ("steel", "rim_width: 10\n    hub_offset: 12")))
    rings = [(50, 60, 20), (4, 50, 4), (4, 10, 8)]
    m = sum(STEEL * math.pi * (b * b - a * a) * t * 1e-9 for a, b, t in rings)
    i = sum(ring_inertia(a, b, t) for a, b, t in rings)
    assert part.sizes["mass"] == pytest.approx(m, rel=1e-12)
    assert part.sizes["inertia_axial"] == pytest.approx(i, rel=1e-12)
    msg = refused(write_yaml(RIM % ("steel", "rim_width: 10\n    hub_offset: 20"), "h.yaml"))
    assert "key 'hub_offset'" in msg
