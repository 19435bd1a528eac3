"""The anti-backlash slit of a ``screw_nut``: its cuts, manifest numbers, note and the slice
check that re-measures slit, bridge and preload holes on the exported triangles.

Layout and numbers: :mod:`gen.geometry.screw_split`. Frame of :mod:`gen.kinds.screw_nut`
(axis Z, bridge centred on +X, preload screw on −X). Lengths mm, angles degrees in the
manifest.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import ParamError
from gen.findings import ERROR, INFO, Finding
from gen.geometry.body import Prism
from gen.geometry.screw_split import PRELOAD_SCREWS, SplitNut, split_nut
from gen.geometry.section import Arc, Line, Loop, Section, area_centroid, circle
from gen.kinds.base import Formula
from gen.tolerances import LIMITS, TOL
from gen.validate.printability import print_limits

SOURCE = "computed (gen.geometry.screw_split: rigid halves turning about the bridge)"
SPLIT_FORMULAS = (
    Formula("anti_backlash.axial_play", "f = 2 c / cos(α/2) = 2 c_r tan(α/2), c_r = c / sin(α/2)",
            "computed (flank moved back by c normal to itself)"),
    Formula("anti_backlash.hinge_radius", "x_h = ⅔ (R³ − r₄³)/(R² − r₄²) · sin φ / φ, φ = β/2",
            "centroid of an annular sector (standard)"),
    Formula("anti_backlash.slit_needed", "s_needed = f (x_h + r_s) / x_h", SOURCE),
)
#: how far (mm) beyond the body the preload-hole cuts stand out, so no face coincides
OVERRUN = 0.5
#: mm: a slit face must lie within this of its place on the triangles (the cut's faces are
#: planes, so only float round-off moves them; the probe steps this far to either side)
FACE_PROBE = TOL.mesh_size


def make_split(values, ab, nut, r_root, R, flange_top, length, where):
    """(SplitNut, cut prisms) for the ``anti_backlash`` mapping ``ab``; ParamError on bad input."""
    limits = print_limits(values.get("fit") if isinstance(values.get("fit"), dict) else {})
    screw = PRELOAD_SCREWS[ab["preload_screw"]]
    s = ab["slit"]
    z_mid = 0.5 * length
    if z_mid - s / 2.0 < flange_top + limits.wall:
        raise where.error("anti_backlash.slit", f"a {s:g} mm slit at mid-length (z = "
                          f"{z_mid:g} mm) leaves less than {limits.wall:g} mm of barrel over "
                          f"the flange ({flange_top:g} mm thick): lengthen the nut", s,
                          f"length ≥ {2 * (flange_top + limits.wall) + s:.2f} mm")
    try:
        sp = split_nut(axial_play=nut.axial_play, root_radius=r_root, outer_radius=R, slit=s,
                       z_mid=z_mid, bridge=ab["bridge"], screw=screw,
                       screw_radius=ab["screw_radius"], least_line=limits.wall,
                       wall=LIMITS.min_wall)
    except ParamError as exc:
        raise where.error(exc.key, exc.detail, exc.value, exc.allowed) from None
    return sp, cuts_of(sp, length)


def cuts_of(sp: SplitNut, length: float) -> tuple:
    """The slit (a pie round everything but the bridge) and the two preload holes."""
    phi = sp.bridge / 2.0
    big = sp.outer_radius + 1.0
    a, b = phi, 2.0 * math.pi - phi
    pa = (big * math.cos(a), big * math.sin(a))
    pb = (big * math.cos(b), big * math.sin(b))
    pie = Loop((Line((0.0, 0.0), pa), Arc((0.0, 0.0), big, a, b), Line(pb, (0.0, 0.0))))
    c = sp.screw_xy()
    mid = 0.5 * (sp.z_lo + sp.z_hi)
    return (Prism(Section(pie), sp.z_lo, sp.z_hi),
            Prism(Section(circle(sp.screw.pilot / 2.0, c)), -OVERRUN, mid),
            Prism(Section(circle(sp.screw.clearance / 2.0, c)), mid, length + OVERRUN))


def split_sizes(sp: SplitNut) -> dict:
    return {"slit": sp.slit, "slit_z": [sp.z_lo, sp.z_hi], "slit_needed": sp.slit_needed,
            "takes_up": sp.takes_up, "axial_play": sp.axial_play,
            "bridge": math.degrees(sp.bridge), "bridge_chord": sp.bridge_chord,
            "hinge_radius": sp.hinge_radius, "takeup_ratio": sp.takeup_ratio,
            "preload_screw": sp.screw.name, "screw_radius": sp.screw_radius,
            "clearance_hole": sp.screw.clearance, "pilot_hole": sp.screw.pilot}


def split_note(name: str, sp: SplitNut) -> Finding:
    return Finding(INFO, "split-nut",
                   f"anti-backlash slit {sp.slit:g} mm at z {sp.z_lo:g}–{sp.z_hi:g} mm, bridge "
                   f"{math.degrees(sp.bridge):g}° ({sp.bridge_chord:.2f} mm on the thread root): "
                   f"the plain nut floats {sp.axial_play:.3f} mm; a {sp.screw.name} screw on "
                   f"radius {sp.screw_radius:.2f} mm closes the slit with the halves turning "
                   f"about the bridge ({sp.takeup_ratio:.3f} of the closure reaches the thread "
                   f"axis), so the float is gone after {sp.slit_needed:.3f} mm of closure; "
                   f"tighten until the screw turns the nut with light drag. The slit's upper "
                   "face prints as an overhang carried by the bridge", name, SOURCE,
                   key="anti_backlash")


def _material_at(loops, pt) -> bool:
    """Even-odd: is point ``pt`` inside the material of a slice given as closed loops?"""
    x, y = pt
    n = 0
    for p in loops:
        p = np.asarray(p, dtype=float)[:, :2]
        a, b = p, np.roll(p, -1, axis=0)
        cond = (a[:, 1] > y) != (b[:, 1] > y)
        with np.errstate(divide="ignore", invalid="ignore"):
            xc = a[:, 0] + (y - a[:, 1]) * (b[:, 0] - a[:, 0]) / (b[:, 1] - a[:, 1])
        n += int(np.count_nonzero(cond & (x < xc)))
    return n % 2 == 1


def measure_split(slicer, sp: SplitNut, length: float) -> dict:
    """Slit faces, bridge and preload holes measured on slices of the triangles (mm, deg).

    * probe: a point in the wall halfway between the bridge edge and the screw hole; the
      lower face lies between the highest z with material there and the next probe.
    * bridge: the slice at mid-slit; angular span of its vertices outside the thread root.
    * holes: the loop nearest the screw axis in a slice of each half; its area centroid, and
      the diameter through its farthest corner.
    """
    reach = math.asin(min(1.0, (sp.screw.clearance / 2.0 + LIMITS.min_wall) / sp.screw_radius))
    ang = 0.5 * (sp.bridge / 2.0 + math.pi - reach)
    rp = 0.5 * (sp.root_radius + sp.outer_radius)
    probe = (rp * math.cos(ang), rp * math.sin(ang))
    d = FACE_PROBE
    mid = 0.5 * (sp.z_lo + sp.z_hi)
    at = {z: _material_at(slicer(z), probe)
          for z in (sp.z_lo - d, sp.z_lo + d, mid, sp.z_hi - d, sp.z_hi + d)}
    loops = [np.asarray(p, dtype=float)[:, :2] for p in slicer(mid)]
    pts = np.concatenate(loops) if loops else np.zeros((0, 2))
    r = np.hypot(pts[:, 0], pts[:, 1])
    th = np.arctan2(pts[:, 1], pts[:, 0])
    out_wall = pts[r > sp.root_radius + 0.25 * (sp.outer_radius - sp.root_radius)]
    span = (float(np.ptp(np.arctan2(out_wall[:, 1], out_wall[:, 0]))) if len(out_wall)
            else 0.0)

    def hole(z):
        c = np.array(sp.screw_xy())
        best = None
        for p in slicer(z):
            p = np.asarray(p, dtype=float)[:, :2]
            _, cen = area_centroid(p)
            if cen is None:
                continue
            if best is None or np.hypot(*(cen - c)) < np.hypot(*(best[0] - c)):
                # an inscribed polygon's corners lie on the circle; boolean splits add
                # points on its sides, inside it: the farthest corner gives the diameter
                best = (cen, 2.0 * float(np.max(np.hypot(*(p - cen).T))))
        return best

    return {"lower_face_below": at[sp.z_lo - d] and not at[sp.z_lo + d],
            "upper_face_above": at[sp.z_hi + d] and not at[sp.z_hi - d],
            "open_mid": not at[mid], "bridge_loops": len(loops),
            "bridge_span": math.degrees(span),
            "bridge_max_abs_angle": math.degrees(float(np.max(np.abs(th)))) if len(th) else 0.0,
            "bridge_r_max": float(r.max()) if len(r) else 0.0,
            "upper_hole": hole(0.5 * (sp.z_hi + length)), "lower_hole": hole(0.5 * sp.z_lo)}


def split_slice_check(name, sp: SplitNut, length: float, chord: float):
    """A slice check: the slit, bridge and preload holes measured (:func:`measure_split`)."""
    tol = chord + TOL.slice_extra

    def check(slicer):
        got = measure_split(slicer, sp, length)
        out = []

        def bad(msg):
            out.append(Finding(ERROR, "split-measure", f"triangles: {msg}", name, SOURCE,
                               key="anti_backlash"))

        if not (got["lower_face_below"] and got["upper_face_above"] and got["open_mid"]):
            bad(f"the slit is not open from z {sp.z_lo:g} to {sp.z_hi:g} mm within "
                f"{FACE_PROBE:g} mm")
        # the bridge's radial edges are straight: only float round-off moves their angle
        span_tol = math.degrees(2.0 * tol / sp.root_radius)
        want = math.degrees(sp.bridge)
        if got["bridge_loops"] != 1 or abs(got["bridge_span"] - want) > span_tol \
                or got["bridge_max_abs_angle"] > want / 2.0 + span_tol:
            bad(f"the bridge at mid-slit measures {got['bridge_span']:.2f}° in "
                f"{got['bridge_loops']} piece(s), expected {want:g}° in one")
        if abs(got["bridge_r_max"] - sp.outer_radius) > tol:
            bad(f"the bridge reaches radius {got['bridge_r_max']:.3f} mm, expected "
                f"{sp.outer_radius:.3f} mm")
        for what, h, dia in (("upper", got["upper_hole"], sp.screw.clearance),
                             ("lower", got["lower_hole"], sp.screw.pilot)):
            cen, d = h if h is not None else (np.array([np.nan, np.nan]), np.nan)
            off = float(np.hypot(*(cen - np.array(sp.screw_xy()))))
            if not (off <= tol and abs(d - dia) <= 2.0 * tol):
                bad(f"{what} preload hole measures {d:.3f} mm at {off:.3f} mm from its axis, "
                    f"expected {dia:g} mm on it")
        return out

    return check
