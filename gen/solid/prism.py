"""B-rep solids of straight, twisted (helical), sheared and chevron prisms.

cadquery/OCP are imported lazily, inside the functions. Input is the neutral description of
:mod:`gen.geometry.body`.

Routes
------
* Straight prism: one planar face with holes (lines, circles, fitted B-splines) extruded
  by ``BRepPrimAPI_MakePrism``; a sheared (helical rack) prism is the same face extruded
  along the oblique vector (shear·h, 0, h), exact; a sheared chevron is two such prisms.
* Twisted or chevron prism: the faces are built directly, no sweep and no sewing. Every
  section curve becomes a NURBS curve (splines fitted by ``GeomAPI_PointsToBSpline``, arcs
  as rational quadratics, lines of degree 1) with control points Q_i. Its lateral face
  over one stage [z_a, z_b] is the tensor-product B-spline surface with control points

      P_ij = Σ_k A_jk · (R(θ(z_k)) Q_i + (s(z_k), 0), z_k),

  where A inverts the collocation matrix of a clamped cubic B-spline in v = z at its
  Greville points z_k. Because rotation is linear, S(u, z_k) equals the exact moved curve
  at every z_k; between them the surface leaves the true helicoid by at most
  ρ_max · e(Θ), e being the fit error of the unit circle (checked numerically, spans added
  until ≤ :data:`HELIX_FIT`). The surface reproduces z = v and the shear exactly. Adjacent
  faces share their boundary iso-curves as one edge (a v-iso B-spline) with line pcurves
  on both, so the shell is closed by construction; the herringbone halves share the mid
  section edges, and the caps are planes bounded by the same edges. Bores that are circles
  about the axis, and straight through-cuts that stay clear of the moving boundary
  (:func:`gen.geometry.body.plan_cuts`), become straight lateral faces of the same shell:
  no boolean ever touches a twisted face.
* Other cuts and multi-solid unions fall back to OCC booleans on the result.

Measured (2 cores, cadquery 2.8, OCP 7.9.3; herringbone m_n 2, z 40, 2 × 10 mm, β 30°,
8 mm bore; after imports, outline generation (0.09 s) not included; "earlier" rows are the
project's earlier measurements, the others one-off runs of this module's code):

==========================================================  ==========  ================
route                                                        time (s)    result
==========================================================  ==========  ================
polyline profile, twisted extrusion ×2, union (earlier)      195         invalid
B-spline flanks, twistExtrude ×2, glue fuse, bore (earlier)  7.7 + I/O   valid
same halves sewn instead of fused (earlier)                  6.0 + I/O   valid
ThruSections, 4 sections per half: build 0.42, glue fuse     11.7        valid
  10.5, bore cut 0.80
direct faces, splines interpolated (GeomAPI_Interpolate):    0.17        valid, STEP 8.2 MB
  check 0.12, STEP 0.40
direct faces, splines fitted to 1e-6 mm (kept):              0.10–0.13   valid, STEP 4.3 MB
  check 0.08–0.11, STEP 0.18–0.25
==========================================================  ==========  ================

Sheared racks take 0.02 s as one oblique prism and 0.03 s as a chevron pair (the direct
route took 0.16 s for the chevron rack and wrote heavier B-spline faces); their check and
STEP costs follow the edge count: the 20-tooth rack outline has 743 lines (each fillet
sampled as 16 lines), check 0.28 s + STEP 0.24 s; the same outline with each fillet as one
spline (84 curves) needs 0.03 s + 0.03 s.
A keyway that crosses the round bore falls back to a boolean: +0.3 s. Current figures of
every case: ``benchmarks/bench_twisted.py``.
"""

from __future__ import annotations

import importlib
import math
from dataclasses import dataclass
from functools import lru_cache
from types import SimpleNamespace

import numpy as np

from gen.errors import GeometryError
from gen.geometry.body import Body, Prism, plan_cuts
from gen.geometry.section import Arc, Line, Loop, Spline, signed_area

