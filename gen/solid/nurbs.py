"""Section curves as NURBS data: fitted B-spline flanks, rational arcs, lines, oriented loops."""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from gen.errors import GeometryError
from gen.geometry.bspline_fit import fit_curve
from gen.geometry.section import Arc, Exact, Line, Loop, Spline, signed_area

from gen.solid.kernel import JUNCTION_GAP, SPLINE_FIT, occ

#: largest distance (mm) of a section B-spline from the dense samples of the exact curve it
#: is fitted to: under SPLINE_FIT, so that between two checked samples (EXACT_SAMPLES per
#: curve, spans of the fit several samples long) the curve stays within SPLINE_FIT
EXACT_FIT = 0.8 * SPLINE_FIT
#: samples of an exact section curve checked by its fit
EXACT_SAMPLES = 200

@dataclass(eq=False)
class Nurbs:
    """A planar NURBS curve in OCC's form: degree, poles (n, 2), weights or None, knots, mults."""

    deg: int
    poles: np.ndarray
    weights: np.ndarray | None
    knots: np.ndarray
    mults: list
    #: the exact arc (center x, center y, radius, a0, a1) when the curve is one: faces
    #: builders then use a circle and a cylinder instead of the rational form
    arc: tuple | None = None


def spline_nurbs(points: np.ndarray) -> Nurbs:
    """Cubic C2 B-spline within :data:`SPLINE_FIT` of the section samples (end points kept).

    ``GeomAPI_PointsToBSpline`` needs 2.6× fewer poles than interpolating every sample
    (``GeomAPI_Interpolate``: 26 and 42 poles for the 24- and 40-sample flank pieces of
    the bench gear, against 16 and 10), and so fewer STEP entities, for a curve within
    1e-6 mm of the interpolant (measured).
    """
    o = occ()
    p = np.asarray(points, dtype=float)
    pts = o.TColgp_Array1OfPnt(1, len(p))
    for i, (x, y) in enumerate(p, 1):
        pts.SetValue(i, o.gp_Pnt(float(x), float(y), 0.0))
    fit = o.GeomAPI_PointsToBSpline(pts, 3, 3, o.GeomAbs_C2, SPLINE_FIT)
    if not fit.IsDone():
        raise GeometryError("could not fit a B-spline through the section points")
    c = fit.Curve()
    poles = np.array([[c.Pole(i).X(), c.Pole(i).Y()] for i in range(1, c.NbPoles() + 1)])
    if max(np.hypot(*(poles[0] - p[0])), np.hypot(*(poles[-1] - p[-1]))) > SPLINE_FIT:
        raise GeometryError("the section spline fit moved a curve end")
    poles[0], poles[-1] = p[0], p[-1]
    knots = np.array([c.Knot(i) for i in range(1, c.NbKnots() + 1)])
    mults = [c.Multiplicity(i) for i in range(1, c.NbKnots() + 1)]
    return Nurbs(c.Degree(), poles, None, knots, mults)


def section_spline_nurbs(c: Spline) -> Nurbs:
    """B-spline of a section spline: fitted to its exact curve when that is known
    (:func:`exact_nurbs`), else to its samples (:func:`spline_nurbs`)."""
    if c.exact is not None:
        nb = exact_nurbs(c.exact)
        if nb is not None:
            p = np.asarray(c.points, dtype=float)
            if max(np.hypot(*(nb.poles[0] - p[0])), np.hypot(*(nb.poles[-1] - p[-1]))) \
                    <= JUNCTION_GAP:
                nb.poles[0], nb.poles[-1] = p[0], p[-1]   # the spline's own ends, bit for bit
                return nb
    return spline_nurbs(c.points)


def exact_nurbs(e: Exact) -> Nurbs | None:
    """B-spline within :data:`EXACT_FIT` of the exact curve ``e`` (fitted once per curve
    shape, then turned and moved into place); None when no fit reaches it."""
    fit = _source_fit(e.source, e.flip)
    if fit is None:
        return None
    c, s = math.cos(e.angle), math.sin(e.angle)
    P = fit.poles
    poles = np.column_stack([c * P[:, 0] - s * P[:, 1] + e.shift[0],
                             s * P[:, 0] + c * P[:, 1] + e.shift[1]])
    return Nurbs(fit.deg, poles, None, fit.knots.copy(), list(fit.mults))


