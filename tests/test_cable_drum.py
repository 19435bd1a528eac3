"""Cable drum kind: turns, holding ratio and ratios in the manifest, grooves and turns measured
on the exported triangles, refusals naming the key."""

import math

import numpy as np
import pytest

from gen.errors import ParamError
from gen.kinds.base import resolve
from gen.params.project import RawPart


def part(**values):
    raw = RawPart(name="d", kind="cable_drum", values=values, file="t.yaml", train=None, lines={})
    return resolve(raw)


def test_issue_example_manifest():
    p = part(cable_diameter=1.0, drum_diameter=20, travel=150)
    s = p.sizes
    # computed: D_p = D + d_c = 21 mm; active turns 150 / (π·21) = 2.2736; + 2 dead turns
    assert s["pitch_diameter"] == 21.0
    assert s["turns"] == pytest.approx(150 / (math.pi * 21) + 2, rel=1e-12)
    assert s["turns"] == pytest.approx(4.2736, abs=1e-4)
    # ratio 21 against 10 for a polyester braid (common practice, the default cable)
    assert s["diameter_ratio"] == pytest.approx(21.0) and s["min_diameter_ratio"] == 10.0
    assert not p.errors


@pytest.mark.parametrize("wraps", [2, 3])
def test_holding_ratio_of_the_dead_turns(wraps):
    # Euler–Eytelwein e^(μθ), θ = 2π × wraps, μ 0.2 (computed): 12.35 for 2, 43.38 for 3
    p = part(cable_diameter=1.0, drum_diameter=20, travel=150, dead_turns=wraps, friction=0.2)
    assert p.sizes["holding_ratio"] == pytest.approx(math.exp(0.2 * 2 * math.pi * wraps), rel=1e-12)
    assert p.sizes["holding_ratio"] == pytest.approx({2: 12.35, 3: 43.38}[wraps], abs=0.005)


def test_one_dead_turn_is_refused():
    # one wrap would hold only e^(0.4π) = 3.51 (computed): fewer than 2 dead turns is refused
    with pytest.raises(ParamError) as exc:
        part(cable_diameter=1.0, drum_diameter=20, travel=150, dead_turns=1)
    assert exc.value.key == "dead_turns"


def test_drum_smaller_than_the_cable_allows_is_refused():
    # steel 7×19 wants D_p/d_c ≥ 30 (common practice); a 20 mm drum for 1 mm gives 21
    with pytest.raises(ParamError) as exc:
        part(cable_diameter=1.0, drum_diameter=20, travel=150, cable="steel-7x19")
    assert exc.value.key == "drum_diameter" and "too small" in str(exc.value)
    assert part(cable_diameter=1.0, drum_diameter=29, travel=150, cable="steel-7x19").sizes[
        "diameter_ratio"] == pytest.approx(30.0)


def test_tension_and_joint_ratio():
    p = part(cable_diameter=1.0, drum_diameter=20, travel=150, torque=0.2, joint_diameter=42)
    # T = τ / (D_p/2) = 0.2 N·m / 0.0105 m (computed); the joint turns D_p/D_j of the drum
    assert p.sizes["cable_tension"] == pytest.approx(0.2 / 0.0105, rel=1e-12)
    assert p.sizes["joint_ratio"] == pytest.approx(42 / 21)
    assert p.sizes["joint_torque"] == pytest.approx(0.2 * 2.0, rel=1e-12)


@pytest.fixture(scope="module")
def drum_mesh():
    from gen.triangles import triangles

    p = part(cable_diameter=1.5, drum_diameter=24, travel=60, bore=5, chord_tolerance=0.02)
    return p, triangles(p.shape, p.chord_tol)


def _axial(mesh, normal):
    sec = mesh.section(plane_origin=(0.0, 0.0, 0.0), plane_normal=normal)
    return np.vstack([np.asarray(d) for d in sec.discrete])


