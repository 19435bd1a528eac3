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
from gen.geometry.section import Line, Loop, Spline


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


def _space_half(sizes: RackSizes, rack: BasicRack) -> np.ndarray:
    """Right half of one tooth space (centre → tip corner) as points, centred at x = 0."""
    cb = math.cos(sizes.beta)
    space_n = (sizes.pitch - sizes.s) * cb  # space width on the pitch line, normal plane
    cut = Cutter(alpha_n=rack.alpha, half_width_n=space_n / 2.0, tip_depth=sizes.dedendum,
                 tip_radius=rack.root_radius * sizes.mn, shift=0.0, stretch=1.0 / cb,
                 top=sizes.addendum)
    s = np.concatenate([[0.0, 1.0], np.linspace(1.0, 2.0, 17)[1:], [3.0]])
    x, y = cut.points(s)
    return np.column_stack([x, y])


def rack_loop(sizes: RackSizes, rack: BasicRack) -> Loop:
    half = _space_half(sizes, rack)
    if half[-1, 0] * 2 >= sizes.pitch - 1e-9:
        raise GeometryError("rack teeth are pointed: no tip land left")
    left = half[::-1] * np.array([-1.0, 1.0])  # tip corner → centre, mirrored
    space = np.concatenate([left, half[1:]])    # left tip corner → right tip corner
    h, L = sizes.height, sizes.length
    y_root = space[len(half) - 1, 1]
    top = []  # left to right along the toothed side
    for k in range(sizes.teeth + 1):
        pts = space + np.array([sizes.offset + k * sizes.pitch, 0.0])
        pts = pts[(pts[:, 0] >= -1e-12) & (pts[:, 0] <= L + 1e-12)]
        top.append(pts)
    top = np.concatenate(top)
    if top[0, 0] > 1e-12:
        top = np.vstack([[0.0, y_root], top])
    if top[-1, 0] < L - 1e-12:
        top = np.vstack([top, [L, y_root]])
    top[0, 0], top[-1, 0] = 0.0, L
    # counter-clockwise: bottom edge, right end, toothed side right → left, left end
    pts = np.vstack([[[0.0, -h], [L, -h]], top[::-1]])
    curves = []
    for i in range(len(pts)):
        a, b = pts[i], pts[(i + 1) % len(pts)]
        if np.hypot(*(b - a)) > 1e-12:
            curves.append(Line(tuple(a), tuple(b)))
    return Loop(tuple(curves))
