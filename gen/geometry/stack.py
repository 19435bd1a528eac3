"""When a body's prisms form a stack that can be built as one shell, without a boolean union.

A stack is prisms placed end to end along the axis (each one's top height is the next one's
bottom), every one carrying the same holes, with the holes straight (circles about the axis,
straight cuts the plan placed, or any hole where every prism is straight), and at each
junction one prism's outer loop lying strictly inside the other's. Then the union's boundary
is known in closed form: the lateral faces of every prism, one lateral face per hole from the
bottom to the top, the two end caps, and at each junction a planar ring between the wider
outer loop and the narrower one. Gears with a hub, flanged pulleys and flanged cable drums are
stacks; a herringbone's middle groove cut to the root circle is not (its core touches the
root arcs, so no ring lies between them) and goes to a boolean union.

numpy only; the B-rep is made in :mod:`gen.solid.stack`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields

import numpy as np

from gen.geometry.body import PLAN_TOL, Body, CutPlan, _ccw, _inside
from gen.geometry.section import Arc, Loop

#: least gap (mm) between the two outer loops at a junction for the ring face between them
STACK_GAP = 1e-3
#: two heights closer than this (mm) are the same junction
Z_SAME = 1e-9


@dataclass(frozen=True)
class StackLayout:
    """``holes``: the loops every layer carries; ``lower_wider[j]``: at junction j (between
    layer j and j + 1) the lower layer's outer loop is the wider one."""

    holes: tuple
    lower_wider: tuple


def loop_key(loop: Loop) -> tuple:
    """A value equal for two loops of the same curves (numbers rounded to 1e-9 mm)."""
    out = [loop.circle]
    for c in loop.curves:
        out.append(type(c).__name__)
        for f in fields(c):
            v = np.asarray(getattr(c, f.name), dtype=float).ravel()
            out.append(tuple(np.round(v, 9).tolist()))
    return tuple(out)


def fixed_loop(loop: Loop) -> bool:
    """A circle (or arcs of one circle) about the axis: the same at any twist."""
    cs = loop.curves
    return all(isinstance(c, Arc) and math.hypot(*c.center) < 1e-7
               and abs(c.radius - cs[0].radius) < 1e-7 for c in cs)


def stack_layout(body: Body, plan: CutPlan) -> StackLayout | None:
    """The stack layout of ``body`` (with the holes ``plan`` absorbed), or None when the body
    is not a stack (see the module docstring) and needs a boolean union."""
    layers = body.solids
    if len(layers) < 2 or any(p.shear != 0.0 for p in layers):
        return None
    for a, b in zip(layers, layers[1:]):
        if abs(a.z1 - b.z0) > Z_SAME:
            return None
    hole_sets = [tuple(p.section.holes) + tuple(extra) for p, extra in zip(layers, plan.holes)]
    keys = [sorted(loop_key(h) for h in hs) for hs in hole_sets]
    if any(k != keys[0] for k in keys[1:]):
        return None
    holes = hole_sets[0]
    # the shell carries every hole straight: a hole of a moving layer's own section turns
    # with it, so it must look the same at any turn; straight cuts placed by the plan (a D-bore
    # or keyway through a helical groove) are straight by definition
    if not all(fixed_loop(h) for p in layers if not p.straight for h in p.section.holes):
        return None
    wider = []
    for a, b in zip(layers, layers[1:]):
        pa = _ccw(a.place(a.section.outer.polygon(PLAN_TOL), a.z1))
        pb = _ccw(b.place(b.section.outer.polygon(PLAN_TOL), b.z0))
        if _inside(pb, pa, STACK_GAP):
            wider.append(True)
        elif _inside(pa, pb, STACK_GAP):
            wider.append(False)
        else:
            return None
    return StackLayout(holes, tuple(wider))
