"""Incremental builds: parameter hashes, file digests, the previous manifest, up-to-date tests."""

from __future__ import annotations

import hashlib
import json
import os

from gen import __version__

MANIFEST = "manifest.json"


def params_hash(model, formats=()) -> str:
    blob = json.dumps({"kind": model.kind, "values": model.values, "version": __version__,
                       "formats": sorted(formats)}, sort_keys=True, default=str).encode()
    return hashlib.sha256(blob).hexdigest()


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


def up_to_date(prev: dict, phash: str, out: str) -> bool:
    if not prev or prev.get("params_hash") != phash or prev.get("status") == "failed":
        return False
    for info in prev.get("files", {}).values():
        path = os.path.join(out, info["path"])
        if not os.path.exists(path) or os.path.getsize(path) != info["bytes"] or \
                sha256_of(path) != info["sha256"]:
            return False
    return bool(prev.get("files"))
