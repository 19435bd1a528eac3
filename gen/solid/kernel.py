"""Access to the OCP kernel classes this package uses, its tolerances, and solid checks.

OCP is imported on first use (:func:`occ`), never at module import, so ``pitchline check``
and ``--help`` do not load the CAD kernel.
"""

from __future__ import annotations

import importlib
from functools import lru_cache
from types import SimpleNamespace

from gen.errors import GeometryError

#: vertex, edge and face tolerance of the shapes built here (mm) = OCC Precision::Confusion
KERNEL_TOL = 1e-7
#: largest allowed deviation (mm) of a twisted face from the true helicoidal surface
HELIX_FIT = 1e-5
#: largest gap (mm) allowed between one section curve's end and the next curve's start
JUNCTION_GAP = 1e-6
#: largest distance (mm) of a section B-spline from the spline samples it replaces
SPLINE_FIT = 1e-6


_OCC_NAMES = {
    "OCP.BRep": ("BRep_Builder", "BRep_Tool"),
    "OCP.BRepAlgoAPI": ("BRepAlgoAPI_Cut", "BRepAlgoAPI_Fuse"),
    "OCP.BRepCheck": ("BRepCheck_Analyzer",),
    "OCP.BRepPrimAPI": ("BRepPrimAPI_MakePrism",),
    "OCP.Geom": ("Geom_BSplineCurve", "Geom_BSplineSurface", "Geom_Circle", "Geom_ConicalSurface",
                 "Geom_CylindricalSurface", "Geom_Line", "Geom_Plane", "Geom_SurfaceOfLinearExtrusion"),
    "OCP.Geom2d": ("Geom2d_BSplineCurve", "Geom2d_Circle", "Geom2d_Line"),
    "OCP.Geom2dAPI": ("Geom2dAPI_PointsToBSpline",),
    "OCP.GeomAbs": ("GeomAbs_C2",),
    "OCP.GeomAPI": ("GeomAPI_PointsToBSpline",),
    "OCP.gp": ("gp_Ax2", "gp_Ax22d", "gp_Ax2d", "gp_Ax3", "gp_Dir", "gp_Dir2d", "gp_Pnt",
               "gp_Pnt2d", "gp_Vec"),
    "OCP.TColgp": ("TColgp_Array1OfPnt", "TColgp_Array1OfPnt2d", "TColgp_Array2OfPnt"),
    "OCP.TColStd": ("TColStd_Array1OfInteger", "TColStd_Array1OfReal", "TColStd_Array2OfReal"),
    "OCP.TopAbs": ("TopAbs_FACE", "TopAbs_FORWARD", "TopAbs_REVERSED", "TopAbs_SOLID"),
    "OCP.TopExp": ("TopExp", "TopExp_Explorer"),
    "OCP.TopLoc": ("TopLoc_Location",),
    "OCP.TopoDS": ("TopoDS", "TopoDS_Edge", "TopoDS_Face", "TopoDS_Shell", "TopoDS_Solid",
                   "TopoDS_Vertex", "TopoDS_Wire"),
}


#: OCP modules the build path loads besides :data:`_OCC_NAMES`: the other builders' imports
#: and the STEP export (writer, XCAF assembly document, reader, shape analysis)
_BUILD_MODULES = (
    "OCP.BRepBuilderAPI", "OCP.BRepPrimAPI", "OCP.TopTools",
    "OCP.IFSelect", "OCP.Interface", "OCP.STEPControl", "OCP.STEPCAFControl",
    "OCP.XSControl", "OCP.TDocStd", "OCP.XCAFApp", "OCP.XCAFDoc", "OCP.TDataStd",
    "OCP.TCollection", "OCP.BRepGProp", "OCP.GProp", "OCP.ShapeAnalysis", "OCP.BRepAdaptor",
    "OCP.BRepLib", "OCP.Message",
)


@lru_cache(maxsize=None)
def occ() -> SimpleNamespace:
    """The OCP classes used here, imported on first use (the kernel loads in ~0.5–3 s)."""
    ns = {}
    for module, names in _OCC_NAMES.items():
        mod = importlib.import_module(module)
        ns.update({n: getattr(mod, n) for n in names})
    return SimpleNamespace(**ns)


def preload_kernel() -> None:
    """Import every OCP module a build uses (:func:`occ` and :data:`_BUILD_MODULES`)."""
    occ()
    for module in _BUILD_MODULES:
        importlib.import_module(module)


def check_solid(shape, what: str = "solid"):
    """Raise GeometryError unless ``shape`` is valid and holds exactly one solid."""
    o = occ()
    if not o.BRepCheck_Analyzer(shape).IsValid():
        raise GeometryError(f"the kernel built an invalid {what}")
    ex = o.TopExp_Explorer(shape, o.TopAbs_SOLID)
    count = 0
    while ex.More():
        count += 1
        ex.Next()
    if count != 1:
        raise GeometryError(f"the {what} came out as {count} solids, expected one")



def as_solid(shape):
    o = occ()
    if shape.ShapeType() == o.TopAbs_SOLID:
        return o.TopoDS.Solid_s(shape)
    ex = o.TopExp_Explorer(shape, o.TopAbs_SOLID)
    if not ex.More():
        raise GeometryError("the kernel result holds no solid")
    return o.TopoDS.Solid_s(ex.Current())
