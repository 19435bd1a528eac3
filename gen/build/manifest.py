"""``manifest.json``: every part and assembly with its sizes, files, status and source, the
plates, the meshes and the belt drives.

``source`` is the parameter file a part comes from, written relative to the project root
folder (the folder named on the command line, or the folder of the named file), with ``/``
separators, so that it does not depend on the current directory; parts made by an assembly
carry the assembly's file.
"""

from __future__ import annotations

import json
import os

from gen import __version__
from gen.build.cache import MANIFEST, params_hash


def project_root(paths) -> str:
    """The folder sources are written relative to: the common folder of the paths named on
    the command line (a named file counts by its folder)."""
    dirs = [os.path.abspath(p if os.path.isdir(p) else os.path.dirname(p) or ".")
            for p in paths] or [os.getcwd()]
    return os.path.commonpath(dirs)


def source_of(file: str, root: str) -> str | None:
    """``file`` relative to ``root`` with ``/`` separators (absolute when outside the root)."""
    if not file:
        return None
    path = os.path.abspath(file)
    rel = os.path.relpath(path, root)
    if rel == os.pardir or rel.startswith(os.pardir + os.sep):
        return path.replace(os.sep, "/")
    return rel.replace(os.sep, "/")


def fitted_sizes(part) -> dict:
    """Sizes of the geometry as generated when it differs from the nominal ones.

    A pulley's ``outside_diameter`` is the nominal d_o = d_p − 2a (ISO 5288); the generated
    outline is smaller by the per-flank fit allowance. The fitted outside diameter is measured
    on the part's outline (twice its largest radius), not recomputed.
    """
    import numpy as np

    out = {}
    if part.role.value == "pulley" and part.outline is not None and \
            "outside_diameter" in part.sizes:
        pts = np.asarray(part.outline, dtype=float)
        out["outside_diameter_fitted"] = float(2.0 * np.hypot(pts[:, 0], pts[:, 1]).max())
    return out


def write_manifest(out: str, result, outcomes: dict, formats=(), *, root: str | None = None,
                   plates: list | None = None, options=None) -> str:
    from gen.export.atomic import write_atomic

    if root is None:
        root = project_root(result.project.files or ["."])
    asm_files = {a.name: a.file for a in result.assemblies}
    parts = {}
    for name in sorted(result.models):
        model = result.models[name]
        oc = outcomes.get(name)
        file = model.file or asm_files.get(model.assembly or "", "")
        parts[name] = {
            "kind": model.kind,
            "train": model.train,
            "assembly": model.assembly,
            "source": source_of(file, root),
            "params_hash": params_hash(model, formats, options),
            "sizes": {**dict(model.sizes), **fitted_sizes(model)},
            "files": oc.files if oc else {},
            "status": oc.status if oc else "failed",
            **({"mass_properties": oc.mass} if oc and oc.mass else {}),
        }
        if model.rating is not None:
            r = model.rating()
            parts[name]["sizes"].update(lewis_form_factor=r["lewis_form_factor"],
                                        rated_torque=r["rated_torque"])
            parts[name]["rating"] = {k: r[k] for k in ("material", "safety_factor", "rpm")}
    for asm in result.assemblies:
        key = f"assembly:{asm.name}"
        oc = outcomes.get(key)
        parts[key] = {"kind": asm.kind, "parts": asm.parts, "sizes": asm.sizes,
                      "kinematics": asm.kinematics,
                      "source": source_of(asm.file, root),
                      "params_hash": getattr(oc, "params_hash", None),
                      "files": oc.files if oc else {},
                      "status": oc.status if oc else "skipped"}
    doc = {"tool": "pitchline", "version": __version__,
           "units": {"length": "mm", "angle": "deg", "volume": "mm3"},
           "parts": parts,
           "plates": list(plates or []),
           "meshes": [{"name": p["name"], "parts": p["parts"], **p.get("numbers", {})}
                      for p in result.pairs],
           "drives": [{"name": d["name"], **{k: v for k, v in d["solution"].as_dict().items()
                                             if k != "findings"}} for d in result.drives]}
    path = os.path.join(out, MANIFEST)
    write_atomic(path, (json.dumps(doc, indent=2, sort_keys=True) + "\n").encode())
    return path
