"""Solid builders: shape descriptions → B-rep solids. The only package that imports the CAD
kernel (cadquery/OCP), always inside functions.

A part's ``shape`` names its builder (``shape.builder``); :data:`BUILDERS` maps the name to
the function that makes the solid.
"""

from __future__ import annotations

import importlib

#: builder name -> (module, function(shape) -> cadquery.Solid)
BUILDERS = {
    "prism": ("gen.solid.prism", "body_solid"),
    "apex_ruled": ("gen.solid.bevel", "apex_solid"),
    "revolved": ("gen.solid.revolved", "revolved_solid"),
}


def solid(shape):
    """A checked, valid solid of ``shape`` (imports the kernel)."""
    module, func = BUILDERS[shape.builder]
    return getattr(importlib.import_module(module), func)(shape)


def preload() -> None:
    """Import the kernel now (before forking workers, so that they share it)."""
    import cadquery  # noqa: F401
