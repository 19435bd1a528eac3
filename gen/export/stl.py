"""Binary STL export from a trimesh mesh (deterministic bytes)."""

from __future__ import annotations

import os

from gen.export.atomic import write_atomic


def stl_bytes(mesh) -> bytes:
    from trimesh.exchange.stl import export_stl

    return export_stl(mesh)


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
