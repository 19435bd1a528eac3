"""Check every declared belt drive (``drives:``): the open-belt solution and its findings.

An entry names two ``timing_pulley`` parts, or gives a profile and two tooth counts inline::

    drives:
      pan_belt: {pulleys: [pan_motor_pulley, pan_input_pulley], center_distance: 42}
      spare:    {profile: curv3, teeth: [16, 48], belt_teeth: 120, stock: [110, 120, 130]}
"""

from __future__ import annotations

from dataclasses import replace

from gen.errors import GeometryError, ParamError
from gen.findings import ERROR, Finding
from gen.geometry.belt import solve_drive
from gen.geometry.pulley import PROFILES
from gen.kinds.base import Role
from gen.params.project import display_path
from gen.params.schema import Key, Where, check_mapping

DRIVE_KEYS = (
    Key("pulleys", "list", None, item="str", count=2, doc="two timing_pulley part names"),
    Key("profile", "enum", None, choices=tuple(sorted({p.name for p in PROFILES.values()})),
        doc="belt profile, when no pulley parts are named"),
    Key("teeth", "list", None, item="int", count=2, lo=1, hi=10000,
        doc="pulley tooth counts, when no pulley parts are named"),
    Key("center_distance", "float", None, lo=0, hi=100000, lo_open=True, unit="mm"),
    Key("belt_teeth", "int", None, lo=1, hi=100000, doc="belt length in teeth"),
    Key("stock", "list", None, item="int", lo=1, hi=100000,
        doc="belt tooth counts you can buy; the nearest is chosen"),
    Key("adjust", "float", 1.0, lo=0, hi=50, unit="%",
        doc="tensioner travel: ± this share of the belt length"),
)


def _err(where: Where, key, msg, value=None) -> Finding:
    return Finding(ERROR, "parameter", where.error(key, msg, value).one_line(), where.part, "",
                   scope="drive")


def _drive_inputs(entry, v, where, result):
    """(profile, z1, z2) of a drive, or None and the findings that say why not."""
    if v["pulleys"] is not None:
        if v["profile"] is not None or v["teeth"] is not None:
            return None, [_err(where, "pulleys", "give pulleys, or profile and teeth, not both")]
        models = []
        for n in v["pulleys"]:
            if n not in result.project.parts:
                return None, [_err(where, "pulleys", f"names unknown part '{n}'")]
            m = result.models.get(n)
            if m is None:
                return None, []  # the part failed on its own
            if m.role is not Role.PULLEY:
                return None, [_err(where, "pulleys", f"part '{n}' is not a timing_pulley")]
            models.append(m)
        p1, p2 = (m.mate for m in models)
        if p1.profile != p2.profile:
            return None, [_err(where, "pulleys", f"pulleys have different profiles "
                               f"({p1.profile} and {p2.profile})")]
        return (p1.profile, p1.teeth, p2.teeth), []
    if v["profile"] is None:
        return None, [_err(where, "profile", "give pulleys: [a, b], or profile and "
                           "teeth: [z1, z2]")]
    if v["teeth"] is None:
        return None, [_err(where, "teeth", "give the two pulleys' tooth counts, e.g. [20, 40]")]
    return (v["profile"], v["teeth"][0], v["teeth"][1]), []


def check_drives(result) -> None:
    for entry in result.project.entries.get("drives", []):
        where = Where(entry.file, entry.label, entry.line, section="drive")
        try:
            v = check_mapping(entry.values, DRIVE_KEYS, where)
        except ParamError as exc:
            result.findings.append(Finding(ERROR, "parameter", exc.one_line(), entry.label, "",
                                           scope="drive"))
            continue
        inputs, errs = _drive_inputs(entry, v, where, result)
        if errs or inputs is None:
            result.findings += errs
            continue
        center, belt = v["center_distance"], v["belt_teeth"]
        if (center is None) == (belt is None):
            key = "belt_teeth" if center is not None else "center_distance"
            result.findings.append(_err(where, key, "give either center_distance (mm) or "
                                        "belt_teeth, not both"
                                        if center is not None else
                                        "give either center_distance (mm) or belt_teeth"))
            continue
        try:
            sol = solve_drive(inputs[0], inputs[1], inputs[2], center=center, belt_teeth=belt,
                              stock=v["stock"], adjust_pct=v["adjust"])
        except GeometryError as exc:
            key = "center_distance" if center is not None else "belt_teeth"
            result.findings.append(_err(where, key, str(exc)))
            continue
        rel = display_path(entry.file)
        found = [replace(f, subject=entry.label, where=f"{rel}:{entry.line(f.key or None)}",
                         scope="drive")
                 for f in sol.findings]
        result.findings += found
        result.drives.append({"name": entry.label, "solution": sol, "findings": found,
                              "pulleys": v["pulleys"]})


def drive_table(drives) -> list[str]:
    if not drives:
        return []
    w = max(12, max(len(d["name"]) for d in drives))
    lines = [f"  {'drive':<{w}}  {'profile':<7}  {'teeth':>7}  {'belt':>11}  {'C mm':>8}  "
             f"{'wrap °':>6}  {'in mesh':>7}"]
    for d in drives:
        s = d["solution"]
        lines.append(f"  {d['name']:<{w}}  {s.profile:<7}  {s.teeth[0]:>3}/{s.teeth[1]:<3}  "
                     f"{s.belt_teeth:>4} teeth  {s.center_distance:>8.3f}  {s.wrap_angle:>6.1f}  "
                     f"{s.teeth_in_mesh:>7.2f}")
    return lines
