"""Check every declared mesh (gears in engagement): formula numbers, a swept rolling of the
real outlines, findings, and the picture for the report. Numpy and shapely only (no CAD kernel).

Entries are validated by the same key tables as parts (:data:`MESH_KEYS`), and each pair is
checked by the function :data:`PAIR_CHECKS` names for the two parts' roles.
"""

from __future__ import annotations

import math
from dataclasses import replace

from gen.errors import GeometryError, ParamError
from gen.findings import ERROR, INFO, WARNING, Finding
from gen.geometry.pair import mesh_pair, mesh_rack
from gen.kinds.base import Role
from gen.params.project import display_path
from gen.params.schema import REQUIRED, Key, Where, check_mapping
from gen.tolerances import LIMITS
from gen.validate.pair_basic import basic_pair_findings
from gen.validate.pair_checks import pair_findings, pair_numbers
from gen.validate.strength import MATERIALS
from gen.validate.sweep import sweep_pair, sweep_rack
from gen.check.sector_pairs import check_sector_pair, is_sector

MESH_KEYS = (
    Key("parts", "list", REQUIRED, item="str", count=2, doc="the two parts in engagement"),
    Key("center_distance", "float", None, lo=0, hi=100000, lo_open=True, unit="mm",
        doc="as mounted (default: the zero-backlash working distance)"),
    Key("print_clearance", "float", None, lo=0, hi=5, unit="mm",
        doc="clearance each printed flank needs from its mate"),
    Key("max_backlash", "float", None, lo=0, hi=50, unit="mm",
        doc="largest normal backlash before the pair is said to rattle (default: two print "
            "clearances + 2 × ISO/TR 10064-2 j_bn,min)"),
    Key("torque", "float", None, lo=0, hi=1e6, lo_open=True, unit="N·m",
        doc="torque on the part named first (Lewis bending estimate)"),
    Key("speed", "float", None, lo=0, hi=1e6, unit="rpm", doc="speed of the part named first"),
    Key("material", "enum", None, choices=tuple(MATERIALS),
        doc="overrides both parts' material in the strength estimate"),
    Key("safety_factor", "float", None, lo=1.0, hi=20.0,
        doc="overrides both parts' safety factor in the strength estimate"),
)


def mesh_values(entry) -> dict:
    """The entry's values checked against :data:`MESH_KEYS`; raises ParamError."""
    where = Where(entry.file, entry.label, entry.line, section="mesh")
    return check_mapping(entry.values, MESH_KEYS, where)


def check_cylindrical_pair(label, names, a, b, v):
    """(findings, numbers, picture-inputs) for two cylindrical gears or a gear and a rack."""
    if a.role is Role.RACK:
        a, b = b, a
    if b.role is not Role.RACK and (is_sector(a) or is_sector(b)):  # issue 15
        return check_sector_pair(label, names, a, b, v, strength=strength_of_pair)
    ta, tb = a.mate, b.mate
    found = basic_pair_findings(label, a.name, ta, b.name, tb)
    if found:
        return found, {}, None
    center, clearance = v["center_distance"], v["print_clearance"]
    bw = min(ta.face_width, tb.face_width)
    rack = b.role is Role.RACK
    try:
        if rack:
            pr = mesh_rack(ta.sizes, tb.sizes, center, face_width=bw,
                           form_radius=ta.flank.r_junction)
            sw = sweep_rack(a.outline, b.outline, pr, tb.sizes)
        else:
            pr = mesh_pair(ta.sizes, tb.sizes, center, face_width=bw,
                           form_radii=(ta.flank.r_junction, tb.flank.r_junction))
            sw = sweep_pair(a.outline, b.outline, pr)
    except GeometryError as exc:
        return [Finding(ERROR, "no-mesh", str(exc), label, "", key="center_distance")], {}, None
    found = pair_findings(pr, sw, subject=label, print_clearance=clearance,
                          max_backlash=v["max_backlash"])
    applied = {m.name: float(m.sizes.get("tip_shortening", 0.0)) for m in (a, b)
               if m.role is Role.EXTERNAL_GEAR}
    if not rack:
        said = ", ".join(f"{n} {k:.4f}" for n, k in applied.items())
        hint = ("" if all(k >= pr.k - 1e-4 for k in applied.values()) else
                "; tip_shortening: auto applies it")
        found.append(Finding(INFO, "mesh-geometry", f"tip shortening k = x1 + x2 − y = "
                             f"{pr.k:.4f} for this pair; applied to the tips: {said}{hint}",
                             label, "ISO 21771", key="parts"))
    if v["torque"] is not None:
        found += rated_at_rest(label, v) + strength_of_pair(label, names, a, b, v)
    numbers = pair_numbers(pr, sw)
    numbers["tip_shortening_applied"] = applied
    return found, numbers, (a.outline, b.outline, pr, sw,
                                        tb.sizes if rack else None)


