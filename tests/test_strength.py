"""Lewis bending rating of gears and racks: Shigley Example 14-1, Kv forms, findings."""

import math

import pytest

from gen.errors import ParamError, PitchlineError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import gear_sizes
from gen.findings import ERROR, INFO, WARNING
from gen.validate.strength import (CAUTION, KV_FORMS, MATERIALS, PRINTED_KV, Material,
                                   bending_stress, loaded_gear, loaded_rack, mass_grams,
                                   material, pitch_line_velocity, rated_force, rated_torque,
                                   strength_findings, velocity_factor)

RACK = basic_rack("A")
# unit definitions (common practice; exact by definition of the units)
IN = 25.4                 # mm per inch
LBF = 4.4482216152605     # N per pound-force
PSI = LBF / IN ** 2       # MPa per psi (computed)
HP = 745.69987158227      # W per mechanical horsepower, 550 ft·lbf/s
FPM = 0.3048 / 60.0       # m/s per ft/min


# --- Shigley, Mechanical Engineering Design, Example 14-1 (from memory):
# P 8 teeth/in, F 1.5 in, 16 teeth, 20°, 1200 rpm, σ_all 10 kpsi → d 2 in, V 628 ft/min,
# Kv 1.52 (cut teeth, (1200+V)/1200), Y 0.296, Wt 365 lbf, H 6.95 hp.
EX_M = IN / 8.0
EX_SIZES = gear_sizes(16, EX_M, RACK)
EX_STEEL = Material("Example 14-1 steel", 10_000 * PSI)


def _ex_gear(form_factor=0.296):
    return loaded_gear(EX_SIZES, RACK, 1.5 * IN, "pinion", form_factor=form_factor)


def test_example_14_1_pitch_diameter_and_velocity():
    assert EX_SIZES.d == pytest.approx(2.0 * IN, rel=1e-12)
    v = pitch_line_velocity(EX_SIZES.d, 1200)
    assert v / FPM == pytest.approx(628, abs=0.5)


def test_example_14_1_velocity_factor_cut_form():
    v = pitch_line_velocity(EX_SIZES.d, 1200)
    assert velocity_factor(v, "cut") == pytest.approx(1.52, abs=0.005)
    # the metric constant 6.1 m/s is the inch form's 1200 ft/min, rounded (computed)
    assert velocity_factor(v, "cut") == pytest.approx((1200 + v / FPM) / 1200, rel=1e-3)


def test_example_14_1_transmitted_load_and_power():
    gear = _ex_gear()
    v = pitch_line_velocity(EX_SIZES.d, 1200)
    wt = rated_force(gear, EX_STEEL, safety_factor=1.0, speed=v, kv_form="cut")
    assert wt / LBF == pytest.approx(365, rel=5e-3)
    # power by another route: rated torque times angular speed
    torque = rated_torque(gear, EX_STEEL, safety_factor=1.0, rpm=1200, kv_form="cut")
    power = torque * 1200 * 2 * math.pi / 60
    assert power / HP == pytest.approx(6.95, rel=5e-3)
    assert power == pytest.approx(wt * v, rel=1e-12)


def test_example_14_1_with_the_inch_velocity_factor_as_a_rule():
    # the Kv form may be passed as a rule: Shigley's inch form (1200 + V)/1200, V in ft/min
    gear = _ex_gear()
    v = pitch_line_velocity(EX_SIZES.d, 1200)
    wt = rated_force(gear, EX_STEEL, 1.0, v, kv_form=lambda vel: (1200 + vel / FPM) / 1200)
    assert wt / LBF == pytest.approx(365, rel=5e-3)


def test_example_14_1_with_the_measured_form_factor():
    # Y measured on the generated 16-tooth pinion instead of the table's 0.296
    gear = loaded_gear(EX_SIZES, RACK, 1.5 * IN, "pinion")
    assert gear.form_factor == pytest.approx(0.296, rel=0.05)
    v = pitch_line_velocity(EX_SIZES.d, 1200)
    wt = rated_force(gear, EX_STEEL, 1.0, v, "cut")
    assert wt / LBF == pytest.approx(365 * gear.form_factor / 0.296, rel=5e-3)


def test_bending_stress_inverts_the_rating():
    gear = _ex_gear()
    f = rated_force(gear, EX_STEEL, 1.0, 3.0, "cut")
    assert bending_stress(gear, f, 3.0, "cut") == pytest.approx(EX_STEEL.allowable_bending)
    # σ = Kv Ft/(b m Y) recomputed by hand
    kv = (6.1 + 3.0) / 6.1
    assert bending_stress(gear, 1000.0, 3.0, "cut") == pytest.approx(
        kv * 1000.0 / (1.5 * IN * EX_M * 0.296))


# --- velocity factor (Barth, Shigley metric forms, from memory) -----------------------------

@pytest.mark.parametrize("form,v", [("cast", 3.05), ("cut", 6.1), ("hobbed", 3.56 ** 2),
                                    ("shaved", 5.56 ** 2)])
