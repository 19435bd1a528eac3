"""Helical and herringbone gears and racks: ISO 21771 relations, worked examples, the helix
measured on exported meshes, valid solids, and refused input."""

import math

import pytest

from gen.cli import main
from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import gear_sizes
from gen.geometry.pair import mesh_pair
from gen.check import check

IN = 25.4


def test_shigley_example_13_2():
    # Shigley, Mechanical Engineering Design, Example 13-2 (inputs doc, results computed):
    # φn 20°, ψ 25°, Pt 6 teeth/in, 18 teeth → d 3.000 in, pn 0.4745 in, px 1.1229 in,
    # φt 21.88°. Pt = 6 → transverse module 25.4/6 mm, normal module mt cos ψ.
    beta = math.radians(25)
    mn = IN / 6 * math.cos(beta)
    g = gear_sizes(18, mn, basic_rack("A", 20), beta=beta)
    assert g.d / IN == pytest.approx(3.000, abs=5e-4)
    assert math.pi * g.mn / IN == pytest.approx(0.4745, abs=5e-4)          # normal pitch
    assert math.pi * g.mn / math.sin(beta) / IN == pytest.approx(1.1229, abs=5e-4)  # axial
    assert math.degrees(g.alpha_t) == pytest.approx(21.88, abs=5e-3)


def test_metric_helical_pair():
    # ISO 21771 helical relations (from memory): mt = mn/cos β, tan αt = tan αn/cos β, d = z mt,
    # a = (d1 + d2)/2; mn 2, β 15°, z 20/40 → mt 2.0706, αt 20.647°,
    # d 41.411/82.822, a 62.117 mm (computed; recomputed by the closed forms just below)
    b15 = math.radians(15)
    assert 2 / math.cos(b15) == pytest.approx(2.0706, abs=5e-5)
    at = math.atan(math.tan(math.radians(20)) / math.cos(b15))
    assert math.degrees(at) == pytest.approx(20.647, abs=5e-4)
    assert 60 * 2 / math.cos(b15) / 2 == pytest.approx(62.117, abs=5e-4)
    rack, beta = basic_rack("A"), math.radians(15)
    g1, g2 = gear_sizes(20, 2.0, rack, beta=beta), gear_sizes(40, 2.0, rack, beta=beta)
    assert g1.mt == pytest.approx(2.0706, abs=5e-5)
    assert math.degrees(g1.alpha_t) == pytest.approx(20.647, abs=5e-4)
    assert (g1.d, g2.d) == (pytest.approx(41.411, abs=5e-4), pytest.approx(82.822, abs=5e-4))
    assert mesh_pair(g1, g2).reference_center_distance == pytest.approx(62.117, abs=5e-4)
    # overlap ratio εβ = b sin β / (π mn) (ISO 21771, from memory), b = 20 mm
    pr = mesh_pair(g1, g2, face_width=20.0)
    assert pr.overlap_ratio == pytest.approx(20 * math.sin(beta) / (math.pi * 2.0))


PARTS = """parts:
  hel: {kind: helical_gear, module: 2, teeth: 20, face_width: 10, helix_angle: 20, bore: 6}
  her: {kind: herringbone_gear, module: 2, teeth: 24, face_width: 12, helix_angle: 30, bore: 8, groove: 2}
  hrack: {kind: helical_rack, module: 2, teeth: 8, face_width: 10, height: 8, helix_angle: 20, hand: left}
  vrack: {kind: herringbone_rack, module: 2, teeth: 8, face_width: 12, height: 8, helix_angle: 30, hand: left}
  tgear: {kind: helical_gear, module: 2.0, module_basis: transverse, teeth: 20, face_width: 5, helix_angle: 20}
"""


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    d = tmp_path_factory.mktemp("hel")
    src = d / "h.yaml"
    src.write_text(PARTS)
    out = d / "out"
    assert main(["build", str(src), "--out", str(out)]) == 0
    return out, check([str(src)])


def _fold(value, period):
    """value brought into [−period/2, period/2) (written here, not the project's own fold)."""
    return (value + 0.5 * period) % period - 0.5 * period


