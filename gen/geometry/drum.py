"""Cable drums: helical groove sizes, turns, length, capstan holding, tension and joint ratio.

Lengths mm, angles radians, torques N·m, forces N. Notation: d_c cable diameter, D drum
diameter at the groove bottom, D_p = D + d_c pitch diameter (to the cable centre line: the
cable lies on the groove bottom).

Relations and values:

* groove pitch p = d_c + gap; gap ≈ 0.1 d_c (pitch 1.05–1.15 d_c, common practice);
* groove radius r_g ≈ 0.53 d_c (0.52–0.54 d_c, common practice), groove depth ≈ 0.35 d_c
  (0.3–0.4 d_c, common practice, never deeper than r_g here);
* turns for a travel s: s / (π D_p) (computed: one turn pays out the pitch circumference),
  plus at least 2 dead turns that stay on the drum and relieve the anchor (common practice);
* grooved length = total turns × p; drum length adds an end margin each side;
* capstan (Euler–Eytelwein): T_load / T_hold = e^(μ θ), θ the wrap angle (from memory);
* D_p / d_c at least a minimum per cable construction (common practice values in
  :data:`MIN_RATIO`): tighter bends fatigue the cable quickly;
* cable tension from motor torque: T = τ / (D_p / 2); a joint pulley of pitch diameter
  D_j driven by the cable turns D_p / D_j times the drum angle.

Transverse section for a twisted prism: the groove is a helicoid of lead p (one turn per
pitch); at radius r its axial half-width is h(r) = √(r_g² − (D/2 + r_g − r)²) and the land
between turns is p − 2 h(r) wide, mapped to angle by 2π / p (:mod:`gen.geometry.helicoid`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.helicoid import flank_samples, helicoid_loop, twist_rate
from gen.geometry.section import Loop

#: least pitch-diameter / cable-diameter ratio per cable construction (common practice:
#: steel wire rope makers' bend-ratio guidance, braided fibre line makers' sheave guidance;
#: no single standard, low confidence — long-life designs use more)
MIN_RATIO = {
    "steel-7x7": 40.0,
    "steel-7x19": 30.0,
    "steel-1x19": 50.0,
    "uhmwpe-braid": 8.0,
    "polyester-braid": 10.0,
    "nylon-braid": 10.0,
}

GAP_FACTOR = 0.10            # gap = 0.1 d_c (common practice)
GROOVE_RADIUS_FACTOR = 0.53  # r_g = 0.53 d_c (common practice)
GROOVE_DEPTH_FACTOR = 0.35   # depth = 0.35 d_c (common practice)
MIN_DEAD_TURNS = 2.0         # (common practice)


def min_ratio(cable: str) -> float:
    """Least D_p / d_c for a cable construction (see :data:`MIN_RATIO`)."""
    try:
        return MIN_RATIO[cable]
    except KeyError:
        raise GeometryError(f"unknown cable type {cable!r}; known: {', '.join(MIN_RATIO)}") from None


@dataclass(frozen=True)
class DrumSizes:
    """Sizes of a single-layer helically grooved cable drum (mm)."""

    cable: str
    cable_diameter: float     # d_c
    drum_diameter: float      # D, at the groove bottom
    pitch_diameter: float     # D_p = D + d_c
    outer_diameter: float     # over the lands, D + 2·depth
    groove_pitch: float       # p
    groove_radius: float      # r_g
    groove_depth: float
    land_width: float         # axial width of the land between grooves at the outer diameter
    ratio: float              # D_p / d_c
    min_ratio: float
    travel: float             # cable paid out over the working range, s
    active_turns: float       # s / (π D_p)
    dead_turns: float
    total_turns: float
    grooved_length: float     # total turns × p
    length: float             # grooved length + 2 end margins

    def groove_half_width(self, r):
        """Axial half-width of the groove at radius r (mm): √(r_g² − (D/2 + r_g − r)²)."""
        r = np.asarray(r, dtype=float)
        y = self.drum_diameter / 2.0 + self.groove_radius - r
        return np.sqrt(np.clip(self.groove_radius ** 2 - y * y, 0.0, None))

    def land_width_at(self, r):
        """Axial width of the drum material between two grooves at radius r (mm)."""
        return self.groove_pitch - 2.0 * self.groove_half_width(r)


def drum_sizes(cable_diameter: float, drum_diameter: float, travel: float, *,
               cable: str = "steel-7x19", dead_turns: float = MIN_DEAD_TURNS,
               gap: float | None = None, groove_radius: float | None = None,
               groove_depth: float | None = None, end_margin: float | None = None) -> DrumSizes:
    """Size a grooved drum for ``travel`` mm of cable of diameter d_c on a drum of diameter D.

    Defaults (common practice): gap 0.1 d_c, groove radius 0.53 d_c, depth 0.35 d_c, end
    margin one groove pitch. Refuses a drum smaller than the cable allows, fewer than 2 dead
    turns, a groove narrower than the cable, and grooves that leave no land between turns.
    """
    dc, D = float(cable_diameter), float(drum_diameter)
    if dc <= 0 or D <= 0:
        raise GeometryError("cable and drum diameters must be positive")
    if travel < 0:
        raise GeometryError("cable travel must not be negative")
    need = min_ratio(cable)
    dp = D + dc
    if dp / dc < need - 1e-9:
        raise GeometryError(
            f"a {D:g} mm drum is too small for a {dc:g} mm {cable} cable: the cable would bend "
            f"round {dp / dc:.1f} cable diameters, and this cable needs at least {need:g} "
            f"(a drum of {need * dc - dc:g} mm or more, or a cable made for tighter bends)")
    if dead_turns < MIN_DEAD_TURNS:
        raise GeometryError(f"keep at least {MIN_DEAD_TURNS:g} dead turns on the drum so the "
                            f"anchor does not carry the full pull (got {dead_turns:g})")
    gap = GAP_FACTOR * dc if gap is None else float(gap)
    rg = GROOVE_RADIUS_FACTOR * dc if groove_radius is None else float(groove_radius)
    depth = GROOVE_DEPTH_FACTOR * dc if groove_depth is None else float(groove_depth)
    if gap < 0:
        raise GeometryError("the gap between turns must not be negative")
    if rg < dc / 2.0:
        raise GeometryError(f"a groove radius of {rg:g} mm is narrower than the {dc:g} mm cable")
    if not 0 < depth <= rg:
        raise GeometryError(f"the groove depth must be above 0 and at most the groove radius "
                            f"{rg:g} mm (got {depth:g})")
    pitch = dc + gap
    top_width = 2.0 * math.sqrt(rg * rg - (rg - depth) ** 2)
    land = pitch - top_width
    if land <= 0:
        raise GeometryError(f"grooves {top_width:.3f} mm wide at a {pitch:.3f} mm pitch run into "
                            "each other: widen the gap or make the grooves shallower")
    active = travel / (math.pi * dp)
    total = active + dead_turns
    grooved = total * pitch
    margin = pitch if end_margin is None else float(end_margin)
    return DrumSizes(cable=cable, cable_diameter=dc, drum_diameter=D, pitch_diameter=dp,
                     outer_diameter=D + 2.0 * depth, groove_pitch=pitch, groove_radius=rg,
                     groove_depth=depth, land_width=land, ratio=dp / dc, min_ratio=need,
                     travel=float(travel), active_turns=active, dead_turns=float(dead_turns),
                     total_turns=total, grooved_length=grooved, length=grooved + 2.0 * margin)


def capstan_ratio(friction: float, wrap: float) -> float:
    """Euler–Eytelwein ratio T_load / T_hold = e^(μ θ) for a wrap angle θ (rad)."""
    if friction < 0 or wrap < 0:
        raise GeometryError("friction and wrap angle must not be negative")
    return math.exp(friction * wrap)


def holding_force(load: float, friction: float, wraps: float) -> float:
    """Pull (N) on the slack end that holds ``load`` (N) over ``wraps`` full turns."""
    return load / capstan_ratio(friction, 2.0 * math.pi * wraps)


def cable_tension(torque: float, pitch_diameter: float) -> float:
    """Cable tension (N) from a drum torque (N·m) at pitch diameter D_p (mm): τ / (D_p/2)."""
    if pitch_diameter <= 0:
        raise GeometryError("pitch diameter must be positive")
    return torque / (pitch_diameter / 2000.0)


@dataclass(frozen=True)
class JointDrive:
    """A drum driving a joint pulley through a cable."""

    ratio: float          # drum turns per joint turn, D_j / D_p
    tension: float        # cable tension (N)
    joint_torque: float   # N·m at the joint, T · D_j / 2
    joint_speed: float    # rpm of the joint for the drum rpm given (0 if none)


def joint_drive(drum_pitch_diameter: float, joint_pitch_diameter: float, torque: float,
                drum_rpm: float = 0.0) -> JointDrive:
    """Ratio, cable tension and joint torque for a drum (torque N·m) driving a joint pulley."""
    if drum_pitch_diameter <= 0 or joint_pitch_diameter <= 0:
        raise GeometryError("pitch diameters must be positive")
    ratio = joint_pitch_diameter / drum_pitch_diameter
    t = cable_tension(torque, drum_pitch_diameter)
    return JointDrive(ratio=ratio, tension=t, joint_torque=t * joint_pitch_diameter / 2000.0,
                      joint_speed=drum_rpm / ratio)


def groove_axial_profile(s: DrumSizes, samples: int = 33) -> np.ndarray:
    """Half axial section of the drum over one groove pitch, (n, 2) columns (r, z), mm.

    Window z ∈ [−p/2, p/2] with the groove centred on z = 0, from the axis to the lands; a
    closed polygon, ccw, the groove arc sampled with ``samples`` points.
    """
    r0, ro = s.drum_diameter / 2.0, s.outer_diameter / 2.0
    h = s.groove_pitch / 2.0
    zt = float(s.groove_half_width(ro))
    yc = r0 + s.groove_radius
    a = math.asin(zt / s.groove_radius)
    t = np.linspace(a, -a, samples)  # from the +z edge down round the bottom to the −z edge
    arc = np.column_stack([yc - s.groove_radius * np.cos(t), s.groove_radius * np.sin(t)])
    arc[0], arc[-1] = (ro, zt), (ro, -zt)
    return np.vstack([[(0.0, -h), (ro, -h)], arc[::-1], [(ro, h), (0.0, h)]])


def drum_section(s: DrumSizes, samples: int | None = None, sag: float = 1e-4) -> Loop:
    """Transverse section (z = 0) of the grooved drum as a Loop, mm; sweep with
    :func:`drum_twist`. The groove is centred on angle 0, the land on angle π.

    The radii are spaced densely near the groove bottom, where the land's flank turns
    fastest (the groove circle meets the bottom tangentially). The land's flank turns through
    nearly half a turn over the groove depth, so by default it gets enough ``samples`` for its
    polyline to stay within ``sag`` mm of the curve (hundreds on a large drum).
    """
    r0, ro = s.drum_diameter / 2.0, s.outer_diameter / 2.0
    if samples is None:
        turn = math.pi * (s.groove_pitch - float(s.land_width_at(ro))) / s.groove_pitch
        samples = flank_samples(turn, ro, sag, least=33)
    t = np.linspace(0.0, 1.0, samples)
    r = r0 + (ro - r0) * (1.0 - np.cos(0.5 * math.pi * t))
    return helicoid_loop(r, s.land_width_at(r), s.groove_pitch, 1, phase=math.pi)


def drum_twist(s: DrumSizes, hand: str = "right") -> float:
    """Twist rate (rad/mm) that sweeps the helical groove: ±2π / p."""
    return twist_rate(s.groove_pitch, hand)
