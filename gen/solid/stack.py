"""One closed shell for a stack of prisms (see :mod:`gen.geometry.stack`): no boolean union.

Faces: every layer's outer loop carried over its own height (twisted, chevron or straight),
each hole carried once from the bottom of the stack to its top, the two end caps, and at each
junction a planar ring bounded by the wider layer's outer edges and the narrower one's (run
backwards, as a hole). All edges are shared by construction, as in :mod:`gen.solid.faces`.
"""

from __future__ import annotations

from gen.geometry.stack import StackLayout, fixed_loop

from gen.solid.faces import Builder, Track, level_rows, planar_face, track_faces
from gen.solid.nurbs import loop_nurbs


def _rho(curves) -> float:
    import numpy as np

    return max(float(np.max(np.hypot(nb.poles[:, 0], nb.poles[:, 1]))) for nb in curves)


def stack_shell(layers, layout: StackLayout):
    """TopoDS_Solid of the stacked ``layers`` (Prisms, bottom to top) with ``layout.holes``."""
    bld = Builder()
    faces = []
    outer = []   # per layer: (track, rows by level)
    for p in layers:
        curves = loop_nurbs(p.section.outer, True)
        moving = not (p.straight or fixed_loop(p.section.outer))
        tr = Track(curves, p if moving else None, _rho(curves))
        levels = tr.levels(p.z0, p.z1)
        per = level_rows(bld, tr, levels)
        faces.extend(track_faces(bld, tr, levels, per))
        outer.append((tr, per))
    z0, z1 = layers[0].z0, layers[-1].z1
    holes = []
    for h in layout.holes:
        curves = loop_nurbs(h, False)
        tr = Track(curves, None, _rho(curves))
        per = level_rows(bld, tr, [z0, z1])
        faces.extend(track_faces(bld, tr, [z0, z1], per))
        holes.append((tr, per))
    first, last = outer[0], outer[-1]
    faces.append(planar_face(bld, z0, [(first[0], first[1][0], True)]
                             + [(tr, per[0], True) for tr, per in holes], up=False))
    faces.append(planar_face(bld, z1, [(last[0], last[1][len(last[1]) - 1], True)]
                             + [(tr, per[1], True) for tr, per in holes], up=True))
    for j, lower_wider in enumerate(layout.lower_wider):
        (ta, pa), (tb, pb) = outer[j], outer[j + 1]
        top_a, bottom_b = pa[len(pa) - 1], pb[0]
        z = layers[j].z1
        if lower_wider:
            loops = [(ta, top_a, True), (tb, bottom_b, False)]
        else:
            loops = [(tb, bottom_b, True), (ta, top_a, False)]
        faces.append(planar_face(bld, z, loops, up=lower_wider))
    return bld.solid(faces)
