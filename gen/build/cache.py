"""Incremental builds: parameter hashes, the previous manifest, file fingerprints."""

from __future__ import annotations

import hashlib
import json
import os

from gen import __version__

MANIFEST = "manifest.json"


#: format options and the format they change (an option counts only when its format is built)
OPTION_FORMAT = {"dxf_curves": "dxf"}


def params_hash(model, formats=(), options=None) -> str:
    """SHA-256 of a part's kind, resolved values, tool version, formats and the options of
    those formats."""
    extra = {k: v for k, v in (options or {}).items() if OPTION_FORMAT.get(k) in formats}
    blob = json.dumps({"kind": model.kind, "values": model.values, "version": __version__,
                       "formats": sorted(formats), **({"extra": extra} if extra else {})},
                      sort_keys=True, default=str).encode()
    return hashlib.sha256(blob).hexdigest()


def sha256_file(path: str) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def file_info(path: str, size: int) -> dict:
    """The manifest entry of one written file: name in the output folder, bytes, SHA-256."""
    return {"path": os.path.basename(path), "bytes": size, "sha256": sha256_file(path)}


def read_manifest_doc(out: str) -> dict:
    """The whole previous manifest (any version), or {} when there is none readable."""
    try:
        with open(os.path.join(out, MANIFEST), encoding="utf-8") as fh:
            doc = json.load(fh)
        return doc if isinstance(doc, dict) else {}
    except (OSError, ValueError):
        return {}


def read_manifest(out: str) -> dict:
    """Per-part entries of the previous manifest when written by this version, else {}."""
    doc = read_manifest_doc(out)
    return doc.get("parts", {}) if doc.get("version") == __version__ else {}


def listed_files(doc: dict) -> set[str]:
    """Every file name a manifest lists (parts, assemblies and plates)."""
    names = set()
    for entry in (doc.get("parts") or {}).values():
        for info in (entry.get("files") or {}).values():
            if isinstance(info, dict) and isinstance(info.get("path"), str):
                names.add(info["path"])
    for info in doc.get("plates") or []:
        if isinstance(info, dict) and isinstance(info.get("path"), str):
            names.add(info["path"])
    return names


def up_to_date(prev: dict, phash: str, out: str) -> bool:
    if not prev or prev.get("params_hash") != phash or prev.get("status") == "failed":
        return False
    for info in prev.get("files", {}).values():
        path = os.path.join(out, info["path"])
        if not os.path.exists(path) or os.path.getsize(path) != info["bytes"] or \
                sha256_file(path) != info["sha256"]:
            return False
    return bool(prev.get("files"))
