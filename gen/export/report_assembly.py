"""Assemblies for the report: the placed parts drawn (shaded from the written STL files with
the assembly's poses, from two sides; or, without files, a section through the axes), a moving
top view of a planetary set, and the kinematics table.

Centre lines (axes) are long-dashed dotted narrow lines (ISO 128-24:2014, type 04.1, the
standard's line type for centre lines and pitch circles/cones).
"""

from __future__ import annotations

import math
import os
from html import escape

import numpy as np

from gen.export.report_motion import MEMBER_STYLES, OKABE_ITO, SECONDS, _d, _n
from gen.export.report_parts import ROLE_COLOURS, fmt, png_img, table

W, H = 640, 360


def stl_paths(assembly, outcomes, out_dir) -> dict:
    """Member name → its STL file as the outcomes list it (None where there is none)."""
    paths = {}
    for name in assembly.poses:
        oc = outcomes.get(name) if outcomes else None
        rel = (oc.files or {}).get("stl", {}).get("path") if oc else None
        paths[name] = os.path.join(out_dir, rel) if rel and out_dir else None
    return paths


def _bevel(assembly, models) -> bool:
    """A bevel set: one of its members is a bevel gear."""
    return any(models[n].role.value == "bevel_gear" for n in assembly.parts.values()
               if n in models)


def assembly_views(assembly, models) -> tuple:
    """The (view, label) pairs an assembly is shaded from: a bevel set along its output axis
    and from the side, any other set from above and from the side."""
    from gen.export.report_raster import View

    return ((View(-90.0, 89.0), "along the output axis"),
            (View(-40.0, 30.0), "from the side")) if _bevel(assembly, models) else \
        ((View(-90.0, 89.0), "from above"), (View(-50.0, 30.0), "from the side"))


def placed_pictures(assembly, models, paths: dict) -> list | None:
    """PNG bytes of :func:`placed_png` for every view of :func:`assembly_views` (drawn by the
    build's worker right after the assembly STEP, so the page only embeds them); None when a
    member's STL is missing."""
    out = []
    for view, _ in assembly_views(assembly, models):
        data = placed_png(assembly, models, paths, view)
        if data is None:
            return None
        out.append(data)
    return out


def placed_png(assembly, models, paths: dict, view, size=(320, 240)):
    """PNG bytes of every member's STL (``paths``: member name → file) placed by the
    assembly's poses, or None if a file is missing. One depth buffer for all, so members hide
    each other correctly."""
    from gen.export.report_raster import png_bytes, read_stl, shade

    verts, faces, cols, n0 = [], [], [], 0
    for name, pose in sorted(assembly.poses.items()):
        path = paths.get(name)
        if not path or not os.path.isfile(path):
            return None
        v, f = read_stl(path)
        T = np.asarray(pose, float)
        v = v @ T[:3, :3].T + T[:3, 3]
        role = models[name].role.value if name in models else "plain"
        verts.append(v)
        faces.append(f + n0)
        cols.append(np.broadcast_to(ROLE_COLOURS.get(role, ROLE_COLOURS["plain"]), (len(f), 3)))
        n0 += len(v)
    if not verts:
        return None
    return png_bytes(shade(np.vstack(verts), np.vstack(faces), np.vstack(cols), view=view,
                           size=size))


