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
    models: dict = field(default_factory=dict)      # name -> PartModel
    findings: list = field(default_factory=list)
    pairs: list = field(default_factory=list)       # per-mesh result dicts
    drives: list = field(default_factory=list)      # per-belt-drive result dicts
    assemblies: list = field(default_factory=list)  # gen.assemblies.bevel_differential.Assembly

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
    from gen.params.fits import collect_fits

    project = load_project(paths)
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
        result.findings += model.findings
    from gen.check.assemblies import check_assemblies
    from gen.check.drives import check_drives
    from gen.check.meshes import check_meshes

    check_assemblies(result)
    check_meshes(result)
    check_drives(result)
    return result
