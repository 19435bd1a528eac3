"""Findings for one straight bevel gear: undercut, face width, tip land at the small end.

Numpy only. The tooth form is judged on the Tredgold virtual spur gear (zv = z / cos δ on the
back-cone radius rv), with the flank made by the same rack-rolling generator that shapes the
part, so what is judged is what is built.
"""

from __future__ import annotations

import math

from gen.geometry.bevel import BevelSizes, virtual_cutter
from gen.geometry.cylindrical import undercut_limit_shift, undercut_limit_teeth
from gen.geometry.generate import Flank
from gen.tolerances import TOL
from gen.findings import ERROR, INFO, WARNING, Finding

#: least top land as a fraction of the (local) module; common practice for through-hardened
#: gears is s_a ≥ 0.2 m (from memory, handbook rule of thumb)
MIN_TIP_LAND = 0.2


def involute_start_radius(sizes: BevelSizes) -> float:
    """Radius on the virtual gear where the cutter's straight flank begins to act (mm).

    A cutter flank point at depth h below the rolling line touches the gear on the line of
    action h / sin α from the pitch point: r² = (rv cos α)² + (rv sin α − h / sin α)².
    Without undercut the generated root fillet joins the involute exactly here; with undercut
    the fillet envelope crosses the involute below it.
    """
    cut = virtual_cutter(sizes)
    a = sizes.alpha
    h = -cut.flank_start_y()
    rv = sizes.rv
    return math.hypot(rv * math.cos(a), rv * math.sin(a) - h / math.sin(a))


def small_end_tip_land(sizes: BevelSizes, flank: Flank) -> float:
    """Arc tooth thickness on the tip at the small end (mm): 2 ψ_tip ρ_tip · Ri/Re.

    On the back cone the arc 2ψρ of the development is the arc on the real gear (developing a
    cone is an isometry); sections scale with the cone distance.
    """
    return 2.0 * float(flank.psi[-1]) * flank.r_tip * sizes.small_end_scale


def bevel_findings(sizes: BevelSizes, flank: Flank, subject: str = "") -> list[Finding]:
    """Findings for the bevel gear ``sizes`` whose virtual flank is ``flank``."""
    out = []
    m, k = sizes.module, sizes.small_end_scale
    # undercut, judged on the generated virtual flank
    r_form = involute_start_radius(sizes)
    zmin = undercut_limit_teeth(sizes.alpha, sizes.x, sizes.rack.addendum)
    if flank.r_junction < r_form - TOL.flank * max(1.0, m):
        xmin = undercut_limit_shift(sizes.zv, sizes.alpha, sizes.rack.addendum)
        out.append(Finding(
            WARNING, "undercut",
            f"virtual gear zv = {sizes.zv:.2f} is undercut: the root fillet cuts the involute "
            f"(fillet meets it at r = {flank.r_junction:.4f} mm below the flank start "
            f"{r_form:.4f} mm); rack limit zv ≥ {zmin:.2f}, or shift x ≥ {xmin:.3f}",
            subject, "Tredgold virtual gear, rack generation"))
    # face width limit
    if sizes.b > sizes.b_max + 1e-9:
        out.append(Finding(ERROR, "face-width",
                           f"face width {sizes.b:.3f} mm exceeds min(Re/3, 10 m) = {sizes.b_max:.3f} mm",
                           subject, "ISO 23509 practice"))
    else:
        out.append(Finding(INFO, "face-width",
                           f"face width {sizes.b:.3f} mm of at most {sizes.b_max:.3f} mm "
                           f"(Re = {sizes.Re:.3f} mm)", subject, "ISO 23509 practice"))
    # tip land at the small end
    sa = small_end_tip_land(sizes, flank)
    if sa <= 0:
        out.append(Finding(ERROR, "pointed-tip", "teeth are pointed at the small end",
                           subject, "Tredgold virtual gear"))
    elif sa < MIN_TIP_LAND * m * k:
        out.append(Finding(WARNING, "thin-tip",
                           f"tip land at the small end {sa:.3f} mm is below "
                           f"{MIN_TIP_LAND} × small-end module = {MIN_TIP_LAND * m * k:.3f} mm",
                           subject, "common practice"))
    else:
        out.append(Finding(INFO, "tip-land", f"tip land at the small end {sa:.3f} mm",
                           subject, "Tredgold virtual gear"))
    return out
