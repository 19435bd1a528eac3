"""Findings for a pinion meshing inside a ring: formula numbers
(:func:`gen.geometry.internal_pair.mesh_internal`) and the swept outlines
(:func:`gen.validate.internal_sweep.sweep_internal`).

Rules (limits shared with external pairs, :data:`gen.validate.pair_checks.PAIR_LIMITS`):

* error ``teeth-interfere``: the swept outlines overlap;
* error ``involute-interference``: the ring's tip circle lies inside the pinion's
  interference point, r_a2 < √(r_b2² + (C sin α'_w)²) (gear handbooks, from memory);
* error ``trochoid-interference``: z₁θ₁ − z₂θ₂ < 0, the tips strike as the teeth leave mesh
  (the classic tip-circle condition, from memory; derived in :mod:`gen.geometry.internal_pair`);
* warning ``tooth-difference``: z₂ − z₁ below the least difference that passes the trochoid
  check for this module, shift and addendum;
* warning ``ring-tip-inside-base``: the ring's tips are not involute;
* error ``contact-ratio-low``, ``tip-clearance-low`` (error when negative, warning under
  0.1 m_n), warning ``backlash-low`` (under two print clearances), warnings
  ``contact-below-form`` / ``contact-past-ring-involute`` (contact on a fillet);
* warning ``backlash-mismatch``: swept and formula backlash disagree;
* info ``axial-assembly-only`` when the pinion cannot be put in along a radius;
* info lines with the numbers.
"""

from __future__ import annotations

import math

from gen.findings import ERROR, INFO, WARNING, Finding
from gen.validate.internal_sweep import INTERFERING
from gen.validate.pair_checks import PAIR_LIMITS, iso_min_backlash

SOURCE = "ISO 21771 internal mesh relations"
SOURCE_SWEEP = "swept outlines (shapely intersection and distance)"


def internal_pair_findings(pr, sw=None, *, subject: str = "", print_clearance=None,
                           limits=PAIR_LIMITS) -> list[Finding]:
    """Findings for one internal mesh (``pr``: InternalPairResult, ``sw``:
    InternalSweepResult or None), errors first."""
    clear = limits.print_clearance if print_clearance is None else print_clearance
    out = []

    def add(sev, code, msg, src=SOURCE, key=""):
        out.append(Finding(sev, code, msg, subject, src, key=key))

    if sw is not None and sw.status == INTERFERING:
        add(ERROR, "teeth-interfere", f"teeth overlap in mesh at center distance "
            f"{pr.center_distance:.3f} mm (up to {sw.overlap_area:.4f} mm² at "
            f"{math.degrees(sw.angle_at_overlap):.2f}° of the pinion)", SOURCE_SWEEP)
    elif sw is None and pr.backlash_circumferential < -limits.length_eps:
        add(ERROR, "teeth-interfere", f"negative backlash {pr.backlash_normal:.3f} mm at "
            f"center distance {pr.center_distance:.3f} mm")
    r_a2, r_b2 = pr.tip_radii[1], pr.base_radii[1]
    if r_a2 < r_b2:
        add(WARNING, "ring-tip-inside-base", f"the ring's tip circle (d_a {2 * r_a2:.3f} mm) lies "
            f"inside its base circle (d_b {2 * r_b2:.3f} mm): raise its shift or tip shortening",
            key="tip_shortening")
    if pr.involute_margin < -limits.length_eps:
        add(ERROR, "involute-interference", f"the ring's tips reach {-pr.involute_margin:.3f} mm "
            f"inside the pinion's interference point (ring tip diameter must be ≥ "
            f"{2 * pr.interference_point_radius:.3f} mm): shorten the ring's tips "
            f"(tip_shortening) or use a pinion with more teeth", key="tip_shortening")
    if pr.trochoid_margin is None:
        add(WARNING, "trochoid-interference", "the tip-to-tip (trochoid) condition cannot be "
            "evaluated for these tip circles; rely on the sweep")
    elif pr.trochoid_margin < 0.0:
        need = f"; at least {pr.min_tooth_difference} is needed" if pr.min_tooth_difference else ""
        add(ERROR, "trochoid-interference", f"the pinion's tips strike the ring's tips as they "
            f"leave the mesh (margin {pr.trochoid_margin:.4f} rad): tooth-count difference "
            f"{pr.tooth_difference} is too small{need}", key="teeth")
    if pr.min_tooth_difference is None:
        add(WARNING, "tooth-difference", f"no pinion of this module, shift and addendum passes "
            f"the tip-circle (trochoid) condition in this ring (difference here "
            f"{pr.tooth_difference})", key="teeth")
    elif pr.tooth_difference < pr.min_tooth_difference:
        add(WARNING, "tooth-difference", f"ring and pinion differ by {pr.tooth_difference} teeth; "
            f"this module, shift and addendum need at least {pr.min_tooth_difference}",
            key="teeth")
    if pr.contact_ratio < limits.min_contact_ratio:
        add(ERROR, "contact-ratio-low", f"transverse contact ratio {pr.contact_ratio:.3f} is "
            f"below {limits.min_contact_ratio:g}")
    tip_min = limits.min_tip_clearance_modules * pr.mn
    if pr.tip_clearance < -limits.length_eps:
        add(ERROR, "tip-clearance-low", f"a tip reaches the mating root: tip clearance "
            f"{pr.tip_clearance:.3f} mm")
    elif pr.tip_clearance < tip_min:
        add(WARNING, "tip-clearance-low", f"tip clearance {pr.tip_clearance:.3f} mm is under "
            f"{limits.min_tip_clearance_modules:g} m = {tip_min:.3f} mm")
    interfering = sw is not None and sw.status == INTERFERING
    jn = pr.backlash_normal
    if sw is not None and not interfering:
        jn = min(jn, sw.swept_backlash * math.cos(pr.alpha_w) * math.cos(pr.beta_b))
    if not interfering and jn < 2.0 * clear:
        add(WARNING, "backlash-low", f"normal backlash {jn:.3f} mm is under two print "
            f"clearances of {clear:.3f} mm: thin the teeth (backlash_allowance); moving the "
            f"pinion away from the ring axis tightens an internal mesh",
            SOURCE if sw is None else SOURCE_SWEEP)
    for text in pr.problems:   # the pair module's checks against form and involute limits
        if text.startswith("contact reaches") and "pinion" in text:
            add(WARNING, "contact-below-form", text)
        elif text.startswith("contact reaches") and "ring" in text:
            add(WARNING, "contact-past-ring-involute", text)
    if sw is not None and not interfering:
        allowed = limits.backlash_mismatch_abs + limits.backlash_mismatch_rel * abs(sw.formula_backlash)
        if abs(sw.backlash_deviation) > allowed:
            add(WARNING, "backlash-mismatch", f"swept backlash {sw.swept_backlash:.3f} mm differs "
                f"from the formula's {sw.formula_backlash:.3f} mm by {sw.backlash_deviation:+.3f} "
                "mm: the tightest spot is off the involutes", SOURCE_SWEEP)
    if not pr.radial_assembly:
        add(INFO, "axial-assembly-only", "the pinion cannot be put into the ring along a radius: "
            "slide it in axially", "radial insertion of the tooth outlines")
    out += _info(pr, sw, subject)
    rank = {ERROR: 0, WARNING: 1, INFO: 2}
    return sorted(out, key=lambda f: rank[f.severity])


