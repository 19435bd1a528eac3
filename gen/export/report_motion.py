"""Moving pictures of meshes for the report: both members turning through one pitch of the
first member, as SMIL ``animateTransform`` in the SVG (no scripts), from the same placements
the sweeps use (:mod:`gen.validate.sweep` for pairs and racks, :mod:`gen.validate.internal_sweep`
for a pinion in a ring, the Tredgold virtual outlines for bevel pairs).

Every member turns (and a rack slides) linearly with the first member's angle θ, so one
rotation/translation animation per member from θ = −π/z₁ to +π/z₁ reproduces the sweep's
poses exactly; the end pose repeats the start pose one tooth on, so the loop is seamless.
A sector pair (``cycle="swing"``, :mod:`gen.export.report_swing`) instead swings from one end
of its swing to the other and back (``values="a;b;a"``), so it too loops without a jump.
Overlap is computed at a fixed number of frames (:func:`gen.validate.overlap_frames.
overlap_regions`) and painted, frame by frame, in the warning colour with its area.

Line types: pitch circles/lines as long-dashed dotted narrow lines (ISO 128-24:2014, type
04.1, the line type the standard gives for pitch circles of gears); base circles as our own
dotted narrow line. Colours are from the Okabe–Ito palette (Okabe & Ito, "Color Universal
Design", 2002/2008), chosen to stay distinct for colour-blind readers.
"""

from __future__ import annotations

import hashlib
import math
from dataclasses import dataclass, field
from xml.sax.saxutils import escape

import numpy as np

#: Okabe–Ito palette (Okabe & Ito 2008), named by use
OKABE_ITO = {"black": "#000000", "orange": "#E69F00", "sky": "#56B4E9", "green": "#009E73",
             "yellow": "#F0E442", "blue": "#0072B2", "vermillion": "#D55E00",
             "purple": "#CC79A7"}
MEMBER_STYLES = (("#A9D5F2", OKABE_ITO["blue"]), ("#F3CF80", "#8A5F00"),
                 ("#9ED9C4", "#00664A"), ("#E8B9D3", "#8E4A73"))
WARN = OKABE_ITO["vermillion"]
FRAMES = 24          # overlap frames per pitch
SECONDS = 6.0        # one pitch of member 1 takes this long
W, H = 640, 340
_PANELS = ((8, 34, 308, 262), (324, 34, 308, 262))


def _n(v: float) -> str:
    s = f"{v:.4f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _n3(v: float) -> str:
    s = f"{v:.3f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _d(poly) -> str:
    """Closed SVG path of a polygon (mm, to 0.001 mm: far finer than any screen or print)."""
    return "M " + " ".join(f"{_n3(x)} {_n3(y)}" for x, y in poly) + " Z"


def _rot(p, a):
    c, s = math.cos(a), math.sin(a)
    p = np.asarray(p, float)
    return np.column_stack([c * p[:, 0] - s * p[:, 1], s * p[:, 0] + c * p[:, 1]])


@dataclass(frozen=True)
class Member:
    """One moving outline: own-frame polygon (mm), rotation (rad) and translation (mm) at the
    start and end of the cycle; ``hole`` marks a ring gear's toothed hole (material between it
    and ``outer_radius``)."""

    name: str
    poly: np.ndarray
    rot: tuple          # (start, end) rad
    shift: tuple        # ((x, y) start, (x, y) end) mm
    hole: bool = False
    outer_radius: float | None = None

    def at(self, t: float) -> np.ndarray:
        """World outline at travel fraction t ∈ [0, 1] (start → end of ``rot``/``shift``)."""
        a = self.rot[0] + t * (self.rot[1] - self.rot[0])
        s = np.asarray(self.shift[0]) + t * (np.asarray(self.shift[1]) - np.asarray(self.shift[0]))
        return _rot(self.poly, a) + s


