"""Findings for a declared mesh: formula numbers (gen.geometry.pair) and the swept profiles.

Rules (limits in :data:`PAIR_LIMITS`):

* error ``teeth-interfere``: the swept outlines overlap (area above the sweep tolerance), or,
  without a sweep, the formula backlash is negative; names the center distance that clears;
* error ``contact-ratio-low``: ε_α < 1.1 (common practice: below it, tooth pairs hand over
  with no margin for pitch errors, which printed teeth have plenty of);
* warning ``backlash-low``: the normal backlash is under two print clearances (one per
  flank side: with the backlash centred, each of the drive and coast gaps gets half of it);
* warning ``tip-clearance-low``: tip-to-root clearance under 0.1 m_n (common practice);
  error when it is negative (a tip reaches the mating root circle);
* warning ``contact-past-tangent`` / ``contact-below-form``: the contact path runs past a base
  tangent point, or below the involute start, so a tip works on the fillet and ε_α is
  overstated;
* warning ``backlash-mismatch``: swept and formula backlash disagree beyond the limit (the
  tightest spot is off the involutes, or the outlines do not match the declared sizes);
* info lines with the numbers.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from gen.geometry.pair import RACK, PairResult
from gen.tolerances import TOL
from gen.tolerances import LIMITS
from gen.findings import ERROR, INFO, WARNING, Finding
from gen.validate.sweep import INTERFERING, SweepResult

SOURCE_FORMULA = "ISO 21771 mesh relations"
SOURCE_SWEEP = "swept outlines (shapely intersection and distance)"


@dataclass(frozen=True)
class PairLimits:
    #: least transverse contact ratio (common practice)
    min_contact_ratio: float = LIMITS.min_contact_ratio
    #: least tip-to-root clearance, in modules (common practice)
    min_tip_clearance_modules: float = 0.1
    #: default clearance a printed flank needs from its mate, per flank (mm, common practice:
    #: 0.05–0.2 mm per flank)
    print_clearance: float = 0.1
    #: swept vs formula backlash: allowed difference = abs + rel × formula (mm)
    backlash_mismatch_abs: float = 0.01
    backlash_mismatch_rel: float = 0.05
    #: lengths within this of zero count as zero (float round-off, mm)
    length_eps: float = 1e-6
    #: default largest normal backlash: the two print clearances plus this many times the
    #: ISO/TR 10064-2 minimum backlash of a machined pair of the same center distance and
    #: module (basis: ISO/TR 10064-2 j_bn,min; the multiple is this project's choice, so a
    #: printed pair gets the play a machined one is given twice over, and no more)
    max_backlash_iso_multiple: float = LIMITS.max_backlash_iso_multiple


PAIR_LIMITS = PairLimits()


def _f(severity, code, message, subject, source=SOURCE_FORMULA):
    return Finding(severity=severity, code=code, message=message, subject=subject, source=source)


def iso_min_backlash(center_distance: float, mn: float) -> float:
    """j_bn,min = (2/3)(0.06 + 0.0005 a + 0.03 m_n) mm (ISO/TR 10064-2, machined gears)."""
    return 2.0 / 3.0 * (0.06 + 0.0005 * abs(center_distance) + 0.03 * mn)


def max_normal_backlash(pair: PairResult, print_clearance: float,
                        limits: PairLimits = PAIR_LIMITS) -> float:
    """Default largest normal backlash (mm): 2 c_print + n · j_bn,min (see :class:`PairLimits`)."""
    return (2.0 * print_clearance
            + limits.max_backlash_iso_multiple * iso_min_backlash(pair.center_distance, pair.mn))


def center_move(delta_jn: float, pair: PairResult) -> float:
    """Center (or datum) distance change that changes the normal backlash by ``delta_jn`` (mm):
    Δa = Δj_n / (2 sin α_wt cos β_b) (ISO 21771 / ISO/TR 10064-2 relation j_n = 2 Δa sin α_wt
    cos β_b; for a rack α_wt = α_t)."""
    return delta_jn / (2.0 * math.sin(pair.alpha_w) * math.cos(pair.beta_b))


def pair_findings(pair: PairResult, sweep: SweepResult | None = None, *, subject: str = "",
                  print_clearance: float | None = None, max_backlash: float | None = None,
                  limits: PairLimits = PAIR_LIMITS) -> list[Finding]:
    """Findings for one mesh, errors first. ``print_clearance`` (mm per flank) overrides the
    default of ``limits``; ``max_backlash`` (mm, normal) overrides :func:`max_normal_backlash`."""
    clear = limits.print_clearance if print_clearance is None else print_clearance
    out: list[Finding] = []
    rack = pair.kind == RACK
    dist_name = "datum distance" if rack else "center distance"

    # interference
    if sweep is not None and sweep.status == INTERFERING:
        fix = ""
        if sweep.clear_center_distance is not None:
            fix = (f"; the teeth clear at a {dist_name} of {sweep.clear_center_distance:.3f} mm "
                   f"(+{sweep.clear_center_distance - pair.center_distance:.3f} mm)")
        out.append(_f(ERROR, "teeth-interfere",
                      f"teeth overlap in mesh at {dist_name} {pair.center_distance:.3f} mm "
                      f"(up to {sweep.overlap_area:.4f} mm² at "
                      f"{math.degrees(sweep.angle_at_overlap):.2f}° of gear 1){fix}",
                      subject, SOURCE_SWEEP))
    elif sweep is None and pair.backlash_base < -limits.length_eps:
        out.append(_f(ERROR, "teeth-interfere",
                      f"negative backlash {pair.backlash_normal:.3f} mm: the teeth cannot turn at "
                      f"{dist_name} {pair.center_distance:.3f} mm; they clear from "
                      f"{pair.tight_center_distance:.3f} mm", subject))

    if pair.contact_ratio < limits.min_contact_ratio:
        out.append(_f(ERROR, "contact-ratio-low",
                      f"transverse contact ratio {pair.contact_ratio:.3f} is below "
                      f"{limits.min_contact_ratio:g}: tooth pairs do not overlap enough "
                      f"(more teeth, a smaller pressure angle or less center distance help)",
                      subject))

    tip_min = limits.min_tip_clearance_modules * pair.mn
    if pair.tip_clearance < -limits.length_eps:
        out.append(_f(ERROR, "tip-clearance-low",
                      f"a tip reaches the mating root: tip clearance {pair.tip_clearance:.3f} mm",
                      subject))
    elif pair.tip_clearance < tip_min:
        out.append(_f(WARNING, "tip-clearance-low",
                      f"tip clearance {pair.tip_clearance:.3f} mm is under "
                      f"{limits.min_tip_clearance_modules:g} m = {tip_min:.3f} mm "
                      f"(shorten the tips by k m_n or increase the {dist_name})", subject))

    jn = pair.backlash_normal if sweep is None or sweep.status == INTERFERING else \
        min(pair.backlash_normal, _swept_normal(pair, sweep))
    if not (sweep is not None and sweep.status == INTERFERING) and jn < 2.0 * clear:
        out.append(_f(WARNING, "backlash-low",
                      f"normal backlash {jn:.3f} mm is under two print clearances of "
                      f"{clear:.3f} mm (one per flank side); printed teeth may pinch: thin the "
                      f"teeth or move the {dist_name} out by "
                      f"{center_move(2.0 * clear - jn, pair):.3f} mm",
                      subject, SOURCE_FORMULA if sweep is None else SOURCE_SWEEP))
    jmax = max_normal_backlash(pair, clear, limits) if max_backlash is None else max_backlash
    if not (sweep is not None and sweep.status == INTERFERING) and jn > jmax + limits.length_eps:
        basis = ("the max_backlash of the mesh" if max_backlash is not None else
                 f"2 × print clearance + {limits.max_backlash_iso_multiple:g} × ISO/TR 10064-2 "
                 f"j_bn,min")
        mid = 0.5 * (2.0 * clear + jmax) if 2.0 * clear < jmax else jmax
        out.append(Finding(WARNING, "backlash-high",
                           f"the teeth will rattle: normal backlash {jn:.3f} mm exceeds "
                           f"{jmax:.3f} mm ({basis}); move the {dist_name} in by at least "
                           f"{center_move(jn - jmax, pair):.3f} mm ({center_move(jn - mid, pair):.3f}"
                           f" mm to centre it between {2.0 * clear:.3f} and {jmax:.3f} mm), or "
                           f"thin the teeth less", subject, "ISO/TR 10064-2; Δa = Δj_n/(2 sin α_wt "
                           "cos β_b)", key="center_distance"))

    names = ("gear 1", "the rack" if rack else "gear 2")
    for i in (0, 1):
        if not pair.interference_free[i]:
            out.append(_f(WARNING, "contact-past-tangent",
                          f"the contact path passes the base tangent point of {names[i]}: the "
                          f"mating tip works on its undercut or fillet and ε_α is overstated",
                          subject))
        rf = pair.form_radii[i]
        ra = pair.active_start_radii[i]
        # the form radius comes from a bisection at a tangent junction: good to ~2 µm
        if rf is not None and ra is not None and ra < rf - 10 * TOL.flank:
            out.append(_f(WARNING, "contact-below-form",
                          f"contact on {names[i]} reaches down to r {ra:.3f} mm, below its "
                          f"involute start at r {rf:.3f} mm: the mating tip meets the fillet",
                          subject))

    if sweep is not None and sweep.status != INTERFERING:
        allowed = limits.backlash_mismatch_abs + limits.backlash_mismatch_rel * abs(sweep.formula_backlash)
        if abs(sweep.backlash_deviation) > allowed:
            out.append(_f(WARNING, "backlash-mismatch",
                          f"swept backlash {sweep.swept_backlash:.3f} mm differs from the formula's "
                          f"{sweep.formula_backlash:.3f} mm by {sweep.backlash_deviation:+.3f} mm: "
                          f"the tightest spot is off the involute flanks, or the outlines do not "
                          f"match the declared sizes", subject, SOURCE_SWEEP))

    out.extend(_info(pair, sweep, subject, dist_name))
    rank = {ERROR: 0, WARNING: 1, INFO: 2}
    return sorted(out, key=lambda f: rank[f.severity])


def _swept_normal(pair: PairResult, sweep: SweepResult) -> float:
    """Swept circumferential backlash → normal: × cos α'_w × cos β_b."""
    return sweep.swept_backlash * math.cos(pair.alpha_w) * math.cos(pair.beta_b)


