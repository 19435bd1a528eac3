"""Laying parts flat and packing them on a build plate."""

from __future__ import annotations

import itertools
import math

import numpy as np
import pytest

from gen.errors import GeometryError
from gen.geometry.body import Body, Prism
from gen.geometry.section import Section, circle
from gen.triangles.plate import arrange, lay_flat
from gen.triangles.prism import body_triangles


def box(x, y, z):
    import trimesh

    b = trimesh.creation.box((x, y, z))
    b.apply_translation((0.0, 0.0, z / 2.0))
    return b


def disc(r, h, hole=None):
    holes = (circle(hole),) if hole else ()
    return body_triangles(Body((Prism(Section(circle(r), holes), 0.0, h),)), 0.01)


def frustum_apex_down():
    """A cone frustum (bevel-gear-like blank) standing on its small face, back face up."""
    import trimesh

    c = trimesh.creation.cone(radius=20.0, height=12.0, sections=64)
    c = c.slice_plane((0, 0, 6.0), (0, 0, -1.0), cap=True)     # keep the lower half
    c.apply_transform(trimesh.transformations.rotation_matrix(math.pi, (1, 0, 0)))
    c.apply_translation((0, 0, -c.bounds[0][2]))
    return c


def _footprints(placed):
    return [(p.name, p.mesh.bounds[0][:2], p.mesh.bounds[1][:2]) for p in placed]


def test_generated_bottom_is_kept():
    g = disc(15.0, 6.0, hole=4.0)
    moved, tf = lay_flat(g)
    assert np.allclose(tf, np.eye(4))
    assert np.allclose(moved.vertices, g.vertices)


def test_back_face_goes_down():
    f = frustum_apex_down()
    assert f.is_watertight
    moved, _ = lay_flat(f)
    assert moved.bounds[0][2] == pytest.approx(0.0, abs=1e-9)
    # the large (back) face, radius 20 mm, now lies on z = 0
    bottom = moved.vertices[np.abs(moved.vertices[:, 2]) < 1e-9]
    assert np.max(np.hypot(bottom[:, 0], bottom[:, 1])) == pytest.approx(20.0, abs=1e-6)
    assert moved.volume == pytest.approx(f.volume, rel=1e-9)


def test_tilted_box_lands_on_its_largest_face():
    import trimesh

    b = box(40.0, 30.0, 5.0)
    b.apply_transform(trimesh.transformations.rotation_matrix(0.7, (1, 0, 0)))
    b.apply_transform(trimesh.transformations.rotation_matrix(0.3, (0, 1, 0)))
    moved, _ = lay_flat(b)
    assert moved.extents[2] == pytest.approx(5.0, abs=1e-9)   # stands on a 40 × 30 face
    on_plate = np.all(np.abs(moved.vertices[moved.faces][:, :, 2]) < 1e-9, axis=1)
    assert moved.area_faces[on_plate].sum() == pytest.approx(40.0 * 30.0, rel=1e-9)


def test_packing_has_no_overlaps_and_stays_on_the_plate():
    plate, gap = (220.0, 220.0), 5.0
    items = [(f"box{i}", box(20.0 + 7 * i, 15.0 + 3 * (i % 4), 4.0)) for i in range(10)]
    items += [("wheel", disc(30.0, 8.0, hole=4.0)), ("blank", frustum_apex_down())]
    originals = [m.vertices.copy() for _, m in items]
    placed = arrange(items, plate, gap)
    assert [p.name for p in placed] == [n for n, _ in items]
    for (_, m), v in zip(items, originals):
        assert np.array_equal(m.vertices, v)                   # inputs untouched
    for p, (_, m) in zip(placed, items):
        lo, hi = p.mesh.bounds
        assert lo[0] >= -1e-9 and lo[1] >= -1e-9 and lo[2] == pytest.approx(0.0, abs=1e-9)
        assert hi[0] <= plate[0] + 1e-9 and hi[1] <= plate[1] + 1e-9
        assert p.mesh.volume == pytest.approx(m.volume, rel=1e-9)
        # the recorded transform reproduces the placed copy from the input
        again = m.copy()
        again.apply_transform(p.transform)
        assert np.allclose(again.vertices, p.mesh.vertices, atol=1e-9)
    for (na, alo, ahi), (nb, blo, bhi) in itertools.combinations(_footprints(placed), 2):
        apart = max(blo[0] - ahi[0], alo[0] - bhi[0], blo[1] - ahi[1], alo[1] - bhi[1])
        assert apart >= gap - 1e-9, (na, nb, apart)


def test_long_part_is_turned_to_fit():
    placed = arrange([("rail", box(200.0, 20.0, 5.0))], plate=(100.0, 220.0), spacing=5.0)
    p = placed[0]
    assert p.turned
    assert p.mesh.extents[0] == pytest.approx(20.0) and p.mesh.extents[1] == pytest.approx(200.0)


def test_errors_name_the_part_and_the_plate():
    with pytest.raises(GeometryError, match=r"part 'big'.*220 × 220 mm plate"):
        arrange([("small", box(10, 10, 2)), ("big", box(230.0, 230.0, 5.0))])
    many = [(f"tile{i}", box(100.0, 100.0, 2.0)) for i in range(5)]   # only 4 fit
    with pytest.raises(GeometryError, match=r"part 'tile4'.*220 × 220 mm plate"):
        arrange(many)
    with pytest.raises(GeometryError):
        arrange([("a", box(1, 1, 1))], plate=(0.0, 100.0))
