"""Incremental builds: parameter hashes, file digests, the previous manifest, up-to-date tests."""

from __future__ import annotations

import hashlib
import json
import os

from gen import __version__

MANIFEST = "manifest.json"


def params_hash(model, formats=()) -> str:
    """SHA-256 of what fixes a part's geometry: kind, resolved values, tool version.

    ``formats`` is accepted for old callers and ignored: which files a part needs is checked
    per format by :func:`up_to_date`, so dropping a format does not rebuild the part, and
    two parts with the same hash have the same geometry (built once, see
    :mod:`gen.build.run`).
    """
    blob = json.dumps({"kind": model.kind, "values": model.values, "version": __version__},
                      sort_keys=True, default=str).encode()
    return hashlib.sha256(blob).hexdigest()


def expected_formats(model, formats) -> tuple:
    """The formats a part writes a file for: all requested ones but DXF for a part without a
    flat section (the DXF writer returns nothing for it, :func:`gen.export.dxf.write_part`)."""
    return tuple(f for f in formats if not (f == "dxf" and getattr(model, "section", 1) is None))


def sha256_of(path: str) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def file_info(path: str, size: int) -> dict:
    return {"path": os.path.basename(path), "bytes": size, "sha256": sha256_of(path)}


def read_manifest(out: str) -> dict:
    try:
        with open(os.path.join(out, MANIFEST), encoding="utf-8") as fh:
            doc = json.load(fh)
        return doc.get("parts", {}) if doc.get("version") == __version__ else {}
    except (OSError, ValueError):
        return {}


def up_to_date(prev: dict, phash: str, out: str, formats=None) -> bool:
    """True when the previous build of a part (its manifest entry ``prev``) has the same hash,
    did not fail, and left every needed file intact (same size and SHA-256).

    ``formats``: the formats needed now (None: every file of ``prev``); files of formats not
    needed any more are not looked at (nor is the part rebuilt for them).
    """
    if not prev or prev.get("params_hash") != phash or prev.get("status") == "failed":
        return False
    files = prev.get("files", {})
    if formats is not None:
        if any(f not in files for f in formats):
            return False
        files = {f: files[f] for f in formats}
    for info in files.values():
        path = os.path.join(out, info["path"])
        if not os.path.exists(path) or os.path.getsize(path) != info["bytes"] or \
                sha256_of(path) != info["sha256"]:
            return False
    return bool(files) or formats == ()


def plate_key(outcomes: dict, plate) -> str:
    """SHA-256 of what fixes ``plate.3mf``: the plate size and every placed part's 3MF digest."""
    parts = sorted((name, oc.files["3mf"]["sha256"]) for name, oc in outcomes.items()
                   if oc.ok and "3mf" in oc.files and not name.startswith("assembly:"))
    blob = json.dumps({"plate": list(plate), "parts": parts, "version": __version__}).encode()
    return hashlib.sha256(blob).hexdigest()


def read_plate_record(out: str) -> dict:
    """The ``plate`` entry of the previous manifest ({} when none)."""
    try:
        with open(os.path.join(out, MANIFEST), encoding="utf-8") as fh:
            doc = json.load(fh)
        return doc.get("plate", {}) if doc.get("version") == __version__ else {}
    except (OSError, ValueError):
        return {}


def add_plate_record(out: str, record: dict) -> None:
    """Store ``record`` as the manifest's ``plate`` entry (key and file digest)."""
    from gen.export.atomic import write_atomic

    path = os.path.join(out, MANIFEST)
    with open(path, encoding="utf-8") as fh:
        doc = json.load(fh)
    doc["plate"] = record
    write_atomic(path, (json.dumps(doc, indent=2, sort_keys=True) + "\n").encode())


def geometry_cost(model) -> float:
    """Rough relative cost of building a part (for scheduling the longest first): section
    curves × (3 for a twisted prism), 6 curves per bevel tooth × 3. A heuristic, not a time."""
    shape = getattr(model, "shape", None)
    if shape is None:
        return 0.0
    if getattr(shape, "builder", "") == "apex_ruled":
        return 18.0 * shape.sizes.z
    cost = 0.0
    for p in getattr(shape, "solids", ()):
        n = len(p.section.outer.curves) + sum(len(h.curves) for h in p.section.holes)
        cost += n * (3.0 if p.twist != 0.0 else 1.0) * (2.0 if p.chevron else 1.0)
    return cost + 10.0 * len(getattr(shape, "cuts", ()))