#: vertex, edge and face tolerance of the shapes built here (mm) = OCC Precision::Confusion
KERNEL_TOL = 1e-7
#: largest allowed deviation (mm) of a twisted face from the true helicoidal surface
HELIX_FIT = 1e-5
#: largest gap (mm) allowed between one section curve's end and the next curve's start
JUNCTION_GAP = 1e-6
#: largest distance (mm) of a section B-spline from the spline samples it replaces
SPLINE_FIT = 1e-6


# --------------------------------------------------------------------------- kernel access
_OCC_NAMES = {
    "OCP.BRep": ("BRep_Builder",),
    "OCP.BRepAlgoAPI": ("BRepAlgoAPI_Cut", "BRepAlgoAPI_Fuse"),
    "OCP.BRepCheck": ("BRepCheck_Analyzer",),
    "OCP.BRepPrimAPI": ("BRepPrimAPI_MakePrism",),
    "OCP.Geom": ("Geom_BSplineCurve", "Geom_BSplineSurface", "Geom_Circle", "Geom_Line",
                 "Geom_Plane"),
    "OCP.Geom2d": ("Geom2d_BSplineCurve", "Geom2d_Line"),
    "OCP.GeomAbs": ("GeomAbs_C2",),
    "OCP.GeomAPI": ("GeomAPI_PointsToBSpline",),
    "OCP.gp": ("gp_Ax2", "gp_Ax3", "gp_Dir", "gp_Dir2d", "gp_Pnt", "gp_Pnt2d", "gp_Vec"),
    "OCP.TColgp": ("TColgp_Array1OfPnt", "TColgp_Array1OfPnt2d", "TColgp_Array2OfPnt"),
    "OCP.TColStd": ("TColStd_Array1OfInteger", "TColStd_Array1OfReal", "TColStd_Array2OfReal"),
    "OCP.TopAbs": ("TopAbs_FACE", "TopAbs_FORWARD", "TopAbs_REVERSED", "TopAbs_SOLID"),
    "OCP.TopExp": ("TopExp_Explorer",),
    "OCP.TopLoc": ("TopLoc_Location",),
    "OCP.TopoDS": ("TopoDS", "TopoDS_Edge", "TopoDS_Face", "TopoDS_Shell", "TopoDS_Solid",
                   "TopoDS_Vertex", "TopoDS_Wire"),
}


@lru_cache(maxsize=None)
def _occ() -> SimpleNamespace:
    """The OCP classes used here, imported on first use (the kernel loads in ~0.5–3 s)."""
    ns = {}
    for module, names in _OCC_NAMES.items():
        mod = importlib.import_module(module)
        ns.update({n: getattr(mod, n) for n in names})
    return SimpleNamespace(**ns)


# --------------------------------------------------------------------------- section curves
@dataclass(eq=False)
class _Nurbs:
    """A planar NURBS curve in OCC's form: degree, poles (n, 2), weights or None, knots, mults."""

    deg: int
    poles: np.ndarray
    weights: np.ndarray | None
    knots: np.ndarray
    mults: list


def _spline_nurbs(points: np.ndarray) -> _Nurbs:
    """Cubic C2 B-spline within :data:`SPLINE_FIT` of the section samples (end points kept).

    ``GeomAPI_PointsToBSpline`` needs 2.6× fewer poles than interpolating every sample
    (``GeomAPI_Interpolate``: 26 and 42 poles for the 24- and 40-sample flank pieces of
    the bench gear, against 16 and 10), and so fewer STEP entities, for a curve within
    1e-6 mm of the interpolant (measured).
    """
    o = _occ()
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
    return _Nurbs(c.Degree(), poles, None, knots, mults)


def _arc_nurbs(a: Arc) -> _Nurbs:
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
    return _Nurbs(2, poles, w, knots, [3] + [2] * (n - 1) + [3])


