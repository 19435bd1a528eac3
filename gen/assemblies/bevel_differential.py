"""Assemblies (``assemblies:``): a bevel-gear differential expands into its printable gears,
its kinematics and an interference check of the gears placed in mesh.

    assemblies:
      camera_wrist:
        kind: bevel_differential
        module: 1.5
        input_teeth: 24
        output_teeth: 16
        outputs: 1
        face_width: 7
        input_bore: 5
        output_bore: 4

Gears become parts named ``<assembly>_input_1``, ``_input_2``, ``_output_1`` (``_output_2``),
each in its own printable frame (back face on z = 0). Sign conventions: see
:mod:`gen.geometry.differential`.
"""

from __future__ import annotations

import math
from dataclasses import replace

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.bevel import virtual_flank
from gen.geometry.differential import (bevel_differential, carrier_and_roll, gear_poses,
                                       input_commands)
from gen.assemblies import Assembly
from gen.params.schema import REQUIRED, Key, check_mapping
from gen.kinds import common_keys as K
from gen.kinds.bevel_gear import bevel_model
from gen.validate.bevel_interference import differential_findings
from gen.findings import ERROR, INFO, Finding
from gen.params.project import display_path

KIND = "bevel_differential"
KEYS = (
    Key("kind", "enum", REQUIRED, choices=(KIND,)),
    K.MODULE,
    Key("input_teeth", "int", REQUIRED, lo=6, hi=400),
    Key("output_teeth", "int", REQUIRED, lo=6, hi=400),
    Key("outputs", "int", 1, lo=1, hi=2, doc="output gears on the carrier"),
    Key("face_width", "float", REQUIRED, lo=0, hi=1000, lo_open=True, unit="mm"),
    K.PRESSURE_ANGLE, K.PROFILE,
    Key("profile_shift", "float", 0.0, lo=-0.6, hi=0.6, doc="inputs x, outputs −x"),
    K.BACKLASH_ALLOWANCE, K.MATERIAL,
    Key("input_bore", "float", 0.0, lo=0, hi=1000, unit="mm"),
    Key("output_bore", "float", 0.0, lo=0, hi=1000, unit="mm"),
    Key("carrier_clearance", "float", 0.5, lo=0, hi=50, unit="mm",
        doc="gap between each output gear's back face and the carrier"),
    Key("input_mounting_error", "float", 0.0, lo=-50, hi=50, unit="mm",
        doc="as-built back-face position minus the designed one (checks a frame drawing)"),
    Key("output_mounting_error", "float", 0.0, lo=-50, hi=50, unit="mm"),
    Key("command", "map", None, sub=(
        Key("pitch", "float", 0.0, lo=-3600, hi=3600, unit="deg", doc="carrier angle"),
        Key("roll", "float", 0.0, lo=-3600, hi=3600, unit="deg", doc="output roll"),
    ), doc="a wanted carrier pitch and output roll: check prints the input angles"),
    K.CHORD,
)


def _gear_values(values, which: str) -> dict:
    """The values of one gear of the differential: everything that fixes its geometry (the
    build's parameter hash groups parts by these, so equal values must mean equal gears)."""
    own, mate = ("input", "output") if which == "input" else ("output", "input")
    shift = values["profile_shift"] if which == "input" else -values["profile_shift"]
    return {"bore": values[f"{which}_bore"], "chord_tolerance": values["chord_tolerance"],
            "module": values["module"], "face_width": values["face_width"],
            "material": values["material"], "member": which,
            "teeth": values[f"{own}_teeth"], "mating_teeth": values[f"{mate}_teeth"],
            "pressure_angle": values["pressure_angle"], "profile": values["profile"],
            "profile_shift": shift, "backlash_allowance": values["backlash_allowance"],
            "outputs": values["outputs"]}


