"""Build: export every validated part (and assembly) to files, incrementally, in parallel.

* Nothing is written unless :func:`gen.pipeline.check` passes.
* A part whose parameter hash (resolved values, kind, tool version) and requested formats match
  the previous manifest, and whose files are still there with the same SHA-256, is skipped
  (``"status": "up_to_date"``); ``force`` rebuilds everything.
* ``jobs > 1`` exports parts in forked worker processes (the parent has not loaded the CAD
  kernel at that point, so each worker loads its own).
* Every file is written atomically; one part's failure leaves the others' files intact.
"""

from __future__ import annotations

import hashlib
import json
import os
import sys
import time
from dataclasses import dataclass, field

from gen import __version__
from gen.errors import PitchlineError
from gen.findings import ERROR, Finding, has_errors
from gen.params.project import display_path

MANIFEST = "manifest.json"


def params_hash(model, formats=()) -> str:
    blob = json.dumps({"kind": model.kind, "values": model.values, "version": __version__,
                       "formats": sorted(formats)}, sort_keys=True, default=str).encode()
    return hashlib.sha256(blob).hexdigest()


@dataclass
class PartOutcome:
    name: str
    ok: bool
    status: str = "built"                       # built | up_to_date | failed
    files: dict = field(default_factory=dict)   # format -> {"path", "bytes", "sha256"}
    seconds: float = 0.0
    findings: list = field(default_factory=list)
    mass: dict = field(default_factory=dict)


def _sha(path: str) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def _file_info(path: str, size: int) -> dict:
    return {"path": os.path.basename(path), "bytes": size, "sha256": _sha(path)}


def make_mesh(model):
    """Triangle mesh of a part: prismatic bodies, or a bevel gear."""
    if model.body is not None:
        from gen.mesh.prism import body_mesh
        return body_mesh(model.body, model.chord_tol)
    from gen.mesh.bevel import bevel_mesh

    b = model.bevel
    return bevel_mesh(b["sizes"], b["bore"], b["flank"], model.chord_tol)


def make_solid(model):
    """CAD solid of a part (imports the kernel)."""
    if model.body is not None:
        from gen.solid.prism import body_solid
        return body_solid(model.body)
    from gen.solid.bevel import build_bevel_solid

    b = model.bevel
    return build_bevel_solid(b["sizes"], b["bore"], flank=b["flank"])


def assembly_step(asm, models, path: str, out: str | None = None) -> int:
    """One STEP of an assembly: every gear solid placed in mesh and named after its part.

    Solids already exported this build are read back from their STEP files instead of being
    rebuilt (the same bytes, so the same geometry)."""
    import cadquery as cq
    from OCP.gp import gp_Trsf

    from gen.errors import GeometryError
    from gen.export.step import read_step, write_step_assembly
    from gen.geometry.differential import gear_poses

    poses = gear_poses(asm.diff)
    items, cache = [], {}
    for gear, part in asm.parts.items():
        key = "input" if gear.startswith("input") else "output"
        if key not in cache:
            done = os.path.join(out, part + ".step") if out else None
            cache[key] = (read_step(done).Solids()[0] if done and os.path.exists(done)
                          else make_solid(models[part]))
        T = poses[gear]
        trsf = gp_Trsf()
        trsf.SetValues(*(float(T[i, j]) for i in range(3) for j in range(4)))
        if not cache[key].isValid():
            raise GeometryError(f"assembly STEP: the solid of {part} is not valid")
        items.append((part, cache[key], cq.Location(trsf)))
    return write_step_assembly(items, path, asm.name)


