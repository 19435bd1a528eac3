"""Picture of a two-pulley belt drive for the report: both pulleys at the center distance, the
belt's pitch line with one mark per belt tooth, the wrap arcs with their angles, the belt teeth
in mesh on the small pulley, and the tensioner range (the large pulley's outline at the least
and greatest center distance).

Open-belt geometry (common practice, e.g. Shigley's *Mechanical Engineering Design*, belt
drives): with pitch radii r₁ ≤ r₂ at center distance C, the spans leave at φ = asin((r₂ − r₁)/C)
from the perpendicular to the line of centres; wraps are π − 2φ (small) and π + 2φ (large).
Colours from the Okabe–Ito palette (see :mod:`gen.export.report_motion`).
"""

from __future__ import annotations

import hashlib
import math
from xml.sax.saxutils import escape

import numpy as np

from gen.export.report_motion import MEMBER_STYLES, OKABE_ITO, _d, _n

W, H = 640, 330


def belt_path(r1: float, r2: float, C: float, n: int = 720) -> np.ndarray:
    """Closed polyline (k, 2) of the belt pitch line, mm: small pulley at the origin, large at
    (C, 0); starts at the upper tangent point of the small pulley, runs round it (through −X),
    along the lower span, round the large pulley and back along the upper span."""
    phi = math.asin((r2 - r1) / C)
    up = math.pi / 2 + phi
    a1 = np.linspace(up, 2 * math.pi - up, max(8, int(n * (math.pi - 2 * phi) / (2 * math.pi))))
    a2 = np.linspace(-up, up, max(8, int(n * (math.pi + 2 * phi) / (2 * math.pi))))
    small = np.column_stack([r1 * np.cos(a1), r1 * np.sin(a1)])
    large = np.column_stack([C + r2 * np.cos(a2), r2 * np.sin(a2)])
    return np.vstack([small, large])


def _marks(path: np.ndarray, pitch: float):
    """Points at every ``pitch`` along the closed ``path`` and their unit normals."""
    closed = np.vstack([path, path[:1]])
    seg = np.diff(closed, axis=0)
    ln = np.hypot(seg[:, 0], seg[:, 1])
    s = np.concatenate([[0.0], np.cumsum(ln)])
    at = np.arange(0.0, s[-1] - 1e-9, pitch)
    i = np.clip(np.searchsorted(s, at, side="right") - 1, 0, len(seg) - 1)
    t = (at - s[i]) / ln[i]
    pts = closed[i] + t[:, None] * seg[i]
    tang = seg[i] / ln[i][:, None]
    return pts, np.column_stack([tang[:, 1], -tang[:, 0]])


