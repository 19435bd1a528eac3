"""STEP (ISO 10303-21, AP214) export with deterministic bytes; every file is re-read and
analysed before it replaces an earlier one (the solid in memory has its tolerances checked
first: a file does not carry them).

Shape analysis: :mod:`gen.export.shape_analysis`; assemblies: :mod:`gen.export.step_assembly`.
"""

from __future__ import annotations

import os
import re
from functools import lru_cache


from gen.errors import ExportError
from gen.export.atomic import folder_problem, temp_path, write_atomic
from gen.export.shape_analysis import analyse_shape, shape_volume, tolerance_check  # noqa: F401
from gen.export.step_share import share_geometry

_STAMP = re.compile(rb"FILE_NAME\('([^']*)','[^']*'")
# the writer numbers products per session ('name 2', 'name 4' …): drop the counter
_PRODUCT = re.compile(rb"PRODUCT\('([^']*?) \d+','([^']*?) \d+'")
# entities whose text carries per-session counters, with their line continuations
_SESSION_ENTITY = re.compile(rb"(#\d+ = (?:PRODUCT|NEXT_ASSEMBLY_USAGE_OCCURRENCE)\()(.*?)\);\n",
                             re.DOTALL)
_NAUO = re.compile(rb"NEXT_ASSEMBLY_USAGE_OCCURRENCE\('\d+'")


@lru_cache(maxsize=None)
def quiet_kernel() -> None:
    """Let the kernel's default messenger print failures only: its STEP readers and writers
    otherwise print transfer statistics on standard output, between the build's own lines."""
    from OCP.Message import Message, Message_Gravity

    for printer in Message.DefaultMessenger_s().Printers():
        printer.SetTraceLevel(Message_Gravity.Message_Fail)


def step_bytes(shape, name: str, workdir: str) -> bytes:
    """STEP text of ``shape`` with the product named ``name``, a fixed time stamp, and one
    instance per geometric value (:func:`gen.export.step_share.share_geometry`)."""
    quiet_kernel()
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
    data = through_file(workdir, lambda tmp: writer.Write(tmp) == IFSelect_RetDone, name)
    return share_geometry(normalise(data, name))


def through_file(workdir: str, write, name: str) -> bytes:
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


def read_step_shape(path: str):
    """Read a STEP file with the kernel's reader; returns the ``TopoDS_Shape``."""
    from OCP.IFSelect import IFSelect_RetDone
    from OCP.STEPControl import STEPControl_Reader

    quiet_kernel()
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
