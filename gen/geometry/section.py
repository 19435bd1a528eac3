"""Planar sections made of exact curves, and their polygons.

A :class:`Loop` is a closed chain of curves, each ending exactly where the next begins.
Curves are kept exact so the solid layer can build B-spline and circular edges, while the
mesh layer asks for a polygon at a chordal tolerance.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np


@dataclass(frozen=True, eq=False)
class Exact:
    """The exact curve a :class:`Spline`'s points were sampled from, for the solid layer's fit.

    ``source(t)`` gives points (n, 2) of the curve in its own frame for parameters t in
    [0, 1] (a picklable callable, equal for equal curves); the curve is then turned by
    ``angle`` (rad) about the origin and moved by ``shift``; ``flip``: the spline runs from
    t = 1 to t = 0.
    """

    source: object
    angle: float = 0.0
    shift: tuple = (0.0, 0.0)
    flip: bool = False

    def at(self, t) -> np.ndarray:
        t = np.asarray(t, dtype=float)
        p = np.asarray(self.source(1.0 - t if self.flip else t), dtype=float)
        c, s = math.cos(self.angle), math.sin(self.angle)
        return np.column_stack([c * p[:, 0] - s * p[:, 1] + self.shift[0],
                                s * p[:, 0] + c * p[:, 1] + self.shift[1]])

    def moved(self, angle: float, dx: float) -> "Exact":
        """This curve turned by ``angle`` about the origin, then moved ``dx`` along +X."""
        c, s = math.cos(angle), math.sin(angle)
        x, y = self.shift
        return Exact(self.source, self.angle + angle, (c * x - s * y + dx, s * x + c * y),
                     self.flip)

    def reversed(self) -> "Exact":
        return Exact(self.source, self.angle, self.shift, not self.flip)


@dataclass(frozen=True, eq=False)
class Spline:
    """Interpolating curve through ``points`` (n, 2); a polyline in the mesh layer.
    ``exact``: the curve the points were sampled from, when known (:class:`Exact`)."""

    points: np.ndarray
    exact: Exact | None = None

    @property
    def start(self):
        return self.points[0]

    @property
    def end(self):
        return self.points[-1]

    def polyline(self, tol: float) -> np.ndarray:
        return self.points


@dataclass(frozen=True, eq=False)
class Arc:
    """Circular arc about ``center`` of ``radius`` from angle ``a0`` to ``a1`` (rad, ccw if a1 > a0)."""

    center: tuple
    radius: float
    a0: float
    a1: float

    def at(self, a):
        a = np.atleast_1d(a)
        return np.column_stack([self.center[0] + self.radius * np.cos(a),
                                self.center[1] + self.radius * np.sin(a)])

    @property
    def start(self):
        return self.at(self.a0)[0]

    @property
    def end(self):
        return self.at(self.a1)[0]

    @property
    def mid(self):
        return self.at(0.5 * (self.a0 + self.a1))[0]

    def polyline(self, tol: float) -> np.ndarray:
        span = abs(self.a1 - self.a0)
        # chord sagitta r (1 − cos(δ/2)) ≤ tol
        step = 2.0 * math.acos(max(-1.0, 1.0 - tol / self.radius)) if tol < self.radius else span
        n = max(1, int(math.ceil(span / max(step, 1e-9))))
        return self.at(np.linspace(self.a0, self.a1, n + 1))


@dataclass(frozen=True, eq=False)
class Line:
    p0: tuple
    p1: tuple

    @property
    def start(self):
        return np.asarray(self.p0, dtype=float)

    @property
    def end(self):
        return np.asarray(self.p1, dtype=float)

    def polyline(self, tol: float) -> np.ndarray:
        return np.array([self.p0, self.p1], dtype=float)


@dataclass(frozen=True, eq=False)
class Loop:
    """Closed chain of curves; ``circle`` marks a full circle (one Arc of 2π)."""

    curves: tuple
    circle: bool = False

    def polygon(self, tol: float) -> np.ndarray:
        """Vertices of the closed polygon (last vertex not repeated)."""
        parts = [c.polyline(tol)[:-1] for c in self.curves]
        return np.concatenate(parts, axis=0)

    def gaps(self) -> float:
        """Largest distance between one curve's end and the next curve's start."""
        worst = 0.0
        n = len(self.curves)
        for i in range(n):
            a = self.curves[i].end
            b = self.curves[(i + 1) % n].start
            worst = max(worst, float(np.hypot(*(np.asarray(a) - np.asarray(b)))))
        return worst


def circle(radius: float, center=(0.0, 0.0)) -> Loop:
    return Loop((Arc(tuple(center), radius, 0.0, 2.0 * math.pi),), circle=True)


@dataclass(frozen=True, eq=False)
class Section:
    """A planar region: one outer loop (ccw) and holes (any orientation)."""

    outer: Loop
    holes: tuple = field(default_factory=tuple)

    def polygons(self, tol: float):
        """(outer (n, 2) ccw, [hole (k, 2) cw, ...]) for triangulators and booleans."""
        outer = self.outer.polygon(tol)
        if signed_area(outer) < 0:
            outer = outer[::-1]
        holes = []
        for h in self.holes:
            p = h.polygon(tol)
            holes.append(p[::-1] if signed_area(p) > 0 else p)
        return outer, holes


def signed_area(poly: np.ndarray) -> float:
    x, y = poly[:, 0], poly[:, 1]
    return 0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))


def area_centroid(poly) -> tuple[float, np.ndarray | None]:
    """Signed area (mm²) and area centroid (mm) of a closed polygon (n, ≥2) by the shoelace
    formula; centroid None for a zero area."""
    p = np.asarray(poly, dtype=float)[:, :2]
    q = np.roll(p, -1, axis=0)
    cr = p[:, 0] * q[:, 1] - q[:, 0] * p[:, 1]
    area = 0.5 * float(np.sum(cr))
    if area == 0.0:
        return 0.0, None
    return area, np.array([np.sum((p[:, 0] + q[:, 0]) * cr),
                           np.sum((p[:, 1] + q[:, 1]) * cr)]) / (6.0 * area)


def rotate(points: np.ndarray, angle: float) -> np.ndarray:
    c, s = math.cos(angle), math.sin(angle)
    return points @ np.array([[c, s], [-s, c]])


def _move_curve(c, angle: float, dx: float):
    co, si = math.cos(angle), math.sin(angle)

    def pt(p):
        x, y = float(p[0]), float(p[1])
        return (co * x - si * y + dx, si * x + co * y)

    if isinstance(c, Spline):
        p = c.points
        return Spline(np.column_stack([co * p[:, 0] - si * p[:, 1] + dx, si * p[:, 0] + co * p[:, 1]]),
                      None if c.exact is None else c.exact.moved(angle, dx))
    if isinstance(c, Arc):
        return Arc(pt(c.center), c.radius, c.a0 + angle, c.a1 + angle)
    return Line(pt(c.p0), pt(c.p1))


def moved(section: Section, angle: float = 0.0, dx: float = 0.0) -> Section:
    """The section turned by ``angle`` (rad, about the origin) and then moved ``dx`` along +X."""
    def loop(lp):
        return Loop(tuple(_move_curve(c, angle, dx) for c in lp.curves), circle=lp.circle)
    return Section(loop(section.outer), tuple(loop(h) for h in section.holes))
