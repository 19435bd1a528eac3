"""Check every declared mesh: formula numbers, a swept rolling of the real outlines, findings,
and the picture for the report. Numpy and shapely only (no CAD kernel)."""

from __future__ import annotations

from dataclasses import replace

from gen.errors import GeometryError, ParamError
from gen.geometry.pair import mesh_pair, mesh_rack
from gen.findings import ERROR, Finding
from gen.validate.pair_basic import basic_pair_findings
from gen.validate.pair_checks import pair_findings
from gen.validate.sweep import sweep_pair, sweep_rack
from gen.params.project import display_path

MESH_KEYS = ("parts", "center_distance", "print_clearance", "torque", "speed", "material",
             "safety_factor")


def _err(entry, key, msg, value=None):
    exc = ParamError(msg, file=entry.file, line=entry.line(key), key=key, value=value,
                     allowed=", ".join(MESH_KEYS) if msg.startswith("unknown") else None)
    return Finding(ERROR, "parameter", exc.one_line(), entry.label, "")


def _number(entry, key, lo=0.0):
    v = entry.values.get(key)
    if v is None:
        return None, None
    if isinstance(v, bool) or not isinstance(v, (int, float)) or not (float(v) > lo) \
            or v != v or v in (float("inf"),):
        return None, _err(entry, key, f"must be a number > {lo:g}", v)
    return float(v), None


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
    if pr.rack_back_distance is not None:
        out["rack_mounting_height"] = pr.rack_back_distance
    if sw is not None:
        out.update(min_clearance=min(sw.min_clearance_drive, sw.min_clearance_coast),
                   min_clearance_drive=sw.min_clearance_drive,
                   min_clearance_coast=sw.min_clearance_coast,
                   overlap_area=sw.overlap_area, swept_backlash=sw.swept_backlash,
                   clear_center_distance=sw.clear_center_distance)
    return out


def check_pair(label, names, a, b, entry):
    """(findings, numbers, picture-inputs) for one declared mesh of two part models."""
    found = basic_pair_findings(label, names[0], a.tooth, names[1], b.tooth)
    if found:
        return found, {}, None
    center, e1 = _number(entry, "center_distance")
    clearance, e2 = _number(entry, "print_clearance", lo=-1e-12)
    errs = [e for e in (e1, e2) if e]
    if errs:
        return errs, {}, None
    ta, tb = a.tooth, b.tooth
    if ta["role"] == "rack":
        a, b, ta, tb = b, a, tb, ta
    bw = min(ta["face_width"], tb["face_width"])
    try:
        if tb["role"] == "rack":
            pr = mesh_rack(ta["sizes"], tb["rack_sizes"], center, face_width=bw,
                           form_radius=ta["flank"].r_junction)
            sw = sweep_rack(a.outline, b.outline, pr, tb["rack_sizes"])
        else:
            pr = mesh_pair(ta["sizes"], tb["sizes"], center, face_width=bw,
                           form_radii=(ta["flank"].r_junction, tb["flank"].r_junction))
            sw = sweep_pair(a.outline, b.outline, pr)
    except GeometryError as exc:
        return [Finding(ERROR, "no-mesh", str(exc), label, "", key="center_distance")], {}, None
    found = pair_findings(pr, sw, subject=label, print_clearance=clearance)
    torque, e3 = _number(entry, "torque")
    speed, e4 = _number(entry, "speed", lo=-1e-12)
    found += [e for e in (e3, e4) if e]
    if torque is not None:
        found += strength_of_pair(label, names, a, b, torque, speed or 0.0)
    return found, pair_numbers(pr, sw), (a.outline, b.outline, pr, sw,
                                        tb.get("rack_sizes") if tb["role"] == "rack" else None)


