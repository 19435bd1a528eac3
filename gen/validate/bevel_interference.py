"""Do assembled straight bevel gears overlap? Sections on spheres about the common apex.

Method. Straight bevel teeth are ruled surfaces through their pitch-cone apex, so a sphere
about the (common) apex cuts every gear in one closed curve per gear, and two correctly
mounted gears overlap somewhere exactly when those spherical sections overlap on some sphere
between the small and the large end. For each gear the large-end outline (points on the back
cone) is carried along its rulings to the sphere: the point A + t (q − A) with
|A + t (q − A) − O| = R, A the gear's own apex, O the sphere centre. This stays right when a
gear is mounted at a wrong distance (its apex then misses O): only rulings whose point lies
within the gear's own face width count, and the sphere radii are chosen inside the range all
rulings of both gears reach.

The spherical sections are mapped to a plane by the Lambert azimuthal equal-area projection
centred on the pitch point, which keeps areas exact and distances within a fraction of a
per cent over the few teeth near the mesh that are kept (a window of ±1.5 pitches);
overlap is preserved by any one-to-one map. Approximations: the outline is a polygon through
the generated flank samples (chords lie inside the convex flanks, so they hide no overlap of
more than the chord sag), and Tredgold's back-cone tooth is itself an approximation of the
spherical involute, off by the order of (h/Re)² of the tooth height.

The pose sequence sweeps one tooth pitch of rotation in steps (plus the rest position).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import shapely
from shapely.geometry import Polygon

from gen.errors import GeometryError
from gen.geometry.bevel import BevelOutline, BevelSizes, bevel_tooth_outline_3d, virtual_flank
from gen.geometry.differential import BevelDifferential, apply, gear_poses, pitch_point
from gen.findings import ERROR, INFO, WARNING, Finding

#: overlap thicker than this (× module, estimated as 2·area/perimeter) is an interference error;
#: it lies above the Tredgold and chord errors of correct zero-backlash teeth
MAX_OVERLAP_DEPTH = 0.005
#: distance between the two gears' pitch-cone apexes allowed (× module)
MAX_APEX_OFFSET = 0.02
#: gap beyond the designed backlash that makes a mesh "loose" (× module)
LOOSE_GAP = 0.1
#: half width of the window kept around the pitch point (in circular pitches at that sphere)
WINDOW_PITCHES = 1.5
#: fraction of the common sphere-radius range left out at each end
RADIUS_INSET = 0.02
#: flank samples along the involute for the check (denser than the part's default)
CHECK_INVOLUTE_SAMPLES = 80


@dataclass(frozen=True)
class PlacedGear:
    """A gear's sizes and large-end outline in its own frame (poses come per step)."""

    sizes: BevelSizes
    outline: BevelOutline


@dataclass(frozen=True)
class MeshClearance:
    """Result of one meshing pair over the sweep (mm, mm²)."""

    pair: tuple
    min_clearance: float     # smallest gap between the sections where they do not overlap
    overlap_area: float      # largest overlap area on one sphere at one step
    overlap_depth: float     # largest 2·area/perimeter of an overlap piece (sliver thickness)
    apex_offset: float       # distance between the two pitch-cone apexes
    radii: tuple             # sphere radii used
    steps: int


def placed_gear(sizes: BevelSizes) -> PlacedGear:
    flank = virtual_flank(sizes, n_involute=CHECK_INVOLUTE_SAMPLES)
    return PlacedGear(sizes, bevel_tooth_outline_3d(sizes, flank))


def _rulings(g: PlacedGear, T: np.ndarray):
    """World apex A and ruling vectors d = q − A of the large-end outline points."""
    q = apply(T, g.outline.polyline())
    A = apply(T, g.outline.apex[None, :])[0]
    return A, q - A


def _t_on_sphere(A, d, O, R):
    """Ruling parameter t > 0 where A + t d meets the sphere |p − O| = R (nan if it misses)."""
    w = A - O
    a = np.einsum("ij,ij->i", d, d)
    b = 2.0 * d @ w
    c = float(w @ w) - R * R
    disc = b * b - 4.0 * a * c
    with np.errstate(invalid="ignore"):
        return (-b + np.sqrt(disc)) / (2.0 * a)


def _radius_range(g: PlacedGear, T: np.ndarray, O: np.ndarray) -> tuple[float, float]:
    """Sphere radii that every ruling of the gear reaches within its face width."""
    A, d = _rulings(g, T)
    k = g.outline.small_end_scale
    r_small = np.linalg.norm(A + k * d - O, axis=1)
    r_large = np.linalg.norm(A + d - O, axis=1)
    return float(np.max(np.minimum(r_small, r_large))), float(np.min(np.maximum(r_small, r_large)))


def _frame(c: np.ndarray):
    e1 = np.cross(c, [0.0, 0.0, 1.0])
    if np.linalg.norm(e1) < 1e-6:
        e1 = np.cross(c, [1.0, 0.0, 0.0])
    e1 /= np.linalg.norm(e1)
    return e1, np.cross(c, e1)


def _section(g: PlacedGear, T, O, R, c, e1, e2, window: float):
    """The gear's section on the sphere R, projected (Lambert) and clipped to the window."""
    A, d = _rulings(g, T)
    t = _t_on_sphere(A, d, O, R)
    p = A + t[:, None] * d - O
    u = p / R
    cosang = np.clip(u @ c, -1.0, 1.0)
    f = R * np.sqrt(2.0 / (1.0 + cosang))
    xy = np.column_stack([f * (u @ e1), f * (u @ e2)])
    if not np.all(np.isfinite(xy)):
        raise GeometryError("a gear ruling misses the check sphere")
    poly = Polygon(xy)
    if not poly.is_valid:
        poly = shapely.make_valid(poly)
    return shapely.clip_by_rect(poly, -window, -window, window, window)


