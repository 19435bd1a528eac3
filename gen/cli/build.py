"""``pitchline build``: validate, check meshes, then export every part (incrementally)."""

from __future__ import annotations

import os
import sys

from gen.cli.output import print_findings, result_summary


def register(sub):
    p = sub.add_parser("build", help="validate, then write STEP/STL files, a manifest and a report",
                       description="Validate every part, mesh, drive and assembly; if all pass, "
                                   "export each part whose parameters changed.")
    p.add_argument("paths", nargs="*", default=["params"], metavar="PATH",
                   help="parameter files or folders of them (default: params)")
    p.add_argument("--out", default="out", metavar="DIR", help="output folder (default: out)")
    p.add_argument("--format", default="step,stl", metavar="LIST",
                   help="comma-separated formats (default: step,stl)")
    p.add_argument("--jobs", type=int, default=None, metavar="N",
                   help="export parts in N parallel processes (default: one per CPU this "
                        "process may use)")
    p.add_argument("--force", action="store_true", help="rebuild parts that are up to date")
    p.add_argument("--executor", default="local", choices=("local", "dask"),
                   help="where parts are exported: this machine (default) or a Dask cluster")
    p.add_argument("--scheduler", metavar="ADDRESS", default=None,
                   help="Dask scheduler address, e.g. tcp://10.0.0.5:8786 (default with "
                        "--executor dask: a local two-worker cluster)")
    p.add_argument("--plate", default="220x220", metavar="WxD",
                   help="build plate for plate.3mf when 3mf is a format (mm, default 220x220)")
    p.add_argument("--dxf-curves", default="spline", choices=("spline", "polyline", "both"),
                   help="DXF flank curves: splines through the generated points, closed "
                        "polylines within the chord tolerance, or both on two layers "
                        "(default: spline)")
    p.set_defaults(func=run)


def parse_formats(text: str):
    """Formats from a comma-separated list (see :func:`gen.export.registry.parse_formats`)."""
    from gen.export.registry import parse_formats as parse

    return parse(text)


def default_jobs() -> int:
    """CPUs this process may use (its affinity mask), at least 1."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:   # not on Linux
        return max(1, os.cpu_count() or 1)


def report_inputs(out: str, result) -> str:
    """SHA-256 of what the build page is drawn from: the tool version, the parameter files'
    bytes and the manifest just written (parts' hashes and files' SHA-256), less the parts'
    build status."""
    import hashlib

    from gen import __version__

    h = hashlib.sha256(__version__.encode())
    for path in sorted(result.project.files or ()):
        h.update(os.path.abspath(path).encode())
        with open(path, "rb") as fh:
            h.update(fh.read())
    import json

    with open(os.path.join(out, "manifest.json"), encoding="utf-8") as fh:
        doc = json.load(fh)

    def steady(v):   # a part's "status" (built / up to date) does not change the page
        if isinstance(v, dict):
            return {k: steady(x) for k, x in v.items() if k != "status"}
        if isinstance(v, list):
            return [steady(x) for x in v]
        return v
    h.update(json.dumps(steady(doc), sort_keys=True).encode())
    return h.hexdigest()


def run(args) -> int:
    from gen.build import Progress, build
    from gen.api import check_files

    try:
        formats = parse_formats(args.format)
        if args.jobs is None:
            args.jobs = default_jobs()
        if args.jobs < 1:
            raise ValueError("--jobs takes a whole number ≥ 1")
        try:
            plate = tuple(float(v) for v in args.plate.lower().split("x"))
        except ValueError:
            plate = ()
        if len(plate) != 2 or not all(0 < v <= 10000 for v in plate):  # finite, positive, mm
            raise ValueError(f"--plate takes width x depth in mm, like 220x220 (got {args.plate!r})")
    except ValueError as exc:
        print(f"pitchline build: {exc}", file=sys.stderr)
        return 2
    from gen.cli.outdir import manifest_problem, missing_needs, prepare_out

    needs = missing_needs(formats)
    if needs:
        print(f"pitchline build: {needs[0]}", file=sys.stderr)
        return 2
    result = check_files(*args.paths)
    if not result.ok:
        print(f"not built: {result_summary(result)}")
        print_findings(result.findings)
        print("nothing was written", file=sys.stderr)
        return 1
    from gen.build.manifest import project_root
    from gen.export.report_build import MAX_SHADED

    prepare_out(args.out)
    stale = None if args.force else manifest_problem(args.out)
    if stale:
        print(f"note: {os.path.join(args.out, 'manifest.json')} {stale}: treated as absent, "
              "every part is rebuilt", file=sys.stderr)
    report = build(result, args.out, formats, force=args.force or bool(stale), jobs=args.jobs,
                   progress=Progress(len(result.models)), plate=plate,
                   executor=args.executor, scheduler=args.scheduler,
                   options={"dxf_curves": args.dxf_curves,
                            "pictures": len(result.models) <= MAX_SHADED},
                   root=project_root(args.paths))
    plate_oc = report.plate
    if plate_oc is not None and not plate_oc.ok:
        print_findings(plate_oc.findings)
    for oc in report.outcomes.values():
        shown = [f for f in oc.findings if not oc.ok or f.severity != "info"]
        if shown:
            print_findings(shown)
    if plate_oc is not None and plate_oc.ok and plate_oc.extra.get("plates"):
        names = ", ".join(p["path"] for p in plate_oc.extra["plates"])
        print(f"plates: {names}")
    if report.removed:
        print(f"removed files the manifest no longer lists: {', '.join(report.removed)}")
    from gen.cli.check import write_report

    write_report(os.path.join(args.out, "report.html"), result, out_dir=args.out,
                 outcomes=report.outcomes, inputs_key=report_inputs(args.out, result))
    built = sum(o.status == "built" for o in report.outcomes.values())
    kept = sum(o.status == "up_to_date" for o in report.outcomes.values())
    failed = sum(o.status == "failed" for o in report.outcomes.values())
    print(f"{args.out}/: {built} built, {kept} up to date, {failed} failed in "
          f"{report.seconds:.1f} s ({result_summary(result)})")
    print_findings([f for f in result.findings if f.severity != "info"])
    return 0 if report.ok else 1