def check_bevel_pair(label, names, a, b):
    """A declared pair of bevel gears: same tooth system, each other's tooth counts, one
    shaft angle, shifts x and −x; contact ratio of the Tredgold virtual spur pair."""
    import math

    from gen.geometry.cylindrical import gear_sizes

    sa, sb = a.bevel["sizes"], b.bevel["sizes"]
    src = "straight bevel pair (ISO 23509 conventions)"
    errs = []

    def bad(msg, key="parts"):
        errs.append(Finding(ERROR, "bevel-mismatch", msg, label, src, key=key))

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
    found = [Finding("info", "bevel-pair", f"pitch cones {math.degrees(sa.delta):.3f}° + "
                     f"{math.degrees(sb.delta):.3f}° = {math.degrees(sa.delta + sb.delta):.3f}°; "
                     f"mount the back faces {sa.mounting_distance:.3f} and "
                     f"{sb.mounting_distance:.3f} mm from the common apex; virtual (Tredgold) "
                     f"contact ratio {pr.contact_ratio:.3f}", label, src)]
    if pr.contact_ratio < 1.1:
        found.append(Finding(ERROR, "contact-ratio-low", f"virtual contact ratio "
                             f"{pr.contact_ratio:.3f} < 1.1", label, "common practice"))
    return found, numbers, None


def strength_of_pair(label, names, a, b, torque: float, rpm: float) -> list:
    """Lewis check of both members under the declared torque (N·m) and speed (rpm) of the
    part named first in the mesh; the mate carries it scaled by the tooth ratio."""
    from gen.geometry.basic_rack import basic_rack
    from gen.validate.strength import loaded_rack, strength_findings

    first = a if a.name == names[0] else b
    z1 = first.tooth["sizes"].z if first.tooth["role"] == "gear" else None
    out = []
    for m in (a, b):
        t = m.tooth
        if t["role"] == "rack":
            pin = a if m is b else b
            rp = pin.tooth["sizes"].rp
            force = torque / (rp / 1000.0)  # the pinion carries the torque
            v = rp / 1000.0 * rpm * 2.0 * 3.141592653589793 / 60.0
            rack = basic_rack(m.values["profile"]).with_alpha(m.values["pressure_angle"])
            gear = loaded_rack(t["rack_sizes"].mn, rack, t["face_width"], m.name,
                               thinning=m.values["backlash_allowance"])
            out += [replace(f, message=f"{m.name}: {f.message}") for f in
                    strength_findings(gear, m.values["material"], force=force, speed=v,
                                      safety_factor=m.values["safety_factor"], subject=label)]
            continue
        r = m.rating()
        z = t["sizes"].z
        ratio = 1.0 if m is first or z1 is None else z / z1
        out += [replace(f, message=f"{m.name}: {f.message}") for f in
                strength_findings(r["loaded"], m.values["material"], torque=torque * ratio,
                                  rpm=rpm / ratio, safety_factor=m.values["safety_factor"],
                                  subject=label)]
    return out


def check_meshes(result) -> None:
    """Fill ``result.pairs`` and ``result.findings`` for every ``meshes:`` entry."""
    for entry in result.project.entries.get("meshes", []):
        label = entry.label
        bad = [_err(entry, k, f"unknown key '{k}'") for k in entry.values if k not in MESH_KEYS]
        names = entry.values.get("parts")
        if (not isinstance(names, list) or len(names) != 2
                or not all(isinstance(n, str) for n in names)):
            bad.append(_err(entry, "parts", "must list exactly two part names", names))
        elif any(n not in result.project.parts for n in names):
            ghost = next(n for n in names if n not in result.project.parts)
            bad.append(_err(entry, "parts", f"names unknown part '{ghost}'"))
        elif names[0] == names[1]:
            bad.append(_err(entry, "parts", "a part cannot mesh with itself"))
        if bad:
            result.findings += bad
            continue
        a, b = (result.models.get(n) for n in names)
        if a is None or b is None:
            continue  # the part itself already failed and says why
        label = f"{names[0]}+{names[1]}"
        if a.bevel and b.bevel:
            found, numbers, picture = check_bevel_pair(label, names, a, b)
        elif not a.tooth or not b.tooth:
            result.findings.append(_err(entry, "parts", "both parts must be cylindrical gears "
                                        "or racks, or both bevel gears"))
            continue
        else:
            found, numbers, picture = check_pair(label, names, a, b, entry)
        rel = display_path(entry.file)
        found = [f if f.code == "parameter" else
                 replace(f, where=f.where or f"{rel}:{entry.line('parts')}", key=f.key or "parts",
                         scope="mesh")
                 for f in found]
        result.findings += found
        result.pairs.append({"name": label, "parts": names, "findings": found,
                             "numbers": numbers, "picture": picture})
