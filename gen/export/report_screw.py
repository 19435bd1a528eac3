"""Axial half-section of a lead screw and its nut, for the report.

Drawn from the parts' own thread geometry (:func:`gen.geometry.screw.screw_axial_profile`
and :func:`gen.geometry.screw.nut_axial_profile`, the basic ISO 2904 / ISO 68-1 profile and
the nut moved back by its clearance normal to every face), repeated pitch by pitch along the
axis: in an axial plane an n-start thread repeats every pitch P, and one start comes back
after the lead L = n P.

Conventions: the axis runs left to right (z, mm), the radius upwards (r, mm); the axis and
the pitch line are long-dashed dotted narrow lines (ISO 128-24:2014, type 04.1); cut material
is hatched with narrow continuous lines at 45° (ISO 128-50, from memory: adjacent parts
hatched in different directions — the screw one way, the nut the other). The thread is drawn
with its true profile, not the simplified thread representation of ISO 6410.
Colours: Okabe–Ito (:data:`gen.export.report_motion.OKABE_ITO`).
"""

from __future__ import annotations

import hashlib
import math
from xml.sax.saxutils import escape

import numpy as np

from gen.export.report_motion import MEMBER_STYLES, _n

W, H = 640, 410
_PLOT = (14, 40, 420, 250)        # x, y, w, h (px) of the section
HATCH_PX = 6.0                    # hatch spacing (px)


def _chain(profile_windows):
    """Concatenate window edges (lists of (z, r)), dropping repeated joints."""
    out = []
    for pts in profile_windows:
        for p in pts:
            if not out or abs(out[-1][0] - p[0]) > 1e-9 or abs(out[-1][1] - p[1]) > 1e-9:
                out.append(p)
    return out


def screw_edge(s, k_lo: int, k_hi: int):
    """The screw's thread edge (z, r) over windows k_lo..k_hi (each one pitch, centred on
    z = k P), from :func:`gen.geometry.screw.screw_axial_profile`."""
    from gen.geometry.screw import screw_axial_profile

    prof = screw_axial_profile(s)            # (r, z), closed via the axis
    edge = prof[1:-1]                        # off the axis
    return _chain([[(float(z) + k * s.pitch, float(r)) for r, z in edge]
                   for k in range(k_lo, k_hi + 1)])


def nut_edge(nut, outer_radius: float, k_lo: int, k_hi: int):
    """The nut's thread edge (z, r) over windows k_lo..k_hi (window k spans [k P, (k+1) P]),
    from :func:`gen.geometry.screw.nut_axial_profile`."""
    from gen.geometry.screw import nut_axial_profile

    prof = nut_axial_profile(nut, outer_radius)   # (r, z): two outer points, then the edge
    edge = prof[2:][::-1]                         # rising z
    p = nut.sizes.pitch
    return _chain([[(float(z) + k * p, float(r)) for r, z in edge]
                   for k in range(k_lo, k_hi + 1)])


def _spread(ys, gap):
    """Label rows (px) at least ``gap`` apart, as near their wanted rows as a simple push
    down then up allows."""
    order = np.argsort(ys)
    out = np.array(ys, float)
    for i in range(1, len(order)):
        a, b = order[i - 1], order[i]
        out[b] = max(out[b], out[a] + gap)
    for i in range(len(order) - 2, -1, -1):
        a, b = order[i], order[i + 1]
        out[a] = min(out[a], out[b] - gap)
    return out


