"""Assembly STEP: every part of an assembly placed by its pose, each its own named product."""

from __future__ import annotations

import hashlib
import json
import os
import time

from gen import __version__
from gen.build.cache import file_info, up_to_date
from gen.build.outcome import PartOutcome
from gen.findings import ERROR, Finding


def assembly_items(asm, models, out: str | None = None):
    """[(part name, solid, 4×4 pose)] of an assembly's parts (solids as ``TopoDS_Solid``).

    A solid already exported this build is read back from its STEP file rather than rebuilt
    (the same bytes, so the same geometry); parts with equal parameters share one solid here,
    and :func:`gen.export.step_assembly.write_step_assembly` gives each placement its own
    product."""
    from gen.export.step import step_solids
    from gen.solid import solid

    items, cache = [], {}
    for part, pose in asm.poses.items():
        model = models[part]
        key = json.dumps({"kind": model.kind, "values": model.values}, sort_keys=True,
                         default=str)
        if key not in cache:
            done = os.path.join(out, part + ".step") if out else None
            cache[key] = (step_solids(done)[0] if done and os.path.exists(done)
                          else solid(model.shape))
        items.append((part, cache[key], pose))
    return items


def assembly_step(asm, models, path: str, out: str | None = None) -> int:
    """Write one assembly's STEP (named, placed solids); returns the bytes written."""
    from gen.export.step_assembly import write_step_assembly

    return write_step_assembly(assembly_items(asm, models, out), path, asm.name)


def _phash(asm) -> str:
    return hashlib.sha256(json.dumps({"values": asm.values, "v": __version__},
                                     sort_keys=True, default=str).encode()).hexdigest()


def _pictures(asm, models, out):
    """The report's shaded views of the placed members, drawn from the STL files the build has
    just written (here, in the worker, so that the page only embeds them); None when a member
    has no STL or a view cannot be drawn (the page then draws or omits it)."""
    from gen.export.report_assembly import placed_pictures

    paths = {n: os.path.join(out, n + ".stl") for n in asm.poses}
    try:
        return placed_pictures(asm, models, paths)
    except Exception:
        return None


def export_assembly(asm, models, out, options=None) -> PartOutcome:
    """Write one assembly's STEP; failures become an error finding of the outcome. With
    ``options["pictures"]`` the report's views of the placed parts are drawn too
    (``outcome.extra["pictures"]``)."""
    from gen.export.step_assembly import write_step_assembly

    path = os.path.join(out, asm.name + ".step")
    t0 = time.perf_counter()
    oc = PartOutcome(f"assembly:{asm.name}", True)
    try:
        size = write_step_assembly(assembly_items(asm, models, out), path, asm.name)
        oc.files["step"] = file_info(path, size)
    except Exception as exc:  # reported, never a traceback
        oc.ok, oc.status = False, "failed"
        oc.findings.append(Finding(ERROR, "export", f"assembly STEP: {exc}", asm.name,
                                   "", scope="assembly"))
    if oc.ok and (options or {}).get("pictures"):
        pictures = _pictures(asm, models, out)
        if pictures is not None:
            oc.extra["pictures"] = pictures
    oc.seconds = time.perf_counter() - t0
    oc.params_hash = _phash(asm)
    return oc


def plan_assemblies(result, out, formats, report, prev) -> list:
    """The assemblies to export; those that are up to date (the assembly and every part of it)
    get their outcome in ``report.outcomes`` here."""
    if "step" not in formats:
        return []
    todo = []
    for asm in result.assemblies:
        parts = [report.outcomes.get(p) for p in asm.poses]
        key = f"assembly:{asm.name}"
        phash = _phash(asm)
        if all(p is not None and p.status == "up_to_date" for p in parts) and \
                up_to_date(prev.get(key, {}), phash, out):
            oc = PartOutcome(key, True, "up_to_date", prev[key]["files"])
            oc.params_hash = phash
            report.outcomes[key] = oc
        else:
            todo.append(asm)
    return todo


def export_assemblies(result, out, formats, report, prev, options=None) -> None:
    """Every assembly's STEP, here, one after the other, unless it and its parts are up to
    date (the parts already exported)."""
    for asm in plan_assemblies(result, out, formats, report, prev):
        report.outcomes[f"assembly:{asm.name}"] = export_assembly(
            asm, result.models, out, options if "stl" in formats else None)
