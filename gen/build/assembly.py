"""The STEP of each assembly: every gear solid placed in mesh and named after its part."""

from __future__ import annotations

import hashlib
import json
import os
import time

from gen import __version__
from gen.build.cache import file_info, up_to_date
from gen.build.export import make_solid
from gen.build.outcome import PartOutcome
from gen.findings import ERROR, Finding


def assembly_step(asm, models, path: str, out: str | None = None) -> int:
    """One STEP of an assembly: every gear solid placed in mesh and named after its part.

    Solids already exported this build are read back from their STEP files instead of being
    rebuilt (the same bytes, so the same geometry)."""
    from gen.build.cache import params_hash
    from gen.export.step import read_step, write_step_assembly

    items, cache = [], {}
    for part, pose in asm.poses.items():
        key = params_hash(models[part])   # identical members are built once
        if key not in cache:
            done = os.path.join(out, part + ".step") if out else None
            cache[key] = (read_step(done).Solids()[0] if done and os.path.exists(done)
                          else make_solid(models[part]))
        items.append((part, cache[key], pose))
    return write_step_assembly(items, path, asm.name)


def export_assemblies(result, out, formats, report, prev) -> None:
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
                oc.files["step"] = file_info(path, size)
            except Exception as exc:  # reported, never a traceback
                oc.ok, oc.status = False, "failed"
                oc.findings.append(Finding(ERROR, "export", f"assembly STEP: {exc}", asm.name, ""))
            oc.seconds = time.perf_counter() - t0
        oc.params_hash = phash
        report.outcomes[key] = oc