def test_helix_measured_on_exported_stl(built):
    import trimesh

    from gen.triangles.prism import slice_polygons
    from gen.validate.helix import angular_offset, linear_offset

    out, _ = built

    def slices(name, *heights):
        mesh = trimesh.load(out / f"{name}.stl")
        return [max(slice_polygons(mesh, z), key=len) for z in heights]

    # helical gear 'hel': mn 2, z 20, β 20°, right hand. ISO 21771 (from memory):
    # r_p = z mn / (2 cos β); the section turns Δθ = Δz tan β / r_p, counter-clockwise seen
    # from +Z for a right hand (the project's stated convention), computed here
    beta = math.radians(20)
    rp = 20 * 2.0 / (2 * math.cos(beta))
    a, b = slices("hel", 1.0, 9.0)
    want = _fold(8.0 * math.tan(beta) / rp, 2 * math.pi / 20)
    assert math.degrees(abs(angular_offset(a, b, rp, 20) - want)) < 0.05
    # herringbone 'her': mn 2, z 24, β 30°, face 12 with a 2 mm groove → helices on z 0–5
    # and 7–12. Each half turns by Δz tan β / r_p, the upper half the other way, so slices
    # at mirror heights coincide. An untwisted part fails the first two checks.
    beta = math.radians(30)
    rp = 24 * 2.0 / (2 * math.cos(beta))
    turn = 3.0 * math.tan(beta) / rp                         # over Δz = 3 mm (computed)
    z1, z4, z8, z11 = slices("her", 1.0, 4.0, 8.0, 11.0)
    pitch = 2 * math.pi / 24
    assert math.degrees(abs(angular_offset(z1, z4, rp, 24) - _fold(turn, pitch))) < 0.05
    assert math.degrees(abs(angular_offset(z8, z11, rp, 24) - _fold(-turn, pitch))) < 0.05
    assert math.degrees(abs(angular_offset(z1, z11, rp, 24))) < 0.05
    # helical rack 'hrack': mn 2, β 20°: transverse pitch p_t = π mn / cos β along the rack
    # (ISO 21771, from memory); tooth traces shift Δx = Δz tan β (computed)
    beta = math.radians(20)
    p = math.pi * 2.0 / math.cos(beta)
    a, b = slices("hrack", 1.0, 3.0)
    assert linear_offset(a, b, 0.0, p) == pytest.approx(_fold(2.0 * math.tan(beta), p), abs=1e-3)


def test_step_reimports_and_volumes_agree(built):
    import cadquery as cq
    import trimesh

    from gen.export.step import read_step

    out, _ = built
    for name in ("hel", "her", "hrack", "vrack"):
        shape = cq.Shape.cast(read_step(str(out / f"{name}.step")))
        assert len(shape.Solids()) == 1 and shape.Solids()[0].isValid(), name
        mesh = trimesh.load(out / f"{name}.stl")
        assert mesh.is_watertight
        # issue requirement: STL volume within 0.2 % of the STEP volume
        assert mesh.volume == pytest.approx(shape.Solids()[0].Volume(), rel=2e-3), name


def test_transverse_module_basis(built):
    _, res = built
    s = res.models["tgear"].mate.sizes
    # module_basis transverse: mt given, mn = mt cos β (ISO 21771)
    assert s.mt == pytest.approx(2.0)
    assert s.mn == pytest.approx(2.0 * math.cos(math.radians(20)))
    assert s.d == pytest.approx(40.0)


@pytest.mark.parametrize("text,words", [
    ("parts:\n  g: {kind: helical_gear, module: 2, teeth: 20, face_width: 5, helix_angle: 60}\n",
     ["helix_angle", "out of range"]),
    ("parts:\n  g: {kind: helical_gear, module: 2, teeth: 20, face_width: 5, helix_angle: -10}\n",
     ["helix_angle", "out of range"]),
    ("parts:\n  g: {kind: herringbone_gear, module: 2, teeth: 20, face_width: 5, groove: 6}\n",
     ["groove", "face width"]),
    ("parts:\n  g: {kind: helical_gear, module: 2, teeth: 20, face_width: 5, helix_angle: 20}\n"
     "  r: {kind: helical_rack, module: 2, teeth: 9, face_width: 5, height: 6, helix_angle: 15, hand: left}\n"
     "meshes:\n  - parts: [g, r]\n", ["g+r", "helix angle"]),
    ("parts:\n  g: {kind: helical_gear, module: 2, teeth: 20, face_width: 5, helix_angle: 20}\n"
     "  r: {kind: helical_rack, module: 2, teeth: 9, face_width: 5, height: 6, helix_angle: 20, hand: right}\n"
     "meshes:\n  - parts: [g, r]\n", ["g+r", "opposite hands"]),
    ("parts:\n  g: {kind: herringbone_gear, module: 2, teeth: 20, face_width: 5, helix_angle: 20}\n"
     "  r: {kind: helical_rack, module: 2, teeth: 9, face_width: 5, height: 6, helix_angle: 20, hand: left}\n"
     "meshes:\n  - parts: [g, r]\n", ["g+r", "herringbone"]),
])
def test_helical_bad_input(text, words, write_yaml, capsys):
    assert main(["check", write_yaml(text)]) == 1
    out = capsys.readouterr()
    assert any(all(w in ln for w in words) for ln in (out.out + out.err).splitlines()), out.out