def _info(pair: PairResult, sweep: SweepResult | None, subject: str, dist_name: str):
    lines = []
    if pair.kind == RACK:
        lines.append(_f(INFO, "mesh-geometry",
                        f"datum line {pair.center_distance:.3f} mm from the pinion axis "
                        f"(zero-backlash {pair.zero_backlash_center_distance:.3f} mm), rack back "
                        f"at {pair.rack_back_distance:.3f} mm; pressure angle "
                        f"{pair.working_pressure_angle:.3f}°", subject))
    else:
        lines.append(_f(INFO, "mesh-geometry",
                        f"center distance {pair.center_distance:.3f} mm (standard "
                        f"{pair.reference_center_distance:.3f}, zero-backlash "
                        f"{pair.zero_backlash_center_distance:.3f}); operating pressure angle "
                        f"{pair.working_pressure_angle:.3f}°; y {pair.y:.4f}, k {pair.k:.4f}",
                        subject))
    lines.append(_f(INFO, "mesh-contact",
                    f"contact ratio ε_α {pair.contact_ratio:.3f}, overlap ε_β "
                    f"{pair.overlap_ratio:.3f}, total {pair.total_contact_ratio:.3f}; tip clearance "
                    f"{pair.tip_clearance:.3f} mm", subject))
    lines.append(_f(INFO, "mesh-backlash",
                    f"backlash (formula) normal {pair.backlash_normal:.3f} mm, circumferential "
                    f"{pair.backlash_circumferential:.3f} mm (thinning "
                    f"{pair.backlash_from_thinning:.3f}, {dist_name} "
                    f"{pair.backlash_from_center:.3f}, allowance "
                    f"{pair.backlash_from_allowance:.3f}); ISO/TR 10064-2 minimum for machined "
                    f"gears {iso_min_backlash(pair.center_distance, pair.mn):.3f} mm normal",
                    subject, "ISO 21771; ISO/TR 10064-2"))
    if sweep is not None:
        lines.append(_f(INFO, "mesh-sweep",
                        f"swept {sweep.steps} steps: least clearance drive "
                        f"{sweep.min_clearance_drive:.4f} mm, coast {sweep.min_clearance_coast:.4f} mm "
                        f"(at {math.degrees(sweep.angle_at_min):.2f}°); swept backlash "
                        f"{sweep.swept_backlash:.4f} mm vs formula {sweep.formula_backlash:.4f} mm",
                        subject, SOURCE_SWEEP))
    return lines


def pair_numbers(pr, sw) -> dict:
    """The per-pair numbers of ``check --json`` (mm and degrees)."""
    out = {
        "center_distance": pr.center_distance,
        "reference_center_distance": pr.reference_center_distance,
        "working_center_distance": pr.zero_backlash_center_distance,
        "working_pressure_angle": pr.working_pressure_angle,
        "center_distance_modification": pr.y,
        "tip_shortening": pr.k,
        "contact_ratio": pr.contact_ratio,
        "overlap_ratio": pr.overlap_ratio,
        "backlash_normal": pr.backlash_normal,
        "backlash_circumferential": pr.backlash_circumferential,
        "tip_clearance": pr.tip_clearance,
    }
    if getattr(pr, "rack_back_distance", None) is not None:
        out["rack_mounting_height"] = pr.rack_back_distance
    if sw is not None:
        out.update(min_clearance=min(sw.min_clearance_drive, sw.min_clearance_coast),
                   min_clearance_drive=sw.min_clearance_drive,
                   min_clearance_coast=sw.min_clearance_coast,
                   overlap_area=sw.overlap_area, swept_backlash=sw.swept_backlash)
        if hasattr(sw, "clear_center_distance"):
            out["clear_center_distance"] = sw.clear_center_distance
    return out
