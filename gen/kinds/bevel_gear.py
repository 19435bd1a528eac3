"""Part kind ``bevel_gear``: straight bevel gear, Tredgold back-cone tooth form.

Own frame: axis Z, back (mounting) face on z = 0, teeth toward +Z, cone apex on the axis at
z = mounting distance. See :mod:`gen.geometry.bevel` for the conventions.
"""

from __future__ import annotations

import functools
import math

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.bevel import bevel_sizes, virtual_flank
from gen.params.schema import REQUIRED, Key
from gen.kinds import common_keys as K
from gen.kinds.base import BevelMate, Formula, Part, Role
from gen.geometry.body import ApexBody
from gen.validate import measure
from gen.validate.bevel_checks import bevel_findings
from gen.validate.bevel_measure import bevel_size_findings, slice_plan
from gen.tolerances import TOL
from gen.findings import ERROR, Finding

KIND = "bevel_gear"
ROLE = Role.BEVEL_GEAR
BEVEL_FORMULAS = (
    Formula("pitch_cone_angle", "tan δ1 = sin Σ / (z2/z1 + cos Σ)", "ISO 23509"),
    Formula("outer_cone_distance", "R_e = d_e / (2 sin δ)", "ISO 23509"),
    Formula("virtual_teeth", "z_v = z / cos δ (Tredgold)", "ISO 23509"),
)
BORE = Key("bore", "float", 0.0, lo=0, hi=2000, unit="mm", doc="plain bore diameter (0: none)")
COMMON = (
    K.MODULE, K.TEETH, K.PRESSURE_ANGLE, K.PROFILE,
    Key("face_width", "float", REQUIRED, lo=0, hi=2000, lo_open=True, unit="mm",
        doc="along the pitch-cone generator; at most min(Re/3, 10 m)"),
    Key("profile_shift", "float", 0.0, lo=-0.6, hi=0.6, doc="x; the mating gear takes −x"),
    K.BACKLASH_ALLOWANCE, BORE, K.MATERIAL, K.SAFETY_FACTOR, K.RATING_SPEED, K.FIT,
    Key("mounting_distance", "float", None, lo=0, hi=5000, lo_open=True, unit="mm",
        doc="cone apex to back face (default: derived from the blank)"),
    K.FORCE, K.CHORD,
)
KEYS = COMMON + (
    Key("mating_teeth", "int", REQUIRED, lo=3, hi=10000),
    Key("shaft_angle", "angle", 90.0, lo=10, hi=170, unit="deg"),
)
EXAMPLE = {"module": 1.5, "teeth": 20, "mating_teeth": 30, "face_width": 8, "bore": 5}


def make_bevel(name, values, where, *, kind, mating_teeth, shaft_angle) -> Part:
    rack = basic_rack(values["profile"]).with_alpha(values["pressure_angle"])
    try:
        sizes = bevel_sizes(values["teeth"], mating_teeth, values["module"], shaft_angle,
                            values["face_width"], rack, values["profile_shift"],
                            thinning=values["backlash_allowance"]
                            + 2.0 * K.fit_of(values)["flank_clearance"],
                            mounting_distance=values["mounting_distance"])
        flank = virtual_flank(sizes)
    except GeometryError as exc:
        msg = str(exc)
        key = ("face_width" if "face" in msg else "mounting_distance" if "mounting" in msg
               else "teeth")
        raise where.error(key, msg, values[key]) from None
    return bevel_model(name, kind, values, sizes, flank)


