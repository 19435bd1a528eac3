"""``plate.3mf``: every built part's triangles laid flat and packed on one build plate."""

from __future__ import annotations

import os

from gen.build.cache import file_info
from gen.build.outcome import PartOutcome
from gen.errors import PitchlineError
from gen.findings import ERROR, Finding


def export_plate(result, out, report, plate) -> None:
    """``plate.3mf``: every built part's mesh laid flat and packed on one build plate."""
    from gen.export.threemf import read_3mf, write_3mf
    from gen.triangles.plate import arrange

    items = []
    for name in sorted(result.models):
        oc = report.outcomes.get(name)
        if oc is None or not oc.ok or "3mf" not in oc.files:
            continue
        # the part's own 3MF holds exactly its mesh
        mesh = read_3mf(os.path.join(out, oc.files["3mf"]["path"]))
        items.append((name, mesh))
    key = "plate"
    oc = PartOutcome(key, True)
    try:
        placed = arrange(items, plate=plate)
        path = os.path.join(out, "plate.3mf")
        size = write_3mf([(p.name, p.mesh) for p in placed], path)
        oc.files["3mf"] = file_info(path, size)
    except PitchlineError as exc:
        oc.ok, oc.status = False, "failed"
        oc.findings.append(Finding(ERROR, "plate", str(exc), "plate", ""))
    report.plate = oc
