"""Flywheel bolt circle: mass and inertia less the holes against the closed form, the stress
raised at the holes, refusals, and the holes counted and measured on the exported triangles
(one triangle build and one STEP solid, module fixture)."""

import math

import numpy as np
import pytest

from gen.errors import ParamError
from gen.geometry.rotor_holes import concentration
from gen.kinds.base import resolve
from gen.params.project import RawPart

STEEL = 7850.0          # kg/m³, the rotor table's steel (common practice)
DISC = dict(outer_diameter=120, thickness=20, material="steel", max_speed=3000, bore=8,
            bolt_circle={"diameter": 24, "count": 4, "hole": 3.4})
RIM = dict(outer_diameter=120, thickness=20, material="steel", max_speed=3000, bore=8,
           layout="rim_web", rim_width=10, web_thickness=4, hub_diameter=24,
           bolt_circle={"diameter": 16, "count": 3, "hole": 3.4})


def fly(base=DISC, **over):
    raw = RawPart(name="f", kind="flywheel", values={**base, **over}, file="t.yaml", train=None,
                  lines={})
    return resolve(raw)


def refused(base=DISC, **over) -> ParamError:
    with pytest.raises(ParamError) as exc:
        fly(base, **over)
    return exc.value


def disc_less_holes(R, a, T, rc, dh, n, rho=STEEL):
    """Closed form (standard): disc ½ m (R² + a²) minus n holes, each m_h (R_c² + d_h²/8) by the
    parallel-axis theorem; kg and kg·m² from mm."""
    rho = rho * 1e-9
    m_disc = rho * math.pi * (R * R - a * a) * T
    m_h = rho * math.pi * dh * dh / 4 * T
    i = 0.5 * m_disc * (R * R + a * a) - n * m_h * (rc * rc + dh * dh / 8)
    return m_disc - n * m_h, i * 1e-6


def test_disc_mass_and_inertia_less_the_bolt_holes():
    part = fly()
    m, i = disc_less_holes(60, 4, 20, 12, 3.4, 4)
    assert part.sizes["mass"] == pytest.approx(m, rel=1e-12)
    assert part.sizes["inertia_axial"] == pytest.approx(i, rel=1e-12)
    plain = fly({k: v for k, v in DISC.items() if k != "bolt_circle"})
    assert plain.sizes["mass"] > part.sizes["mass"]


def test_hub_bolts_on_a_rim_web_rotor():
    # rim r 50…60 × 20, web r 4…50 × 4 (centred), hub r 4…12 × 20; three holes in the hub
    part = fly(RIM)
    rho = STEEL * 1e-9
    rings = [(50, 60, 20), (12, 50, 4), (4, 12, 20)]
    m = sum(rho * math.pi * (b * b - a * a) * t for a, b, t in rings)
    i = sum(0.5 * rho * math.pi * (b * b - a * a) * t * (a * a + b * b) for a, b, t in rings)
    m_h = rho * math.pi * 3.4 ** 2 / 4 * 20
    assert part.sizes["mass"] == pytest.approx(m - 3 * m_h, rel=1e-12)
    assert part.sizes["inertia_axial"] == pytest.approx(
        (i - 3 * m_h * (8 ** 2 + 3.4 ** 2 / 8)) * 1e-6, rel=1e-12)


def test_kirsch_factor():
    # Kirsch (Timoshenko & Goodier, from memory): 3 in uniaxial tension, 2 in equal biaxial
    assert concentration(1.0, 0.0) == (3.0, 3.0)
    assert concentration(1.0, 1.0) == (2.0, 2.0)
    assert concentration(2.0, 1.0)[0] == pytest.approx(5.0)


def test_stress_at_the_bolt_holes_against_timoshenko_and_kirsch():
    # Timoshenko's bored disc (from memory): σ_r = (3+ν)/8 ρω² (a² + b² − a²b²/r² − r²),
    # σ_θ = (3+ν)/8 ρω² (a² + b² + a²b²/r² − (1+3ν)/(3+ν) r²); at the holes 3σ_θ − σ_r
    part = fly(max_speed=12000)
    nu = part.data["material"].poisson
    w = 12000 * 2 * math.pi / 60
    k = STEEL * w * w * 1e-12                         # MPa/mm²
    a, b, r = 4.0, 60.0, 12.0
    sr = (3 + nu) / 8 * k * (a * a + b * b - a * a * b * b / (r * r) - r * r)
    st = (3 + nu) / 8 * k * (a * a + b * b + a * a * b * b / (r * r) - (1 + 3 * nu) / (3 + nu) * r * r)
    bc = part.sizes["bolt_circle"]
    assert bc["circle_stress_r"] == pytest.approx(sr, rel=1e-12)
    assert bc["circle_stress_theta"] == pytest.approx(st, rel=1e-12)
    assert bc["hole_stress"] == pytest.approx(3 * st - sr, rel=1e-12)
    assert 2.0 <= bc["stress_factor"] <= 3.0
    # the bore's hoop stress, (3+ν)/4 ρω² (b² + (1−ν)/(3+ν) a²), is below the holes' peak here
    bore = (3 + nu) / 4 * k * (b * b + (1 - nu) / (3 + nu) * a * a)
    assert bore < 3 * st - sr
    assert part.sizes["peak_stress"] == pytest.approx(3 * st - sr, rel=1e-12)
    assert part.sizes["peak_stress_at"] == "bolt holes"
    assert part.sizes["safety_factor"] == pytest.approx(part.sizes["strength"] / (3 * st - sr))
    # stresses ∝ ω²: the speed limit puts the holes' peak at the strength
    lim = part.sizes["speed_limit"]
    assert (3 * st - sr) * (lim / 12000) ** 2 == pytest.approx(part.sizes["strength"], rel=1e-9)
    note = next(f for f in part.findings if f.code == "bolt-circle")
    assert "concentration factor" in note.message and "Kirsch" in note.source


