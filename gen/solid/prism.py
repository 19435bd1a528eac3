"""B-rep solids from :mod:`gen.geometry.body` descriptions (the only cadquery user).

cadquery and OCP are imported inside the functions, so importing this module is cheap.
Flanks become one interpolating B-spline edge each and tip/root circles true arcs, so the
kernel never sees thousands of straight edges.
"""

from __future__ import annotations

import math

from gen.errors import GeometryError

#: B-spline fit tolerance for flank samples (mm): measured < 1 µm from the exact envelope
SPLINE_TOL = 1e-6


def _edge(curve, z: float = 0.0):
    import cadquery as cq
    from gen.geometry.section import Arc, Line, Spline

    if isinstance(curve, Spline):
        pts = [cq.Vector(float(x), float(y), z) for x, y in curve.points]
        if len(pts) == 2:
            return cq.Edge.makeLine(pts[0], pts[1])
        if len(pts) <= 4:
            return cq.Edge.makeSpline(pts)
        # least-squares B-spline within SPLINE_TOL of the samples: ~13 poles instead of one
        # per sample (a 40-point interpolation is 3× the STEP size for the same accuracy)
        return cq.Edge.makeSplineApprox(pts, tol=SPLINE_TOL, maxDeg=8)
    if isinstance(curve, Arc):
        if abs(curve.a1 - curve.a0) >= 2 * math.pi - 1e-12:
            return cq.Edge.makeCircle(curve.radius, cq.Vector(curve.center[0], curve.center[1], z))
        p0, pm, p1 = curve.start, curve.mid, curve.end
        return cq.Edge.makeThreePointArc(cq.Vector(p0[0], p0[1], z), cq.Vector(pm[0], pm[1], z),
                                         cq.Vector(p1[0], p1[1], z))
    if isinstance(curve, Line):
        return cq.Edge.makeLine(cq.Vector(curve.p0[0], curve.p0[1], z),
                                cq.Vector(curve.p1[0], curve.p1[1], z))
    raise GeometryError(f"unknown curve type {type(curve).__name__}")


def loop_wire(loop, z: float = 0.0):
    import cadquery as cq

    wire = cq.Wire.assembleEdges([_edge(c, z) for c in loop.curves])
    if not wire.IsClosed():
        raise GeometryError("section outline does not close")
    return wire


def section_face(section, z: float = 0.0):
    import cadquery as cq

    outer = loop_wire(section.outer, z)
    holes = [loop_wire(h, z) for h in section.holes]
    face = cq.Face.makeFromWires(outer, holes)
    if not face.isValid():
        raise GeometryError("section face is not valid")
    return face


def prism_solid(prism):
    import cadquery as cq

    if not prism.straight:
        raise GeometryError("twisted and sheared prisms need the twisted-solid builder")
    outer = loop_wire(prism.section.outer, prism.z0)
    holes = [loop_wire(h, prism.z0) for h in prism.section.holes]
    return cq.Solid.extrudeLinear(outer, holes, cq.Vector(0, 0, prism.height))


def radial_hole_solid(hole):
    import cadquery as cq

    c, s = math.cos(hole.angle), math.sin(hole.angle)
    return cq.Solid.makeCylinder(hole.diameter / 2.0, hole.r1 - hole.r0,
                                 cq.Vector(hole.r0 * c, hole.r0 * s, hole.z), cq.Vector(c, s, 0))


def body_solid(body):
    """One valid solid: union of the body's prisms minus its cuts."""
    shapes = [prism_solid(p) for p in body.solids]
    result = shapes[0]
    if len(shapes) > 1:
        result = result.fuse(*shapes[1:], glue=False).clean()
    for cut in body.cuts:
        result = result.cut(prism_solid(cut))
    for h in body.radial_holes:
        result = result.cut(radial_hole_solid(h))
    solids = result.Solids()
    if len(solids) != 1:
        raise GeometryError(f"solid has {len(solids)} separate bodies, expected one")
    solid = solids[0]
    if not solid.isValid():
        raise GeometryError("the CAD kernel produced an invalid solid")
    return solid
