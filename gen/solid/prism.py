"""B-rep solids of straight, twisted (helical), sheared and chevron prisms: the public builders.

OCP is imported lazily, inside the functions (:func:`gen.solid.kernel.occ`); the builders
return ``TopoDS_Solid`` (``gen.api.to_cadquery`` wraps one for cadquery users). Input is the
neutral description of :mod:`gen.geometry.body`.

* Straight prism: one planar face with holes (lines, circles, fitted B-splines) extruded by
  ``BRepPrimAPI_MakePrism``; a sheared (helical rack) prism is the same face extruded along
  the oblique vector (shear·h, 0, h), exact; a sheared chevron is two such prisms.
* Twisted or chevron prism: faces built directly with shared edges (:mod:`gen.solid.faces`),
  no sweep, no sewing; circular bores and straight through-cuts that stay clear of the moving
  boundary become lateral faces of the same shell, so no boolean touches a twisted face.
* Other cuts and multi-solid unions fall back to OCC booleans on the result.

Measured costs of the routes tried: ``benchmarks/README.md``.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.geometry.body import Body, Prism, plan_cuts
from gen.geometry.section import Arc, Line, Loop

from gen.geometry.cap_split import cap_cuts
from gen.geometry.stack import stack_layout
from gen.solid.faces import Builder, Track, lateral_shell
from gen.solid.stack import stack_shell
from gen.solid.kernel import HELIX_FIT, KERNEL_TOL  # noqa: F401  (HELIX_FIT re-exported)
from gen.solid.kernel import as_solid, check_solid, occ
from gen.geometry.stack import fixed_loop
from gen.solid.nurbs import loop_nurbs, oriented_curves, section_spline_nurbs


def _curve_edge(bld: Builder, c, v0, v1, p0, p1, z: float):
    """Edge of one section curve at height z between vertices v0, v1 (points p0, p1), exact:
    a line, a circle, or the fitted B-spline."""
    o = bld.o
    if isinstance(c, Line):
        L = float(np.hypot(*(p1 - p0)))
        d = (p1 - p0) / L
        g = o.Geom_Line(o.gp_Pnt(float(p0[0]), float(p0[1]), z),
                        o.gp_Dir(float(d[0]), float(d[1]), 0.0))
        return bld.edge(g, v0, v1, 0.0, L)
    if isinstance(c, Arc):
        sense = 1.0 if c.a1 > c.a0 else -1.0
        ax = o.gp_Ax2(o.gp_Pnt(float(c.center[0]), float(c.center[1]), z),
                      o.gp_Dir(0.0, 0.0, sense), o.gp_Dir(1.0, 0.0, 0.0))
        g = o.Geom_Circle(ax, float(c.radius))
        return bld.edge(g, v0, v1, sense * c.a0, sense * c.a1)
    nb = section_spline_nurbs(c)
    nb.poles[0], nb.poles[-1] = p0, p1
    return bld.edge(bld.curve3d(nb, nb.poles[:, 0], nb.poles[:, 1], z), v0, v1, nb.knots[0],
                    nb.knots[-1])


def _loop_edges(bld: Builder, curves, z: float):
    """(vertices, edges) of a closed chain of oriented curves at height z, shared in turn."""
    pts = [np.asarray(c.start, dtype=float) for c in curves]
    # arcs end where their angles say; the next curve may start up to JUNCTION_GAP away
    tol = max(KERNEL_TOL, 2.0 * Loop(tuple(curves)).gaps())
    verts = [bld.vertex(p[0], p[1], z, tol) for p in pts]
    n = len(curves)
    edges = [_curve_edge(bld, c, verts[i], verts[(i + 1) % n], pts[i], pts[(i + 1) % n], z)
             for i, c in enumerate(curves)]
    return verts, edges


def _planar_face(bld: Builder, loops, z: float):
    """Planar face at height z from oriented loops (outer ccw first, holes cw), exact curves."""
    wires = [bld.wire([(e, True) for e in _loop_edges(bld, curves, z)[1]]) for curves in loops]
    return bld.face(bld.plane(z), wires)


def _extruded(prism: Prism, extra_holes=()) -> object:
    """Straight or sheared prism by ``BRepPrimAPI_MakePrism`` of the bottom face.

    A sheared chevron is two prisms: the second grows from the first one's top face, so
    both share that face's edges, and their faces less the mid face make one closed shell.
    """
    bld = Builder()
    o = bld.o
    loops = [oriented_curves(prism.section.outer, True)]
    loops += [oriented_curves(h, False) for h in tuple(prism.section.holes) + tuple(extra_holes)]
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
        if prism.shear == 0.0 and fixed_loop(loop):
            straight = True
        curves = loop_nurbs(loop, ccw)
        rho = max(float(np.max(np.hypot(nb.poles[:, 0], nb.poles[:, 1]))) for nb in curves)
        tracks.append(Track(curves, None if straight else prism, rho))
    return tracks


def _split_cap_prism(prism: Prism, extra_holes=()):
    """A long straight prism whose caps are cut into pieces (:mod:`gen.geometry.cap_split`):
    the bottom pieces (sharing their cut edges) extruded together, less the faces the cuts
    sweep; None when the section has no cut to make."""
    holes = [oriented_curves(h, False) for h in tuple(prism.section.holes) + tuple(extra_holes)]
    cc = cap_cuts(oriented_curves(prism.section.outer, True),
                  tuple(prism.section.holes) + tuple(extra_holes))
    if cc is None:
        return None
    bld = Builder()
    o = bld.o
    z = prism.z0
    curves = list(cc.curves)
    verts, edges = _loop_edges(bld, curves, z)
    n, m = len(curves), len(cc.cuts)
    back = cc.back
    tops = {k + 1: top for k, (top, _) in enumerate(cc.cuts)}
    cut_x = [float(curves[back[k]].p1[0]) for k in range(m)]
    cuts = {}
    for k in range(1, m + 1):
        lo = np.asarray(curves[(back[k - 1] + 1) % n].start, dtype=float)
        hi = np.asarray(curves[tops[k]].start, dtype=float)
        cuts[k] = _curve_edge(bld, Line(tuple(lo), tuple(hi)), verts[(back[k - 1] + 1) % n],
                              verts[tops[k]], lo, hi, z)
    hole_wires = []
    for h in holes:
        hx = float(np.mean([np.asarray(c.start, dtype=float)[0] for c in h]))
        hole_wires.append((hx, bld.wire([(e, True) for e in _loop_edges(bld, h, z)[1]])))
    pieces = []
    for p in range(m + 1):
        seq = [(edges[back[p]], True)]
        i = tops[p + 1] if p < m else (back[m] + 1) % n
        if p < m:
            seq.append((cuts[p + 1], True))
        stop = tops[p] if p > 0 else back[0]
        while i != stop:
            seq.append((edges[i], True))
            i = (i + 1) % n
        if p > 0:
            seq.append((cuts[p], False))
        lo_x = cut_x[p - 1] if p > 0 else -np.inf
        hi_x = cut_x[p] if p < m else np.inf
        wires = [bld.wire(seq)] + [w for hx, w in hole_wires if lo_x < hx < hi_x]
        pieces.append(bld.face(bld.plane(z), wires))
    shell = o.TopoDS_Shell()
    bld.b.MakeShell(shell)
    for f in pieces:
        bld.b.Add(shell, f)
    mk = o.BRepPrimAPI_MakePrism(shell, o.gp_Vec(0.0, 0.0, prism.z1 - prism.z0))
    mk.Build()
    if not mk.IsDone():
        raise GeometryError("extrusion of the cut section failed")
    inner = []
    for e in cuts.values():
        inner.extend(mk.Generated(e))
    faces = []   # every face but the swept cuts belongs to one piece's solid only
    ex = o.TopExp_Explorer(mk.Shape(), o.TopAbs_FACE)
    while ex.More():
        f = ex.Current()
        if not any(f.IsSame(s) for s in inner):
            faces.append(f)
        ex.Next()
    return bld.solid(faces)


def _raw_prism(prism: Prism, extra_holes=()):
    if prism.straight and prism.shear == 0.0:
        split = _split_cap_prism(prism, extra_holes)
        if split is not None:
            return split
    if prism.straight or (prism.twist == 0.0 and not extra_holes):
        return _extruded(prism, extra_holes)
    return lateral_shell(_tracks(prism, extra_holes), prism.z0, prism.z1)



def prism_solid(prism: Prism, check: bool = True):
    """``TopoDS_Solid`` of one prism (straight, twisted, sheared or chevron); validity checked."""
    shape = _raw_prism(prism)
    if check:
        check_solid(shape, "prism")
    return as_solid(shape)


def radial_hole_solid(hole):
    """Cylinder (``TopoDS_Shape``) of a :class:`gen.geometry.body.RadialHole`: axis from radius
    ``r0`` to ``r1`` (mm) along the hole's polar angle at height ``z``, full turn."""
    from OCP.BRepPrimAPI import BRepPrimAPI_MakeCylinder

    o = occ()
    c, s = math.cos(hole.angle), math.sin(hole.angle)
    ax = o.gp_Ax2(o.gp_Pnt(hole.r0 * c, hole.r0 * s, hole.z), o.gp_Dir(c, s, 0.0))
    return BRepPrimAPI_MakeCylinder(ax, hole.diameter / 2.0, hole.r1 - hole.r0,
                                    2.0 * math.pi).Shape()


def body_solid(body: Body, check: bool = True):
    """``TopoDS_Solid`` of ``body``: union of its prisms minus its cuts.

    A stack of prisms (:mod:`gen.geometry.stack`) is one shell built face by face.
    Straight through-cuts that :func:`plan_cuts` can place become plain holes of the faces;
    the rest, and unions of several prisms, use OCC booleans (their cost is in the bench).
    """
    o = occ()
    plan = plan_cuts(body)
    layout = stack_layout(body, plan)
    if layout is not None:   # one shell, no union (gen.geometry.stack)
        shapes = [stack_shell(body.solids, layout)]
    else:
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
        op = o.BRepAlgoAPI_Cut(shape, radial_hole_solid(h))
        if not op.IsDone():
            raise GeometryError("drilling a set-screw hole failed")
        shape = op.Shape()
    if check:
        check_solid(shape, "body")
    return as_solid(shape)

