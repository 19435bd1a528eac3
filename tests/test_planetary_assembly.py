"""Assembly `planetary` through `check` and the builders: Willis ratio, spacing, neighbours,
hands, phasing into poses, no overlap of the placed triangles, and the assembly STEP."""

import json
import math
import os

import numpy as np
import pytest

from gen.check import check
from conftest import PARAMS

SET = """assemblies:
  stage:
    kind: planetary
    module: {m}
    sun_teeth: {zs}
    planet_teeth: {zp}
    ring_teeth: {zr}
    planets: {n}
    face_width: 8
    held: {held}
    input: {inp}
    sun_shift: 0.3
    ring_shift: 0.3
    backlash_allowance: 0.15
{extra}"""


def run(write_yaml, m=1.5, zs=12, zp=18, zr=48, n=3, held="ring", inp="sun", extra=""):
    res = check([write_yaml(SET.format(m=m, zs=zs, zp=zp, zr=zr, n=n, held=held, inp=inp,
                                       extra=extra))])
    codes = {}
    for f in res.findings:
        codes.setdefault(f.code, f)
    return res, codes


def test_ratio_five_with_the_ring_held(write_yaml, capsys):
    # sun 12, planets 18, ring 48, ring held, sun in: i = 1 + z_r/z_s = 1 + 48/12 = 5
    # (Willis, computed)
    from gen.cli import main

    main(["check", "--json", write_yaml(SET.format(m=1.5, zs=12, zp=18, zr=48, n=3,
                                                   held="ring", inp="sun", extra=""))])
    doc = json.loads(capsys.readouterr().out)
    stage = doc["assemblies"][0]
    assert doc["ok"], [f["message"] for f in doc["findings"] if f["severity"] == "error"]
    assert stage["ratio"] == pytest.approx(1 + 48 / 12, abs=1e-12)
    assert sorted(stage["parts"]) == ["carrier", "planet_1", "planet_2", "planet_3", "ring",
                                      "sun"]


@pytest.mark.parametrize("held, inp, want", [
    ("carrier", "sun", -48 / 12),          # −z_r/z_s (Willis, computed)
    ("sun", "ring", (1 + 48 / 12) / (48 / 12)),   # ring in, carrier out: 1 + z_s/z_r
])
def test_other_arrangements(write_yaml, held, inp, want):
    res, _ = run(write_yaml, held=held, inp=inp)
    assert res.assemblies[0].kinematics["ratio"] == pytest.approx(want, abs=1e-12)


def test_coaxial_distance_and_hands(write_yaml):
    res, codes = run(write_yaml, extra="    helix_angle: 20\n    herringbone: true\n")
    assert res.ok, [f.message for f in res.findings if f.severity == "error"]
    s = res.assemblies[0].sizes
    # sun–planet with x_s + x_p = 0.3: inv α_wt = inv α_t + 2 tan α_n·0.3/30 and
    # a_w = m_t·15 cos α_t / cos α_wt (ISO 21771, from memory); computed by bisection here
    at = math.atan(math.tan(math.radians(20)) / math.cos(math.radians(20)))
    mt = 1.5 / math.cos(math.radians(20))
    target = math.tan(at) - at + 2 * math.tan(math.radians(20)) * 0.3 / 30
    lo, hi = 0.1, 1.2
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if math.tan(mid) - mid < target else (lo, mid)
    aw = mt * 15 * math.cos(at) / math.cos(lo)
    assert s["sun_planet_center_distance"] == pytest.approx(aw, abs=1e-9)
    assert s["coaxial"] and abs(s["planet_ring_center_distance"] - aw) < 1e-3
    # hands: planets opposite to the sun (external mesh), ring the same as the planets
    # (internal mesh: computed from the twist rates, see gen/assemblies/planetary.py)
    models = res.models
    sun, p1, ring = (models[f"stage_{k}"] for k in ("sun", "planet_1", "ring"))
    assert p1.mate.hand != sun.mate.hand and ring.mate.hand == p1.mate.hand
    assert ring.mate.chevron and sun.mate.chevron


