"""Before a build writes anything: the output folder, the previous manifest, format needs.

Each check answers with one plain sentence instead of letting an ``OSError``,
``AttributeError`` or ``ModuleNotFoundError`` surface half-way through a build.
"""

from __future__ import annotations

import importlib.util
import json
import os
import tempfile

from gen.errors import UsageError

#: Python modules a format needs beyond the install's own dependencies, with the reason.
#: 3MF: the build re-reads every written 3MF with trimesh, whose 3MF reader needs lxml.
FORMAT_NEEDS = {"3mf": (("lxml", "trimesh reads 3MF files back with it"),)}


def prepare_out(out: str) -> None:
    """Create the output folder (and its parents) and prove that a file can be written there.

    Raises
    ------
    UsageError
        ``out`` is a file, lies under a file, cannot be created, or is not writable.
    """
    probe = out
    while probe and not os.path.exists(probe):
        probe = os.path.dirname(probe.rstrip(os.sep)) or ""
    if probe and not os.path.isdir(probe):
        what = "is a file" if probe == out else f"lies under '{probe}', which is a file"
        raise UsageError(f"--out {out}: the output folder {what}; name a folder")
    try:
        os.makedirs(out, exist_ok=True)
    except OSError as exc:
        raise UsageError(f"--out {out}: cannot create the output folder: "
                         f"{exc.strerror or exc}") from None
    try:
        fd, tmp = tempfile.mkstemp(prefix=".probe-", dir=out)
        os.close(fd)
        os.unlink(tmp)
    except OSError as exc:
        raise UsageError(f"--out {out}: cannot write in the output folder: "
                         f"{exc.strerror or exc}") from None


def manifest_problem(out: str) -> str | None:
    """Why ``out/manifest.json`` cannot be used for an incremental build, or None.

    None also when there is no manifest. A manifest of another shape (``[]``, a part entry
    that is text, files without sizes …) is reported so the caller can rebuild everything.
    """
    path = os.path.join(out, "manifest.json")
    if not os.path.lexists(path):
        return None
    if not os.path.isfile(path):
        return "is not a regular file"
    try:
        with open(path, encoding="utf-8") as fh:
            doc = json.load(fh)
    except (OSError, ValueError) as exc:
        return f"cannot be read ({type(exc).__name__})"
    if not isinstance(doc, dict):
        return f"holds a JSON {type(doc).__name__}, not an object"
    parts = doc.get("parts", {})
    if not isinstance(parts, dict):
        return "its 'parts' is not an object"
    for name, entry in parts.items():
        if not isinstance(entry, dict):
            return f"its entry for '{name}' is not an object"
        files = entry.get("files", {})
        if not isinstance(files, dict):
            return f"the files of '{name}' are not an object"
        for info in files.values():
            if not (isinstance(info, dict) and isinstance(info.get("path"), str)
                    and isinstance(info.get("bytes"), int)
                    and isinstance(info.get("sha256"), str)):
                return f"a file entry of '{name}' lacks path, bytes or sha256"
            if os.path.basename(info["path"]) != info["path"]:
                return f"a file entry of '{name}' points outside the folder"
    return None


def missing_needs(formats) -> list[str]:
    """One sentence per Python module a requested format needs and cannot import."""
    out = []
    for fmt in formats:
        for module, why in FORMAT_NEEDS.get(fmt, ()):
            try:
                found = importlib.util.find_spec(module) is not None
            except (ImportError, ValueError):
                found = False
            if not found:
                out.append(f"format {fmt} needs the Python package '{module}' ({why}); "
                           f"install it (pip install {module}) or leave {fmt} out of --format")
    return out