def check_bevel_pair(label, names, a, b, v):
    """A declared pair of bevel gears: same tooth system, each other's tooth counts, one
    shaft angle, shifts x and −x; contact ratio and backlash of the Tredgold virtual spur
    pair; with a torque, the Lewis estimate at the mean section with Y of the virtual gear."""
    from gen.geometry.cylindrical import gear_sizes

    sa, sb = a.mate.sizes, b.mate.sizes
    src = "straight bevel pair (ISO 23509 conventions)"
    errs = []

    def bad(msg, key="parts"):
        errs.append(Finding(ERROR, "bevel-mismatch", msg, label, src, key=key))

    if v["center_distance"] is not None:
        bad("a bevel pair has no center distance: its gears are placed by their mounting "
            "distances (set mounting_distance on each gear)", "center_distance")
    if abs(sa.module - sb.module) > 1e-9:
        bad(f"modules differ ({sa.module:g} and {sb.module:g} mm)", "module")
    if abs(sa.alpha - sb.alpha) > 1e-9:
        bad("pressure angles differ", "pressure_angle")
    if sa.mating_z != sb.z or sb.mating_z != sa.z:
        bad(f"'{names[0]}' is cut for {sa.mating_z} mating teeth and '{names[1]}' for "
            f"{sb.mating_z}: each must name the other's tooth count", "mating_teeth")
    if abs(sa.shaft_angle - sb.shaft_angle) > 1e-9:
        bad("shaft angles differ", "shaft_angle")
    if abs(sa.x + sb.x) > 1e-9:
        bad(f"profile shifts {sa.x:g} and {sb.x:g}: a bevel pair takes x and −x", "profile_shift")
    if errs:
        return errs, {}, None
    rack = sa.rack
    va = gear_sizes(sa.zv, sa.module, rack, x=sa.x, thinning=sa.thinning)
    vb = gear_sizes(sb.zv, sb.module, rack, x=sb.x, thinning=sb.thinning)
    pr = mesh_pair(va, vb, face_width=min(sa.b, sb.b))
    numbers = {"center_distance": sa.Re, "outer_cone_distance": sa.Re,
               "working_pressure_angle": math.degrees(sa.alpha),
               "contact_ratio": pr.contact_ratio, "backlash_normal": pr.backlash_normal,
               "pitch_cone_angles": [math.degrees(sa.delta), math.degrees(sb.delta)],
               "mounting_distances": [sa.mounting_distance, sb.mounting_distance]}
    found = [Finding(INFO, "bevel-pair", f"pitch cones {math.degrees(sa.delta):.3f}° + "
                     f"{math.degrees(sb.delta):.3f}° = {math.degrees(sa.delta + sb.delta):.3f}°; "
                     f"mount the back faces {sa.mounting_distance:.3f} and "
                     f"{sb.mounting_distance:.3f} mm from the common apex; virtual (Tredgold) "
                     f"contact ratio {pr.contact_ratio:.3f}", label, src)]
    if pr.contact_ratio < LIMITS.min_contact_ratio:
        found.append(Finding(ERROR, "contact-ratio-low", f"virtual contact ratio "
                             f"{pr.contact_ratio:.3f} < {LIMITS.min_contact_ratio:g}", label,
                             "common practice"))
    found += bevel_sweep(label, a, b, pr, numbers, v)
    clearance = v["print_clearance"]
    if clearance is not None and pr.backlash_normal < 2.0 * clearance - 1e-9:
        found.append(Finding(ERROR, "backlash-low", f"virtual-pair normal backlash "
                             f"{pr.backlash_normal:.3f} mm is under twice the print clearance "
                             f"({2 * clearance:.3f} mm): thin the teeth (backlash_allowance)",
                             label, src, key="print_clearance"))
    if v["torque"] is not None:
        found += rated_at_rest(label, v) + bevel_strength(label, names, a, b, v)
    return found, numbers, None


