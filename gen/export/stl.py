"""Binary STL export from a trimesh mesh (deterministic bytes)."""

from __future__ import annotations

import os

from gen.export.atomic import write_atomic


#: one binary STL facet record: normal, three corners (float32), attribute bytes
_FACET = [("n", "<f4", 3), ("v", "<f4", (3, 3)), ("a", "<u2")]


def stl_bytes(mesh) -> bytes:
    """Binary STL of ``mesh`` (trimesh's writer), with each facet's normal recomputed from its
    corners as stored in float32: a reader that checks normals against the corners (admesh)
    then finds nothing to fix, even on a sliver facet whose float64 normal the rounding of
    its corners has turned by a few tenths of a degree."""
    import numpy as np
    from trimesh.exchange.stl import export_stl

    data = export_stl(mesh)
    n = int(np.frombuffer(data, "<u4", 1, 80)[0])
    rec = np.frombuffer(data, np.dtype(_FACET), n, 84).copy()
    v = rec["v"].astype(np.float64)
    c = np.cross(v[:, 1] - v[:, 0], v[:, 2] - v[:, 0])
    length = np.linalg.norm(c, axis=1)
    rec["n"] = (c / np.where(length > 0.0, length, 1.0)[:, None]).astype(np.float32)
    return data[:84] + rec.tobytes() + data[84 + 50 * n:]


def write_stl(mesh, path: str) -> int:
    """Write ``mesh`` as binary STL; the bytes are re-read and checked (closed, no degenerate
    facet, positive volume: :mod:`gen.export.readback`) before they replace ``path``."""
    from gen.export.readback import verifier

    data = stl_bytes(mesh)
    write_atomic(path, data, verifier("stl", 1, os.path.basename(path)))
    return len(data)


def write_part(part, path: str, made) -> int:
    """The part's checked triangles as binary STL."""
    return write_stl(made.triangles, path)


def read_stl_objects(path: str):
    """[("", vertices, faces)] of an STL file read by trimesh (no processing: corners as
    stored, three per facet)."""
    import numpy as np
    import trimesh

    with open(path, "rb") as fh:
        mesh = trimesh.load(fh, file_type="stl", process=False)
    return [("", np.asarray(mesh.vertices), np.asarray(mesh.faces))]
