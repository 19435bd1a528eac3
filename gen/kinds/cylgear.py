"""Shared builder for cylindrical involute gears (spur, helical, herringbone).

Each kind module (``spur_gear.py`` …) declares its keys and calls :func:`make_gear`.
"""

from __future__ import annotations

import functools
import math

import numpy as np

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.body import Body, Prism
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.features import Bore
from gen.geometry.gear_outline import gear_loop
from gen.geometry.generate import generate_flank
from gen.geometry.section import Section, circle
from gen.geometry.stack import fixed_loop
from gen.kinds.base import Formula, GearMate, Part, Role
from gen.kinds import common_keys as K
from gen.findings import ERROR, Finding
from gen.tolerances import TOL
from gen.validate.gear_checks import (compare_sizes, gear_findings, measured_sizes,
                                      thickness_circle)

GEAR_KEYS = (K.MODULE, K.TEETH, K.PRESSURE_ANGLE, K.PROFILE, K.PROFILE_SHIFT, K.FACE_WIDTH,
             K.BACKLASH_ALLOWANCE, K.TIP_SHORTENING, K.BORE, K.HUB, K.MATERIAL,
             K.SAFETY_FACTOR, K.RATING_SPEED, K.FIT, K.FORCE, K.CHORD)


def bore_of(values) -> Bore | None:
    b = values.get("bore")
    if not b:
        return None
    return Bore(diameter=b["diameter"], flat=b["flat"], keyway=b["keyway"],
                allowance=K.fit_of(values)["hole_allowance"])


def make_gear(name: str, values: dict, where, *, kind: str, beta: float = 0.0,
              hand: str | None = None, chevron: bool = False, groove: float = 0.0) -> Part:
    """Generate, measure and describe one cylindrical gear.

    ``beta`` is the helix angle (rad), ``hand`` "right"/"left" for helical gears (None: spur),
    ``chevron`` makes a herringbone with an optional plain centre ``groove`` (mm).
    """
    rack = basic_rack(values["profile"]).with_alpha(values["pressure_angle"])
    m, z, b = values["module"], values["teeth"], values["face_width"]
    fit = K.fit_of(values)
    if values["tip_shortening"] == "auto":
        # resolved per declared mesh by gen.check.project; alone the part keeps its full tips
        values = dict(values, tip_shortening=0.0)
    # the fit thins every flank and pulls the tip in; the formulas below include both, so
    # the measured profile is checked against the compensated sizes
    sizes = gear_sizes(z, m, rack, x=values["profile_shift"], beta=beta,
                       thinning=values["backlash_allowance"] + 2.0 * fit["flank_clearance"],
                       tip_shortening=values["tip_shortening"] + fit["outline_offset"] / m)
    findings = []
    bore = bore_of(values)
    try:
        cutter = cutter_for(sizes, rack)
        flank = generate_flank(z, sizes.rp, cutter, sizes.ra)
    except GeometryError as exc:
        raise where.error("teeth", str(exc), z) from None
    # a pointed tooth has no outline: report it and stop
    if flank.psi[-1] <= 0:
        findings += gear_findings(name, sizes, cutter, flank, None, force=values["force"])
        return _part(name, kind, values, None, sizes, findings, None, flank, beta, rack)
    loop = gear_loop(flank)
    poly = loop.polygon(values["chord_tolerance"])
    bore_r = None
    holes, straight_cuts = (), ()
    if bore is not None:
        try:
            holes = (bore.loop(),)
            bore_r = bore.outer_radius()
        except GeometryError as exc:
            raise where.error("bore", str(exc), values["bore"]) from None
    findings += gear_findings(name, sizes, cutter, flank, poly, force=values["force"],
                              addendum=rack.addendum, face_width=b, bore_radius=bore_r,
                              rack_root=rack.root_radius * m,
                              slice_margin=values["chord_tolerance"] + TOL.slice_extra)
    findings += min_feature_findings(name, fit, flank, sizes, bore_r)
    if beta:
        from gen.kinds.helical import gear_twist, helix_measure_radius, twisted_gear_body
        from gen.validate.measure import tooth_count

        # the helix is measured on slices of the triangles on this circle: it must cross
        # every tooth of the outline (the check build will run, done here on the profile)
        r_m = helix_measure_radius(sizes, flank.r_junction)
        if tooth_count(poly, r_m) != z:
            findings.append(Finding(ERROR, "helix", f"the circle r = {r_m:.3f} mm on which the "
                                    f"helix is measured crosses {tooth_count(poly, r_m)} teeth, "
                                    f"not {z}", name, "tan β = Δθ·r_p/Δz", key="profile_shift"))

        twist = gear_twist(beta, sizes.rp, hand)
        # a section's holes turn with it: only a round bore looks the same at every turn; a
        # D-flat or keyway must stay straight for its shaft, so it is cut straight through
        # the whole gear (plan_cuts makes it a plain hole of every layer, no boolean)
        if holes and not fixed_loop(holes[0]):
            straight_cuts, holes = holes, ()
        solids, extra = twisted_gear_body(Section(loop, holes), b, twist, chevron, groove,
                                          sizes.rf, holes, where)
        solids = list(solids)
        findings += extra
    else:
        twist = 0.0
        solids = [Prism(Section(loop, holes), 0.0, b)]
    hub = values.get("hub")
    if hub:
        if hub["diameter"] / 2.0 >= sizes.rf:
            findings.append(Finding(ERROR, "hub-too-big", f"hub diameter {hub['diameter']:g} mm "
                                    f"reaches the root circle ({sizes.df:.3f} mm)", name, "geometry", key="hub"))
        if bore_r is not None and hub["diameter"] / 2.0 <= bore_r + 0.5:
            findings.append(Finding(ERROR, "hub-too-thin", f"hub diameter {hub['diameter']:g} mm "
                                    "leaves no wall around the bore", name, "geometry", key="hub"))
        solids.append(Prism(Section(circle(hub["diameter"] / 2.0), holes), b, b + hub["length"]))
    top = solids[-1].z1
    body = Body(tuple(solids), tuple(Prism(Section(h), 0.0, top) for h in straight_cuts))
    part = _part(name, kind, values, body, sizes, findings, poly, flank, beta, rack,
                 hand=hand, chevron=chevron)
    checks = list(part.slice_checks)
    if chevron:   # measure in the middle of the lower toothed half, clear of any groove
        checks = [size_slice_check(name, sizes, flank, values["chord_tolerance"],
                                   0.25 * (b - groove))]
    if beta:
        from gen.kinds.helical import helix_slice_check

        checks.append(helix_slice_check(name, sizes, twist, chevron, b, groove,
                                        flank.r_junction, values["chord_tolerance"]))
    return part.with_(section=Section(loop, holes + straight_cuts), slice_checks=tuple(checks))


