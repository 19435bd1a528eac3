"""Involute flanks of twisted prisms meshed along their straight lines (numpy only).

An involute of base radius r_b turned about its centre at κ rad/mm sweeps a developable
surface ruled by straight lines tangent to the base helix. With t the roll angle of a
section point (r = r_b √(1 + t²), polar angle α₀ + ε (t − atan t), ε = ±1 the flank's
sense), the point of roll t at height z lies on the line

    s = t + ε κ (z − z_a) = const,

so in the sheared coordinates (s, z) the flank of one stage is a parallelogram whose lines
are vertical. Its boundary vertices are the flank's polygon vertices at the two stage ends,
the images of the other end's vertices along the lines (so that every triangle stays between
two neighbouring lines) and the vertex columns of the fillet and tip on its two sides; the
parallelogram is triangulated by zipping its lower and upper chains in order of s.

Error bound (derivation computed, in the frame of the twist-walls bound of
:mod:`gen.triangles.twist_walls`): untwisting a point Σ λ_i X_i of a triangle to its own
height gives Σ λ_i [inv(σ_i) + r_b φ_i T(σ_i)] with σ_i spread Δ (the triangle's spread in s),
|φ_i| ≤ δ = |κ| × its height range, Σ λ_i φ_i = 0, T the involute's unit normal. The first
sum lies within the involute's sagitta over Δ, r_b σ Δ²/8 (curvature radius r_b σ); expanding
T about the mean, the second is a slide along the curve of at most r_b δ Δ/4 (a weighted
covariance, Popoviciu) — worth (r_b δ Δ/4)²/(2 r_b σ_min) off it — plus a normal part of at most
r_b δ Δ²/8 and a third-order rest r_b δ Δ³/6. A loop whose flank triangles would exceed the
tolerance keeps the column walls instead.

Measured (herringbone m_n 2, z 40, β 30°, 2 × 10 mm, tol 0.01 mm): see ``benchmarks/README.md``.
"""

from __future__ import annotations


from functools import lru_cache

import numpy as np

from gen.geometry.involute import inv, pressure_angle_at
from gen.geometry.section import Exact
from gen.triangles.twist_walls import largest_within

#: positions of a flank's samples must follow the involute formula within this (mm)
INVOLUTE_FIT = 1e-7


def _inv(r: np.ndarray, rb: float) -> np.ndarray:
    """inv α_r of the involute of base radius r_b at radius r (ISO 21771)."""
    return inv(pressure_angle_at(rb, r))


def involute_params(spline) -> tuple | None:
    """(r_b, ε, α₀) when ``spline``'s exact curve is an involute of a circle about the origin
    (checked on 41 points within :data:`INVOLUTE_FIT`), else None. Curves that are one shape
    turned about the origin (a gear's teeth) are fitted once; a spline without its exact
    curve is checked on its own samples."""
    e = getattr(spline, "exact", None)
    if e is None:   # the samples alone (a ring gear's generated flank): they must fit too
        pts = np.asarray(getattr(spline, "points", ()), dtype=float)
        if len(pts) < 8:
            return None
        # every tooth's flank is one shape turned: fitted once, turned to its first sample
        a = float(np.arctan2(pts[0, 1], pts[0, 0]))
        c, s = np.cos(-a), np.sin(-a)
        key = np.round(np.column_stack([c * pts[:, 0] - s * pts[:, 1],
                                        s * pts[:, 0] + c * pts[:, 1]]), 9)
        got = _samples_params(key.tobytes(), len(key))
        return None if got is None else (got[0], got[1], got[2] + a)
    if tuple(e.shift) == (0.0, 0.0):
        try:
            got = _source_params(e.source, e.flip)
        except TypeError:               # a source that cannot be a cache key
            got = _params(Exact(e.source, 0.0, (0.0, 0.0), e.flip))
        return None if got is None else (got[0], got[1], got[2] + e.angle)
    return _params(e)


