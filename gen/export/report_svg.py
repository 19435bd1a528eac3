"""SVG picture of a mesh: both outlines in place, their circles, the line of action and the
tightest spot the sweep found. Pure string building; the same input gives the same bytes.

Layout: a title line, then two panels side by side: the whole pair on the left, the mesh
zone around the pitch point magnified on the right, and a key along the bottom. Each outline
is written once as a ``<path>`` in ``<defs>`` and shown in both panels with ``<use>``.
World coordinates are mm with y up; each panel maps them with one ``matrix`` transform (y
flipped); stroke widths and dashes are divided by the panel scale so they look the same in
both panels; text and markers are placed in pixel coordinates so they are never mirrored.
"""

from __future__ import annotations

import hashlib

import math
from xml.sax.saxutils import escape

import numpy as np

from gen.geometry.pair import PAIR, PairResult
from gen.geometry.rack_outline import RackSizes
from gen.validate.sweep import SweepResult, mesh_pose

WIDTH, HEIGHT = 960, 500
_PANELS = ((16, 44, 456, 400), (488, 44, 456, 400))   # x, y, w, h (px)
_STYLE = {
    "page": "#f6f4ee",
    "panel": "#ffffff",
    "frame": "#cfc8b6",
    "ink": "#26292e",
    # Okabe–Ito palette (Okabe & Ito 2008), lightened for fills: colour-blind safe
    "fill1": "#A9D5F2", "line1": "#0072B2",
    "fill2": "#F3CF80", "line2": "#8A5F00",
    "pitch": "#000000",
    "base": "#555555",
    "action": "#D55E00",
    "coast": "#E69F00",
    "tight": "#111111",
    "overlap": "#D55E00",   # Okabe–Ito vermillion: the report's warning colour
}


def _n(v: float) -> str:
    """Fixed-precision number (deterministic text, no '-0')."""
    s = f"{v:.4f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _path_d(poly: np.ndarray) -> str:
    pts = " ".join(f"{_n(x)} {_n(y)}" for x, y in poly)
    return f"M {pts} Z"


class _Panel:
    """Maps a world window (mm, y up) onto a pixel rectangle, keeping the aspect ratio."""

    def __init__(self, rect, window):
        x, y, w, h = rect
        x0, x1, y0, y1 = window
        pad = 10.0
        self.rect = rect
        self.s = min((w - 2 * pad) / (x1 - x0), (h - 2 * pad) / (y1 - y0))
        self.cx, self.cy = 0.5 * (x0 + x1), 0.5 * (y0 + y1)
        self.ox, self.oy = x + w / 2.0, y + h / 2.0

    def matrix(self) -> str:
        s = self.s
        return (f"matrix({_n(s)} 0 0 {_n(-s)} {_n(self.ox - s * self.cx)} "
                f"{_n(self.oy + s * self.cy)})")

    def px(self, x: float, y: float):
        return self.ox + self.s * (x - self.cx), self.oy - self.s * (y - self.cy)


def _line_of_action(pair: PairResult):
    """Drive line of action: (T1, T2 or far point, A, E) in world coordinates (mm)."""
    aw = pair.alpha_w
    rb1 = pair.base_radii[0]
    g_f, g_a = pair.contact_path
    if pair.kind == PAIR:
        C = pair.center_distance
        t1 = np.array([rb1 * math.cos(aw), -rb1 * math.sin(aw)])
        rb2 = pair.base_radii[1]
        t2 = np.array([C - rb2 * math.cos(aw), rb2 * math.sin(aw)])
        p = np.array([pair.pitch_radii[0], 0.0])
    else:
        t1 = rb1 * np.array([-math.sin(aw), -math.cos(aw)])
        p = np.array([0.0, -pair.pitch_radii[0]])
        t2 = p + (p - t1) * 1.5
    u = (t2 - t1) / np.hypot(*(t2 - t1))
    return t1, t2, p - g_f * u, p + g_a * u, p


