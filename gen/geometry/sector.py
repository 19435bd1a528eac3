"""Sector gears: teeth for a swing, the toothed arc, the lever-shaped outline.

A sector gear is cut from a full involute gear of ``z`` teeth (module, pressure angle, shift
as for any gear: :func:`gen.geometry.cylindrical.gear_sizes`) but keeps teeth only over the
arc the mechanism uses. Lengths mm, angles radians, the angular pitch τ = 2π / z.

Tooth positions. The sector's N teeth sit symmetrically about its centre line: tooth j at
(j − (N − 1)/2) τ, j = 0 … N − 1; the toothed arc runs between the two space centres just
outside the end teeth, N τ wide.

Teeth for a swing (computed; contact along the path of contact, as in
:mod:`gen.geometry.sector_pair`). The sector turns by the swing Σ, i.e. 2U = Σ / τ pitches
(Σ z / 2π: the teeth that pass the pitch point). A tooth centred at position a (pitches from
the line of centres) carries load while the rolled distance u lies in
[a ∓ t − g_f/p_b, a ∓ t + g_a/p_b] (one flank side each sign, t the half tooth thickness in
pitches, ≈ ¼), an interval ε_α pitches long. For |u| ≤ U on both flank sides, every position
with |a| < X = U + t + g/p_b (g the longer of approach and recess, ≈ ε_α p_b / 2) must carry
a tooth. N symmetric teeth reach (N − 1)/2 and the next position (N + 1)/2 must not be
needed, so

    N ≥ 2X − 1 = Σ z / 2π + 2t + 2g/p_b − 1   (≈ Σ z / 2π + ε_α − ½ for t = ¼),

then a margin of whole teeth at each end (so a hard stop or overtravel never rides on the
last tooth).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.features import Bore
from gen.geometry.generate import Flank
from gen.geometry.gear_outline import flank_pieces, flank_splines
from gen.geometry.section import Arc, Line, Loop, Section, circle


@dataclass(frozen=True)
class SectorTeeth:
    """Tooth count of a sector for a swing."""

    z: int               # teeth of the full gear
    swing: float         # rad, angle the sector turns
    engaged: float       # Σ z / 2π: pitches that pass the pitch point
    needed: int          # teeth that keep the full-gear contact over the swing
    margin: int          # extra teeth at each end
    teeth: int           # needed + 2 margin
    arc: float           # teeth · τ, rad


def sector_teeth(z: int, swing: float, contact_ratio: float, margin: int = 1, *,
                 reach: float | None = None, flank_offset: float = 0.25,
                 parity: str | None = None) -> SectorTeeth:
    """Teeth a sector of a z-tooth gear needs to turn through ``swing`` (rad).

    ``contact_ratio`` ε_α of the mesh; ``reach`` the longer of approach and recess in base
    pitches (default ε_α / 2); ``flank_offset`` t the half tooth thickness in pitches on the
    operating pitch circle (¼ without shift or backlash); ``parity`` "odd" (a tooth on the
    centre line) or "even" (a space on it) rounds the needed count up to that parity, as a
    mating pair of symmetric sectors needs opposite parities. See the module notes.
    """
    if z < 2 or int(z) != z:
        raise GeometryError(f"a sector is cut from a whole gear of at least 2 teeth (got {z})")
    if swing <= 0:
        raise GeometryError("the swing must be a positive angle")
    if contact_ratio <= 0:
        raise GeometryError("the contact ratio must be positive")
    if margin < 0 or int(margin) != margin:
        raise GeometryError("the margin is a whole number of teeth ≥ 0")
    g = 0.5 * contact_ratio if reach is None else float(reach)
    engaged = swing * z / (2.0 * math.pi)
    needed = max(1, math.ceil(engaged + 2.0 * flank_offset + 2.0 * g - 1.0 - 1e-9))
    if parity is not None:
        if parity not in ("odd", "even"):
            raise GeometryError("parity is 'odd' or 'even'")
        if (needed % 2 == 1) != (parity == "odd"):
            needed += 1
    teeth = needed + 2 * int(margin)
    if teeth > z:
        raise GeometryError(f"a {math.degrees(swing):.1f}° swing needs {teeth} teeth, more than "
                            f"the {z} of the full gear: use a full gear")
    return SectorTeeth(z=int(z), swing=swing, engaged=engaged, needed=needed,
                       margin=int(margin), teeth=teeth, arc=teeth * 2.0 * math.pi / z)


def teeth_in_arc(z: int, arc: float) -> int:
    """Whole teeth of a z-tooth gear that fit in a toothed arc (rad); refuses less than one."""
    pitch = 2.0 * math.pi / z
    n = int(math.floor(arc / pitch + 1e-9))
    if n < 1:
        raise GeometryError(f"a {math.degrees(arc):.2f}° arc is shorter than one tooth pitch "
                            f"({math.degrees(pitch):.2f}° on a {z}-tooth gear): no tooth fits")
    return min(n, z)


def _check_count(z: int, teeth: int):
    if teeth < 1 or int(teeth) != teeth:
        raise GeometryError(f"a sector needs at least one whole tooth (got {teeth}): its arc "
                            "would be shorter than one tooth pitch")
    if teeth > z:
        raise GeometryError(f"a sector of a {z}-tooth gear has at most {z} teeth (got {teeth})")


def sector_arc(z: int, teeth: int, center: float = 0.0) -> tuple[float, float]:
    """(start, end) angles (rad) of the toothed arc: N τ wide, centred on ``center``."""
    _check_count(z, teeth)
    half = teeth * math.pi / z
    return center - half, center + half


def tooth_angles(z: int, teeth: int, center: float = 0.0) -> np.ndarray:
    """Centre-line angles (rad) of the sector's teeth: center + (j − (N−1)/2) τ."""
    _check_count(z, teeth)
    return center + (np.arange(teeth) - (teeth - 1) / 2.0) * 2.0 * math.pi / z


