"""Two sector gears (or a sector and a full gear) meshing over a swing: tooth pairs in contact.

Lengths mm, angles radians. Frame (computed): gear 1 on the origin, gear 2 on +X at the
centre distance C, pitch point P between them on the operating pitch circles. Gear 1 turns
counter-clockwise by θ₁ = u τ₁ (u: pitches rolled, τ₁ = 2π / z₁), gear 2 clockwise by
θ₂ = u τ₂. A tooth at *position* a (pitches) has its centre line on the line of centres when
u = a. At mid-swing (u = 0) each sector's centre line lies on the line of centres.

Path of contact (ISO 21771, :func:`gen.geometry.pair.mesh_pair`): with gear 1 driving
counter-clockwise contact runs along the line of action from A (gear 2's tip circle), g_f
before P, to E (gear 1's tip circle), g_a after P, at p_b per pitch rolled. The flank of
tooth a that leads (faces the turning direction) is on P when u = a − t, t the half tooth
thickness of gear 1 on the operating pitch circle in pitches,
t = (s₁/d₁ + inv α_t − inv α'_w) / τ₁ (ISO 21771 tooth thickness relation). So:

* leading flanks of gear 1 (gear 1 drives ccw, or gear 2 drives it back cw): tooth a meets
  gear 2's tooth at a − ½ and is in contact for u ∈ [a − t − g_f/p_b, a − t + g_a/p_b];
* trailing flanks (the mirror image): tooth a meets gear 2's tooth at a + ½, in contact for
  u ∈ [a + t − g_a/p_b, a + t + g_f/p_b].

Each interval is ε_α = (g_f + g_a)/p_b long (the transverse contact ratio). The number of
tooth pairs in contact at u is the number of intervals holding u whose two teeth both exist:
a full pair alternates between ⌊ε_α⌋ and ⌈ε_α⌉ and averages ε_α; a sector loses pairs near
its ends. Hard stops: beyond the first engagement and the last separation the mesh has no
pair on that flank side (the gears come apart or a tooth rides over the end).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.cylindrical import GearSizes
from gen.geometry.involute import inv
from gen.geometry.pair import mesh_pair


@dataclass(frozen=True, eq=False)
class SectorContact:
    """Tooth pairs in contact over the swing (angles of gear 1, rad; counts per flank side)."""

    teeth: tuple              # (N1, N2); N = z for a full gear
    offset2: float            # gear 2 positions shifted by this many pitches (0 or ½)
    contact_ratio: float      # ε_α of the pair at the centre distance used
    flank_offset: float       # t, pitches
    swing: float              # Σ (gear 1), rad
    angles: np.ndarray        # θ₁ samples over the swing, rad
    pairs_leading: np.ndarray   # pairs in contact on the leading flanks at each angle
    pairs_trailing: np.ndarray
    full_leading: np.ndarray    # the same for full gears
    full_trailing: np.ndarray
    min_pairs: int            # least over the swing and both flank sides
    always_in_contact: bool   # min_pairs ≥ 1
    full_ratio_kept: bool     # sector counts equal full-gear counts over the whole swing
    leading_range: tuple      # (first engagement, last separation) θ₁, rad, band through 0
    trailing_range: tuple
    stops: tuple              # (lowest, highest) θ₁ with contact on both sides, rad
    stops_gear2: tuple        # the same as gear 2 angles (clockwise positive), rad


def _positions(n: int, z: int, offset: float) -> np.ndarray:
    if n >= z:  # a full gear: positions wrap round, list plenty of them
        return np.arange(-4 * z, 4 * z + 1, dtype=float) + offset
    return np.arange(n, dtype=float) - (n - 1) / 2.0 + offset


def _intervals(p1: np.ndarray, p2: np.ndarray, t: float, gf: float, ga: float):
    """Contact intervals (in u) of the leading and trailing flank pairs whose teeth exist."""
    have2 = set(np.round(2.0 * p2).astype(int).tolist())
    lead, trail = [], []
    for a in p1:
        if int(round(2.0 * (a - 0.5))) in have2:
            lead.append((a - t - gf, a - t + ga))
        if int(round(2.0 * (a + 0.5))) in have2:
            trail.append((a + t - ga, a + t + gf))
    return np.array(lead).reshape(-1, 2), np.array(trail).reshape(-1, 2)


def _count(iv: np.ndarray, u: np.ndarray) -> np.ndarray:
    if len(iv) == 0:
        return np.zeros(len(u), dtype=int)
    return np.sum((u[:, None] >= iv[None, :, 0]) & (u[:, None] <= iv[None, :, 1]), axis=1)


def _band(iv: np.ndarray) -> tuple:
    """The union of intervals that holds u = 0 (or the nearest one), as (lo, hi) in u."""
    if len(iv) == 0:
        return (0.0, 0.0)
    order = iv[np.argsort(iv[:, 0])]
    bands = []
    lo, hi = order[0]
    for a, b in order[1:]:
        if a <= hi + 1e-12:
            hi = max(hi, b)
        else:
            bands.append((lo, hi))
            lo, hi = a, b
    bands.append((lo, hi))
    for lo, hi in bands:
        if lo <= 0.0 <= hi:
            return (float(lo), float(hi))
    best = min(bands, key=lambda b: min(abs(b[0]), abs(b[1])))
    return (float(best[0]), float(best[1]))


def sector_contact(g1: GearSizes, g2: GearSizes, teeth1: int, teeth2: int, swing: float, *,
                   center_distance: float | None = None, offset2: float | None = None,
                   samples: int = 2001) -> SectorContact:
    """Tooth pairs in contact over a swing Σ (rad, of gear 1, centred on u = 0).

    ``teeth1``/``teeth2``: teeth of each sector (≥ z for a full gear). ``offset2``: shift of
    gear 2's tooth positions in pitches; by default 0 when N1 and N2 differ in parity (a
    tooth of one faces a space of the other on the line of centres) and ½ otherwise.
    The counts are exact at the sampled angles and at every engagement and separation.
    """
    z1, z2 = g1.z, g2.z
    for n, z in ((teeth1, z1), (teeth2, z2)):
        if n < 1 or int(n) != n:
            raise GeometryError(f"a sector needs at least one whole tooth (got {n})")
    if swing <= 0:
        raise GeometryError("the swing must be a positive angle")
    res = mesh_pair(g1, g2, center_distance)
    gf, ga = (x / g1.pb for x in res.contact_path)
    tau1 = 2.0 * math.pi / z1
    t = (g1.s / g1.d + float(inv(g1.alpha_t)) - float(inv(res.alpha_w))) / tau1
    full1, full2 = teeth1 >= z1, teeth2 >= z2
    if offset2 is None:  # make gear 2's positions fall half a pitch off gear 1's
        frac1 = 0.0 if full1 else ((teeth1 - 1) / 2.0) % 1.0
        frac2 = 0.0 if full2 else ((teeth2 - 1) / 2.0) % 1.0
        offset2 = (frac1 - frac2 + 0.5) % 1.0
    p1 = _positions(teeth1, z1, 0.0)
    p2 = _positions(teeth2, z2, offset2)
    if abs(((p1[0] - p2[0]) % 1.0) - 0.5) > 1e-9:
        raise GeometryError("the two sectors' teeth do not interleave: shift gear 2 by half a "
                            "pitch (offset2)")
    lead, trail = _intervals(p1, p2, t, gf, ga)
    q1 = np.arange(-4 * z1, 4 * z1 + 1, dtype=float)
    q2 = q1 + ((p2[0] - p1[0]) % 1.0)
    flead, ftrail = _intervals(q1, q2, t, gf, ga)

    big_u = swing / (2.0 * tau1)
    u = np.linspace(-big_u, big_u, samples)
    events = np.concatenate([lead.ravel(), trail.ravel()])
    events = events[(events >= -big_u) & (events <= big_u)]
    u = np.unique(np.concatenate([u, events, events - 1e-9, events + 1e-9]))
    u = u[(u >= -big_u) & (u <= big_u)]
    nl, nt = _count(lead, u), _count(trail, u)
    fl, ft = _count(flead, u), _count(ftrail, u)
    lr, tr = _band(lead), _band(trail)
    lo, hi = max(lr[0], tr[0]), min(lr[1], tr[1])
    least = int(min(nl.min(), nt.min()))
    return SectorContact(
        teeth=(int(teeth1), int(teeth2)), offset2=float(offset2), contact_ratio=res.contact_ratio,
        flank_offset=t, swing=swing, angles=u * tau1, pairs_leading=nl, pairs_trailing=nt,
        full_leading=fl, full_trailing=ft, min_pairs=least, always_in_contact=least >= 1,
        full_ratio_kept=bool(np.all(nl == fl) and np.all(nt == ft)),
        leading_range=(lr[0] * tau1, lr[1] * tau1), trailing_range=(tr[0] * tau1, tr[1] * tau1),
        stops=(lo * tau1, hi * tau1), stops_gear2=(lo * 2.0 * math.pi / z2, hi * 2.0 * math.pi / z2))
