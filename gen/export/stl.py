"""Binary STL export from a trimesh mesh (deterministic bytes)."""

from __future__ import annotations

from gen.export.atomic import write_atomic


def stl_bytes(mesh) -> bytes:
    from trimesh.exchange.stl import export_stl

    return export_stl(mesh)


def write_stl(mesh, path: str) -> int:
    data = stl_bytes(mesh)
    write_atomic(path, data)
    return len(data)


def write_part(part, path: str, made) -> int:
    """The part's checked triangles as binary STL."""
    return write_stl(made.triangles, path)