def axis_section_svg(assembly, models, uid: str) -> str:
    """Section through the axes of a bevel assembly: each gear's pitch cone from the common
    apex, its tooth zone (face width along the cone) and its axis (mm)."""
    gears = [(n, np.asarray(p, float)) for n, p in sorted(assembly.poses.items())
             if n in models and models[n].role.value == "bevel_gear"]
    axes = [T[:3, 2] for _, T in gears]
    normal = None
    for i in range(len(axes)):
        for j in range(i + 1, len(axes)):
            c = np.cross(axes[i], axes[j])
            if np.linalg.norm(c) > 1e-6:
                normal = c / np.linalg.norm(c)
                break
        if normal is not None:
            break
    if normal is None:
        return ""
    e1 = axes[0] / np.linalg.norm(axes[0])
    e2 = np.cross(normal, e1)
    if sum(T[:3, 3].dot(e2) for _, T in gears) < 0:   # the lone gear (output) drawn on top
        e2 = -e2
    pts = [np.zeros(3)]
    for name, T in gears:
        s_ = models[name].mate.sizes
        w = np.cross(normal, T[:3, 2])
        pts += [_pitch_point(s_, T[:3, 2], w), _pitch_point(s_, T[:3, 2], -w), T[:3, 3] * 1.3]
    P = np.array([[p.dot(e1), p.dot(e2)] for p in pts])
    lo, hi = P.min(axis=0) - 4, P.max(axis=0) + 4
    w_, h_ = 300, 240
    sc = min((w_ - 16) / (hi[0] - lo[0]), (h_ - 16) / (hi[1] - lo[1]))
    cx, cy = (lo + hi) / 2
    tf = f"matrix({_n(sc)} 0 0 {_n(-sc)} {_n(w_ / 2 - sc * cx)} {_n(h_ / 2 + sc * cy)})"
    px = 1 / sc
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" class="axis-section" id="{uid}" '
           f'width="{w_}" height="{h_}" viewBox="0 0 {w_} {h_}" font-size="11" '
           f'font-family="Helvetica, Arial, sans-serif"><title>section through the axes</title>'
           f'<rect width="{w_}" height="{h_}" fill="#ffffff"/><g transform="{tf}">']
    for (name, T), k in zip(gears, range(len(gears))):
        s = models[name].mate.sizes
        u = T[:3, 2]
        w = np.cross(normal, u)
        fill, line = MEMBER_STYLES[k % len(MEMBER_STYLES)]
        a, b = _pitch_point(s, u, w), _pitch_point(s, u, -w)
        inner = 1.0 - s.b / s.Re
        depth = (s.ha + s.hf) / 2.0
        for q in (a, b):   # tooth zone: a band either side of the pitch cone generator
            radial = _unit(q - q.dot(u) * u)
            n_out = _unit(radial - radial.dot(_unit(q)) * _unit(q))   # along the back cone
            quad = [q + n_out * depth, q * inner + n_out * depth * inner,
                    q * inner - n_out * depth * inner, q - n_out * depth]
            d = _d([[p.dot(e1), p.dot(e2)] for p in quad])
            out.append(f'<path class="tooth-zone" d="{d}" fill="{fill}" stroke="{line}" '
                       f'stroke-width="{_n(px)}"/>')
        cone = _d([[p.dot(e1), p.dot(e2)] for p in (np.zeros(3), a, b)])
        out.append(f'<path class="pitch-cone" d="{cone}" fill="none" stroke="{line}" '
                   f'stroke-width="{_n(0.8 * px)}" stroke-dasharray="{_n(8 * px)} {_n(2 * px)} '
                   f'{_n(1.5 * px)} {_n(2 * px)}"/>')
        end = T[:3, 3] * 1.3
        out.append(f'<line class="axis" x1="0" y1="0" x2="{_n(end.dot(e1))}" '
                   f'y2="{_n(end.dot(e2))}" stroke="#000" stroke-width="{_n(0.6 * px)}" '
                   f'stroke-dasharray="{_n(12 * px)} {_n(3 * px)} {_n(1.5 * px)} {_n(3 * px)}"/>')
    out.append(f'<circle cx="0" cy="0" r="{_n(2 * px)}" fill="{OKABE_ITO["vermillion"]}"/>')
    out.append('</g><text x="6" y="14">section through the axes; dot: common apex</text></svg>')
    return "".join(out)


def _unit(a):
    n = np.linalg.norm(a)
    return a / n if n > 0 else a


def _pitch_point(s, u, w):
    """Large-end pitch point of a bevel gear whose axis from the apex is −u·(apex side)."""
    # apex at the origin; the back face centre lies at distance R·cos δ along the axis
    axial = s.Re * math.cos(s.delta)
    radial = s.Re * math.sin(s.delta)
    side = -1.0  # the teeth point toward +Z local, i.e. toward the apex: back face along −u
    return side * axial * u + radial * _unit(w)


