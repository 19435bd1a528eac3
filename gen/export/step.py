"""STEP (ISO 10303-21, AP214) export with deterministic bytes."""

from __future__ import annotations

import os
import re

from gen.errors import ExportError
from gen.export.atomic import folder_problem, temp_path, write_atomic

_STAMP = re.compile(rb"FILE_NAME\('([^']*)','[^']*'")
# the writer numbers products per session ('name 2', 'name 4' …): drop the counter
_PRODUCT = re.compile(rb"PRODUCT\('([^']*?) \d+','([^']*?) \d+'")


def step_bytes(shape, name: str, workdir: str) -> bytes:
    """STEP text of ``shape`` with the product named ``name`` and a fixed time stamp."""
    from OCP.IFSelect import IFSelect_RetDone
    from OCP.Interface import Interface_Static
    from OCP.STEPControl import STEPControl_AsIs, STEPControl_Writer

    writer = STEPControl_Writer()  # first: it registers the static parameters set below
    Interface_Static.SetCVal_s("write.step.schema", "AP214IS")
    Interface_Static.SetCVal_s("write.step.product.name", name)
    shapes = shape if isinstance(shape, (list, tuple)) else [shape]
    for s in shapes:
        if writer.Transfer(s.wrapped, STEPControl_AsIs) != IFSelect_RetDone:
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
    """Fixed time stamp and product names without the writer's session counters."""
    data = _PRODUCT.sub(rb"PRODUCT('\1','\2'", data)
    return _STAMP.sub(lambda m: b"FILE_NAME('" + name.encode() + b"','1970-01-01T00:00:00'",
                      data, count=1)


def write_step_assembly(items, path: str, name: str) -> int:
    """STEP of named, placed solids: ``items`` = [(part name, shape, 4×4 pose matrix)].

    Written through the XCAF writer so that every solid keeps its name in CAD."""
    import cadquery as cq
    from cadquery.occ_impl.exporters.assembly import exportAssembly
    from OCP.gp import gp_Trsf

    from gen.errors import GeometryError

    assy = cq.Assembly(name=name)
    for part, shape, T in items:
        if not shape.isValid():
            raise GeometryError(f"assembly STEP: the solid of {part} is not valid")
        trsf = gp_Trsf()
        trsf.SetValues(*(float(T[i, j]) for i in range(3) for j in range(4)))
        assy.add(shape, name=part, loc=cq.Location(trsf))
    data = _through_file(os.path.dirname(os.path.abspath(path)),
                         lambda tmp: exportAssembly(assy, tmp), name)
    data = normalise(data, name)
    write_atomic(path, data)
    return len(data)


def write_step(shape, path: str, name: str) -> int:
    data = step_bytes(shape, name, os.path.dirname(os.path.abspath(path)))
    write_atomic(path, data)
    return len(data)


def read_step(path: str):
    """Re-import a STEP file (cadquery) and return its shape."""
    import cadquery as cq

    return cq.importers.importStep(path).val()


def write_part(part, path: str, made) -> int:
    """The part's solid (checked against its triangles' volume) as STEP."""
    return write_step(made.solid(), path, part.name)
