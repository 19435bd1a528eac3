"""Part cards for the report: a shaded picture of the STL file written (build) or the
measured outline (check), key sizes, mass, rated torque, files and findings.

Pictures are drawn from the file actually on disk (read back with trimesh) by the numpy
z-buffer of :mod:`gen.export.report_raster` and embedded as base64 PNG ``data:`` URIs, so the
page needs nothing else.
"""

from __future__ import annotations

import base64
import os
from html import escape

import numpy as np

from gen.export.report_motion import MEMBER_STYLES, _d, _n

#: sizes shown first on a card, in this order (mm, degrees, counts); the rest fold away
KEY_SIZES = ("module", "teeth", "pressure_angle", "helix_angle", "profile_shift",
             "pitch_diameter", "tip_diameter", "root_diameter", "face_width", "length",
             "height", "profile", "outside_diameter", "pitch_cone_angle", "mounting_distance",
             "rim_outside_diameter", "thickness")
#: shaded-picture colour per role (Okabe–Ito hues, lightened for shading)
ROLE_COLOURS = {"external_gear": (0.34, 0.62, 0.84), "internal_gear": (0.30, 0.66, 0.56),
                "rack": (0.86, 0.62, 0.22), "bevel_gear": (0.80, 0.50, 0.68),
                "pulley": (0.42, 0.56, 0.80), "plain": (0.66, 0.66, 0.62)}
PICTURE = (300, 220)


def anchor(kind: str, name: str) -> str:
    """A unique, valid element id for an item of the page."""
    safe = "".join(c if c.isalnum() or c in "-_" else "-" for c in name)
    return f"{kind}-{safe}"


def fmt(v) -> str:
    """Short display text of a number, flag, list or word (HTML-escaped)."""
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(fmt(x) for x in v) + "]"
    if isinstance(v, bool):
        return "yes" if v else "no"
    if isinstance(v, (int, np.integer)):
        return str(int(v))
    if isinstance(v, (float, np.floating)):
        return f"{v:.4g}" if abs(v) < 1e4 else f"{v:.0f}"
    return escape(str(v))


def shaded_png(stl_path: str, role: str, view=None, size=PICTURE) -> bytes:
    """PNG bytes of the STL file at ``stl_path``, shaded (see :mod:`report_raster`)."""
    from gen.export.report_raster import View, png_bytes, read_stl, shade

    v, f = read_stl(stl_path)
    return png_bytes(shade(v, f, ROLE_COLOURS.get(role, ROLE_COLOURS["plain"]),
                           view=view or View(), size=size))


def png_img(data: bytes, alt: str, cls: str = "shaded") -> str:
    return (f'<img class="{cls}" alt="{escape(alt)}" width="{PICTURE[0]}" '
            f'src="data:image/png;base64,{base64.b64encode(data).decode("ascii")}">')


def outline_svg(part, uid: str) -> str:
    """SVG of the part's measured outline (own frame, mm): the polygon the checks measured,
    or the section loops; a bevel gear has neither and gets its virtual (back-cone) tooth."""
    polys = []
    if part.outline is not None:
        polys = [np.asarray(part.outline, float)]
        section = getattr(part, "section", None)
        if section is not None and section.holes:
            polys += [h.polygon(0.02) for h in section.holes]
    elif getattr(part, "section", None) is not None:
        outer, holes = part.section.polygons(0.02)
        polys = [outer] + list(holes)
    elif part.role.value == "bevel_gear":
        from gen.validate.bevel_measure import virtual_outline

        s = part.mate.sizes
        polys = [virtual_outline(part.mate.flank, s.zv, 0.02)]
    elif getattr(part.shape, "builder", "") == "revolved":
        # a solid of revolution: its half-section (r, z) mirrored about the axis
        prof = np.asarray(part.shape.profile, float)
        polys = [prof, prof * np.array([-1.0, 1.0])]
    if not polys:
        return '<p class="muted">no outline to draw</p>'
    if part.role.value == "internal_gear":   # the toothed hole inside the rim
        r = float(part.sizes.get("rim_outside_diameter", 0)) / 2.0
        if r > 0:
            t = np.linspace(0, 2 * np.pi, 181)[:-1]
            polys = [np.column_stack([r * np.cos(t), r * np.sin(t)])] + polys
    allp = np.vstack(polys)
    lo, hi = allp.min(axis=0), allp.max(axis=0)
    w, h = PICTURE
    s = min((w - 20) / max(hi[0] - lo[0], 1e-9), (h - 20) / max(hi[1] - lo[1], 1e-9))
    cx, cy = (lo + hi) / 2
    tf = f"matrix({_n(s)} 0 0 {_n(-s)} {_n(w / 2 - s * cx)} {_n(h / 2 + s * cy)})"
    fill, line = MEMBER_STYLES[0]
    d = " ".join(_d(p) for p in polys)
    return (f'<svg xmlns="http://www.w3.org/2000/svg" class="outline-view" id="{uid}" '
            f'width="{w}" height="{h}" viewBox="0 0 {w} {h}"><title>measured outline of '
            f'{escape(part.name)}</title><rect width="{w}" height="{h}" fill="#ffffff"/>'
            f'<path transform="{tf}" fill-rule="evenodd" fill="{fill}" stroke="{line}" '
            f'stroke-width="{_n(1 / s)}" d="{d}"/></svg>')


