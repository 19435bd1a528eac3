"""Build: export every validated part (and assembly) to files, incrementally, in parallel.

* Nothing is written unless :func:`gen.check.check` passes.
* A part whose parameter hash (resolved values, kind, tool version) matches the previous
  manifest, and whose file of every requested format is still there with the same SHA-256, is
  skipped (``"status": "up_to_date"``); dropping a format rebuilds nothing. ``force``
  rebuilds everything. ``plate.3mf`` is remade only when a placed part's 3MF or the plate
  size changed (its key is kept in the manifest), so an unchanged rebuild loads neither the
  CAD kernel nor the triangle libraries.
* Parts with the same parameter hash have the same geometry: their triangles and solid are
  made once (one job) and written under each name.
* Jobs run longest first (:func:`gen.build.cache.geometry_cost`); ``jobs > 1`` exports them
  in forked worker processes.
* Every file is written atomically; one part's failure leaves the others' files intact.
"""

from __future__ import annotations

import os
import time
from dataclasses import dataclass, field

from gen.build.assembly import export_assemblies
from gen.build import export as _export
from gen.build.cache import (add_plate_record, expected_formats, geometry_cost, params_hash,
                             plate_key, read_manifest, read_plate_record, up_to_date)
from gen.build.export import export_part
from gen.build.manifest import write_manifest
from gen.build.outcome import PartOutcome
from gen.build.plate import export_plate
from gen.build.progress import Progress


# --- parallel export (fork: workers inherit the models, nothing is pickled but the outcome)
_JOB = {}


def _work(names) -> list:
    return _export_group(_JOB["models"], names, _JOB["out"], _JOB["formats"])


def _export_group(models, names, out, formats) -> list:
    """Export parts of identical geometry: triangles and solid made once, files per name."""
    if len(names) == 1:
        return [export_part(models[names[0]], out, formats)]
    made = {}
    real_tri, real_solid = _export.make_triangles, _export.make_solid

    def once(kind, real):
        def make(model):
            if kind not in made:
                made[kind] = real(model)
            return made[kind]
        return make

    _export.make_triangles, _export.make_solid = (once("tri", real_tri),
                                                  once("solid", real_solid))
    try:
        return [export_part(models[n], out, formats) for n in names]
    finally:
        _export.make_triangles, _export.make_solid = real_tri, real_solid


@dataclass
class BuildResult:
    check: object
    outcomes: dict = field(default_factory=dict)
    seconds: float = 0.0
    plate: PartOutcome | None = None

    @property
    def ok(self) -> bool:
        return all(o.ok for o in self.outcomes.values()) and self.check.ok


def build(result, out: str, formats, *, force: bool = False, jobs: int = 1,
          progress: Progress | None = None, plate=(220.0, 220.0), executor: str = "local",
          scheduler: str | None = None) -> BuildResult:
    """Export every model of a passing CheckResult into ``out``.

    ``executor`` "local" exports in this process (``jobs`` > 1: forked workers); "dask" sends
    the parts to the Dask cluster at ``scheduler`` (None: a local two-worker cluster)."""
    t0 = time.perf_counter()
    os.makedirs(out, exist_ok=True)
    prev = {} if force else read_manifest(out)
    report = BuildResult(check=result)
    groups = {}   # parameter hash -> names to build (same geometry)
    models = dict(result.models)
    for name in sorted(models):
        phash = params_hash(models[name])
        need = expected_formats(models[name], formats)
        if up_to_date(prev.get(name, {}), phash, out, need):
            old = prev[name]
            files = {f: old["files"][f] for f in need}
            report.outcomes[name] = PartOutcome(name, True, "up_to_date", files, 0.0, [],
                                                old.get("mass_properties", {}))
        else:
            groups.setdefault(phash, []).append(name)
    jobs_list = sorted(groups.values(),   # longest first; ties by name for a stable order
                       key=lambda g: (-geometry_cost(models[g[0]]) * len(g), g[0]))
    progress = progress or Progress(len(models), enabled=False)
    for name in sorted(report.outcomes):
        progress.step(report.outcomes[name])
    if executor == "dask" and jobs_list:
        from gen.build.cluster import export_on_dask

        names = [n for group in jobs_list for n in group]
        for oc in export_on_dask(result, names, out, formats, scheduler, progress):
            report.outcomes[oc.name] = oc
    elif jobs > 1 and len(jobs_list) > 1:
        import multiprocessing as mp

        if "step" in formats:
            from gen.solid import preload

            preload()  # load the kernel once; the forked workers share it

        _JOB.update(models=models, out=out, formats=tuple(formats))
        ctx = mp.get_context("fork")
        with ctx.Pool(min(jobs, len(jobs_list))) as pool:
            for ocs in pool.imap_unordered(_work, jobs_list):
                for oc in ocs:
                    report.outcomes[oc.name] = oc
                    progress.step(oc)
        _JOB.clear()
    else:
        for names in jobs_list:
            for oc in _export_group(models, names, out, tuple(formats)):
                report.outcomes[oc.name] = oc
                progress.step(oc)
    export_assemblies(result, out, formats, report, prev)
    record = None
    if "3mf" in formats and plate:
        key = plate_key(report.outcomes, plate)
        old = read_plate_record(out) if not force else {}
        if old.get("key") == key and up_to_date({"params_hash": key, **old}, key, out):
            report.plate = PartOutcome("plate", True, "up_to_date", old["files"])
        else:
            export_plate(result, out, report, plate)
        if report.plate is not None and report.plate.ok:
            record = {"key": key, "files": report.plate.files}
    write_manifest(out, result, report.outcomes, formats)
    if record is not None:
        add_plate_record(out, record)
    report.seconds = time.perf_counter() - t0
    return report
