"""Plates: every built part's triangles laid flat and packed on as many build plates as they
need, written as ``plate_1.3mf``, ``plate_2.3mf`` … (listed in the manifest under ``plates``).

A part that fits on no plate fails the plate step (an error finding; the build exits 1) and no
plate file is written; plate files of an earlier build that this build does not list are
removed with the other stale files (:mod:`gen.build.clean`).
"""

from __future__ import annotations

import os
import re

from gen.build.cache import file_info
from gen.build.outcome import PartOutcome
from gen.errors import PitchlineError
from gen.findings import ERROR, Finding

PLATE_FILE = "plate_{}.3mf"
PLATE_RE = re.compile(r"^plate_\d+$")


def _earlier_plates(earlier, names, plate, out) -> list | None:
    """The earlier build's plates when they hold exactly ``names`` on plates of the same size
    and every plate file is still there unchanged (size and SHA-256); else None."""
    from gen.build.cache import sha256_file

    if not isinstance(earlier, list) or not earlier:
        return None
    held = sorted(n for p in earlier if isinstance(p, dict) for n in p.get("parts", []))
    if held != sorted(names):
        return None
    for p in earlier:
        path = os.path.join(out, str(p.get("path", "")))
        if p.get("plate_mm") != [float(plate[0]), float(plate[1])] or \
                not os.path.isfile(path) or os.path.getsize(path) != p.get("bytes") or \
                sha256_file(path) != p.get("sha256"):
            return None
    return earlier


def export_plate(result, out, report, plate, earlier=None) -> None:
    """Pack the parts' meshes (re-read from their written 3MF files) onto plates of ``plate``
    = (width, depth) mm; sets ``report.plate`` (an outcome whose ``extra['plates']`` lists the
    plate files and the parts on each). ``earlier``: the previous manifest's plates, kept as
    they are when every part on them is up to date (the packing depends on nothing else)."""
    from gen.export.threemf import read_3mf, write_3mf
    from gen.triangles.plate import arrange_plates

    oc = PartOutcome("plate", True)
    with_3mf = [n for n in sorted(result.models) if report.outcomes.get(n) is not None
                and report.outcomes[n].ok and "3mf" in report.outcomes[n].files]
    if with_3mf and all(report.outcomes[n].status == "up_to_date" for n in with_3mf):
        kept = _earlier_plates(earlier, with_3mf, plate, out)
        if kept is not None:
            oc.status, oc.files = "up_to_date", {p["path"]: p for p in kept}
            oc.extra["plates"] = kept
            report.plate = oc
            return
    items = []
    for name in sorted(result.models):
        part_oc = report.outcomes.get(name)
        if part_oc is None or not part_oc.ok or "3mf" not in part_oc.files:
            continue
        # the part's own 3MF holds exactly its checked triangles, as written
        mesh = read_3mf(os.path.join(out, part_oc.files["3mf"]["path"]))
        items.append((name, mesh))
    plates, written = [], []
    try:
        clash = [n for n in result.models if PLATE_RE.match(n)]
        if clash:
            raise PitchlineError(f"part '{clash[0]}' has the name of a plate file; rename it")
        if items:
            for i, placed in enumerate(arrange_plates(items, plate=plate), start=1):
                path = os.path.join(out, PLATE_FILE.format(i))
                size = write_3mf([(p.name, p.mesh) for p in placed], path)
                written.append(path)
                plates.append({**file_info(path, size), "parts": [p.name for p in placed],
                               "plate_mm": [float(plate[0]), float(plate[1])]})
    except PitchlineError as exc:
        oc.ok, oc.status = False, "failed"
        oc.findings.append(Finding(ERROR, "plate", str(exc), "plate", "", scope="part"))
        plates = []
        for path in written:      # no partial set of plates is left behind
            try:
                os.unlink(path)
            except OSError:
                pass
    oc.files = {p["path"]: p for p in plates}
    oc.extra["plates"] = plates
    report.plate = oc