def mesh_svg(poly1: np.ndarray, poly2: np.ndarray, pair: PairResult,
             sweep: SweepResult | None = None, *, rack: RackSizes | None = None,
             title: str = "") -> str:
    """SVG text of the mesh; outlines in their own frames as the sweep takes them.

    With a sweep the members are drawn at its tightest angle and the tightest gap is marked,
    or, when the sweep found the teeth overlapping, at its largest overlap; without one at the
    centred starting phase (the mounted pose). A rack needs its ``rack`` sizes for placing.
    Where the outlines overlap in the pose drawn the common region is painted in the warning
    colour and its area written (:func:`gen.validate.overlap_frames.overlap_regions`, the
    same measure as the moving picture's).
    """
    from gen.validate.overlap_frames import overlap_regions

    pose = sweep.pose if sweep is not None else mesh_pose(pair, rack)
    worst = (sweep is not None and sweep.overlap_area > 0
             and sweep.angle_at_overlap is not None)
    theta = (sweep.angle_at_overlap if worst else sweep.angle_at_min if sweep is not None
             else 0.0)
    w1, w2 = pose.at(poly1, poly2, theta)
    over_area, over_rings = overlap_regions(w1, w2)
    ra1 = pair.tip_radii[0]
    t1, t2, a_pt, e_pt, p_pt = _line_of_action(pair)
    st = _STYLE

    if pair.kind == PAIR:
        C, ra2 = pair.center_distance, pair.tip_radii[1]
        big = max(ra1, ra2) * 1.06
        window = (-ra1 * 1.06, C + ra2 * 1.06, -big, big)
    else:
        back = pair.rack_back_distance
        window = (-1.7 * ra1, 1.7 * ra1, -back - 0.1 * ra1, ra1 * 1.1)
    over = _Panel(_PANELS[0], window)
    half = max(3.2 * pair.mn, 0.75 * (pair.contact_path[0] + pair.contact_path[1]))
    zoom = _Panel(_PANELS[1], (p_pt[0] - half, p_pt[0] + half, p_pt[1] - half, p_pt[1] + half))

    # ids must be unique across every SVG inlined in one page: derive them from the content
    uid = "s" + hashlib.sha1((title + _path_d(w1)[:200]).encode()).hexdigest()[:8]
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" '
           f'width="{WIDTH}" height="{HEIGHT}" viewBox="0 0 {WIDTH} {HEIGHT}" '
           f'font-family="Helvetica, Arial, sans-serif" font-size="12">']
    out.append(f'<title>{escape(title or "mesh")}</title>')
    out.append("<defs>")
    out.append(f'<path id="{uid}m1" class="outline member-1" d="{_path_d(w1)}"/>')
    out.append(f'<path id="{uid}m2" class="outline member-2" d="{_path_d(w2)}"/>')
    for i, (x, y, w, h) in enumerate(_PANELS):
        out.append(f'<clipPath id="{uid}clip{i}"><rect x="{x}" y="{y}" width="{w}" '
                   f'height="{h}"/></clipPath>')
    out.append("</defs>")
    out.append(f'<rect width="{WIDTH}" height="{HEIGHT}" fill="{st["page"]}"/>')
    out.append(f'<text x="16" y="28" font-size="16" fill="{st["ink"]}">{escape(title)}</text>')

    for i, panel in enumerate((over, zoom)):
        k = 1.0 / panel.s  # pixel sizes → mm inside the panel's transform
        x, y, w, h = panel.rect
        out.append(f'<rect x="{x}" y="{y}" width="{w}" height="{h}" fill="{st["panel"]}" '
                   f'stroke="{st["frame"]}"/>')
        out.append(f'<g clip-path="url(#{uid}clip{i})"><g transform="{panel.matrix()}">')
        out.append(f'<use xlink:href="#{uid}m1" href="#{uid}m1" fill="{st["fill1"]}" stroke="{st["line1"]}" '
                   f'{_stroke(k, 1.0)}/>')
        out.append(f'<use xlink:href="#{uid}m2" href="#{uid}m2" fill="{st["fill2"]}" stroke="{st["line2"]}" '
                   f'{_stroke(k, 1.0)} fill-opacity="0.9"/>')
        if over_area > 0 and over_rings:
            d = " ".join(_path_d(r) for r in over_rings)
            out.append(f'<path class="overlap" fill="{st["overlap"]}" stroke="{st["overlap"]}" '
                       f'{_stroke(k, 1.2)} d="{d}"/>')
        out.extend(_reference_marks(pair, k))
        # line of action (drive), its mirror (coast), the active contact path
        tm = np.array([1.0, -1.0]) if pair.kind == PAIR else np.array([-1.0, 1.0])
        c1, c2 = t1 * tm, t2 * tm
        out.append(_seg(c1, c2, f'class="coast-line" stroke="{st["coast"]}" '
                               f'{_stroke(k, 0.8, (5, 3))}'))
        out.append(_seg(t1, t2, f'class="line-of-action" stroke="{st["action"]}" '
                               f'{_stroke(k, 0.9)}'))
        out.append(_seg(a_pt, e_pt, f'class="contact-path" stroke="{st["action"]}" '
                                   f'{_stroke(k, 3.0)} stroke-linecap="round"'))
        out.append("</g></g>")
    out.append(f'<text x="{_PANELS[0][0] + 8}" y="{_PANELS[0][1] + 18}" fill="{st["ink"]}">'
               f'whole {"pair" if pair.kind == PAIR else "pinion and rack"}</text>')
    out.append(f'<text x="{_PANELS[1][0] + 8}" y="{_PANELS[1][1] + 18}" fill="{st["ink"]}">'
               f'mesh zone, {_n(zoom.s)} px/mm</text>')
    if sweep is not None and len(sweep.tight_segment) == 2 and not worst:
        out.extend(_tight_marker(zoom, sweep))
    if over_area > 0 or worst:
        x, y, w, h = _PANELS[1]
        where = "largest overlap of the sweep" if worst else "overlap in the pose drawn"
        shown = f"{over_area:.4f} mm² at {math.degrees(theta):.2f}°"
        if worst and abs(over_area - sweep.overlap_area) > 1e-4:
            shown += f" (sweep: {sweep.overlap_area:.4f} mm²)"
        out.append(f'<text class="overlap-label" x="{_n(x + w - 12)}" y="{_n(y + h - 14)}" '
                   f'text-anchor="end" font-weight="bold" fill="{st["overlap"]}">'
                   f'{escape(where)}: {escape(shown)}</text>')
    out.extend(_key(pair, sweep, over_area > 0))
    out.append("</svg>")
    return "\n".join(out) + "\n"


