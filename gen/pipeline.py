"""Check and build: parameter files → validated part models → files in the output folder.

Nothing is written unless every part and every declared mesh passes validation. During the
build each part is exported on its own; one part's failure leaves the others' files intact,
and every file is written atomically.
"""

from __future__ import annotations

import hashlib
import json
import os
import time
from dataclasses import dataclass, field, replace

from gen import __version__
from gen.errors import ParamError, PitchlineError
from gen.params.project import RawProject, load_project
from gen.parts.base import resolve
from gen.validate.findings import ERROR, Finding, has_errors


@dataclass
class CheckResult:
    project: RawProject
    models: dict = field(default_factory=dict)      # name -> PartModel
    findings: list = field(default_factory=list)
    pairs: list = field(default_factory=list)       # per-mesh result dicts
    drives: list = field(default_factory=list)      # per-belt-drive result dicts

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
    rel = os.path.relpath(raw.file) if raw.file else "<input>"
    return replace(f, where=f"{rel}:{line}" if line else rel)


def check(paths) -> CheckResult:
    """Load, resolve and validate every part and mesh; never imports the CAD kernel."""
    project = load_project(paths)
    result = CheckResult(project=project)
    for name, raw in project.parts.items():
        try:
            model = resolve(raw)
        except ParamError as exc:
            result.findings.append(_param_finding(exc))
            continue
        model.findings = [_locate(f, raw) for f in model.findings]
        result.models[name] = model
        result.findings += model.findings
    from gen.drives import check_drives
    from gen.pairs import check_meshes

    check_meshes(result)
    check_drives(result)
    return result


def params_hash(model) -> str:
    blob = json.dumps({"kind": model.kind, "values": model.values, "version": __version__},
                      sort_keys=True, default=str).encode()
    return hashlib.sha256(blob).hexdigest()


@dataclass
class PartOutcome:
    name: str
    ok: bool
    files: dict = field(default_factory=dict)   # format -> {"path", "bytes", "sha256"}
    seconds: float = 0.0
    findings: list = field(default_factory=list)
    mass: dict = field(default_factory=dict)


def _file_info(path: str, size: int) -> dict:
    with open(path, "rb") as fh:
        digest = hashlib.sha256(fh.read()).hexdigest()
    return {"path": os.path.basename(path), "bytes": size, "sha256": digest}


def export_part(model, out: str, formats) -> PartOutcome:
    """Mesh, measure, then write the part's files. Raises nothing: failures are findings."""
    from gen.export.registry import FORMATS
    from gen.mesh.prism import body_mesh, slice_polygons

    t0 = time.perf_counter()
    outcome = PartOutcome(name=model.name, ok=True)
    try:
        mesh = body_mesh(model.body, model.chord_tol)
        if model.mesh_check is not None:
            z_mid = model.mesh_check_z
            if z_mid is None:
                z_mid = 0.5 * model.sizes.get("face_width", 0.0)
            outcome.findings += model.mesh_check(slice_polygons(mesh, z_mid), z_mid)
        if has_errors(outcome.findings):
            outcome.ok = False
            return outcome
        outcome.mass = {"volume": float(mesh.volume)}
        for fmt in formats:
            suffix, kernel = FORMATS[fmt]
            path = os.path.join(out, model.name + suffix)
            if fmt == "stl":
                from gen.export.stl import write_stl
                size = write_stl(mesh, path)
            elif fmt == "step":
                from gen.export.step import write_step
                from gen.solid.prism import body_solid
                solid = body_solid(model.body)
                vol = solid.Volume()
                if abs(vol - mesh.volume) > 0.01 * abs(vol):
                    raise PitchlineError(f"STEP volume {vol:.3f} mm³ and mesh volume "
                                         f"{mesh.volume:.3f} mm³ disagree by more than 1 %")
                size = write_step(solid, path, model.name)
            outcome.files[fmt] = _file_info(path, size)
    except PitchlineError as exc:
        outcome.ok = False
        outcome.findings.append(Finding(ERROR, "export", str(exc), model.name, ""))
    except Exception as exc:  # kernel failures are reported, never a traceback
        outcome.ok = False
        outcome.findings.append(Finding(ERROR, "export", f"{type(exc).__name__}: {exc}",
                                        model.name, ""))
    outcome.seconds = time.perf_counter() - t0
    return outcome


def write_manifest(out: str, result: CheckResult, outcomes: dict) -> str:
    from gen.export.atomic import write_atomic

    parts = {}
    for name in sorted(result.models):
        model = result.models[name]
        oc = outcomes.get(name)
        parts[name] = {
            "kind": model.kind,
            "train": model.train,
            "source": os.path.relpath(model.file) if model.file else None,
            "params_hash": params_hash(model),
            "sizes": model.sizes,
            "files": oc.files if oc else {},
            "status": "built" if oc and oc.ok else "failed",
            **({"mass_properties": oc.mass} if oc and oc.mass else {}),
        }
    doc = {"tool": "pitchline", "version": __version__, "units": {"length": "mm", "angle": "deg"},
           "parts": parts,
           "meshes": [{"name": p["name"], "parts": p["parts"]} for p in result.pairs]}
    path = os.path.join(out, "manifest.json")
    write_atomic(path, (json.dumps(doc, indent=2, sort_keys=True) + "\n").encode())
    return path