def findings_html(findings) -> str:
    """A list of findings, each with its severity and code."""
    if not findings:
        return '<p class="muted">no findings</p>'
    items = []
    for f in findings:
        items.append(f'<li class="{escape(f.severity)}"><span class="sev">'
                     f'{escape(f.severity)}</span> <code>{escape(f.code)}</code> '
                     f'{escape(f.message)}</li>')
    return '<ul class="findings">' + "".join(items) + "</ul>"


def table(rows, cls: str = "num") -> str:
    body = "".join(f"<tr><th>{escape(str(k))}</th><td>{v}</td></tr>" for k, v in rows)
    return f'<table class="{cls}">{body}</table>'


def part_card(part, outcome=None, out_dir=None) -> str:
    """One part's card (HTML)."""
    aid = anchor("part", part.name)
    role = part.role.value
    files = (outcome.files if outcome is not None else {}) or {}
    stl = files.get("stl", {}).get("path") if files else None
    stl_path = os.path.join(out_dir, stl) if stl and out_dir else None
    if stl_path and os.path.isfile(stl_path):
        data = (outcome.extra.get("picture") if outcome is not None else None) or \
            shaded_png(stl_path, role)   # drawn by the build from this file, or now
        pic = png_img(data, f"shaded view of {part.name} from {stl}")
        caption = f"shaded from {escape(stl)} as written"
    else:
        pic = outline_svg(part, aid + "-outline")
        caption = ("Tredgold virtual outline on the back cone, large end (no file written)"
                   if part.outline is None and role == "bevel_gear" else
                   "section through the axis (no file written)"
                   if getattr(part.shape, "builder", "") == "revolved" else
                   "measured outline (no file written)")
    sizes = {k: v for k, v in part.sizes.items() if not isinstance(v, (list, tuple, dict))
             and v is not None}
    first = [(k.replace("_", " "), fmt(sizes[k])) for k in KEY_SIZES if k in sizes]
    rest = [(k.replace("_", " "), fmt(v)) for k, v in sorted(sizes.items()) if k not in KEY_SIZES]
    rows = list(first)
    mass = (outcome.mass if outcome is not None else {}) or {}
    if "mass_g" in mass:
        rows.append(("mass", f"{mass['mass_g']:.2f} g ({escape(str(mass.get('material', '')))})"))
    rating = None
    if part.rating is not None:
        try:
            rating = part.rating()
        except Exception:   # a rating that cannot be made is said, not hidden
            rating = None
    if rating and rating.get("rated_torque") is not None:
        rows.append(("rated torque (estimate)", f"{rating['rated_torque']:.3g} N·m at "
                     f"{fmt(rating.get('rpm', 0))} rpm, {escape(str(rating.get('material')))}, "
                     f"safety {fmt(rating.get('safety_factor'))}"))
    flist = "".join(f"<li><code>{escape(v['path'])}</code> {v['bytes']:,} bytes</li>"
                    for k, v in sorted(files.items())) or "<li>none written (check only)</li>"
    more = (f"<details><summary>all sizes ({len(rest)} more)</summary>{table(rest)}</details>"
            if rest else "")
    return (f'<article class="card" id="{aid}"><h3>{escape(part.name)} '
            f'<small>{escape(getattr(part, "kind", role))}</small></h3>'
            f'<figure>{pic}<figcaption>{caption}</figcaption></figure>'
            f'{table(rows)}{more}<p class="files-head">files</p><ul class="files">{flist}</ul>'
            f'{findings_html(part.findings)}</article>')
