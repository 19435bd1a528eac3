"""Export one part: triangles, measured on slices; then each format's writer from the table.

Raises nothing: failures become error findings of the part's outcome.
"""

from __future__ import annotations

import os
import time

from gen.build.cache import file_info
from gen.build.outcome import PartOutcome
from gen.errors import PitchlineError
from gen.findings import ERROR, INFO, Finding, has_errors


def make_triangles(model):
    """Triangle mesh of a part, by the builder its shape names."""
    from gen.triangles import triangles

    return triangles(model.shape, model.chord_tol)


def make_solid(model):
    """CAD solid of a part, by the builder its shape names (imports the kernel)."""
    from gen.solid import solid

    return solid(model.shape)


class Made:
    """A part's triangles, and its solid built on first use and checked against them."""

    def __init__(self, part, triangles):
        self.part, self.triangles, self._solid = part, triangles, None

    def solid(self):
        if self._solid is None:
            solid = make_solid(self.part)
            vol = solid.Volume()
            if abs(vol - self.triangles.volume) > 0.01 * abs(vol):
                raise PitchlineError(f"STEP volume {vol:.3f} mm³ and mesh volume "
                                     f"{self.triangles.volume:.3f} mm³ disagree by more than 1 %")
            self._solid = solid
        return self._solid


def export_part(model, out: str, formats) -> PartOutcome:
    """Triangulate, measure, then write the part's files. Raises nothing: failures are findings."""
    from gen.export.registry import FORMATS, writer
    from gen.triangles.prism import slice_polygons

    t0 = time.perf_counter()
    outcome = PartOutcome(name=model.name, ok=True)
    try:
        tri = make_triangles(model)
        for slice_check in model.slice_checks:
            outcome.findings += slice_check(lambda z: slice_polygons(tri, z))
        if has_errors(outcome.findings):
            outcome.ok, outcome.status = False, "failed"
            return outcome
        from gen.triangles.mass import mass_properties
        from gen.validate.strength import material

        mat = material(model.values.get("material") or "PLA")
        outcome.mass = {"material": mat.name, "density_g_cm3": mat.density,
                        **mass_properties(tri, mat.density)}
        made = Made(model, tri)
        for fmt in formats:
            path = os.path.join(out, model.name + FORMATS[fmt].suffix)
            size = writer(fmt)(model, path, made)
            if size is None:
                outcome.findings.append(Finding(INFO, "no-profile", f"no flat profile to cut: "
                                                f"{fmt.upper()} skipped", model.name, ""))
                continue
            outcome.files[fmt] = file_info(path, size)
    except PitchlineError as exc:
        outcome.ok, outcome.status = False, "failed"
        outcome.findings.append(Finding(ERROR, "export", str(exc), model.name, ""))
    except Exception as exc:  # kernel failures are reported, never a traceback
        outcome.ok, outcome.status = False, "failed"
        outcome.findings.append(Finding(ERROR, "export", f"{type(exc).__name__}: {exc}",
                                        model.name, ""))
    outcome.seconds = time.perf_counter() - t0
    return outcome
