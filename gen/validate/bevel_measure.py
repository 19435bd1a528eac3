"""Measurements of a straight bevel gear on its generated geometry (numpy only).

* Large-end sizes (ISO 23509 notation): the outer tip diameter d_ae = d_e + 2 h_ae cos δ, the
  outer root diameter d_fe = d_e − 2 h_fe cos δ, the tooth count, the angular pitch and the
  arc tooth thickness on the outer pitch circle, all measured on the large-end outline that
  the solid is built from (Tredgold back cone, :func:`gen.geometry.bevel.bevel_tooth_outline_3d`).
  Developing the back cone is an isometry, so the arc on the real pitch circle equals the arc
  of the virtual spur gear: s_e = m (π/2 + 2 x tan α) − thinning.
* Where a plane z = const crosses the teeth: the toothed band of the axial section (between
  the back and front cones, the root and tip cones) is a quadrilateral; a horizontal line
  crosses it over a radial interval. The slice of the exported triangles is measured at the
  height where that interval is widest, on its middle circle, and :func:`plane_section`
  gives the same section from the exact tooth surfaces (their rulings pass through the
  apex, so a central projection of the large-end outline is exact), so ``check`` measures
  what ``build`` will measure.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.geometry.bevel import BevelSizes, back_cone_point, bevel_tooth_outline_3d
from gen.geometry.generate import Flank
from gen.validate import measure


@dataclass(frozen=True)
class SlicePlan:
    """Height of the plane section (mm, gear frame) and the radial interval (mm) over which
    it crosses the toothed band; teeth are counted on the middle circle ``r_count``."""

    z: float
    r_lo: float
    r_hi: float

    @property
    def r_count(self) -> float:
        return 0.5 * (self.r_lo + self.r_hi)

    @property
    def depth(self) -> float:
        return self.r_hi - self.r_lo


def tooth_band(sizes: BevelSizes, flank: Flank) -> np.ndarray:
    """(4, 2) corners (r, z) of the toothed band of the axial section: large-end root, large-end
    tip, small-end tip, small-end root (scaled about the apex by R_i/R_e)."""
    H = sizes.mounting_distance
    k = sizes.small_end_scale
    big = back_cone_point(sizes, np.array([flank.r_root, flank.r_tip]), 0.0)[:, [0, 2]]
    small = np.column_stack([k * big[:, 0], H + k * (big[:, 1] - H)])
    return np.array([big[0], big[1], small[1], small[0]])


def _interval(quad: np.ndarray, z: float):
    """Radial interval of the line z = const inside the convex polygon ``quad`` (or None)."""
    rs = []
    for a, b in zip(quad, np.roll(quad, -1, axis=0)):
        if (a[1] - z) * (b[1] - z) <= 0 and a[1] != b[1]:
            t = (z - a[1]) / (b[1] - a[1])
            rs.append(a[0] + t * (b[0] - a[0]))
    return (min(rs), max(rs)) if len(rs) >= 2 else None


def slice_plan(sizes: BevelSizes, flank: Flank, samples: int = 201) -> SlicePlan:
    """The plane z (mm) crossing the most tooth depth, sampled over the band's height."""
    quad = tooth_band(sizes, flank)
    zs = np.linspace(quad[:, 1].min(), quad[:, 1].max(), samples)[1:-1]
    best = None
    for z in zs:
        iv = _interval(quad, float(z))
        if iv is not None and (best is None or iv[1] - iv[0] > best.depth):
            best = SlicePlan(float(z), iv[0], iv[1])
    return best


def plane_section(sizes: BevelSizes, flank: Flank, z: float, chord: float) -> np.ndarray:
    """(n, 2) section of the (unbounded) tooth surfaces by the plane z, from the exact outline."""
    outline = bevel_tooth_outline_3d(sizes, flank)
    return outline.on_plane(z).polygon(chord)


def large_end_sizes(sizes: BevelSizes, flank: Flank) -> dict:
    """Sizes measured on the large-end outline (mm, rad): tip and root diameters, teeth, arc
    tooth thickness on the outer pitch circle, largest angular pitch error."""
    pts = bevel_tooth_outline_3d(sizes, flank).polyline()[:, :2]   # back cone seen along Z
    r = measure.radii(pts)
    rp = sizes.de / 2.0
    thick = measure.arc_thickness(pts, rp)
    pitch = measure.angular_pitch(pts, rp)
    return {
        "tip_diameter": 2.0 * float(r.max()),
        "root_diameter": 2.0 * float(r.min()),
        "teeth": measure.tooth_count(pts, rp),
        "thickness": float(thick.mean()) if len(thick) else float("nan"),
        "pitch_error": (float(np.max(np.abs(pitch - 2.0 * math.pi / sizes.z)))
                        if len(pitch) else float("nan")),
    }


