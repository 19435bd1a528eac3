"""Direct construction of B-rep faces that share their edges: the twisted-prism shell.

Every section curve becomes a NURBS curve with control points Q_i. Its lateral face over one
stage [z_a, z_b] is the tensor-product B-spline surface with control points

    P_ij = Σ_k A_jk · (R(θ(z_k)) Q_i + (s(z_k), 0), z_k),

A inverting the collocation matrix of a clamped cubic B-spline in v = z at its Greville points
z_k. Adjacent faces share their boundary iso-curves as one edge with line pcurves on both, so
the shell is closed by construction; the herringbone halves share the mid-section edges, and
the caps are planes bounded by the same edges.

An arc about the twist axis (a tip or root land, a bore) is the exception: turned about its
own centre it stays on one cylinder, so its face is that exact cylinder, bounded by circle
edges at the levels and by the neighbouring faces' fitted helix edges, whose tolerance is
raised to their fit error at that radius (≤ HELIX_FIT; 5.4e-6 mm at the tip of the 40-tooth
herringbone of the benchmarks). CAD programs then measure tip, root and bore diameters
directly, and the file is lighter (:func:`circle_arc` says when).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.geometry.body import Prism

from gen.solid.helix_fit import place, vfit
from gen.solid.kernel import KERNEL_TOL, occ
from gen.solid.nurbs import Nurbs

class Builder:
    """Thin wrapper over BRep_Builder for shapes whose edges are shared by construction."""

    def __init__(self):
        self.o = o = occ()
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

    def edge(self, curve, v0, v1, t0, t1, tol: float = KERNEL_TOL):
        o, b = self.o, self.b
        e = o.TopoDS_Edge()
        b.MakeEdge(e, curve, tol)
        b.Add(e, v0.Oriented(o.TopAbs_FORWARD))
        b.Add(e, v1.Oriented(o.TopAbs_REVERSED))
        b.Range(e, float(t0), float(t1))
        return e

    def curve3d(self, nb: Nurbs, x, y, z):
        o = self.o
        P = o.TColgp_Array1OfPnt(1, len(x))
        for i in range(len(x)):
            P.SetValue(i + 1, o.gp_Pnt(float(x[i]), float(y[i]), float(z)))
        K, M = self.reals(nb.knots), self.ints(nb.mults)
        if nb.weights is not None:
            return o.Geom_BSplineCurve(P, self.reals(nb.weights), K, M, nb.deg)
        return o.Geom_BSplineCurve(P, K, M, nb.deg)

    def curve2d(self, nb: Nurbs, x, y):
        o = self.o
        P = o.TColgp_Array1OfPnt2d(1, len(x))
        for i in range(len(x)):
            P.SetValue(i + 1, o.gp_Pnt2d(float(x[i]), float(y[i])))
        K, M = self.reals(nb.knots), self.ints(nb.mults)
        if nb.weights is not None:
            return o.Geom2d_BSplineCurve(P, self.reals(nb.weights), K, M, nb.deg)
        return o.Geom2d_BSplineCurve(P, K, M, nb.deg)

    def circle2d(self, arc):
        """Curve on the plane z = const of a circle edge (``arc`` as in :func:`level_rows`):
        the same parameter (angle, clockwise where ``sense`` is −1)."""
        o = self.o
        cx, cy, R, sense = arc[:4]
        return o.Geom2d_Circle(o.gp_Ax22d(o.gp_Pnt2d(cx, cy), o.gp_Dir2d(1.0, 0.0),
                                          o.gp_Dir2d(0.0, sense)), R)

    def line2d(self, p, q, t0, t1):
        """Straight curve on a surface from uv point p (parameter t0) to q (t1)."""
        o = self.o
        P = o.TColgp_Array1OfPnt2d(1, 2)
        P.SetValue(1, o.gp_Pnt2d(float(p[0]), float(p[1])))
        P.SetValue(2, o.gp_Pnt2d(float(q[0]), float(q[1])))
        return o.Geom2d_BSplineCurve(P, self.reals([t0, t1]), self.ints([2, 2]), 1)

    def pcurve(self, edge, curve2d, surface):
        tol = max(KERNEL_TOL, self.o.BRep_Tool.Tolerance_s(edge))
        self.b.UpdateEdge(edge, curve2d, surface, self.loc, tol)

    def widen(self, edge, tol: float) -> None:
        """Raise the tolerance of ``edge`` and its two vertices to at least ``tol``."""
        o = self.o
        if tol <= o.BRep_Tool.Tolerance_s(edge):
            return
        self.b.UpdateEdge(edge, float(tol))
        for v in (o.TopExp.FirstVertex_s(edge), o.TopExp.LastVertex_s(edge)):
            if o.BRep_Tool.Tolerance_s(v) < tol:
                self.b.UpdateVertex(v, float(tol))

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
class Track:
    """One section loop and how it moves: the prism's motion, or none (straight)."""

    curves: list          # Nurbs, oriented (outer ccw, holes cw)
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


