"""Export one part: triangles, re-measured slices, mass, then one file per requested format.

Every writer checks its own bytes before they replace an earlier file (STL/3MF re-read by a
second reader, STEP shape analysis and re-read: :mod:`gen.export`); any failure becomes an
error finding of the part and leaves the earlier file in place.
"""

from __future__ import annotations

import os
import time

from gen.build.cache import file_info
from gen.build.outcome import PartOutcome
from gen.errors import PitchlineError
from gen.findings import ERROR, WARNING, Finding, has_errors

#: relative disagreement allowed between the solid's and the triangles' volume: the triangles
#: lie within the chord tolerance of the exact surfaces (0.01 mm), far under 1 % of any part
VOLUME_REL = 0.01


#: (solid, volume mm³) of the last solid measured: equal parts of a group share the solid
_LAST_VOLUME: list = []


class Made:
    """What the writers of one part share: its checked triangles and (on first use) its solid.

    ``options`` holds format options (``dxf_curves``: "spline", "polyline" or "both").
    """

    def __init__(self, part, triangles, options=None):
        self.part = part
        self.triangles = triangles
        self.options = dict(options or {})
        self.notes = []        # findings the writers report (e.g. shape-analysis warnings)
        self.analysis = {}     # format -> what the writer's check measured
        self._solid = None
        self.volume = None     # the solid's volume (mm³), measured with it

    def solid(self):
        if self._solid is None:
            from gen.export.step import shape_volume

            s = make_solid(self.part)   # looked up now: a group of equal parts shares one
            if _LAST_VOLUME and _LAST_VOLUME[0] is s:
                vol = _LAST_VOLUME[1]
            else:
                vol = shape_volume(s)
                _LAST_VOLUME[:] = [s, vol]
            tri = float(self.triangles.volume)
            if abs(vol - tri) > VOLUME_REL * abs(vol):
                raise PitchlineError(f"solid volume {vol:.3f} mm³ and triangle volume "
                                     f"{tri:.3f} mm³ disagree by more than "
                                     f"{100 * VOLUME_REL:g} %")
            self._solid, self.volume = s, vol
        return self._solid


def make_triangles(part):
    """Triangles of a part, by the builder its shape names."""
    from gen.triangles import triangles

    return triangles(part.shape, part.chord_tol)


def make_solid(part):
    """Solid (``TopoDS_Solid``) of a part, by the builder its shape names (imports the kernel's
    OCP modules, not cadquery)."""
    from gen.solid import solid

    return solid(part.shape)


def _picture(part, stl_path: str) -> bytes | None:
    """The report's shaded view of the STL just written and re-read (drawn here, in the
    worker, so that the report only embeds it); None if it cannot be drawn."""
    from gen.export.report_parts import shaded_png

    try:
        return shaded_png(stl_path, part.role.value)
    except Exception:   # the page then draws it from the file itself
        return None


def export_part(part, out: str, formats, options=None) -> PartOutcome:
    """Triangulate, re-measure, then write the part's files. Raises nothing: failures are
    findings of the outcome."""
    from gen.export.registry import FORMATS, writer
    from gen.triangles.prism import slice_polygons

    t0 = time.perf_counter()
    outcome = PartOutcome(name=part.name, ok=True)
    try:
        mesh = make_triangles(part)
        for check in part.slice_checks:
            outcome.findings += list(check(lambda z: slice_polygons(mesh, z)))
        if has_errors(outcome.findings):
            outcome.ok, outcome.status = False, "failed"
            return outcome
        from gen.triangles.mass import mass_properties
        from gen.validate.strength import material

        mat = material(part.values.get("material") or "PLA")
        outcome.mass = {"material": mat.name, "density_g_cm3": mat.density,
                        **mass_properties(mesh, mat.density)}
        made = Made(part, mesh, options)
        for fmt in formats:
            path = os.path.join(out, part.name + FORMATS[fmt].suffix)
            size = writer(fmt)(part, path, made)
            if size is None:
                outcome.findings.append(Finding(
                    WARNING, "no-profile", f"{part.kind} '{part.name}' has no flat section to "
                    f"cut: no {fmt.upper()} written", part.name, "", scope="part"))
                continue
            outcome.files[fmt] = file_info(path, size)
        outcome.findings += made.notes
        if made.options.get("pictures") and "stl" in outcome.files:
            outcome.extra["picture"] = _picture(part, os.path.join(out, outcome.files["stl"]["path"]))
    except PitchlineError as exc:
        outcome.ok, outcome.status = False, "failed"
        outcome.findings.append(Finding(ERROR, "export", str(exc), part.name, "", scope="part"))
    except Exception as exc:  # kernel failures are reported, never a traceback
        outcome.ok, outcome.status = False, "failed"
        outcome.findings.append(Finding(ERROR, "export", f"{type(exc).__name__}: {exc}",
                                        part.name, "", scope="part"))
    outcome.seconds = time.perf_counter() - t0
    return outcome
