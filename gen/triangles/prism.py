"""Triangle meshes of straight, twisted, sheared and chevron prisms, without the CAD kernel.

Vertices are placed directly: each section loop becomes a polygon (arcs at a chordal
tolerance, spline samples thinned to it); every polygon vertex becomes a column of copies
moved by the prism's motion (:meth:`gen.geometry.body.Prism.place`) at its own heights, every
stage end included (a chevron's mid-height too); neighbouring columns are joined by strips of
triangles, and the two caps are triangulated once by ``manifold3d.triangulate`` (reused at the
top when the whole section moves rigidly). The mesh is closed by construction. Straight
through-cuts placed by :func:`gen.geometry.body.plan_cuts` become straight hole walls; unions
and other cuts use manifold3d booleans.

Tolerance: a straight or sheared wall is exact between its layers (S is linear in z), so its
error is the polygon's alone (``PROFILE_SHARE`` of the tolerance, the rest unused). A twisted
prism spends ``TWISTED_PROFILE_SHARE`` on the polygon and the rest on the twist: the number
of steps of each column comes from the error bound derived in
:mod:`gen.triangles.twist_walls` (helix sagitta along the chord's normal, mixed term of the
profile chord and the turn, third-order and slide terms), strip by strip. Involute flanks
(about the axis, turned without shear) have no columns inside: their surface is ruled by
straight lines, along which :mod:`gen.triangles.ruled_flanks` meshes them, with its own
bound; the fillet and tip columns at their ends take steps no longer than that allows.

Measured (2 cores; herringbone m_n 2, z 40, 2 × 10 mm, β 30°, 8 mm bore, tol 0.01 mm):
uniform layers (one global radius and chord for every column: 9 layers per half) gave 52,554
triangles; columns with their own steps give 28,384 (``benchmarks/bench_triangles.py``,
``benchmarks/README.md``). Earlier, against manifold3d: the direct route took 0.015 s,
``Manifold.extrude(n_divisions, twist_degrees)`` ×2 + union 0.31 s, ``extrude`` with
divisions + ``warp_batch`` 0.09 s, all watertight and agreeing in volume to 1e-9; the direct
route also lets straight holes stay straight in a twisted part.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.geometry.body import Body, Prism, plan_cuts
from gen.geometry.section import Arc, Line, Loop, Spline, signed_area
from gen.geometry.stack import fixed_loop
from gen.triangles.ruled_flanks import flank_runs, ruled_walls, side_steps
from gen.triangles.twist_walls import chord_terms, column_counts, stage_walls, strip_steps

#: share of the chordal tolerance spent on the section polygon of a straight or sheared prism
PROFILE_SHARE = 0.5
#: the same for a twisted prism (the rest bounds the twist: :mod:`gen.triangles.twist_walls`)
TWISTED_PROFILE_SHARE = 0.35   # fewest triangles over z 20/40/80 herringbones, 0.04…0.002 mm


# --------------------------------------------------------------------------- polygons
def _spline_polyline(points: np.ndarray, tol: float) -> np.ndarray:
    """Sample points thinned so that every chord stays within ``tol`` of the curve.

    A chord of length ℓ over a curve of curvature κ has sagitta κ ℓ²/8, so the curve needs
    ∫ √(κ / 8 tol) ds chords. κ is the curvature of the circle through three neighbouring
    samples (the larger of the two ends of each step is used); a point is kept at each
    0.9-unit increase of that integral. Then every chord is checked on the samples it
    replaces, and where one fails, the sample farthest from it is kept too (repeated until
    all pass): the refinement stays local, so a smaller tolerance never gives fewer points
    for a whole curve because of one failing chord.
    """
    p = np.asarray(points, dtype=float)
    n = len(p)
    if n <= 2:
        return p
    a, b, c = p[:-2], p[1:-1], p[2:]
    ab, bc, ca = (np.hypot(*(b - a).T), np.hypot(*(c - b).T), np.hypot(*(a - c).T))
    cross = np.abs((b - a)[:, 0] * (c - a)[:, 1] - (b - a)[:, 1] * (c - a)[:, 0])
    kappa = np.zeros(n)
    kappa[1:-1] = 2.0 * cross / np.maximum(ab * bc * ca, 1e-300)
    kappa[0], kappa[-1] = kappa[1], kappa[-2]
    step = np.hypot(*(p[1:] - p[:-1]).T)
    k_step = np.maximum(kappa[1:], kappa[:-1])
    units = np.concatenate([[0.0], np.cumsum(step * np.sqrt(k_step / (8.0 * tol)))]) / 0.9
    keep = np.zeros(n, dtype=bool)
    keep[0] = keep[-1] = True
    cell = np.floor(units)
    keep[1:-1] = cell[2:] > cell[1:-1]  # last sample before each unit boundary
    return p[refine_chords(p, np.nonzero(keep)[0], tol)]


def _chord_errors(p: np.ndarray, idx: np.ndarray):
    """(owner chord of each sample, distance of each sample from its owner chord)."""
    owner = np.searchsorted(idx, np.arange(len(p)), side="right") - 1
    owner = np.clip(owner, 0, len(idx) - 2)
    a, b = p[idx[owner]], p[idx[owner + 1]]
    d = b - a
    L = np.maximum(np.hypot(d[:, 0], d[:, 1]), 1e-300)
    return owner, np.abs(d[:, 0] * (p - a)[:, 1] - d[:, 1] * (p - a)[:, 0]) / L


def refine_chords(p: np.ndarray, idx: np.ndarray, tol: float) -> np.ndarray:
    """Indices ``idx`` (sorted, first and last kept) plus the samples needed so that no sample
    of ``p`` lies farther than ``tol`` from the chord that replaces it: each failing chord
    keeps its farthest sample, repeatedly (a Douglas–Peucker split where the check fails)."""
    idx = np.asarray(idx, dtype=int)
    while len(idx) < len(p):
        owner, err = _chord_errors(p, idx)
        bad = err > tol
        if not bad.any():
            break
        cand = np.nonzero(bad)[0]
        order = np.lexsort((-err[cand], owner[cand]))   # per chord, the farthest first
        cand = cand[order]
        first = np.ones(len(cand), dtype=bool)
        first[1:] = owner[cand][1:] != owner[cand][:-1]
        idx = np.union1d(idx, cand[first])
    return idx


def _max_chord_error(p: np.ndarray, idx: np.ndarray) -> float:
    return float(np.max(_chord_errors(p, idx)[1]))


def loop_polygon(loop: Loop, tol: float, ccw: bool = True) -> np.ndarray:
    """Closed polygon (last vertex not repeated) of ``loop`` within ``tol`` mm, in the given sense."""
    return tagged_polygon(loop, tol, ccw)[0]


def tagged_polygon(loop: Loop, tol: float, ccw: bool = True):
    """(polygon as :func:`loop_polygon`, the index in ``loop.curves`` of the curve each vertex
    starts or lies on, True when the polygon runs against the curves)."""
    parts, tags = [], []
    for c in loop.curves:
        if isinstance(c, Spline):
            parts.append(_spline_polyline(c.points, tol)[:-1])
        elif isinstance(c, (Arc, Line)):
            parts.append(c.polyline(tol)[:-1])
        else:
            raise GeometryError(f"unknown section curve {type(c).__name__}")
        tags.append(np.full(len(parts[-1]), len(tags)))
    poly = np.concatenate(parts, axis=0)
    tag = np.concatenate(tags)
    # vertices closer than this are one: curve junctions fitted apart by round-off would
    # otherwise give sliver facets that a re-read of the written STL counts as degenerate
    # (1/100 of the chord tolerance, at most 0.1 µm: no measurable change of the outline)
    merge = min(1e-4, 0.01 * tol)
    keep = np.hypot(*(poly - np.roll(poly, 1, axis=0)).T) > merge
    poly, tag = poly[keep], tag[keep]
    flip = (signed_area(poly) > 0) != ccw
    if flip:
        poly, tag = poly[::-1], tag[::-1]
    return poly, tag, flip


# --------------------------------------------------------------------------- assembly
def _loop_walls(prism: Prism, poly: np.ndarray, moving: bool, tol_t: float, base: int,
                tol: float = 0.0, runs=()):
    """(vertices (n, 3), wall triangles, bottom ring, top ring) of one loop: a column of
    vertices per polygon vertex, with its own steps per stage (:mod:`twist_walls`), except
    inside the involute flanks ``runs`` (:func:`gen.triangles.ruled_flanks.flank_runs`),
    meshed along their lines. The rings are the global indices of the cap loops in polygon
    order. None when a flank's lines would not keep ``tol``."""
    n = len(poly)
    stages = prism.stages() if moving else ((prism.z0, prism.z1, 1.0),)
    counts, leads, known = [], [], {}
    c_k = chord_terms(poly)[3] * prism.twist if moving else None  # sign of c·k per strip
    for za, zb, sign in stages:
        theta = abs(prism.twist) * (zb - za) if moving else 0.0
        if theta > 0.0:
            if theta not in known:   # the two halves of a chevron turn alike
                least = side_steps(poly, runs, theta, tol) if runs else None
                known[theta] = column_counts(*strip_steps(poly, theta, tol_t), theta, least)
            counts.append(known[theta])
            leads.append(c_k * sign > 0.0)
        else:
            counts.append(np.ones(n, dtype=np.int64))
            leads.append(np.zeros(n, dtype=bool))
    inner = np.zeros(n, dtype=bool)
    for _, ins, _, _ in runs:
        inner[ins] = True
    at_col = np.flatnonzero(~inner)                       # polygon index of each column
    pos = np.full(n, -1)
    pos[at_col] = np.arange(len(at_col))
    keep = np.ones(len(at_col), dtype=bool)               # strips meshed as columns
    for i0, _, _, _ in runs:
        keep[pos[i0]] = False
    counts = [c[at_col] for c in counts]
    leads = [ld[at_col] for ld in leads]
    pc, nc = poly[at_col], len(at_col)
    levels = 1 + np.sum(counts, axis=0)                   # vertices per column
    offset = base + np.concatenate([[0], np.cumsum(levels)[:-1]])
    cols, zs, lvls = [np.arange(nc)], [np.full(nc, float(prism.z0))], [np.zeros(nc, np.int64)]
    start = np.ones(nc, dtype=np.int64)                   # level of each stage's first step
    tris, firsts = [], []
    for (za, zb, _), cnt, lead in zip(stages, counts, leads):
        firsts.append(start - 1)
        tris.append(stage_walls(offset + start - 1, cnt, lead, keep))
        col = np.repeat(np.arange(nc), cnt)
        m = np.arange(len(col)) - np.repeat(np.cumsum(cnt) - cnt, cnt) + 1
        zs.append(np.where(m == cnt[col], zb, za + (zb - za) * m / cnt[col]))
        cols.append(col)
        lvls.append(start[col] + m - 1)
        start = start + cnt
    # scatter into column order: vertex (column i, level l) at offset[i] − base + l
    at = (offset - base)[np.concatenate(cols)] + np.concatenate(lvls)
    col, z = np.empty(len(at), dtype=np.int64), np.empty(len(at))
    col[at], z[at] = np.concatenate(cols), np.concatenate(zs)
    if moving:
        th, s = prism.motion(z)
        c, sn = np.cos(th), np.sin(th)
        p = pc[col]
        xy = np.column_stack([c * p[:, 0] - sn * p[:, 1] + s, sn * p[:, 0] + c * p[:, 1]])
    else:
        xy = pc[col]
    verts = np.column_stack([xy, z])
    bottom, top = offset, offset + levels - 1
    if not runs:
        return verts, np.concatenate(tris), bottom, top
    got = ruled_walls(prism, poly, runs, counts, pos, offset, firsts, base + len(verts), tol)
    if got is None:
        return None
    more, flank_tris, inserts = got
    after = {i0: ins for (i0, _, _, _), ins in zip(runs, inserts)}
    rings = []
    for ring, level in ((bottom, 0), (top, -1)):
        out = []
        for k, i in enumerate(at_col):
            out.append(ring[k:k + 1])
            if i in after:
                out.append(after[i][level])
        rings.append(np.concatenate(out))
    return (np.vstack([verts, more]), np.concatenate(tris + [flank_tris]), rings[0], rings[1])