def export_part(model, out: str, formats) -> PartOutcome:
    """Mesh, measure, then write the part's files. Raises nothing: failures are findings."""
    from gen.export.registry import FORMATS
    from gen.mesh.prism import slice_polygons

    t0 = time.perf_counter()
    outcome = PartOutcome(name=model.name, ok=True)
    try:
        mesh = make_mesh(model)
        if model.mesh_check is not None:
            z = model.mesh_check_z
            if z is None:
                z = 0.5 * model.sizes.get("face_width", 0.0)
            outcome.findings += model.mesh_check(slice_polygons(mesh, z), z)
        if model.helix_check is not None:
            outcome.findings += model.helix_check(lambda zz: slice_polygons(mesh, zz))
        if has_errors(outcome.findings):
            outcome.ok, outcome.status = False, "failed"
            return outcome
        from gen.mesh.mass import mass_properties
        from gen.validate.strength import material

        mat = material(model.values.get("material") or "PLA")
        outcome.mass = {"material": mat.name, "density_g_cm3": mat.density,
                        **mass_properties(mesh, mat.density)}
        for fmt in formats:
            suffix, _kernel = FORMATS[fmt]
            path = os.path.join(out, model.name + suffix)
            if fmt == "stl":
                from gen.export.stl import write_stl
                size = write_stl(mesh, path)
            elif fmt == "step":
                from gen.export.step import write_step
                solid = make_solid(model)
                vol = solid.Volume()
                if abs(vol - mesh.volume) > 0.01 * abs(vol):
                    raise PitchlineError(f"STEP volume {vol:.3f} mm³ and mesh volume "
                                         f"{mesh.volume:.3f} mm³ disagree by more than 1 %")
                size = write_step(solid, path, model.name)
            elif fmt == "3mf":
                from gen.export.threemf import write_3mf
                size = write_3mf([(model.name, mesh)], path)
            elif fmt == "dxf":
                if model.profile_section is None:
                    outcome.findings.append(Finding("info", "no-profile", "no flat profile to "
                                                    "cut: DXF skipped", model.name, ""))
                    continue
                from gen.export.dxf import write_dxf
                size = write_dxf(model.profile_section, path, model.name)
            else:  # pragma: no cover - FORMATS and this table are kept in step
                raise PitchlineError(f"no writer for format {fmt}")
            outcome.files[fmt] = _file_info(path, size)
    except PitchlineError as exc:
        outcome.ok, outcome.status = False, "failed"
        outcome.findings.append(Finding(ERROR, "export", str(exc), model.name, ""))
    except Exception as exc:  # kernel failures are reported, never a traceback
        outcome.ok, outcome.status = False, "failed"
        outcome.findings.append(Finding(ERROR, "export", f"{type(exc).__name__}: {exc}",
                                        model.name, ""))
    outcome.seconds = time.perf_counter() - t0
    return outcome


def read_manifest(out: str) -> dict:
    try:
        with open(os.path.join(out, MANIFEST), encoding="utf-8") as fh:
            doc = json.load(fh)
        return doc.get("parts", {}) if doc.get("version") == __version__ else {}
    except (OSError, ValueError):
        return {}


def up_to_date(prev: dict, phash: str, out: str) -> bool:
    if not prev or prev.get("params_hash") != phash or prev.get("status") == "failed":
        return False
    for info in prev.get("files", {}).values():
        path = os.path.join(out, info["path"])
        if not os.path.exists(path) or os.path.getsize(path) != info["bytes"] or \
                _sha(path) != info["sha256"]:
            return False
    return bool(prev.get("files"))


# --- parallel export (fork: workers inherit the models, nothing is pickled but the outcome)
_JOB = {}


def _work(name: str) -> PartOutcome:
    return export_part(_JOB["models"][name], _JOB["out"], _JOB["formats"])


class Progress:
    """A one-line bar on a terminal, plain lines otherwise."""

    def __init__(self, total: int, stream=None, enabled: bool | None = None):
        self.total, self.done = total, 0
        self.stream = stream or sys.stdout
        self.tty = self.stream.isatty() if enabled is None else enabled

    def step(self, outcome: PartOutcome) -> None:
        self.done += 1
        sizes = ", ".join(f"{f} {v['bytes'] / 1024:.0f} kB" for f, v in outcome.files.items())
        if self.tty:
            n = 24
            fill = int(n * self.done / max(self.total, 1))
            self.stream.write(f"\r  [{'=' * fill}{' ' * (n - fill)}] {self.done}/{self.total} "
                              f"{outcome.name[:30]:<30}")
            if self.done == self.total:
                self.stream.write("\n")
        else:
            state = {"built": "built ", "up_to_date": "kept  ", "failed": "FAILED"}[outcome.status]
            self.stream.write(f"  {state} {outcome.name:<26} {sizes:<30} {outcome.seconds:6.2f} s\n")
        self.stream.flush()


@dataclass
class BuildResult:
    check: object
    outcomes: dict = field(default_factory=dict)
    seconds: float = 0.0

    @property
    def ok(self) -> bool:
        return all(o.ok for o in self.outcomes.values()) and self.check.ok


def build(result, out: str, formats, *, force: bool = False, jobs: int = 1,
          progress: Progress | None = None, plate=(220.0, 220.0)) -> BuildResult:
    """Export every model of a passing CheckResult into ``out``."""
    t0 = time.perf_counter()
    os.makedirs(out, exist_ok=True)
    prev = {} if force else read_manifest(out)
    report = BuildResult(check=result)
    todo = []
    models = dict(result.models)
    for name in sorted(models):
        phash = params_hash(models[name], formats)
        if up_to_date(prev.get(name, {}), phash, out):
            old = prev[name]
            report.outcomes[name] = PartOutcome(name, True, "up_to_date", old["files"], 0.0, [],
                                                old.get("mass_properties", {}))
        else:
            todo.append(name)
    progress = progress or Progress(len(models), enabled=False)
    for name in sorted(report.outcomes):
        progress.step(report.outcomes[name])
    if jobs > 1 and len(todo) > 1:
        import multiprocessing as mp

        if "step" in formats:
            import cadquery  # noqa: F401  (load the kernel once; the forked workers share it)

        _JOB.update(models=models, out=out, formats=tuple(formats))
        ctx = mp.get_context("fork")
        with ctx.Pool(min(jobs, len(todo))) as pool:
            for oc in pool.imap_unordered(_work, todo):
                report.outcomes[oc.name] = oc
                progress.step(oc)
        _JOB.clear()
    else:
        for name in todo:
            oc = export_part(models[name], out, formats)
            report.outcomes[name] = oc
            progress.step(oc)
    _assemblies(result, out, formats, report, prev)
    if "3mf" in formats and plate:
        _plate(result, out, report, plate)
    write_manifest(out, result, report.outcomes, formats)
    report.seconds = time.perf_counter() - t0
    return report


