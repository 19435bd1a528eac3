"""Keep the output folder and the manifest in agreement.

After a build, files that the previous manifest listed (so pitchline wrote them) and the new
manifest does not are removed: a rebuild with fewer formats, a renamed part or fewer plates
leaves nothing stale. Files pitchline did not list are never touched. The ``plate.3mf`` of
builds before numbered plates (written but not listed) counts as pitchline's when the folder
holds a pitchline manifest.
"""

from __future__ import annotations

import os

from gen.build.cache import listed_files

#: the single plate file of earlier versions, which their manifests did not list
LEGACY_PLATE = "plate.3mf"


def _safe(name: str) -> bool:
    """A bare file name inside the folder (no separators, not '.', '..' or hidden)."""
    return bool(name) and os.path.basename(name) == name and not name.startswith(".")


def stale_files(prev_doc: dict, new_doc: dict) -> list[str]:
    """Names the previous manifest listed (or the legacy plate) that the new one does not."""
    old = listed_files(prev_doc)
    if prev_doc.get("tool") == "pitchline":
        old.add(LEGACY_PLATE)
    return sorted(n for n in old - listed_files(new_doc) if _safe(n))


def remove_stale(out: str, prev_doc: dict, new_doc: dict) -> list[str]:
    """Delete the stale files that exist in ``out``; returns the names removed."""
    removed = []
    for name in stale_files(prev_doc, new_doc):
        path = os.path.join(out, name)
        if os.path.isfile(path):
            os.unlink(path)
            removed.append(name)
    return removed