def test_not_coaxial_is_an_error(write_yaml):
    res, codes = run(write_yaml, zr=50)
    assert codes["planetary-not-coaxial"].severity == "error"


def test_unequal_spacing_reports_the_angles_that_assemble(write_yaml):
    # (12 + 48)/7 is not whole: planets only at multiples of 360°/60 = 6° (assembly condition,
    # common practice); the nearest to 360k/7: 0, 54, 102, 156, 204, 258, 306° (computed)
    # 7 planets do not clear each other here, so the neighbour condition fails too
    res, codes = run(write_yaml, n=7, zr=48)
    f = codes["planet-spacing-unequal"]
    angles = res.assemblies[0].sizes["planet_angles"]
    want = [6 * math.floor(360 * k / 7 / 6 + 0.5) for k in range(7)]
    assert angles == pytest.approx(want, abs=1e-9)
    assert "54.00°" in f.message
    # the planet counts that would assemble equally spaced divide 60: 2, 3, 4 clear (computed)
    assert "planet counts that assemble equally spaced: 4" in f.message


def test_neighbour_condition_just_passing_and_failing(write_yaml):
    # 3 planets of 18 teeth at a_w: gap = 2 a_w sin 60° − d_a,p (neighbour condition, common
    # practice); shifts x_s 0.3, x_p 0 → a_w from the run, d_a,p = 1.5·20 = 30 (computed)
    res, _ = run(write_yaml)
    a = res.assemblies[0].sizes["planet_center_distance"]
    gap = 2 * a * math.sin(math.pi / 3) - 30.0
    assert res.assemblies[0].sizes["planet_tip_gaps"] == pytest.approx([gap] * 3, abs=1e-9)
    _, ok = run(write_yaml, extra=f"    neighbour_margin: {gap - 0.01:.4f}\n")
    _, bad = run(write_yaml, extra=f"    neighbour_margin: {gap + 0.01:.4f}\n")
    assert "planets-collide" not in ok
    assert bad["planets-collide"].severity == "error"


def test_load_per_planet(write_yaml):
    # sun torque T shared by N planets with K_γ (common practice, from memory: 1.15 for 3):
    # most loaded planet K_γ T/N; tangential force on the sun's working pitch radius
    res, codes = run(write_yaml, extra="    torque: 0.3\n    speed: 100\n")
    loads = res.assemblies[0].sizes["loads"]
    assert loads["planet_share"] == pytest.approx(1.15 * 0.3 / 3, abs=1e-12)
    a = res.assemblies[0].sizes["planet_center_distance"]
    assert loads["sun_mesh_force"] == pytest.approx(1.15 * 0.3 / 3 / (a * 12 / 30 / 1000))
    assert any(f.message.startswith("ring:") for f in res.findings
               if f.code.startswith("strength"))


# --- placed triangles and the assembly STEP ----------------------------------------------

def _placed(models, poses):
    import manifold3d as m3d

    from gen.build.export import make_triangles

    out = {}
    cache = {}
    for name, T in poses.items():
        key = id(models[name].shape)
        if key not in cache:
            t = make_triangles(models[name])
            cache[key] = (np.asarray(t.vertices, dtype=np.float32),
                          np.asarray(t.faces, dtype=np.uint32))
        v, f = cache[key]
        mesh = m3d.Manifold(m3d.Mesh(vert_properties=v, tri_verts=f))
        out[name] = mesh.transform(np.asarray(T[:3, :], dtype=np.float64))
    return out


@pytest.fixture(scope="module")
def demo():
    res = check([os.path.join(PARAMS, "turntable_stage.yaml")])
    assert res.ok, [f.message for f in res.findings if f.severity == "error"]
    return res


def test_demo_is_the_herringbone_ratio_five_stage(demo):
    asm = demo.assemblies[0]
    assert asm.kinematics["ratio"] == pytest.approx(5.0, abs=1e-12)
    assert demo.models["turntable_stage_sun"].mate.chevron