def _prism_arrays(prism: Prism, tol: float, extra_holes=()):
    """(vertices (n, 3), triangles (m, 3)) of one prism with optional straight holes."""
    tol_p = (PROFILE_SHARE if prism.twist == 0.0 else TWISTED_PROFILE_SHARE) * tol
    loops = [(prism.section.outer, True, True)]
    # a round hole on the axis is its own image under any turn: its wall stays straight
    # (exact along z, one step) and needs no twist share; shear moves it like the rest
    loops += [(h, False, not (fixed_loop(h) and prism.shear == 0.0))
              for h in prism.section.holes]
    loops += [(h, False, False) for h in extra_holes]
    ruled = prism.twist != 0.0 and prism.shear == 0.0
    verts, tris, base = [], [], 0
    bottom, top = [], []  # global indices of each loop's cap ring
    any_runs = False
    for loop, ccw, mv in loops:
        poly, tags, flip = tagged_polygon(loop, tol_p, ccw)
        runs = flank_runs(tags, loop.curves, flip) if (ruled and mv) else []
        got = _loop_walls(prism, poly, mv, tol - tol_p, base, tol, runs) if runs else None
        if got is None:
            got = _loop_walls(prism, poly, mv, tol - tol_p, base)
        else:
            any_runs = True
        v, t, b, e = got
        verts.append(v)
        tris.append(t)
        bottom.append(b)
        top.append(e)
        base += len(v)
    allv = np.concatenate(verts)
    first = np.concatenate(bottom)
    last = np.concatenate(top)
    cap = _triangulate([allv[b][:, :2] for b in bottom])
    tris.append(first[cap][:, ::-1])  # bottom faces down
    rigid = all(mv for _, _, mv in loops) or prism.straight
    top_cap = cap if (rigid or prism.chevron) and not any_runs else _triangulate(
        [allv[e][:, :2] for e in top])
    tris.append(last[top_cap])
    return allv, np.concatenate(tris)


