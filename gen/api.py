"""pitchline from Python: make checked parts, check pairs and drives, build files.

Stable names (the command line is a thin layer over them)::

    from gen import api

    pinion = api.make("spur_gear", "pinion", module=2, teeth=12, profile_shift=0.4,
                      face_width=10, bore=5)
    wheel = api.make("spur_gear", "wheel", module=2, teeth=30, profile_shift=0.2,
                     face_width=10, bore=8)
    mesh = api.check_pair(pinion, wheel, torque=0.15, speed=30)
    mesh.numbers["working_center_distance"]        # 43.1 mm
    solid = api.to_cadquery(pinion)                 # cadquery.Solid, checked
    tri = api.to_trimesh(pinion)                    # trimesh.Trimesh, measured on slices
    files = api.write_files(pinion, "out", ["step", "stl"])

Units are those of parameter files: mm and degrees in, mm and degrees in ``sizes``. Bad values
raise :class:`gen.errors.ParamError` with the command line's message (the file is
``<python>``); a part whose checks find an error raises :class:`CheckFailed` where a checked
result is asked for (``to_cadquery``, ``to_trimesh``, ``write_files``), listing the errors.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from gen.errors import PitchlineError

PYTHON = "<python>"


class CheckFailed(PitchlineError):
    """A part, pair or build whose checks found errors; ``findings`` lists them all."""

    def __init__(self, what: str, findings):
        self.findings = list(findings)
        errors = [f for f in self.findings if f.severity == "error"]
        lines = "; ".join(f"{f.code}: {f.message}" for f in errors[:3])
        more = f" (+{len(errors) - 3} more)" if len(errors) > 3 else ""
        super().__init__(f"{what}: {len(errors)} error(s): {lines}{more}")


@dataclass(frozen=True)
class PairCheck:
    """What checking a pair gave: findings, the numbers of ``check --json``, and the ok flag."""

    name: str
    findings: tuple
    numbers: dict = field(default_factory=dict)

    @property
    def ok(self) -> bool:
        return not any(f.severity == "error" for f in self.findings)


def _fits(fits: dict | None):
    from gen.params.fits import collect_fits

    return collect_fits([]) if fits is None else fits


def make(kind: str, name: str | None = None, **values):
    """A checked :class:`gen.kinds.base.Part` of ``kind`` from keyword values (mm, degrees).

    ``values`` are the keys of ``pitchline new KIND``; ``name`` defaults to the kind word.
    Raises ParamError for unknown keys and values out of range. Findings (errors included)
    are on ``part.findings``; :func:`require_ok` raises when there is an error.
    """
    from gen.kinds.base import resolve
    from gen.params.project import RawPart

    raw = RawPart(name=name or kind, kind=kind, values=dict(values), file=PYTHON, train=None,
                  lines={None: None})
    return resolve(raw, _fits(None))


def make_from(mapping: dict, name: str | None = None):
    """Like :func:`make`, from a mapping with a ``kind`` key (as written in a file)."""
    values = dict(mapping)
    kind = values.pop("kind", None)
    if not isinstance(kind, str):
        from gen.errors import ParamError
        raise ParamError("is required", file=PYTHON, part=name, key="kind")
    return make(kind, name, **values)


def require_ok(part):
    """``part`` itself when its checks found no error; raises CheckFailed otherwise."""
    if part.errors:
        raise CheckFailed(f"part '{part.name}'", part.findings)
    return part


def to_trimesh(part):
    """The part's triangles (trimesh.Trimesh), re-measured on slices like a build does."""
    from gen.build.export import make_triangles
    from gen.triangles.prism import slice_polygons

    require_ok(part)
    tri = make_triangles(part)
    found = [f for check in part.slice_checks for f in check(lambda z: slice_polygons(tri, z))]
    if any(f.severity == "error" for f in found):
        raise CheckFailed(f"part '{part.name}' triangles", found)
    return tri


def to_cadquery(part):
    """The part's solid as a ``cadquery.Solid`` (valid, one solid; imports cadquery, which
    the build itself never does: it wraps the builders' ``TopoDS_Solid``)."""
    import cadquery as cq

    from gen.build.export import make_solid

    return cq.Solid(make_solid(require_ok(part)))