def circle_arc(tr: Track, nb: Nurbs, levels):
    """(cx, cy, R, a0, a1) of an arc curve that stays a circular arc about a fixed axis
    wherever ``tr`` carries it between ``levels`` (a straight track, or a turn about its
    centre at the origin without shear), else None. A face that would wrap more than half a
    turn of its cylinder (a long helical groove) stays a B-spline: the kernel's booleans lose
    faces whose parameter range exceeds the cylinder's period (measured: an empty cut)."""
    return _circle_arc(tr, nb, _stage_turn(tr, levels))


def _stage_turn(tr: Track, levels) -> float:
    """The largest turn (rad) of ``tr`` between consecutive levels (0 when straight)."""
    if tr.prism is None:
        return 0.0
    return max(abs(tr.theta(b) - tr.theta(a)) for a, b in zip(levels[:-1], levels[1:]))


def _circle_arc(tr: Track, nb: Nurbs, turn: float):
    if nb.arc is None:
        return None
    cx, cy, _, a0, a1 = nb.arc
    if tr.prism is None:
        return nb.arc
    if tr.prism.shear != 0.0 or math.hypot(cx, cy) > 1e-12:
        return None
    return nb.arc if turn + abs(a1 - a0) <= math.pi else None


def level_rows(bld: Builder, tr: Track, levels) -> dict:
    """Edges of ``tr``'s curves at each level: {level index: [(edge, pole x, pole y, start
    vertex, 3-D curve, arc), ...]}; consecutive curves share their vertices. ``arc``: for an
    arc carried as a circle (:func:`circle_arc`), (cx, cy, R, sense, p0, p1) with the edge's
    parameter range p0…p1 (angle, ``sense`` −1: measured clockwise), else None."""
    per = {}
    turn = _stage_turn(tr, levels)
    arcs = [_circle_arc(tr, nb, turn) for nb in tr.curves]
    for k, z in enumerate(levels):
        c, s, t = tr.at(z)
        th = tr.theta(z)
        verts = []
        for i, nb in enumerate(tr.curves):
            x, y = place(nb.poles[:1], c, s, t)
            tol = KERNEL_TOL
            for a, end in ((arcs[i], 3), (arcs[i - 1], 4)):   # a circle ends where its angle says
                if a is not None:
                    ang = a[end] + th
                    tol = max(tol, 2.0 * math.hypot(a[0] + a[2] * math.cos(ang) - x[0, 0],
                                                    a[1] + a[2] * math.sin(ang) - y[0, 0]))
            verts.append(bld.vertex(x[0, 0], y[0, 0], z, tol))
        row = []
        for i, nb in enumerate(tr.curves):
            x, y = place(nb.poles, c, s, t)
            x, y = x[:, 0], y[:, 0]
            o = bld.o
            arc = None
            if arcs[i] is not None:
                cx, cy, R, a0, a1 = arcs[i]
                sense = 1.0 if a1 > a0 else -1.0
                ax = o.gp_Ax2(o.gp_Pnt(cx, cy, float(z)), o.gp_Dir(0.0, 0.0, sense),
                              o.gp_Dir(1.0, 0.0, 0.0))
                curve = o.Geom_Circle(ax, R)
                arc = (cx, cy, R, sense, sense * (a0 + th), sense * (a1 + th))
                t0, t1 = arc[4], arc[5]
            elif nb.deg == 1 and len(x) == 2 and nb.weights is None:   # a line, parameter =
                d = math.hypot(x[1] - x[0], y[1] - y[0])                # length (as its knots)
                curve = o.Geom_Line(o.gp_Pnt(float(x[0]), float(y[0]), float(z)),
                                    o.gp_Dir(float((x[1] - x[0]) / d), float((y[1] - y[0]) / d),
                                             0.0))
                t0, t1 = nb.knots[0], nb.knots[-1]
            else:
                curve = bld.curve3d(nb, x, y, z)
                t0, t1 = nb.knots[0], nb.knots[-1]
            e = bld.edge(curve, verts[i], verts[(i + 1) % len(verts)], t0, t1)
            row.append((e, x, y, verts[i], curve, arc))
        per[k] = row
    return per


