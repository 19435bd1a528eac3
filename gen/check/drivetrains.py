"""Check every ``drivetrains:`` entry: a motor, a chain of declared stages, a load.

Each stage names something the file already declares, so its ratio and strength come from
the checked parts, not from numbers typed twice::

    drivetrains:
      tray_drive:
        motor: {stall_torque: 0.6, no_load_speed: 120}    # N·m, rpm (straight line)
        stages:
          - {mesh: [tray_pinion, tray_wheel]}    # a gear pair, driver first
          - {drive: pan_belt}                    # a belt drive, first pulley drives
          - {assembly: turntable_stage}          # a planetary stage (its own ratio)
          - {ratio: 3, kind: spur}               # a stage not modelled in the file
        load: {torque: 2.0, speed: 10}           # N·m, rpm at the output

or, for a bevel differential driven by two motors, ``differential: camera_wrist`` with
``motors: [{...}, {...}]`` (and optional ``input_ratio``): the pitch/roll torque envelope.

Numbers come from :mod:`gen.geometry.drivetrain` (chain) and
:mod:`gen.geometry.differential_torque` (envelope). Strength margins: a gear stage's allowable
output torque is the smaller of the driven gear's Lewis rated torque and the driver's scaled by
the ratio (the same rating the mesh check uses); other stages carry an ``allowable`` only when
the entry states one.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from gen.errors import GeometryError, ParamError
from gen.findings import ERROR, INFO, WARNING, Finding
from gen.params.project import display_path
from gen.params.schema import Key, Where, check_mapping
from gen.kinds.base import Role

MOTOR_KEYS = (
    Key("stall_torque", "float", None, lo=0, hi=1e5, lo_open=True, unit="N·m"),
    Key("no_load_speed", "float", None, lo=0, hi=1e6, lo_open=True, unit="rpm"),
    Key("rated_torque", "float", None, lo=0, hi=1e5, lo_open=True, unit="N·m"),
    Key("rated_speed", "float", None, lo=0, hi=1e6, lo_open=True, unit="rpm"),
    Key("curve_speeds", "list", None, lo=0, hi=1e6, unit="rpm", ascending=True,
        doc="speeds of a torque–speed curve"),
    Key("curve_torques", "list", None, lo=0, hi=1e5, unit="N·m",
        doc="torques at curve_speeds"),
)
STAGE_KEYS = (
    Key("mesh", "list", None, item="str", count=2, doc="a declared gear pair, driver first"),
    Key("drive", "str", None, doc="a declared belt drive; its first pulley drives"),
    Key("assembly", "str", None, doc="a declared planetary stage"),
    Key("screw", "str", None, doc="a lead_screw part: turns rotation into travel (last stage)"),
    Key("drum", "str", None, doc="a cable_drum part: winds a cable (last stage)"),
    Key("ratio", "float", None, lo=0, hi=1e6, lo_open=True,
        doc="a stage not modelled in the file: input speed / output speed"),
    Key("kind", "enum", "spur", choices=("spur", "belt", "bevel", "planetary"),
        doc="kind of a free stage (its default efficiency)"),
    Key("efficiency", "float", None, lo=0, hi=1, lo_open=True,
        doc="overrides the common-practice default of the stage kind"),
    Key("allowable", "float", None, lo=0, hi=1e6, lo_open=True, unit="N·m",
        doc="largest output torque of the stage, when not rated from parts"),
    Key("inertia", "float", 0.0, lo=0, hi=1e6, unit="kg·m²", doc="on the stage output shaft"),
    Key("allowable_tension", "float", None, lo=0, hi=1e5, lo_open=True, unit="N/mm",
        doc="belt drive: allowable effective tension per mm of belt width, from the belt "
            "maker's data (no default: it varies with the belt's make and cords)"),
)
LOAD_KEYS = (
    Key("torque", "float", None, lo=0, hi=1e6, unit="N·m", doc="at the output shaft"),
    Key("force", "float", None, lo=0, hi=1e7, unit="N",
        doc="on a screw's nut or a drum's cable; on a shaft, with radius: F·r"),
    Key("radius", "float", None, lo=0, hi=1e5, lo_open=True, unit="mm"),
    Key("speed", "float", None, lo=0, hi=1e6, lo_open=True, unit="rpm or mm/s",
        doc="wanted output speed (mm/s after a screw or drum)"),
    Key("inertia", "float", 0.0, lo=0, hi=1e6, unit="kg·m²"),
)
DRIVETRAIN_KEYS = (
    Key("motor", "map", None, sub=MOTOR_KEYS, doc="motor of a chain"),
    Key("stages", "list", None, item="map", sub=STAGE_KEYS, doc="stages in order from the motor"),
    Key("load", "map", None, sub=LOAD_KEYS),
    Key("differential", "str", None, doc="a bevel_differential assembly driven by two motors"),
    Key("motors", "list", None, item="map", count=2, sub=MOTOR_KEYS,
        doc="the differential's two motors"),
    Key("input_ratio", "float", 1.0, lo=0, hi=1e4, lo_open=True,
        doc="reduction from each motor to its differential input"),
    Key("same_shaft", "list", None, item="list", doc="groups of parts fixed on one shaft, "
        "e.g. [[wheel_1, pinion_2]]: a compound stage"),
)
SOURCE = "stage chain: T_out = T_in·i·η, ω_out = ω_in/i (power balance, common practice)"


@dataclass
class DrivetrainResult:
    name: str
    numbers: dict
    findings: list


def _motor(v: dict, where: Where, key: str):
    from gen.geometry.drivetrain import CurveMotor, LineMotor, RatedMotor

    if v["stall_torque"] is not None and v["no_load_speed"] is not None:
        return LineMotor(v["stall_torque"], v["no_load_speed"])
    if v["rated_torque"] is not None and v["rated_speed"] is not None:
        return RatedMotor(v["rated_torque"], v["rated_speed"])
    if v["curve_speeds"] is not None and v["curve_torques"] is not None:
        if len(v["curve_speeds"]) != len(v["curve_torques"]):
            raise where.error(key, "curve_speeds and curve_torques differ in length")
        return CurveMotor(tuple(v["curve_speeds"]), tuple(v["curve_torques"]))
    raise where.error(key, "give stall_torque and no_load_speed, rated_torque and rated_speed, "
                      "or curve_speeds and curve_torques")


def _shafts(v) -> dict:
    """part name -> shaft name (the first part of its same_shaft group, or itself)."""
    out = {}
    for group in v.get("same_shaft") or ():
        for n in group:
            out[n] = group[0]
    return out


def _gear_stage(result, names, where, key, v, shafts):
    from gen.geometry.drivetrain import Stage

    models = [result.models.get(n) for n in names]
    for n, m in zip(names, models):
        if n not in result.models and n not in result.project.parts:
            raise where.error(key, f"names unknown part '{n}'")
    if any(m is None for m in models):
        return None  # a part failed on its own and says why
    if not any(p["parts"] == list(names) or p["parts"] == list(names)[::-1]
               for p in result.pairs):
        raise where.error(key, f"{names[0]} and {names[1]} are not a declared mesh "
                          "(add them to meshes:)")
    a, b = models
    roles = {a.role, b.role}
    if roles == {Role.EXTERNAL_GEAR}:
        za, zb = a.mate.sizes.z, b.mate.sizes.z
        kind = "spur"
    elif roles == {Role.BEVEL_GEAR}:
        za, zb = a.mate.sizes.z, b.mate.sizes.z
        kind = "bevel"
    else:
        raise where.error(key, f"a {a.role.value} and a {b.role.value} make no rotary stage "
                          "here (gear pairs and bevel pairs)")
    ratio = zb / za
    allow = v["allowable"]
    if allow is None and a.rating is not None and b.rating is not None:
        allow = min(b.rating()["rated_torque"], a.rating()["rated_torque"] * ratio)
    return Stage(kind, ratio, v["efficiency"], name=f"{names[0]}→{names[1]}",
                 allowable=allow, inertia_out=v["inertia"],
                 input_shaft=shafts.get(names[0], names[0]),
                 output_shaft=shafts.get(names[1], names[1]))


def _stage(result, v, where: Where, key: str, shafts: dict):
    """One :class:`gen.geometry.drivetrain.Stage` from a checked stage mapping."""
    from gen.geometry.drivetrain import Stage

    given = [k for k in ("mesh", "drive", "assembly", "screw", "drum", "ratio")
             if v[k] is not None]
    if len(given) != 1:
        raise where.error(key, "a stage names exactly one of mesh, drive, assembly, screw, drum "
                          "or ratio")
    if v["screw"] is not None or v["drum"] is not None:
        return _linear_stage(result, v, where, key)
    if v["mesh"] is not None:
        return _gear_stage(result, v["mesh"], where, key, v, shafts)
    if v["drive"] is not None:
        d = next((d for d in result.drives if d["name"] == v["drive"]), None)
        if d is None:
            raise where.error(key, f"names no checked belt drive '{v['drive']}'")
        z1, z2 = d["solution"].teeth
        pulleys = d.get("pulleys") or ("", "")
        allow = v["allowable"]
        if allow is None and v["allowable_tension"] is not None:
            # effective tension T_e = T_out / r_driven; allowable T_out = T_e,allow · b · r
            if not pulleys[1] or pulleys[1] not in result.models:
                raise where.error(key + ".allowable_tension", "needs a drive of pulley parts "
                                  "(their belt width)")
            from gen.geometry.pulley import lookup_profile

            r = z2 * lookup_profile(d["solution"].profile).pitch / (2 * math.pi)
            width = result.models[pulleys[1]].values["belt_width"]
            allow = v["allowable_tension"] * width * r / 1000.0
        return Stage("belt", z2 / z1, v["efficiency"], name=v["drive"],
                     allowable=allow, inertia_out=v["inertia"],
                     input_shaft=shafts.get(pulleys[0], pulleys[0]),
                     output_shaft=shafts.get(pulleys[1], pulleys[1]))
    if v["assembly"] is not None:
        asm = next((a for a in result.assemblies if a.name == v["assembly"]), None)
        if asm is None:
            raise where.error(key, f"names no checked assembly '{v['assembly']}'")
        ratio = asm.kinematics.get("ratio") if asm.kind == "planetary" else None
        if not ratio:
            raise where.error(key, f"assembly '{asm.name}' ({asm.kind}) is not a single-input "
                              "stage; a differential is checked with differential: and motors:")
        return Stage("planetary", abs(ratio), v["efficiency"], name=asm.name,
                     allowable=v["allowable"], inertia_out=v["inertia"])
    return Stage(v["kind"], v["ratio"], v["efficiency"], name=f"{key} ({v['kind']})",
                 allowable=v["allowable"], inertia_out=v["inertia"])


def _linear_stage(result, v, where, key):
    """A lead screw (i = 2π/L; efficiency raising, and lowering when the load drives back,
    Shigley's power-screw relations; allowable the Euler buckling load over its safety factor)
    or a cable drum (i = 1/r at the cable centre)."""
    from gen.geometry.drivetrain import cable_drum, lead_screw
    from gen.geometry.screw_drive import screw_torques
    from gen.tolerances import LIMITS

    which = "screw" if v["screw"] is not None else "drum"
    name = v[which]
    if name not in result.models and name not in result.project.parts:
        raise where.error(key, f"names unknown part '{name}'")
    part = result.models.get(name)
    if part is None:
        return None
    want = "lead_screw" if which == "screw" else "cable_drum"
    if part.kind != want:
        raise where.error(key, f"part '{name}' is a {part.kind}, not a {want}")
    sz = part.sizes
    if which == "drum":
        return cable_drum(sz["pitch_diameter"], name=name, allowable=v["allowable"])
    t = screw_torques(1.0, sz["pitch_diameter"], sz["lead"],
                      math.radians(sz["flank_angle"] / 2.0), sz["friction"])
    work = sz["lead"] / 1000.0 / (2.0 * math.pi)        # N·m per N of load
    back = 0.0 if t.self_locking else max(0.0, -t.thread_lower) / work
    allow = v["allowable"]
    if allow is None and sz.get("buckling_load"):
        allow = sz["buckling_load"] / LIMITS.screw_buckling_safety
    eff = v["efficiency"] if v["efficiency"] is not None else t.thread_efficiency
    return lead_screw(sz["lead"], eff, name=name, back_efficiency=back, allowable=allow)


def _chain(result, v, where, label) -> DrivetrainResult | None:
    from gen.geometry.drivetrain import Load, solve_chain

    if v["motor"] is None or v["stages"] is None or v["load"] is None:
        missing = next(k for k in ("motor", "stages", "load") if v[k] is None)
        raise where.error(missing, "a drive train needs motor, stages and load")
    motor = _motor(v["motor"], where, "motor")
    stages, shafts = [], _shafts(v)
    for k, raw in enumerate(v["stages"]):
        st = _stage(result, raw, where, f"stages[{k}]", shafts)
        if st is None:
            return None
        stages.append(st)
    lv = v["load"]
    if lv["torque"] is not None and lv["force"] is not None:
        raise where.error("load", "give torque, or force with radius, not both")
    linear = stages[-1].linear
    if lv["force"] is not None and linear:
        load = Load(torque=lv["force"], speed=lv["speed"], inertia=lv["inertia"])
    elif lv["force"] is not None:
        if lv["radius"] is None:
            raise where.error("load.radius", "a force needs the radius it acts at (mm)")
        load = Load.force_at_radius(lv["force"], lv["radius"], speed=lv["speed"],
                                    inertia=lv["inertia"])
    elif linear and lv["torque"] is not None:
        raise where.error("load.torque", "after a screw or drum the load is a force (N)")
    else:
        load = Load(torque=lv["torque"] or 0.0, speed=lv["speed"], inertia=lv["inertia"])
    res = solve_chain(motor, stages, load)
    unit, speed = ("N", "mm/s") if linear else ("N·m", "rpm")
    found = []
    if not res.moves:
        found.append(Finding(ERROR, "chain-stalls", f"the motor cannot move the load: it can "
                             f"give {res.move_limit:.3g} {unit} at the output, the load needs "
                             f"{load.torque:.3g} {unit}", label, SOURCE, key="load"))
    if load.speed is not None and res.moves and res.output_speed < load.speed:
        found.append(Finding(WARNING, "chain-slow", f"output moves at {res.output_speed:.3g} "
                             f"{speed}, under the wanted {load.speed:g} {speed}", label, SOURCE,
                             key="load"))
    for st in res.stages:
        if st.margin is not None and st.margin < 1.0:
            found.append(Finding(ERROR, "stage-overload", f"stage {st.name}: output torque "
                                 f"{st.torque_out:.3g} N·m exceeds its allowable by "
                                 f"{1 / st.margin:.2f}×", label, SOURCE, key="stages"))
        elif st.margin_stall is not None and st.margin_stall < 1.0:
            found.append(Finding(WARNING, "stage-stall-overload", f"stage {st.name}: at motor "
                                 f"stall it carries {st.torque_out_stall:.3g} N·m, "
                                 f"{1 / st.margin_stall:.2f}× its allowable", label, SOURCE,
                                 key="stages"))
    numbers = {
        "total_ratio": res.total_ratio, "efficiency": res.efficiency, "moves": res.moves,
        "linear": linear, "units": {"torque": unit, "speed": speed},
        "motor_speed": res.motor_speed, "motor_torque": res.motor_torque,
        "output_speed": res.output_speed, "output_torque": res.output_torque,
        "move_limit": res.move_limit, "move_limit_at_speed": res.move_limit_at_speed,
        "hold_limit": None if math.isinf(res.hold_limit) else res.hold_limit,
        "reflected_inertia": res.reflected_inertia, "weakest": res.weakest,
        "weakest_margin": res.weakest_margin,
        "stages": [{"name": s.name, "kind": s.kind, "speed_in": s.speed_in,
                    "speed_out": s.speed_out, "torque_in": s.torque_in,
                    "torque_out": s.torque_out, "margin": s.margin,
                    "margin_at_stall": s.margin_stall} for s in res.stages],
    }
    found.append(Finding(INFO, "chain-summary", f"ratio {res.total_ratio:.4g}, efficiency "
                         f"{res.efficiency:.3f}; output {res.output_torque:.3g} {unit} at "
                         f"{res.output_speed:.4g} {speed}; "
                         + ("the load holds with the motor off (self-locking); "
                            if math.isinf(res.hold_limit) else "") + "reflected inertia "
                         f"{res.reflected_inertia:.3g} kg·m²"
                         + (f"; weakest stage {res.weakest} (margin at stall "
                            f"{res.weakest_margin:.2f})" if res.weakest else ""),
                         label, SOURCE))
    return DrivetrainResult(label, numbers, found)


def _differential(result, v, where, label) -> DrivetrainResult | None:
    from gen.geometry.differential_torque import torque_envelope

    asm = next((a for a in result.assemblies if a.name == v["differential"]), None)
    if asm is None:
        raise where.error("differential", f"names no checked assembly '{v['differential']}'")
    if asm.kind != "bevel_differential":
        raise where.error("differential", f"'{asm.name}' is a {asm.kind}, not a "
                          "bevel_differential")
    if v["motors"] is None:
        raise where.error("motors", "a differential needs its two motors")
    motors = [_motor(m, where, f"motors[{k}]") for k, m in enumerate(v["motors"])]
    zi, zo = asm.values["input_teeth"], asm.values["output_teeth"]
    env = torque_envelope(motors[0].max_torque, motors[1].max_torque, zi, zo,
                          input_ratio=v["input_ratio"])
    numbers = {"differential": asm.name, **env.as_dict()}
    found = [Finding(INFO, "chain-summary", f"two motors give up to {env.max_pitch:.3g} N·m of "
                     f"pitch (no roll) or {env.max_roll:.3g} N·m of roll (no pitch)", label,
                     "virtual work through the differential kinematics")]
    return DrivetrainResult(label, numbers, found)


def check_drivetrains(result) -> None:
    for entry in result.project.entries.get("drivetrains", []):
        where = Where(entry.file, entry.label, entry.line, section="drive train")
        try:
            v = check_mapping(entry.values, DRIVETRAIN_KEYS, where)
            out = (_differential if v["differential"] is not None else _chain)(
                result, v, where, entry.label)
        except ParamError as exc:
            result.findings.append(Finding(ERROR, "parameter", exc.one_line(), entry.label, "",
                                           scope="drive train"))
            continue
        except GeometryError as exc:
            result.findings.append(Finding(ERROR, "parameter", where.error(
                "stages", str(exc)).one_line(), entry.label, "", scope="drive train"))
            continue
        if out is None:
            continue
        rel = display_path(entry.file)
        out.findings = [f if f.where else
                        Finding(f.severity, f.code, f.message, f.subject, f.source, key=f.key,
                                where=f"{rel}:{entry.line(f.key or None)}", scope="drive train")
                        for f in out.findings]
        result.findings += out.findings
        result.drivetrains.append(out)
