"""Check every declared belt drive (``drives:``): the open-belt solution and its findings.

An entry names two ``timing_pulley`` parts, or gives a profile and two tooth counts inline::

    drives:
      pan_belt: {pulleys: [pan_motor_pulley, pan_input_pulley], center_distance: 42}
      spare:    {profile: curv3, teeth: [16, 48], belt_teeth: 120, stock: [110, 120, 130]}
"""

from __future__ import annotations

from dataclasses import replace

from gen.errors import GeometryError, ParamError
from gen.geometry.belt import solve_drive
from gen.findings import ERROR, Finding
from gen.params.project import display_path

DRIVE_KEYS = ("pulleys", "profile", "teeth", "center_distance", "belt_teeth", "stock", "adjust")


def _err(entry, key, msg, value=None):
    exc = ParamError(msg, file=entry.file, line=entry.line(key), part=None, key=key, value=value,
                     allowed=", ".join(DRIVE_KEYS) if msg.startswith("unknown") else None)
    return Finding(ERROR, "parameter", f"drive '{entry.label}': " + exc.one_line(), entry.label, "")


def _drive_inputs(entry, result):
    v = entry.values
    bad = [_err(entry, k, f"unknown key '{k}'") for k in v if k not in DRIVE_KEYS]
    if bad:
        return None, bad
    if "pulleys" in v:
        names = v["pulleys"]
        if not (isinstance(names, list) and len(names) == 2 and all(isinstance(n, str) for n in names)):
            return None, [_err(entry, "pulleys", "must list two timing_pulley part names", names)]
        models = []
        for n in names:
            m = result.models.get(n)
            if n not in result.project.parts:
                return None, [_err(entry, "pulleys", f"names unknown part '{n}'")]
            if m is None:
                return None, []  # the part failed on its own
            if not m.pulley:
                return None, [_err(entry, "pulleys", f"part '{n}' is not a timing_pulley")]
            models.append(m)
        p1, p2 = (m.pulley for m in models)
        if p1["profile"] != p2["profile"]:
            return None, [_err(entry, "pulleys", f"pulleys have different profiles "
                               f"({p1['profile']} and {p2['profile']})")]
        return (p1["profile"], p1["teeth"], p2["teeth"]), []
    prof, teeth = v.get("profile"), v.get("teeth")
    if not isinstance(prof, str):
        return None, [_err(entry, "profile", "give pulleys: [a, b] or profile and teeth: [z1, z2]", prof)]
    if not (isinstance(teeth, list) and len(teeth) == 2 and
            all(isinstance(t, int) and not isinstance(t, bool) for t in teeth)):
        return None, [_err(entry, "teeth", "must be two whole tooth counts", teeth)]
    return (prof, teeth[0], teeth[1]), []


def check_drives(result) -> None:
    for entry in result.project.entries.get("drives", []):
        inputs, errs = _drive_inputs(entry, result)
        if errs or inputs is None:
            result.findings += errs
            continue
        v = entry.values
        center, belt = v.get("center_distance"), v.get("belt_teeth")
        if (center is None) == (belt is None):
            result.findings.append(_err(entry, "center_distance",
                                        "give either center_distance (mm) or belt_teeth"))
            continue
        stock = v.get("stock")
        try:
            sol = solve_drive(inputs[0], inputs[1], inputs[2], center=center, belt_teeth=belt,
                              stock=stock, adjust_pct=v.get("adjust", 1.0))
        except (GeometryError, TypeError, ValueError) as exc:
            key = "center_distance" if center is not None else "belt_teeth"
            result.findings.append(_err(entry, key, str(exc)))
            continue
        rel = display_path(entry.file)
        found = [replace(f, subject=entry.label, where=f"{rel}:{entry.line(None)}", scope="drive")
                 for f in sol.findings]
        result.findings += found
        result.drives.append({"name": entry.label, "solution": sol, "findings": found})


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
