"""Triangle mesh of a straight bevel gear, built with manifold3d (no CAD kernel).

Straight bevel flanks are ruled surfaces through the cone apex, so the tooth ring is an
extrusion of the outline projected on a plane below the back face, scaled about the axis
toward the apex (``scale_top``): exact, no interpolation along the face. The revolved blank
(back face, back cone, tip cone, front cone, front face, bore) is intersected with it.
"""

from __future__ import annotations

import math

import numpy as np


def bevel_manifold(sizes, bore_diameter: float, flank, tol: float = 0.01):
    import manifold3d as m3d

    from gen.geometry.bevel import bevel_tooth_outline_3d, blank_profile

    outline = bevel_tooth_outline_3d(sizes, flank)
    H = sizes.mounting_distance
    blank_rz = blank_profile(sizes, bore_diameter / 2.0)
    z_lo = -sizes.module
    z_hi = float(blank_rz[:, 1].max()) + 0.5 * (H - float(blank_rz[:, 1].max()))
    base = outline.on_plane(z_lo).polygon(tol)
    k = (H - z_hi) / (H - z_lo)
    teeth = m3d.Manifold.extrude(m3d.CrossSection([base]), z_hi - z_lo, 0, 0.0, (k, k))
    teeth = teeth.translate((0.0, 0.0, z_lo))
    r_max = float(blank_rz[:, 0].max())
    segs = max(64, int(math.ceil(math.pi / math.acos(max(-1.0, 1.0 - tol / r_max)))))
    # a whole number of segments per tooth, turned half a segment: no seam of the revolved
    # blank falls on a tooth's centre plane, where it met the tooth tip's own vertices and the
    # intersection left zero-area facets and edges shared by four faces (issue 11)
    z = int(sizes.z)
    segs = z * int(math.ceil(segs / z))
    blank = m3d.Manifold.revolve(m3d.CrossSection([blank_rz]), segs)
    blank = blank.rotate((0.0, 0.0, 180.0 / segs))
    return teeth ^ blank


def bevel_triangles(sizes, bore_diameter: float, flank, tol: float = 0.01):
    import trimesh

    from gen.errors import GeometryError

    mesh = bevel_manifold(sizes, bore_diameter, flank, tol).to_mesh()
    tm = trimesh.Trimesh(vertices=np.asarray(mesh.vert_properties)[:, :3],
                         faces=np.asarray(mesh.tri_verts), process=False)
    # checked as an STL reader will see it: float32 corners merged by position
    from gen.geometry.closed_surface import inspect

    rep = inspect(np.asarray(tm.vertices, dtype=np.float32), tm.faces)
    if not rep.ok:
        raise GeometryError(f"bevel gear triangles are not a closed solid: {rep.problem()}")
    return tm


def apex_triangles(shape, tol: float = 0.01):
    """Triangles of a :class:`gen.geometry.body.ApexBody` (the builder table's entry)."""
    return bevel_triangles(shape.sizes, shape.bore, shape.flank, tol)