def formula_sizes(sizes: BevelSizes) -> dict:
    """The same sizes from the ISO 23509 formulas (mm)."""
    m, a = sizes.module, sizes.alpha
    return {
        "tip_diameter": sizes.de + 2.0 * sizes.ha * math.cos(sizes.delta),
        "root_diameter": sizes.de - 2.0 * sizes.hf * math.cos(sizes.delta),
        "teeth": sizes.z,
        "thickness": m * (math.pi / 2.0 + 2.0 * sizes.x * math.tan(a)) - sizes.thinning,
    }


def bevel_size_findings(sizes: BevelSizes, flank: Flank, subject: str, chord: float,
                        slice_tol: float) -> list:
    """Errors where the large-end outline disagrees with ISO 23509, or where the plane
    section that ``build`` measures on the triangles shows the wrong number of teeth."""
    from gen.findings import ERROR, Finding
    from gen.tolerances import TOL

    out = []
    got, want = large_end_sizes(sizes, flank), formula_sizes(sizes)
    src = "ISO 23509 (Tredgold back cone)"
    for key, what, formula, tol, param in (
            ("tip_diameter", "outer tip diameter", "d_ae = d_e + 2 h_ae cos δ", TOL.size,
             "profile_shift"),
            ("root_diameter", "outer root diameter", "d_fe = d_e − 2 h_fe cos δ", TOL.size,
             "profile_shift"),
            ("thickness", "arc tooth thickness on d_e", "s_e = m (π/2 + 2 x tan α) − thinning",
             TOL.thickness_rel * sizes.module, "backlash_allowance")):
        if not abs(got[key] - want[key]) <= tol:
            out.append(Finding(ERROR, "size-mismatch", f"large end: measured {what} "
                               f"{got[key]:.4f} mm, formula {want[key]:.4f} mm (tolerance "
                               f"{tol:g} mm)", subject, f"{src}: {formula}", key=param))
    if got["teeth"] != sizes.z:
        out.append(Finding(ERROR, "tooth-count", f"large end: counted {got['teeth']} teeth, "
                           f"expected {sizes.z}", subject, src, key="teeth"))
    elif not got["pitch_error"] <= 1e-4:
        out.append(Finding(ERROR, "pitch", f"large end: angular pitch varies by "
                           f"{math.degrees(got['pitch_error']):.4f}°", subject, "p = 2π/z",
                           key="teeth"))
    plan = slice_plan(sizes, flank)
    if plan is None or plan.depth < 2.0 * slice_tol:
        out.append(Finding(ERROR, "tooth-count", "no plane across the axis crosses the teeth "
                           "deeply enough to count them on the exported triangles; widen the "
                           "face", subject, "plane section of the tooth band", key="face_width"))
        return out
    n = measure.tooth_count(plane_section(sizes, flank, plan.z, chord), plan.r_count)
    if n != sizes.z:
        out.append(Finding(ERROR, "tooth-count", f"plane section z={plan.z:.3f}: counted {n} "
                           f"teeth on r = {plan.r_count:.3f} mm, expected {sizes.z}", subject,
                           "plane section of the tooth band", key="face_width"))
    return out


def virtual_outline(flank: Flank, zv: float, chord: float = 0.01) -> np.ndarray:
    """(n, 2) outline of the Tredgold virtual spur gear (development of the back cone), tooth 0
    on +X, for sweeping a bevel pair.

    z_v = z / cos δ is seldom whole, so the development is not a closed gear: the teeth are
    laid at the virtual pitch 2π/z_v on both sides of +X as far as whole teeth go, and the
    outline closes over the root circle on the far side (−X), away from the mesh zone the
    sweep looks at (:func:`gen.validate.sweep.sweep_pair` cuts each outline to the lens
    where the tip circles overlap, plus half a pitch).
    """
    r, psi = flank.r, flank.psi
    pitch = 2.0 * math.pi / zv
    n_side = int(zv // 2) - 1
    if n_side < 1:
        raise ValueError(f"virtual gear of {zv:.2f} teeth is too small to sweep")

    def arc(radius, a0, a1):
        step = 2.0 * math.acos(max(-1.0, 1.0 - chord / radius)) if radius > chord else 0.5
        n = max(2, int(math.ceil(abs(a1 - a0) / step)) + 1)
        a = np.linspace(a0, a1, n)
        return np.column_stack([radius * np.cos(a), radius * np.sin(a)])

    def polar(rr, aa):
        return np.column_stack([rr * np.cos(aa), rr * np.sin(aa)])

    parts = []
    for k in range(-n_side, n_side + 1):
        c = k * pitch
        parts.append(polar(r, c - psi))
        parts.append(arc(flank.r_tip, c - psi[-1], c + psi[-1])[1:-1])
        parts.append(polar(r[::-1], c + psi[::-1]))
        end = c + pitch - psi[0] if k < n_side else 2.0 * math.pi - n_side * pitch - psi[0]
        parts.append(arc(flank.r_root, c + psi[0], end)[1:-1])
    return np.concatenate(parts, axis=0)
