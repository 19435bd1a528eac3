"""``pitchline new WHAT [NAME]``: write a commented starter parameter file.

WHAT is a part kind (every key with its unit, range and default), or one of the starters of a
whole set: ``train`` (two gears sharing their tooth system, and their mesh), ``belt_drive`` (two
timing pulleys and their drive) and ``bevel_differential`` (the assembly). Every starter file
passes ``pitchline check`` as written; keys marked "required" must stay.
"""

from __future__ import annotations

import os
import sys

#: starters that are not a single part kind
SETS = ("train", "belt_drive", "bevel_differential", "planetary", "drivetrain")
#: how a bevel gear's ``module`` is meant (the README says the same)
BEVEL_MODULE_DOC = "outer transverse module m_et at the heel (ISO 23509)"
#: values the differential starter writes
DIFFERENTIAL_EXAMPLE = {"module": 1.5, "input_teeth": 24, "output_teeth": 16, "face_width": 7,
                        "input_bore": 6, "output_bore": 4}


def register(sub):
    from gen.kinds.base import KINDS

    p = sub.add_parser("new", help="write a commented starter parameter file",
                       description="Write NAME.yaml: for a part kind every key with its unit, "
                                   "range and default; or a starter set. Kinds: "
                                   + ", ".join(sorted(KINDS)) + ". Sets: " + ", ".join(SETS))
    p.add_argument("kind", metavar="KIND")
    p.add_argument("name", nargs="?", default=None, metavar="NAME",
                   help="part (or set) name and file stem (default: my_<kind>)")
    p.add_argument("--dir", default=".", help="folder to write into (default: current)")
    p.set_defaults(func=run)