def bevel_sweep(label, a, b, pr, numbers, v) -> list:
    """Sweep the Tredgold virtual (back-cone) outlines of a bevel pair through one pitch, as a
    cylindrical pair is swept: overlap is an error, the least clearances are reported, and a
    virtual normal backlash above the maximum rattles."""
    from gen.validate.bevel_measure import virtual_outline
    from gen.validate.pair_checks import PAIR_LIMITS, max_normal_backlash
    from gen.validate.sweep import INTERFERING

    src = "swept Tredgold virtual outlines (large end)"
    sa, sb = a.mate.sizes, b.mate.sizes
    try:
        sw = sweep_pair(virtual_outline(a.mate.flank, sa.zv, a.chord_tol),
                        virtual_outline(b.mate.flank, sb.zv, b.chord_tol), pr)
    except (GeometryError, ValueError) as exc:
        return [Finding(ERROR, "no-mesh", f"virtual pair: {exc}", label, src, key="parts")]
    numbers.update(min_clearance_drive=sw.min_clearance_drive,
                   min_clearance_coast=sw.min_clearance_coast, overlap_area=sw.overlap_area,
                   swept_backlash=sw.swept_backlash)
    if sw.status == INTERFERING:
        return [Finding(ERROR, "teeth-interfere", f"virtual (back-cone) outlines overlap in mesh "
                        f"(up to {sw.overlap_area:.4f} mm²)", label, src, key="profile_shift")]
    out = [Finding(INFO, "mesh-sweep", f"virtual pair swept {sw.steps} steps: least clearance "
                   f"drive {sw.min_clearance_drive:.4f} mm, coast {sw.min_clearance_coast:.4f} "
                   f"mm; swept backlash {sw.swept_backlash:.4f} mm vs formula "
                   f"{sw.formula_backlash:.4f} mm", label, src)]
    clear = PAIR_LIMITS.print_clearance if v["print_clearance"] is None else v["print_clearance"]
    jmax = v["max_backlash"] if v["max_backlash"] is not None else max_normal_backlash(pr, clear)
    if pr.backlash_normal > jmax + 1e-9:
        out.append(Finding(WARNING, "backlash-high", f"the teeth will rattle: virtual-pair normal "
                           f"backlash {pr.backlash_normal:.3f} mm exceeds {jmax:.3f} mm: thin the "
                           "teeth less (backlash_allowance)", label, "ISO/TR 10064-2",
                           key="backlash_allowance"))
    return out


def rated_at_rest(label, v) -> list:
    """A warning when a torque is declared without a speed: the Lewis estimate then uses the
    0 rpm velocity factor (no dynamic load), the most lenient case."""
    if v["speed"] is not None:
        return []
    return [Finding(WARNING, "rated-at-rest", f"torque {v['torque']:g} N·m is rated at 0 rpm "
                    "(no speed given): the velocity factor of a running pair is left out; "
                    "give speed (rpm of the part named first)", label,
                    "Lewis with the Barth velocity factor", key="speed")]


def bevel_strength(label, names, a, b, v) -> list:
    """Lewis estimate of both bevel gears under the declared torque and speed of the part
    named first (:func:`gen.kinds.bevel_gear.bevel_loaded_gear`: mean section, Y of the
    Tredgold virtual spur gear); the mate carries T·z2/z1 at n·z1/z2."""
    from gen.validate.strength import strength_findings

    first = a if a.name == names[0] else b
    out = []
    for m in (a, b):
        s = m.mate.sizes
        gear = m.rating()["loaded"]
        ratio = 1.0 if m is first else s.z / first.mate.sizes.z
        out += [replace(f, message=f"{m.name}: {f.message}") for f in
                strength_findings(gear, v["material"] or m.values["material"],
                                  torque=v["torque"] * ratio, rpm=(v["speed"] or 0.0) / ratio,
                                  safety_factor=v["safety_factor"] or m.values.get(
                                      "safety_factor", 2.0), subject=label)]
    return out


def strength_of_pair(label, names, a, b, v) -> list:
    """Lewis check of both members under the declared torque (N·m) and speed (rpm) of the
    part named first in the mesh; the mate carries it scaled by the tooth ratio."""
    from gen.geometry.basic_rack import basic_rack
    from gen.validate.strength import loaded_rack, strength_findings

    torque, rpm = v["torque"], v["speed"] or 0.0
    first = a if a.name == names[0] else b
    z1 = first.mate.sizes.z if first.role is Role.EXTERNAL_GEAR else None
    out = []
    for m in (a, b):
        mat = v["material"] or m.values["material"]
        safety = v["safety_factor"] or m.values["safety_factor"]
        if m.role is Role.RACK:
            pin = a if m is b else b
            rp = pin.mate.sizes.rp
            force = torque / (rp / 1000.0)  # the pinion carries the torque
            speed = rp / 1000.0 * rpm * 2.0 * math.pi / 60.0
            rack = basic_rack(m.values["profile"]).with_alpha(m.values["pressure_angle"])
            gear = loaded_rack(m.mate.sizes.mn, rack, m.mate.face_width, m.name,
                               thinning=m.values["backlash_allowance"])
            out += [replace(f, message=f"{m.name}: {f.message}") for f in
                    strength_findings(gear, mat, force=force, speed=speed,
                                      safety_factor=safety, subject=label)]
            continue
        r = m.rating()
        z = m.mate.sizes.z
        ratio = 1.0 if m is first or z1 is None else z / z1
        out += [replace(f, message=f"{m.name}: {f.message}") for f in
                strength_findings(r["loaded"], mat, torque=torque * ratio,
                                  rpm=rpm / ratio, safety_factor=safety, subject=label)]
    return out


