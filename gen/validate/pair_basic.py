"""First-level checks of a declared mesh: both parts exist, mesh-able kinds, same tooth system."""

from __future__ import annotations

import math

from gen.findings import ERROR, Finding


def tooth_system(mate) -> tuple[float, float, float]:
    """(normal module, normal pressure angle, helix angle) of a gear's or rack's mate data
    (anything with ``sizes.mn``, ``sizes.alpha_n`` and ``sizes.beta``)."""
    s = mate.sizes
    return s.mn, s.alpha_n, s.beta


def basic_pair_findings(label: str, a: str, ta, b: str, tb) -> list:
    """Same tooth system, opposite hands, herringbone with herringbone. ``ta``/``tb`` are the
    members' mate data (sizes, ``hand``, ``chevron``)."""
    out = []
    ma, aa, ba = tooth_system(ta)
    mb, ab, bb = tooth_system(tb)
    if abs(ma - mb) > 1e-9:
        out.append(Finding(ERROR, "module-mismatch", f"'{a}' has module {ma:g} mm but '{b}' has "
                           f"{mb:g} mm: they cannot mesh", label, "equal normal module"))
    if abs(aa - ab) > 1e-9:
        out.append(Finding(ERROR, "pressure-angle-mismatch",
                           f"'{a}' has pressure angle {math.degrees(aa):g}° but '{b}' has "
                           f"{math.degrees(ab):g}°: they cannot mesh", label,
                           "equal normal pressure angle"))
    if abs(ba - bb) > 1e-9:
        out.append(Finding(ERROR, "helix-mismatch",
                           f"'{a}' has helix angle {math.degrees(ba):g}° but '{b}' has "
                           f"{math.degrees(bb):g}°: they cannot mesh", label,
                           "equal helix angle (ISO 21771)", key="helix_angle"))
    if ta.hand and tb.hand and ta.hand == tb.hand:
        out.append(Finding(ERROR, "same-hand", f"'{a}' and '{b}' are both {ta.hand}-hand: "
                           "meshing helical members need opposite hands", label,
                           "parallel-axis helical mesh (ISO 21771)", key="hand"))
    if bool(ta.chevron) != bool(tb.chevron):
        out.append(Finding(ERROR, "herringbone-mix", f"'{a}' and '{b}': a herringbone meshes "
                           "only with a herringbone", label, ""))
    return out
