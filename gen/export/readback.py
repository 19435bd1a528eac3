"""Re-read a written triangle file from its bytes on disk and check it is a closed solid.

The check reads the file with a second reader (trimesh's STL and 3MF loaders, called through
:func:`gen.export.stl.read_stl_objects` and :func:`gen.export.threemf.read_3mf_objects`, not
the code that wrote the bytes) and refuses it unless every object is a closed solid with no
degenerate facet and positive volume (:func:`gen.geometry.closed_surface.inspect`).

Used as the ``verify`` step of :func:`gen.export.atomic.write_atomic`, so a refused file never
replaces an earlier one.
"""

from __future__ import annotations

from gen.errors import ExportError
from gen.geometry.closed_surface import TriangleReport, inspect

__all__ = ["TriangleReport", "check_written", "inspect", "read_objects", "verifier"]


def read_objects(path: str, file_type: str):
    """[(name, vertices, faces)] of every object in an STL or 3MF file (second reader)."""
    if file_type == "stl":
        from gen.export.stl import read_stl_objects as reader
    elif file_type == "3mf":
        from gen.export.threemf import read_3mf_objects as reader
    else:
        raise ExportError(f"no reader for {file_type}")
    try:
        return reader(path)
    except Exception as exc:  # a reader failure is a refusal, with the reader's words
        raise ExportError(f"the written {file_type.upper()} cannot be read back: "
                          f"{type(exc).__name__}: {exc}") from None

def check_written(path: str, file_type: str, objects: int | None = None,
                  label: str = "") -> list[TriangleReport]:
    """Re-read ``path`` and raise :class:`ExportError` unless every object is a closed solid
    with no degenerate facet (and, when given, the file holds ``objects`` objects)."""
    found = read_objects(path, file_type)
    what = label or file_type.upper()
    if objects is not None and len(found) != objects:
        raise ExportError(f"{what} as written holds {len(found)} objects, expected {objects}")
    reports = [inspect(v, f, name) for name, v, f in found]
    bad = [r for r in reports if not r.ok]
    if bad:
        r = bad[0]
        raise ExportError(f"{what} as written is not a closed solid"
                          f"{' (object ' + r.name + ')' if r.name else ''}: {r.problem()}")
    return reports


def verifier(file_type: str, objects: int | None = None, label: str = ""):
    """A ``verify(path)`` callable for :func:`gen.export.atomic.write_atomic`."""
    return lambda path: check_written(path, file_type, objects, label)
