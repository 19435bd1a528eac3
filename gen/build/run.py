"""Build: export every validated part (and assembly) to files, incrementally, in parallel.

* Nothing is written unless :func:`gen.check.check` passes.
* A part whose parameter hash (resolved values, kind, tool version, format options) matches the
  previous manifest, and whose file of every requested format is still there with the same
  SHA-256, is skipped (``"status": "up_to_date"``); dropping a format rebuilds nothing.
  ``force`` rebuilds everything.
* Parts with the same parameter hash have the same geometry: their triangles and solid are
  made once (one job) and written under each name.
* Jobs run longest first, the parts of an assembly ahead (:func:`gen.build.cache.schedule`); ``jobs > 1`` exports them
  in forked worker processes; ``executor="dask"`` sends them to a Dask cluster
  (:mod:`gen.build.cluster`).
* Every file is written atomically and checked as written before it replaces an earlier one;
  one part's failure leaves the others' files intact, and a failed part keeps its earlier
  files (listed in the manifest as ``kept_from_earlier_build``).
* The folder and the manifest agree: files an earlier manifest listed that this build does not
  are removed (:mod:`gen.build.clean`).
"""

from __future__ import annotations

import json
import os
import time
from dataclasses import dataclass, field

from gen.build import export as _export
from gen.build.assembly import export_assemblies, plan_assemblies
from gen.build.cache import (expected_formats, params_hash, read_manifest, read_manifest_doc,
                             schedule, sha256_file, up_to_date)
from gen.build.clean import remove_stale
from gen.build.export import export_part
from gen.build.manifest import project_root, write_manifest
from gen.build.outcome import PartOutcome
from gen.build.plate import export_plate
from gen.build.progress import Progress

# --- parallel export (fork: workers inherit the models, nothing is pickled but the outcome)
_JOB = {}


def _work(names) -> list:
    return _export_group(_JOB["models"], names, _JOB["out"], _JOB["formats"], _JOB["options"])


def _assembly_work(name: str):
    from gen.build.assembly import export_assembly

    asm = next(a for a in _JOB["assemblies"] if a.name == name)
    return export_assembly(asm, _JOB["models"], _JOB["out"],
                           _JOB["options"] if "stl" in _JOB["formats"] else None)


def _export_group(models, names, out, formats, options=None) -> list:
    """Export parts of identical geometry: triangles and solid made once, files per name."""
    if len(names) == 1:
        return [export_part(models[names[0]], out, formats, options)]
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
        return [export_part(models[n], out, formats, options) for n in names]
    finally:
        _export.make_triangles, _export.make_solid = real_tri, real_solid


def _run_pool(pool, workers: int, jobs_list, assemblies, report, progress) -> None:
    """Part groups (longest first) and assemblies on the pool, at most ``workers`` tasks in
    flight; an assembly is sent as soon as every part it places is exported (it reads their
    STEP files), ahead of the parts still waiting, so that it overlaps them."""
    import queue

    done_q = queue.Queue()
    parts = list(jobs_list)
    waiting = {a.name: set(a.poses) for a in assemblies}
    ready = []
    finished = set(report.outcomes)

    def release():
        for name in [n for n, need in waiting.items() if need <= finished]:
            ready.append(name)
            del waiting[name]

    def send(fn, arg, kind):
        pool.apply_async(fn, (arg,), callback=lambda r: done_q.put((kind, r)),
                         error_callback=lambda e: done_q.put(("error", e)))

    release()
    in_flight = 0
    while parts or ready or in_flight or waiting:
        while in_flight < workers and (ready or parts):
            if ready:
                send(_assembly_work, ready.pop(0), "assembly")
            else:
                send(_work, parts.pop(0), "parts")
            in_flight += 1
        if not in_flight:   # assemblies whose parts never came: none left to wait for
            ready.extend(waiting)
            waiting.clear()
            continue
        kind, got = done_q.get()
        in_flight -= 1
        if kind == "error":
            raise got
        if kind == "assembly":
            report.outcomes[got.name] = got
            continue
        for oc in got:
            report.outcomes[oc.name] = oc
            finished.add(oc.name)
            progress.step(oc)
        release()


