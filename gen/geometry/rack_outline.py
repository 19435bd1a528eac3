"""Outline of a straight rack with the basic-rack tooth form, in its transverse section.

Rack along +X from x = 0 to x = length, tips toward +Y, pitch line on y = 0, back on
y = −height. The tooth space is the generating-rack tooth of :mod:`gen.geometry.generate`
with no shift (same flank, root radius and depth), so racks and gears share one tooth form.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.basic_rack import BasicRack
from gen.geometry.generate import Cutter
from gen.geometry.section import Arc, Line, Loop, Spline


@dataclass(frozen=True)
class RackSizes:
    mn: float
    alpha_n: float
    beta: float
    pitch: float          # transverse pitch π m_n / cos β
    s: float              # transverse tooth thickness on the pitch line
    addendum: float       # mm above the pitch line
    dedendum: float       # mm below the pitch line
    height: float         # pitch line to back, mm
    length: float
    teeth: int
    offset: float         # x of the first tooth-space centre


def rack_sizes(mn: float, rack: BasicRack, *, height: float, length: float | None = None,
               teeth: int | None = None, beta: float = 0.0, thinning: float = 0.0) -> RackSizes:
    p = math.pi * mn / math.cos(beta)
    if teeth is not None:
        n = int(teeth)
        length = n * p
        offset = 0.0
    else:
        n = int(math.floor(length / p + 1e-9))
        offset = (length - n * p) / 2.0
    if n < 1:
        raise GeometryError("rack shorter than one pitch")
    hf = rack.dedendum * mn
    if height <= hf:
        raise GeometryError(f"rack height {height} mm leaves no back below the tooth root "
                            f"(dedendum {hf:.3f} mm)")
    return RackSizes(mn=mn, alpha_n=rack.alpha, beta=beta, pitch=p, s=p / 2.0 - thinning,
                     addendum=rack.addendum * mn, dedendum=hf, height=height, length=length,
                     teeth=n, offset=offset)


def _space_cutter(sizes: RackSizes, rack: BasicRack) -> Cutter:
    cb = math.cos(sizes.beta)
    space_n = (sizes.pitch - sizes.s) * cb  # space width on the pitch line, normal plane
    return Cutter(alpha_n=rack.alpha, half_width_n=space_n / 2.0, tip_depth=sizes.dedendum,
                  tip_radius=rack.root_radius * sizes.mn, shift=0.0, stretch=1.0 / cb,
                  top=sizes.addendum)


def _reverse(c):
    if isinstance(c, Line):
        return Line(c.p1, c.p0)
    if isinstance(c, Arc):
        return Arc(c.center, c.radius, c.a1, c.a0)
    return Spline(c.points[::-1].copy())


def _mirror(c):
    """Mirror a curve about x = 0 (and reverse it, so chains stay in order)."""
    if isinstance(c, Line):
        return Line((-c.p1[0], c.p1[1]), (-c.p0[0], c.p0[1]))
    if isinstance(c, Arc):
        return Arc((-c.center[0], c.center[1]), c.radius, math.pi - c.a1, math.pi - c.a0)
    return Spline((c.points * np.array([-1.0, 1.0]))[::-1].copy())


def _shift(c, dx):
    if isinstance(c, Line):
        return Line((c.p0[0] + dx, c.p0[1]), (c.p1[0] + dx, c.p1[1]))
    if isinstance(c, Arc):
        return Arc((c.center[0] + dx, c.center[1]), c.radius, c.a0, c.a1)
    return Spline(c.points + np.array([dx, 0.0]))


def _half_space(cut: Cutter):
    """Right half of a tooth space centred on x = 0: root flat, fillet, flank (centre → tip)."""
    x, y = cut.points(np.array([0.0, 1.0, 2.0, 3.0]))
    curves = []
    if x[1] > 1e-12:
        curves.append(Line((0.0, y[0]), (x[1], y[1])))
    if cut.stretch == 1.0:
        xc, yc = cut.fillet_center_n
        curves.append(Arc((xc, yc), cut.tip_radius, -math.pi / 2, -cut.alpha_n))
    else:  # transverse section of a helical rack: the round becomes an ellipse
        xs, ys = cut.points(np.linspace(1.0, 2.0, 17))
        curves.append(Spline(np.column_stack([xs, ys])))
    curves.append(Line((x[2], y[2]), (x[3], y[3])))
    return curves


def rack_loop(sizes: RackSizes, rack: BasicRack) -> Loop:
    cut = _space_cutter(sizes, rack)
    right = _half_space(cut)
    tip_x = right[-1].p1[0]
    if tip_x * 2 >= sizes.pitch - 1e-9:
        raise GeometryError("rack teeth are pointed: no tip land left")
    left = [_mirror(c) for c in reversed(right)]
    h, L, p = sizes.height, sizes.length, sizes.pitch
    y_root = right[0].p0[1] if isinstance(right[0], Line) else -sizes.dedendum
    top = []  # toothed side, left to right
    if sizes.offset > 1e-12:
        top.append(Line((0.0, y_root), (sizes.offset, y_root)))
    for k in range(sizes.teeth + 1):
        cx = sizes.offset + k * p
        if k > 0:
            top += [_shift(c, cx) for c in left]
        if k < sizes.teeth:
            top += [_shift(c, cx) for c in right]
            top.append(Line((cx + tip_x, sizes.addendum), (cx + p - tip_x, sizes.addendum)))
    if L - (sizes.offset + sizes.teeth * p) > 1e-12:
        top.append(Line((sizes.offset + sizes.teeth * p, y_root), (L, y_root)))
    # with ``teeth`` the ends cut through root flats at x = 0 and x = L; drop zero-length bits
    start, end = top[0].start, top[-1].end
    curves = [Line((0.0, -h), (L, -h)), Line((L, -h), tuple(end))]
    curves += [_reverse(c) for c in reversed(top)]
    curves.append(Line(tuple(start), (0.0, -h)))
    return Loop(tuple(c for c in curves if not (isinstance(c, Line) and
                                                 math.dist(c.p0, c.p1) < 1e-12)))


def whole_pitch_length(length: float, pitch: float) -> float:
    """``length`` rounded to the nearest whole number (at least one) of pitches (mm)."""
    return max(1, int(round(length / pitch))) * pitch


def joint_pitch_error(length: float, pitch: float) -> float:
    """Pitch error at the joint of two equal rack sections butted end to end (mm).

    The second section's tooth spaces sit ``length`` further on; the pitch continues across
    the joint when ``length`` is a whole number of pitches. The error is ``length − N·p`` with
    N the nearest whole number: how far the second section's teeth are from where the first
    section's pitch puts them (positive: too far)."""
    return length - round(length / pitch) * pitch


def extended_loop(sizes: RackSizes, rack: BasicRack, extra: float) -> tuple[Loop, float]:
    """A rack loop reaching at least ``extra`` mm past both ends, teeth in the same phase.

    Returns (loop, e): the loop runs from x = −e to x = length + e, e a whole number of pitches
    ≥ ``extra``; trimming it at x = 0 and x = length gives back the rack. Used for slanted
    (helical, herringbone) racks, whose sheared sections are cut flat at the ends."""
    from dataclasses import replace

    n = max(1, int(math.ceil(extra / sizes.pitch - 1e-12)))
    e = n * sizes.pitch
    longer = replace(sizes, length=sizes.length + 2 * e, teeth=sizes.teeth + 2 * n)
    loop = rack_loop(longer, rack)
    return Loop(tuple(_shift(c, -e) for c in loop.curves)), e
