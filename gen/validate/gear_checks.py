"""Checks of a generated cylindrical gear against ISO 21771, measured on its outline."""

from __future__ import annotations

import math

import numpy as np

from gen.geometry.cylindrical import GearSizes, undercut_limit_shift, undercut_limit_teeth
from gen.geometry.generate import Cutter, Flank, psi_exact
from gen.geometry.involute import half_thickness_angle
from gen.geometry.modules import module_series
from gen.tolerances import TOL
from gen.validate import measure
from gen.findings import ERROR, INFO, WARNING, Finding

ISO21771 = "ISO 21771 sizes"
MIN_TEETH, MAX_TEETH = 6, 400


def undercut_depth(sizes: GearSizes, cutter: Cutter) -> float:
    """How far (mm, along the base circle) the generated flank lies inside the involute at the
    base circle; > 0 means the rack cutter has cut into the involute (undercut)."""
    rb = sizes.rb
    if rb <= sizes.rf + 1e-9:
        return 0.0
    gen = float(psi_exact(cutter, sizes.rp, sizes.z, [rb])[0])
    inv = float(half_thickness_angle(rb, rp=sizes.rp, rb=rb, s=sizes.s))
    return (inv - gen) * rb


def thickness_circle(sizes: GearSizes, r_form: float, margin: float) -> tuple[float, float]:
    """(R, s_R): the circle on which the transverse tooth thickness is measured and its
    formula value (mm).

    The reference circle when it lies on the involute at least ``margin`` mm inside the form
    circle … tip circle band; otherwise the middle of that band, with
    s_y = d_y (s/d + inv α_t − inv α_yt), cos α_yt = d_b/d_y (ISO 21771, tooth thickness at
    any diameter). A shift of −1 puts the tip on the reference circle, where a faceted
    outline has no material left to measure; a large shift lifts the root above it.
    Returns (nan, nan) when the involute band is narrower than 2·margin.
    """
    lo = max(r_form, sizes.rb) + margin
    hi = sizes.ra - margin
    if lo > hi:
        return float("nan"), float("nan")
    R = sizes.rp if lo <= sizes.rp <= hi else 0.5 * (lo + hi)
    psi = float(half_thickness_angle(R, rp=sizes.rp, rb=sizes.rb, s=sizes.s))
    return R, 2.0 * R * psi


def measured_sizes(poly: np.ndarray, sizes: GearSizes, thick_r: float | None = None) -> dict:
    r = measure.radii(poly)
    R = sizes.rp if thick_r is None or math.isnan(thick_r) else thick_r
    thick = measure.arc_thickness(poly, R)
    pitch = measure.angular_pitch(poly, sizes.rp if _crosses(r, sizes.rp) else 0.5 * (r.min() + r.max()))
    return {
        "tip_radius": float(r.max()),
        "root_radius": float(r.min()),
        "teeth": measure.tooth_count(poly),
        "thickness": float(thick.mean()) if len(thick) else float("nan"),
        "thickness_spread": float(np.ptp(thick)) if len(thick) else float("nan"),
        "pitch_error": float(np.max(np.abs(pitch - 2 * math.pi / sizes.z))) if len(pitch) else float("nan"),
    }


#: the pitch is measured on r_p only where r_p lies this far (mm) inside the outline's radii:
#: a tip on the reference circle (x = −1) puts the tip land's vertices within rounding of r_p,
#: where every tip-land edge would count as a crossing
PITCH_CIRCLE_MARGIN = 1e-6


def _crosses(r: np.ndarray, R: float) -> bool:
    return bool(r.min() + PITCH_CIRCLE_MARGIN < R < r.max() - PITCH_CIRCLE_MARGIN)


def compare_sizes(subject: str, got: dict, sizes: GearSizes, *, size_tol: float,
                  thickness_tol: float, where: str = "profile", check_thickness: bool = True,
                  thickness_at: tuple[float, float] | None = None):
    """Errors for every measured size that disagrees with the formula.

    ``thickness_at`` = (R, s_R) from :func:`thickness_circle` (default: the reference circle
    and s). Every finding names the key to change.
    """
    out = []
    R, s_want = thickness_at if thickness_at is not None else (sizes.rp, sizes.s)
    if math.isnan(R):
        check_thickness = False

    def bad(what, measured, expected, tol, formula, key):
        out.append(Finding(ERROR, "size-mismatch",
                           f"{where}: measured {what} {measured:.4f} mm, formula {expected:.4f} mm "
                           f"(tolerance {tol:g} mm)", subject, f"{ISO21771}: {formula}", key=key))

    if abs(got["tip_radius"] - sizes.ra) > size_tol:
        bad("tip radius", got["tip_radius"], sizes.ra, size_tol, "da = d + 2 m_n (h_aP* + x − k)",
            "tip_shortening")
    if abs(got["root_radius"] - sizes.rf) > size_tol:
        bad("root radius", got["root_radius"], sizes.rf, size_tol, "df = d − 2 m_n (h_fP* − x)",
            "profile_shift")
    if got["teeth"] != sizes.z:
        out.append(Finding(ERROR, "tooth-count", f"{where}: counted {got['teeth']} teeth, "
                           f"expected {sizes.z}", subject, "tooth count", key="teeth"))
    if check_thickness and not math.isnan(got["thickness"]):
        if abs(got["thickness"] - s_want) > thickness_tol:
            what = ("tooth thickness on d" if R == sizes.rp
                    else f"tooth thickness on d_y = {2 * R:.4f} mm")
            bad(what, got["thickness"], s_want, thickness_tol,
                "s = m_t (π/2 + 2 x tan α_n) − thinning; s_y = d_y (s/d + inv α_t − inv α_yt)",
                "profile_shift")
    if not math.isnan(got["pitch_error"]) and got["pitch_error"] > 1e-4:
        out.append(Finding(ERROR, "pitch", f"{where}: angular pitch varies by "
                           f"{math.degrees(got['pitch_error']):.4f}°", subject, "p = 2π/z",
                           key="teeth"))
    return out