@dataclass
class BuildResult:
    check: object
    outcomes: dict = field(default_factory=dict)
    seconds: float = 0.0
    plate: PartOutcome | None = None
    removed: list = field(default_factory=list)   # stale files removed from the folder

    @property
    def ok(self) -> bool:
        return (all(o.ok for o in self.outcomes.values()) and self.check.ok
                and (self.plate is None or self.plate.ok))


def _keep_earlier(oc: PartOutcome, prev: dict, out: str, formats) -> None:
    """A failed part keeps the files of the requested formats that an earlier build wrote
    (unchanged on disk) and lists them."""
    kept = {}
    for fmt, info in (prev.get("files") or {}).items():
        if fmt in oc.files or fmt not in formats:
            continue
        path = os.path.join(out, info.get("path", ""))
        if os.path.isfile(path) and os.path.getsize(path) == info.get("bytes") and \
                sha256_file(path) == info.get("sha256"):
            kept[fmt] = dict(info, kept_from_earlier_build=True)
    oc.files = {**oc.files, **kept}


def build(result, out: str, formats, *, force: bool = False, jobs: int = 1,
          progress: Progress | None = None, plate=(220.0, 220.0), executor: str = "local",
          scheduler: str | None = None, options=None, root: str | None = None) -> BuildResult:
    """Export every model of a passing CheckResult into ``out``.

    ``executor`` "local" exports in this process (``jobs`` > 1: forked workers); "dask" sends
    the parts to the Dask cluster at ``scheduler`` (None: a local two-worker cluster).
    ``options``: format options (``dxf_curves``); ``root``: the project folder manifest
    sources are relative to (default: the common folder of the parameter files).
    """
    t0 = time.perf_counter()
    os.makedirs(out, exist_ok=True)
    options = dict(options or {})
    prev_doc = read_manifest_doc(out)
    earlier = read_manifest(out)
    prev = {} if force else earlier
    report = BuildResult(check=result)
    groups = {}   # parameter hash -> names to build (same geometry)
    models = dict(result.models)
    for name in sorted(models):
        phash = params_hash(models[name], formats, options)
        need = expected_formats(models[name], formats)
        if up_to_date(prev.get(name, {}), phash, out, need):
            old = prev[name]
            files = {f: old["files"][f] for f in need}
            report.outcomes[name] = PartOutcome(name, True, "up_to_date", files, 0.0, [],
                                                old.get("mass_properties", {}))
        else:
            groups.setdefault(phash, []).append(name)
    jobs_list = schedule(list(groups.values()), models, result.assemblies)
    progress = progress or Progress(len(models), enabled=False)
    for name in sorted(report.outcomes):
        progress.step(report.outcomes[name])
    if executor == "dask" and jobs_list:
        from gen.build.cluster import export_on_dask

        names = [n for group in jobs_list for n in group]
        for oc in export_on_dask(result, names, out, formats, scheduler, progress, options):
            report.outcomes[oc.name] = oc
        export_assemblies(result, out, formats, report, prev, options)
    elif jobs > 1 and len(jobs_list) > 1:
        import multiprocessing as mp

        if "step" in formats:
            from gen.solid import preload

            preload()  # load the kernel once; the forked workers share it

        _JOB.update(models=models, out=out, formats=tuple(formats), options=options,
                    assemblies=tuple(result.assemblies))
        ctx = mp.get_context("fork")
        workers = min(jobs, len(jobs_list))
        with ctx.Pool(workers) as pool:
            _run_pool(pool, workers, jobs_list, plan_assemblies(result, out, formats, report,
                                                                prev), report, progress)
        _JOB.clear()
    else:
        for names in jobs_list:
            for oc in _export_group(models, names, out, tuple(formats), options):
                report.outcomes[oc.name] = oc
                progress.step(oc)
        export_assemblies(result, out, formats, report, prev, options)
    for name, oc in report.outcomes.items():
        if not oc.ok:
            _keep_earlier(oc, earlier.get(name, {}), out, formats)
    if "3mf" in formats and plate:
        export_plate(result, out, report, plate,
                     earlier=None if force else (prev_doc or {}).get("plates"))
    plates = report.plate.extra.get("plates", []) if report.plate else []
    root = root if root is not None else project_root(result.project.files or ["."])
    path = write_manifest(out, result, report.outcomes, formats, root=root, plates=plates,
                          options=options)
    with open(path, encoding="utf-8") as fh:
        report.removed = remove_stale(out, prev_doc, json.load(fh))
    report.seconds = time.perf_counter() - t0
    return report