def _pieces(geom):
    if geom.is_empty:
        return []
    if hasattr(geom, "geoms"):
        return [p for g in geom.geoms for p in _pieces(g)]
    return [geom] if geom.area > 0 else []


def pair_clearance(ga: PlacedGear, gb: PlacedGear, pose_steps, pair=("a", "b"),
                   n_radii: int = 3) -> MeshClearance:
    """Clearance and overlap of two gears over a sequence of (Ta, Tb) pose pairs."""
    Ta0, Tb0 = pose_steps[0]
    Aa = apply(Ta0, ga.outline.apex[None, :])[0]
    Ab = apply(Tb0, gb.outline.apex[None, :])[0]
    O = 0.5 * (Aa + Ab)
    lo_a, hi_a = _radius_range(ga, Ta0, O)
    lo_b, hi_b = _radius_range(gb, Tb0, O)
    lo, hi = max(lo_a, lo_b), min(hi_a, hi_b)
    if lo >= hi:
        raise GeometryError(f"{pair[0]} and {pair[1]} share no face width on spheres about the apex")
    inset = RADIUS_INSET * (hi - lo)
    radii = tuple(np.linspace(lo + inset, hi - inset, n_radii))
    m = ga.sizes.module
    min_gap, max_area, max_depth = math.inf, 0.0, 0.0
    for Ta, Tb in pose_steps:
        P = pitch_point(Ta, ga.sizes, Tb, gb.sizes)
        c = P / np.linalg.norm(P)
        e1, e2 = _frame(c)
        for R in radii:
            window = WINDOW_PITCHES * math.pi * m * R / ga.sizes.Re
            sa = _section(ga, Ta, O, R, c, e1, e2, window)
            sb = _section(gb, Tb, O, R, c, e1, e2, window)
            ov = sa.intersection(sb)
            pieces = _pieces(ov)
            if pieces:
                max_area = max(max_area, sum(p.area for p in pieces))
                max_depth = max(max_depth, max(2.0 * p.area / p.length for p in pieces))
                min_gap = min(min_gap, 0.0)
            else:
                min_gap = min(min_gap, float(sa.distance(sb)))
    return MeshClearance(pair=tuple(pair), min_clearance=min_gap, overlap_area=max_area,
                         overlap_depth=max_depth, apex_offset=float(np.linalg.norm(Aa - Ab)),
                         radii=radii, steps=len(pose_steps))


def differential_clearance(diff: BevelDifferential, steps: int = 6, axial_shift: dict | None = None,
                           n_radii: int = 3) -> list[MeshClearance]:
    """Every mesh of the differential, at rest and over one input tooth pitch of output roll.

    The sweep turns θ1 = t, θ2 = −t for t = j·(2π/z_in)/steps, j = 0 … steps − 1 (carrier
    still, each input one tooth pitch relative to it).
    """
    gears = {n: placed_gear(diff.sizes_of(n)) for n in ("input_1", "output_1")}
    gear = {n: gears["input_1"] if n.startswith("input") else gears["output_1"] for n in diff.names}
    p = 2.0 * math.pi / diff.input.z
    poses = [gear_poses(diff, j * p / steps, -j * p / steps, axial_shift) for j in range(steps)]
    return [pair_clearance(gear[a], gear[b], [(P[a], P[b]) for P in poses], (a, b), n_radii)
            for a, b in diff.meshes]


def designed_gap(sa: BevelSizes, sb: BevelSizes) -> float:
    """Gap per flank side at the large end from the tooth thinning: (Δs_a + Δs_b) cos α / 2."""
    return 0.5 * (sa.thinning + sb.thinning) * math.cos(sa.alpha)


def interference_findings(reports, module: float, designed: float = 0.0, subject: str = "") -> list[Finding]:
    """Findings from :class:`MeshClearance` results (``designed``: expected gap per side, mm)."""
    out = []
    src = "spherical sections about the apex"
    for r in reports:
        name = f"{r.pair[0]}/{r.pair[1]}"
        if r.apex_offset > MAX_APEX_OFFSET * module:
            out.append(Finding(ERROR, "apex-offset",
                               f"{name}: pitch-cone apexes {r.apex_offset:.3f} mm apart (allowed "
                               f"{MAX_APEX_OFFSET * module:.3f} mm): check the mounting distances",
                               subject, "common apex of bevel gears"))
        if r.overlap_depth > MAX_OVERLAP_DEPTH * module:
            out.append(Finding(ERROR, "bevel-overlap",
                               f"{name}: teeth overlap by up to {r.overlap_depth:.4f} mm "
                               f"({r.overlap_area:.4f} mm² on one sphere)", subject, src))
        elif r.min_clearance > designed + LOOSE_GAP * module:
            out.append(Finding(WARNING, "loose-mesh",
                               f"{name}: smallest gap {r.min_clearance:.3f} mm exceeds the designed "
                               f"{designed:.3f} mm by more than {LOOSE_GAP} m", subject, src))
        else:
            out.append(Finding(INFO, "bevel-clearance",
                               f"{name}: smallest gap {r.min_clearance:.4f} mm, overlap "
                               f"{r.overlap_depth:.4f} mm over {r.steps} steps", subject, src))
    return out


def differential_findings(diff: BevelDifferential, steps: int = 6, axial_shift: dict | None = None,
                          subject: str = "") -> tuple[list[MeshClearance], list[Finding]]:
    """Clearance reports and findings of a differential (designed gap from the thinning)."""
    reports = differential_clearance(diff, steps, axial_shift)
    gap = designed_gap(diff.input, diff.output)
    return reports, interference_findings(reports, diff.input.module, gap, subject)
