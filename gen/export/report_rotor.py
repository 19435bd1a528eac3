"""A flywheel's section and the stress along its radius at its maximum speed, for the report.

Left: the axial section through the spin axis, drawn from the part's own revolved half-section
(:class:`gen.geometry.body.Revolved` ``profile``, (r, z) mm) and its mirror image, hatched as
cut material (narrow continuous lines at 45°, ISO 128-50, from memory), the spin axis as a
long-dashed dotted narrow centre line (ISO 128-24:2014, type 04.1). Right: radial and hoop
stress (MPa) against radius (mm) at ``max_speed`` (:func:`gen.geometry.rotor_stress.
stress_curve`: Timoshenko's constant-thickness disc, plus the thin-ring stress across the rim
of a rim + web rotor), the allowable (or yield) stress of the material as a line and the peak
estimate marked. Colours Okabe–Ito, each curve also told apart by its dash and its label.
"""

from __future__ import annotations

import hashlib
import math
from xml.sax.saxutils import escape

import numpy as np

from gen.export.report_motion import MEMBER_STYLES, OKABE_ITO, WARN, _n

W, H = 680, 372
_SECTION = (12, 40, 250, 240)
_PLOT = (330, 40, 320, 240)
HATCH_PX = 6.0
#: the allowable line is drawn on the scale when it is at most this many times the largest
#: stress plotted; higher, it is written at the top of the plot instead (the curves would be
#: flattened into the axis)
ALLOWABLE_ON_SCALE = 4.0


def _ticks(hi: float, n: int = 5):
    """Round tick values from 0 to at least ``hi`` (1, 2, 2.5 or 5 × 10^k steps)."""
    if hi <= 0:
        return [0.0, 1.0]
    raw = hi / n
    mag = 10 ** math.floor(math.log10(raw))
    step = next(m * mag for m in (1, 2, 2.5, 5, 10) if m * mag >= raw)
    return [k * step for k in range(int(math.ceil(hi / step - 1e-9)) + 1)]


def rotor_svg(part, title: str = "") -> str:
    """SVG text: section and stress plot of a flywheel part (reads ``part.shape.profile`` and
    ``part.data`` rotor/material, ``part.sizes['max_speed']`` rpm)."""
    from gen.geometry.rotor_stress import stress_curve

    rotor, mat = part.data["rotor"], part.data["material"]
    rpm = float(part.sizes["max_speed"])
    omega = rpm * 2.0 * math.pi / 60.0
    curve = stress_curve(rotor, mat, omega)
    holes = _hole_marks(rotor, mat, omega)
    prof = np.asarray(part.shape.profile, float)
    uid = "f" + hashlib.sha1((title + part.name).encode()).hexdigest()[:8]
    fill, line = MEMBER_STYLES[0]
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" class="rotor-section" id="{uid}" '
           f'width="{W}" height="{H}" viewBox="0 0 {W} {H}" '
           f'font-family="Helvetica, Arial, sans-serif" font-size="12">',
           f"<title>{escape(title or part.name)}: section and stress along the radius at "
           f"{rpm:g} rpm</title>", "<defs>",
           f'<pattern id="{uid}h" patternUnits="userSpaceOnUse" width="{HATCH_PX}" '
           f'height="{HATCH_PX}" patternTransform="rotate(45)"><rect width="{HATCH_PX}" '
           f'height="{HATCH_PX}" fill="{fill}"/><line x1="0" y1="0" x2="0" y2="{HATCH_PX}" '
           f'stroke="{line}" stroke-width="0.7"/></pattern>', "</defs>",
           f'<rect width="{W}" height="{H}" fill="#ffffff"/>',
           f'<text x="8" y="22" font-size="14">{escape(title or part.name)}</text>']
    out += _section(prof, rotor, uid, line)
    out += _plot(curve, rpm, mat, holes)
    out.append("</svg>")
    return "\n".join(out) + "\n"