def write_files(part, out: str, formats=("step", "stl")) -> dict:
    """Write the part's files into folder ``out``; returns {format: path}. Each file is
    measured and written as a build writes it (atomic, deterministic bytes)."""
    import os

    from gen.build.export import export_part
    from gen.export.registry import parse_formats

    require_ok(part)
    fmts = parse_formats(formats if isinstance(formats, str) else ",".join(formats))
    os.makedirs(out, exist_ok=True)
    outcome = export_part(part, out, fmts)
    if not outcome.ok:
        raise CheckFailed(f"part '{part.name}' export", outcome.findings)
    return {fmt: os.path.join(out, info["path"]) for fmt, info in outcome.files.items()}


def check_pair(a, b, **mesh_values) -> PairCheck:
    """Check two parts in engagement, with the keys of a ``meshes:`` entry (center_distance,
    print_clearance, torque, speed, material, safety_factor). Same checks as ``check``."""
    from gen.check.meshes import MESH_KEYS, PAIR_CHECKS
    from gen.params.schema import Where, check_mapping

    where = Where(PYTHON, f"{a.name}+{b.name}", lambda key: None, section="mesh")
    v = check_mapping({"parts": [a.name, b.name], **mesh_values}, MESH_KEYS, where)
    check = PAIR_CHECKS.get(frozenset({a.role, b.role}))
    if check is None:
        raise where.error("parts", f"a {a.role.value} and a {b.role.value} do not mesh")
    found, numbers, _ = check(f"{a.name}+{b.name}", [a.name, b.name], a, b, v)
    return PairCheck(f"{a.name}+{b.name}", tuple(found), numbers)


def check_drive(profile: str | None = None, teeth=None, *, pulleys=None,
                center_distance: float | None = None, belt_teeth: int | None = None,
                stock=None, adjust: float = 1.0):
    """Solve a belt drive: two ``timing_pulley`` parts (``pulleys``), or a profile and two
    tooth counts. Give ``center_distance`` (mm) or ``belt_teeth``. Returns the solution
    (belt length and teeth, center distance, wrap, teeth in mesh, tensioner range, findings)."""
    from gen.check.drives import DRIVE_KEYS
    from gen.geometry.belt import solve_drive
    from gen.params.schema import Where, check_mapping

    where = Where(PYTHON, "drive", lambda key: None, section="drive")
    raw = {"profile": profile, "teeth": list(teeth) if teeth is not None else None,
           "center_distance": center_distance, "belt_teeth": belt_teeth,
           "stock": list(stock) if stock is not None else None, "adjust": adjust}
    v = check_mapping({k: x for k, x in raw.items() if x is not None}, DRIVE_KEYS, where)
    if pulleys is not None:
        p1, p2 = (p.mate for p in pulleys)
        if p1.profile != p2.profile:
            raise where.error("pulleys", f"pulleys have different profiles ({p1.profile} and "
                              f"{p2.profile})")
        prof, z1, z2 = p1.profile, p1.teeth, p2.teeth
    elif v["profile"] is not None and v["teeth"] is not None:
        prof, (z1, z2) = v["profile"], v["teeth"]
    else:
        raise where.error("profile", "give pulleys, or a profile and two tooth counts")
    if (v["center_distance"] is None) == (v["belt_teeth"] is None):
        raise where.error("center_distance", "give either center_distance (mm) or belt_teeth")
    return solve_drive(prof, z1, z2, center=v["center_distance"], belt_teeth=v["belt_teeth"],
                       stock=v["stock"], adjust_pct=v["adjust"])


def check_design(mapping: dict, name: str = PYTHON):
    """Check a whole design given as a mapping laid out like a parameter file (parts, trains,
    series, meshes, drives, assemblies, drivetrains, fits). Returns the CheckResult."""
    from gen.check.project import check_project
    from gen.params.project import project_from_mapping

    return check_project(project_from_mapping(mapping, name))


def check_files(*paths):
    """Check parameter files or folders of them (what ``pitchline check`` does)."""
    from gen.check import check

    return check(list(paths) or ["params"])


def build_files(*paths, out: str = "out", formats=("step", "stl"), jobs: int = 1,
                force: bool = False, executor: str = "local", scheduler: str | None = None,
                plate=(220.0, 220.0)):
    """Check, then build parameter files into ``out`` (what ``pitchline build`` does).
    Raises CheckFailed when the check finds an error (nothing is written)."""
    from gen.build import build

    result = check_files(*paths)
    if not result.ok:
        raise CheckFailed("check", result.findings)
    return build(result, out, list(formats), force=force, jobs=jobs, plate=plate,
                 executor=executor, scheduler=scheduler)


__all__ = ["CheckFailed", "PairCheck", "make", "make_from", "require_ok", "to_trimesh",
           "to_cadquery", "write_files", "check_pair", "check_drive", "check_design",
           "check_files", "build_files"]
