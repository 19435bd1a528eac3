"""Triangle builders (manifold3d / trimesh): shape descriptions → watertight triangle meshes.

A part's ``shape`` names its builder (``shape.builder``); :data:`BUILDERS` maps that name to
the function that triangulates it. A kind that needs a new way of building adds one module here
and one line to the table (and the same in :mod:`gen.solid`).
"""

from __future__ import annotations

import importlib

#: builder name -> (module, function(shape, chord_tolerance) -> trimesh.Trimesh)
BUILDERS = {
    "prism": ("gen.triangles.prism", "body_triangles"),
    "apex_ruled": ("gen.triangles.apex", "apex_triangles"),
    "revolved": ("gen.triangles.revolved", "revolved_triangles"),
}


def triangles(shape, tol: float):
    """Triangles of ``shape`` within the chord tolerance ``tol`` (mm)."""
    module, func = BUILDERS[shape.builder]
    return getattr(importlib.import_module(module), func)(shape, tol)
