"""Measurements on a closed outline polygon (from a profile, or from a slice of a mesh).

A polygon is an (n, 2) array, counter-clockwise, centred on the gear axis.
"""

from __future__ import annotations

import math

import numpy as np


def radii(poly: np.ndarray) -> np.ndarray:
    return np.hypot(poly[:, 0], poly[:, 1])


def circle_crossings(poly: np.ndarray, R: float):
    """Crossings of the closed polygon with the circle of radius R.

    Returns (angles, outward) where ``outward`` is True where the outline, walked in its
    order, passes from inside to outside the circle (a vertex on the circle is outside). Each crossing is solved exactly on its
    straight edge (quadratic in the edge parameter).
    """
    a = poly
    b = np.roll(poly, -1, axis=0)
    ra, rb = radii(a), radii(b)
    # half-open sides: a vertex exactly on the circle counts as outside, so that an outline
    # whose vertices lie on R (a thread's flank ends on d2) is crossed there once, not skipped
    sel = (ra < R) != (rb < R)
    a, b = a[sel], b[sel]
    d = b - a
    # |a + t d|² = R²
    A = np.einsum("ij,ij->i", d, d)
    B = 2.0 * np.einsum("ij,ij->i", a, d)
    C = np.einsum("ij,ij->i", a, a) - R * R
    disc = np.sqrt(np.maximum(B * B - 4 * A * C, 0.0))
    t1 = (-B + disc) / (2 * A)
    t2 = (-B - disc) / (2 * A)
    # the root on the edge; where the crossing is an end vertex rounding may put it a hair
    # outside [0, 1], so take the root nearer the edge and clip it
    off1 = np.maximum(-t1, 0.0) + np.maximum(t1 - 1.0, 0.0)
    off2 = np.maximum(-t2, 0.0) + np.maximum(t2 - 1.0, 0.0)
    t = np.clip(np.where(off1 <= off2, t1, t2), 0.0, 1.0)
    p = a + t[:, None] * d
    ang = np.arctan2(p[:, 1], p[:, 0])
    outward = ra[sel] < R
    return ang, outward


def ccw(poly: np.ndarray) -> np.ndarray:
    """The polygon in counter-clockwise order."""
    x, y = poly[:, 0], poly[:, 1]
    area = np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1))
    return poly if area >= 0 else poly[::-1]


def material_arcs(poly: np.ndarray, R: float):
    """Angular intervals (start, width) of material on the circle R around the outline."""
    ang, outward = circle_crossings(ccw(poly), R)
    if len(ang) == 0:
        return np.zeros((0, 2))
    order = np.argsort(ang)
    ang, outward = ang[order], outward[order]
    # material starts where the outline leaves the circle going out (the −ψ flank of a tooth)
    starts = np.nonzero(outward)[0]
    out = []
    n = len(ang)
    for i in starts:
        j = (i + 1) % n
        if outward[j]:
            continue
        w = (ang[j] - ang[i]) % (2 * math.pi)
        out.append((ang[i], w))
    return np.array(out)


def tooth_count(poly: np.ndarray, r_mid: float | None = None) -> int:
    """Number of teeth: material intervals on a circle midway between min and max radius."""
    r = radii(poly)
    if r_mid is None:
        r_mid = 0.5 * (r.min() + r.max())
    return len(material_arcs(poly, r_mid))


def arc_thickness(poly: np.ndarray, R: float) -> np.ndarray:
    """Arc tooth thickness (mm, on the circle R) of every tooth."""
    arcs = material_arcs(poly, R)
    return arcs[:, 1] * R if len(arcs) else np.zeros(0)


def chordal_thickness(poly: np.ndarray, R: float) -> np.ndarray:
    arcs = material_arcs(poly, R)
    return 2.0 * R * np.sin(arcs[:, 1] / 2.0) if len(arcs) else np.zeros(0)


def angular_pitch(poly: np.ndarray, R: float) -> np.ndarray:
    """Angles between successive tooth centre lines on the circle R (rad)."""
    arcs = material_arcs(poly, R)
    if len(arcs) < 2:
        return np.zeros(0)
    centres = np.sort((arcs[:, 0] + arcs[:, 1] / 2.0) % (2 * math.pi))
    return np.diff(np.concatenate([centres, [centres[0] + 2 * math.pi]]))


def line_crossings_x(poly: np.ndarray, y: float) -> np.ndarray:
    """x of the crossings of the polygon with the horizontal line y (sorted)."""
    a = poly
    b = np.roll(poly, -1, axis=0)
    sel = (a[:, 1] < y) != (b[:, 1] < y)     # half-open, as in circle_crossings
    a, b = a[sel], b[sel]
    t = (y - a[:, 1]) / (b[:, 1] - a[:, 1])
    return np.sort(a[:, 0] + t * (b[:, 0] - a[:, 0]))


def rack_teeth_on_line(poly: np.ndarray, y: float, y_back: float):
    """Tooth intervals (x0, x1) of a rack outline on the line y (excluding the back)."""
    xs = line_crossings_x(poly, y)
    return np.column_stack([xs[0::2], xs[1::2]]) if len(xs) >= 2 else np.zeros((0, 2))
