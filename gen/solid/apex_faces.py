"""Straight bevel gear shell built face by face, with shared edges and no boolean.

Frame and blank of :mod:`gen.geometry.bevel`: axis Z, back face z = 0, apex A = (0, 0, H).
The large-end outline lies on the back cone; the small end is that outline scaled by
k = Ri/Re about A, and it lies on the front cone (the back cone scaled by k about A). So
every face is known in closed form:

* flank pieces: ruled surfaces between the large-end curve C(u) and A + k (C(u) − A). With C a
  B-spline with poles P_i, the surface with poles P_i (v = 0) and A + k (P_i − A) (v = 1),
  degree 1 in v, *is* that ruled surface: every ruling runs through the apex (exact);
* tip and root lands: the cones through A over the tip and root circles (exact cones);
* back and front ends: the back and front cones, one face per tooth pitch (a sector from the
  start of a tooth to the start of the next), down to the blank's rim circles;
* blank: the back plane z = 0, an optional cylindrical shoulder, the front plane and the
  bore cylinder, all exact surfaces of revolution or planes.

The large-end flank curves are B-splines fitted through the back-cone samples within
:data:`gen.solid.kernel.SPLINE_FIT`; their pcurves on the back cone are fitted to the same
samples at the same curve parameters, and the largest distance between the two (measured at
points between the samples) becomes those edges' tolerance (about 1e-7 mm, never above
:data:`APEX_EDGE_TOL`).
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.geometry.bevel import BevelSizes, bevel_tooth_outline_3d, blank_profile

from gen.solid.faces import Builder
from gen.solid.kernel import KERNEL_TOL, SPLINE_FIT

#: largest edge tolerance (mm) accepted between a flank edge and its pcurve on a cone
APEX_EDGE_TOL = 1e-5
#: points of the 3-D flank fit per sample interval (taken on the cone image of the pcurve)
DENSE = 4


class _Cone:
    """Cone about Z: P(u, v) = (0, 0, z0) + (r0 + v sin a) (cos u, sin u, 0) + v cos a ẑ."""

    def __init__(self, bld: Builder, z0: float, a: float, r0: float):
        if not (1e-9 < abs(a) < 0.5 * math.pi - 1e-9):
            raise GeometryError("bevel gear cone angle out of range for a direct solid")
        o = bld.o
        self.z0, self.a, self.r0 = z0, a, r0
        self.surface = o.Geom_ConicalSurface(
            o.gp_Ax3(o.gp_Pnt(0.0, 0.0, z0), o.gp_Dir(0.0, 0.0, 1.0), o.gp_Dir(1.0, 0.0, 0.0)),
            a, r0)

    def point(self, u, v) -> np.ndarray:
        u, v = np.asarray(u, float), np.asarray(v, float)
        r = self.r0 + v * math.sin(self.a)
        return np.stack([r * np.cos(u), r * np.sin(u), self.z0 + v * math.cos(self.a)], axis=-1)

    def copy(self, bld: Builder) -> object:
        """A new surface handle of the same cone."""
        return _Cone(bld, self.z0, self.a, self.r0).surface


def _arr_pnt(o, pts):
    a = o.TColgp_Array1OfPnt(1, len(pts))
    for i, p in enumerate(pts, 1):
        a.SetValue(i, o.gp_Pnt(float(p[0]), float(p[1]), float(p[2])))
    return a


def _arr_pnt2d(o, pts):
    a = o.TColgp_Array1OfPnt2d(1, len(pts))
    for i, p in enumerate(pts, 1):
        a.SetValue(i, o.gp_Pnt2d(float(p[0]), float(p[1])))
    return a


def _bspline_data(c):
    n = c.NbPoles()
    knots = [c.Knot(i) for i in range(1, c.NbKnots() + 1)]
    mults = [c.Multiplicity(i) for i in range(1, c.NbKnots() + 1)]
    return n, knots, mults


class _FlankCurve:
    """Large-end flank curve: 3-D B-spline and its pcurve on the back cone, same parameter."""

    def __init__(self, bld: Builder, pts3: np.ndarray, theta: np.ndarray, rho: np.ndarray,
                 back: _Cone):
        o = bld.o
        self._arr = []   # OCC knot arrays, filled on first use
        seg = np.linalg.norm(np.diff(pts3, axis=0), axis=1)
        t = np.concatenate([[0.0], np.cumsum(seg)])
        # 1. the pcurve: θ (as an arc length, so the tolerance is in mm) and ρ against t
        scale = float(np.mean(rho))
        uv = np.column_stack([theta * scale, rho])
        f2 = o.Geom2dAPI_PointsToBSpline(_arr_pnt2d(o, uv), bld.reals(t), 3, 3, o.GeomAbs_C2,
                                         0.25 * SPLINE_FIT)
        if not f2.IsDone():
            raise GeometryError("could not fit a B-spline through the bevel flank samples")
        c2 = f2.Curve()
        n2, k2, m2 = _bspline_data(c2)
        Q = np.array([[c2.Pole(i).X() / scale, c2.Pole(i).Y()] for i in range(1, n2 + 1)])
        Q[0], Q[-1] = (theta[0], rho[0]), (theta[-1], rho[-1])
        k2 = np.array(k2)  # the 2-D fit normalises the parameters to 0 … 1: map them back
        k2 = t[0] + (k2 - k2[0]) / (k2[-1] - k2[0]) * (t[-1] - t[0])
        self.uv_poles, self.uv_knots, self.uv_mults = Q, k2, m2
        # 2. the 3-D curve: fitted to points of the cone image of the pcurve, DENSE times
        # denser than the samples, so that between them it cannot leave the cone (a chord
        # of the samples would, by the cone's normal curvature: ~1e-5 mm on small gears)
        self.t = t
        td = np.concatenate([t[:-1, None] + np.diff(t)[:, None] * np.arange(DENSE) / DENSE,
                             t[-1:, None]], axis=None)
        c2u = o.Geom2d_BSplineCurve(_arr_pnt2d(o, Q), bld.reals(k2), bld.ints(m2), 3)
        uvd = np.array([[q.X(), q.Y()] for q in (c2u.Value(float(x)) for x in td)])
        pd = back.point(uvd[:, 0], uvd[:, 1])
        pd[0], pd[-1] = pts3[0], pts3[-1]
        f3 = o.GeomAPI_PointsToBSpline(_arr_pnt(o, pd), bld.reals(td), 3, 3, o.GeomAbs_C2,
                                       SPLINE_FIT)
        if not f3.IsDone():
            raise GeometryError("could not fit a B-spline through the bevel flank samples")
        c3 = f3.Curve()
        n3, k3, m3 = _bspline_data(c3)
        P = np.array([[c3.Pole(i).X(), c3.Pole(i).Y(), c3.Pole(i).Z()] for i in range(1, n3 + 1)])
        if max(np.linalg.norm(P[0] - pts3[0]), np.linalg.norm(P[-1] - pts3[-1])) > SPLINE_FIT:
            raise GeometryError("the bevel flank fit moved a curve end")
        P[0], P[-1] = pts3[0], pts3[-1]
        k3 = np.array(k3)
        k3 = t[0] + (k3 - k3[0]) / (k3[-1] - k3[0]) * (t[-1] - t[0])
        self.poles, self.knots, self.mults = P, k3, m3
        self._td = td
        self.deviation = self._deviation(bld, back)

    def rotated(self, angle: float, start, end, theta0: float) -> "_FlankCurve":
        """The same curve turned by ``angle`` about Z (exact on the poles), ends snapped."""
        c, s = math.cos(angle), math.sin(angle)
        new = object.__new__(_FlankCurve)
        P = self.poles @ np.array([[c, s, 0.0], [-s, c, 0.0], [0.0, 0.0, 1.0]])
        P[0], P[-1] = start, end
        Q = self.uv_poles.copy()
        Q[:, 0] += theta0 - Q[0, 0]
        new.poles, new.knots, new.mults = P, self.knots, self.mults
        new.uv_poles, new.uv_knots, new.uv_mults = Q, self.uv_knots, self.uv_mults
        new.t, new.deviation = self.t, self.deviation
        new._arr = self._arr        # one list, filled on first use, shared by every copy
        return new

    def arrays(self, bld: Builder):
        """OCC knot and multiplicity arrays (made once, shared by the turned copies: the
        kernel copies them into each curve)."""
        if not self._arr:
            self._arr.append((bld.reals(self.knots), bld.ints(self.mults),
                          bld.reals(self.uv_knots), bld.ints(self.uv_mults)))
        return self._arr[0]

    def curve3d(self, bld: Builder, apex=None, k: float = 1.0):
        o = bld.o
        P = self.poles if apex is None else apex + k * (self.poles - apex)
        K, M, _, _ = self.arrays(bld)
        return o.Geom_BSplineCurve(_arr_pnt(o, P), K, M, 3)

    def pcurve(self, bld: Builder, k: float = 1.0):
        o = bld.o
        Q = self.uv_poles * np.array([1.0, k])
        _, _, K, M = self.arrays(bld)
        return o.Geom2d_BSplineCurve(_arr_pnt2d(o, Q), K, M, 3)

    def _deviation(self, bld: Builder, back: _Cone) -> float:
        """Largest distance (mm) between the 3-D curve and the cone image of its pcurve."""
        c3, c2 = self.curve3d(bld), self.pcurve(bld)
        ts = np.concatenate([self._td, 0.5 * (self._td[1:] + self._td[:-1])])
        p3 = np.array([[q.X(), q.Y(), q.Z()] for q in (c3.Value(float(x)) for x in ts)])
        uv = np.array([[q.X(), q.Y()] for q in (c2.Value(float(x)) for x in ts)])
        return float(np.max(np.linalg.norm(p3 - back.point(uv[:, 0], uv[:, 1]), axis=1)))


def _circle(bld: Builder, r: float, z: float):
    o = bld.o
    return o.Geom_Circle(o.gp_Ax2(o.gp_Pnt(0.0, 0.0, float(z)), o.gp_Dir(0.0, 0.0, 1.0),
                                  o.gp_Dir(1.0, 0.0, 0.0)), float(r))


def _circle2d(bld: Builder, r: float):
    o = bld.o
    return o.Geom2d_Circle(o.gp_Ax2d(o.gp_Pnt2d(0.0, 0.0), o.gp_Dir2d(1.0, 0.0)), float(r))


def _segment(bld: Builder, p0, p1, tol):
    """Degree-1 B-spline edge curve from p0 to p1, parameter 0 … 1."""
    o = bld.o
    return o.Geom_BSplineCurve(_arr_pnt(o, [p0, p1]), bld.reals([0.0, 1.0]), bld.ints([2, 2]), 1)


def _segment2d(bld: Builder, p0, p1):
    o = bld.o
    return o.Geom2d_BSplineCurve(_arr_pnt2d(o, [p0, p1]), bld.reals([0.0, 1.0]),
                                 bld.ints([2, 2]), 1)


def _line_edge(bld, p0, p1, v0, v1, tol):
    """Straight edge p0 → p1 as a Geom_Line, parameter = distance from p0."""
    o = bld.o
    d = np.asarray(p1, float) - np.asarray(p0, float)
    L = float(np.linalg.norm(d))
    g = o.Geom_Line(o.gp_Pnt(*map(float, p0)), o.gp_Dir(*map(float, d / L)))
    return bld.edge(g, v0, v1, 0.0, L, tol), L


def apex_shell(sizes: BevelSizes, bore_radius: float, flank):
    """Closed TopoDS_Solid of one straight bevel gear (unchecked; see :mod:`gen.solid.bevel`)."""
    bld = Builder()
    o = bld.o
    H = sizes.mounting_distance
    apex = np.array([0.0, 0.0, H])
    k = sizes.small_end_scale
    cd, sd = math.cos(sizes.delta), math.sin(sizes.delta)
    z_bc = H - sizes.Re * cd - sizes.rv * sd          # back-cone apex (gen.geometry.bevel)
    back = _Cone(bld, z_bc, 0.5 * math.pi - sizes.delta, 0.0)
    front = _Cone(bld, H + k * (z_bc - H), 0.5 * math.pi - sizes.delta, 0.0)

    outline = bevel_tooth_outline_3d(sizes, flank)
    curves = outline.curves
    z = sizes.z
    per = len(curves) // z
    if per * z != len(curves):
        raise GeometryError("bevel outline does not repeat tooth by tooth")
    starts = np.array([c.start for c in curves])
    theta = np.unwrap(np.arctan2(starts[:, 1], starts[:, 0]))
    theta = np.append(theta, theta[0] + 2.0 * math.pi)

    # --- fit the flank curves; one tolerance for every vertex and edge of the shell -------
    fits = {}
    for i, c in enumerate(curves):
        if c.kind == "spline" and i >= per:   # the teeth are copies of tooth 0 turned about Z
            f0 = fits[i % per]
            fits[i] = f0.rotated(theta[i] - theta[i % per], c.points[0], c.points[-1], theta[i])
        elif c.kind == "spline":
            th = np.unwrap(np.arctan2(c.points[:, 1], c.points[:, 0]))
            th += theta[i] - th[0]
            rh = np.hypot(c.points[:, 0], c.points[:, 1]) / cd
            fits[i] = _FlankCurve(bld, c.points, th, rh, back)
    dev = max((f.deviation for f in fits.values()), default=0.0)
    if dev > APEX_EDGE_TOL:
        raise GeometryError(f"bevel flank edges leave their cone by {dev:.2g} mm")
    tol = max(KERNEL_TOL, 2.0 * dev)

    n = len(curves)
    vb = [bld.vertex(*starts[i], tol) for i in range(n)]
    fpts = apex + k * (starts - apex)
    vf = [bld.vertex(*fpts[i], tol) for i in range(n)]

    # --- outline edges (back, front) and the rulings through the apex ---------------------
    eb, ef, rul = [], [], []
    arcs = {}
    for i, c in enumerate(curves):
        j = (i + 1) % n
        if c.kind == "spline":
            f = fits[i]
            e1 = bld.edge(f.curve3d(bld), vb[i], vb[j], f.t[0], f.t[-1], tol)
            e2 = bld.edge(f.curve3d(bld, apex, k), vf[i], vf[j], f.t[0], f.t[-1], tol)
        else:
            r, zc = float(np.hypot(*c.points[0, :2])), float(c.points[0, 2])
            a0, a1 = theta[i], theta[i + 1]
            arcs[i] = (r, zc, a0, a1)
            e1 = bld.edge(_circle(bld, r, zc), vb[i], vb[j], a0, a1, tol)
            e2 = bld.edge(_circle(bld, k * r, H + k * (zc - H)), vf[i], vf[j], a0, a1, tol)
        eb.append(e1)
        ef.append(e2)
        rul.append(bld.edge(_segment(bld, starts[i], fpts[i], tol), vb[i], vf[i], 0.0, 1.0, tol))

    faces = []
    v_knots, v_mults = bld.reals([0.0, 1.0]), bld.ints([2, 2])
    # --- lateral faces: ruled flanks, tip and root cones through the apex -----------------
    for i, c in enumerate(curves):
        j = (i + 1) % n
        if c.kind == "spline":
            f = fits[i]
            P0 = f.poles
            P1 = apex + k * (P0 - apex)
            nu = len(P0)
            P = o.TColgp_Array2OfPnt(1, nu, 1, 2)
            for a in range(nu):
                P.SetValue(a + 1, 1, o.gp_Pnt(*map(float, P0[a])))
                P.SetValue(a + 1, 2, o.gp_Pnt(*map(float, P1[a])))
            K, Mu, _, _ = f.arrays(bld)
            S = o.Geom_BSplineSurface(P, K, v_knots, Mu, v_mults, 3, 1)
            u0, u1 = f.t[0], f.t[-1]
            bld.pcurve(eb[i], bld.iso_line(v=0.0), S)
            bld.pcurve(ef[i], bld.iso_line(v=1.0), S)
            bld.pcurve(rul[i], bld.iso_line(u=u0), S)
            bld.pcurve(rul[j], bld.iso_line(u=u1), S)
        else:
            r, zc, a0, a1 = arcs[i]
            L = math.hypot(r, H - zc)
            cone = _Cone(bld, zc, math.atan2(-r, H - zc), r)
            S = cone.surface
            vt = (1.0 - k) * L
            bld.pcurve(eb[i], bld.iso_line(v=0.0), S)
            bld.pcurve(ef[i], bld.iso_line(v=vt), S)
            bld.pcurve(rul[i], _segment2d(bld, (a0, 0.0), (a0, vt)), S)
            bld.pcurve(rul[j], _segment2d(bld, (a1, 0.0), (a1, vt)), S)
        faces.append(bld.face(S, [bld.wire([(eb[i], True), (rul[j], True), (ef[i], False),
                                            (rul[i], False)])]))

    # --- the blank: rims of the back and front cones, planes, shoulder, bore --------------
    prof = blank_profile(sizes, bore_radius)
    shoulder = len(prof) == 7
    r_bl, z_bl = prof[-5]                  # lowest circle of the back cone
    r_fl, z_fl = prof[-2]                  # lowest circle of the front cone (front face rim)
    v_bl, v_fl = r_bl / cd, r_fl / cd
    sec = [theta[t * per] for t in range(z + 1)]   # sector boundaries: tooth starts

    def ring(r, zc):
        return _ring_at(bld, r, zc, sec, tol)

    vbl, ebl = ring(r_bl, z_bl)
    vfl, efl = ring(r_fl, z_fl)
    for cone, vl, el, vo, eo, hi, v_low, scale, outward in (
            (back, vbl, ebl, vb, eb, starts, v_bl, 1.0, True),
            (front, vfl, efl, vf, ef, fpts, v_fl, k, False)):
        lines = []   # the generator at each sector boundary, rim to tooth start
        for t in range(z):
            e, _ = _line_edge(bld, cone.point(sec[t], v_low), hi[t * per], vl[t], vo[t * per],
                              tol)
            lines.append(e)
        lines.append(lines[0])
        for t in range(z):
            S = cone.copy(bld)   # one surface per sector: no edge has two pcurves on one
            i0, i1 = t * per, (t + 1) * per
            bld.pcurve(lines[t], _line2d(bld, sec[t], v_low), S)
            bld.pcurve(lines[t + 1], _line2d(bld, sec[t + 1], v_low), S)
            bld.pcurve(el[t], bld.iso_line(v=v_low), S)
            wire = [(el[t], True), (lines[t + 1], True)]
            for i in range(i1 - 1, i0 - 1, -1):
                if i in fits:
                    bld.pcurve(eo[i], fits[i].pcurve(bld, scale), S)
                else:
                    bld.pcurve(eo[i], bld.iso_line(v=scale * arcs[i][0] / cd), S)
                wire.append((eo[i], False))
            wire.append((lines[t], False))
            f = bld.face(S, [bld.wire(wire)])
            faces.append(f if outward else f.Reversed())

    # back face (plane z = 0), optional shoulder, front face, bore
    if shoulder:
        vsh, esh = ring(r_bl, 0.0)
        faces += _band(bld, r_bl, 0.0, z_bl, sec, vsh, esh, vbl, ebl, tol, outward=True)
        back_rim = esh
    else:
        back_rim = ebl
    holes = {}
    if bore_radius > 0.0:
        half = [0.0, math.pi, 2.0 * math.pi]
        vlo, elo = _ring_at(bld, bore_radius, 0.0, half, tol)
        vhi, ehi = _ring_at(bld, bore_radius, z_fl, half, tol)
        faces += _band(bld, bore_radius, 0.0, z_fl, half, vlo, elo, vhi, ehi, tol,
                       outward=False)
        holes = {0.0: elo, z_fl: ehi}
    for zc, rim, outward in ((0.0, back_rim, False), (z_fl, efl, True)):
        pl = bld.plane(zc)
        wires = [_plane_wire(bld, pl, rim, r_bl if zc == 0.0 else r_fl, True)]
        if zc in holes:
            wires.append(_plane_wire(bld, pl, holes[zc], bore_radius, False))
        f = bld.face(pl, wires)
        faces.append(f if outward else f.Reversed())
    return bld.solid(faces)


def _ring_at(bld, r, zc, angles, tol):
    """Circle r at height zc split at ``angles`` (last = first + 2π): vertices and edges."""
    vs = [bld.vertex(r * math.cos(a), r * math.sin(a), zc, tol) for a in angles[:-1]]
    vs.append(vs[0])
    g = _circle(bld, r, zc)
    return vs, [bld.edge(g, vs[t], vs[t + 1], angles[t], angles[t + 1], tol)
                for t in range(len(angles) - 1)]


def _band(bld, r, z0, z1, angles, vlo, elo, vhi, ehi, tol, outward):
    """Cylinder r from z0 to z1 in sectors between ``angles``, bounded by the two rings."""
    o = bld.o
    lines = []
    for t in range(len(angles) - 1):
        a = angles[t]
        p0 = (r * math.cos(a), r * math.sin(a), z0)
        p1 = (p0[0], p0[1], z1)
        lines.append(_line_edge(bld, p0, p1, vlo[t], vhi[t], tol)[0])
    lines.append(lines[0])
    faces = []
    for t in range(len(angles) - 1):
        S = o.Geom_CylindricalSurface(o.gp_Ax3(o.gp_Pnt(0.0, 0.0, float(z0)),
                                               o.gp_Dir(0.0, 0.0, 1.0), o.gp_Dir(1.0, 0.0, 0.0)),
                                      float(r))
        bld.pcurve(elo[t], bld.iso_line(v=0.0), S)
        bld.pcurve(ehi[t], bld.iso_line(v=z1 - z0), S)
        bld.pcurve(lines[t], _line2d(bld, angles[t], 0.0), S)
        bld.pcurve(lines[t + 1], _line2d(bld, angles[t + 1], 0.0), S)
        f = bld.face(S, [bld.wire([(elo[t], True), (lines[t + 1], True), (ehi[t], False),
                                   (lines[t], False)])])
        faces.append(f if outward else f.Reversed())
    return faces


def _plane_wire(bld, pl, edges, r, ccw):
    c2 = _circle2d(bld, r)
    for e in edges:
        bld.pcurve(e, c2, pl)
    seq = [(e, True) for e in edges] if ccw else [(e, False) for e in reversed(edges)]
    return bld.wire(seq)


def _line2d(bld, u, v0):
    """pcurve of a cone generator at angle u starting at v0, parameter = distance."""
    o = bld.o
    return o.Geom2d_Line(o.gp_Pnt2d(float(u), float(v0)), o.gp_Dir2d(0.0, 1.0))