def build(entry, where) -> tuple[Assembly, dict]:
    """(Assembly, {part name: Part}) from a raw ``assemblies`` entry; raises ParamError."""
    kind = KIND
    v = check_mapping(entry.values, KEYS, where)
    rack = basic_rack(v["profile"]).with_alpha(v["pressure_angle"])
    try:
        diff = bevel_differential(v["input_teeth"], v["output_teeth"], v["module"],
                                  v["face_width"], rack, outputs=v["outputs"],
                                  x=v["profile_shift"], thinning=v["backlash_allowance"])
    except GeometryError as exc:
        key = "face_width" if "face" in str(exc) else "input_teeth"
        raise where.error(key, str(exc), v[key]) from None
    asm = Assembly(entry.label, kind, v, {}, file=entry.file, detail=diff)
    models = {}
    flank_in, flank_out = virtual_flank(diff.input), virtual_flank(diff.output)
    for gear in diff.names:
        part = f"{entry.label}_{gear}"
        which = "input" if gear.startswith("input") else "output"
        sizes = diff.input if which == "input" else diff.output
        model = bevel_model(part, "bevel_gear", _gear_values(v, which), sizes,
                            flank_in if which == "input" else flank_out)
        models[part] = model.with_(assembly=entry.label)
        asm.parts[gear] = part
    # kinematics, with a worked example
    zi, zo = v["input_teeth"], v["output_teeth"]
    asm.kinematics = {
        "carrier": "(θ1 + θ2) / 2",
        "output_roll": f"(θ1 − θ2) / 2 · {zi}/{zo}",
        "inverse": f"θ1 = pitch + roll·{zo}/{zi}, θ2 = pitch − roll·{zo}/{zi}",
        "ratio_roll": zi / zo,
    }
    cmd = v.get("command")
    if cmd:
        t1, t2 = input_commands(math.radians(cmd["pitch"]), math.radians(cmd["roll"]), zi, zo)
        asm.kinematics["command"] = {"pitch": cmd["pitch"], "roll": cmd["roll"],
                                     "theta1": math.degrees(t1), "theta2": math.degrees(t2)}
        c, r = carrier_and_roll(t1, t2, zi, zo)
        assert abs(math.degrees(c) - cmd["pitch"]) < 1e-9 and abs(math.degrees(r) - cmd["roll"]) < 1e-9
    # interference of the placed gears, at rest and over one tooth pitch
    shift = {}
    for gear in diff.names:
        err = v["input_mounting_error"] if gear.startswith("input") else v["output_mounting_error"]
        if err:
            shift[gear] = -err  # a back face further from the apex moves the gear away from it
    try:
        reports, found = differential_findings(diff, steps=6, axial_shift=shift or None,
                                               subject=entry.label)
    except GeometryError as exc:
        found = [Finding(ERROR, "bevel-placement", str(exc), entry.label, "")]
        reports = []
    rel = display_path(entry.file)
    asm.findings = [replace(f, where=f"{rel}:{entry.line(None)}", scope="assembly",
                            key=f.key or ("output_mounting_error" if shift else ""))
                    for f in found]
    asm.reports = reports
    si, so = diff.input, diff.output
    asm.sizes = {
        "input_mounting_distance": si.mounting_distance,
        "output_mounting_distance": so.mounting_distance,
        "input_back_face_spacing": 2 * si.mounting_distance,
        "carrier_arm_spacing": 2 * so.mounting_distance + 2 * v["carrier_clearance"],
        "input_pitch_cone_angle": math.degrees(si.delta),
        "output_pitch_cone_angle": math.degrees(so.delta),
        "outer_cone_distance": si.Re,
    }
    asm.findings.append(Finding(INFO, "kinematics", f"carrier = {asm.kinematics['carrier']}, "
                                f"output roll = {asm.kinematics['output_roll']}; inverse "
                                f"{asm.kinematics['inverse']}", entry.label,
                                "differential kinematics", where=f"{rel}:{entry.line(None)}",
                                scope="assembly"))
    poses = gear_poses(diff)
    asm.poses = {asm.parts[g]: poses[g] for g in diff.names}
    return asm, models
