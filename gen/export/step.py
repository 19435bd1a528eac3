"""STEP (ISO 10303-21, AP214) export with deterministic bytes; every file is re-read and
analysed before it replaces an earlier one (the solid in memory has its tolerances checked
first: a file does not carry them).

Shape analysis (:func:`analyse_shape`), with the CAD kernel's own tools:

* basic validity: ``BRepCheck_Analyzer`` (geometry checks on), exactly one solid;
* contents: ``ShapeAnalysis_ShapeContents`` — loose edges, edges without a curve on a face
  (``NbNoPCurve``), B-spline surfaces and curves of C0 continuity; free edges (bounding one
  face only: an open shell) from the edge → face map;
* curve on surface: for every edge of every face, the 3-D curve against the face's curve on
  surface (``BRepLib_ValidateEdge`` of ``BRepAdaptor_Curve(edge)`` and the curve on surface
  of ``BRepAdaptor_Curve(edge, face)``) at 23 equally spaced parameters, the same sampling
  ``BRepCheck`` uses for SameParameter (the kernel's own loop: ~10× faster than sampling
  from Python);
* tolerances: the largest edge and vertex tolerance (``BRep_Tool::Tolerance``).

A solid is refused when it is invalid, is not one closed solid, lacks a curve on a face, has an
edge whose curve leaves its face by more than the edge's tolerance, or carries an edge or
vertex tolerance above ``TOL.edge_tolerance``. C0 surfaces and curves are legal B-rep but
stricter checkers flag them: they are reported (warning), not refused.
"""

from __future__ import annotations

import os
import re
from dataclasses import dataclass
from functools import lru_cache

from gen.tolerances import TOL

from gen.errors import ExportError
from gen.export.atomic import folder_problem, temp_path, write_atomic

_STAMP = re.compile(rb"FILE_NAME\('([^']*)','[^']*'")
# the writer numbers products per session ('name 2', 'name 4' …): drop the counter
_PRODUCT = re.compile(rb"PRODUCT\('([^']*?) \d+','([^']*?) \d+'")
# entities whose text carries per-session counters, with their line continuations
_SESSION_ENTITY = re.compile(rb"(#\d+ = (?:PRODUCT|NEXT_ASSEMBLY_USAGE_OCCURRENCE)\()(.*?)\);\n",
                             re.DOTALL)
_NAUO = re.compile(rb"NEXT_ASSEMBLY_USAGE_OCCURRENCE\('\d+'")


@lru_cache(maxsize=None)
def _quiet() -> None:
    """Let the kernel's default messenger print failures only (its STEP reader and writers
    otherwise print transfer statistics on standard output)."""
    from OCP.Message import Message, Message_Gravity

    for printer in Message.DefaultMessenger_s().Printers():
        printer.SetTraceLevel(Message_Gravity.Message_Fail)


def step_bytes(shape, name: str, workdir: str) -> bytes:
    """STEP text of ``shape`` with the product named ``name`` and a fixed time stamp."""
    _quiet()
    from OCP.IFSelect import IFSelect_RetDone
    from OCP.Interface import Interface_Static
    from OCP.STEPControl import STEPControl_AsIs, STEPControl_Writer

    writer = STEPControl_Writer()  # first: it registers the static parameters set below
    Interface_Static.SetCVal_s("write.step.schema", "AP214IS")
    Interface_Static.SetCVal_s("write.step.product.name", name)
    # edges as 3-D curves only: the 2-D curves of every edge on both its faces (pcurves) are
    # half of a gear's file and readers recompute them (measured: 40-tooth spur 1.78 → 0.87 MB)
    Interface_Static.SetIVal_s("write.surfacecurve.mode", 0)
    shapes = shape if isinstance(shape, (list, tuple)) else [shape]
    for s in shapes:
        if writer.Transfer(getattr(s, "wrapped", s), STEPControl_AsIs) != IFSelect_RetDone:
            raise ExportError(f"STEP transfer failed for {name}")
    data = _through_file(workdir, lambda tmp: writer.Write(tmp) == IFSelect_RetDone, name)
    return normalise(data, name)


