"""Triangle meshes from :mod:`gen.geometry.body` descriptions, built with manifold3d.

The section's polygons (at the part's chordal tolerance) are extruded directly; no CAD kernel.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError


def _cross_section(section, tol):
    import manifold3d as m3d

    outer, holes = section.polygons(tol)
    return m3d.CrossSection([outer] + holes, m3d.FillRule.EvenOdd)


def prism_manifold(prism, tol: float = 0.01):
    import manifold3d as m3d

    cs = _cross_section(prism.section, tol)
    if prism.chevron or prism.shear:
        raise GeometryError("chevron and sheared prisms need the twisted-mesh builder")
    if prism.twist:
        total = prism.twist * prism.height
        r = max(np.hypot(*np.asarray(prism.section.polygons(tol)[0]).T))
        # chord of the helix between slices: r·Δφ²/8 ≤ tol
        n = max(1, int(math.ceil(abs(total) / math.sqrt(8 * tol / r))))
        man = m3d.Manifold.extrude(cs, prism.height, n, math.degrees(total))
    else:
        man = m3d.Manifold.extrude(cs, prism.height)
    return man.translate((0.0, 0.0, prism.z0))


def radial_hole_manifold(hole, tol: float = 0.01):
    """A cylinder along +X from r0 to r1, turned to the hole's angle and raised to its z."""
    import manifold3d as m3d

    r = hole.diameter / 2.0
    n = max(12, int(math.ceil(math.pi / math.acos(max(-1.0, 1.0 - tol / r)))))
    cyl = m3d.Manifold.cylinder(hole.r1 - hole.r0, r, r, n)   # along +Z from 0
    cyl = cyl.rotate((0.0, 90.0, 0.0)).translate((hole.r0, 0.0, 0.0))
    return cyl.rotate((0.0, 0.0, math.degrees(hole.angle))).translate((0.0, 0.0, hole.z))


def body_mesh(body, tol: float = 0.01):
    """Watertight trimesh of the body's union minus its cuts."""
    import trimesh

    man = None
    for p in body.solids:
        piece = prism_manifold(p, tol)
        man = piece if man is None else man + piece
    for c in body.cuts:
        man = man - prism_manifold(c, tol)
    for h in body.radial_holes:
        man = man - radial_hole_manifold(h, tol)
    mesh = man.to_mesh()
    tm = trimesh.Trimesh(vertices=np.asarray(mesh.vert_properties)[:, :3],
                         faces=np.asarray(mesh.tri_verts), process=False)
    if not tm.is_watertight or tm.volume <= 0:
        raise GeometryError("mesh is not watertight or has no volume")
    return tm


def slice_polygons(mesh, z: float):
    """Closed outline polygons ((n, 2) arrays) of the mesh cut by the plane at height z."""
    sec = mesh.section(plane_origin=(0.0, 0.0, z), plane_normal=(0.0, 0.0, 1.0))
    if sec is None:
        return []
    return [np.asarray(d)[:, :2] for d in sec.discrete]