def _triangulate(polys) -> np.ndarray:
    import manifold3d

    return np.asarray(manifold3d.triangulate([np.ascontiguousarray(p) for p in polys]),
                      dtype=np.int64)


def _to_trimesh(vertices: np.ndarray, faces: np.ndarray):
    import trimesh

    return trimesh.Trimesh(vertices=vertices, faces=faces, process=False)


def _to_manifold(vertices: np.ndarray, faces: np.ndarray):
    import manifold3d

    m = manifold3d.Manifold(manifold3d.Mesh64(
        vert_properties=np.ascontiguousarray(vertices, dtype=np.float64),
        tri_verts=np.ascontiguousarray(faces, dtype=np.uint64)))
    if m.status() != manifold3d.Error.NoError:
        raise GeometryError(f"mesh of a prism is not a closed manifold ({m.status()})")
    return m


def _from_manifold(m):
    mesh = m.to_mesh64()
    return np.asarray(mesh.vert_properties)[:, :3], np.asarray(mesh.tri_verts, dtype=np.int64)


def prism_triangles(prism: Prism, tol: float = 0.01):
    """Closed trimesh.Trimesh of one prism, within ``tol`` mm of the exact surfaces."""
    if tol <= 0:
        raise GeometryError(f"mesh tolerance must be positive, got {tol}")
    return _to_trimesh(*_prism_arrays(prism, tol))


