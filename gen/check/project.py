"""Check: parameter files → validated part models, meshes, drives and assemblies.

Nothing here imports the CAD kernel or trimesh; :mod:`gen.build` exports what passes.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

from gen.errors import ParamError
from gen.params.project import display_path, RawProject, load_project
from gen.kinds.base import resolve
from gen.findings import ERROR, Finding, has_errors
from gen.validate.budget import work_findings


@dataclass
class CheckResult:
    project: RawProject
    models: dict = field(default_factory=dict)      # name -> gen.kinds.base.Part
    findings: list = field(default_factory=list)
    pairs: list = field(default_factory=list)       # per-mesh result dicts
    drives: list = field(default_factory=list)      # per-belt-drive result dicts
    assemblies: list = field(default_factory=list)  # gen.assemblies.Assembly
    drivetrains: list = field(default_factory=list)  # gen.check.drivetrains.DrivetrainResult
    #: name -> how to make the part again elsewhere (picklable): ("part", raw, fits) or
    #: ("assembly", entry, name); used by cluster builds
    recipes: dict = field(default_factory=dict)
    rotors: list = field(default_factory=list)      # per-entry dicts of gen.check.rotors

    @property
    def ok(self) -> bool:
        return not has_errors(self.findings)


def _param_finding(exc: ParamError) -> Finding:
    return Finding(ERROR, "parameter", exc.one_line(), exc.part or "", "parameter file")


def _locate(f: Finding, raw) -> Finding:
    """Point a part finding at the file and line of the key it is about."""
    if f.where or f.subject != raw.name:
        return f
    line = raw.line(f.key or None)
    rel = display_path(raw.file) if raw.file else "<input>"
    return replace(f, where=f"{rel}:{line}" if line else rel)


def check(paths) -> CheckResult:
    """Load, resolve and validate every part and mesh; never imports the CAD kernel."""
    return check_project(load_project(paths))


def check_project(project: RawProject) -> CheckResult:
    """Resolve and validate every part, assembly, mesh, drive and drive train of a project."""
    from gen.params.fits import collect_fits

    result = CheckResult(project=project)
    try:
        fits = collect_fits(project.entries.get("fits", []))
    except ParamError as exc:
        result.findings.append(_param_finding(exc))
        return result
    for name, raw in project.parts.items():
        try:
            model = resolve(raw, fits)
        except ParamError as exc:
            result.findings.append(_param_finding(exc))
            continue
        model = model.with_(findings=tuple(_locate(f, raw) for f in model.findings
                                           + tuple(work_findings(name, model.kind, model.outline,
                                                                 model.shape, model.chord_tol,
                                                                 model.sizes))))
        result.models[name] = model
        result.recipes[name] = ("part", raw, fits)
        result.findings += model.findings
    apply_auto_tip_shortening(result, fits)
    from gen.check.assemblies import check_assemblies
    from gen.check.drives import check_drives
    from gen.check.meshes import check_meshes
    from gen.check.rotors import check_rotors

    check_assemblies(result)
    check_meshes(result)
    check_drives(result)
    from gen.check.drivetrains import check_drivetrains

    check_drivetrains(result)

    check_rotors(result)
    return result


def _is_auto(raw) -> bool:
    v = raw.values.get("tip_shortening")
    return isinstance(v, str) and v.lower() == "auto"


def apply_auto_tip_shortening(result, fits) -> None:
    """Remake every part with ``tip_shortening: auto`` with the k of its declared mesh.

    ISO 21771: a pair at center distance a' has y = (a' − a)/m_n and keeps the standard tip
    clearance with k = x1 + x2 − y (k ≥ 0). y does not depend on the tips, so one pass
    suffices. A part in several meshes takes the largest k; in none, k = 0 (said as info).
    """
    from gen.check.meshes import mesh_values
    from gen.errors import GeometryError
    from gen.findings import INFO
    from gen.geometry.pair import mesh_pair
    from gen.kinds.base import Role

    autos = {n for n, raw in result.project.parts.items() if _is_auto(raw)
             and n in result.models and result.models[n].role is Role.EXTERNAL_GEAR}
    if not autos:
        return
    ks: dict = {}
    for entry in result.project.entries.get("meshes", []):
        try:
            v = mesh_values(entry)
        except ParamError:
            continue   # check_meshes reports it
        names = v["parts"]
        a, b = (result.models.get(n) for n in names)
        if a is None or b is None or a.role is not Role.EXTERNAL_GEAR \
                or b.role is not Role.EXTERNAL_GEAR or a.shape is None or b.shape is None:
            continue
        try:
            pr = mesh_pair(a.mate.sizes, b.mate.sizes, v["center_distance"])
        except GeometryError:
            continue   # check_meshes reports it
        for n in names:
            if n in autos and max(pr.k, 0.0) >= ks.get(n, (-1.0, ""))[0]:
                ks[n] = (max(pr.k, 0.0), f"{names[0]}+{names[1]}")
    for n in sorted(autos):
        raw = result.project.parts[n]
        k, label = ks.get(n, (0.0, ""))
        old = result.models[n]
        fixed = replace(raw, values={**raw.values, "tip_shortening": k})
        try:
            model = resolve(fixed, fits)
        except ParamError as exc:
            result.findings.append(_param_finding(exc))
            continue
        note = (f"tip_shortening: auto applies k = {k:.4f} of mesh {label} (ISO 21771: "
                f"k = x1 + x2 − y)" if label else
                "tip_shortening: auto, but the part is in no declared mesh of external gears: "
                "k = 0 applied")
        found = tuple(_locate(f, raw) for f in model.findings) + (
            _locate(Finding(INFO, "mesh-geometry", note, n, "ISO 21771", key="tip_shortening"),
                    raw),)
        model = model.with_(findings=found,
                            sizes={**model.sizes, "tip_shortening_from": label or None})
        result.findings = [f for f in result.findings if f not in old.findings] + list(found)
        result.models[n] = model
        result.recipes[n] = ("part", fixed, fits)
