"""Roll a pinion outline inside a ring outline through one pitch and measure them (shapely).

Placement (transverse plane, mm, rad): the ring about the origin with tooth 0 on +X, the pinion
about (C, 0) turned by π/z₁ so that one of its tooth spaces faces the ring's tooth 0. Both
outlines are then mirror images of themselves about the X axis, which centres the backlash
(drive gap = coast gap at the symmetric phase).

Motion: the pinion turns +θ (counter-clockwise) over one angular pitch, θ ∈ [−π/z₁, π/z₁);
the ring turns θ z₁/z₂ in the *same* sense (internal mesh). The pinion drives with its
leading (+ψ) flanks; they push the trailing (−ψ) flanks of the ring's teeth; the others are
the coast flanks.

As in :mod:`gen.validate.sweep` (whose helpers are reused) only the mesh zone of each member
is kept: pinion material within reach of the ring's tooth zone, ring material within reach of
the pinion's tip circle, each widened by the sweep's rotation and a margin of one module.
At each step the drive (coast) clearance is the least distance between the drive (coast) flank
sets and the overlap is the area common to both regions; distances above the margin only say
"at least margin". The swept circumferential backlash is min(drive + coast)/cos α'_w.

:func:`radial_insertion` moves the whole pinion outline from the ring axis out to C along the
line of centres, at a few mesh phases, and reports whether one phase goes in without overlap:
an outline check of :func:`gen.geometry.internal_pair.radial_assembly`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import shapely

from gen.errors import GeometryError
from gen.geometry.internal_pair import InternalPairResult
from gen.validate.sweep import (CLEAR, INTERFERING, SWEEP_TOL, TOUCHING, SweepTolerances,
                                sweep_status,
                                _posed, _sector, _split, _wrap)

__all__ = ["CLEAR", "TOUCHING", "INTERFERING", "InternalSweepResult", "sweep_internal",
           "radial_insertion"]


@dataclass(frozen=True)
class InternalSweepResult:
    """Measured mesh of a pinion outline in a ring outline over one pinion pitch (mm, rad)."""

    status: str                     # clear | touching | interfering
    min_clearance: float            # least of drive and coast
    min_clearance_drive: float
    min_clearance_coast: float
    overlap_area: float             # largest common area over the sweep (mm²)
    angle_at_min: float             # θ of the least clearance
    angle_at_overlap: float | None  # θ of the largest overlap, when interfering
    swept_backlash: float           # circumferential on the operating pitch circle (0 if interfering)
    formula_backlash: float         # InternalPairResult.backlash_circumferential
    backlash_deviation: float
    margin: float
    steps: int


def _lens_ring(C: float, r_lo: float, r_hi: float, reach: float) -> float:
    """Largest ring-frame angle of ring points (radius r_lo … r_hi) within ``reach`` of the
    pinion axis at (C, 0)."""
    r = np.linspace(r_lo, r_hi, 256)
    c = (r * r + C * C - reach * reach) / (2.0 * r * C)
    return float(np.max(np.arccos(np.clip(c, -1.0, 1.0))))


class _Zone:
    def __init__(self, region, boundary: np.ndarray, inside, phase, drive_low: bool):
        self.region = region
        d, c = _split(boundary, inside, phase, drive_low)
        if not d or not c:
            raise GeometryError("no tooth flank lies in the mesh zone")
        self.drive = shapely.multilinestrings(d)
        self.coast = shapely.multilinestrings(c)


def _zones(pinion_poly, hole_poly, pr: InternalPairResult, margin: float):
    z1, z2, C = pr.z1, pr.z2, pr.center_distance
    ra1, ra2 = pr.tip_radii
    rf2 = pr.root_radii[1]
    p1, p2 = 2.0 * math.pi / z1, 2.0 * math.pi / z2
    # pinion: own frame, the mesh zone faces −π/z₁ (it is turned by π/z₁ + θ)
    cos1 = ((ra2 - margin) ** 2 - C * C - ra1 * ra1) / (2.0 * C * ra1)
    half1 = math.acos(min(1.0, max(-1.0, cos1))) + p1 / 2.0 + 0.02
    dir1 = -math.pi / z1
    r1min = max(ra2 - margin - C, 0.0)
    sec1 = _sector(dir1, min(half1, math.pi), r1min, ra1 + margin)
    region1 = shapely.intersection(shapely.make_valid(shapely.Polygon(pinion_poly)),
                                   shapely.Polygon(sec1))

    def inside1(p):
        return ((np.hypot(p[:, 0], p[:, 1]) >= r1min)
                & (np.abs(_wrap(np.arctan2(p[:, 1], p[:, 0]) - dir1)) <= half1))

    # ring: own frame, the mesh zone faces 0
    half2 = _lens_ring(C, ra2, rf2 + margin, ra1 + margin) + p2 / 2.0 + 0.02
    sec2 = _sector(0.0, min(half2, math.pi), ra2 - margin, rf2 + margin)
    region2 = shapely.difference(shapely.Polygon(sec2),
                                 shapely.make_valid(shapely.Polygon(hole_poly)))

    def inside2(p):
        return np.abs(np.arctan2(p[:, 1], p[:, 0])) <= half2

    m1 = _Zone(region1, pinion_poly, inside1, lambda p: np.arctan2(p[:, 1], p[:, 0]) / p1,
               drive_low=False)
    m2 = _Zone(region2, hole_poly, inside2, lambda p: np.arctan2(p[:, 1], p[:, 0]) / p2,
               drive_low=True)
    return m1, m2


def _poses(pr: InternalPairResult, theta):
    rot1 = math.pi / pr.z1 + theta
    rot2 = theta * pr.z1 / pr.z2
    shift1 = np.column_stack([np.full_like(theta, pr.center_distance), np.zeros_like(theta)])
    return rot1, shift1, rot2, np.zeros_like(shift1)


def sweep_internal(pinion_poly: np.ndarray, hole_poly: np.ndarray, pair: InternalPairResult,
                   *, steps: int = 90, tol: SweepTolerances = SWEEP_TOL) -> InternalSweepResult:
    """Roll the pinion outline (own frame, tooth 0 on +X) inside the ring's toothed hole
    (own frame, tooth 0 on +X) at ``pair.center_distance`` over one pinion pitch."""
    if pair.center_distance + pair.tip_radii[0] <= pair.tip_radii[1]:
        raise GeometryError("the pinion's tip circle stays inside the ring's: no mesh")
    margin = tol.margin_modules * pair.mn
    m1, m2 = _zones(np.asarray(pinion_poly, float), np.asarray(hole_poly, float), pair, margin)
    p1 = 2.0 * math.pi / pair.z1
    theta = -p1 / 2.0 + p1 * np.arange(steps) / steps
    r1, s1, r2, s2 = _poses(pair, theta)
    area = shapely.area(shapely.intersection(_posed(m1.region, r1, s1), _posed(m2.region, r2, s2)))
    dd = shapely.distance(_posed(m1.drive, r1, s1), _posed(m2.drive, r2, s2))
    dc = shapely.distance(_posed(m1.coast, r1, s1), _posed(m2.coast, r2, s2))
    both = np.minimum(dd, dc)
    i_min = int(np.argmin(both))
    status, overlap, swept = sweep_status(area, dd, dc, tol, pair.alpha_w)
    interfering = status == INTERFERING
    return InternalSweepResult(
        status=status, min_clearance=float(both.min()), min_clearance_drive=float(dd.min()),
        min_clearance_coast=float(dc.min()), overlap_area=overlap,
        angle_at_min=float(theta[i_min]),
        angle_at_overlap=float(theta[int(np.argmax(area))]) if interfering else None,
        swept_backlash=swept, formula_backlash=pair.backlash_circumferential,
        backlash_deviation=swept - pair.backlash_circumferential, margin=margin, steps=steps)


def radial_insertion(pinion_poly: np.ndarray, hole_poly: np.ndarray, pair: InternalPairResult,
                     *, phases: int = 12, steps: int = 60,
                     tol: SweepTolerances = SWEEP_TOL):
    """Push the pinion outline from the ring axis to (C, 0) at mesh phases t ∈ [0, π/z₁]
    (pinion turned π/z₁ + t, ring t z₁/z₂). Returns (possible, pinion turn or None, least
    over the phases of the largest overlap met on the way, mm²)."""
    C, z1, z2 = pair.center_distance, pair.z1, pair.z2
    rf2 = pair.root_radii[1]
    pin = shapely.make_valid(shapely.Polygon(np.asarray(pinion_poly, float)))
    outer = _sector(0.0, math.pi / 2.0, 0.0, rf2 + pair.mn, n=256)   # x ≥ 0 half: the side it moves to
    ring = shapely.difference(shapely.Polygon(outer), shapely.make_valid(shapely.Polygon(hole_poly)))
    u = np.linspace(0.0, C, steps + 1)
    best = math.inf
    for t in np.linspace(0.0, math.pi / z1, phases):
        rot1 = np.full_like(u, math.pi / z1 + t)
        shift1 = np.column_stack([u, np.zeros_like(u)])
        rot2 = np.full_like(u, t * z1 / z2)
        a = shapely.area(shapely.intersection(_posed(pin, rot1, shift1),
                                              _posed(ring, rot2, np.zeros_like(shift1))))
        worst = float(a.max())
        if worst <= tol.overlap_area:
            return True, float(math.pi / z1 + t), worst
        best = min(best, worst)
    return False, None, best