@dataclass(frozen=True)
class MeshScene:
    """What a moving mesh picture shows (mm, rad)."""

    title: str
    members: tuple
    window: tuple                  # whole view (x0, x1, y0, y1)
    zoom: tuple                    # mesh zone
    circles: tuple = ()            # ((cx, cy), r, "pitch" | "base")
    lines: tuple = ()              # ((x0, y0), (x1, y1), "pitch")
    note: str = ""
    overlap: tuple = field(default=())   # per frame (when, area, rings); when: ((t0, t1), ...)
    cycle: str = "pitch"           # "pitch": start → end, looped; "swing": start → end → start
    seconds: float = SECONDS       # one whole cycle (s)

    @property
    def max_overlap(self) -> float:
        return max((a for _, a, _ in self.overlap), default=0.0)


def _frame_slots(cycle: str, frames: int):
    """(travel fraction, ((t0, t1), ...) cycle-time intervals showing it) per frame.

    "pitch": frame i at travel i/n, shown over [i/n, (i+1)/n). "swing": the cycle goes out
    and back, 2n slots of 1/(2n); travel i/n is reached in slot i (out) and slot 2n − i
    (back), so each pose is measured once and shown in both slots.
    """
    n = frames
    if cycle == "pitch":
        return [(i / n, ((i / n, (i + 1) / n),)) for i in range(n)]
    out = []
    for i in range(n + 1):
        slots = sorted({i, (2 * n - i) % (2 * n)})
        out.append((i / n, tuple((j / (2 * n), (j + 1) / (2 * n)) for j in slots)))
    return out


def with_overlap(scene: MeshScene, frames: int = FRAMES) -> MeshScene:
    """The scene with the overlap of its two members measured at ``frames`` frames."""
    from gen.validate.overlap_frames import overlap_regions

    a, b = scene.members
    out = []
    for t, when in _frame_slots(scene.cycle, frames):
        pa, pb = a.at(t), b.at(t)
        if b.hole:
            centre = tuple(np.asarray(b.shift[0]) + t * (np.asarray(b.shift[1]) - np.asarray(b.shift[0])))
            area, rings = overlap_regions(pa, pb, second_is_hole=True,
                                          outer_radius=b.outer_radius, center=centre)
        else:
            area, rings = overlap_regions(pa, pb)
        out.append((when, area, tuple(rings)))
    return MeshScene(**{**scene.__dict__, "overlap": tuple(out)})


def pair_scene(poly1, poly2, pair, rack=None, title: str = "",
               names=("gear 1", "gear 2")) -> MeshScene:
    """Gear pair or pinion and rack placed and moved as :mod:`gen.validate.sweep` does."""
    from gen.geometry.pair import PAIR
    from gen.validate.sweep import mesh_pose

    pose = mesh_pose(pair, rack)
    th = np.array([-math.pi / pair.z1, math.pi / pair.z1])
    a1, a2, t2 = pose.angles(th)
    m1 = Member(names[0], np.asarray(poly1, float), (float(a1[0]), float(a1[1])), ((0, 0), (0, 0)))
    m2 = Member(names[1], np.asarray(poly2, float), (float(a2[0]), float(a2[1])),
                (tuple(map(float, t2[0])), tuple(map(float, t2[1]))))
    ra1, rp1, rb1 = pair.tip_radii[0], pair.pitch_radii[0], pair.base_radii[0]
    half = max(3.2 * pair.mn, 0.75 * sum(pair.contact_path))
    if pair.kind == PAIR:
        C, ra2 = pair.center_distance, pair.tip_radii[1]
        big = max(ra1, ra2) * 1.06
        window = (-ra1 * 1.06, C + ra2 * 1.06, -big, big)
        p = (rp1, 0.0)
        circles = (((0, 0), rp1, "pitch"), ((0, 0), rb1, "base"),
                   ((C, 0), pair.pitch_radii[1], "pitch"), ((C, 0), pair.base_radii[1], "base"))
        lines = ()
    else:
        back = pair.rack_back_distance
        window = (-1.7 * ra1, 1.7 * ra1, -back - 0.1 * ra1, ra1 * 1.1)
        p = (0.0, -rp1)
        circles = (((0, 0), rp1, "pitch"), ((0, 0), rb1, "base"))
        lines = (((-4 * ra1, -rp1), (4 * ra1, -rp1), "pitch"),)
    zoom = (p[0] - half, p[0] + half, p[1] - half, p[1] + half)
    return MeshScene(title, (m1, m2), window, zoom, circles, lines)