@lru_cache(maxsize=128)
def _source_fit(source, flip: bool):
    """:func:`gen.geometry.bspline_fit.fit_curve` of ``EXACT_SAMPLES`` points of the exact
    curve in its own frame (the teeth of one gear share it)."""
    pts = Exact(source, 0.0, (0.0, 0.0), flip).at(np.linspace(0.0, 1.0, EXACT_SAMPLES))
    return fit_curve(pts, EXACT_FIT)


def _arc_nurbs(a: Arc) -> Nurbs:
    """Rational quadratic arc: spans ≤ 90°, middle weight cos(Δ/2) (the standard conic form)."""
    span = a.a1 - a.a0
    n = max(1, int(math.ceil(abs(span) / (0.5 * math.pi) - 1e-9)))
    d = span / n
    ang = a.a0 + 0.5 * d * np.arange(2 * n + 1)
    rad = np.full(2 * n + 1, float(a.radius))
    rad[1::2] /= math.cos(0.5 * d)
    poles = np.column_stack([a.center[0] + rad * np.cos(ang), a.center[1] + rad * np.sin(ang)])
    w = np.ones(2 * n + 1)
    w[1::2] = math.cos(0.5 * d)
    knots = np.arange(n + 1, dtype=float) * abs(d) * a.radius  # parameter ≈ arc length
    return Nurbs(2, poles, w, knots, [3] + [2] * (n - 1) + [3],
                 (float(a.center[0]), float(a.center[1]), float(a.radius), float(a.a0),
                  float(a.a1)))


def _line_nurbs(seg: Line) -> Nurbs:
    p = np.array([seg.p0, seg.p1], dtype=float)
    return Nurbs(1, p, None, np.array([0.0, float(np.hypot(*(p[1] - p[0])))]), [2, 2])


def _reversed(c):
    if isinstance(c, Spline):
        return Spline(np.asarray(c.points)[::-1], None if c.exact is None else c.exact.reversed())
    if isinstance(c, Arc):
        return Arc(c.center, c.radius, c.a1, c.a0)
    return Line(c.p1, c.p0)


def _split_closed(c):
    """A curve that closes on itself (full circle, closed spline) as open pieces; an arc of more
    than 90° as pieces of at most 90°, each one rational quadratic span: a longer arc needs
    double interior knots, which make its curve (and any face swept from it) only C0 in its
    parameter, and a full shape analysis flags that."""
    if isinstance(c, Arc):
        span = c.a1 - c.a0
        n = max(1, int(math.ceil(abs(span) / (0.5 * math.pi) - 1e-9)))
        if n == 1:
            return [c]
        cuts = c.a0 + span * np.arange(n + 1) / n
        return [Arc(c.center, c.radius, float(a), float(b)) for a, b in zip(cuts[:-1], cuts[1:])]
    if isinstance(c, Spline) and np.hypot(*(c.start - c.end)) < JUNCTION_GAP:
        k = len(c.points) // 2
        return [Spline(c.points[: k + 1]), Spline(c.points[k:])]
    return [c]


def oriented_curves(loop: Loop, ccw: bool, tol: float = 1e-3) -> list:
    curves = list(loop.curves)
    if (signed_area(loop.polygon(tol)) > 0) != ccw:
        curves = [_reversed(c) for c in curves[::-1]]
    out = []
    for c in curves:
        out.extend(_split_closed(c))
    gap = Loop(tuple(out)).gaps()
    if gap > JUNCTION_GAP:
        raise GeometryError(f"section loop is not closed: a {gap:.3g} mm gap between curves")
    return out


def loop_nurbs(loop: Loop, ccw: bool) -> list:
    out = []
    for c in oriented_curves(loop, ccw):
        if isinstance(c, Spline):
            out.append(section_spline_nurbs(c))
        elif isinstance(c, Arc):
            out.append(_arc_nurbs(c))
        else:
            out.append(_line_nurbs(c))
    for i in range(len(out)):  # one junction point, bit for bit, per pair of curves
        out[i].poles[0] = out[i - 1].poles[-1]
    return out