def bevel_model(name, kind, values, sizes, flank) -> Part:
    """Part of a bevel gear whose sizes and flank are known (parts and assemblies)."""
    findings = [Finding(f.severity, f.code, f.message, name, f.source, key=f.key or "teeth")
                for f in bevel_findings(sizes, flank, subject=name)]
    bore = values.get("bore") or 0.0
    if bore:
        bore += K.fit_of(values)["hole_allowance"]
    from gen.geometry.bevel import blank_profile

    rim = None
    try:
        blank = blank_profile(sizes, bore / 2.0)
        if bore:   # least wall between the bore and the small-end root land
            rim = float(min(blank[-2, 0], blank[1, 0])) - bore / 2.0
    except GeometryError as exc:
        findings.append(Finding(ERROR, "bore-too-big", str(exc), name, "geometry", key="bore"))
    # printability at the small end, where the teeth are thinnest (sections scale by Ri/Re)
    from gen.validate.bevel_checks import small_end_tip_land
    from gen.validate.printability import print_limits, printability_findings

    k = sizes.small_end_scale
    s_small = (sizes.module * (math.pi / 2 + 2 * sizes.x * math.tan(sizes.alpha))
               - sizes.thinning) * k
    findings += printability_findings(name, print_limits(K.fit_of(values)), tooth=s_small,
                                      tip_land=small_end_tip_land(sizes, flank), rim=rim)
    chord = values["chord_tolerance"]
    manifest = {"module": sizes.module, "teeth": sizes.z, "mating_teeth": sizes.mating_z,
                "shaft_angle": math.degrees(sizes.shaft_angle),
                "pressure_angle": math.degrees(sizes.alpha), "pitch_diameter": sizes.de,
                "tip_diameter": sizes.dae, "root_diameter": sizes.dfe,
                "bore": bore, **sizes.manifest()}
    # ISO 23509 sizes measured on the large-end outline, and the plane section that the
    # slice of the exported triangles will show (the same plane and circle as slice_check)
    slice_tol = chord + TOL.slice_extra
    findings += bevel_size_findings(sizes, flank, name, chord, slice_tol)
    plan = slice_plan(sizes, flank)

    def slice_check(slicer):
        if plan is None:
            return []     # already refused by bevel_size_findings
        polys = slicer(plan.z)
        if not polys:
            return [Finding(ERROR, "tooth-count", f"mesh slice z={plan.z:.3f}: no section",
                            name, "", key="face_width")]
        # above the front face the teeth stand as islands: count over every polygon
        n = sum(measure.tooth_count(q, plan.r_count) for q in polys)
        if n != sizes.z:
            return [Finding(ERROR, "tooth-count", f"mesh slice z={plan.z:.3f}: counted {n} "
                            f"teeth on r = {plan.r_count:.3f} mm, expected {sizes.z}", name,
                            "plane section of the tooth band", key="face_width")]
        return []

    rating = functools.lru_cache(maxsize=1)(lambda: bevel_rating(name, values, sizes))
    return Part(name=name, kind=kind, role=Role.BEVEL_GEAR, values=values, rating=rating,
                shape=ApexBody(sizes, flank, bore), sizes=manifest, findings=tuple(findings),
                formulas=BEVEL_FORMULAS, mate=BevelMate(sizes, flank),
                slice_checks=(slice_check,), chord_tol=chord)


def bevel_loaded_gear(sizes, name: str = ""):
    """The Lewis load model of a straight bevel gear: tangential force at the mean pitch
    radius r_m = (d_e/2)(1 − b/(2 R_e)), mean module m_m = m (1 − b/(2 R_e)), face width b,
    Y measured on the Tredgold virtual spur gear of z_v = z/cos δ teeth (Shigley, Mechanical
    Engineering Design, bevel gears: the usual approximation, from memory)."""
    from gen.geometry.cylindrical import gear_sizes
    from gen.geometry.lewis import lewis_gear
    from gen.validate.strength import LoadedGear

    shrink = 1.0 - sizes.b / (2.0 * sizes.Re)
    virtual = gear_sizes(sizes.zv, sizes.module, sizes.rack, x=sizes.x, thinning=sizes.thinning)
    return LoadedGear(name=name, module=sizes.module * shrink, face_width=sizes.b,
                      form_factor=lewis_gear(virtual, sizes.rack).form_factor,
                      pitch_diameter=sizes.de * shrink, teeth=sizes.z)


def bevel_rating(name, values, sizes) -> dict:
    """Lewis form factor (virtual gear) and the rated torque (N·m) of a bevel gear."""
    from gen.validate.strength import rated_torque

    gear = bevel_loaded_gear(sizes, name)
    safety, rpm = values.get("safety_factor", 2.0), values.get("rpm", 60.0)
    return {"lewis_form_factor": gear.form_factor,
            "rated_torque": rated_torque(gear, values["material"], safety, rpm),
            "material": values["material"], "safety_factor": safety, "rpm": rpm,
            "basis": "Lewis at the mean section, Y of the Tredgold virtual spur gear",
            "loaded": gear}


def make(name, values, where):
    return make_bevel(name, values, where, kind=KIND, mating_teeth=values["mating_teeth"],
                      shaft_angle=values["shaft_angle"])