def _through_file(workdir: str, write, name: str) -> bytes:
    """Bytes of a file the kernel writes by name (``write(path) -> ok``); no file is left."""
    tmp = temp_path(workdir, ".step")
    try:
        if not write(tmp):
            why = folder_problem(workdir)
            raise ExportError(f"STEP write failed for {name} in {workdir}"
                              + (f": {why}" if why else ""))
        with open(tmp, "rb") as fh:
            return fh.read()
    finally:
        if os.path.exists(tmp):
            os.unlink(tmp)


def normalise(data: bytes, name: str) -> bytes:
    """Bytes that depend on the input only, not on what the process wrote before: a fixed
    time stamp, product names without the writer's session counters, assembly occurrence ids
    numbered from 1 in file order, and those entities on one line each (the writer wrapped
    them at a width that the counters changed)."""
    data = _SESSION_ENTITY.sub(lambda m: m.group(1) + re.sub(rb"\n\s*", b"", m.group(2)) + b");\n",
                               data)
    data = _PRODUCT.sub(rb"PRODUCT('\1','\2'", data)
    ids = iter(range(1, 1 << 30))
    data = _NAUO.sub(lambda m: b"NEXT_ASSEMBLY_USAGE_OCCURRENCE('%d'" % next(ids), data)
    return _STAMP.sub(lambda m: b"FILE_NAME('" + name.encode() + b"','1970-01-01T00:00:00'",
                      data, count=1)


#: parameters sampled per edge in the curve-on-surface check (as BRepCheck's SameParameter)
CURVE_SAMPLES = 23


@dataclass(frozen=True)
class ShapeReport:
    """Shape analysis of one shape (lengths mm, volume mm³)."""

    valid: bool
    solids: int
    free_edges: int
    no_pcurve: int
    c0_surfaces: int
    c0_curves: int
    edge_face_pairs: int
    max_curve_on_surface: float   # largest 3-D curve vs curve-on-surface distance
    edges_off_surface: int        # edge/face pairs deviating more than the edge tolerance
    max_edge_tolerance: float
    max_vertex_tolerance: float
    volume: float

    def errors(self) -> list[str]:
        out = []
        if not self.valid:
            out.append("the kernel's validity check fails")
        if self.solids != 1:
            out.append(f"{self.solids} solids, expected one")
        if self.free_edges:
            out.append(f"{self.free_edges} free edges (the shell is open)")
        if self.no_pcurve:
            out.append(f"{self.no_pcurve} edges without a curve on their face")
        if self.edges_off_surface:
            out.append(f"{self.edges_off_surface} edges leave their face by more than their "
                       f"tolerance (up to {self.max_curve_on_surface:.3g} mm)")
        worst = max(self.max_edge_tolerance, self.max_vertex_tolerance)
        if worst > TOL.edge_tolerance:
            out.append(f"edge/vertex tolerance {worst:.3g} mm exceeds {TOL.edge_tolerance:g} mm")
        return out

    def warnings(self) -> list[str]:
        if self.c0_surfaces or self.c0_curves:
            return [f"{self.c0_surfaces} B-spline surfaces and {self.c0_curves} curves of only "
                    "C0 continuity (legal, but flagged by strict CAD checkers)"]
        return []