def _fmt(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return f"{value:g}"
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(_fmt(v) for v in value) + "]"
    return str(value)


def _map_subs(key) -> str:
    """Sub-keys of a mapping key, each with its default when it has one (``slit: 1``)."""
    out = []
    for k in key.sub:
        if k.required or k.default is None:
            out.append(k.name)
        else:
            out.append(f"{k.name}: {_fmt(k.default)}")
    return ", ".join(out)


def _map_units(key) -> str:
    """``; units: slit mm, bridge deg`` for the sub-keys that have a unit ('' when none)."""
    units = [f"{k.name} {k.unit}" for k in key.sub if k.unit]
    return f"; units: {', '.join(units)}" if units else ""


def _doc(key, bevel: bool) -> str:
    if bevel and key.name == "module":
        return BEVEL_MODULE_DOC
    return key.doc or ""


def key_lines(keys, example: dict, indent: str, *, skip=(), bevel: bool = False) -> list[str]:
    """One line per key: set (example or default) or commented out, with unit and range."""
    lines = []
    for key in keys:
        if key.name in skip:
            continue
        if (key.kind == "angle" and key.lo is not None and key.lo == key.hi) or \
                (key.kind == "enum" and len(key.choices) == 1):
            continue  # keys that only exist so trains can pass shared values through
        req = "required" if key.required else ""
        if key.kind == "map" and key.name not in example:
            lines.append(f"{indent}# {key.name}: {{{_map_subs(key)}}}    # {key.doc}"
                         + _map_units(key))
            continue
        comment = "; ".join(x for x in (req, _doc(key, bevel), key.range_text()) if x)
        if key.name in example:
            lines.append(f"{indent}{key.name}: {_fmt(example[key.name])}    # {comment}")
        elif key.required:
            lines.append(f"{indent}{key.name}:     # {comment}")
        elif key.default is None:
            lines.append(f"{indent}# {key.name}:    # {comment}")
        else:
            lines.append(f"{indent}{key.name}: {_fmt(key.default)}    # {comment}")
    return lines


def _kind_module(kind: str):
    import importlib

    from gen.kinds.base import KINDS

    return importlib.import_module(f"gen.kinds.{KINDS[kind]}")


def _is_bevel(mod) -> bool:
    from gen.kinds.base import Role

    return getattr(mod, "ROLE", None) is Role.BEVEL_GEAR


HEAD = ["# Units: mm and degrees. Keys marked 'required' must be set; the others show their",
        "# default or are commented out."]


def starter_text(kind: str, name: str) -> str:
    """Starter file of one part of ``kind`` named ``name``.

    The tooth-system keys a train gives its parts come first, in their own block: pasted into
    a train the part is valid as it is when the values agree with the train's, and valid in
    any train once that block is deleted.
    """
    from gen.params.project import TRAIN_SHARED

    mod = _kind_module(kind)
    example = getattr(mod, "EXAMPLE", {})
    bevel = _is_bevel(mod)
    own = [k for k in mod.KEYS if k.name not in TRAIN_SHARED]
    shared = [k for k in mod.KEYS if k.name in TRAIN_SHARED]
    lines = [f"# pitchline starter file for a {kind}."] + HEAD + [
        "parts:", f"  {name}:", f"    kind: {kind}"]
    tooth = key_lines(shared, example, "    ", bevel=bevel)
    if tooth:
        lines.append("    # tooth system (a train sets it for all its parts: in a train, keep "
                     "these lines only with the train's values, or delete them)")
        lines += tooth
        lines.append("    # this part's own keys")
    lines += key_lines(own, example, "    ", bevel=bevel)
    return "\n".join(lines) + "\n"


def train_text(name: str) -> str:
    """Two spur gears in a train (one module and pressure angle for both) and their mesh."""
    from gen.check.meshes import MESH_KEYS
    from gen.kinds.common_keys import MODULE, PRESSURE_ANGLE, PROFILE

    a, b = f"{name}_pinion", f"{name}_wheel"
    lines = ["# pitchline starter file for a gear train: two gears sharing one tooth system,",
             "# and their mesh."] + HEAD + [
        "trains:", f"  {name}:"]
    lines += key_lines((MODULE, PRESSURE_ANGLE, PROFILE), {"module": 1.5}, "    ")
    lines += ["    parts:    # any gear kind; leave out the keys the train sets",
              f"      {a}: {{kind: spur_gear, teeth: 18, face_width: 8, bore: 5, "
              "backlash_allowance: 0.15}",
              f"      {b}: {{kind: spur_gear, teeth: 40, face_width: 8, bore: 8, "
              "backlash_allowance: 0.15}",
              "meshes:",
              f"  - parts: [{a}, {b}]    # required; {MESH_KEYS[0].doc}"]
    lines += key_lines(MESH_KEYS[1:], {}, "    ")
    return "\n".join(lines) + "\n"


def belt_drive_text(name: str) -> str:
    """Two timing pulleys and the open belt drive between them."""
    from gen.check.drives import DRIVE_KEYS

    mod = _kind_module("timing_pulley")
    a, b = f"{name}_motor_pulley", f"{name}_driven_pulley"
    ex = dict(getattr(mod, "EXAMPLE", {}))
    lines = ["# pitchline starter file for a belt drive: two timing pulleys and the belt "
             "between them."] + HEAD + ["parts:", f"  {a}:", "    kind: timing_pulley"]
    lines += key_lines(mod.KEYS, ex, "    ")
    ex2 = dict(ex, teeth=2 * ex.get("teeth", 20))
    body = ", ".join(f"{k}: {_fmt(v)}" for k, v in ex2.items())
    lines += [f"  {b}: {{kind: timing_pulley, {body}}}", "drives:", f"  {name}:"]
    lines += key_lines(DRIVE_KEYS, {"pulleys": [a, b], "center_distance": 60}, "    ",
                       skip=("profile", "teeth"))
    lines += ["    # without pulley parts: profile and teeth: [z1, z2] instead of pulleys"]
    return "\n".join(lines) + "\n"


def _assembly_text(kind: str, name: str, intro, example, **opts) -> str:
    """A starter file for an assembly of ``kind``: its keys with the example values."""
    import importlib

    from gen.assemblies import ASSEMBLY_KINDS

    mod = importlib.import_module(f"gen.assemblies.{ASSEMBLY_KINDS[kind]}")
    lines = list(intro) + HEAD + ["assemblies:", f"  {name}:", f"    kind: {kind}"]
    lines += key_lines(mod.KEYS, example(mod), "    ", skip=("kind",), **opts)
    return "\n".join(lines) + "\n"


def differential_text(name: str) -> str:
    """A bevel-gear differential assembly (its parts are made from these values)."""
    return _assembly_text(
        "bevel_differential", name,
        ["# pitchline starter file for a bevel-gear differential: two facing input gears,",
         "# one or two output gears on a carrier."],
        lambda mod: DIFFERENTIAL_EXAMPLE, bevel=True)


def planetary_text(name: str) -> str:
    """A planetary stage assembly (sun, planets, ring and carrier are made from these values)."""
    return _assembly_text(
        "planetary", name,
        ["# pitchline starter file for a planetary stage: a sun, planets on a carrier and",
         "# an internal ring; one member held, one driven, the third the output."],
        lambda mod: getattr(mod, "EXAMPLE", {}))


def drivetrain_text(name: str) -> str:
    """A motor driving a load through a gear pair (declared here) and a free belt stage."""
    from gen.check.drivetrains import LOAD_KEYS, MOTOR_KEYS, STAGE_KEYS

    a, b = f"{name}_pinion", f"{name}_wheel"
    lines = ["# pitchline starter file for a drive train: a motor, stages that name what the",
             "# file declares (meshes, drives, planetary assemblies) or a free ratio, a load.",
             "# Torques N·m, speeds rpm."] + HEAD + [
        "parts:",
        f"  {a}: {{kind: spur_gear, module: 1.5, teeth: 15, profile_shift: 0.3, face_width: 10, "
        "backlash_allowance: 0.15, bore: 5}",
        f"  {b}: {{kind: spur_gear, module: 1.5, teeth: 45, face_width: 10, "
        "backlash_allowance: 0.15, bore: 8}",
        "meshes:", f"  - parts: [{a}, {b}]",
        "drivetrains:", f"  {name}:",
        "    motor:    # stall_torque + no_load_speed, rated_torque + rated_speed, or a curve"]
    lines += key_lines(MOTOR_KEYS, {"stall_torque": 0.3, "no_load_speed": 300}, "      ")
    lines += ["    stages:", f"      - mesh: [{a}, {b}]    # driver first",
              "      - ratio: 2    # a stage not modelled in the file", "        kind: belt"]
    lines += [f"        # {k.name}: …    # {k.doc}" for k in STAGE_KEYS
              if k.name in ("drive", "assembly", "efficiency", "allowable")]
    lines += ["    load:"]
    lines += key_lines(LOAD_KEYS, {"torque": 1.2, "speed": 10}, "      ")
    return "\n".join(lines) + "\n"


SET_TEXT = {"train": train_text, "belt_drive": belt_drive_text,
            "bevel_differential": differential_text, "planetary": planetary_text,
            "drivetrain": drivetrain_text}
#: longest suffix a set adds to NAME for its parts
_SUFFIX = len("_driven_pulley")


def run(args) -> int:
    from gen.kinds.base import KINDS
    from gen.params.project import NAME_RE, name_problem
    from gen.params.schema import suggest

    args.kind = {"coupon": "fit_coupon"}.get(args.kind, args.kind)
    if args.kind not in KINDS and args.kind not in SETS:
        print(f"pitchline new: unknown kind '{args.kind}'"
              f"{suggest(args.kind, list(KINDS) + list(SETS))}; allowed: "
              f"{', '.join(sorted(KINDS))}; sets: {', '.join(SETS)}", file=sys.stderr)
        return 2
    name = args.name or f"my_{args.kind}"
    problem = name_problem(name)
    if problem is None and args.kind in ("train", "belt_drive", "drivetrain") and \
            not NAME_RE.match(name + "x" * _SUFFIX):
        problem = f"at most {64 - _SUFFIX} characters here (its parts add a suffix)"
    if problem:
        print(f"pitchline new: name {name!r} is not allowed: {problem}", file=sys.stderr)
        return 2
    folder = os.path.realpath(args.dir)
    path = os.path.join(args.dir, f"{name}.yaml")
    if os.path.dirname(os.path.realpath(path)) != folder:
        print(f"pitchline new: {path} lies outside {args.dir}; not written", file=sys.stderr)
        return 2
    if os.path.lexists(path):
        print(f"pitchline new: {path} exists; not overwritten", file=sys.stderr)
        return 2
    from gen.export.atomic import write_atomic

    text = SET_TEXT[args.kind](name) if args.kind in SETS else starter_text(args.kind, name)
    write_atomic(path, text.encode())
    print(f"wrote {path}")
    return 0