def _line_nurbs(seg: Line) -> _Nurbs:
    p = np.array([seg.p0, seg.p1], dtype=float)
    return _Nurbs(1, p, None, np.array([0.0, float(np.hypot(*(p[1] - p[0])))]), [2, 2])


def _reversed(c):
    if isinstance(c, Spline):
        return Spline(np.asarray(c.points)[::-1])
    if isinstance(c, Arc):
        return Arc(c.center, c.radius, c.a1, c.a0)
    return Line(c.p1, c.p0)


def _split_closed(c):
    """A curve that closes on itself (full circle, closed spline) as two open halves."""
    if isinstance(c, Arc):
        if abs(c.a1 - c.a0) < 2.0 * math.pi - 1e-12:
            return [c]
        m = 0.5 * (c.a0 + c.a1)
        return [Arc(c.center, c.radius, c.a0, m), Arc(c.center, c.radius, m, c.a1)]
    if isinstance(c, Spline) and np.hypot(*(c.start - c.end)) < JUNCTION_GAP:
        k = len(c.points) // 2
        return [Spline(c.points[: k + 1]), Spline(c.points[k:])]
    return [c]


def _oriented_curves(loop: Loop, ccw: bool, tol: float = 1e-3) -> list:
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


def _loop_nurbs(loop: Loop, ccw: bool) -> list:
    out = []
    for c in _oriented_curves(loop, ccw):
        if isinstance(c, Spline):
            out.append(_spline_nurbs(c.points))
        elif isinstance(c, Arc):
            out.append(_arc_nurbs(c))
        else:
            out.append(_line_nurbs(c))
    for i in range(len(out)):  # one junction point, bit for bit, per pair of curves
        out[i].poles[0] = out[i - 1].poles[-1]
    return out


def _rotation_invariant(loop: Loop) -> bool:
    """A circle (or arcs of one circle) about the axis: unchanged by any twist."""
    cs = loop.curves
    return all(isinstance(c, Arc) and math.hypot(*c.center) < KERNEL_TOL
               and abs(c.radius - cs[0].radius) < KERNEL_TOL for c in cs)


# --------------------------------------------------------------------------- v-direction fit
def _basis(full: np.ndarray, deg: int, t: np.ndarray) -> np.ndarray:
    """B-spline basis functions N_j,deg(t) on the full knot vector (Cox–de Boor), (len t, n)."""
    t = np.asarray(t, dtype=float)
    m = len(full) - 1
    B = ((full[:-1] <= t[:, None]) & (t[:, None] < full[1:])).astype(float)
    last = int(np.nonzero(full[:-1] < full[1:])[0][-1])
    B[t >= full[-1], :] = 0.0
    B[t >= full[-1], last] = 1.0
    for p in range(1, deg + 1):
        Bn = np.zeros((len(t), m - p))
        for j in range(m - p):
            d1, d2 = full[j + p] - full[j], full[j + p + 1] - full[j + 1]
            if d1 > 0:
                Bn[:, j] += (t - full[j]) / d1 * B[:, j]
            if d2 > 0:
                Bn[:, j] += (full[j + p + 1] - t) / d2 * B[:, j + 1]
        B = Bn
    return B


@dataclass(eq=False)
class _VFit:
    """Clamped B-spline in v = z over one stage, and the weights A mapping data to poles."""

    deg: int
    knots: list
    mults: list
    zs: np.ndarray       # data heights (Greville points)
    A: np.ndarray        # poles_j = Σ_k A_jk data_k
    error: float         # fit error of a unit-radius helix (mm per mm of radius)