@lru_cache(maxsize=256)
def _samples_params(raw: bytes, n: int):
    return _fit(np.frombuffer(raw, dtype=float).reshape(n, 2))


@lru_cache(maxsize=64)
def _source_params(source, flip: bool):
    return _params(Exact(source, 0.0, (0.0, 0.0), flip))


def _params(e) -> tuple | None:
    return _fit(e.at(np.linspace(0.0, 1.0, 41)))


def _fit(p: np.ndarray) -> tuple | None:
    """(r_b, ε, α₀) of the involute through the points ``p`` (ordered along the curve), when
    every one lies within :data:`INVOLUTE_FIT` of it."""
    r = np.hypot(p[:, 0], p[:, 1])
    phi = np.unwrap(np.arctan2(p[:, 1], p[:, 0]))
    i, j = int(np.argmin(r)), int(np.argmax(r))
    if r[j] - r[i] < 1e-6 or not np.all(np.diff(r) * np.sign(r[-1] - r[0]) > 0):
        return None
    dphi = phi[j] - phi[i]
    eps = 1.0 if dphi > 0 else -1.0

    def gap(rb):   # the involute's turn from r_i to r_j at base radius rb, minus the curve's
        return float(_inv(np.array([r[j]]), rb)[0] - _inv(np.array([r[i]]), rb)[0]) - abs(dphi)

    lo, hi = 1e-9 * r[i], r[i]          # the turn falls as r_b grows toward r_i
    if gap(lo) < 0 or gap(hi) > 0:
        return None
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if gap(mid) > 0:
            lo = mid
        else:
            hi = mid
        if hi - lo <= 1e-15 * r[i]:
            break
    rb = 0.5 * (lo + hi)
    alpha0 = phi[i] - eps * _inv(r[i:i + 1], rb)[0]
    want = alpha0 + eps * _inv(r, rb)
    if np.max(np.abs(want - phi) * r) > INVOLUTE_FIT:
        return None
    return rb, eps, float(alpha0)


def roll(points: np.ndarray, rb: float) -> np.ndarray:
    """Roll angles t of points on an involute of base radius r_b."""
    r = np.hypot(points[:, 0], points[:, 1])
    return np.sqrt(np.maximum(r * r / (rb * rb) - 1.0, 0.0))


def involute_points(t: np.ndarray, rb: float, eps: float, alpha0: float) -> np.ndarray:
    """Section points (n, 2) of roll angles ``t`` on the involute (r_b, ε, α₀): radius
    r_b √(1 + t²), polar angle α₀ + ε inv α (t = tan α)."""
    t = np.asarray(t, dtype=float)
    r = rb * np.sqrt(1.0 + t * t)
    a = alpha0 + eps * inv(np.arctan(t))
    return np.column_stack([r * np.cos(a), r * np.sin(a)])


def level_rolls(inner: np.ndarray, t_ends: tuple, shifts: list, merge: float) -> list:
    """Roll angles of a flank's vertices strictly between its two ends, at every stage level:
    the polygon's own ``inner`` rolls, plus the images of the neighbouring levels' vertices
    along the lines (stage j moves a roll by −``shifts[j]`` from its bottom to its top),
    repeated until no level gains one; images within ``merge`` of a vertex already there are
    not added."""
    lo, hi = min(t_ends), max(t_ends)
    levels = [np.sort(inner) for _ in range(len(shifts) + 1)]
    for _ in range(4):
        grew = False
        for j, d in enumerate(shifts):
            for k, moved in ((j + 1, levels[j] - d), (j, levels[j + 1] + d)):
                cand = moved[(moved > lo + merge) & (moved < hi - merge)]
                have = levels[k]
                if len(have):
                    near = np.min(np.abs(cand[:, None] - have[None, :]), axis=1) if len(cand) \
                        else np.zeros(0)
                    cand = cand[near > merge]
                if len(cand):
                    levels[k] = np.sort(np.concatenate([have, cand]))
                    grew = True
        if not grew:
            break
    return levels


