"""A D-flat or keyway bore stays straight through a twisted part (helical and herringbone
gears, grooved cable drums): a section's holes turn with it, so such bores are cut straight
through every layer. Checked on slices of the triangles, no CAD kernel."""

from __future__ import annotations

import math

import numpy as np
import pytest

from gen.api import make
from gen.build.export import make_triangles
from gen.geometry.body import plan_cuts
from gen.triangles.prism import slice_polygons

R, FLAT = 4.0, 0.5            # bore {diameter: 8, flat: 0.5}: the flat at y = R − FLAT


def d_hole(tri, z):
    """The slice's loop around the axis (the bore) at height z."""
    loops = slice_polygons(tri, z)
    return min(loops, key=lambda p: float(np.max(np.hypot(p[:, 0], p[:, 1]))))


CASES = [
    ("helical_gear", {}),
    ("herringbone_gear", {}),
    ("herringbone_gear", {"groove": 3}),
    ("helical_gear", {"hub": {"diameter": 20, "length": 6}}),
]


@pytest.mark.parametrize("kind,extra", CASES)
def test_d_flat_of_a_twisted_gear_stays_put(kind, extra):
    part = make(kind, module=2, teeth=30, face_width=20, helix_angle=30,
                bore={"diameter": 2 * R, "flat": FLAT}, **extra)
    assert not part.errors
    assert not plan_cuts(part.shape).booleans            # a plain hole of every layer
    tri = make_triangles(part)
    tol = part.chord_tol
    top = part.shape.solids[-1].z1
    # the D-hole is {r ≤ R, y ≤ R − FLAT} at every height (geometry of a circular segment,
    # computed): the flat stays at y = R − FLAT; had it turned with the helix (0.58° per mm
    # here, tan β / r_p), its ends would rise above that line by ~0.03 mm per mm of height
    half = math.acos((R - FLAT) / R)
    for z in (0.25, 0.5 * top, top - 0.25):
        p = d_hole(tri, z)
        r = np.hypot(p[:, 0], p[:, 1])
        assert np.max(p[:, 1]) <= R - FLAT + 1e-6
        assert np.max(r) <= R + 1e-6 and np.min(r[p[:, 1] < R - FLAT - 1e-3]) >= R - tol
        on_flat = p[np.abs(p[:, 1] - (R - FLAT)) <= 1e-6]
        assert np.min(on_flat[:, 0]) == pytest.approx(-R * math.sin(half), abs=1e-6)
        assert np.max(on_flat[:, 0]) == pytest.approx(R * math.sin(half), abs=1e-6)


def test_d_flat_of_a_grooved_drum_runs_through_the_band():
    part = make("cable_drum", cable_diameter=1.0, drum_diameter=20, travel=40,
                flanges="one", bore={"diameter": 2 * R, "flat": FLAT},
                hub={"diameter": 14, "length": 6})
    assert not part.errors
    assert not plan_cuts(part.shape).booleans
    tri = make_triangles(part)
    band0, band1 = part.data["band"]
    for z in (3.0, 0.5 * (band0 + band1), band1 - 0.25):    # hub, grooved band
        p = d_hole(tri, z)
        assert np.max(p[:, 1]) == pytest.approx(R - FLAT, abs=1e-6)
        assert np.max(np.hypot(p[:, 0], p[:, 1])) <= R + 1e-6
