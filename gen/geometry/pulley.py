"""Timing-belt pulleys: belt tooth systems, pulley groove forms, sizes and the toothed outline.

Sizes follow the ISO 5288 definitions: the pitch diameter lies on the belt's pitch line,
dp = z·p/π, and the outside diameter sits one pitch-line differential ``a`` inside it on each
side, do = dp − 2a.

Groove form (both families use the same construction):

* two straight flanks, symmetric about the groove's radial axis, each inclined at the flank
  angle γ (half the included groove angle) to that axis;
* trapezoidal grooves: a bottom arc on the root circle (radius do/2 − hg), joined to each flank
  by a root fillet rb; ``bottom_width`` is the distance between the two flank lines where they
  cross the root circle;
* curvilinear (round-tooth) grooves: one bottom arc of radius Rb, tangent to the root circle
  on the groove axis and to both flanks (common practice approximation by arcs);
* a tip fillet rt between each flank and the outside circle.

The outline is a counter-clockwise :class:`~gen.geometry.section.Loop` centred on the origin
with **groove 0 centred on +X**. Lengths mm, angles radians.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.section import Arc, Line, Loop

#: shortest curve kept in an outline (mm of length or rad of arc); shorter pieces are dropped
_MIN_PIECE = 1e-12
#: smallest rim land left between two grooves (mm on the outside circle)
MIN_LAND = 1e-3


@dataclass(frozen=True)
class GrooveForm:
    """Pulley groove (tooth space) form; see the module docstring for the construction."""

    kind: str            # "trapezoid" or "round"
    depth: float         # hg: outside circle to groove bottom (mm)
    flank_angle: float   # γ: each flank's angle to the groove axis (rad), half the groove angle
    bottom_width: float  # trapezoid: flank-line spacing on the root circle (mm); round: 0
    root_radius: float   # trapezoid: root fillet rb; round: bottom arc radius Rb (mm)
    tip_radius: float    # rt: fillet between flank and outside circle (mm)


@dataclass(frozen=True)
class BeltProfile:
    """A synchronous belt tooth system and the pulley groove that meshes with it."""

    name: str
    pitch: float         # p: belt pitch on the pitch line (mm)
    differential: float  # a: pitch-line differential per side (mm), do = dp − 2a
    groove: GrooveForm
    min_teeth: int       # smallest recommended pulley tooth count
    family: str
    note: str            # where the numbers come from, with a status word


def _trapezoid(depth, angle_deg, bottom_width, rb, rt) -> GrooveForm:
    return GrooveForm("trapezoid", depth, math.radians(angle_deg / 2.0), bottom_width, rb, rt)


def _trapezoid_from_top(depth, angle_deg, top_width, rb, rt) -> GrooveForm:
    """DIN 7721 states the gap width at the outside circle; convert it to the root-circle
    width with the straight-rack relation bw = b_top − 2·hg·tan γ."""
    bw = top_width - 2.0 * depth * math.tan(math.radians(angle_deg / 2.0))
    return _trapezoid(depth, angle_deg, bw, rb, rt)


def _round(depth, angle_deg, bottom_radius, rt) -> GrooveForm:
    return GrooveForm("round", depth, math.radians(angle_deg / 2.0), 0.0, bottom_radius, rt)


_ISO = "ISO 5296 trapezoidal"
_DIN = "DIN 7721 trapezoidal metric"
_CURV = "curvilinear (round tooth)"

_TABLE = (
    # Pitch and a: ISO 5296 (from memory). Groove hg, 2γ, bw, rb, rt: ISO 5294 pulley groove
    # table for straight-flanked grooves (from memory). Minimum teeth: from memory.
    BeltProfile("MXL", 2.032, 0.254, _trapezoid(0.69, 40.0, 0.84, 0.25, 0.13), 10, _ISO,
                "pitch, a: ISO 5296 (from memory); groove: ISO 5294 (from memory)"),
    BeltProfile("XL", 5.080, 0.254, _trapezoid(1.65, 50.0, 1.32, 0.41, 0.64), 10, _ISO,
                "pitch, a: ISO 5296 (from memory); groove: ISO 5294 (from memory)"),
    BeltProfile("L", 9.525, 0.381, _trapezoid(2.67, 40.0, 3.05, 1.19, 1.17), 10, _ISO,
                "pitch, a: ISO 5296 (from memory); groove: ISO 5294 (from memory)"),
    BeltProfile("H", 12.700, 0.686, _trapezoid(3.05, 40.0, 4.19, 1.60, 1.60), 14, _ISO,
                "pitch, a: ISO 5296 (from memory); groove: ISO 5294 (from memory)"),
    # a: DIN 7721 (from memory, medium confidence). Groove: DIN 7721-2 gap form for small
    # pulleys, width b at the outside circle, hg, 2γ = 50°, rb, rt (from memory, low confidence).
    BeltProfile("T2.5", 2.5, 0.3, _trapezoid_from_top(0.75, 50.0, 1.75, 0.2, 0.3), 10, _DIN,
                "a: DIN 7721 (from memory, medium confidence); groove: DIN 7721-2 "
                "(from memory, low confidence)"),
    BeltProfile("T5", 5.0, 0.5, _trapezoid_from_top(1.25, 50.0, 2.96, 0.4, 0.6), 10, _DIN,
                "a: DIN 7721 (from memory, medium confidence); groove: DIN 7721-2 "
                "(from memory, low confidence)"),
    BeltProfile("T10", 10.0, 1.0, _trapezoid_from_top(2.6, 50.0, 6.02, 0.6, 0.8), 12, _DIN,
                "a: DIN 7721 (from memory, medium confidence); groove: DIN 7721-2 "
                "(from memory, low confidence)"),
    # Round-tooth belts: a (common practice). Groove: an arc approximation of our own —
    # depth about the belt tooth height, bottom arc, slightly opened flanks, tip fillet
    # (common practice, not a published table). Minimum teeth: common practice.
    BeltProfile("curv2", 2.0, 0.254, _round(0.75, 24.0, 0.50, 0.15), 12, _CURV,
                "a: common practice; groove: arc approximation (common practice)"),
    BeltProfile("curv3", 3.0, 0.381, _round(1.15, 24.0, 0.75, 0.25), 10, _CURV,
                "a: common practice; groove: arc approximation (common practice)"),
    BeltProfile("curv5", 5.0, 0.5715, _round(2.06, 24.0, 1.35, 0.45), 12, _CURV,
                "a: common practice; groove: arc approximation (common practice)"),
)


class _ProfileTable(Mapping):
    """Read-only mapping of profiles whose keys match case-insensitively ("t5" → "T5")."""

    def __init__(self, profiles):
        self._items = {p.name: p for p in profiles}
        self._fold = {p.name.casefold(): p.name for p in profiles}

    def _key(self, name):
        return self._fold.get(str(name).strip().casefold()) if isinstance(name, str) else None

    def __getitem__(self, name):
        key = self._key(name)
        if key is None:
            raise KeyError(name)
        return self._items[key]

    def __contains__(self, name):
        return self._key(name) is not None

    def __iter__(self):
        return iter(self._items)

    def __len__(self):
        return len(self._items)


PROFILES = _ProfileTable(_TABLE)


def lookup_profile(name) -> BeltProfile:
    """The :class:`BeltProfile` called ``name`` (case-insensitive); a profile passes through."""
    if isinstance(name, BeltProfile):
        return name
    if name in PROFILES:
        return PROFILES[name]
    raise GeometryError(f"unknown belt profile {name!r}; valid profiles: "
                        + ", ".join(PROFILES))


@dataclass(frozen=True)
class PulleySizes:
    """Reference sizes of one pulley (mm)."""

    profile: str
    teeth: int
    pitch: float
    pitch_diameter: float        # dp = z·p/π
    outside_diameter: float      # do = dp − 2a
    root_diameter: float         # do − 2·hg
    groove_depth: float          # hg
    fit_allowance: float         # per-flank printing allowance (mm)
    fit_outside_diameter: float  # do − 2·allowance
    fit_root_diameter: float     # root diameter − 2·allowance


def _check_teeth(teeth) -> int:
    if isinstance(teeth, bool) or not float(teeth).is_integer() or teeth < 3:
        raise GeometryError(f"pulley tooth count must be a whole number of at least 3 "
                            f"(got {teeth!r})")
    return int(teeth)


def pulley_sizes(profile, teeth: int, fit_allowance: float = 0.0) -> PulleySizes:
    """Pitch, outside and root diameters of a pulley (ISO 5288 definitions).

    dp = z·p/π; do = dp − 2a; root diameter = do − 2·hg.

    ``fit_allowance`` (mm) is a printing clearance: the whole toothed outline is offset
    inward by that amount, normal to itself. Each groove flank moves back into the tooth by
    the allowance (the gap grows by 2·allowance measured normal to the flanks), the outside
    and root diameters both shrink by 2·allowance, and the groove depth stays hg.
    """
    prof = lookup_profile(profile)
    z = _check_teeth(teeth)
    f = float(fit_allowance)
    if not math.isfinite(f):
        raise GeometryError(f"fit allowance must be a finite number of mm (got {fit_allowance!r})")
    dp = z * prof.pitch / math.pi
    do = dp - 2.0 * prof.differential
    hg = prof.groove.depth
    dr = do - 2.0 * hg
    if dr - 2.0 * f <= 0.0:
        raise GeometryError(f"{prof.name} pulley with {z} teeth has no material under the "
                            f"grooves (root diameter {dr - 2.0 * f:.3f} mm)")
    return PulleySizes(prof.name, z, prof.pitch, dp, do, dr, hg, f, do - 2.0 * f, dr - 2.0 * f)


# --- outline ---------------------------------------------------------------------------------

def _far_root(q, d, R):
    """Largest t with |q + t·d| = R (d a unit vector), or None if the line misses the circle."""
    b = float(q @ d)
    disc = b * b - (float(q @ q) - R * R)
    return None if disc < 0.0 else -b + math.sqrt(disc)


def _arc_between(centre, radius, p_start, p_end) -> Arc:
    """The shorter arc about ``centre`` from ``p_start`` to ``p_end`` (both on the circle)."""
    a0 = math.atan2(p_start[1] - centre[1], p_start[0] - centre[0])
    a1 = math.atan2(p_end[1] - centre[1], p_end[0] - centre[0])
    a1 = a0 + ((a1 - a0 + math.pi) % (2.0 * math.pi) - math.pi)
    return Arc((float(centre[0]), float(centre[1])), float(radius), a0, a1)


def _groove_half(prof: BeltProfile, sizes: PulleySizes) -> list:
    """Upper half (+Y side) of groove 0, from the groove bottom on +X out to the rim."""
    g = prof.groove
    f = sizes.fit_allowance
    ro, rr = sizes.outside_diameter / 2.0, sizes.root_diameter / 2.0
    roe, rre = ro - f, rr - f
    d = np.array([math.cos(g.flank_angle), math.sin(g.flank_angle)])   # along the flank, out
    n = np.array([-math.sin(g.flank_angle), math.cos(g.flank_angle)])  # into the tooth
    where = f"{prof.name} pulley, {sizes.teeth} teeth"

    curves = []
    if g.kind == "trapezoid":
        hw = g.bottom_width / 2.0
        p0 = np.array([math.sqrt(rr * rr - hw * hw), hw])
        q = p0 + f * n                      # the flank line after the fit offset
        rbe = max(g.root_radius + f, 0.0)
        s = _far_root(q - rbe * n, d, rre + rbe)
        if s is None:
            raise GeometryError(f"{where}: groove flanks miss the root circle")
        centre = q - rbe * n + s * d
        on_line = centre + rbe * n
        on_root = centre * (rre / np.hypot(*centre))
        a_root = math.atan2(on_root[1], on_root[0])
        if a_root <= 0.0:
            raise GeometryError(f"{where}: root fillets overlap at the groove bottom")
        curves.append(Arc((0.0, 0.0), rre, 0.0, a_root))
        if rbe > _MIN_PIECE:
            curves.append(_arc_between(centre, rbe, curves[-1].end, on_line))
    elif g.kind == "round":
        rbe = g.root_radius + f
        if rbe <= 0.0:
            raise GeometryError(f"{where}: fit allowance removes the groove bottom arc")
        centre = np.array([rr + g.root_radius, 0.0])
        q = centre + g.root_radius * n + f * n
        curves.append(Arc((float(centre[0]), 0.0), rbe, math.pi,
                          math.atan2(n[1], n[0])))
    else:
        raise GeometryError(f"{where}: unknown groove kind {g.kind!r}")

    rte = max(g.tip_radius - f, 0.0)
    t = _far_root(q + rte * n, d, roe - rte)
    if t is None:
        raise GeometryError(f"{where}: groove flanks miss the outside circle")
    tip_c = q + rte * n + t * d
    tip_line = tip_c - rte * n
    tip_rim = tip_c * (roe / np.hypot(*tip_c))

    start = curves[-1].end
    run = float((tip_line - start) @ d)
    if run < -1e-9:
        hint = f" (fit allowance {f:g} mm is too large for this groove)" if f else ""
        raise GeometryError(f"{where}: root and tip fillets overlap along the flank{hint}")
    if run > _MIN_PIECE:
        curves.append(Line(tuple(start), tuple(tip_line)))
    if rte > _MIN_PIECE:
        curves.append(_arc_between(tip_c, rte, curves[-1].end, tip_rim))
    return curves


def _mirror_reversed(c):
    """``c`` mirrored in the X axis and walked the other way."""
    if isinstance(c, Line):
        return Line((c.p1[0], -c.p1[1]), (c.p0[0], -c.p0[1]))
    return Arc((c.center[0], -c.center[1]), c.radius, -c.a1, -c.a0)


def _rotated(c, angle: float):
    """``c`` turned counter-clockwise by ``angle`` about the origin."""
    co, si = math.cos(angle), math.sin(angle)

    def turn(pt):
        return (co * pt[0] - si * pt[1], si * pt[0] + co * pt[1])

    if isinstance(c, Line):
        return Line(turn(c.p0), turn(c.p1))
    return Arc(turn(c.center), c.radius, c.a0 + angle, c.a1 + angle)


def pulley_loop(profile, teeth: int, fit_allowance: float = 0.0) -> Loop:
    """Counter-clockwise toothed outline of a pulley, centred on the origin, groove 0 on +X.

    Built from Line and Arc curves whose ends meet exactly (``Loop.gaps()`` at rounding level).
    Each groove, walked counter-clockwise: tip fillet, flank, root fillet and bottom arc on the
    −Y side, the mirror image on the +Y side, then the rim land to the next groove.
    ``fit_allowance`` as in :func:`pulley_sizes` (inward offset of the outline, mm).

    Raises
    ------
    GeometryError
        when the groove form does not fit (fillets overlap, grooves meet on the rim).
    """
    prof = lookup_profile(profile)
    sizes = pulley_sizes(prof, teeth, fit_allowance)
    z = sizes.teeth
    upper = _groove_half(prof, sizes)
    groove = [_mirror_reversed(c) for c in reversed(upper)] + upper
    roe = sizes.fit_outside_diameter / 2.0
    rim = upper[-1].end
    beta = math.atan2(rim[1], rim[0])
    step = 2.0 * math.pi / z
    land = step - 2.0 * beta
    if land * roe < MIN_LAND:
        raise GeometryError(f"{prof.name} pulley, {z} teeth: grooves meet on the rim "
                            f"(land {land * roe:.4f} mm)")
    curves = []
    for k in range(z):
        c = k * step
        curves.extend(_rotated(cv, c) for cv in groove)
        curves.append(Arc((0.0, 0.0), roe, c + beta, c + step - beta))
    return Loop(tuple(curves))
