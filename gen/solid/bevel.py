"""Solid of one straight bevel gear (cadquery, imported lazily inside the functions).

Construction, in the gear's own frame of :mod:`gen.geometry.bevel` (axis Z, back face z = 0,
teeth toward +Z, apex at z = mounting distance):

1. The large-end Tredgold outline on the back cone is projected from the apex onto two planes
   perpendicular to the axis, one below the back face and one beyond the small end. The two
   planar sections are homothetic about the apex, so a ruled loft between them (B-spline edges
   through the flank samples, circular arcs for tips and roots) has exactly the straight bevel
   flanks: every ruling runs through the apex, i.e. the section at cone distance R is the
   large-end section scaled by R/Re.
2. The blank of revolution (back face, back cone, a cone over the tips, front cone, front
   face, bore) is intersected with that tooth body. The back and front cones thereby trim the
   teeth at the large and small ends; no tooth face coincides with a blank face.
"""

from __future__ import annotations

from gen.errors import GeometryError
from gen.geometry.bevel import BevelSizes, blank_profile, bevel_tooth_outline_3d, virtual_flank
from gen.geometry.section import Arc, Loop, Spline


def _loop_wire(loop: Loop, z: float):
    """cadquery Wire of a 2-D Loop placed on the plane at height z."""
    import cadquery as cq

    edges = []
    for c in loop.curves:
        if isinstance(c, Arc):
            p0, pm, p1 = c.start, c.mid, c.end
            edges.append(cq.Edge.makeThreePointArc(cq.Vector(p0[0], p0[1], z),
                                                   cq.Vector(pm[0], pm[1], z),
                                                   cq.Vector(p1[0], p1[1], z)))
        elif isinstance(c, Spline):
            edges.append(cq.Edge.makeSpline([cq.Vector(px, py, z) for px, py in c.points]))
        else:
            p0, p1 = c.start, c.end
            edges.append(cq.Edge.makeLine(cq.Vector(p0[0], p0[1], z), cq.Vector(p1[0], p1[1], z)))
    return cq.Wire.assembleEdges(edges)


def tooth_body(sizes: BevelSizes, z_low: float, z_high: float, flank=None):
    """Ruled loft of the tooth surfaces between the planes z_low and z_high (both below the apex)."""
    import cadquery as cq

    if not z_low < z_high < sizes.mounting_distance:
        raise GeometryError("tooth body planes must lie below the apex, low before high")
    outline = bevel_tooth_outline_3d(sizes, flank)
    wires = [_loop_wire(outline.on_plane(zp), zp) for zp in (z_low, z_high)]
    return cq.Solid.makeLoft(wires, ruled=True)


def blank_solid(sizes: BevelSizes, bore_diameter: float):
    """The blank of revolution about Z (see :func:`gen.geometry.bevel.blank_profile`)."""
    import cadquery as cq

    prof = blank_profile(sizes, bore_diameter / 2.0)
    wire = cq.Wire.makePolygon([cq.Vector(r, 0.0, zz) for r, zz in prof], close=True)
    return cq.Solid.revolve(wire, [], 360.0, cq.Vector(0, 0, 0), cq.Vector(0, 0, 1))


def _common(a, b):
    """Boolean common of two shapes, run on all cores (BRepAlgoAPI_Common)."""
    import cadquery as cq
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Common
    from OCP.TopTools import TopTools_ListOfShape

    args, tools = TopTools_ListOfShape(), TopTools_ListOfShape()
    args.Append(a.wrapped)
    tools.Append(b.wrapped)
    op = BRepAlgoAPI_Common()
    op.SetArguments(args)
    op.SetTools(tools)
    op.SetRunParallel(True)
    op.Build()
    if not op.IsDone():
        raise GeometryError("the CAD kernel could not trim the bevel teeth to the blank")
    return cq.Shape.cast(op.Shape())


def build_bevel_solid(sizes: BevelSizes, bore_diameter: float, *, flank=None):
    """One valid straight bevel gear solid (``cadquery.Solid``), bore Ø ``bore_diameter`` mm.

    Raises GeometryError when the kernel does not give exactly one valid solid.
    """
    import cadquery as cq

    if flank is None:
        flank = virtual_flank(sizes)
    blank = blank_solid(sizes, bore_diameter)
    H = sizes.mounting_distance
    z_top = blank.BoundingBox().zmax
    body = tooth_body(sizes, -sizes.module, z_top + 0.5 * (H - z_top), flank)
    result = _common(blank, body)
    solids = result.Solids()
    if len(solids) != 1:
        raise GeometryError(f"bevel gear solid came out as {len(solids)} solids, expected one")
    solid = solids[0]
    if not solid.isValid():
        solid = solid.fix()
        if not solid.isValid():
            raise GeometryError("the CAD kernel produced an invalid bevel gear solid")
    if not isinstance(solid, cq.Solid):  # pragma: no cover - defensive
        raise GeometryError("bevel gear result is not a solid")
    return solid



def apex_solid(shape):
    """Solid of a :class:`gen.geometry.body.ApexBody` (the builder table's entry)."""
    return build_bevel_solid(shape.sizes, shape.bore, flank=shape.flank)
