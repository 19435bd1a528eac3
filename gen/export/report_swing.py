"""Sector pairs over their whole swing, for the report: the moving pair (one end of the swing
to the other and back) and a static drawing at mid-swing with both swing ends marked.

Placement is the swing sweep's (:mod:`gen.validate.sector_sweep`, computed there): gear 1 on
the origin turned by φ, gear 2 on (C, 0) turned by π + τ₂/2 + k₂ τ₂ − φ z₁/z₂ (τ = 2π/z, k₂
from :func:`gen.validate.sector_sweep.gear2_offset`), with φ over the swing Σ centred on
mid-swing φ_mid = −c₁ (c the sector's centre-line angle in its own frame). At mid-swing each
sector's centre line faces its mate. The outlines are the parts' own measured outlines, the
ones the sweep rolled.

Two kinds of end are shown and named apart: the *swing ends* (φ_mid ± Σ/2, the stated swing
the mechanism makes, which the animation runs between) and the *hard stops* of the pair
check (where the last tooth pair separates; the mechanism must stop before them).

Line types: pitch circles long-dashed dotted narrow (ISO 128-24:2014, type 04.1); the ghosted
end poses long-dashed double-dotted narrow (type 05.1, the line ISO 128-24 gives for
alternative and extreme positions of movable parts; from memory); colours Okabe–Ito.
"""

from __future__ import annotations

import hashlib
import math
from dataclasses import dataclass
from xml.sax.saxutils import escape

import numpy as np

from gen.export.report_motion import (MEMBER_STYLES, WARN, Member, MeshScene, _d, _n, _rot,
                                      with_overlap)

#: seconds per pitch of gear 1 on the way out, kept between these bounds (s)
SECONDS_PER_PITCH, MIN_WAY, MAX_WAY = 1.5, 4.0, 12.0
FRAMES_PER_PITCH, MAX_FRAMES = 12, 72
W, H = 640, 430


@dataclass(frozen=True)
class SwingPlacement:
    """Where the two members of a sector pair sit over the swing (rad, mm)."""

    names: tuple          # (gear 1, gear 2)
    polys: tuple          # own-frame outlines (mm)
    z: tuple              # (z1, z2) full-circle tooth counts
    center_distance: float
    swing: float          # Σ of gear 1 (rad)
    mid: float            # φ_mid (rad)
    base2: float          # π + τ₂/2 + k₂ τ₂ (rad)

    def angles(self, phi):
        """(gear-1 turn, gear-2 turn) at gear-1 angle φ (rad)."""
        z1, z2 = self.z
        return phi, self.base2 - phi * z1 / z2

    @property
    def ends(self) -> tuple:
        """Gear-1 angles φ at the two swing ends (rad)."""
        return self.mid - self.swing / 2.0, self.mid + self.swing / 2.0

    def world(self, phi):
        a1, a2 = self.angles(phi)
        return (_rot(self.polys[0], a1),
                _rot(self.polys[1], a2) + np.array([self.center_distance, 0.0]))


def placement(a, b, pair, swing: float) -> SwingPlacement:
    """The sweep's placement of parts ``a`` (gear 1) and ``b`` (gear 2) over gear 1's swing."""
    from gen.validate.sector_sweep import gear2_offset

    z1, z2 = pair.z1, pair.z2
    c1 = getattr(a.mate, "centre", 0.0) if getattr(a.mate, "swing", 0.0) > 0 else 0.0
    c2 = getattr(b.mate, "centre", 0.0) if getattr(b.mate, "swing", 0.0) > 0 else 0.0
    k2, _ = gear2_offset(z1, z2, c1, c2)
    t2 = 2.0 * math.pi / z2
    return SwingPlacement((a.name, b.name), (np.asarray(a.outline, float),
                                             np.asarray(b.outline, float)),
                          (z1, z2), pair.center_distance, swing, -c1,
                          math.pi + t2 / 2.0 + k2 * t2)


def _box(polys, pad):
    allp = np.vstack(polys)
    lo, hi = allp.min(axis=0) - pad, allp.max(axis=0) + pad
    return float(lo[0]), float(hi[0]), float(lo[1]), float(hi[1])


