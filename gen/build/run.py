"""Build: export every validated part (and assembly) to files, incrementally, in parallel.

* Nothing is written unless :func:`gen.check.check` passes.
* A part whose parameter hash (resolved values, kind, tool version) and requested formats match
  the previous manifest, and whose files are still there with the same SHA-256, is skipped
  (``"status": "up_to_date"``); ``force`` rebuilds everything.
* ``jobs > 1`` exports parts in forked worker processes (the parent has not loaded the CAD
  kernel at that point, so each worker loads its own).
* Every file is written atomically; one part's failure leaves the others' files intact.
"""

from __future__ import annotations

import os
import time
from dataclasses import dataclass, field

from gen.build.assembly import export_assemblies
from gen.build.cache import params_hash, read_manifest, up_to_date
from gen.build.export import export_part
from gen.build.manifest import write_manifest
from gen.build.outcome import PartOutcome
from gen.build.plate import export_plate
from gen.build.progress import Progress


# --- parallel export (fork: workers inherit the models, nothing is pickled but the outcome)
_JOB = {}


def _work(name: str) -> PartOutcome:
    return export_part(_JOB["models"][name], _JOB["out"], _JOB["formats"])


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
    todo = []
    models = dict(result.models)
    for name in sorted(models):
        phash = params_hash(models[name], formats)
        if up_to_date(prev.get(name, {}), phash, out):
            old = prev[name]
            report.outcomes[name] = PartOutcome(name, True, "up_to_date", old["files"], 0.0, [],
                                                old.get("mass_properties", {}))
        else:
            todo.append(name)
    progress = progress or Progress(len(models), enabled=False)
    for name in sorted(report.outcomes):
        progress.step(report.outcomes[name])
    if executor == "dask" and todo:
        from gen.build.cluster import export_on_dask

        for oc in export_on_dask(result, todo, out, formats, scheduler, progress):
            report.outcomes[oc.name] = oc
    elif jobs > 1 and len(todo) > 1:
        import multiprocessing as mp

        if "step" in formats:
            from gen.solid import preload

            preload()  # load the kernel once; the forked workers share it

        _JOB.update(models=models, out=out, formats=tuple(formats))
        ctx = mp.get_context("fork")
        with ctx.Pool(min(jobs, len(todo))) as pool:
            for oc in pool.imap_unordered(_work, todo):
                report.outcomes[oc.name] = oc
                progress.step(oc)
        _JOB.clear()
    else:
        for name in todo:
            oc = export_part(models[name], out, formats)
            report.outcomes[name] = oc
            progress.step(oc)
    export_assemblies(result, out, formats, report, prev)
    if "3mf" in formats and plate:
        export_plate(result, out, report, plate)
    write_manifest(out, result, report.outcomes, formats)
    report.seconds = time.perf_counter() - t0
    return report