def planetary_svg(assembly, models, uid: str, seconds: float = 4 * SECONDS) -> str:
    """Top view of a planetary set placed by its poses, moving through one turn of the output
    (speeds from the kinematics: sun, ring, carrier per input turn; planets' own spin)."""
    k = assembly.kinematics
    speeds = k.get("speeds_per_input_turn", {})
    out_member = k.get("output", "carrier")
    out_speed = speeds.get(out_member, 0.0) or 1.0
    turns = 1.0 / abs(out_speed)    # input turns for one output turn
    parts = assembly.parts
    R = max(float(models[n].sizes.get("rim_outside_diameter", 0) or
                  models[n].sizes.get("outside_diameter", 0) or
                  models[n].sizes.get("tip_diameter", 0)) for n in parts.values()) / 2 * 1.05
    size = 300
    sc = (size - 16) / (2 * R)
    tf = f"matrix({_n(sc)} 0 0 {_n(-sc)} {_n(size / 2)} {_n(size / 2)})"
    px = 1 / sc
    dur = f"{_n(seconds)}s"
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" '
           f'class="planetary motion" id="{uid}" width="{size}" height="{size + 20}" '
           f'viewBox="0 0 {size} {size + 20}" font-size="11" '
           f'font-family="Helvetica, Arial, sans-serif"><title>{escape(assembly.name)} from '
           f'above, one output turn</title><rect width="{size}" height="{size + 20}" '
           f'fill="#ffffff"/><g transform="{tf}">']

    def spin(deg0, deg1):
        return (f'<animateTransform attributeName="transform" type="rotate" from="{_n(deg0)}" '
                f'to="{_n(deg1)}" dur="{dur}" repeatCount="indefinite"/>')

    order = sorted(parts.items(), key=lambda kv: (kv[0].startswith("planet"), kv[0]))
    carrier_turn = 360.0 * turns * speeds.get("carrier", 0.0)
    planet_turn = 360.0 * turns * k.get("planet_speed_per_input_turn", 0.0)
    planets = []
    for i, (role, name) in enumerate(order):
        m = models[name]
        T = np.asarray(assembly.poses[name], float)
        a0 = math.degrees(math.atan2(T[1, 0], T[0, 0]))
        x, y = T[0, 3], T[1, 3]
        d = _member_path(m)
        if not d:
            continue
        fill, line = MEMBER_STYLES[(0 if role == "sun" else 1 if role == "ring" else
                                    3 if role == "carrier" else 2)]
        shape = (f'<path class="placed {escape(role.split("_")[0])}" fill-rule="evenodd" '
                 f'fill="{fill}" fill-opacity="{0.55 if role == "carrier" else 0.9}" '
                 f'stroke="{line}" stroke-width="{_n(px)}" d="{d}"/>')
        if role.startswith("planet"):
            planets.append((x, y, a0, shape))
            continue
        turn = 360.0 * turns * speeds.get(role, 0.0)
        out.append(f'<g transform="rotate({_n(a0)})">{spin(a0, a0 + turn) if turn else ""}'
                   f'{shape}</g>')
    # planets ride on the carrier and spin about their own axes (relative spin = own − carrier)
    if planets:
        out.append(f'<g transform="rotate(0)">{spin(0, carrier_turn)}')
        for x, y, a0, shape in planets:
            rel = planet_turn - carrier_turn
            out.append(f'<g transform="translate({_n(x)} {_n(y)})"><g transform="rotate('
                       f'{_n(a0)})">{spin(a0, a0 + rel)}{shape}</g></g>')
        out.append("</g>")
    out.append(f'</g><text x="6" y="{size + 14}">one turn of the {escape(out_member)} = '
               f'{turns:.3g} input turns, in {_n(seconds)} s</text></svg>')
    return "".join(out)


def _member_path(m) -> str:
    role = m.role.value
    if role == "internal_gear":
        r = float(m.sizes.get("rim_outside_diameter", 0)) / 2
        t = np.linspace(0, 2 * math.pi, 121)[:-1]
        return _d(np.column_stack([r * np.cos(t), r * np.sin(t)])) + " " + _d(m.outline)
    if m.outline is not None:
        return _d(m.outline)
    if m.section is not None:
        outer, holes = m.section.polygons(0.05)
        return " ".join(_d(p) for p in [outer] + list(holes))
    return ""


def kinematics_rows(assembly):
    """(label, html value) rows of an assembly's kinematics and sizes."""
    rows = []
    for key, v in assembly.kinematics.items():
        if isinstance(v, dict):
            v = ", ".join(f"{k2} {fmt(x)}" for k2, x in v.items())
        rows.append((key.replace("_", " "), fmt(v) if not isinstance(v, str) else escape(v)))
    for key, v in assembly.sizes.items():
        if isinstance(v, (int, float, bool, str)):
            rows.append((key.replace("_", " "), fmt(v)))
    return rows


def assembly_html(assembly, models, outcomes, out_dir, aid: str) -> str:
    """The figures and table of one assembly (without its heading)."""
    figs = []
    bevel = _bevel(assembly, models)
    views = assembly_views(assembly, models)
    own = outcomes.get(f"assembly:{assembly.name}") if outcomes else None
    drawn = (own.extra or {}).get("pictures") if own is not None else None
    if not drawn or len(drawn) != len(views):
        paths = stl_paths(assembly, outcomes, out_dir)
        drawn = [placed_png(assembly, models, paths, view) if out_dir else None
                 for view, _ in views]
    for (view, label), data in zip(views, drawn):
        if data is not None:
            figs.append(f"<figure>{png_img(data, f'{assembly.name} {label}', 'placed')}"
                        f"<figcaption>placed parts {escape(label)}, shaded from the STL files"
                        f"</figcaption></figure>")
    if bevel:
        figs.append(f"<figure>{axis_section_svg(assembly, models, aid + '-section')}"
                    f"<figcaption>pitch cones and tooth zones</figcaption></figure>")
    else:
        figs.append(f"<figure>{planetary_svg(assembly, models, aid + '-top')}"
                    f"<figcaption>outlines as placed, moving</figcaption></figure>")
    return f'<div class="figs">{"".join(figs)}</div>' + table(kinematics_rows(assembly))