def check_internal_pair(label, names, a, b, v):
    """A pinion (external gear) inside a ring (internal gear): same tooth system, the SAME
    hand, herringbone with herringbone; formula numbers, internal interferences, the swept
    outlines and radial or axial assembly; with a torque, the Lewis estimate of both."""
    from gen.geometry.internal_pair import mesh_internal
    from gen.validate.internal_checks import internal_numbers, internal_pair_findings
    from gen.validate.internal_sweep import sweep_internal
    from gen.validate.strength import strength_findings

    pin, ring = (a, b) if a.role is Role.EXTERNAL_GEAR else (b, a)
    found = [f for f in basic_pair_findings(label, pin.name, pin.mate, ring.name, ring.mate)
             if f.code != "same-hand"]
    if pin.mate.hand and ring.mate.hand and pin.mate.hand != ring.mate.hand:
        found.append(Finding(ERROR, "internal-hand", f"'{pin.name}' is {pin.mate.hand}-hand and "
                             f"'{ring.name}' {ring.mate.hand}-hand: a pinion inside a ring needs "
                             "the same hand", label, "internal helical mesh", key="hand"))
    if found:
        return found, {}, None
    try:
        pr = mesh_internal(pin.mate.sizes, ring.mate.sizes, v["center_distance"],
                           face_width=min(pin.mate.face_width, ring.mate.face_width),
                           pinion_form_radius=pin.mate.flank.r_junction,
                           ring_involute_end=ring.mate.flank.r_involute[1])
        sw = sweep_internal(pin.outline, ring.outline, pr)
    except GeometryError as exc:
        return [Finding(ERROR, "no-mesh", str(exc), label, "", key="center_distance")], {}, None
    found = internal_pair_findings(pr, sw, subject=label, print_clearance=v["print_clearance"])
    if v["torque"] is not None:
        first = a if a.name == names[0] else b
        for m in (pin, ring):
            r, ratio = m.rating(), m.mate.sizes.z / first.mate.sizes.z
            found += [replace(f, message=f"{m.name}: {f.message}") for f in strength_findings(
                r["loaded"], v["material"] or m.values["material"], torque=v["torque"] * ratio,
                rpm=(v["speed"] or 0.0) / ratio,
                safety_factor=v["safety_factor"] or m.values["safety_factor"], subject=label)]
    return found, internal_numbers(pr, sw), None


#: the check for each pair of roles (order of the two parts does not matter)
PAIR_CHECKS = {
    frozenset({Role.EXTERNAL_GEAR}): check_cylindrical_pair,
    frozenset({Role.EXTERNAL_GEAR, Role.RACK}): check_cylindrical_pair,
    frozenset({Role.BEVEL_GEAR}): check_bevel_pair,
    frozenset({Role.EXTERNAL_GEAR, Role.INTERNAL_GEAR}): check_internal_pair,
}


def _param_finding(exc: ParamError) -> Finding:
    return Finding(ERROR, "parameter", exc.one_line(), exc.part or "", "", scope="mesh")


def check_meshes(result) -> None:
    """Fill ``result.pairs`` and ``result.findings`` for every ``meshes:`` entry."""
    for entry in result.project.entries.get("meshes", []):
        try:
            v = mesh_values(entry)
        except ParamError as exc:
            result.findings.append(_param_finding(exc))
            continue
        names = v["parts"]
        where = Where(entry.file, entry.label, entry.line, section="mesh")
        ghost = next((n for n in names if n not in result.project.parts
                      and n not in result.models), None)
        if ghost is not None:
            result.findings.append(_param_finding(where.error("parts", f"names unknown part "
                                                              f"'{ghost}'")))
            continue
        if names[0] == names[1]:
            result.findings.append(_param_finding(where.error(
                "parts", "a part cannot mesh with itself")))
            continue
        a, b = (result.models.get(n) for n in names)
        if a is None or b is None:
            continue  # the part itself already failed and says why
        label = f"{names[0]}+{names[1]}"
        check = PAIR_CHECKS.get(frozenset({a.role, b.role}))
        if check is None:
            result.findings.append(_param_finding(where.error(
                "parts", f"a {a.role.value.replace('_', ' ')} and a "
                f"{b.role.value.replace('_', ' ')} do not mesh; pairs checked: external gears "
                "with each other, with a rack or inside a ring gear, bevel gears with each other")))
            continue
        found, numbers, picture = check(label, names, a, b, v)
        rel = display_path(entry.file)
        found = [f if f.code == "parameter" else
                 replace(f, where=f.where or f"{rel}:{entry.line('parts')}", key=f.key or "parts",
                         scope="mesh")
                 for f in found]
        result.findings += found
        result.pairs.append({"name": label, "parts": names, "findings": found,
                             "numbers": numbers, "picture": picture})