def internal_scene(pin_poly, ring_hole, pair, outer_radius: float, title: str = "",
                   names=("pinion", "ring")) -> MeshScene:
    """A pinion in a ring gear placed and moved as :mod:`gen.validate.internal_sweep` does:
    ring about the origin, pinion about (C, 0) turned π/z₁, both turning the same way."""
    z1, z2, C = pair.z1, pair.z2, pair.center_distance
    th = (-math.pi / z1, math.pi / z1)
    pin = Member(names[0], np.asarray(pin_poly, float), (math.pi / z1 + th[0], math.pi / z1 + th[1]),
                 ((C, 0.0), (C, 0.0)))
    ring = Member(names[1], np.asarray(ring_hole, float), (th[0] * z1 / z2, th[1] * z1 / z2),
                  ((0.0, 0.0), (0.0, 0.0)), hole=True, outer_radius=outer_radius)
    R = outer_radius * 1.04
    p = (pair.pitch_radii[1], 0.0)
    half = max(3.2 * pair.mn, 0.75 * sum(pair.contact_path))
    circles = (((C, 0), pair.pitch_radii[0], "pitch"), ((C, 0), pair.base_radii[0], "base"),
               ((0, 0), pair.pitch_radii[1], "pitch"), ((0, 0), pair.base_radii[1], "base"))
    return MeshScene(title, (pin, ring), (-R, R, -R, R),
                     (p[0] - half, p[0] + half, p[1] - half, p[1] + half), circles)


def bevel_scene(part1, part2, title: str = ""):
    """A straight bevel pair drawn on its back cones: the Tredgold virtual spur gears (z_v =
    z / cos δ, development of the back cone) in mesh at the virtual center distance, placed
    and moved as a cylindrical pair. Returns (scene, pair numbers)."""
    from gen.geometry.cylindrical import gear_sizes
    from gen.geometry.pair import mesh_pair
    from gen.validate.bevel_measure import virtual_outline

    sa, sb = part1.mate.sizes, part2.mate.sizes
    va = gear_sizes(sa.zv, sa.module, sa.rack, x=sa.x, thinning=sa.thinning)
    vb = gear_sizes(sb.zv, sb.module, sb.rack, x=sb.x, thinning=sb.thinning)
    pr = mesh_pair(va, vb, face_width=min(sa.b, sb.b))
    p1 = virtual_outline(part1.mate.flank, sa.zv, 0.01)
    p2 = virtual_outline(part2.mate.flank, sb.zv, 0.01)
    scene = pair_scene(p1, p2, pr, title=title, names=(part1.name, part2.name))
    # a virtual gear is not closed round its whole circumference: show the mesh side only
    r1, r2 = pr.tip_radii
    w = 0.55 * max(r1, r2)
    scene = MeshScene(**{**scene.__dict__, "window": (r1 - 1.6 * w, r1 + 1.6 * w, -w, w),
                         "note": "back-cone (Tredgold) virtual gears, large end"})
    return scene, pr


class _Map:
    def __init__(self, rect, window):
        x, y, w, h = rect
        x0, x1, y0, y1 = window
        self.s = min((w - 16) / (x1 - x0), (h - 16) / (y1 - y0))
        self.cx, self.cy = 0.5 * (x0 + x1), 0.5 * (y0 + y1)
        self.ox, self.oy = x + w / 2.0, y + h / 2.0

    def matrix(self):
        s = self.s
        return f"matrix({_n(s)} 0 0 {_n(-s)} {_n(self.ox - s * self.cx)} {_n(self.oy + s * self.cy)})"


def _motion(kind: str, a: str, b: str, dur: str, cycle: str) -> str:
    """SMIL transform animation from ``a`` to ``b`` (and back for a swing), looped."""
    if cycle == "swing":
        span = f'values="{a};{b};{a}" keyTimes="0;0.5;1"'
    else:
        span = f'from="{a}" to="{b}"'
    return (f'<animateTransform attributeName="transform" type="{kind}" {span} dur="{dur}" '
            f'repeatCount="indefinite"/>')


