"""Incremental builds: parameter hashes, file fingerprints, the previous manifest, and the
up-to-date test."""

from __future__ import annotations

import hashlib
import json
import os

from gen import __version__

MANIFEST = "manifest.json"

#: format options and the format they change (an option counts only when its format is built)
OPTION_FORMAT = {"dxf_curves": "dxf"}


def params_hash(model, formats=(), options=None) -> str:
    """SHA-256 of what fixes a part's files: kind, resolved values, tool version, and the
    options of the formats asked for (``dxf_curves`` when DXF is built).

    The formats themselves are not hashed: which files a part needs is checked per format by
    :func:`up_to_date`, so dropping a format does not rebuild the part, and two parts with
    the same hash have the same geometry (built once, see :mod:`gen.build.run`).
    """
    extra = {k: v for k, v in (options or {}).items() if OPTION_FORMAT.get(k) in formats}
    blob = json.dumps({"kind": model.kind, "values": model.values, "version": __version__,
                       **({"extra": extra} if extra else {})},
                      sort_keys=True, default=str).encode()
    return hashlib.sha256(blob).hexdigest()


def expected_formats(model, formats) -> tuple:
    """The formats a part writes a file for: all requested ones but DXF for a part without a
    flat section (the DXF writer returns nothing for it, :func:`gen.export.dxf.write_part`)."""
    return tuple(f for f in formats if not (f == "dxf" and getattr(model, "section", 1) is None))


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
    parts = doc.get("parts", {}) if doc.get("version") == __version__ else {}
    return parts if isinstance(parts, dict) else {}


def listed_files(doc: dict) -> set[str]:
    """Every file name a manifest lists (parts, assemblies and plates)."""
    names = set()
    for entry in (doc.get("parts") or {}).values():
        if not isinstance(entry, dict):
            continue
        for info in (entry.get("files") or {}).values():
            if isinstance(info, dict) and isinstance(info.get("path"), str):
                names.add(info["path"])
    for info in doc.get("plates") or []:
        if isinstance(info, dict) and isinstance(info.get("path"), str):
            names.add(info["path"])
    return names


def up_to_date(prev: dict, phash: str, out: str, formats=None) -> bool:
    """True when the previous build of a part (its manifest entry ``prev``) has the same hash,
    did not fail, and left every needed file intact (same size and SHA-256).

    ``formats``: the formats needed now (None: every file of ``prev``); files of formats not
    needed any more are not looked at (nor is the part rebuilt for them).
    """
    if not isinstance(prev, dict) or not prev or prev.get("params_hash") != phash \
            or prev.get("status") == "failed":
        return False
    files = prev.get("files", {})
    if not isinstance(files, dict):
        return False
    if formats is not None:
        if any(f not in files for f in formats):
            return False
        files = {f: files[f] for f in formats}
    for info in files.values():
        if not isinstance(info, dict) or not isinstance(info.get("path"), str):
            return False
        path = os.path.join(out, info["path"])
        if not os.path.isfile(path) or os.path.getsize(path) != info.get("bytes") or \
                sha256_file(path) != info.get("sha256"):
            return False
    return bool(files) or formats == ()


def geometry_cost(model) -> float:
    """Rough relative cost of building a part (for scheduling the longest first); a heuristic,
    not a time. One unit is about 2–10 ms on the demo (2 cores, measured per part):

    * a prism: its section curves, × 3 × (1 + Θ/4) when it twists through Θ rad in all (the
      twisted faces' poles grow with the turn: a 4.7-turn drum groove costs as much as a
      100-curve herringbone), × 2 for a chevron;
    * every boolean (a cut that cannot become a plain hole, a radial hole) costs 100 plus
      0.3 × the flat and 1.5 × the twisted part of the body (it meets every face; a boolean
      on a twisted face costs more, measured: the split nut's three cuts 3 s, the rack's two
      0.6 s);
    * a straight bevel gear: 18 per tooth."""
    shape = getattr(model, "shape", None)
    if shape is None:
        return 0.0
    if getattr(shape, "builder", "") == "apex_ruled":
        return 18.0 * shape.sizes.z
    from gen.geometry.body import plan_cuts

    plan = plan_cuts(shape) if getattr(shape, "cuts", ()) else None
    flat = twisted = 0.0
    for i, p in enumerate(getattr(shape, "solids", ())):
        holes = list(p.section.holes) + list(plan.holes[i] if plan else ())
        n = len(p.section.outer.curves) + sum(len(h.curves) for h in holes)
        n *= 2.0 if p.chevron else 1.0
        if p.twist != 0.0:
            twisted += 3.0 * n * (1.0 + abs(p.twist) * (p.z1 - p.z0) / 4.0)
        else:
            flat += n
    booleans = len(plan.booleans if plan else ()) + len(getattr(shape, "radial_holes", ()))
    return flat + twisted + booleans * (100.0 + 0.3 * flat + 1.5 * twisted)


def schedule(groups, models, assemblies=()) -> list:
    """Groups of equal parts in the order to build them: longest first (:func:`geometry_cost`
    × group size), where a part an assembly places counts the assembly's cost too (its parts
    together), so that the assembly STEP can start while the other parts build; ties by name."""
    own = {tuple(g): geometry_cost(models[g[0]]) * len(g) for g in groups}
    cost = dict(own)
    by_name = {n: tuple(g) for g in groups for n in g}
    for asm in assemblies:
        mine = {by_name[p] for p in asm.poses if p in by_name}
        total = sum(own[g] for g in mine)
        for g in mine:
            cost[g] += total
    return sorted(groups, key=lambda g: (-cost[tuple(g)], g[0]))