def test_velocity_factor_forms(form, v):
    # computed: each form doubles where V (or √V) equals its constant
    assert velocity_factor(0.0, form) == 1.0
    assert velocity_factor(v, form) == pytest.approx(2.0)


def test_printed_gears_use_the_cast_form():
    assert PRINTED_KV == "cast"
    assert velocity_factor(2.0) == pytest.approx((3.05 + 2.0) / 3.05)
    for v in (0.74, 1.0, 3.0, 10.0, 30.0):  # largest of the four above 0.73 m/s (computed)
        assert velocity_factor(v) >= max(velocity_factor(v, f) for f in KV_FORMS)


def test_unknown_velocity_form_is_refused():
    with pytest.raises(ParamError, match="cast"):
        velocity_factor(1.0, "printed")


# --- materials --------------------------------------------------------------------------------

# Bulk tensile strength of the unfilled polymers, lower end of the usual range (common
# practice, MPa): a conservative allowable for printed teeth is well below half of it.
BULK_TENSILE = {"PLA": 50, "PETG": 45, "ABS": 35, "PA": 45, "POM": 60}


def test_material_table_is_conservative():
    assert set(MATERIALS) == set(BULK_TENSILE)
    for name, m in MATERIALS.items():
        assert 0 < m.allowable_bending <= 0.5 * BULK_TENSILE[name]
        # unfilled engineering polymers are 1.0–1.45 g/cm³ (common practice)
        assert 1.0 <= m.density <= 1.45


def test_material_names_and_aliases():
    assert material("nylon") is MATERIALS["PA"]
    assert material("Acetal") is MATERIALS["POM"]
    assert material(" pla ") is MATERIALS["PLA"]
    with pytest.raises(ParamError, match="allowed: PLA"):
        material("wood")


def test_mass_from_density():
    # 1 cm³ of PLA weighs its density in grams
    assert mass_grams(1000.0, "PLA") == pytest.approx(MATERIALS["PLA"].density)


# --- ratings ----------------------------------------------------------------------------------

def _printed(z=20, m=1.5, b=8.0):
    return loaded_gear(gear_sizes(z, m, RACK), RACK, b, f"gear z{z}")


def test_rated_torque_scaling():
    g = _printed()
    t = rated_torque(g, "PLA", 2.0, 0.0)
    # computed: T = σ b m Y d / (2 S) at V = 0
    assert t == pytest.approx(14.0 * 8.0 * 1.5 * g.form_factor * 30.0 / (2 * 2.0) / 1000)
    assert rated_torque(_printed(b=16.0), "PLA", 2.0, 0.0) == pytest.approx(2 * t)
    # T ∝ m² at fixed z (Y does not depend on m, d = z m)
    assert rated_torque(_printed(m=3.0), "PLA", 2.0, 0.0) == pytest.approx(4 * t, rel=1e-6)
    assert rated_torque(g, "PLA", 4.0, 0.0) == pytest.approx(t / 2)
    assert rated_torque(g, "PLA", 2.0, 600) < t
    assert rated_torque(g, "PA", 2.0, 0.0) > rated_torque(g, "ABS", 2.0, 0.0)


def test_rated_torque_refuses_a_rack_and_bad_inputs():
    rack = loaded_rack(1.5, RACK, 8.0, "rack")
    with pytest.raises(PitchlineError, match="force, not a torque"):
        rated_torque(rack, "PLA")
    with pytest.raises(ParamError, match="safety factor"):
        rated_torque(_printed(), "PLA", 0.0)
    with pytest.raises(ParamError, match="face width"):
        loaded_gear(gear_sizes(20, 1.5, RACK), RACK, 0.0)


def test_findings_by_load():
    g = _printed()
    rating = rated_torque(g, "PLA", 2.0, 100)
    ok = strength_findings(g, "PLA", torque=0.5 * rating, safety_factor=2.0, rpm=100)
    assert [f.severity for f in ok] == [INFO]
    warn = strength_findings(g, "PLA", torque=1.5 * rating, safety_factor=2.0, rpm=100)
    assert [f.severity for f in warn] == [WARNING]
    msg = warn[0].message
    assert f"{1.5 * rating:.3g} N·m" in msg and f"{rating:.3g} N·m" in msg
    assert "PLA" in msg and "safety factor 2" in msg
    assert warn[0].subject == "gear z20" and "Lewis" in warn[0].source
    err = strength_findings(g, "PLA", torque=2.5 * rating, safety_factor=2.0, rpm=100)
    assert [f.severity for f in err] == [ERROR]
    assert err[0].code == "strength-overload"


def test_rack_findings_use_force():
    rack = loaded_rack(1.5, RACK, 8.0, "rack")
    limit = rated_force(rack, "PETG", 3.0, 0.2)
    got = strength_findings(rack, "PETG", force=1.2 * limit, safety_factor=3.0, speed=0.2)
    assert got[0].severity == WARNING and "PETG" in got[0].message and "N" in got[0].message
    with pytest.raises(ParamError, match="force"):
        strength_findings(rack, "PETG", torque=1.0)


def test_caution_text():
    low = CAUTION.lower()
    assert "estimate" in low and "test printed parts" in low and "pinch" in low