def test_grooves_and_turns_measured_on_the_triangles(drum_mesh):
    from gen.triangles.prism import slice_polygons

    p, mesh = drum_mesh
    s = p.data["drum"]
    assert mesh.is_watertight
    for c in p.slice_checks:
        assert c(lambda z: slice_polygons(mesh, z)) == []
    band0, band1 = p.data["band"]
    # the axial cut y = 0, +X side, outside the bore (the anchor hole points to −X here: it
    # is checked below)
    pts = _axial(mesh, (0.0, 1.0, 0.0))
    pts = pts[pts[:, 0] > 0]
    r, z = pts[:, 0], pts[:, 2]
    band = ((z > band0 + 1e-3) & (z < band1 - 1e-3) & (r > 8.0)
            & (r < s.outer_diameter / 2 + 0.05))
    # groove bottom and land diameters: D = 24 and D + 2·0.35 d_c = 25.05 (common practice
    # depth 0.35 d_c); facets within 0.02 mm
    assert 2 * r[band].min() == pytest.approx(24.0, abs=0.05)
    assert 2 * r[band].max() == pytest.approx(24.0 + 2 * 0.35 * 1.5, abs=0.05)
    # grooves along the line: runs of the cut below r = 12.3 (0.3 mm above the bottom, where
    # a groove is ±0.66 mm wide and the land between two is 0.41 mm, computed from r_g =
    # 0.53 d_c); the cut of a faceted surface jitters by the chord tolerance, so runs closer
    # than 0.2 mm are one groove. Their centres lie one groove pitch p = 1.1 d_c = 1.65 apart.
    # A run that reaches a band end (the cut's points on the flange junction planes included)
    # is a groove cut by the flange: left out of the pitch.
    ends = (z >= band0 - 1e-6) & (z <= band1 + 1e-6) & (r > 8.0) & (r < 12.3)
    zl = np.sort(z[ends])
    breaks = np.flatnonzero(np.diff(zl) > 0.2)
    groups = np.split(zl, breaks + 1)
    inner = [g for g in groups if g[0] > band0 + 1e-6 and g[-1] < band1 - 1e-6]
    bottoms = np.array([0.5 * (g[0] + g[-1]) for g in inner])
    assert len(bottoms) >= 3
    assert np.diff(bottoms) == pytest.approx(np.full(len(bottoms) - 1, 1.65), abs=0.02)
    # turns: the band holds the grooved length (total turns × p) plus one pitch of margin at
    # each end (common practice), so band length / measured pitch − 2 is the total turns:
    # 60 / (π·25.5) + 2 dead = 2.749 (computed)
    turns_on_band = (band1 - band0) / float(np.mean(np.diff(bottoms))) - 2
    assert turns_on_band == pytest.approx(60 / (math.pi * 25.5) + 2, abs=0.05)
    # and the grooves crossing the line across the band: one per turn of the band
    assert len(groups) in (math.floor(turns_on_band + 2), math.ceil(turns_on_band + 2) + 1)


def test_anchor_hole_opens_into_the_groove(drum_mesh):
    from gen.triangles.prism import slice_polygons

    p, mesh = drum_mesh
    s = p.data["drum"]
    z = p.data["anchor"]
    # at the anchor height the hole joins the groove to the bore: the slice is one polygon
    # (no separate bore loop) that reaches in to the bore radius 2.5 mm
    polys = slice_polygons(mesh, z)
    assert len(polys) == 1
    r = np.hypot(*polys[0].T)
    assert r.min() == pytest.approx(2.5, abs=0.05)
    # the hole points where the groove centre is: angle 0 at the band start, turning 2π per
    # groove pitch (right hand, gen.geometry.drum); its wall lies within half the hole
    # diameter of that direction
    band0 = p.data["band"][0]
    ang = 2 * math.pi * (z - band0) / s.groove_pitch
    d = p.sizes["anchor_hole"]
    xy = polys[0][(r > 4.0) & (r < 11.9)]
    assert len(xy) > 10
    ux, uy = math.cos(ang), math.sin(ang)
    along = xy[:, 0] * ux + xy[:, 1] * uy
    across = -xy[:, 0] * uy + xy[:, 1] * ux
    assert np.all(along > 0) and np.all(np.abs(across) <= d / 2 + 0.05)
