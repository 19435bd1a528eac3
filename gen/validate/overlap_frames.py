"""Overlap of two posed outlines at a few animation frames, for drawing (shapely).

The sweep (:mod:`gen.validate.sweep`) measures the largest overlap over one pitch; a drawing
also needs the overlapping *regions*, frame by frame, to paint them. Each frame gives the
area (mm²) and the exterior rings (mm, world frame) of the common region.
"""

from __future__ import annotations

import numpy as np
import shapely


def _shape(poly):
    return shapely.make_valid(shapely.Polygon(np.asarray(poly, float)))


def overlap_regions(first, second, *, second_is_hole: bool = False, outer_radius=None,
                    center=(0.0, 0.0)):
    """(area mm², [ring (k, 2), ...]) where the two outlines share material.

    ``second_is_hole``: ``second`` is the toothed hole of a ring gear (material outside it,
    out to ``outer_radius`` about ``center``), so the overlap is ``first`` minus the hole,
    inside the rim.
    """
    a = _shape(first)
    if second_is_hole:
        common = shapely.difference(a, _shape(second))
        if outer_radius is not None:
            common = shapely.intersection(common, shapely.Point(center).buffer(outer_radius, 64))
    else:
        common = shapely.intersection(a, _shape(second))
    rings = []
    for g in shapely.get_parts(common):
        if g.geom_type == "Polygon" and not g.is_empty and g.area > 0:
            rings.append(np.asarray(g.exterior.coords)[:-1])
    return float(common.area), rings