# --- refusals ------------------------------------------------------------------------------------

@pytest.mark.parametrize("base,bc,key,words", [
    (DISC, {"diameter": 24, "count": 1, "hole": 3.4}, "bolt_circle.count", "out of range"),
    (DISC, {"diameter": 12, "count": 10, "hole": 3.4}, "bolt_circle.count", "between neighbours"),
    (DISC, {"diameter": 12, "count": 3, "hole": 3.4}, "bolt_circle.diameter", "bore"),
    (DISC, {"diameter": 116, "count": 4, "hole": 3.4}, "bolt_circle.diameter", "one constant"),
    # across the hub's edge (r 12) into the thinner web
    (RIM, {"diameter": 24, "count": 4, "hole": 3.4}, "bolt_circle.diameter", "one constant"),
])
def test_bad_bolt_circles_are_refused(base, bc, key, words):
    # walls of LIMITS.min_wall (1 mm, common practice) to neighbours, bore and slab edges
    e = refused(base, bolt_circle=bc)
    assert e.key == key and words in str(e)


def test_bolts_into_lightening_holes_are_refused():
    e = refused(RIM, hub_diameter=12, bolt_circle={"diameter": 60, "count": 6, "hole": 5},
                holes={"count": 6, "diameter": 10, "circle": 60})
    assert e.key == "bolt_circle.diameter" and "lightening" in str(e)


# --- measured on the triangles and the solid -----------------------------------------------------

@pytest.fixture(scope="module")
def built():
    import cadquery as cq

    from gen.solid import solid
    from gen.triangles import triangles

    part = fly(RIM)
    return part, triangles(part.shape, part.chord_tol), cq.Solid(solid(part.shape))


def test_bolt_holes_counted_on_a_slice(built):
    from gen.triangles.prism import slice_polygons

    part, tm, _ = built
    # a slice through the hub below the web (z 2): loops other than the outer ones are the bore
    # and the bolt holes; their area centroids give the circle
    loops = [np.asarray(p)[:, :2] for p in slice_polygons(tm, 2.0)]
    small = []
    for p in loops:
        q = np.roll(p, -1, axis=0)
        cr = p[:, 0] * q[:, 1] - q[:, 0] * p[:, 1]
        a = 0.5 * cr.sum()
        c = np.array([((p[:, 0] + q[:, 0]) * cr).sum(), ((p[:, 1] + q[:, 1]) * cr).sum()]) / (6 * a)
        if 0.5 < np.hypot(*c) < 30:
            small.append((c, 2 * np.hypot(*(p - c).T).max()))
    assert len(small) == 3
    assert [2 * np.hypot(*c) for c, _ in small] == pytest.approx([16.0] * 3, abs=1e-9)
    assert [d for _, d in small] == pytest.approx([3.4] * 3, abs=1e-9)
    from gen.triangles.prism import slice_polygons as sp
    assert [f.message for c in part.slice_checks for f in c(lambda z: sp(tm, z))] == []


def test_triangles_mass_and_step_volume_against_the_section(built):
    from gen.triangles.mass import mass_properties
    from gen.kinds.flywheel import mass_error_bound

    part, tm, sol = built
    bound = mass_error_bound(part.data["rotor"], part.chord_tol)
    mp = mass_properties(tm, STEEL / 1000)
    assert abs(mp["mass_g"] / 1000 - part.sizes["mass"]) <= bound["volume"] * part.sizes["mass"]
    # the exact solid (cylinders, no chords) against the section's volume: round-off only
    assert sol.isValid()
    assert sol.Volume() == pytest.approx(part.sizes["volume"], rel=1e-7)
    assert abs(sol.Volume() - tm.volume) <= bound["volume"] * part.sizes["volume"]