def track_faces(bld: Builder, tr: Track, levels, per: dict) -> list:
    """Lateral faces of ``tr`` between consecutive levels, bounded by the rows' edges."""
    faces = []
    for k in range(len(levels) - 1):
        faces.extend(_stage_faces(bld, tr, levels[k], levels[k + 1], per[k], per[k + 1]))
    return faces


def planar_face(bld: Builder, z: float, loops, up: bool):
    """Planar face at height z bounded by ``loops`` = [(track, row, forward)], the first the
    outer boundary; ``forward`` False runs a loop backwards (a ccw outer loop used as a hole);
    ``up``: the material lies below (the face's normal is +Z)."""
    pl = bld.plane(z)
    wires = []
    for tr, row, forward in loops:
        for (e, x, y, _, _, arc), nb in zip(row, tr.curves):
            bld.pcurve(e, bld.circle2d(arc) if arc else bld.curve2d(nb, x, y), pl)
        edges = [(e, True) for e, *_ in row]
        wires.append(bld.wire(edges if forward else [(e, False) for e, _ in edges[::-1]]))
    f = bld.face(pl, wires)
    return f if up else f.Reversed()


def lateral_shell(tracks: list, z0: float, z1: float):
    """Closed solid from moving loops: lateral B-spline faces + two planar caps."""
    bld = Builder()
    faces = []
    horiz = []
    for tr in tracks:
        levels = tr.levels(z0, z1)
        per = level_rows(bld, tr, levels)
        horiz.append(per)
        faces.extend(track_faces(bld, tr, levels, per))
    for k_end, z, top in ((0, z0, False), (-1, z1, True)):
        loops = [(tr, per[len(per) - 1 if k_end == -1 else 0], True)
                 for tr, per in zip(tracks, horiz)]
        faces.append(planar_face(bld, z, loops, top))
    return bld.solid(faces)


def _stage_faces(bld: Builder, tr: Track, za: float, zb: float, low, high):
    if tr.prism is None:
        return _extruded_faces(bld, tr, za, zb, low, high)
    o = bld.o
    ca, sa, ta = tr.at(za)
    cb, sb, tb = tr.at(zb)
    fit = vfit(za, zb, tr.theta(zb) - tr.theta(za), tr.rho)
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
        x, y = place(nb.poles[:1], Mc[None, :], Ms[None, :], Tv[None, :])
        P = o.TColgp_Array1OfPnt(1, nv)
        for j in range(nv):
            P.SetValue(j + 1, o.gp_Pnt(float(x[0, j]), float(y[0, j]), float(Zv[j])))
        vert.append(bld.edge(o.Geom_BSplineCurve(P, VK, VM, fit.deg), low[i][3], high[i][3],
                             za, zb))
    faces = []
    for i, nb in enumerate(tr.curves):
        if low[i][5] is not None:   # a circle carried about its centre: a cylinder
            el, er = vert[i], vert[(i + 1) % n]
            for e, v in ((el, low[i][3]), (er, low[(i + 1) % n][3])):
                # the fitted helix leaves the exact one (the cylinder's line) by ≤ fit.error
                # per mm of radius; its end poles sit on the circle's ends within the vertex
                # tolerance
                gap = bld.o.BRep_Tool.Tolerance_s(v)
                bld.widen(e, 1.25 * ((low[i][5][2] + gap) * fit.error + gap))
            faces.append(cylinder_face(bld, low[i][5], high[i][5], low[i][0], high[i][0],
                                       el, er, za, zb, za, zb))
            continue
        X, Y = place(nb.poles, Mc[None, :], Ms[None, :], Tv[None, :])
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