def zip_patch(cycle_s: np.ndarray, cycle_z: np.ndarray, sense: float) -> np.ndarray:
    """Triangles (indices into the cycle) of a convex boundary cycle in the (s, z) plane: the
    two chains from the vertex of least s to the vertex of most s, zipped in order of s, each
    triangle turned counter-clockwise in (``sense`` · s, z)."""
    n = len(cycle_s)
    a, b = int(np.argmin(cycle_s)), int(np.argmax(cycle_s))
    fwd = [(a + k) % n for k in range((b - a) % n + 1)]            # a … b forwards
    bwd = [(a - k) % n for k in range((a - b) % n + 1)]            # a … b backwards
    tris = []
    if len(fwd) > 2 and len(bwd) > 2:
        tris.append((fwd[0], fwd[1], bwd[1]))
        i, j = 1, 1
    elif len(fwd) > 2:
        i, j = 0, 1
    else:
        i, j = 1, 0
    last_f, last_b = len(fwd) - 1, len(bwd) - 1
    while i < last_f - 1 or j < last_b - 1:
        adv_f = j >= last_b - 1 or (i < last_f - 1 and cycle_s[fwd[i + 1]] <= cycle_s[bwd[j + 1]])
        if adv_f:
            tris.append((fwd[i], bwd[j], fwd[i + 1]))
            i += 1
        else:
            tris.append((fwd[i], bwd[j], bwd[j + 1]))
            j += 1
    if i < last_f and j < last_b:       # both chains one short of the end vertex
        tris.append((fwd[i], bwd[j], fwd[last_f]))
    t = np.array(tris, dtype=np.int64)
    u, z = sense * cycle_s, cycle_z
    area = ((u[t[:, 1]] - u[t[:, 0]]) * (z[t[:, 2]] - z[t[:, 0]])
            - (u[t[:, 2]] - u[t[:, 0]]) * (z[t[:, 1]] - z[t[:, 0]]))
    t[area < 0] = t[area < 0][:, ::-1]
    return t


def _bound(d, delta, t_hi, t_lo, rb):
    """The module docstring's bound for s-spread ``d`` and turn ``delta`` between rolls
    t_lo … t_hi (all may be arrays)."""
    slide = rb * delta * d / 4.0
    return (rb * (t_hi + d) * d * d / 8.0 + rb * delta * d * d / 8.0
            + np.minimum(slide, slide * slide / (2.0 * rb * np.maximum(t_lo - d, 1e-12)))
            + rb * delta * d ** 3 / 6.0)


@lru_cache(maxsize=256)
def _widest(rb, turn, t_hi, t_lo, tol):
    return widest_gap(rb, turn, t_hi, t_lo, tol)


def widest_gap(rb: float, delta: float, t_hi: float, t_lo: float, tol: float) -> float:
    """The largest s-spread (≤ 1 rad) whose bound stays within ``tol`` for triangles turning
    up to ``delta`` between rolls t_lo … t_hi (the bound grows with the spread)."""
    return float(largest_within(lambda d: _bound(d, delta, t_hi, t_lo, rb), np.ones(1), tol)[0])


def run_widest(poly: np.ndarray, run, turn: float, tol: float) -> float:
    """The widest s-spread a triangle of ``run``'s flank may have (turn: the stage's largest
    turn, rad), with a tenth of ``tol`` kept for round-off and the bound's neglected terms."""
    i0, _, i1, (rb, _, _) = run
    t0, t1 = roll(poly[[i0, i1]], rb)
    return _widest(round(rb, 12), round(turn, 12), round(max(t0, t1), 12),
                   round(min(t0, t1), 12), 0.9 * tol)