def swing_scene(pl: SwingPlacement, pair, title: str = "") -> MeshScene:
    """The moving pair over the whole swing (out and back), overlap measured per frame."""
    e0, e1 = pl.ends
    (_, a20), (_, a21) = pl.angles(e0), pl.angles(e1)
    C = pl.center_distance
    m1 = Member(pl.names[0], pl.polys[0], (e0, e1), ((0.0, 0.0), (0.0, 0.0)))
    m2 = Member(pl.names[1], pl.polys[1], (a20, a21), ((C, 0.0), (C, 0.0)))
    poses = [pl.world(p) for p in (e0, 0.5 * (e0 + e1), e1)]
    window = _box([p for pose in poses for p in pose], 0.04 * C)
    rp1 = pair.pitch_radii[0]
    half = max(3.2 * pair.mn, 0.75 * sum(pair.contact_path))
    circles = (((0, 0), rp1, "pitch"), ((0, 0), pair.base_radii[0], "base"),
               ((C, 0), pair.pitch_radii[1], "pitch"), ((C, 0), pair.base_radii[1], "base"))
    pitches = pl.swing / (2.0 * math.pi / pl.z[0])
    way = min(MAX_WAY, max(MIN_WAY, SECONDS_PER_PITCH * pitches))
    frames = int(min(MAX_FRAMES, max(8, math.ceil(FRAMES_PER_PITCH * pitches))))
    scene = MeshScene(title, (m1, m2), window, (rp1 - half, rp1 + half, -half, half), circles,
                      note=f"swing {math.degrees(pl.swing):.2f}° of {pl.names[0]}, "
                           "out and back", cycle="swing", seconds=2.0 * way)
    return with_overlap(scene, frames)


def _arc(c, r, a0, a1, n=48):
    t = np.linspace(a0, a1, n)
    return np.column_stack([c[0] + r * np.cos(t), c[1] + r * np.sin(t)])


