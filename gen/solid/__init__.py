"""Solid builders: shape descriptions → B-rep solids (``TopoDS_Solid``). With
:mod:`gen.export.step`, the only place that imports the CAD kernel (OCP only — never
cadquery, whose import costs seconds and hundreds of MiB), always inside functions.

A part's ``shape`` names its builder (``shape.builder``); :data:`BUILDERS` maps the name to
the function that makes the solid.
"""

from __future__ import annotations

import importlib

#: builder name -> (module, function(shape) -> TopoDS_Solid)
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
    """Import the kernel modules a build uses now (before forking workers, so that they
    share them): the builders' classes and the STEP writer's and reader's modules."""
    from gen.solid.kernel import preload_kernel

    preload_kernel()