@lru_cache(maxsize=256)
def _vfit(za: float, zb: float, turn: float, rho: float) -> _VFit:
    """Smallest uniform cubic fit whose helix error ρ·e ≤ HELIX_FIT (turn = Δθ over the stage).

    The error of cubic interpolation falls as (Θ/spans)⁴, so one trial span count gives an
    estimate; the estimate is then checked and raised until the measured error fits.
    """
    if turn == 0.0:
        return _VFit(1, [za, zb], [2, 2], np.array([za, zb]), np.eye(2), 0.0)
    spans = max(1, int(math.ceil(abs(turn) / 0.5)))
    fit = _vfit_spans(za, zb, turn, spans)
    if fit.error * rho > HELIX_FIT:
        spans = int(math.ceil(spans * (fit.error * rho / HELIX_FIT) ** 0.25))
    for _ in range(64):
        fit = _vfit_spans(za, zb, turn, spans)
        if fit.error * rho <= HELIX_FIT:
            return fit
        spans += max(1, spans // 8)
    raise GeometryError(f"twist of {turn:.3f} rad over one stage is too large to fit")


def _vfit_spans(za: float, zb: float, turn: float, spans: int) -> _VFit:
    """Cubic interpolation at the Greville points of ``spans`` uniform spans; error measured."""
    knots = np.linspace(za, zb, spans + 1)
    full = np.concatenate([[za] * 3, knots, [zb] * 3])
    n = spans + 3
    zs = np.array([full[j + 1:j + 4].mean() for j in range(n)])
    A = np.linalg.inv(_basis(full, 3, zs))
    th = (zs - za) / (zb - za) * turn
    P = A @ np.column_stack([np.cos(th), np.sin(th)])
    ts = np.linspace(za, zb, 24 * spans + 1)
    E = _basis(full, 3, ts) @ P
    the = (ts - za) / (zb - za) * turn
    err = float(np.max(np.hypot(E[:, 0] - np.cos(the), E[:, 1] - np.sin(the))))
    return _VFit(3, [float(k) for k in knots], [4] + [1] * (spans - 1) + [4], zs, A, err)


def _place(Q: np.ndarray, c, s, t):
    """x, y of points Q (n, 2) under the affine map [[c, −s], [s, c]]·Q + (t, 0) (broadcasts)."""
    return c * Q[:, 0:1] - s * Q[:, 1:2] + t, s * Q[:, 0:1] + c * Q[:, 1:2]


# --------------------------------------------------------------------------- OCC builders
class _Builder:
    """Thin wrapper over BRep_Builder for shapes whose edges are shared by construction."""

    def __init__(self):
        self.o = o = _occ()
        self.b = o.BRep_Builder()
        self.loc = o.TopLoc_Location()

    def reals(self, vals):
        a = self.o.TColStd_Array1OfReal(1, len(vals))
        for i, v in enumerate(vals, 1):
            a.SetValue(i, float(v))
        return a

    def ints(self, vals):
        a = self.o.TColStd_Array1OfInteger(1, len(vals))
        for i, v in enumerate(vals, 1):
            a.SetValue(i, int(v))
        return a

    def vertex(self, x, y, z, tol: float = KERNEL_TOL):
        v = self.o.TopoDS_Vertex()
        self.b.MakeVertex(v, self.o.gp_Pnt(float(x), float(y), float(z)), tol)
        return v

    def edge(self, curve, v0, v1, t0, t1):
        o, b = self.o, self.b
        e = o.TopoDS_Edge()
        b.MakeEdge(e, curve, KERNEL_TOL)
        b.Add(e, v0.Oriented(o.TopAbs_FORWARD))
        b.Add(e, v1.Oriented(o.TopAbs_REVERSED))
        b.Range(e, float(t0), float(t1))
        return e

    def curve3d(self, nb: _Nurbs, x, y, z):
        o = self.o
        P = o.TColgp_Array1OfPnt(1, len(x))
        for i in range(len(x)):
            P.SetValue(i + 1, o.gp_Pnt(float(x[i]), float(y[i]), float(z)))
        K, M = self.reals(nb.knots), self.ints(nb.mults)
        if nb.weights is not None:
            return o.Geom_BSplineCurve(P, self.reals(nb.weights), K, M, nb.deg)
        return o.Geom_BSplineCurve(P, K, M, nb.deg)

    def curve2d(self, nb: _Nurbs, x, y):
        o = self.o
        P = o.TColgp_Array1OfPnt2d(1, len(x))
        for i in range(len(x)):
            P.SetValue(i + 1, o.gp_Pnt2d(float(x[i]), float(y[i])))
        K, M = self.reals(nb.knots), self.ints(nb.mults)
        if nb.weights is not None:
            return o.Geom2d_BSplineCurve(P, self.reals(nb.weights), K, M, nb.deg)
        return o.Geom2d_BSplineCurve(P, K, M, nb.deg)

    def pcurve(self, edge, curve2d, surface):
        self.b.UpdateEdge(edge, curve2d, surface, self.loc, KERNEL_TOL)

    def iso_line(self, u=None, v=None):
        o = self.o
        if u is None:  # constant v, parameter = u
            return o.Geom2d_Line(o.gp_Pnt2d(0.0, float(v)), o.gp_Dir2d(1.0, 0.0))
        return o.Geom2d_Line(o.gp_Pnt2d(float(u), 0.0), o.gp_Dir2d(0.0, 1.0))

    def wire(self, edges_and_senses):
        o, b = self.o, self.b
        w = o.TopoDS_Wire()
        b.MakeWire(w)
        for e, forward in edges_and_senses:
            b.Add(w, e.Oriented(o.TopAbs_FORWARD if forward else o.TopAbs_REVERSED))
        w.Closed(True)
        return w

    def face(self, surface, wires):
        f = self.o.TopoDS_Face()
        self.b.MakeFace(f, surface, KERNEL_TOL)
        for w in wires:
            self.b.Add(f, w)
        return f

    def plane(self, z):
        o = self.o
        return o.Geom_Plane(o.gp_Ax3(o.gp_Pnt(0.0, 0.0, float(z)), o.gp_Dir(0.0, 0.0, 1.0),
                                     o.gp_Dir(1.0, 0.0, 0.0)))

    def solid(self, faces):
        o, b = self.o, self.b
        sh = o.TopoDS_Shell()
        b.MakeShell(sh)
        for f in faces:
            b.Add(sh, f)
        sh.Closed(True)
        so = o.TopoDS_Solid()
        b.MakeSolid(so)
        b.Add(so, sh)
        return so


@dataclass(eq=False)
class _Track:
    """One section loop and how it moves: the prism's motion, or none (straight)."""

    curves: list          # _Nurbs, oriented (outer ccw, holes cw)
    prism: Prism | None   # None: straight
    rho: float            # largest control-point radius (mm), for the helix fit

    def levels(self, z0, z1):
        if self.prism is None:
            return [z0, z1]
        st = self.prism.stages()
        return [st[0][0]] + [s[1] for s in st]

    def theta(self, z) -> float:
        return 0.0 if self.prism is None else float(self.prism.motion(z)[0])

    def at(self, z):
        if self.prism is None:
            return 1.0, 0.0, 0.0
        th, s = self.prism.motion(z)
        return math.cos(float(th)), math.sin(float(th)), float(s)


def _lateral_shell(tracks: list, z0: float, z1: float):
    """Closed solid from moving loops: lateral B-spline faces + two planar caps."""
    bld = _Builder()
    faces = []
    horiz = []  # per track: {level index: [(edge, pole x, pole y, start vertex), ...]}
    for tr in tracks:
        levels = tr.levels(z0, z1)
        per = {}
        for k, z in enumerate(levels):
            c, s, t = tr.at(z)
            verts = []
            for nb in tr.curves:
                x, y = _place(nb.poles[:1], c, s, t)
                verts.append(bld.vertex(x[0, 0], y[0, 0], z))
            row = []
            for i, nb in enumerate(tr.curves):
                x, y = _place(nb.poles, c, s, t)
                x, y = x[:, 0], y[:, 0]
                e = bld.edge(bld.curve3d(nb, x, y, z), verts[i], verts[(i + 1) % len(verts)],
                             nb.knots[0], nb.knots[-1])
                row.append((e, x, y, verts[i]))
            per[k] = row
        horiz.append(per)
        for k in range(len(levels) - 1):
            faces.extend(_stage_faces(bld, tr, levels[k], levels[k + 1], per[k], per[k + 1]))
    for k_end, z, top in ((0, z0, False), (-1, z1, True)):
        pl = bld.plane(z)
        wires = []
        for tr, per in zip(tracks, horiz):
            row = per[len(per) - 1 if k_end == -1 else 0]
            for (e, x, y, _), nb in zip(row, tr.curves):
                bld.pcurve(e, bld.curve2d(nb, x, y), pl)
            wires.append(bld.wire([(e, True) for e, *_ in row]))
        f = bld.face(pl, wires)
        faces.append(f if top else f.Reversed())
    return bld.solid(faces)


def _stage_faces(bld: _Builder, tr: _Track, za: float, zb: float, low, high):
    o = bld.o
    ca, sa, ta = tr.at(za)
    cb, sb, tb = tr.at(zb)
    fit = _vfit(za, zb, tr.theta(zb) - tr.theta(za), tr.rho)
    if fit.deg == 1:
        Mc, Ms, Tv, Zv = np.array([ca, cb]), np.array([sa, sb]), np.array([ta, tb]), fit.zs
    else:
        cos_k, sin_k, sh_k = [], [], []
        for z in fit.zs:
            c, s, t = tr.at(z)
            cos_k.append(c), sin_k.append(s), sh_k.append(t)
        Mc, Ms, Tv, Zv = fit.A @ cos_k, fit.A @ sin_k, fit.A @ sh_k, fit.A @ fit.zs
        Mc[0], Ms[0], Tv[0], Zv[0] = ca, sa, ta, za  # ends exactly on the level curves
        Mc[-1], Ms[-1], Tv[-1], Zv[-1] = cb, sb, tb, zb
    VK, VM = bld.reals(fit.knots), bld.ints(fit.mults)
    nv = len(Zv)
    n = len(tr.curves)
    vert = []  # vertical edge at the start of each curve
    for i, nb in enumerate(tr.curves):
        x, y = _place(nb.poles[:1], Mc[None, :], Ms[None, :], Tv[None, :])
        P = o.TColgp_Array1OfPnt(1, nv)
        for j in range(nv):
            P.SetValue(j + 1, o.gp_Pnt(float(x[0, j]), float(y[0, j]), float(Zv[j])))
        vert.append(bld.edge(o.Geom_BSplineCurve(P, VK, VM, fit.deg), low[i][3], high[i][3],
                             za, zb))
    faces = []
    for i, nb in enumerate(tr.curves):
        X, Y = _place(nb.poles, Mc[None, :], Ms[None, :], Tv[None, :])
        nu = len(nb.poles)
        P = o.TColgp_Array2OfPnt(1, nu, 1, nv)
        for a in range(nu):
            xa, ya = X[a], Y[a]
            for j in range(nv):
                P.SetValue(a + 1, j + 1, o.gp_Pnt(float(xa[j]), float(ya[j]), float(Zv[j])))
        UK, UM = bld.reals(nb.knots), bld.ints(nb.mults)
        if nb.weights is not None:
            W = o.TColStd_Array2OfReal(1, nu, 1, nv)
            for a in range(nu):
                for j in range(nv):
                    W.SetValue(a + 1, j + 1, float(nb.weights[a]))
            S = o.Geom_BSplineSurface(P, W, UK, VK, UM, VM, nb.deg, fit.deg)
        else:
            S = o.Geom_BSplineSurface(P, UK, VK, UM, VM, nb.deg, fit.deg)
        u0, u1 = nb.knots[0], nb.knots[-1]
        eb, et = low[i][0], high[i][0]
        el, er = vert[i], vert[(i + 1) % n]
        bld.pcurve(eb, bld.iso_line(v=za), S)
        bld.pcurve(et, bld.iso_line(v=zb), S)
        bld.pcurve(el, bld.iso_line(u=u0), S)
        bld.pcurve(er, bld.iso_line(u=u1), S)
        faces.append(bld.face(S, [bld.wire([(eb, True), (er, True), (et, False), (el, False)])]))
    return faces


# --------------------------------------------------------------------------- straight route
def _planar_face(bld: _Builder, loops, z: float):
    """Planar face at height z from oriented loops (outer ccw first, holes cw), exact curves."""
    o = bld.o
    pl = bld.plane(z)
    wires = []
    for curves in loops:
        pts = [np.asarray(c.start, dtype=float) for c in curves]
        # arcs end where their angles say; the next curve may start up to JUNCTION_GAP away
        tol = max(KERNEL_TOL, 2.0 * Loop(tuple(curves)).gaps())
        verts = [bld.vertex(p[0], p[1], z, tol) for p in pts]
        edges = []
        for i, c in enumerate(curves):
            v0, v1 = verts[i], verts[(i + 1) % len(verts)]
            if isinstance(c, Line):
                p0, p1 = pts[i], pts[(i + 1) % len(pts)]
                L = float(np.hypot(*(p1 - p0)))
                d = (p1 - p0) / L
                g = o.Geom_Line(o.gp_Pnt(float(p0[0]), float(p0[1]), z),
                                o.gp_Dir(float(d[0]), float(d[1]), 0.0))
                edges.append(bld.edge(g, v0, v1, 0.0, L))
            elif isinstance(c, Arc):
                sense = 1.0 if c.a1 > c.a0 else -1.0
                ax = o.gp_Ax2(o.gp_Pnt(float(c.center[0]), float(c.center[1]), z),
                              o.gp_Dir(0.0, 0.0, sense), o.gp_Dir(1.0, 0.0, 0.0))
                g = o.Geom_Circle(ax, float(c.radius))
                edges.append(bld.edge(g, v0, v1, sense * c.a0, sense * c.a1))
            else:
                nb = _spline_nurbs(c.points)
                nb.poles[0], nb.poles[-1] = pts[i], pts[(i + 1) % len(pts)]
                edges.append(bld.edge(bld.curve3d(nb, nb.poles[:, 0], nb.poles[:, 1], z),
                                      v0, v1, nb.knots[0], nb.knots[-1]))
        wires.append(bld.wire([(e, True) for e in edges]))
    return bld.face(pl, wires)


def _extruded(prism: Prism, extra_holes=()) -> object:
    """Straight or sheared prism by ``BRepPrimAPI_MakePrism`` of the bottom face.

    A sheared chevron is two prisms: the second grows from the first one's top face, so
    both share that face's edges, and their faces less the mid face make one closed shell.
    """
    bld = _Builder()
    o = bld.o
    loops = [_oriented_curves(prism.section.outer, True)]
    loops += [_oriented_curves(h, False) for h in tuple(prism.section.holes) + tuple(extra_holes)]
    face = _planar_face(bld, loops, prism.z0)
    legs = [(za, zb, sign) for za, zb, sign in prism.stages()]
    made = []
    for za, zb, sign in legs:
        h = zb - za
        mk = o.BRepPrimAPI_MakePrism(face, o.gp_Vec(sign * prism.shear * h, 0.0, h))
        mk.Build()
        if not mk.IsDone():
            raise GeometryError("extrusion of the section failed")
        made.append(mk)
        face = o.TopoDS.Face_s(mk.LastShape())
    if len(made) == 1:
        return made[0].Shape()
    faces = []
    for mk, skip in ((made[0], made[0].LastShape()), (made[1], made[1].FirstShape())):
        ex = o.TopExp_Explorer(mk.Shape(), o.TopAbs_FACE)
        while ex.More():
            if not ex.Current().IsSame(skip):
                faces.append(ex.Current())
            ex.Next()
    return bld.solid(faces)


def _tracks(prism: Prism, extra_holes=()) -> list:
    tracks = []
    specs = [(prism.section.outer, True, False)]
    specs += [(h, False, False) for h in prism.section.holes]
    specs += [(h, False, True) for h in extra_holes]
    for loop, ccw, straight in specs:
        if prism.shear == 0.0 and _rotation_invariant(loop):
            straight = True
        curves = _loop_nurbs(loop, ccw)
        rho = max(float(np.max(np.hypot(nb.poles[:, 0], nb.poles[:, 1]))) for nb in curves)
        tracks.append(_Track(curves, None if straight else prism, rho))
    return tracks


def _raw_prism(prism: Prism, extra_holes=()):
    if prism.straight or (prism.twist == 0.0 and not extra_holes):
        return _extruded(prism, extra_holes)
    return _lateral_shell(_tracks(prism, extra_holes), prism.z0, prism.z1)


# --------------------------------------------------------------------------- public
def check_solid(shape, what: str = "solid"):
    """Raise GeometryError unless ``shape`` is valid and holds exactly one solid."""
    o = _occ()
    if not o.BRepCheck_Analyzer(shape).IsValid():
        raise GeometryError(f"the kernel built an invalid {what}")
    ex = o.TopExp_Explorer(shape, o.TopAbs_SOLID)
    count = 0
    while ex.More():
        count += 1
        ex.Next()
    if count != 1:
        raise GeometryError(f"the {what} came out as {count} solids, expected one")


def prism_solid(prism: Prism, check: bool = True):
    """cadquery.Solid of one prism (straight, twisted, sheared or chevron); validity checked."""
    import cadquery as cq

    shape = _raw_prism(prism)
    if check:
        check_solid(shape, "prism")
    return cq.Solid(_as_solid(shape))


def radial_hole_solid(hole):
    """cadquery cylinder for a :class:`gen.geometry.body.RadialHole`."""
    import cadquery as cq

    c, s = math.cos(hole.angle), math.sin(hole.angle)
    return cq.Solid.makeCylinder(hole.diameter / 2.0, hole.r1 - hole.r0,
                                 cq.Vector(hole.r0 * c, hole.r0 * s, hole.z), cq.Vector(c, s, 0))


def body_solid(body: Body, check: bool = True):
    """cadquery.Solid of ``body``: union of its prisms minus its cuts.

    Straight through-cuts that :func:`plan_cuts` can place become plain holes of the faces;
    the rest, and unions of several prisms, use OCC booleans (their cost is in the bench).
    """
    import cadquery as cq

    o = _occ()
    plan = plan_cuts(body)
    shapes = [_raw_prism(p, holes) for p, holes in zip(body.solids, plan.holes)]
    shape = shapes[0]
    for other in shapes[1:]:
        op = o.BRepAlgoAPI_Fuse(shape, other)  # no SimplifyResult: it broke validity here
        if not op.IsDone():
            raise GeometryError("union of the body's prisms failed")
        shape = op.Shape()
    for cut in plan.booleans:
        op = o.BRepAlgoAPI_Cut(shape, _raw_prism(cut))
        if not op.IsDone():
            raise GeometryError("cutting a feature out of the body failed")
        shape = op.Shape()
    for h in body.radial_holes:
        op = o.BRepAlgoAPI_Cut(shape, radial_hole_solid(h).wrapped)
        if not op.IsDone():
            raise GeometryError("drilling a set-screw hole failed")
        shape = op.Shape()
    if check:
        check_solid(shape, "body")
    return cq.Solid(_as_solid(shape))


def _as_solid(shape):
    o = _occ()
    if shape.ShapeType() == o.TopAbs_SOLID:
        return o.TopoDS.Solid_s(shape)
    ex = o.TopExp_Explorer(shape, o.TopAbs_SOLID)
    if not ex.More():
        raise GeometryError("the kernel result holds no solid")
    return o.TopoDS.Solid_s(ex.Current())