def swing_svg(pl: SwingPlacement, pair, stops=None, stops2=None, title: str = "") -> str:
    """Static drawing: the pair at mid-swing, both members ghosted at the two swing ends, an
    arc per member over its swing (centre line turned from end to end, angles labelled) and,
    when given, the hard stops (gear-1 and gear-2 angles from mid-swing, rad) as ticks."""
    from gen.validate.overlap_frames import overlap_regions

    e0, e1 = pl.ends
    C = pl.center_distance
    z1, z2 = pl.z
    mid_pose = pl.world(pl.mid)
    end_poses = [pl.world(e0), pl.world(e1)]
    x0, x1, y0, y1 = _box([p for pose in [mid_pose] + end_poses for p in pose], 0.06 * C)
    top, bottom = 34, 122
    s = min((W - 16) / (x1 - x0), (H - top - bottom) / (y1 - y0))
    ox = W / 2 - s * 0.5 * (x0 + x1)
    oy = top + (H - top - bottom) / 2 + s * 0.5 * (y0 + y1)
    tf = f"matrix({_n(s)} 0 0 {_n(-s)} {_n(ox)} {_n(oy)})"
    px = 1.0 / s

    def to_px(x, y):
        return ox + s * x, oy - s * y

    uid = "w" + hashlib.sha1((title + _d(pl.polys[0][:40])).encode()).hexdigest()[:8]
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" class="swing" id="{uid}" width="{W}" '
           f'height="{H}" viewBox="0 0 {W} {H}" font-family="Helvetica, Arial, sans-serif" '
           f'font-size="12">', f"<title>{escape(title)} at mid-swing, swing ends marked</title>",
           f'<rect width="{W}" height="{H}" fill="#ffffff"/>',
           f'<text x="8" y="22" font-size="14">{escape(title)}: mid-swing, ends ghosted</text>',
           f'<g transform="{tf}">']
    ghost = (f'fill="none" stroke-width="{_n(0.8 * px)}" stroke-dasharray='
             f'"{_n(10 * px)} {_n(2.5 * px)} {_n(1.5 * px)} {_n(2.5 * px)} {_n(1.5 * px)} '
             f'{_n(2.5 * px)}"')
    # each outline written once, in its own frame; every pose is a <use> turned into place
    out.insert(2, "<defs>" + "".join(f'<path id="{uid}o{i}" d="{_d(poly)}"/>'
                                     for i, poly in enumerate(pl.polys)) + "</defs>")

    def placed(i, phi):
        a = pl.angles(phi)[i]
        shift = "" if i == 0 else f"translate({_n(C)} 0) "
        return f'transform="{shift}rotate({_n(math.degrees(a))})"'

    for k, phi in enumerate((e0, e1)):
        for i in range(2):
            out.append(f'<use href="#{uid}o{i}" class="swing-end end-{k}" {placed(i, phi)} '
                       f'stroke="{MEMBER_STYLES[i][1]}" {ghost}/>')
    for i in range(2):
        fill, line = MEMBER_STYLES[i]
        out.append(f'<use href="#{uid}o{i}" class="outline member-{i + 1}" {placed(i, pl.mid)} '
                   f'fill="{fill}" fill-opacity="0.85" stroke="{line}" '
                   f'stroke-width="{_n(1.0 * px)}"/>')
    area, rings = overlap_regions(*mid_pose)
    if area > 0 and rings:
        out.append(f'<path class="overlap" fill="{WARN}" stroke="{WARN}" '
                   f'stroke-width="{_n(1.2 * px)}" d="{" ".join(_d(r) for r in rings)}"/>')
    pitch = (f'fill="none" stroke="#000000" stroke-width="{_n(0.7 * px)}" stroke-dasharray='
             f'"{_n(12 * px)} {_n(3 * px)} {_n(1.5 * px)} {_n(3 * px)}"')
    for c, r in (((0.0, 0.0), pair.pitch_radii[0]), ((C, 0.0), pair.pitch_radii[1])):
        out.append(f'<circle class="pitch-circle" cx="{_n(c[0])}" cy="{_n(c[1])}" r="{_n(r)}" '
                   f'{pitch}/>')
    # swing arcs: each member's centre line (facing its mate at mid-swing) over the swing
    texts = []
    members = (((0.0, 0.0), 0.0, 1.0, pair.root_radii[0] * 0.72, stops),
               ((C, 0.0), math.pi, -z1 / z2, pair.root_radii[1] * 0.72, stops2))
    for i, (c, facing, ratio, r, stop) in enumerate(members):
        colour = MEMBER_STYLES[i][1]
        half = pl.swing / 2.0 * abs(ratio)
        lo, hi = facing - half, facing + half
        out.append(f'<path class="swing-arc member-{i + 1}" fill="none" stroke="{colour}" '
                   f'stroke-width="{_n(2.2 * px)}" d="M {" ".join(f"{_n(x)} {_n(y)}" for x, y in _arc(c, r, lo, hi))}"/>')
        for a in (lo, hi):
            tip = (c[0] + r * 1.12 * math.cos(a), c[1] + r * 1.12 * math.sin(a))
            out.append(f'<line class="swing-end-line" x1="{_n(c[0])}" y1="{_n(c[1])}" '
                       f'x2="{_n(tip[0])}" y2="{_n(tip[1])}" stroke="{colour}" '
                       f'stroke-width="{_n(0.8 * px)}"/>')
        if stop is not None:
            # hard stops are gear angles from mid-swing (gear 2: clockwise positive)
            for sa in stop:
                a = facing + sa * (1.0 if i == 0 else -1.0)
                p, q = ((c[0] + r * k * math.cos(a), c[1] + r * k * math.sin(a))
                        for k in (0.86, 1.18))
                out.append(f'<line class="hard-stop member-{i + 1}" x1="{_n(p[0])}" '
                           f'y1="{_n(p[1])}" x2="{_n(q[0])}" y2="{_n(q[1])}" stroke="{WARN}" '
                           f'stroke-width="{_n(2.0 * px)}"/>')
        lx, ly = to_px(c[0] + r * 0.35 * math.cos(facing + math.pi),
                       c[1] + r * 0.35 * math.sin(facing + math.pi))
        texts.append(f'<text class="swing-label" x="{_n(lx)}" y="{_n(ly)}" text-anchor="middle" '
                     f'fill="{colour}" font-weight="bold">{math.degrees(2 * half):.2f}°</text>')
    out.append("</g>")
    out += texts
    # the key: numbers in words, so nothing depends on colour
    y = H - bottom + 22
    deg = math.degrees
    lines = [f"{pl.names[0]}: swing {deg(pl.swing):.2f}°, ends {deg(-pl.swing / 2):+.2f}° "
             f"and {deg(pl.swing / 2):+.2f}° from mid-swing (turn {deg(e0):+.2f}° to "
             f"{deg(e1):+.2f}° in its own frame)",
             f"{pl.names[1]}: swing {deg(pl.swing * z1 / z2):.2f}° (ratio {z2}/{z1}), turning "
             "the other way"]
    if stops is not None:
        lines.append(f"hard stops (last tooth pair separates, ticks): {deg(stops[0]):+.2f}° "
                     f"and {deg(stops[1]):+.2f}° of {pl.names[0]}")
    if stops2 is not None:
        lines.append(f"hard stops of {pl.names[1]}: {deg(stops2[0]):+.2f}° and "
                     f"{deg(stops2[1]):+.2f}° (from mid-swing, clockwise positive)")
    lines.append(f"overlap at mid-swing: {area:.4f} mm²" if area > 0 else
                 "no overlap at mid-swing")
    for k, text in enumerate(lines):
        cls = "swing-key" + (" overlap-label" if text.startswith("overlap") else "")
        fill = WARN if text.startswith(("overlap", "hard")) else "#1d1f22"
        out.append(f'<text class="{cls}" x="10" y="{y + 17 * k}" fill="{fill}">'
                   f'{escape(text)}</text>')
    out.append('<text x="8" y="38" font-size="11" fill="#444">dash-dot-dot: swing ends; '
               "red ticks: hard stops</text>")
    out.append("</svg>")
    return "\n".join(out) + "\n"