@dataclass(frozen=True)
class SectorArm:
    """A straight lever arm from the hub, with a hole at its end.

    ``radius``: pivot → hole centre (mm); ``width``: arm width (mm), its end a half circle;
    ``hole_diameter`` (mm, 0 for none); ``angle``: direction (rad), default opposite the teeth.
    """

    radius: float
    width: float
    hole_diameter: float = 0.0
    angle: float | None = None


def _pt(r, a):
    return (r * math.cos(a), r * math.sin(a))


def _teeth_curves(flank: Flank, angles: np.ndarray) -> list:
    """Tooth curves as in :func:`gen.geometry.gear_outline.gear_loop`, root arcs between."""
    psi = flank.psi
    pieces = flank_pieces(flank)
    curves = []
    for k, c in enumerate(angles):
        curves.extend(flank_splines(flank, float(c), pieces, -1.0))
        curves.append(Arc((0.0, 0.0), flank.r_tip, c - psi[-1], c + psi[-1]))
        curves.extend(flank_splines(flank, float(c), pieces, 1.0))
        if k + 1 < len(angles) and angles[k + 1] - psi[0] - (c + psi[0]) > 1e-9:
            curves.append(Arc((0.0, 0.0), flank.r_root, c + psi[0], angles[k + 1] - psi[0]))
    return curves


def _back(radius: float, b0: float, b1: float, arm: SectorArm | None, default_angle: float):
    """Curves of the back of the body: an arc of ``radius`` from b0 to b1 (ccw), with the arm
    spliced in; returns (curves, arm hole loop or None)."""
    if arm is None:
        return [Arc((0.0, 0.0), radius, b0, b1)], None
    w2 = arm.width / 2.0
    if not 0 < w2 < radius:
        raise GeometryError(f"the arm must be narrower than the hub it grows from "
                            f"(width {arm.width:g} mm, hub {2 * radius:g} mm)")
    g = default_angle if arm.angle is None else float(arm.angle)
    g = b0 + (g - b0) % (2.0 * math.pi)
    delta = math.asin(w2 / radius)
    if not (b0 <= g - delta + 1e-12 and g + delta <= b1 + 1e-12):
        raise GeometryError("the arm points into the toothed side of the sector: turn it to "
                            "the back, away from the teeth")
    if arm.radius - w2 <= radius * math.cos(delta):
        raise GeometryError(f"the arm's hole radius {arm.radius:g} mm does not reach beyond the "
                            "hub: lengthen the arm")
    if not 0 <= arm.hole_diameter < arm.width:
        raise GeometryError("the arm hole must be narrower than the arm")
    ux, uy = math.cos(g), math.sin(g)
    nx, ny = math.sin(g), -math.cos(g)  # unit vector to the arm's clockwise side
    cx, cy = arm.radius * ux, arm.radius * uy
    p_hub_r, p_hub_l = _pt(radius, g - delta), _pt(radius, g + delta)
    p_end_r, p_end_l = (cx + w2 * nx, cy + w2 * ny), (cx - w2 * nx, cy - w2 * ny)
    curves = []
    if g - delta - b0 > 1e-12:
        curves.append(Arc((0.0, 0.0), radius, b0, g - delta))
    curves += [Line(p_hub_r, p_end_r),
               Arc((cx, cy), w2, g - math.pi / 2.0, g + math.pi / 2.0),
               Line(p_end_l, p_hub_l)]
    if b1 - (g + delta) > 1e-12:
        curves.append(Arc((0.0, 0.0), radius, g + delta, b1))
    hole = circle(arm.hole_diameter / 2.0, (cx, cy)) if arm.hole_diameter > 0 else None
    return curves, hole


