"""Sweep two sector outlines (or a sector and a full gear) through mesh over a whole swing.

Lengths mm, angles rad. :func:`gen.validate.sweep.sweep_pair` rolls two outlines through one
angular pitch τ₁ = 2π/z₁ of gear 1 (θ ∈ [−τ₁/2, τ₁/2)), with gear 1 turned by θ and gear 2
by π + τ₂/2 − θ z₁/z₂, and splits the flanks into drive and coast sets by their angle in
pitches. A swing is many pitches, so it is covered by windows: for window k both outlines
are first turned by whole pitches, gear 1 by k τ₁ and gear 2 by (k₂ − k) τ₂, which keeps the
tooth centre lines on multiples of the pitch (the flank split stays right) and puts the pair
in the same mesh state as gear 1 turned by k τ₁ + θ (computed: gear 2's turn then equals
π + τ₂/2 + k₂ τ₂ − (k τ₁ + θ) z₁/z₂, the rolling relation). The windows whose angle range
meets the swing are swept and their results combined: the largest overlap, the least drive
and coast clearances; the swept backlash of the window at mid-swing.

Placement (computed). Each outline has its tooth centre lines on multiples of its pitch and
its sector centre line at ``c`` (0 or τ/2). At mid-swing gear 1's centre line lies on the line
of centres (+X): gear 1 turned by −c₁. Gear 2's centre line then sits e pitches past the line
of centres with e = c₂/τ₂ + ½ + c₁/τ₁ + k₂; k₂ = −⌊c₂/τ₂ + ½ + c₁/τ₁⌋ makes e ∈ [0, 1), which
is the ``offset2`` of :func:`gen.geometry.sector_pair.sector_contact` (0 for opposite
parities, ½ for equal ones).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from gen.errors import GeometryError
from gen.geometry.pair import PairResult
from gen.validate.sweep import CLEAR, INTERFERING, TOUCHING, SweepResult, sweep_pair


@dataclass(frozen=True)
class SwingSweep:
    """The combined sweep over a swing and its windows."""

    result: SweepResult | None    # combined (None when no window had teeth on both members)
    windows: tuple                # (k, gear-1 angle range (lo, hi) rad, SweepResult | None)
    offset2: float                # e, gear-2 positions in pitches (sector_contact offset2)
    mid_angle: float              # gear-1 turn at mid-swing, −c₁ (rad)
    empty_windows: int            # windows where one member had no flank in the mesh zone


def gear2_offset(z1: int, z2: int, c1: float, c2: float) -> tuple[int, float]:
    """(k₂, e): whole pitches gear 2 is turned by, and its position offset in pitches."""
    raw = c2 * z2 / (2.0 * math.pi) + 0.5 + c1 * z1 / (2.0 * math.pi)
    k2 = -math.floor(raw + 1e-9)
    return k2, raw + k2


def rotate(p: np.ndarray, a: float) -> np.ndarray:
    c, s = math.cos(a), math.sin(a)
    return np.column_stack([c * p[:, 0] - s * p[:, 1], s * p[:, 0] + c * p[:, 1]])


def sweep_swing(poly1: np.ndarray, poly2: np.ndarray, pair: PairResult, swing: float, *,
                c1: float = 0.0, c2: float = 0.0, steps_per_pitch: int = 45) -> SwingSweep:
    """Roll ``poly1`` (gear 1) and ``poly2`` (gear 2) over gear 1's ``swing`` (rad) centred on
    mid-swing; ``c1``/``c2`` are the sectors' centre-line angles in their own frames (0 for a
    full gear). Outlines in their own frames with tooth centre lines on multiples of 2π/z."""
    if swing <= 0:
        raise GeometryError("the swing must be a positive angle")
    z1, z2 = pair.z1, pair.z2
    t1, t2 = 2.0 * math.pi / z1, 2.0 * math.pi / z2
    k2, e = gear2_offset(z1, z2, c1, c2)
    mid = -c1
    lo, hi = mid - swing / 2.0, mid + swing / 2.0
    k_lo = math.floor(lo / t1 + 0.5)
    k_hi = math.floor(hi / t1 + 0.5)
    windows, results, empty = [], [], 0
    k_mid = math.floor(mid / t1 + 0.5)
    for k in range(k_lo, k_hi + 1):
        p1 = rotate(poly1, k * t1)
        p2 = rotate(poly2, (k2 - k) * t2)
        rng = (k * t1 - t1 / 2.0, k * t1 + t1 / 2.0)
        try:
            sw = sweep_pair(p1, p2, pair, steps=steps_per_pitch)
        except GeometryError:
            empty += 1
            windows.append((k, rng, None))
            continue
        windows.append((k, rng, sw))
        results.append((k, sw))
    if not results:
        return SwingSweep(None, tuple(windows), e, mid, empty)
    worst_overlap = max(results, key=lambda r: r[1].overlap_area)
    centre = min(results, key=lambda r: abs(r[0] - k_mid))[1]
    drive = min(r[1].min_clearance_drive for r in results)
    coast = min(r[1].min_clearance_coast for r in results)
    statuses = {r[1].status for r in results}
    status = INTERFERING if INTERFERING in statuses else TOUCHING if TOUCHING in statuses else CLEAR
    w = worst_overlap[1]
    tight = min(results, key=lambda r: min(r[1].min_clearance_drive, r[1].min_clearance_coast))
    combined = replace(
        centre, status=status, min_clearance_drive=drive, min_clearance_coast=coast,
        overlap_area=w.overlap_area,
        angle_at_overlap=(None if w.angle_at_overlap is None
                          else w.angle_at_overlap + worst_overlap[0] * t1 - mid),
        clear_center_distance=w.clear_center_distance if status == INTERFERING else None,
        angle_at_min=tight[1].angle_at_min + tight[0] * t1 - mid,
        tight_segment=tight[1].tight_segment,
        steps=sum(r[1].steps for r in results))
    return SwingSweep(combined, tuple(windows), e, mid, empty)
