"""B-rep solid of revolution (:class:`gen.geometry.body.Revolved`), exact, by the OCP kernel.

The (r, z) profile becomes a planar face in the XZ plane (x = r, y = 0), revolved a full
turn about the Z axis by ``BRepPrimAPI_MakeRevol``: its straight edges give planes, cylinders
and cones, exactly. Axial holes are exact cylinders (``BRepPrimAPI_MakeCylinder``) standing
out of the body at both ends, subtracted in one ``BRepAlgoAPI_Cut``. The result must be one
valid solid (:func:`gen.solid.kernel.check_solid`). OCP is imported inside the functions.
"""

from __future__ import annotations

import math

from gen.errors import GeometryError
from gen.solid.kernel import as_solid, check_solid

#: how far hole cylinders stand out of the body at each end (mm), so no face coincides
HOLE_OVERRUN = 1.0


def _profile_face(profile):
    from OCP.BRepBuilderAPI import BRepBuilderAPI_MakeFace, BRepBuilderAPI_MakePolygon
    from OCP.gp import gp_Pnt

    poly = BRepBuilderAPI_MakePolygon()
    for r, z in profile:
        poly.Add(gp_Pnt(float(r), 0.0, float(z)))
    poly.Close()
    if not poly.IsDone():
        raise GeometryError("the revolved profile does not make a closed wire")
    face = BRepBuilderAPI_MakeFace(poly.Wire(), True)
    if not face.IsDone():
        raise GeometryError("the revolved profile does not make a planar face")
    return face.Face()


def revolved_shape(shape):
    """OCP ``TopoDS_Shape`` of ``shape`` (revolved profile minus holes), not yet checked."""
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Cut
    from OCP.BRepPrimAPI import BRepPrimAPI_MakeCylinder, BRepPrimAPI_MakeRevol
    from OCP.gp import gp_Ax1, gp_Ax2, gp_Dir, gp_Pnt
    from OCP.TopTools import TopTools_ListOfShape

    rev = BRepPrimAPI_MakeRevol(_profile_face(shape.profile),
                                gp_Ax1(gp_Pnt(0.0, 0.0, 0.0), gp_Dir(0.0, 0.0, 1.0)),
                                2.0 * math.pi)
    rev.Build()
    if not rev.IsDone():
        raise GeometryError("revolving the profile failed")
    body = rev.Shape()
    if not shape.holes:
        return body
    z0, z1 = shape.z_range
    tools = TopTools_ListOfShape()
    for h in shape.holes:
        for x, y in h.centers():
            ax = gp_Ax2(gp_Pnt(float(x), float(y), z0 - HOLE_OVERRUN), gp_Dir(0.0, 0.0, 1.0))
            tools.Append(BRepPrimAPI_MakeCylinder(ax, h.diameter / 2.0,
                                                  z1 - z0 + 2 * HOLE_OVERRUN).Shape())
    args = TopTools_ListOfShape()
    args.Append(body)
    op = BRepAlgoAPI_Cut()
    op.SetArguments(args)
    op.SetTools(tools)
    op.Build()
    if not op.IsDone():
        raise GeometryError("cutting the axial holes out of the revolved body failed")
    return op.Shape()


def revolved_solid(shape, check: bool = True):
    """``TopoDS_Solid`` of a :class:`gen.geometry.body.Revolved` (the builder table's entry)."""
    result = revolved_shape(shape)
    if check:
        check_solid(result, "revolved body")
    return as_solid(result)