def _seg(p, q, attrs):
    return (f'<line x1="{_n(p[0])}" y1="{_n(p[1])}" x2="{_n(q[0])}" y2="{_n(q[1])}" '
            f'{attrs}/>')


def _stroke(k: float, width_px: float, dash_px=None) -> str:
    """Stroke width (and dashes) given in pixels, written in the panel's mm units."""
    text = f'stroke-width="{_n(width_px * k)}"'
    if dash_px:
        text += ' stroke-dasharray="' + " ".join(_n(d * k) for d in dash_px) + '"'
    return text


def _reference_marks(pair: PairResult, k: float):
    st = _STYLE
    out = []
    pitch = f'fill="none" stroke="{st["pitch"]}" {_stroke(k, 0.8, (7, 4))}'
    base = f'fill="none" stroke="{st["base"]}" {_stroke(k, 0.8, (1.5, 3))}'
    centres = [(0.0, 0.0)]
    if pair.kind == PAIR:
        centres.append((pair.center_distance, 0.0))
    for i, c in enumerate(centres):
        out.append(f'<circle class="pitch-circle" cx="{_n(c[0])}" cy="{_n(c[1])}" '
                   f'r="{_n(pair.pitch_radii[i])}" {pitch}/>')
        out.append(f'<circle class="base-circle" cx="{_n(c[0])}" cy="{_n(c[1])}" '
                   f'r="{_n(pair.base_radii[i])}" {base}/>')
    if pair.kind != PAIR:
        far = 4.0 * pair.tip_radii[0]
        yp = -pair.pitch_radii[0]
        out.append(_seg((-far, yp), (far, yp), f'class="pitch-line" {pitch}'))
        if abs(pair.center_distance - pair.pitch_radii[0]) > 1e-9:
            yd = -pair.center_distance
            out.append(_seg((-far, yd), (far, yd), f'class="datum-line" '
                                                   f'stroke="{st["pitch"]}" '
                                                   f'{_stroke(k, 0.6, (2, 2))}'))
    return out


