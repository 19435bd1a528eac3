"""Where to cut the caps of a long straight prism (a rack) into pieces, so that no planar face
carries hundreds of edges.

The CAD kernel's validity check of one planar face grows with the square of its edge count
(its wire self-intersection test; measured on a 1,600 mm m 2 rack: 0.037 → 0.115 → 0.378 s for
the cap at 400, 800, 1,600 mm), and so does the STEP transfer. A cap cut by straight segments
into pieces of a bounded edge count costs linear time; the solid is the same (coplanar pieces
sharing their cut edges).

A loop can be cut when it has a straight back: one horizontal :class:`Line` at the loop's
lowest y spanning at least half its width. Each cut runs straight down from a junction of the
loop's curves to the back, through material only (checked on the loop's polygon and clear of
the holes' x-ranges). numpy only; the faces are made in :mod:`gen.solid.prism`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from gen.geometry.body import _points_inside
from gen.geometry.section import Line, Loop

#: a loop with more curves than this gets its caps cut
SPLIT_ABOVE = 240
#: about this many curves per cap piece
PIECE_CURVES = 120
#: least clearance (mm) of a cut from a hole's x-range
CUT_GAP = 0.05


@dataclass(frozen=True)
class CapCuts:
    """``curves``: the loop's curves, ccw, with the back split at the cuts; ``back``: the
    indices (in ``curves``) of the back segments, left to right; ``cuts``: per cut, the
    index of the curve that starts at the cut's upper end and the index of the back segment
    that ends at its lower end."""

    curves: tuple
    back: tuple
    cuts: tuple


def cap_cuts(curves, holes=(), tol: float = 1e-3) -> CapCuts | None:
    """Cuts for the loop ``curves`` (ccw, exact curves), or None when it needs none or has no
    straight back (see the module docstring)."""
    curves = list(curves)
    if len(curves) <= SPLIT_ABOVE:
        return None
    poly = Loop(tuple(curves)).polygon(tol)
    x0, x1 = float(poly[:, 0].min()), float(poly[:, 0].max())
    y_lo = float(poly[:, 1].min())
    back = None
    for i, c in enumerate(curves):
        if isinstance(c, Line) and abs(c.p0[1] - c.p1[1]) < 1e-9 and abs(c.p0[1] - y_lo) < 1e-9 \
                and c.p1[0] - c.p0[0] >= 0.5 * (x1 - x0):
            back = i
            break
    if back is None:
        return None
    bl = curves[back]
    xa, xb, yb = float(bl.p0[0]), float(bl.p1[0]), float(bl.p0[1])
    spans = [(float(h.polygon(tol)[:, 0].min()) - CUT_GAP, float(h.polygon(tol)[:, 0].max())
              + CUT_GAP) for h in holes]
    # the loop runs ccw: along the back left to right, then the rest back to the back's start;
    # junctions after the back are candidate upper ends, met from right to left
    order = [(back + k) % len(curves) for k in range(1, len(curves))]
    picks, last_x, count = [], xb, 0
    for i in order:
        count += 1
        x, y = (float(v) for v in curves[i].start)
        if count < PIECE_CURVES or not (xa + 1.0 < x < last_x - 1.0) or y <= yb + 1e-6:
            continue
        if any(a < x < b for a, b in spans):
            continue
        probe = np.column_stack([np.full(32, x), np.linspace(yb, y, 34)[1:-1]])
        if not np.all(_points_inside(poly, probe)):
            continue
        picks.append((i, x))
        last_x, count = x, 0
    if not picks:
        return None
    xs = sorted(x for _, x in picks)             # left to right
    segs = [Line((a, yb), (b, yb)) for a, b in zip([xa] + xs, xs + [xb])]
    out = curves[:back] + segs + curves[back + 1:]
    shift = len(segs) - 1                        # indices after the back move by this
    back_idx = tuple(range(back, back + len(segs)))
    by_x = {x: k for k, x in enumerate(xs)}
    cuts = []
    for i, x in picks:
        top = i + shift if i > back else i
        cuts.append((top, back_idx[by_x[x]]))    # the segment ending at x
    return CapCuts(tuple(out), back_idx, tuple(sorted(cuts, key=lambda c: c[1])))
