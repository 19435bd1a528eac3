"""Measurements of an internal (ring) gear's toothed hole against its ISO 21771 sizes.

The toothed hole is a closed polygon about the ring axis whose *inside* is air: the tooth
spaces and the bore swept by the tips. Measured on it (mm, on the polygon's vertices and on
exact circle crossings, :mod:`gen.validate.measure`):

* tip radius r_a2 = least vertex radius (the tips are an exact arc, d_a2 = d − 2 m_n(h_aP* − x − k));
* root radius r_f2 = largest vertex radius (an exact arc, d_f2 = d + 2 m_n(h_fP* + x));
* tooth count = number of air intervals on the circle midway between them (one per space);
* space width e₂ on the reference circle, mean over all spaces, when the reference circle
  lies on the ring's involute (e₂ = m_t(π/2 + 2x tan α_n) + Δs).

Sizes: :mod:`gen.geometry.internal` (sign convention stated there).
"""

from __future__ import annotations

import math

import numpy as np

from gen.findings import ERROR, Finding
from gen.validate.measure import arc_thickness, ccw, radii, tooth_count

SOURCE = "ISO 21771 internal gear sizes"


def measure_ring(hole: np.ndarray, *, rp: float | None = None) -> dict:
    """Tip and root radii (mm), tooth count and, given ``rp``, the mean space width (mm) on
    the circle of radius ``rp``, measured on the toothed-hole polygon ``hole``."""
    hole = ccw(np.asarray(hole, dtype=float))
    r = radii(hole)
    out = {"tip_radius": float(r.min()), "root_radius": float(r.max()),
           "teeth": int(tooth_count(hole))}
    if rp is not None and r.min() < rp < r.max():
        widths = arc_thickness(hole, rp)
        out["space_width"] = float(np.mean(widths)) if len(widths) else math.nan
        out["space_width_spread"] = float(np.ptp(widths)) if len(widths) else math.nan
    return out


def ring_size_findings(name: str, hole: np.ndarray, sizes, *, size_tol: float,
                       width_tol: float, check_width: bool, where: str = "outline") -> list:
    """Compare the measured hole with the formulas of ``sizes`` (a RingSizes); error findings
    ``size-mismatch`` / ``tooth-count`` when they differ by more than the tolerances (mm)."""
    got = measure_ring(hole, rp=sizes.rp if check_width else None)
    out = []

    def bad(code, msg):
        out.append(Finding(ERROR, code, f"{where}: {msg}", name, SOURCE))

    if got["teeth"] != sizes.z:
        bad("tooth-count", f"counted {got['teeth']} tooth spaces, declared {sizes.z}")
    for label, key, want in (("tip diameter d_a", "tip_radius", sizes.ra),
                             ("root diameter d_f", "root_radius", sizes.rf)):
        if abs(got[key] - want) > size_tol:
            bad("size-mismatch", f"{label} measured {2 * got[key]:.4f} mm, formula "
                f"{2 * want:.4f} mm (tolerance {2 * size_tol:.4f} mm)")
    if check_width and "space_width" in got:
        if abs(got["space_width"] - sizes.e) > width_tol or got["space_width_spread"] > width_tol:
            bad("size-mismatch", f"space width on the reference circle measured "
                f"{got['space_width']:.4f} mm (spread {got['space_width_spread']:.4f}), formula "
                f"{sizes.e:.4f} mm (tolerance {width_tol:.4f} mm)")
    return out


def toothed_hole(polys) -> np.ndarray:
    """The toothed hole among a slice's polygons: the smallest one around the axis."""
    around = [p for p in polys if _contains_origin(p)]
    if not around:
        raise ValueError("no slice polygon surrounds the ring axis")
    return min(around, key=lambda p: abs(_area(p)))


def ring_slice_check(name, sizes, z: float, size_tol: float, width_tol: float,
                     check_width: bool):
    """A slice check: measure the toothed hole of the exported triangles at height ``z``."""

    def check(slicer):
        hole = toothed_hole(slicer(z))
        return ring_size_findings(name, hole, sizes, size_tol=size_tol, width_tol=width_tol,
                                  check_width=check_width, where=f"mesh slice z={z:g}")

    return check


def _area(p):
    x, y = p[:, 0], p[:, 1]
    return 0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))


def _contains_origin(p) -> bool:
    a, b = p, np.roll(p, -1, axis=0)
    cond = (a[:, 1] > 0.0) != (b[:, 1] > 0.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        xc = a[:, 0] - a[:, 1] * (b[:, 0] - a[:, 0]) / (b[:, 1] - a[:, 1])
    return bool(np.count_nonzero(cond & (xc > 0.0)) % 2)