def belt_svg(sol, *, title: str = "", outlines=(None, None)) -> str:
    """SVG text of a :class:`gen.geometry.belt.DriveSolution` (mm, degrees).

    ``outlines``: optional own-frame pulley outlines (n, 2) drawn instead of the outside
    circles."""
    r1, r2 = (d / 2.0 for d in sol.pitch_diameters)
    o1, o2 = (d / 2.0 for d in sol.outside_diameters)
    C = sol.center_distance
    x0, x1 = -o1 * 1.1, sol.center_max + o2 * 1.1
    y0, y1 = -o2 * 1.35, o2 * 1.45
    left, right = 130, 20          # pixels kept for the labels
    s = min((W - left - right) / (x1 - x0), (H - 130) / (y1 - y0))
    ox, oy = left - s * x0, 30 + (H - 130) / 2.0

    def P(x, y):
        return ox + s * x, oy - s * y

    uid = "b" + hashlib.sha1(f"{title}{sol.teeth}{C}".encode()).hexdigest()[:8]
    st = MEMBER_STYLES
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" class="belt" width="{W}" height="{H}" '
           f'viewBox="0 0 {W} {H}" font-family="Helvetica, Arial, sans-serif" font-size="12">',
           f"<title>{escape(title)} belt drive</title>",
           f'<rect width="{W}" height="{H}" fill="#ffffff"/>',
           f'<text x="8" y="20" font-size="14">{escape(title)}: {escape(sol.profile)} belt, '
           f'{sol.belt_teeth} teeth ({_n(sol.belt_length)} mm), pulleys {sol.teeth[0]}/'
           f'{sol.teeth[1]}</text>']
    tf = f"matrix({_n(s)} 0 0 {_n(-s)} {_n(ox)} {_n(oy)})"
    px = 1.0 / s
    out.append(f'<g transform="{tf}">')
    # tensioner range: the large pulley at the least and greatest center distance
    for c, cls in ((sol.center_min, "tension-min"), (sol.center_max, "tension-max")):
        out.append(f'<circle class="tensioner {cls}" cx="{_n(c)}" cy="0" r="{_n(o2)}" '
                   f'fill="none" stroke="{OKABE_ITO["purple"]}" stroke-width="{_n(px)}" '
                   f'stroke-dasharray="{_n(4 * px)} {_n(3 * px)}"/>')
    for i, (c, r, outline) in enumerate(((0.0, o1, outlines[0]), (C, o2, outlines[1]))):
        fill, line = st[i]
        if outline is not None:
            out.append(f'<path class="pulley" transform="translate({_n(c)} 0)" '
                       f'd="{_d(outline)}" fill="{fill}" stroke="{line}" stroke-width="{_n(px)}"/>')
        else:
            out.append(f'<circle class="pulley" cx="{_n(c)}" cy="0" r="{_n(r)}" fill="{fill}" '
                       f'stroke="{line}" stroke-width="{_n(px)}"/>')
        out.append(f'<circle cx="{_n(c)}" cy="0" r="{_n(1.2 * px * 2)}" fill="{line}"/>')
    path = belt_path(r1, r2, C)
    out.append(f'<path class="belt-path" d="{_d(path)}" fill="none" stroke="#333333" '
               f'stroke-width="{_n(2.2 * px)}" stroke-linejoin="round"/>')
    pts, nrm = _marks(path, sol.pitch)
    # belt teeth point inward (toward the pulleys): short marks on the inner side
    k = min(0.6 * sol.pitch, 6 * px)
    phi = math.asin((r2 - r1) / C)
    up = math.pi / 2 + phi
    ang = np.arctan2(pts[:, 1], pts[:, 0]) % (2 * math.pi)
    on_small = (np.hypot(pts[:, 0], pts[:, 1]) < r1 + 1e-6) & (ang >= up - 1e-9) & \
        (ang <= 2 * math.pi - up + 1e-9)
    marks_all, marks_mesh = [], []
    for (x, y), (nx, ny), m in zip(pts, nrm, on_small):
        seg = f"M {_n(x)} {_n(y)} L {_n(x - k * nx)} {_n(y - k * ny)}"
        (marks_mesh if m else marks_all).append(seg)
    out.append(f'<path class="belt-teeth" d="{" ".join(marks_all)}" stroke="#333333" '
               f'stroke-width="{_n(1.2 * px)}"/>')
    out.append(f'<path class="teeth-in-mesh" d="{" ".join(marks_mesh)}" '
               f'stroke="{OKABE_ITO["vermillion"]}" stroke-width="{_n(2.0 * px)}"/>')
    out.append("</g>")
    # labels in pixels
    wrap2 = 360.0 - sol.wrap_angle
    lx, ly = P(-o1 * 1.1, o1 * 1.2)
    out.append(f'<text class="wrap" x="{_n(lx)}" y="{_n(ly)}" text-anchor="end">wrap '
               f'{sol.wrap_angle:.1f}°</text>')
    out.append(f'<text x="{_n(lx)}" y="{_n(ly + 14)}" text-anchor="end" '
               f'fill="{OKABE_ITO["vermillion"]}">{sol.teeth_in_mesh:.1f} teeth in mesh</text>')
    rx, ry = P(C + o2 * 0.2, o2 * 1.25)
    out.append(f'<text class="wrap" x="{_n(rx)}" y="{_n(ry)}">wrap {wrap2:.1f}°</text>')
    ay = H - 88.0
    ax0, _ = P(sol.center_min, 0)
    ax1, _ = P(sol.center_max, 0)
    cx, _ = P(C, 0)
    c0, _ = P(0, 0)
    out.append(f'<g class="center-range" stroke="{OKABE_ITO["purple"]}">'
               f'<line x1="{_n(ax0)}" y1="{_n(ay)}" x2="{_n(ax1)}" y2="{_n(ay)}" stroke-width="3"/>'
               f'<line x1="{_n(c0)}" y1="{_n(ay + 10)}" x2="{_n(cx)}" y2="{_n(ay + 10)}" '
               f'stroke="#333" stroke-width="1"/>'
               f'<line x1="{_n(cx)}" y1="{_n(ay - 6)}" x2="{_n(cx)}" y2="{_n(ay + 14)}" stroke="#333"/></g>')
    out.append(f'<text x="{_n(c0)}" y="{_n(ay + 40)}" fill="{OKABE_ITO["purple"]}">tensioner '
               f'{sol.center_min:.2f}…{sol.center_max:.2f} mm (±{_n(sol.adjust_pct)} % belt length)'
               f'</text>')
    out.append(f'<text x="{_n(c0)}" y="{_n(ay + 24)}">C = '
               f'{C:.3f} mm</text>')
    out.append(f'<text x="{W - 8}" y="{H - 22}" text-anchor="end" fill="#444" id="{uid}k">'
               f'marks on the belt: one per belt tooth; vermillion: in mesh on the small pulley'
               f'</text><text x="{W - 8}" y="{H - 8}" text-anchor="end" fill="#444">dashed: '
               f'the large pulley at both ends of the tensioner range</text>')
    out.append("</svg>")
    return "\n".join(out) + "\n"