def _section(prof, rotor, uid, line):
    x, y, w, h = _SECTION
    R = float(prof[:, 0].max())
    zlo, zhi = float(prof[:, 1].min()), float(prof[:, 1].max())
    s = min((w - 20) / (2 * R), (h - 40) / max(zhi - zlo, 1e-9))
    ox, oy = x + w / 2.0, y + (h - 20) / 2.0 + s * 0.5 * (zlo + zhi)

    def pt(r, z):
        return f"{_n(ox + s * r)} {_n(oy - s * z)}"

    out = ['<g class="section">']
    for sign in (1.0, -1.0):
        d = "M " + " ".join(pt(sign * r, z) for r, z in prof) + " Z"
        out.append(f'<path class="rotor-profile hatched" fill="url(#{uid}h)" stroke="{line}" '
                   f'stroke-width="1.4" d="{d}"/>')
    out.append(f'<line class="axis" x1="{_n(ox)}" y1="{_n(oy - s * zhi - 12)}" x2="{_n(ox)}" '
               f'y2="{_n(oy - s * zlo + 12)}" stroke="#000" stroke-width="0.8" '
               'stroke-dasharray="14 3 2 3"/>')
    for circle in (rotor.holes, getattr(rotor, "bolts", None)):
        if circle is None:
            continue
        rc = circle.circle_radius
        for sign in (1.0, -1.0):
            xx = ox + sign * s * rc
            out.append(f'<line class="hole-circle" x1="{_n(xx)}" y1="{_n(oy - s * zhi - 6)}" '
                       f'x2="{_n(xx)}" y2="{_n(oy - s * zlo + 6)}" stroke="#555" '
                       'stroke-width="0.6" stroke-dasharray="10 2 1.5 2"/>')
    yb = oy - s * zlo + 24
    out.append(f'<text x="{_n(ox)}" y="{_n(yb)}" text-anchor="middle">Ø{2 * R:g} mm, '
               f'{zhi - zlo:g} mm thick; section through the axis</text>')
    notes = [f"{c.count} {what} Ø{c.diameter:g} on Ø{2 * c.circle_radius:g}"
             for what, c in (("holes", rotor.holes), ("bolt holes", getattr(rotor, "bolts", None)))
             if c is not None]
    for k, note in enumerate(notes):
        out.append(f'<text x="{x + 4}" y="{_n(yb + 15 * (k + 1))}" font-size="11" '
                   f'fill="#555">{note}{" (centre lines; not in this cut)" if k == len(notes) - 1 else ""}'
                   '</text>')
    out.append("</g>")
    return out


def _hole_marks(rotor, mat, omega) -> list:
    """[(label, HoleStress)] for the rotor's bolt and lightening hole circles: Kirsch's
    concentration on the disc stress there (:mod:`gen.geometry.rotor_holes`), the same
    figures the part's peak stress and safety factor include."""
    from gen.geometry.rotor_holes import hole_stress

    out = []
    for label, circle in (("bolt holes", getattr(rotor, "bolts", None)),
                          ("lightening holes", rotor.holes)):
        if circle is not None:
            out.append((label, hole_stress(rotor, mat, omega, circle.circle_radius)))
    return out