def analyse_shape(shape, slack: float = 0.0) -> ShapeReport:
    """Full shape analysis of a ``TopoDS_Shape`` (see the module docstring); an edge counts as
    off its face when the deviation exceeds its tolerance + ``slack`` (mm)."""
    from OCP.BRep import BRep_Tool
    from OCP.BRepCheck import BRepCheck_Analyzer
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps
    from OCP.ShapeAnalysis import ShapeAnalysis_ShapeContents
    from OCP.TopAbs import TopAbs_EDGE, TopAbs_FACE, TopAbs_VERTEX
    from OCP.TopExp import TopExp_Explorer
    from OCP.TopoDS import TopoDS

    contents = ShapeAnalysis_ShapeContents()
    contents.Perform(shape)
    worst = edge_tol = vert_tol = 0.0
    pairs = off = 0
    faces = TopExp_Explorer(shape, TopAbs_FACE)
    while faces.More():
        face = TopoDS.Face_s(faces.Current())
        edges = TopExp_Explorer(face, TopAbs_EDGE)
        while edges.More():
            edge = TopoDS.Edge_s(edges.Current())
            edges.Next()
            tol = BRep_Tool.Tolerance_s(edge)
            edge_tol = max(edge_tol, tol)
            if BRep_Tool.Degenerated_s(edge):
                continue
            dev = _curve_on_surface(edge, face)
            worst = max(worst, dev)
            pairs += 1
            off += dev > tol + slack
        faces.Next()
    verts = TopExp_Explorer(shape, TopAbs_VERTEX)
    while verts.More():
        vert_tol = max(vert_tol, BRep_Tool.Tolerance_s(TopoDS.Vertex_s(verts.Current())))
        verts.Next()
    # free edges: non-degenerate edges bounding a single face (an open shell); counted on the
    # edge → face map, since ShapeContents counts only edges that belong to no face at all
    from OCP.TopExp import TopExp
    from OCP.TopTools import TopTools_IndexedDataMapOfShapeListOfShape

    ancestors = TopTools_IndexedDataMapOfShapeListOfShape()
    TopExp.MapShapesAndAncestors_s(shape, TopAbs_EDGE, TopAbs_FACE, ancestors)
    free = contents.NbFreeEdges()
    for i in range(1, ancestors.Extent() + 1):
        edge = TopoDS.Edge_s(ancestors.FindKey(i))
        if not BRep_Tool.Degenerated_s(edge) and ancestors.FindFromIndex(i).Size() == 1:
            free += 1
    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(shape, props)
    return ShapeReport(valid=bool(BRepCheck_Analyzer(shape, True).IsValid()),
                       solids=contents.NbSolids(), free_edges=int(free),
                       no_pcurve=contents.NbNoPCurve(), c0_surfaces=contents.NbC0Surfaces(),
                       c0_curves=contents.NbC0Curves(), edge_face_pairs=pairs,
                       max_curve_on_surface=float(worst), edges_off_surface=int(off),
                       max_edge_tolerance=float(edge_tol), max_vertex_tolerance=float(vert_tol),
                       volume=float(props.Mass()))


def _same_frame(a, b) -> bool:
    from OCP.gp import gp_TrsfForm

    if a.Form() == gp_TrsfForm.gp_Identity and b.Form() == gp_TrsfForm.gp_Identity:
        return True
    return all(abs(a.Value(i, j) - b.Value(i, j)) < 1e-12 for i in (1, 2, 3) for j in (1, 2, 3, 4))


def _curve_on_surface(edge, face) -> float:
    """Largest distance (mm) between an edge's 3-D curve and its curve on ``face`` at
    :data:`CURVE_SAMPLES` parameters. The kernel's ``BRepLib_ValidateEdge`` compares the two
    in their shared local frame; edges whose curve and face sit in different frames are
    sampled here."""
    from OCP.BRepAdaptor import BRepAdaptor_Curve
    from OCP.BRepLib import BRepLib_ValidateEdge

    c3, cs = BRepAdaptor_Curve(edge), BRepAdaptor_Curve(edge, face)
    if _same_frame(c3.Trsf(), cs.Trsf()):
        check = BRepLib_ValidateEdge(c3.Curve(), cs.CurveOnSurface(), True)
        check.SetControlPointsNumber(CURVE_SAMPLES)
        check.Process()
        return float(check.GetMaxDistance())
    a, b = c3.FirstParameter(), c3.LastParameter()
    return max(c3.Value(u).Distance(cs.Value(u))
               for u in (a + (b - a) * i / (CURVE_SAMPLES - 1) for i in range(CURVE_SAMPLES)))


def shape_volume(shape) -> float:
    """Volume (mm³) of a ``TopoDS_Shape`` by the kernel's volume integration."""
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps

    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(shape, props)
    return float(props.Mass())