@pytest.mark.parametrize("turn", [0.0, 0.5])
def test_placed_parts_do_not_overlap(demo, turn):
    # at rest and after the input (sun) turns by half a planet pitch, π/z_p: phases from the
    # mesh condition, member turns from Willis (computed); intersection volume of every pair
    # of placed triangle meshes must vanish (budget 1e-3 mm³: round-off of the booleans)
    from gen.assemblies.planetary import phase_residuals, poses

    asm = demo.assemblies[0]
    angle = turn * math.pi / asm.values["planet_teeth"]
    assert max(abs(e) for r in phase_residuals(asm, angle) for e in r) < 1e-9
    placed = _placed(demo.models, poses(asm, angle))
    names = sorted(placed)
    for i, a in enumerate(names):
        for b in names[i + 1:]:
            vol = (placed[a] ^ placed[b]).volume()
            assert vol < 1e-3, (a, b, vol)
    # and the same parts turned a quarter pitch out of phase do overlap (the test can fail)
    wrong = dict(poses(asm, angle))
    p1 = asm.parts["planet_1"]
    c, s = math.cos(math.pi / 36), math.sin(math.pi / 36)
    wrong[p1] = wrong[p1] @ np.array([[c, -s, 0, 0], [s, c, 0, 0], [0, 0, 1, 0], [0, 0, 0, 1]])
    moved = _placed(demo.models, {p1: wrong[p1], asm.parts["ring"]: wrong[asm.parts["ring"]]})
    assert (moved[p1] ^ moved[asm.parts["ring"]]).volume() > 0.01


@pytest.fixture(scope="module")
def step_round_trip(tmp_path_factory):
    """One kernel round trip: a small spur set's assembly STEP, read back."""
    from gen.build.assembly import assembly_step
    from gen.export.step import read_step

    d = tmp_path_factory.mktemp("planetary")
    p = d / "set.yaml"
    p.write_text(SET.format(m=1.0, zs=12, zp=18, zr=48, n=3, held="ring", inp="sun",
                            extra="    chord_tolerance: 0.02\n"))
    res = check([str(p)])
    assert res.ok, [f.message for f in res.findings if f.severity == "error"]
    asm = res.assemblies[0]
    path = d / "set.step"
    assembly_step(asm, res.models, str(path))
    import cadquery as cq

    return res, asm, cq.Shape.cast(read_step(str(path))), path


def test_assembly_step_holds_each_member_as_a_valid_solid(step_round_trip):
    import cadquery as cq

    res, asm, shape, path = step_round_trip
    solids = cq.Workplane().add(shape).solids().vals() if not hasattr(shape, "Solids") \
        else shape.Solids()
    assert len(solids) == 6 and all(s.isValid() for s in solids)
    text = path.read_text(errors="ignore")
    for name in asm.parts.values():
        assert name in text
    # the solids' volumes match the placed triangles' (1 %, as the exporter checks parts)
    from gen.build.export import make_triangles

    vols = sorted(s.Volume() for s in solids)
    tri = sorted(abs(make_triangles(res.models[n]).volume) for n in asm.parts.values())
    assert vols == pytest.approx(tri, rel=0.01)
    # each solid sits where its pose puts it: the planets' box centres on the carrier
    # circle at the planet angles (pose translation), the others on the axis
    centres = sorted((round(float(c.x), 3), round(float(c.y), 3))
                     for c in (s.BoundingBox().center for s in solids))
    from gen.assemblies.planetary import poses

    want = sorted((round(float(T[0, 3]), 3), round(float(T[1, 3]), 3))
                  for T in poses(asm, 0.0).values())
    assert np.allclose(centres, want, atol=0.05)   # box of a faceted tooth outline, 0.05 mm
    # no overlap of the placed members (on their triangles, manifold3d: cheaper than kernel
    # booleans; the kernel solids agree with the triangles in volume above)
    placed = _placed(res.models, poses(asm, 0.0))
    names = sorted(placed)
    for i, a in enumerate(names):
        for b in names[i + 1:]:
            assert (placed[a] ^ placed[b]).volume() < 1e-3
