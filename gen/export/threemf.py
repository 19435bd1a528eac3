"""3MF export (3D Manufacturing Format, core specification 1.x) with deterministic bytes.

A 3MF file is an OPC zip package holding three parts:

- ``[Content_Types].xml``: the content type of each file extension in the package,
- ``_rels/.rels``: the relationship that points at the model part,
- ``3D/3dmodel.model``: the model XML (``unit="millimeter"``): one ``<object>`` with a
  ``<mesh>`` (vertices, counter-clockwise triangles seen from outside) per named part, and
  one build ``<item>`` per object.

Written with the standard library only (zipfile, xml.sax.saxutils for escaping). The bytes
depend only on the meshes and names: zip entries are sorted by name, carry one fixed time
stamp and fixed permissions, and coordinates are printed with a fixed number of decimals.
"""

from __future__ import annotations

import io
import os
import zipfile
from xml.sax.saxutils import quoteattr

import numpy as np

from gen.errors import ExportError
from gen.export.atomic import write_atomic

#: 3MF core namespace (3MF Consortium, core specification, 2015/02 schema)
CORE_NS = "http://schemas.microsoft.com/3dmanufacturing/core/2015/02"
#: relationship type of the start part (the model)
MODEL_REL = "http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel"
MODEL_PATH = "3D/3dmodel.model"
#: decimals of the printed coordinates (mm): 1e-6 mm, far below any printer's resolution
DECIMALS = 6
#: the earliest date a zip entry can carry; used for every entry
ZIP_TIME = (1980, 1, 1, 0, 0, 0)

CONTENT_TYPES = (
    '<?xml version="1.0" encoding="UTF-8"?>\n'
    '<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">\n'
    ' <Default Extension="rels" '
    'ContentType="application/vnd.openxmlformats-package.relationships+xml"/>\n'
    ' <Default Extension="model" '
    'ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/>\n'
    '</Types>\n')

RELS = (
    '<?xml version="1.0" encoding="UTF-8"?>\n'
    '<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">\n'
    f' <Relationship Target="/{MODEL_PATH}" Id="rel0" Type="{MODEL_REL}"/>\n'
    '</Relationships>\n')


def _clean(values: np.ndarray) -> np.ndarray:
    """Round to DECIMALS and turn −0.0 into 0.0 so equal meshes print equal text."""
    return np.round(np.asarray(values, dtype=float), DECIMALS) + 0.0


def _mesh_xml(mesh) -> str:
    verts = _clean(mesh.vertices)
    faces = np.asarray(mesh.faces, dtype=np.int64)
    if len(verts) == 0 or len(faces) == 0:
        raise ExportError("cannot write an empty mesh to 3MF")
    if not np.all(np.isfinite(verts)):
        raise ExportError("mesh has non-finite vertex coordinates")
    f = f"%.{DECIMALS}f"
    vtext = "\n".join(f'<vertex x="{f % x}" y="{f % y}" z="{f % z}"/>' for x, y, z in verts)
    ttext = "\n".join(f'<triangle v1="{a}" v2="{b}" v3="{c}"/>' for a, b, c in faces.tolist())
    return f"<mesh>\n<vertices>\n{vtext}\n</vertices>\n<triangles>\n{ttext}\n</triangles>\n</mesh>"


def model_xml(items) -> str:
    """The ``3D/3dmodel.model`` text for ``items`` = [(name, trimesh), ...] (mm)."""
    if not items:
        raise ExportError("a 3MF file needs at least one mesh")
    names = [n for n, _ in items]
    if len(set(names)) != len(names):
        raise ExportError("3MF object names must be unique")
    objects, build = [], []
    for i, (name, mesh) in enumerate(items, start=1):
        objects.append(f'<object id="{i}" type="model" name={quoteattr(str(name))}>\n'
                       f"{_mesh_xml(mesh)}\n</object>")
        build.append(f'<item objectid="{i}"/>')
    return ('<?xml version="1.0" encoding="UTF-8"?>\n'
            f'<model unit="millimeter" xml:lang="en-US" xmlns="{CORE_NS}">\n'
            '<metadata name="Application">pitchline</metadata>\n'
            "<resources>\n" + "\n".join(objects) + "\n</resources>\n"
            "<build>\n" + "\n".join(build) + "\n</build>\n</model>\n")


def threemf_bytes(items) -> bytes:
    """The whole 3MF package as bytes (deflate-compressed, entries sorted by name)."""
    entries = {"[Content_Types].xml": CONTENT_TYPES, "_rels/.rels": RELS,
               MODEL_PATH: model_xml(items)}
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w") as zf:
        for name in sorted(entries):
            info = zipfile.ZipInfo(name, date_time=ZIP_TIME)
            info.compress_type = zipfile.ZIP_DEFLATED
            info.create_system = 3            # unix, so the attributes below mean the same
            info.external_attr = 0o644 << 16  # rw-r--r--
            zf.writestr(info, entries[name].encode("utf-8"), compresslevel=6)
    return buf.getvalue()


def write_3mf(items, path: str) -> int:
    """Write ``items`` = [(name, trimesh mesh in mm), ...] as one 3MF file; returns its size.

    Each mesh becomes one object and one build item, placed where its coordinates put it
    (arrange parts on a plate first with :func:`gen.triangles.plate.arrange`). The bytes are
    re-read and every object checked (closed, no degenerate facet, positive volume:
    :mod:`gen.export.readback`) before they replace ``path``.
    """
    from gen.export.readback import verifier

    items = list(items)
    data = threemf_bytes(items)
    write_atomic(path, data, verifier("3mf", len(items), os.path.basename(path)))
    return len(data)


def write_part(part, path: str, made) -> int:
    """The part's checked triangles as a one-object 3MF."""
    return write_3mf([(part.name, made.triangles)], path)


def read_3mf(path: str):
    """Re-read a one-object 3MF from disk as one triangle mesh (trimesh, a second reader)."""
    import trimesh

    return trimesh.load(path, force="mesh")


def read_3mf_objects(path: str):
    """[(name, vertices, faces)] of every object of a 3MF file read by trimesh, by name."""
    import trimesh

    with open(path, "rb") as fh:
        loaded = trimesh.load(fh, file_type="3mf", process=False)
    items = sorted(loaded.geometry.items()) if isinstance(loaded, trimesh.Scene) \
        else [("", loaded)]
    return [(name, np.asarray(m.vertices), np.asarray(m.faces)) for name, m in items]