def checked(shape, what: str) -> ShapeReport:
    """Analyse ``shape`` (a cadquery Shape or a TopoDS_Shape); raise ExportError on errors."""
    report = analyse_shape(getattr(shape, "wrapped", shape))
    errors = report.errors()
    if errors:
        raise ExportError(f"{what}: shape analysis refuses the solid: " + "; ".join(errors))
    return report


def read_step_shape(path: str):
    """Read a STEP file with the kernel's reader; returns the ``TopoDS_Shape``."""
    from OCP.IFSelect import IFSelect_RetDone
    from OCP.STEPControl import STEPControl_Reader

    _quiet()
    reader = STEPControl_Reader()
    if reader.ReadFile(path) != IFSelect_RetDone:
        raise ExportError("the written STEP cannot be read back")
    reader.TransferRoots()
    return reader.OneShape()


#: relative volume change allowed between a solid and its STEP re-read: the kernel integrates
#: volumes of B-spline faces numerically, and the re-read faces (same surfaces, curves on them
#: rebuilt by the reader) integrated to within 5e-6 on the demo pulleys; a lost or turned face
#: changes the volume by far more
STEP_VOLUME_REL = 1e-4


#: slack (mm) over the edge tolerance for curves on surface in a STEP as re-read: the files
#: carry edges as 3-D curves only and the reader rebuilds each curve on its faces by
#: projection; on the demo those rebuilt curves lie up to 3.9e-7 mm from the edge (the
#: kernel's BRepLib_ValidateEdge), against 1e-7 mm tolerances; a lost or moved face is
#: millimetres off
STEP_PCURVE_SLACK = 1e-6


def step_verifier(what: str, solids: int, volume: float, rel: float = STEP_VOLUME_REL,
                  sink: list | None = None):
    """A ``verify(path)`` for :func:`write_atomic`: the STEP as written re-reads as ``solids``
    solids passing the shape analysis, of total volume ``volume`` within ``rel``; the
    analysis is appended to ``sink``."""
    def verify(path: str) -> None:
        shape = read_step_shape(path)
        report = analyse_shape(shape, STEP_PCURVE_SLACK)
        if sink is not None:
            sink.append(report)
        errors = report.errors()
        if report.solids == solids and errors == [f"{solids} solids, expected one"]:
            errors = []          # an assembly holds several solids by design
        if errors:
            raise ExportError(f"{what}: the STEP as written fails the shape analysis: "
                              + "; ".join(errors))
        if report.solids != solids:
            raise ExportError(f"{what}: the STEP as written holds {report.solids} solids, "
                              f"expected {solids}")
        if abs(report.volume - volume) > rel * abs(volume):
            raise ExportError(f"{what}: the STEP as written has volume {report.volume:.6f} mm³, "
                              f"the solid {volume:.6f} mm³")
    return verify


def _assembly_document(items, name: str):
    """XCAF document of an assembly: one top shape ``name`` with one component per item.

    Each placement gets its own copy of its solid (``BRepBuilderAPI_Copy``, geometry copied)
    in a compound of its own, a product named after the part; the component placing it is
    named after the part too. The label structure and names are those the writer turns into
    the products of the file."""
    from OCP.BRep import BRep_Builder
    from OCP.BRepBuilderAPI import BRepBuilderAPI_Copy
    from OCP.TCollection import TCollection_ExtendedString
    from OCP.TDataStd import TDataStd_Name
    from OCP.TDocStd import TDocStd_Document
    from OCP.TopLoc import TopLoc_Location
    from OCP.TopoDS import TopoDS_Compound
    from OCP.XCAFApp import XCAFApp_Application
    from OCP.XCAFDoc import XCAFDoc_DocumentTool
    from OCP.gp import gp_Trsf

    def label_name(label, text: str) -> None:
        TDataStd_Name.Set_s(label, TCollection_ExtendedString(text))

    doc = TDocStd_Document(TCollection_ExtendedString("XmlXCAF"))
    XCAFApp_Application.GetApplication_s().InitDocument(doc)
    tool = XCAFDoc_DocumentTool.ShapeTool_s(doc.Main())
    tool.SetAutoNaming_s(False)
    top = tool.NewShape()
    label_name(top, name)
    builder = BRep_Builder()
    for part, shape, T in items:
        compound = TopoDS_Compound()
        builder.MakeCompound(compound)
        builder.Add(compound, BRepBuilderAPI_Copy(shape, True, False).Shape())
        product = tool.NewShape()
        tool.SetShape(product, compound)
        label_name(product, part)
        trsf = gp_Trsf()
        trsf.SetValues(*(float(T[i, j]) for i in range(3) for j in range(4)))
        label_name(tool.AddComponent(top, product, TopLoc_Location(trsf)), part)
    tool.UpdateAssemblies()
    return doc