def _plate(result, out, report, plate) -> None:
    """``plate.3mf``: every built part's mesh laid flat and packed on one build plate."""
    import trimesh

    from gen.export.threemf import write_3mf
    from gen.mesh.plate import arrange

    items = []
    for name in sorted(result.models):
        oc = report.outcomes.get(name)
        if oc is None or not oc.ok or "3mf" not in oc.files:
            continue
        # the part's own 3MF holds exactly its mesh
        mesh = trimesh.load(os.path.join(out, oc.files["3mf"]["path"]), force="mesh")
        items.append((name, mesh))
    key = "plate"
    oc = PartOutcome(key, True)
    try:
        placed = arrange(items, plate=plate)
        path = os.path.join(out, "plate.3mf")
        size = write_3mf([(p.name, p.mesh) for p in placed], path)
        oc.files["3mf"] = _file_info(path, size)
    except PitchlineError as exc:
        oc.ok, oc.status = False, "failed"
        oc.findings.append(Finding(ERROR, "plate", str(exc), "plate", ""))
    report.plate = oc


def _assemblies(result, out, formats, report, prev) -> None:
    if "step" not in formats:
        return
    for asm in result.assemblies:
        parts = [report.outcomes.get(p) for p in asm.parts.values()]
        path = os.path.join(out, asm.name + ".step")
        key = f"assembly:{asm.name}"
        phash = hashlib.sha256(json.dumps({"values": asm.values, "v": __version__},
                                          sort_keys=True, default=str).encode()).hexdigest()
        if all(p is not None and p.status == "up_to_date" for p in parts) and \
                up_to_date(prev.get(key, {}), phash, out):
            oc = PartOutcome(key, True, "up_to_date", prev[key]["files"])
        else:
            t0 = time.perf_counter()
            oc = PartOutcome(key, True)
            try:
                size = assembly_step(asm, result.models, path, out)
                oc.files["step"] = _file_info(path, size)
            except Exception as exc:  # reported, never a traceback
                oc.ok, oc.status = False, "failed"
                oc.findings.append(Finding(ERROR, "export", f"assembly STEP: {exc}", asm.name, ""))
            oc.seconds = time.perf_counter() - t0
        oc.params_hash = phash
        report.outcomes[key] = oc


def write_manifest(out: str, result, outcomes: dict, formats=()) -> str:
    from gen.export.atomic import write_atomic

    parts = {}
    for name in sorted(result.models):
        model = result.models[name]
        oc = outcomes.get(name)
        parts[name] = {
            "kind": model.kind,
            "train": model.train,
            "assembly": getattr(model, "assembly", None),
            "source": display_path(model.file) if model.file else None,
            "params_hash": params_hash(model, formats),
            "sizes": model.sizes,
            "files": oc.files if oc else {},
            "status": oc.status if oc else "failed",
            **({"mass_properties": oc.mass} if oc and oc.mass else {}),
        }
        if model.rating is not None:
            r = model.rating()
            parts[name]["sizes"] = dict(model.sizes, lewis_form_factor=r["lewis_form_factor"],
                                        rated_torque=r["rated_torque"])
            parts[name]["rating"] = {k: r[k] for k in ("material", "safety_factor", "rpm")}
    for asm in result.assemblies:
        key = f"assembly:{asm.name}"
        oc = outcomes.get(key)
        parts[key] = {"kind": asm.kind, "parts": asm.parts, "sizes": asm.sizes,
                      "kinematics": asm.kinematics,
                      "params_hash": getattr(oc, "params_hash", None),
                      "files": oc.files if oc else {},
                      "status": oc.status if oc else "skipped"}
    doc = {"tool": "pitchline", "version": __version__,
           "units": {"length": "mm", "angle": "deg", "volume": "mm3"},
           "parts": parts,
           "meshes": [{"name": p["name"], "parts": p["parts"], **p.get("numbers", {})}
                      for p in result.pairs],
           "drives": [{"name": d["name"], **{k: v for k, v in d["solution"].as_dict().items()
                                             if k != "findings"}} for d in result.drives]}
    path = os.path.join(out, MANIFEST)
    write_atomic(path, (json.dumps(doc, indent=2, sort_keys=True) + "\n").encode())
    return path