def _plot(curve, rpm, mat, holes=()):
    x, y, w, h = _PLOT
    R = float(curve.r[-1])
    seen = [curve.radial, curve.hoop] + ([curve.ring_hoop] if curve.ring_hoop is not None
                                          else [])
    top = max(float(np.max(v)) for v in seen)
    top = max([top, curve.peak.peak] + [hs.peak for _, hs in holes])
    on_scale = curve.allowable <= ALLOWABLE_ON_SCALE * top
    ymax = 1.1 * (max(top, curve.allowable) if on_scale else top)
    xt, yt = _ticks(R), _ticks(ymax)
    xmax, ymax = xt[-1], yt[-1]

    def X(r):
        return x + w * r / xmax

    def Y(v):
        return y + h - h * v / ymax

    out = ['<g class="stress-plot">',
           f'<rect x="{x}" y="{y}" width="{w}" height="{h}" fill="#fbfbf8" stroke="#9a9a9a"/>']
    for t in xt:
        out.append(f'<line x1="{_n(X(t))}" y1="{y + h}" x2="{_n(X(t))}" y2="{y + h + 4}" '
                   f'stroke="#000"/><text class="tick-r" x="{_n(X(t))}" y="{y + h + 16}" '
                   f'text-anchor="middle">{t:g}</text>')
    for t in yt:
        out.append(f'<line x1="{x - 4}" y1="{_n(Y(t))}" x2="{x}" y2="{_n(Y(t))}" '
                   f'stroke="#000"/><line x1="{x}" y1="{_n(Y(t))}" x2="{x + w}" y2="{_n(Y(t))}" '
                   f'stroke="#e2e2dc" stroke-width="0.6"/><text class="tick-s" x="{x - 6}" '
                   f'y="{_n(Y(t) + 4)}" text-anchor="end">{t:g}</text>')
    out.append(f'<text class="axis-label" x="{x + w / 2}" y="{y + h + 32}" '
               'text-anchor="middle">radius r (mm)</text>')
    out.append(f'<text class="axis-label" x="{x - 40}" y="{y + h / 2}" text-anchor="middle" '
               f'transform="rotate(-90 {x - 40} {y + h / 2})">stress σ (MPa)</text>')

    def poly(cls, r, v, colour, dash, label):
        d = "M " + " ".join(f"{_n(X(a))} {_n(Y(b))}" for a, b in zip(r, v))
        return (f'<path class="curve {cls}" fill="none" stroke="{colour}" stroke-width="2" '
                f'{dash} d="{d}"><title>{escape(label)}</title></path>')

    hoop_c, rad_c, ring_c = OKABE_ITO["blue"], OKABE_ITO["green"], OKABE_ITO["purple"]
    out.append(poly("hoop", curve.r, curve.hoop, hoop_c, "", "hoop stress σθ (disc)"))
    out.append(poly("radial", curve.r, curve.radial, rad_c, 'stroke-dasharray="7 4"',
                    "radial stress σr (disc)"))
    if curve.ring_r is not None:
        out.append(poly("ring", curve.ring_r, curve.ring_hoop, ring_c,
                        'stroke-dasharray="2 3"', "thin-ring hoop stress ρω²r² (rim)"))
    kind = getattr(mat, "strength_kind", "allowable")
    if on_scale:
        ya = Y(curve.allowable)
        out.append(f'<line class="allowable" x1="{x}" y1="{_n(ya)}" x2="{x + w}" y2="{_n(ya)}" '
                   'stroke="#000" stroke-width="1.4" stroke-dasharray="14 3 2 3"/>')
        out.append(f'<text x="{x + w - 4}" y="{_n(ya - 5)}" text-anchor="end">{kind} '
                   f'{curve.allowable:g} MPa</text>')
    else:
        out.append(f'<text class="allowable" x="{x + w - 4}" y="{y + 14}" text-anchor="end">'
                   f'{kind} {curve.allowable:g} MPa: above the scale, ×'
                   f'{curve.allowable / top:.1f} the peak</text>')
    marks = [(curve.peak_radius, curve.peak.peak, f"the {curve.peak.where}", None)]
    marks += [(hs.circle_radius, hs.peak, label, hs) for label, hs in holes]
    worst = max(range(len(marks)), key=lambda i: marks[i][1])
    for i, (pr, pv, where, hs) in enumerate(marks):
        if hs is not None:   # from the disc stress at the hole circle to its raised value
            base = max(hs.sigma_theta, hs.sigma_r)
            out.append(f'<line class="hole-factor" x1="{_n(X(pr))}" y1="{_n(Y(base))}" '
                       f'x2="{_n(X(pr))}" y2="{_n(Y(pv))}" stroke="{WARN}" stroke-width="1" '
                       'stroke-dasharray="3 2"/>')
        peak = i == worst
        label = (("peak " if peak else "") + f"{pv:.3g} MPa at {escape(where)}"
                 + (f" (×{hs.factor:.2f}, Kirsch)" if hs is not None else ""))
        weight = ' font-weight="bold"' if peak else ""
        out.append(f'<g class="{"peak" if peak else "stress-mark"}"><circle cx="{_n(X(pr))}" '
                   f'cy="{_n(Y(pv))}" r="{5 if peak else 4}" fill="none" stroke="{WARN}" '
                   f'stroke-width="{2 if peak else 1.2}"/><text '
                   f'x="{_n(min(X(pr) + 8, x + w - 210))}" y="{_n(max(Y(pv) - 8, y + 30 + 14 * i))}" '
                   f'fill="{WARN}"{weight}>{label}</text></g>')
    # key
    ky = y + h + 50
    items = [(hoop_c, "", "hoop σθ (disc)"), (rad_c, "7 4", "radial σr (disc)")]
    if curve.ring_r is not None:
        items.append((ring_c, "2 3", "rim, thin ring ρω²r²"))
    kx = 12
    for colour, dash, text in items:
        da = f' stroke-dasharray="{dash}"' if dash else ""
        out.append(f'<line x1="{kx}" y1="{ky - 4}" x2="{kx + 22}" y2="{ky - 4}" '
                   f'stroke="{colour}" stroke-width="2"{da}/><text x="{kx + 26}" y="{ky}">'
                   f'{escape(text)}</text>')
        kx += 36 + 7 * len(text)
    out.append(f'<text x="12" y="{ky + 17}" fill="#444">at {rpm:g} rpm '
               f'({rpm * 2 * math.pi / 60:.1f} rad/s), {escape(str(mat.name))}; '
               f'Timoshenko rotating disc' + ("; hole edges: Kirsch's factor 3σ₁ − σ₂ on the "
                                              "disc stress there" if holes else "") + '</text>')
    out.append("</g>")
    return out