def _write_document(doc, path: str) -> bool:
    """Write an XCAF document as STEP (AP214, mm, names on, curves on faces written)."""
    from OCP.IFSelect import IFSelect_RetDone
    from OCP.Interface import Interface_Static
    from OCP.STEPCAFControl import STEPCAFControl_Writer
    from OCP.STEPControl import STEPControl_AsIs
    from OCP.XSControl import XSControl_WorkSession

    _quiet()
    writer = STEPCAFControl_Writer(XSControl_WorkSession(), False)
    writer.SetColorMode(True)
    writer.SetLayerMode(True)
    writer.SetNameMode(True)
    Interface_Static.SetCVal_s("write.step.schema", "AP214IS")
    Interface_Static.SetIVal_s("write.surfacecurve.mode", 1)
    Interface_Static.SetIVal_s("write.precision.mode", 0)
    Interface_Static.SetIVal_s("write.stepcaf.subshapes.name", 1)
    Interface_Static.SetCVal_s("xstep.cascade.unit", "MM")
    Interface_Static.SetCVal_s("write.step.unit", "MM")
    if not writer.Transfer(doc, STEPControl_AsIs):
        return False
    return writer.Write(path) == IFSelect_RetDone


def write_step_assembly(items, path: str, name: str) -> int:
    """STEP of named, placed solids: ``items`` = [(part name, solid, 4×4 pose matrix)]; a
    solid is a ``TopoDS_Shape`` (or anything with one in ``.wrapped``).

    Written through the XCAF writer so that every solid keeps its name in CAD. Every placement
    gets its own copy of the solid, so that identical parts (the two inputs of a differential)
    become separate products, each named after its part, instead of one shared product."""
    from OCP.BRepCheck import BRepCheck_Analyzer

    from gen.errors import GeometryError

    volume, seen, placed = 0.0, [], []
    for part, shape, T in items:
        shape = getattr(shape, "wrapped", shape)
        # a solid placed twice is measured once (the same TShape: IsSame); each solid was
        # analysed when its part's STEP was written
        vol = next((v for s, v in seen if s.IsSame(shape)), None)
        if vol is None:
            if not BRepCheck_Analyzer(shape).IsValid():
                raise GeometryError(f"assembly STEP: the solid of {part} is not valid")
            vol = shape_volume(shape)
            seen.append((shape, vol))
        volume += vol
        placed.append((part, shape, T))
    doc = _assembly_document(placed, name)
    data = _through_file(os.path.dirname(os.path.abspath(path)),
                         lambda tmp: _write_document(doc, tmp), name)
    data = normalise(data, name)
    write_atomic(path, data, step_verifier(name, len(items), volume))
    return len(data)


def tolerance_check(shape, what: str) -> None:
    """Before export: one solid, and no edge or vertex tolerance above ``TOL.edge_tolerance``
    (a STEP file does not carry loose tolerances, so only the solid in memory shows them).
    The full analysis runs on the file as re-read."""
    from OCP.BRep import BRep_Tool
    from OCP.TopAbs import TopAbs_EDGE, TopAbs_SOLID, TopAbs_VERTEX
    from OCP.TopExp import TopExp_Explorer
    from OCP.TopoDS import TopoDS

    def scan(kind, cast):
        worst, n, ex = 0.0, 0, TopExp_Explorer(shape, kind)
        while ex.More():
            worst = max(worst, BRep_Tool.Tolerance_s(cast(ex.Current())) if cast else 0.0)
            n += 1
            ex.Next()
        return worst, n

    _, solids = scan(TopAbs_SOLID, None)
    worst = max(scan(TopAbs_EDGE, TopoDS.Edge_s)[0], scan(TopAbs_VERTEX, TopoDS.Vertex_s)[0])
    errors = []
    if solids != 1:
        errors.append(f"{solids} solids, expected one")
    if worst > TOL.edge_tolerance:
        errors.append(f"edge/vertex tolerance {worst:.3g} mm exceeds {TOL.edge_tolerance:g} mm")
    if errors:
        raise ExportError(f"{what}: shape analysis refuses the solid: " + "; ".join(errors))