def scene_svg(scene: MeshScene, *, uid: str | None = None, seconds: float | None = None) -> str:
    """The animated SVG of ``scene``: the whole mesh and the magnified mesh zone, both moving."""
    uid = uid or "m" + hashlib.sha1((scene.title + _d(scene.members[0].poly[:50])).encode()
                                    ).hexdigest()[:8]
    dur = f"{_n(seconds or scene.seconds)}s"
    what = ("swinging from one end of its swing to the other and back" if scene.cycle == "swing"
            else "moving through one pitch")
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" '
           f'class="motion" width="{W}" height="{H}" viewBox="0 0 {W} {H}" '
           f'font-family="Helvetica, Arial, sans-serif" font-size="12">',
           f"<title>{escape(scene.title)} {what}</title>", "<defs>"]
    for i, m in enumerate(scene.members):
        d = _d(m.poly)
        if m.hole:   # ring gear: rim circle and toothed hole, even-odd
            r = m.outer_radius
            d = (f"M {_n(r)} 0 A {_n(r)} {_n(r)} 0 1 0 {_n(-r)} 0 A {_n(r)} {_n(r)} 0 1 0 "
                 f"{_n(r)} 0 Z " + d)
        out.append(f'<path id="{uid}o{i}" class="outline" fill-rule="evenodd" d="{d}"/>')
    for k, (x, y, w, h) in enumerate(_PANELS):
        out.append(f'<clipPath id="{uid}c{k}"><rect x="{x}" y="{y}" width="{w}" height="{h}"/>'
                   f'</clipPath>')
    out.append("</defs>")
    out.append(f'<rect width="{W}" height="{H}" fill="#ffffff"/>')
    out.append(f'<text x="8" y="22" font-size="14">{escape(scene.title)}</text>')
    for k, window in enumerate((scene.window, scene.zoom)):
        mp = _Map(_PANELS[k], window)
        px = 1.0 / mp.s
        x, y, w, h = _PANELS[k]
        out.append(f'<rect x="{x}" y="{y}" width="{w}" height="{h}" fill="#fbfbf8" '
                   f'stroke="#9a9a9a" stroke-width="1"/>')
        out.append(f'<g clip-path="url(#{uid}c{k})"><g transform="{mp.matrix()}">')
        for i, m in enumerate(scene.members):
            fill, line = MEMBER_STYLES[i % len(MEMBER_STYLES)]
            (sx0, sy0), (sx1, sy1) = m.shift
            r0, r1 = math.degrees(m.rot[0]), math.degrees(m.rot[1])
            out.append(f'<g class="member" transform="translate({_n(sx0)} {_n(sy0)})">')
            if (sx0, sy0) != (sx1, sy1):
                out.append(_motion("translate", f"{_n(sx0)} {_n(sy0)}", f"{_n(sx1)} {_n(sy1)}",
                                   dur, scene.cycle))
            out.append(f'<g transform="rotate({_n(r0)})">'
                       + _motion("rotate", _n(r0), _n(r1), dur, scene.cycle))
            out.append(f'<use href="#{uid}o{i}" xlink:href="#{uid}o{i}" fill="{fill}" '
                       f'fill-opacity="0.85" stroke="{line}" stroke-width="{_n(1.0 * px)}"/>')
            out.append("</g></g>")
        out.extend(_marks(scene, px))
        out.extend(_overlap(scene, dur, px))
        out.append("</g></g>")
    out.append(f'<text x="{_PANELS[0][0] + 6}" y="{_PANELS[0][1] + 14}">whole mesh</text>')
    out.append(f'<text x="{_PANELS[1][0] + 6}" y="{_PANELS[1][1] + 14}">mesh zone</text>')
    out.extend(_legend(scene, dur))
    out.append("</svg>")
    return "\n".join(out) + "\n"


def _marks(scene, px):
    pitch = (f'fill="none" stroke="#000000" stroke-width="{_n(0.7 * px)}" '
             f'stroke-dasharray="{_n(12 * px)} {_n(3 * px)} {_n(1.5 * px)} {_n(3 * px)}"')
    base = f'fill="none" stroke="#555555" stroke-width="{_n(0.6 * px)}" ' \
           f'stroke-dasharray="{_n(1 * px)} {_n(2.5 * px)}"'
    out = []
    for (cx, cy), r, kind in scene.circles:
        out.append(f'<circle class="{kind}-circle" cx="{_n(cx)}" cy="{_n(cy)}" r="{_n(r)}" '
                   f'{pitch if kind == "pitch" else base}/>')
    for (x0, y0), (x1, y1), kind in scene.lines:
        out.append(f'<line class="{kind}-line" x1="{_n(x0)}" y1="{_n(y0)}" x2="{_n(x1)}" '
                   f'y2="{_n(y1)}" {pitch}/>')
    return out


