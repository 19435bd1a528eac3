"""Minimum printable sizes: tooth, tip land and rim against the printer's line width.

Without a fit profile a part is judged for the common 0.4 mm FDM nozzle (common practice:
one extruded line is about the nozzle diameter wide, and a wall that must hold load wants two
lines, 0.8 mm); a fit profile's ``min_feature`` stands for that wall (two lines) and half of
it for one line. These checks always run; the fit's size compensation stays opt-in.
"""

from __future__ import annotations

from dataclasses import dataclass

from gen.findings import ERROR, WARNING, Finding
from gen.tolerances import LIMITS


@dataclass(frozen=True)
class PrintLimits:
    line: float     # narrowest feature one extruded line can make (mm)
    wall: float     # thinnest load-bearing wall, two lines (mm)
    basis: str      # where the numbers come from, for messages


def print_limits(fit: dict) -> PrintLimits:
    """Limits from a resolved fit profile, or the default nozzle when the fit sets none."""
    mf = float(fit.get("min_feature") or 0.0)
    if mf > 0:
        return PrintLimits(mf / 2.0, mf, f"fit '{fit['name']}' min_feature {mf:g} mm")
    n = LIMITS.default_nozzle
    return PrintLimits(n, LIMITS.wall_lines * n, f"default {n:g} mm nozzle, "
                       f"{LIMITS.wall_lines} lines per wall (common practice; name a fit to "
                       "change)")


def printability_findings(subject: str, limits: PrintLimits, *, tooth: float | None = None,
                          tip_land: float | None = None, rim: float | None = None,
                          tooth_key: str = "module", rim_key: str = "bore") -> list:
    """Error when a tooth is thinner than one line (it cannot be printed); warnings when a
    tip land is under one line or a rim under one wall. Lengths in mm; None skips a check."""
    out = []
    if tooth is not None and 0 < tooth < limits.line:
        out.append(Finding(ERROR, "below-min-feature", f"tooth thickness {tooth:.3f} mm is under "
                           f"one printed line ({limits.line:.2f} mm): the teeth cannot be "
                           "printed; a larger module, or a fit with a smaller min_feature",
                           subject, limits.basis, key=tooth_key))
    if tip_land is not None and 0 < tip_land < limits.line:
        out.append(Finding(WARNING, "below-min-feature", f"tip land {tip_land:.3f} mm is under "
                           f"one printed line ({limits.line:.2f} mm)", subject, limits.basis,
                           key="profile_shift"))
    if rim is not None and rim < limits.wall:
        out.append(Finding(WARNING, "below-min-wall", f"rim {rim:.3f} mm is under one wall "
                           f"({limits.wall:.2f} mm)", subject, limits.basis, key=rim_key))
    return out
