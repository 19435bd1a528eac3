"""Measure a timing-pulley outline and compare it with the ISO 5288 size formulas.

The polygon is the counter-clockwise outline of :func:`gen.geometry.pulley.pulley_loop`,
centred on the pulley axis. Measured: outside diameter (twice the largest radius), root
diameter (twice the smallest radius), groove depth (their half difference), groove count
(rim lands crossed by the circle midway between root and rim) and how evenly the grooves
are spaced.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from shapely.geometry import Polygon

from gen.geometry.pulley import lookup_profile, pulley_sizes
from gen.geometry.section import Loop, signed_area
from gen.tolerances import TOL
from gen.validate import measure
from gen.findings import ERROR, INFO, WARNING, Finding

#: largest allowed distance between consecutive curve ends of an outline (mm)
GAP_TOL = 1e-9
#: measured diameter and groove depth vs formula (mm, absolute)
SIZE_TOL = TOL.size
#: spread of the groove spacing about 2π/z (rad)
PITCH_TOL = TOL.angle


@dataclass(frozen=True)
class PulleyMeasure:
    outside_diameter: float  # 2·max radius (mm)
    root_diameter: float     # 2·min radius (mm)
    groove_depth: float      # (max − min radius) (mm)
    groove_count: int        # rim lands on the mid circle
    pitch_spread: float      # largest |spacing − 2π/count| of the lands (rad)


def measure_pulley(poly: np.ndarray) -> PulleyMeasure:
    """Measure an (n, 2) counter-clockwise pulley polygon centred on the origin."""
    r = measure.radii(poly)
    r_mid = 0.5 * (r.min() + r.max())
    count = measure.tooth_count(poly, r_mid)
    steps = measure.angular_pitch(poly, r_mid)
    spread = float(np.max(np.abs(steps - 2.0 * math.pi / count))) if count > 1 else math.inf
    return PulleyMeasure(2.0 * float(r.max()), 2.0 * float(r.min()),
                         float(r.max() - r.min()), count, spread)


def pulley_findings(profile, teeth: int, loop: Loop, fit_allowance: float = 0.0, *,
                    force: bool = False, chord: float = TOL.chord) -> list[Finding]:
    """Findings for one pulley outline against its profile's formulas.

    Errors: tooth count below the profile's recommended minimum (a warning instead when
    ``force``); curve ends that do not meet (> ``GAP_TOL``); a self-intersecting or clockwise
    outline; measured outside diameter (do − 2·allowance) or groove depth off the formula by
    more than ``SIZE_TOL``; groove count ≠ teeth; groove spacing off 2π/z by more than
    ``PITCH_TOL``. Info: where the groove data come from.
    """
    prof = lookup_profile(profile)
    sizes = pulley_sizes(prof, teeth, fit_allowance)
    subject = f"{prof.name} pulley, {sizes.teeth} teeth"
    out = []

    def add(sev, code, msg, source=""):
        out.append(Finding(sev, code, msg, subject, source))

    if sizes.teeth < prof.min_teeth:
        add(WARNING if force else ERROR, "below-min-teeth",
            f"{sizes.teeth} teeth is below the recommended minimum of {prof.min_teeth} "
            f"for {prof.name}" + (" (forced)" if force else ""), prof.note)
    gap = loop.gaps()
    if gap > GAP_TOL:
        add(ERROR, "outline-gap", f"outline curves leave a gap of {gap:.3g} mm")

    poly = loop.polygon(chord)
    if not Polygon(poly).is_valid:
        add(ERROR, "outline-invalid", "outline crosses itself")
    if signed_area(poly) <= 0.0:
        add(ERROR, "outline-orientation", "outline is not counter-clockwise")

    m = measure_pulley(poly)
    if abs(m.outside_diameter - sizes.fit_outside_diameter) > SIZE_TOL:
        add(ERROR, "outside-diameter",
            f"measured outside diameter {m.outside_diameter:.4f} mm, formula "
            f"{sizes.fit_outside_diameter:.4f} mm (do = z·p/π − 2a − 2·allowance)",
            "ISO 5288 definitions")
    if abs(m.groove_depth - sizes.groove_depth) > SIZE_TOL:
        add(ERROR, "groove-depth",
            f"measured groove depth {m.groove_depth:.4f} mm, table {sizes.groove_depth:.4f} mm",
            prof.note)
    if m.groove_count != sizes.teeth:
        add(ERROR, "groove-count", f"measured {m.groove_count} grooves, expected {sizes.teeth}")
    elif m.pitch_spread > PITCH_TOL:
        add(ERROR, "groove-spacing",
            f"groove spacing varies by {math.degrees(m.pitch_spread):.3g}° about 360°/z")
    add(INFO, "groove-source", f"{prof.family} profile; {prof.note}")
    return out