def sector_section(flank: Flank, teeth: int, *, hub_diameter: float, bore=None,
                   center: float = 0.0, end_land: float = 0.0,
                   arm: SectorArm | None = None) -> Section:
    """Outline of a sector gear: the teeth over the toothed arc, the rest a lever shape.

    Counter-clockwise: root arc from the arc start (less ``end_land`` rad of plain root
    circle) to the first tooth, the teeth (flanks from ``flank``, generated for the full
    gear), root arc past the last tooth, then straight sides tangent to the hub boss circle
    (``hub_diameter``, mm) and the boss arc round the back, with the optional ``arm`` spliced
    into it. When the toothed arc is so wide that the tangent sides would cross, the back is
    the root circle instead. Holes: the ``bore`` (diameter in mm or a
    :class:`~gen.geometry.features.Bore`) and the arm's hole.
    """
    z = flank.z
    _check_count(z, teeth)
    if end_land < 0:
        raise GeometryError("the plain root arc past the end teeth must not be negative")
    rf = flank.r_root
    rh = hub_diameter / 2.0
    if not 0 < rh < rf:
        raise GeometryError(f"the hub boss ({hub_diameter:g} mm) must be smaller than the root "
                            f"circle ({2 * rf:.3f} mm)")
    if isinstance(bore, (int, float)):
        bore = Bore(float(bore)) if bore > 0 else None
    holes = []
    if bore is not None:
        if bore.outer_radius() >= rh:
            raise GeometryError(f"the bore ({bore.d:g} mm) leaves no wall in the "
                                f"{hub_diameter:g} mm hub boss")
        holes.append(bore.loop())
    angles = tooth_angles(z, teeth, center)
    a0, a1 = sector_arc(z, teeth, center)
    psi0 = float(flank.psi[0])
    a_s = min(a0 - end_land, angles[0] - psi0)
    a_e = max(a1 + end_land, angles[-1] + psi0)
    if a_e - a_s >= 2.0 * math.pi - 1e-9:
        raise GeometryError("the toothed arc and its end lands go all the way round: use a "
                            "full gear")
    curves = []
    if angles[0] - psi0 - a_s > 1e-12:
        curves.append(Arc((0.0, 0.0), rf, a_s, angles[0] - psi0))
    curves += _teeth_curves(flank, angles)
    if a_e - (angles[-1] + psi0) > 1e-12:
        curves.append(Arc((0.0, 0.0), rf, angles[-1] + psi0, a_e))
    beta = math.acos(rh / rf)
    b0, b1 = a_e + beta, a_s - beta + 2.0 * math.pi
    if b1 - b0 > 1e-9:
        back, hole = _back(rh, b0, b1, arm, center + math.pi)
        curves.append(Line(_pt(rf, a_e), _pt(rh, b0)))
        curves += back
        curves.append(Line(_pt(rh, b1), _pt(rf, a_s)))
    else:  # tangent sides would cross: the body is the root disc
        back, hole = _back(rf, a_e, a_s + 2.0 * math.pi, arm, center + math.pi)
        curves += back
    if hole is not None:
        holes.append(hole)
    return Section(Loop(tuple(curves)), tuple(holes))
