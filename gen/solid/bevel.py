"""Solid of one straight bevel gear, built face by face (no boolean).

The faces, all in closed form, are made by :func:`gen.solid.apex_faces.apex_shell`: flank
pieces ruled through the cone apex between the large-end outline on the back cone and its
copy scaled by Ri/Re on the front cone, tip and root cones through the apex, back and front
cone sectors, back and front planes, an optional cylindrical shoulder and the bore. The same
solid was earlier made as the boolean common of a ruled tooth loft and the revolved blank
(4–8 s per gear; the direct shell takes a small fraction of that: ``benchmarks/bench_bevel.py``).
"""

from __future__ import annotations

from gen.geometry.bevel import BevelSizes, virtual_flank

from gen.solid.apex_faces import apex_shell
from gen.solid.kernel import as_solid, check_solid


def build_bevel_solid(sizes: BevelSizes, bore_diameter: float, *, flank=None, check: bool = True):
    """One valid straight bevel gear solid (``TopoDS_Solid``), bore Ø ``bore_diameter`` mm.

    Raises GeometryError when the shell is not exactly one valid solid.
    """
    if flank is None:
        flank = virtual_flank(sizes)
    shape = apex_shell(sizes, bore_diameter / 2.0, flank)
    if check:
        check_solid(shape, "bevel gear solid")
    return as_solid(shape)


def apex_solid(shape):
    """Solid of a :class:`gen.geometry.body.ApexBody` (the builder table's entry)."""
    return build_bevel_solid(shape.sizes, shape.bore, flank=shape.flank)