def side_steps(poly: np.ndarray, runs: list, turn: float, tol: float) -> np.ndarray:
    """Least steps per polygon vertex over a stage turning ``turn``: the end columns of every
    flank take steps of at most its widest spread (a side chain's gap in s is the turn of one
    step)."""
    least = np.ones(len(poly), dtype=np.int64)
    for run in runs:
        n = int(np.ceil(turn / run_widest(poly, run, turn, tol) - 1e-9))
        least[[run[0], run[2]]] = np.maximum(least[[run[0], run[2]]], n)
    return least


def densified(rolls: np.ndarray, widest: float) -> np.ndarray:
    """``rolls`` (sorted, ends included) with equally spaced rolls added in every gap wider
    than ``widest``."""
    out = [rolls[:1]]
    for a, b in zip(rolls[:-1], rolls[1:]):
        k = int(np.ceil((b - a) / widest - 1e-9))
        out.append(a + (b - a) * np.arange(1, k + 1) / k)
    return np.concatenate(out)


def patch_bound(tris_local: np.ndarray, s: np.ndarray, z: np.ndarray, t: np.ndarray,
                rb: float, kappa: float) -> float:
    """Largest bound (mm) of the module docstring over triangles given as local corner
    indices into ``s``, ``z`` (mm) and roll ``t``."""
    S, Z, T = s[tris_local], z[tris_local], t[tris_local]
    bound = _bound(S.max(axis=1) - S.min(axis=1), abs(kappa) * (Z.max(axis=1) - Z.min(axis=1)),
                   T.max(axis=1), T.min(axis=1), rb)
    return float(bound.max()) if len(bound) else 0.0


def flank_runs(tags: np.ndarray, curves, reversed_: bool) -> list:
    """Runs of polygon vertices along involute section curves: (i0, inner indices, i1,
    (r_b, ε, α₀)), i0 and i1 the curve's two end vertices (kept as columns) in polygon order.
    ``tags``: the curve of each polygon vertex (a curve owns its start, not its end: that is
    the next curve's start); ``reversed_``: the polygon runs against the loop's curves."""
    n = len(tags)
    runs = []
    for ci in np.unique(tags):
        params = involute_params(curves[int(ci)])
        if params is None:
            continue
        idx = np.flatnonzero(tags == ci)
        if len(idx) < 2 or np.any(np.diff(idx) != 1):
            continue
        if reversed_:   # the far end (the next curve's start) comes first
            runs.append((int((idx[0] - 1) % n), idx[:-1], int(idx[-1]), params))
        else:
            runs.append((int(idx[0]), idx[1:], int((idx[-1] + 1) % n), params))
    return runs


def lines_shift(kappa: float, eps: float, h: float) -> float:
    """Roll change from a stage's bottom to its top along a line (s constant): ε κ h."""
    return eps * kappa * h


