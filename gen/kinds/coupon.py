"""Part kind ``fit_coupon``: a small print to choose printing allowances for gears and holes.

One flat body, every piece joined to the next by thin breakaway tabs on the bottom layers:

- a row of **pinion sectors** (front): five-tooth slices of a ``teeth``-tooth spur gear, one
  per entry of ``steps``; sector k has its teeth thinned by ``steps[k]`` mm per flank
  (arc thinning 2·steps[k] on the reference circle) and carries k + 1 raised dots;
- a **bore ladder** (middle): a strip with one hole per entry of ``bore_steps``, of diameter
  ``bore + bore_steps[k]``, each with k + 1 raised dots below it;
- a **rack** segment (back): eight teeth of the nominal basic-rack form, no thinning.

Use: break the pieces off; roll each sector along the rack. The sector with the fewest dots
that rolls without binding gives the clearance c the printer needs between mating flanks;
give each gear of a printed pair ``backlash_allowance: c`` (thinning c on each gear is c/2
per flank, both gears together c per flank, as on the coupon). The first hole a ``bore`` mm
shaft or pin enters gives the hole allowance.

Layout (XY, mm): sector centres on y = 0 with teeth toward −Y, strip above, rack above that
with its teeth toward +Y; bottom face on z = 0, top at z = ``thickness``.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.body import Body, Prism
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.generate import generate_flank
from gen.geometry.rack_outline import rack_loop, rack_sizes
from gen.geometry.section import Arc, Line, Loop, Section, Spline, circle, signed_area
from gen.params.schema import REQUIRED, Key
from gen.tolerances import TOL
from gen.kinds import common_keys as K
from gen.kinds.base import Part, Role
from gen.validate import measure
from gen.findings import ERROR, INFO, Finding
from gen.validate.rack_checks import rack_compare, rack_measure

KIND = "fit_coupon"
ROLE = Role.PLAIN

#: shape of the coupon (mm unless stated); printing-scale choices of our own
SECTOR_TEETH = 5        # teeth on each pinion sector
RACK_TEETH = 8          # teeth on the rack segment
RACK_BACK = 3.0         # rack material below the tooth root
GAP = 3.0               # space between pieces, bridged by tabs
WALL = 2.5              # material around the holes and dots of the strip
TAB_WIDTH, TAB_HEIGHT, TAB_INTO = 1.2, 0.6, 1.0   # breakaway tab: width, height, overlap
DOT_D, DOT_PITCH, DOT_HEIGHT, DOT_SINK = 1.2, 2.0, 0.6, 0.2
DOT_CLEAR = 0.4         # least material between a dot and its piece's edge
DOTS_PER_ROW = 4
DOT_TO_HOLE = 1.5       # gap between the dot rows and the largest hole
MAX_STEPS = 8
DEFAULT_STEPS = (0.0, 0.05, 0.10, 0.15, 0.20)      # mm per flank (common practice 0.05–0.2)
DEFAULT_BORE_STEPS = (0.0, 0.1, 0.2, 0.3, 0.4)     # mm on the diameter (holes print small)
DEFAULT_ALPHA_DEG = 20.0

KEYS = (
    Key("module", "float", REQUIRED, lo=0.5, hi=6, unit="mm",
        doc="module of the gears you will print"),
    Key("pressure_angle", "angle", None, lo=10, hi=35, unit="deg",
        doc=f"pressure angle of the basic rack (default {DEFAULT_ALPHA_DEG:g})"),
    K.PROFILE,
    Key("teeth", "int", 18, lo=2 * SECTOR_TEETH, hi=60,
        doc="teeth of the whole gear the pinion sectors are cut from"),
    Key("steps", "list", None, lo=0, hi=0.5, unit="mm", max_count=MAX_STEPS, ascending=True,
        doc="flank clearances to try, mm per flank, as a list, ascending (default "
            + ", ".join(f"{s:g}" for s in DEFAULT_STEPS) + ")"),
    Key("bore", "float", REQUIRED, lo=1, hi=30, unit="mm",
        doc="nominal hole diameter: the shaft or pin to fit"),
    Key("bore_steps", "list", None, lo=0, hi=1.0, unit="mm", max_count=MAX_STEPS,
        ascending=True,
        doc="diameter allowances to try, mm, as a list, ascending (default "
            + ", ".join(f"{s:g}" for s in DEFAULT_BORE_STEPS) + ")"),
    Key("thickness", "float", 4.0, lo=1.5, hi=20, unit="mm", doc="height of every piece"),
    K.CHORD,
)

#: values filled into the starter file written by ``pitchline new fit_coupon``
EXAMPLE = {"module": 1.5, "bore": 5}


# ---------------------------------------------------------------- small geometry helpers
def _moved(loop: Loop, d) -> Loop:
    dx, dy = float(d[0]), float(d[1])
    out = []
    for c in loop.curves:
        if isinstance(c, Line):
            out.append(Line((c.p0[0] + dx, c.p0[1] + dy), (c.p1[0] + dx, c.p1[1] + dy)))
        elif isinstance(c, Arc):
            out.append(Arc((c.center[0] + dx, c.center[1] + dy), c.radius, c.a0, c.a1))
        else:
            out.append(Spline(np.asarray(c.points) + [dx, dy]))
    return Loop(tuple(out), circle=loop.circle)


def _rect(x0, y0, x1, y1) -> Loop:
    p = [(x0, y0), (x1, y0), (x1, y1), (x0, y1)]
    return Loop(tuple(Line(p[i], p[(i + 1) % 4]) for i in range(4)))


def _polar(r, ang):
    return np.column_stack([r * np.cos(ang), r * np.sin(ang)])


def sector_loop(flank, n_teeth: int, mid: float) -> Loop:
    """``n_teeth`` consecutive teeth of the gear of ``flank`` centred on the angle ``mid``,
    closed by two radial lines through the gear centre (ccw, same curves as a whole gear)."""
    r, psi, pitch = flank.r, flank.psi, 2.0 * math.pi / flank.z
    n_root = int(np.searchsorted(r, flank.r_junction, side="right"))
    pieces = [slice(0, n_root)] + ([slice(n_root - 1, len(r))] if n_root < len(r) else [])
    centres = mid + (np.arange(n_teeth) - (n_teeth - 1) / 2.0) * pitch
    half_root = pitch / 2.0 - psi[0]
    curves = []
    for k, c in enumerate(centres):
        a_in = c - pitch / 2.0 if k == 0 else c - pitch + psi[0]
        if half_root > 1e-9:
            curves.append(Arc((0.0, 0.0), flank.r_root, a_in, c - psi[0]))
        for sl in pieces:
            curves.append(Spline(_polar(r[sl], c - psi[sl])))
        curves.append(Arc((0.0, 0.0), flank.r_tip, c - psi[-1], c + psi[-1]))
        for sl in reversed(pieces):
            curves.append(Spline(_polar(r[sl][::-1], c + psi[sl][::-1])))
    if half_root > 1e-9:
        curves.append(Arc((0.0, 0.0), flank.r_root, centres[-1] + psi[0],
                          centres[-1] + pitch / 2.0))
    start, end = tuple(curves[0].start), tuple(curves[-1].end)
    curves += [Line(end, (0.0, 0.0)), Line((0.0, 0.0), start)]
    return Loop(tuple(curves))


def dot_grid(count: int, x: float, y: float, step_y: float) -> list[tuple]:
    """Centres of ``count`` dots in rows of up to DOTS_PER_ROW centred on x, the first row
    at y, further rows ``step_y`` apart (sign gives the direction)."""
    out = []
    for row in range(math.ceil(count / DOTS_PER_ROW)):
        n = min(DOTS_PER_ROW, count - row * DOTS_PER_ROW)
        for i in range(n):
            out.append((x + (i - (n - 1) / 2.0) * DOT_PITCH, y + row * step_y))
    return out


def _edge_distance(poly: np.ndarray, p) -> float:
    a, b = poly, np.roll(poly, -1, axis=0)
    ab, ap = b - a, np.asarray(p) - a
    t = np.clip(np.einsum("ij,ij->i", ap, ab) / np.maximum(np.einsum("ij,ij->i", ab, ab), 1e-300),
                0.0, 1.0)
    return float(np.min(np.hypot(*(ap - t[:, None] * ab).T)))


def _inside(poly: np.ndarray, p) -> bool:
    x, y = p
    a, b = poly, np.roll(poly, -1, axis=0)
    cross = (a[:, 1] > y) != (b[:, 1] > y)
    xs = a[cross, 0] + (y - a[cross, 1]) * (b[cross, 0] - a[cross, 0]) / (b[cross, 1] - a[cross, 1])
    return bool(np.count_nonzero(xs > x) % 2)


def centroid(poly: np.ndarray) -> np.ndarray:
    x, y = poly[:, 0], poly[:, 1]
    xn, yn = np.roll(x, -1), np.roll(y, -1)
    cr = x * yn - xn * y
    a = cr.sum() / 2.0
    return np.array([((x + xn) * cr).sum(), ((y + yn) * cr).sum()]) / (6.0 * a)


# ---------------------------------------------------------------------- value checking
def _step_list(values, key: str, default, where) -> list[float]:
    """The checked list of ``key`` (the schema checked range, count and order), or the default."""
    v = values[key]
    return list(default) if v is None else [float(s) for s in v]


# --------------------------------------------------------------------------- the model
def make(name, values, where):
    steps = _step_list(values, "steps", DEFAULT_STEPS, where)
    bore_steps = _step_list(values, "bore_steps", DEFAULT_BORE_STEPS, where)
    alpha = values["pressure_angle"]
    alpha = math.radians(DEFAULT_ALPHA_DEG) if alpha is None else alpha
    m, z, t, tol = values["module"], values["teeth"], values["thickness"], values["chord_tolerance"]
    rack = basic_rack(values["profile"]).with_alpha(alpha)

    # pinion sectors, one flank generation per clearance step
    sectors = []
    for c in steps:
        sz = gear_sizes(z, m, rack, thinning=2.0 * c)
        try:
            flank = generate_flank(z, sz.rp, cutter_for(sz, rack), sz.ra)
            loop = sector_loop(flank, SECTOR_TEETH, -math.pi / 2.0)
        except GeometryError as exc:
            raise where.error("steps", f"clearance {c:g} mm: {exc}", None) from None
        if flank.psi[-1] <= 0:
            raise where.error("steps", f"clearance {c:g} mm per flank leaves pointed teeth at "
                              f"module {m:g}: use smaller steps or a larger module", None)
        sectors.append({"step": c, "sizes": sz, "loop": loop, "poly": loop.polygon(tol)})
    xs = np.concatenate([s["poly"][:, 0] for s in sectors])
    half_w = float(np.max(np.abs(xs)))
    sector_pitch = 2.0 * half_w + GAP
    row_w = len(steps) * sector_pitch - GAP
    for k, s in enumerate(sectors):
        s["centre"] = ((k - (len(steps) - 1) / 2.0) * sector_pitch, 0.0)

    # rack segment (nominal) and bore ladder strip
    rs = rack_sizes(m, rack, height=rack.dedendum * m + RACK_BACK, teeth=RACK_TEETH)
    rloop = rack_loop(rs, rack)
    diam = [values["bore"] + a for a in bore_steps]
    d_max = max(diam)
    rows_max = math.ceil(len(bore_steps) / DOTS_PER_ROW)
    dot_top = WALL + DOT_D + (rows_max - 1) * DOT_PITCH
    hole_y = dot_top + DOT_TO_HOLE + d_max / 2.0
    strip_h = hole_y + d_max / 2.0 + WALL
    grid_w = (min(len(bore_steps), DOTS_PER_ROW) - 1) * DOT_PITCH + DOT_D
    need = len(diam) * (max(d_max, grid_w) + WALL) + WALL
    strip_len = max(need, row_w, rs.length)
    y_strip = GAP
    hole_pitch = (strip_len - WALL) / len(diam)
    holes = [(-strip_len / 2.0 + WALL / 2.0 + (i + 0.5) * hole_pitch, y_strip + hole_y)
             for i in range(len(diam))]
    y_top = y_strip + strip_h
    rack_off = (-rs.length / 2.0, y_top + GAP + rs.height)

    # prisms: pieces, tabs, dots
    strip_sec = Section(_rect(-strip_len / 2.0, y_strip, strip_len / 2.0, y_top),
                        tuple(circle(d / 2.0, c) for d, c in zip(diam, holes)))
    rack_sec = Section(_moved(rloop, rack_off))
    solids = [Prism(strip_sec, 0.0, t), Prism(rack_sec, 0.0, t)]
    tabs = []
    for s in sectors:
        s["section"] = Section(_moved(s["loop"], s["centre"]))
        solids.append(Prism(s["section"], 0.0, t))
        x = s["centre"][0]
        tabs.append(_rect(x - TAB_WIDTH / 2, -TAB_INTO, x + TAB_WIDTH / 2, y_strip + TAB_INTO))
    for x in (-rs.length / 4.0, rs.length / 4.0):
        tabs.append(_rect(x - TAB_WIDTH / 2, y_top - TAB_INTO, x + TAB_WIDTH / 2,
                          y_top + GAP + TAB_INTO))
    solids += [Prism(Section(tb), 0.0, min(TAB_HEIGHT, t / 2.0)) for tb in tabs]

    # dots: sector k and hole k get k + 1; sector rows start where the pie is wide enough
    half_angle = min(SECTOR_TEETH * math.pi / z, math.radians(80.0))
    # distance from an outer dot (x_out, −y) to a radial edge: y sin h − x_out cos h
    x_out = (min(len(steps), DOTS_PER_ROW) - 1) / 2.0 * DOT_PITCH
    y0 = max((x_out * math.cos(half_angle) + DOT_D / 2.0 + DOT_CLEAR) / math.sin(half_angle),
             TAB_INTO + DOT_D)
    marks = []   # (piece polygon, [dot centres]) for the fit check
    for k, s in enumerate(sectors):
        cx = s["centre"][0]
        dots = dot_grid(k + 1, cx, -y0, -DOT_PITCH)
        marks.append((s["poly"] + [cx, 0.0], dots, f"pinion sector {k + 1}"))
        s["dots"] = dots
    strip_poly = strip_sec.outer.polygon(tol)
    hole_dots = []
    for k, (hx, _) in enumerate(holes):
        dots = dot_grid(k + 1, hx, y_strip + WALL + DOT_D / 2.0, DOT_PITCH)
        marks.append((strip_poly, dots, f"bore step {k + 1}"))
        hole_dots.append(dots)
    for poly, dots, label in marks:
        for p in dots:
            if not _inside(poly, p) or _edge_distance(poly, p) < DOT_D / 2.0 + DOT_CLEAR - 1e-9:
                raise where.error("module", f"the {label} marks do not fit on the piece: use a "
                                  "larger module or more teeth", values["module"])
            solids.append(Prism(Section(circle(DOT_D / 2.0, p)), t - DOT_SINK, t + DOT_HEIGHT))
    body = Body(tuple(solids))

    layout = {"sectors": [{"step": s["step"], "sizes": s["sizes"], "centre": s["centre"],
                           "centroid": centroid(s["poly"]) + s["centre"], "dots": s["dots"]}
                          for s in sectors],
              "rack": {"sizes": rs, "offset": rack_off,
                       "centroid": centroid(rloop.polygon(tol)) + rack_off},
              "holes": [{"centre": c, "diameter": d, "allowance": a, "dots": hd}
                        for c, d, a, hd in zip(holes, diam, bore_steps, hole_dots)]}
    polys = [p for sec in [strip_sec, rack_sec] + [s["section"] for s in sectors]
             for p in [sec.polygons(tol)[0], *sec.polygons(tol)[1]]]
    lo, hi = np.vstack(polys).min(axis=0), np.vstack(polys).max(axis=0)
    measured = measure_coupon(polys, layout)
    findings = coupon_findings(name, measured, layout, tol=TOL.size, chord=tol, where="section")
    findings.append(Finding(INFO, "coupon-steps",
                            f"{len(steps)} pinion sectors at {', '.join(f'{c:g}' for c in steps)} mm "
                            f"per flank; {len(diam)} holes of "
                            f"{', '.join(f'{d:.2f}' for d in diam)} mm; footprint "
                            f"{hi[0] - lo[0]:.1f} × {hi[1] - lo[1]:.1f} mm; dots count the step",
                            name, "measured on the section"))
    findings.append(Finding(INFO, "coupon-reading",
                            "the sector with the fewest dots that rolls along the rack without "
                            "binding gives backlash_allowance for each gear of a printed pair; "
                            f"the first hole a {values['bore']:g} mm pin enters gives the hole "
                            "allowance", name, "coupon layout"))
    sizes = {"module": m, "pressure_angle": math.degrees(alpha), "teeth": z,
             "sector_teeth": SECTOR_TEETH, "rack_teeth": RACK_TEETH, "steps": steps,
             "tooth_thickness": [s["sizes"].s for s in sectors], "bore": values["bore"],
             "bore_steps": bore_steps, "hole_diameters": diam, "thickness": t, "face_width": t,
             "footprint": [float(hi[0] - lo[0]), float(hi[1] - lo[1])]}
    def slice_check(slicer):
        z_at = 0.5 * t
        got = measure_coupon(slicer(z_at), layout)
        return coupon_findings(name, got, layout, tol=2 * tol + TOL.slice_extra, chord=tol,
                               where=f"mesh slice z={z_at:g}")

    return Part(name=name, kind=KIND, role=ROLE, values=values, shape=body, sizes=sizes,
                findings=tuple(findings), slice_checks=(slice_check,), chord_tol=tol,
                data={"layout": layout, "measured": measured})


# ------------------------------------------------------------------------- measurement
def _nearest(polys, point, limit):
    best, dist = None, limit
    for p in polys:
        if len(p) < 3 or abs(signed_area(p)) < 1e-9:
            continue
        d = float(np.hypot(*(centroid(p) - point)))
        if d < dist:
            best, dist = p, d
    return best


def measure_coupon(polys, layout) -> dict:
    """Measure every piece on closed outlines (section polygons or a mesh slice)."""
    polys = [np.asarray(p, dtype=float) for p in polys]
    out = {"sectors": [], "holes": [], "rack": None}
    for s in layout["sectors"]:
        sz = s["sizes"]
        p = _nearest(polys, s["centroid"], sz.rp / 2.0)
        if p is None:
            out["sectors"].append(None)
            continue
        local = p - s["centre"]
        th = measure.arc_thickness(local, sz.rp)
        out["sectors"].append({"teeth": measure.tooth_count(local, 0.5 * (sz.rf + sz.ra)),
                               "thickness": float(th.mean()) if len(th) else float("nan"),
                               "spread": float(np.ptp(th)) if len(th) else float("nan"),
                               "tip": float(measure.radii(local).max())})
    r = layout["rack"]
    p = _nearest(polys, r["centroid"], r["sizes"].height)
    out["rack"] = None if p is None else rack_measure(p - r["offset"], r["sizes"])
    for h in layout["holes"]:
        p = _nearest(polys, h["centre"], h["diameter"] / 4.0)
        if p is None:
            out["holes"].append(None)
            continue
        rad = np.hypot(*(p - centroid(p)).T)
        out["holes"].append({"d_max": 2.0 * float(rad.max()),
                             "d_area": 2.0 * math.sqrt(abs(signed_area(p)) / math.pi)})
    return out


def coupon_findings(subject, got, layout, *, tol, chord, where) -> list:
    """Errors for every measured value that disagrees with the layout's formulas."""
    out = []

    def err(code, msg, source):
        out.append(Finding(ERROR, code, f"{where}: {msg}", subject, source))

    for k, (s, g) in enumerate(zip(layout["sectors"], got["sectors"])):
        label = f"pinion sector {k + 1} ({s['step']:g} mm per flank)"
        if g is None:
            err("piece-missing", f"{label} not found", "coupon layout")
            continue
        if g["teeth"] != SECTOR_TEETH:
            err("tooth-count", f"{label}: counted {g['teeth']} teeth, expected {SECTOR_TEETH}",
                "coupon layout")
        sz = s["sizes"]
        t_tol = max(tol, TOL.thickness_rel * sz.mn)
        if not abs(g["thickness"] - sz.s) <= t_tol:
            err("size-mismatch", f"{label}: arc tooth thickness on the reference circle "
                f"{g['thickness']:.4f} mm, formula {sz.s:.4f} mm (tolerance {t_tol:g} mm)",
                "ISO 21771: s = m π/2 − thinning")
        if not abs(g["tip"] - sz.ra) <= tol + chord:
            err("size-mismatch", f"{label}: tip radius {g['tip']:.4f} mm, formula {sz.ra:.4f} mm",
                "ISO 21771: da = d + 2 m")
    if got["rack"] is None:
        err("piece-missing", "rack segment not found", "coupon layout")
    else:
        out += rack_compare(subject, got["rack"], layout["rack"]["sizes"], tol=tol + chord,
                            where=f"{where}, rack segment")
    for k, (h, g) in enumerate(zip(layout["holes"], got["holes"])):
        label = f"bore step {k + 1} (+{h['allowance']:g} mm)"
        if g is None:
            err("piece-missing", f"{label}: hole not found", "coupon layout")
            continue
        d = h["diameter"]
        # vertices lie on the circle; the inscribed polygon's area is a little smaller
        if not (abs(g["d_max"] - d) <= tol and -tol <= d - g["d_area"] <= 2.0 * chord + tol):
            err("size-mismatch", f"{label}: hole measures {g['d_max']:.4f} mm across its "
                f"vertices, {g['d_area']:.4f} mm by its area, expected {d:.4f} mm (chord "
                f"tolerance {chord:g} mm)", "bore + allowance")
    return out