def screw_section_svg(screw=None, nut=None, *, title: str = "", drive_lines=()) -> str:
    """SVG text of the axial half-section of ``screw`` (a lead_screw part) inside ``nut`` (a
    screw_nut part); either may be None (a nut alone shows its screw's basic profile as a
    thin outline). ``drive_lines``: extra text lines (a drive train's figures)."""
    if screw is None and nut is None:
        raise ValueError("a screw section needs a screw or a nut")
    s = (screw or nut).data["thread"]
    nt = nut.data["nut"] if nut is not None else None
    P, L = s.pitch, s.lead
    n_show = max(4, min(s.starts + 1, 9))
    z0, z1 = -P / 2.0, (n_show - 0.5) * P
    R = float(nut.sizes.get("outer_diameter") or 0) / 2.0 if nut is not None else 0.0
    if nut is not None and not R > nt.root_diameter / 2.0:
        R = nt.root_diameter / 2.0 + 0.6 * s.h3
    top = max(R, s.d / 2.0 + 0.5 * s.h3)
    x, y, w, h = _PLOT
    sc = min(w / (z1 - z0), (h - 40) / top)
    ox, oy = x + (w - sc * (z1 - z0)) / 2.0 - sc * z0, y + h - 34

    def X(z):
        return ox + sc * z

    def Y(r):
        return oy - sc * r

    uid = "t" + hashlib.sha1((title + f"{s.d}{s.pitch}{s.starts}").encode()).hexdigest()[:8]
    fill1, line1 = MEMBER_STYLES[0]
    fill2, line2 = MEMBER_STYLES[1]
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" class="screw-section" id="{uid}" '
           f'width="{W}" height="{H}" viewBox="0 0 {W} {H}" '
           f'font-family="Helvetica, Arial, sans-serif" font-size="12">',
           f"<title>{escape(title)}: axial half-section</title>", "<defs>"]
    for k, (fill, line, angle) in enumerate(((fill1, line1, 45), (fill2, line2, -45))):
        out.append(f'<pattern id="{uid}h{k}" patternUnits="userSpaceOnUse" width="{HATCH_PX}" '
                   f'height="{HATCH_PX}" patternTransform="rotate({angle})">'
                   f'<rect width="{HATCH_PX}" height="{HATCH_PX}" fill="{fill}"/>'
                   f'<line x1="0" y1="0" x2="0" y2="{HATCH_PX}" stroke="{line}" '
                   f'stroke-width="0.7"/></pattern>')
    out.append(f'<clipPath id="{uid}c"><rect x="{_n(X(z0))}" y="{y}" '
               f'width="{_n(sc * (z1 - z0))}" height="{h}"/></clipPath>')
    out.append("</defs>")
    out.append(f'<rect width="{W}" height="{H}" fill="#ffffff"/>')
    out.append(f'<text x="8" y="22" font-size="14">{escape(title)}</text>')
    out.append(f'<g clip-path="url(#{uid}c)">')
    k_lo, k_hi = -1, n_show
    sedge = screw_edge(s, k_lo, k_hi)
    spts = [(z0 - P, 0.0)] + sedge + [(z1 + P, 0.0)]
    d = "M " + " ".join(f"{_n(X(z))} {_n(Y(r))}" for z, r in spts) + " Z"
    if screw is not None:
        out.append(f'<path class="screw-profile hatched" fill="url(#{uid}h0)" stroke="{line1}" '
                   f'stroke-width="1.6" d="{d}"/>')
    else:
        out.append(f'<path class="screw-profile basic" fill="none" stroke="{line1}" '
                   'stroke-width="1" stroke-dasharray="4 3" d="' + d + '"/>')
    if nut is not None:
        nedge = nut_edge(nt, R, k_lo - 1, k_hi)
        npts = nedge + [(nedge[-1][0], R), (nedge[0][0], R)]
        d = "M " + " ".join(f"{_n(X(z))} {_n(Y(r))}" for z, r in npts) + " Z"
        out.append(f'<path class="nut-profile hatched" fill="url(#{uid}h1)" stroke="{line2}" '
                   f'stroke-width="1.6" d="{d}"/>')
    out.append("</g>")
    # axis (r = 0) and the levels of the thread: major, pitch, minor, nut minor and root
    centre = 'stroke-dasharray="14 3 2 3" stroke-width="0.8"'
    out.append(f'<line class="axis" x1="{_n(X(z0) - 6)}" y1="{_n(Y(0))}" x2="{_n(X(z1) + 6)}" '
               f'y2="{_n(Y(0))}" stroke="#000" {centre}/>')
    levels = [("major", s.d, f"d = {s.d:.3f} mm (major)", "#000", ""),
              ("pitch", s.d2, f"d2 = {s.d2:.3f} mm (pitch)", "#000", centre),
              ("minor", s.d3, f"d3 = {s.d3:.3f} mm (minor)", "#000", "")]
    if nt is not None:
        levels += [("nut-minor", nt.minor_diameter,
                    f"D1 + 2c = {nt.minor_diameter:.3f} mm (nut minor)", line2, ""),
                   ("nut-root", nt.root_diameter,
                    f"D4 + 2c = {nt.root_diameter:.3f} mm (nut root)", line2, "")]
    want = [Y(dia / 2.0) for _, dia, _, _, _ in levels]
    rows = _spread(want, 14.0)
    xl = x + w + 8
    for (cls, dia, text, colour, dash), yw, yr in zip(levels, want, rows):
        style = dash or 'stroke-width="0.6"'
        out.append(f'<g class="level level-{cls}"><line x1="{_n(X(z0))}" y1="{_n(yw)}" '
                   f'x2="{_n(xl)}" y2="{_n(yw)}" stroke="{colour}" stroke-opacity="0.6" '
                   f'{style}/><line x1="{_n(xl)}" y1="{_n(yw)}" x2="{_n(xl + 10)}" '
                   f'y2="{_n(yr)}" stroke="{colour}" stroke-width="0.6"/>'
                   f'<text x="{_n(xl + 13)}" y="{_n(yr + 4)}" fill="{colour}" '
                   f'data-diameter="{dia:.4f}">{escape(text)}</text></g>')
    # pitch and lead along the axis, below it
    def dim(cls, za, zb, yy, text):
        return (f'<g class="dimension {cls}"><line x1="{_n(X(za))}" y1="{_n(yy)}" '
                f'x2="{_n(X(zb))}" y2="{_n(yy)}" stroke="#000" stroke-width="0.8"/>'
                f'<line x1="{_n(X(za))}" y1="{_n(yy - 5)}" x2="{_n(X(za))}" y2="{_n(yy + 5)}" '
                f'stroke="#000" stroke-width="0.8"/><line x1="{_n(X(zb))}" y1="{_n(yy - 5)}" '
                f'x2="{_n(X(zb))}" y2="{_n(yy + 5)}" stroke="#000" stroke-width="0.8"/>'
                f'<text x="{_n(0.5 * (X(za) + X(zb)))}" y="{_n(yy - 4)}" text-anchor="middle">'
                f'{escape(text)}</text></g>')

    out.append(dim("pitch", 0.0, P, Y(0) + 14, f"P {P:g}"))
    if L <= z1 + 1e-9:
        out.append(dim("lead", 0.0, L, Y(0) + 30, f"L = {s.starts} × P = {L:g} mm"))
    # the numbers in words
    hand = (screw or nut).sizes.get("hand", "right")
    form = "Tr" if s.form == "trapezoidal" else "M"
    text = [f"{form} {s.d:g}×{P:g}" + (f" ({s.starts} starts)" if s.starts > 1 else "")
            + f", {hand} hand; lead {L:g} mm, lead angle {math.degrees(s.lead_angle):.2f}°",
            ("ISO 2904 trapezoidal" if s.form == "trapezoidal" else "ISO 68-1 metric")
            + f" basic profile, flank angle {math.degrees(s.flank_angle):g}°, thread depth "
            f"{s.h3:.3f} mm"
            + (f", crest clearance a_c {s.ac:g} mm" if s.ac else "")]
    if nt is not None:
        text.append(f"nut clearance c = {nt.clearance:.3f} mm normal to every face: axial "
                    f"play {nt.axial_play:.3f} mm, radial engagement {nt.engagement:.3f} mm")
    sz = (screw or nut).sizes
    if sz.get("efficiency_raise") is not None:
        text.append(f"friction {sz['friction']:.3g}: efficiency raising "
                    f"{100 * sz['efficiency_raise']:.1f} %, "
                    + ("self-locking" if sz.get("self_locking") else "NOT self-locking "
                       "(the load drives the screw back)"))
    text += list(drive_lines)
    yt = y + h + 18
    for k, t in enumerate(text[:6]):
        out.append(f'<text class="screw-key" x="10" y="{yt + 16 * k}">{escape(t)}</text>')
    out.append(f'<text x="{W - 8}" y="22" text-anchor="end" fill="#444">hatched: cut '
               "material (ISO 128-50)</text>")
    out.append("</svg>")
    return "\n".join(out) + "\n"


def same_thread(screw, nut) -> bool:
    """The nut fits the screw: same form, diameter, pitch, starts and hand."""
    a, b = screw.data.get("thread"), nut.data.get("thread")
    if a is None or b is None:
        return False
    return ((a.form, a.d, a.pitch, a.starts) == (b.form, b.d, b.pitch, b.starts)
            and screw.sizes.get("hand") == nut.sizes.get("hand"))

