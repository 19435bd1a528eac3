"""Build: export every validated part (and assembly) to files, incrementally, in parallel.

* Nothing is written unless :func:`gen.check.check` passes.
* A part whose parameter hash (resolved values, kind, tool version) and requested formats match
  the previous manifest, and whose files are still there with the same SHA-256, is skipped
  (``"status": "up_to_date"``); ``force`` rebuilds everything.
* ``jobs > 1`` exports parts in forked worker processes (the parent has not loaded the CAD
  kernel at that point, so each worker loads its own).
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

from gen.build.assembly import export_assemblies
from gen.build.cache import params_hash, read_manifest, read_manifest_doc, sha256_file, up_to_date
from gen.build.clean import remove_stale
from gen.build.export import export_part
from gen.build.manifest import project_root, write_manifest
from gen.build.outcome import PartOutcome
from gen.build.plate import export_plate
from gen.build.progress import Progress


# --- parallel export (fork: workers inherit the models, nothing is pickled but the outcome)
_JOB = {}


def _work(name: str) -> PartOutcome:
    return export_part(_JOB["models"][name], _JOB["out"], _JOB["formats"], _JOB["options"])


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
          progress: Progress | None = None, plate=(220.0, 220.0), options=None,
          root: str | None = None) -> BuildResult:
    """Export every model of a passing CheckResult into ``out``.

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
    todo = []
    models = dict(result.models)
    for name in sorted(models):
        phash = params_hash(models[name], formats, options)
        if up_to_date(prev.get(name, {}), phash, out):
            old = prev[name]
            report.outcomes[name] = PartOutcome(name, True, "up_to_date", old["files"], 0.0, [],
                                                old.get("mass_properties", {}))
        else:
            todo.append(name)
    progress = progress or Progress(len(models), enabled=False)
    for name in sorted(report.outcomes):
        progress.step(report.outcomes[name])
    if jobs > 1 and len(todo) > 1:
        import multiprocessing as mp

        if "step" in formats:
            from gen.solid import preload

            preload()  # load the kernel once; the forked workers share it

        _JOB.update(models=models, out=out, formats=tuple(formats), options=options)
        ctx = mp.get_context("fork")
        with ctx.Pool(min(jobs, len(todo))) as pool:
            for oc in pool.imap_unordered(_work, todo):
                report.outcomes[oc.name] = oc
                progress.step(oc)
        _JOB.clear()
    else:
        for name in todo:
            oc = export_part(models[name], out, formats, options)
            report.outcomes[name] = oc
            progress.step(oc)
    export_assemblies(result, out, formats, report, prev)
    for name, oc in report.outcomes.items():
        if not oc.ok:
            _keep_earlier(oc, earlier.get(name, {}), out, formats)
    if "3mf" in formats and plate:
        export_plate(result, out, report, plate)
    plates = report.plate.extra.get("plates", []) if report.plate else []
    root = root if root is not None else project_root(result.project.files or ["."])
    path = write_manifest(out, result, report.outcomes, formats, root=root, plates=plates,
                          options=options)
    with open(path, encoding="utf-8") as fh:
        report.removed = remove_stale(out, prev_doc, json.load(fh))
    report.seconds = time.perf_counter() - t0
    return report