def body_triangles(body: Body, tol: float = 0.01):
    """Closed trimesh.Trimesh of ``body`` (union of prisms minus cuts), within ``tol`` mm."""
    if tol <= 0:
        raise GeometryError(f"mesh tolerance must be positive, got {tol}")
    plan = plan_cuts(body)
    parts = [_prism_arrays(p, tol, holes) for p, holes in zip(body.solids, plan.holes)]
    if len(parts) == 1 and not plan.booleans and not body.radial_holes:
        return _to_trimesh(*parts[0])
    import manifold3d

    m = manifold3d.Manifold.batch_boolean([_to_manifold(*a) for a in parts],
                                          manifold3d.OpType.Add)
    if plan.booleans:
        cuts = manifold3d.Manifold.batch_boolean(
            [_to_manifold(*_prism_arrays(c, tol)) for c in plan.booleans], manifold3d.OpType.Add)
        m = m - cuts
    for h in body.radial_holes:
        m = m - radial_hole_manifold(h, tol)
    if m.status() != manifold3d.Error.NoError or m.is_empty():
        raise GeometryError(f"mesh boolean of the body failed ({m.status()})")
    # booleans can leave slivers (a cut through a helical groove): collapse edges shorter than
    # 1/100 of the chord tolerance, far under what any measurement sees, so that the file as
    # written (float32) holds no degenerate facet
    m = m.simplify(0.01 * tol)
    return _to_trimesh(*_from_manifold(m))


def radial_hole_manifold(hole, tol: float = 0.01):
    """A cylinder along +X from r0 to r1, turned to the hole's angle and raised to its z."""
    import manifold3d as m3d

    r = hole.diameter / 2.0
    n = max(12, int(math.ceil(math.pi / math.acos(max(-1.0, 1.0 - tol / r)))))
    cyl = m3d.Manifold.cylinder(hole.r1 - hole.r0, r, r, n)   # along +Z from 0
    # turned half a facet about its axis: no vertex of the polygon sits on the hole's top or
    # bottom line, where it would meet section vertices of the body and leave needle facets
    cyl = cyl.rotate((0.0, 0.0, 180.0 / n))
    cyl = cyl.rotate((0.0, 90.0, 0.0)).translate((hole.r0, 0.0, 0.0))
    return cyl.rotate((0.0, 0.0, math.degrees(hole.angle))).translate((0.0, 0.0, hole.z))


def slice_polygons(mesh, z: float):
    """Closed outline polygons ((n, 2) arrays) of the mesh cut by the plane at height z."""
    sec = mesh.section(plane_origin=(0.0, 0.0, z), plane_normal=(0.0, 0.0, 1.0))
    if sec is None:
        return []
    return [np.asarray(d)[:, :2] for d in sec.discrete]