def internal_numbers(pr, sw) -> dict:
    """The per-pair numbers of ``check --json`` for an internal mesh (mm, degrees): those of
    an external pair (:func:`gen.validate.pair_checks.pair_numbers`) and the internal ones."""
    from gen.validate.pair_checks import pair_numbers

    out = {"internal": True, **pair_numbers(pr, sw)}
    out.pop("clear_center_distance", None)   # the internal sweep does not search for it
    out.pop("rack_mounting_height", None)
    out.update(tooth_difference=pr.tooth_difference, involute_margin=pr.involute_margin,
               trochoid_margin=pr.trochoid_margin,
               min_tooth_difference=pr.min_tooth_difference,
               radial_assembly=pr.radial_assembly)
    return out


def _info(pr, sw, subject):
    def f(code, msg, src=SOURCE):
        return Finding(INFO, code, msg, subject, src)

    lines = [
        f("mesh-geometry", f"internal mesh: center distance {pr.center_distance:.3f} mm "
          f"(standard {pr.reference_center_distance:.3f}, zero-backlash "
          f"{pr.zero_backlash_center_distance:.3f}); operating pressure angle "
          f"{pr.working_pressure_angle:.3f}°; tooth difference {pr.tooth_difference}"),
        f("mesh-contact", f"contact ratio ε_α {pr.contact_ratio:.3f}, overlap ε_β "
          f"{pr.overlap_ratio:.3f}; tip clearances {pr.tip_clearances[0]:.3f} (pinion tip) and "
          f"{pr.tip_clearances[1]:.3f} mm (ring tip); involute margin {pr.involute_margin:.3f} mm"),
        f("mesh-backlash", f"backlash (formula) normal {pr.backlash_normal:.3f} mm, "
          f"circumferential {pr.backlash_circumferential:.3f} mm; ISO/TR 10064-2 minimum for "
          f"machined gears {iso_min_backlash(pr.center_distance, pr.mn):.3f} mm normal",
          "ISO 21771; ISO/TR 10064-2"),
    ]
    if sw is not None:
        lines.append(f("mesh-sweep", f"swept {sw.steps} steps: least clearance drive "
                       f"{sw.min_clearance_drive:.4f} mm, coast {sw.min_clearance_coast:.4f} mm; "
                       f"swept backlash {sw.swept_backlash:.4f} mm vs formula "
                       f"{sw.formula_backlash:.4f} mm", SOURCE_SWEEP))
    return lines