def ruled_walls(prism, poly: np.ndarray, runs: list, counts: list, pos: np.ndarray,
                offset: np.ndarray, first_levels: list, base: int, tol: float):
    """Vertices and triangles of the involute flanks of one loop of a twisted prism, meshed
    along their lines; None when a flank's triangles would not keep ``tol`` (mm).

    ``runs``: :func:`flank_runs`; ``counts[j][k]``: steps of column k in stage j, whose
    vertex at level l has the global index ``offset[k] + l`` (stage j starts at level
    ``first_levels[j][k]``); ``pos[i]``: the column of polygon vertex i; new vertices are
    numbered from ``base``. Returns (vertices (m, 3), triangles, per run the global indices of
    its vertices strictly between its end columns at every stage level, in polygon order).
    Flanks of the same shape (every tooth's) share one pattern of rolls and triangles."""
    stages = prism.stages()
    zl = [stages[0][0]] + [zb for _, zb, _ in stages]
    th = prism.motion(np.asarray(zl, dtype=float))[0]
    kappa = tuple(float(th[j + 1] - th[j]) / (zb - za) for j, (za, zb, _) in enumerate(stages))
    heights = tuple((float(za), float(zb)) for za, zb, _ in stages)
    verts, tris, inserts = [], [], []
    nxt = base
    for i0, inner, i1, (rb, eps, a0) in runs:
        k0, k1 = pos[i0], pos[i1]
        t_all = roll(poly[np.concatenate([[i0], inner, [i1]])], rb)
        sides = tuple((int(counts[j][k0]), int(counts[j][k1])) for j in range(len(stages)))
        got = _pattern(tuple(np.round(t_all, 12)), round(rb, 12), eps, kappa, heights, sides,
                       tol)
        if got is None:
            return None
        rolls, locals_ = got
        at_level = []
        for z, r in zip(zl, rolls):
            p = involute_points(r, rb, eps, a0)
            a, sh = prism.motion(np.full(len(r), z))
            c, sn = np.cos(a), np.sin(a)
            verts.append(np.column_stack([c * p[:, 0] - sn * p[:, 1] + sh,
                                          sn * p[:, 0] + c * p[:, 1], np.full(len(r), z)]))
            at_level.append(np.arange(nxt, nxt + len(r)))
            nxt += len(r)
        inserts.append(at_level)
        for j, ((n0, n1), local) in enumerate(zip(sides, locals_)):
            b0, b1 = offset[k0] + first_levels[j][k0], offset[k1] + first_levels[j][k1]
            idx = np.concatenate([[b0], at_level[j], [b1], b1 + np.arange(1, n1 + 1),
                                  at_level[j + 1][::-1], [b0 + n0], b0 + np.arange(n0 - 1, 0, -1)])
            tris.append(idx[local])
    if not verts:
        return np.zeros((0, 3)), np.zeros((0, 3), dtype=np.int64), inserts
    return np.concatenate(verts), np.concatenate(tris), inserts


@lru_cache(maxsize=256)
def _pattern(t_all: tuple, rb: float, eps: float, kappa: tuple, heights: tuple, sides: tuple,
             tol: float):
    """(rolls at every level in polygon order, per stage the patch's triangles as indices into
    its boundary cycle) of one flank: ``t_all`` its polygon rolls from end to end, ``sides``
    per stage the steps of its two end columns; None when the bound exceeds ``tol``."""
    t0, t1 = t_all[0], t_all[-1]
    turn = max(abs(k) * (zb - za) for k, (za, zb) in zip(kappa, heights))
    widest = _widest(round(rb, 12), round(turn, 12), round(max(t0, t1), 12),
                     round(min(t0, t1), 12), 0.9 * tol)
    ends = densified(np.sort(np.asarray(t_all)), widest)
    merge = 0.25 * float(np.median(np.diff(ends)))
    shifts = [eps * k * (zb - za) for k, (za, zb) in zip(kappa, heights)]
    rolls = level_rolls(ends[1:-1], (t0, t1), shifts, merge)
    if t1 < t0:
        rolls = [r[::-1] for r in rolls]
    locals_ = []
    for j, ((za, zb), (n0, n1)) in enumerate(zip(heights, sides)):
        m0, m1 = np.arange(1, n0), np.arange(1, n1 + 1)
        t = np.concatenate([[t0], rolls[j], [t1], np.full(n1, t1), rolls[j + 1][::-1], [t0],
                            np.full(n0 - 1, t0)])
        z = np.concatenate([np.full(len(rolls[j]) + 2, za), za + (zb - za) * m1 / n1,
                            np.full(len(rolls[j + 1]) + 1, zb), za + (zb - za) * m0[::-1] / n0])
        z[len(rolls[j]) + 1 + n1] = zb                       # the top corner, exactly
        s = t + eps * kappa[j] * (z - za)
        local = zip_patch(s, z, 1.0 if t1 > t0 else -1.0)
        if patch_bound(local, s, z, t, rb, kappa[j]) > tol:
            return None
        locals_.append(local)
    return rolls, locals_