def min_feature_findings(name, fit, flank, sizes, bore_r) -> list:
    """Teeth, tip lands and rims against the printer's line width (the fit profile's, or the
    default nozzle's): :mod:`gen.validate.printability`."""
    from gen.validate.printability import print_limits, printability_findings

    tip = 2.0 * flank.r_tip * float(flank.psi[-1])
    rim = sizes.rf - bore_r if bore_r is not None else None
    return printability_findings(name, print_limits(fit), tooth=sizes.s, tip_land=tip, rim=rim)


def gear_rating(name, values, sizes, rack) -> dict:
    """Lewis form factor measured on the generated tooth and the rated torque (N·m)."""
    from gen.validate.strength import loaded_gear, rated_torque

    gear = loaded_gear(sizes, rack, values["face_width"], name)
    torque = rated_torque(gear, values["material"], values["safety_factor"], values["rpm"])
    return {"lewis_form_factor": gear.form_factor, "rated_torque": torque,
            "material": values["material"], "safety_factor": values["safety_factor"],
            "rpm": values["rpm"], "loaded": gear}


#: what a cylindrical gear's sizes are measured against
GEAR_FORMULAS = (
    Formula("pitch_diameter", "d = z·m_n / cos β", "ISO 21771"),
    Formula("base_diameter", "d_b = d·cos α_t", "ISO 21771"),
    Formula("tip_diameter", "d_a = d + 2 m_n (h_aP* + x − k)", "ISO 21771"),
    Formula("root_diameter", "d_f = d − 2 m_n (h_fP* − x)", "ISO 21771"),
    Formula("tooth_thickness", "s = m_t (π/2 + 2 x tan α_n) − thinning", "ISO 21771"),
)


def size_slice_check(name, sizes, flank, chord, z):
    """Measure the outer outline of a slice of the exported triangles at height ``z``."""

    # the same circle the profile check measured on (gen.validate.gear_checks)
    at = thickness_circle(sizes, flank.r_junction, chord + TOL.slice_extra)

    def check(slicer):
        polys = slicer(z)
        if not polys:
            return [Finding(ERROR, "size-mismatch", f"mesh slice z={z:g}: no section",
                            name, "", key="face_width")]
        outer = max(polys, key=lambda p: abs(_area(p)))
        got = measured_sizes(outer, sizes, at[0])
        return compare_sizes(name, got, sizes, size_tol=chord + TOL.slice_extra,
                             thickness_tol=2 * chord + TOL.slice_extra,
                             where=f"mesh slice z={z:g}", thickness_at=at)

    return check


def _part(name, kind, values, body, sizes, findings, poly, flank, beta, rack, *,
          hand=None, chevron=False):
    manifest = {
        "module": sizes.mn,
        "teeth": sizes.z,
        "pressure_angle": math.degrees(sizes.alpha_n),
        "profile_shift": sizes.x,
        "face_width": values["face_width"],
        "pitch_diameter": sizes.d,
        "tip_diameter": sizes.da,
        "root_diameter": sizes.df,
        "base_diameter": sizes.db,
        "tooth_thickness": sizes.s,
        "tip_shortening": values["tip_shortening"],   # k applied to the tip diameter
    }
    fit = K.fit_of(values)
    if fit["name"] != "none":
        manifest["fit"] = {k: fit[k] for k in ("name", "flank_clearance", "hole_allowance",
                                               "outline_offset", "min_feature")}
    if beta:
        manifest.update(helix_angle=math.degrees(beta), transverse_module=sizes.mt,
                        transverse_pressure_angle=math.degrees(sizes.alpha_t))
    chord = values["chord_tolerance"]
    checks = ()
    if body is not None:
        checks = (size_slice_check(name, sizes, flank, chord, 0.5 * values["face_width"]),)
    # computed on first use (a mesh with a declared torque, or the manifest), then kept
    rating = (functools.lru_cache(maxsize=1)(lambda: gear_rating(name, values, sizes, rack))
              if body is not None else None)
    return Part(name=name, kind=kind, role=Role.EXTERNAL_GEAR, values=values, shape=body,
                sizes=manifest, findings=tuple(findings), formulas=GEAR_FORMULAS,
                mate=GearMate(sizes, flank, values["profile"], values["face_width"],
                              hand=hand, chevron=chevron),
                outline=poly, slice_checks=checks, rating=rating, chord_tol=chord)


def _area(p):
    x, y = p[:, 0], p[:, 1]
    return 0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))
