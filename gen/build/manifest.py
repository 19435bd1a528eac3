"""``manifest.json``: every part's kind, sizes, files (bytes, SHA-256) and parameter hash."""

from __future__ import annotations

import json
import os

from gen import __version__
from gen.build.cache import MANIFEST, params_hash
from gen.params.project import display_path


def write_manifest(out: str, result, outcomes: dict, formats=()) -> str:
    from gen.export.atomic import write_atomic

    parts = {}
    for name in sorted(result.models):
        model = result.models[name]
        oc = outcomes.get(name)
        parts[name] = {
            "kind": model.kind,
            "train": model.train,
            "assembly": model.assembly,
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
                      "params_hash": oc.params_hash if oc else None,
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