def _tight_marker(panel: _Panel, sweep: SweepResult):
    st = _STYLE
    (x0, y0), (x1, y1) = sweep.tight_segment
    mx, my = panel.px(0.5 * (x0 + x1), 0.5 * (y0 + y1))
    gap = min(sweep.min_clearance_drive, sweep.min_clearance_coast)
    x, y, w, h = panel.rect
    lx = x + w - 12
    ly = y + h - 14
    label = f"tightest {gap:.3f} mm at {math.degrees(sweep.angle_at_min):.2f}°"
    return [
        '<g class="tightest">',
        f'<circle cx="{_n(mx)}" cy="{_n(my)}" r="7" fill="none" stroke="{st["tight"]}" stroke-width="1.6"/>',
        f'<line x1="{_n(mx - 11)}" y1="{_n(my)}" x2="{_n(mx + 11)}" y2="{_n(my)}" stroke="{st["tight"]}" stroke-width="0.8"/>',
        f'<line x1="{_n(mx)}" y1="{_n(my - 11)}" x2="{_n(mx)}" y2="{_n(my + 11)}" stroke="{st["tight"]}" stroke-width="0.8"/>',
        f'<text x="{_n(lx)}" y="{_n(ly)}" text-anchor="end" fill="{st["tight"]}">{escape(label)}</text>',
        "</g>",
    ]


def _key(pair: PairResult, sweep: SweepResult | None, overlap: bool = False):
    st = _STYLE
    y = HEIGHT - 26
    items = [
        ("swatch", st["fill1"], st["line1"], "gear 1" if pair.kind == PAIR else "pinion"),
        ("swatch", st["fill2"], st["line2"], "gear 2" if pair.kind == PAIR else "rack"),
        ("dash", st["pitch"], "7 4", "pitch circle" if pair.kind == PAIR else "pitch circle / line"),
        ("dash", st["base"], "1.5 3", "base circle"),
        ("dash", st["action"], "", "line of action, contact path"),
    ]
    if sweep is not None and not overlap:
        items.append(("ring", st["tight"], "", "tightest gap"))
    if overlap:
        items.append(("swatch", st["overlap"], st["overlap"], "overlap"))
    out = ['<g class="key">']
    x = 16
    for kind, a, b, text in items:
        if kind == "swatch":
            out.append(f'<rect x="{x}" y="{y - 9}" width="18" height="12" fill="{a}" stroke="{b}"/>')
        elif kind == "dash":
            dash = f' stroke-dasharray="{b}"' if b else ""
            out.append(f'<line x1="{x}" y1="{y - 3}" x2="{x + 18}" y2="{y - 3}" stroke="{a}" '
                       f'stroke-width="1.6"{dash}/>')
        else:
            out.append(f'<circle cx="{x + 9}" cy="{y - 3}" r="6" fill="none" stroke="{a}" stroke-width="1.6"/>')
        out.append(f'<text x="{x + 24}" y="{y + 1}" fill="{st["ink"]}">{escape(text)}</text>')
        x += 30 + 7 * len(text)
    out.append("</g>")
    return out
