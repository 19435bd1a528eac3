"""Part exports on a Dask cluster (``pitchline build --executor dask --scheduler ADDRESS``).

Parts travel as *recipes* — the raw parameter entry (and the fit profiles) of a part, or the
assembly entry that makes it — because a checked part holds closures that do not pickle. A
worker re-resolves the part (cheap, numpy only: the same numbers, so the same bytes), exports
it into a private temporary folder and returns the files' bytes; the client writes each file
atomically into the output folder. A worker that dies mid-part leaves nothing in the output
folder; Dask runs the task again on another worker (``retries``). Results, files and the
manifest are the same bytes as a local build.

Needs the optional extra: ``pip install -e '.[cluster]'`` (dask.distributed).
"""

from __future__ import annotations

import os
import tempfile

from gen.build.cache import file_info
from gen.build.export import export_part
from gen.errors import PitchlineError
from gen.export.atomic import write_atomic

#: times Dask runs a part again after its worker died
RETRIES = 3


def part_from_recipe(recipe):
    """The checked part a recipe describes (see :func:`gen.check.project.check_project`)."""
    what = recipe[0]
    if what == "part":
        from gen.kinds.base import resolve

        _, raw, fits = recipe
        part = resolve(raw, fits)
        return part
    if what == "assembly":
        from gen.assemblies import assembly_module
        from gen.params.schema import Where

        _, entry, name = recipe
        where = Where(entry.file, entry.label, entry.line, section="assembly")
        _, parts = assembly_module(entry.values.get("kind"), where).build(entry, where)
        return parts[name]
    raise PitchlineError(f"unknown part recipe {what!r}")


def export_recipe(recipe, formats, options=None) -> tuple:
    """(outcome, {format: bytes}) of one part, exported in a private temporary folder."""
    part = part_from_recipe(recipe)
    with tempfile.TemporaryDirectory(prefix="pitchline-") as tmp:
        outcome = export_part(part, tmp, formats, options)
        blobs = {}
        for fmt, info in outcome.files.items():
            with open(os.path.join(tmp, info["path"]), "rb") as fh:
                blobs[fmt] = fh.read()
    return outcome, blobs


def export_on_dask(result, names, out: str, formats, scheduler: str | None, progress,
                   options=None):
    """Export ``names`` of a checked result on the cluster at ``scheduler`` (None: a local
    cluster of 2 workers); yields each part's outcome once its files are written."""
    try:
        from distributed import Client, LocalCluster, as_completed
    except ImportError:
        raise PitchlineError("--executor dask needs dask.distributed: "
                             "pip install -e '.[cluster]'") from None
    cluster = None
    if scheduler:
        client = Client(scheduler, timeout="30s")
    else:
        cluster = LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                               dashboard_address=None)
        client = Client(cluster)
    try:
        futures = [client.submit(export_recipe, result.recipes[n], tuple(formats), options,
                                 retries=RETRIES, pure=False) for n in names]
        for fut in as_completed(futures):
            outcome, blobs = fut.result()
            for fmt, data in blobs.items():
                path = os.path.join(out, outcome.files[fmt]["path"])
                write_atomic(path, data)
                outcome.files[fmt] = file_info(path, len(data))
            progress.step(outcome)
            yield outcome
    finally:
        client.close()
        if cluster is not None:
            cluster.close()