def _extruded_faces(bld: Builder, tr: Track, za: float, zb: float, low, high) -> list:
    """Lateral faces of a loop that does not move: surfaces of linear extrusion along +Z of the
    bottom edges' own curves (the STEP file then holds each curve once, not as a second row
    of B-spline poles)."""
    o = bld.o
    up = o.gp_Dir(0.0, 0.0, 1.0)
    h = zb - za
    n = len(tr.curves)
    vert = []  # vertical lines at the start of each curve, parameter = height above za
    for i, nb in enumerate(tr.curves):
        x, y = float(low[i][1][0]), float(low[i][2][0])
        line = o.Geom_Line(o.gp_Pnt(x, y, za), up)
        vert.append(bld.edge(line, low[i][3], high[i][3], 0.0, h))
    faces = []
    for i, nb in enumerate(tr.curves):
        if low[i][5] is not None:
            faces.append(cylinder_face(bld, low[i][5], high[i][5], low[i][0], high[i][0],
                                       vert[i], vert[(i + 1) % n], za, zb, 0.0, h))
            continue
        S = o.Geom_SurfaceOfLinearExtrusion(low[i][4], up)
        u0, u1 = nb.knots[0], nb.knots[-1]
        eb, et = low[i][0], high[i][0]
        el, er = vert[i], vert[(i + 1) % n]
        bld.pcurve(eb, bld.iso_line(v=0.0), S)
        bld.pcurve(et, bld.iso_line(v=h), S)
        bld.pcurve(el, bld.iso_line(u=u0), S)
        bld.pcurve(er, bld.iso_line(u=u1), S)
        faces.append(bld.face(S, [bld.wire([(eb, True), (er, True), (et, False), (el, False)])]))
    return faces


def cylinder_face(bld: Builder, lo, hi, eb, et, el, er, za, zb, ta, tb):
    """Lateral face of an arc carried from z_a to z_b by a turn about its centre (or not
    moved): part of the cylinder through both circle edges ``eb`` (bottom), ``et`` (top),
    bounded by ``el`` (from the arc's start at z_a to its start at z_b, parameters ta…tb) and
    ``er`` (from end to end). ``lo``, ``hi``: the circles as in :func:`level_rows`. The
    cylinder's u is the angle (counter-clockwise), v the height; a clockwise arc (a hole's)
    gives the reversed face, so the normal points away from the material as on every face."""
    o = bld.o
    cx, cy, R, sense = lo[:4]
    S = o.Geom_CylindricalSurface(o.gp_Ax3(o.gp_Pnt(cx, cy, 0.0), o.gp_Dir(0.0, 0.0, 1.0),
                                           o.gp_Dir(1.0, 0.0, 0.0)), R)
    bld.pcurve(eb, o.Geom2d_Line(o.gp_Pnt2d(0.0, float(za)), o.gp_Dir2d(sense, 0.0)), S)
    bld.pcurve(et, o.Geom2d_Line(o.gp_Pnt2d(0.0, float(zb)), o.gp_Dir2d(sense, 0.0)), S)
    bld.pcurve(el, bld.line2d((sense * lo[4], za), (sense * hi[4], zb), ta, tb), S)
    bld.pcurve(er, bld.line2d((sense * lo[5], za), (sense * hi[5], zb), ta, tb), S)
    if sense > 0:
        return bld.face(S, [bld.wire([(eb, True), (er, True), (et, False), (el, False)])])
    return bld.face(S, [bld.wire([(el, True), (et, True), (er, False), (eb, False)])]).Reversed()