def gear_findings(subject: str, sizes: GearSizes, cutter: Cutter, flank: Flank,
                  poly: np.ndarray, *, force: bool = False, addendum: float = 1.0,
                  face_width: float | None = None, bore_radius: float | None = None,
                  rack_root: float | None = None, slice_margin: float = 0.0):
    """All profile findings for one gear: measured sizes, undercut, tip, teeth, module, bore."""
    out = []
    m, z, x = sizes.mn, sizes.z, sizes.x
    if not (MIN_TEETH <= z <= MAX_TEETH):
        sev = WARNING if force else ERROR
        out.append(Finding(sev, "teeth-range", f"{z} teeth is outside {MIN_TEETH}…{MAX_TEETH}"
                           + ("" if force else "; set force: true to build anyway"),
                           subject, "common practice", key="teeth"))
    # pointed or thin tip (measured on the generated flank)
    s_tip = 2.0 * flank.r_tip * float(flank.psi[-1])
    if s_tip <= 0:
        out.append(Finding(ERROR, "pointed-tip", "teeth are pointed: flanks meet below the tip "
                           "circle; reduce the profile shift or shorten the tip", subject,
                           "tip thickness s_a ≤ 0", key="profile_shift"))
        return out
    if s_tip < 0.2 * m:
        out.append(Finding(WARNING, "thin-tip", f"tip land {s_tip:.3f} mm is under 0.2 m = "
                           f"{0.2 * m:.3f} mm", subject, "common practice: s_a ≥ 0.2 m", key="profile_shift"))
    # measured vs formula
    # thickness on the same circle the slice of the exported triangles will use
    at = thickness_circle(sizes, flank.r_junction, slice_margin)
    got = measured_sizes(poly, sizes, at[0])
    out += compare_sizes(subject, got, sizes, size_tol=TOL.size,
                         thickness_tol=TOL.thickness_rel * m, thickness_at=at)
    # undercut: measured on the generated flank, formula named in the message
    depth = undercut_depth(sizes, cutter)
    # transverse section of a helical gear: z_min = 2 (h* − x) cos β / sin²α_t
    cb = math.cos(sizes.beta)
    z_lim = undercut_limit_teeth(sizes.alpha_t, x, addendum) * cb
    x_lim = undercut_limit_shift(z / cb, sizes.alpha_t, addendum)
    if depth > TOL.flank:
        out.append(Finding(WARNING, "undercut", f"undercut: the generating rack cuts "
                           f"{depth * 1000:.1f} µm into the involute at the base circle "
                           f"(z = {z} < 2(1 − x)/sin²α = {z_lim:.1f}); a profile shift "
                           f"x ≥ {x_lim:.3f} avoids it", subject,
                           "rack generation, z_min = 2(h* − x)/sin²α", key="teeth"))
    if cutter.tip_radius < 0.999999 * (cutter.tip_radius if rack_root is None else rack_root):
        out.append(Finding(INFO, "full-round-root", f"root radius reduced to a full round, "
                           f"{cutter.tip_radius:.3f} mm (the basic rack's does not fit at this "
                           "pressure angle)", subject, "ISO 53 root radius", key="profile"))
    series = module_series(m)
    if series is None:
        out.append(Finding(INFO, "module-series", f"module {m:g} mm is not in the ISO 54 / "
                           "DIN 780 preferred series", subject, "ISO 54 / DIN 780", key="module"))
    if face_width is not None and face_width < 0.5 * m:
        out.append(Finding(ERROR, "face-vs-module", f"face width {face_width:g} mm is under half "
                           f"the module ({m:g} mm): the teeth would be slivers", subject,
                           "common practice", key="face_width"))
    if bore_radius is not None:
        if bore_radius >= sizes.rf:
            out.append(Finding(ERROR, "bore-too-big", f"bore reaches radius {bore_radius:.3f} mm, "
                               f"at or beyond the root circle radius {sizes.rf:.3f} mm", subject,
                               "geometry", key="bore"))
        elif sizes.rf - bore_radius < m:
            out.append(Finding(WARNING, "thin-rim", f"rim under the teeth is "
                               f"{sizes.rf - bore_radius:.2f} mm, less than one module", subject,
                               "common practice: rim ≥ 1 m", key="bore"))
    return out
