"""Triangles of a solid of revolution (:class:`gen.geometry.body.Revolved`), by manifold3d.

The (r, z) profile is revolved a full turn (``Manifold.revolve``: the cross-section's x is the
radius, its y becomes z) into an inscribed polygon of n sides at every radius, n from
:meth:`Revolved.segments` for the largest radius so that no chord departs from the true circle
by more than the chord tolerance; smaller radii have smaller sagittae. Axial holes are
cylinders of their own segment count, one millimetre longer than the body at each end,
subtracted by a manifold boolean. The result is checked to be watertight with a positive
volume.

Because every circle is an inscribed n-gon, the triangles' volume and axial inertia are those
of the exact body times :meth:`Revolved.polygon_ratios` (holes: likewise with their own n),
which is what :mod:`gen.kinds.flywheel` uses to bound the error of its cross-check.
"""

from __future__ import annotations

import numpy as np

from gen.errors import GeometryError

#: how far hole cylinders stand out of the body at each end (mm), so no face coincides
HOLE_OVERRUN = 1.0


def revolved_manifold(shape, tol: float = 0.01):
    """``manifold3d.Manifold`` of a :class:`gen.geometry.body.Revolved` at chord tolerance ``tol``."""
    import manifold3d as m3d

    n = shape.segments(shape.r_max, tol)
    body = m3d.Manifold.revolve(m3d.CrossSection([np.asarray(shape.profile, dtype=float)]), n)
    if not shape.holes:
        return body
    z0, z1 = shape.z_range
    cutters = []
    for h in shape.holes:
        r = h.diameter / 2.0
        nh = shape.segments(r, tol, least=12)
        cyl = m3d.Manifold.cylinder(z1 - z0 + 2 * HOLE_OVERRUN, r, -1.0, nh)
        for x, y in h.centers():
            cutters.append(cyl.translate((float(x), float(y), z0 - HOLE_OVERRUN)))
    return body - m3d.Manifold.batch_boolean(cutters, m3d.OpType.Add)


def revolved_triangles(shape, tol: float = 0.01):
    """Watertight ``trimesh.Trimesh`` of ``shape`` (the builder table's entry), mm."""
    import trimesh

    mesh = revolved_manifold(shape, tol).to_mesh64()
    tm = trimesh.Trimesh(vertices=np.asarray(mesh.vert_properties)[:, :3],
                         faces=np.asarray(mesh.tri_verts), process=False)
    if not tm.is_watertight or not tm.volume > 0:
        raise GeometryError("the revolved body's triangles are not closed")
    return tm