def _frame_anim(attr: str, when, dur: str, on: str, off: str) -> str:
    """Discrete animation showing ``on`` over the cycle-fraction intervals ``when`` ((t0, t1),
    ...: sorted, not overlapping), ``off`` otherwise."""
    steps = [(0.0, off)]
    for t0, t1 in when:
        steps += [(t0, on), (t1, off)]
    keep = []
    for t, v in steps:
        if t >= 1.0 - 1e-12:
            continue
        if keep and abs(keep[-1][0] - t) < 1e-12:
            keep[-1] = (keep[-1][0], v)      # same instant: the later change wins
        else:
            keep.append((t, v))
    merged = [keep[0]]
    for t, v in keep[1:]:
        if v != merged[-1][1]:
            merged.append((t, v))
    return (f'<animate attributeName="{attr}" values="{";".join(v for _, v in merged)}" '
            f'keyTimes="{";".join(_n(t) for t, _ in merged)}" calcMode="discrete" dur="{dur}" '
            f'repeatCount="indefinite"/>')


def _shown_first(when) -> str:
    return "visible" if when and when[0][0] <= 1e-12 else "hidden"


def _overlap(scene, dur, px):
    out = []
    for when, area, rings in scene.overlap:
        if not rings or area <= 0:
            continue
        d = " ".join(_d(r) for r in rings)
        out.append(f'<path class="overlap" visibility="{_shown_first(when)}" fill="{WARN}" '
                   f'stroke="{WARN}" stroke-width="{_n(1.5 * px)}" d="{d}">'
                   f'{_frame_anim("visibility", when, dur, "visible", "hidden")}</path>')
    return out


def _legend(scene, dur):
    y = H - 14
    names = [m.name for m in scene.members]
    out = ['<g class="key">']
    x = 8
    for i, name in enumerate(names):
        fill, line = MEMBER_STYLES[i % len(MEMBER_STYLES)]
        out.append(f'<rect x="{x}" y="{y - 10}" width="14" height="11" fill="{fill}" stroke="{line}"/>')
        out.append(f'<text x="{x + 18}" y="{y}">{escape(name)}</text>')
        x += 28 + 7 * len(name)
    out.append(f'<line x1="{x}" y1="{y - 4}" x2="{x + 22}" y2="{y - 4}" stroke="#000" '
               f'stroke-dasharray="8 2 1.5 2"/><text x="{x + 26}" y="{y}">pitch</text>')
    x += 70
    out.append(f'<line x1="{x}" y1="{y - 4}" x2="{x + 22}" y2="{y - 4}" stroke="#555" '
               f'stroke-dasharray="1 2.5"/><text x="{x + 26}" y="{y}">base</text>')
    x += 68
    worst = scene.max_overlap
    if scene.overlap:
        if worst > 0:
            out.append(f'<rect x="{x}" y="{y - 10}" width="14" height="11" fill="{WARN}"/>')
            out.append(f'<text class="overlap-label" x="{x + 18}" y="{y}" fill="{WARN}" '
                       f'font-weight="bold">overlap up to {worst:.4f} mm²</text>')
            # the area of the frame on show, frame by frame
            for when, area, _ in scene.overlap:
                if area > 0:
                    out.append(f'<text class="overlap-area" x="{W - 8}" y="{_PANELS[1][1] + 14}" '
                               f'text-anchor="end" fill="{WARN}" '
                               f'visibility="{_shown_first(when)}">overlap {area:.4f} mm²'
                               f'{_frame_anim("visibility", when, dur, "visible", "hidden")}'
                               f'</text>')
        else:
            out.append(f'<text class="overlap-label" x="{x}" y="{y}">no overlap in '
                       f'{len(scene.overlap)} frames</text>')
    if scene.note:
        out.append(f'<text x="{W - 8}" y="22" text-anchor="end" fill="#444">'
                   f'{escape(scene.note)}</text>')
    out.append("</g>")
    return out