def write_step(shape, path: str, name: str, volume: float | None = None,
               reports: list | None = None) -> int:
    """Write one solid as STEP; the file is re-read and fully analysed (its
    :class:`ShapeReport` appended to ``reports``) before it replaces ``path``. ``volume``:
    the solid's volume if already measured (mm³)."""
    wrapped = getattr(shape, "wrapped", shape)
    tolerance_check(wrapped, name)
    if volume is None:
        volume = shape_volume(wrapped)
    data = step_bytes(shape, name, os.path.dirname(os.path.abspath(path)))
    write_atomic(path, data, step_verifier(name, 1, volume, sink=reports))
    return len(data)


def read_step(path: str):
    """Re-import a STEP file with the kernel's reader; returns its ``TopoDS_Shape`` (the same
    as :func:`read_step_shape`)."""
    return read_step_shape(path)


def step_solids(path: str) -> list:
    """The solids (``TopoDS_Solid``) of a STEP file as re-read, in the file's order."""
    from OCP.TopAbs import TopAbs_SOLID
    from OCP.TopExp import TopExp_Explorer
    from OCP.TopoDS import TopoDS

    out, ex = [], TopExp_Explorer(read_step_shape(path), TopAbs_SOLID)
    while ex.More():
        out.append(TopoDS.Solid_s(ex.Current()))
        ex.Next()
    return out


#: the last STEP that passed the re-read: (solid, part name, bytes, analysis); a part of the
#: same solid under another name (identical planets) gets those bytes renamed
_LAST_VERIFIED: list = []


def renamed(data: bytes, old: str, new: str) -> bytes:
    """STEP bytes of a single-part file with its file and product name ``old`` → ``new``."""
    o, n = old.encode(), new.encode()
    head = b"FILE_NAME('" + o + b"',"
    prod = b"PRODUCT('" + o + b"','" + o + b"'"
    if data.count(head) != 1 or data.count(prod) != 1:
        raise ExportError(f"cannot rename the STEP of {old}: its names are not where expected")
    return (data.replace(head, b"FILE_NAME('" + n + b"',", 1)
            .replace(prod, b"PRODUCT('" + n + b"','" + n + b"'", 1))


def write_part(part, path: str, made) -> int:
    """The part's solid (checked against its triangles' volume) as STEP, fully analysed as
    re-read from the file; analysis warnings (C0 continuity) go to ``made.notes``.

    A solid just written under another name is not written and analysed again: its verified
    bytes are renamed, and the new file is read back and compared byte for byte."""
    from gen.findings import WARNING, Finding

    shape = made.solid()
    last = _LAST_VERIFIED[0] if _LAST_VERIFIED else None
    if last is not None and last[0] is shape and last[1] != part.name:
        data = renamed(last[2], last[1], part.name)

        def same_bytes(p: str) -> None:
            with open(p, "rb") as fh:
                if fh.read() != data:
                    raise ExportError(f"{part.name}: the STEP as written differs from the "
                                      "verified bytes")
        write_atomic(path, data, same_bytes)
        size, report = len(data), last[3]
    else:
        reports = []
        size = write_step(shape, path, part.name, made.volume, reports)
        report = reports[-1]
        with open(path, "rb") as fh:
            _LAST_VERIFIED[:] = [(shape, part.name, fh.read(), report)]
    made.analysis["step"] = report
    for text in report.warnings():
        made.notes.append(Finding(WARNING, "shape-analysis", f"STEP solid: {text}", part.name,
                                  "OCCT ShapeAnalysis_ShapeContents", scope="part"))
    return size
