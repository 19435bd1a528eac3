"""``pitchline build``: validate, check meshes, then export every part."""

from __future__ import annotations

import os
import sys

from gen.commands.output import print_findings, summary_line


def register(sub):
    p = sub.add_parser("build", help="validate, then write STEP/STL files and a manifest",
                       description="Validate every part and mesh; if all pass, export each part.")
    p.add_argument("paths", nargs="*", default=["params"], metavar="PATH",
                   help="parameter files or folders of them (default: params)")
    p.add_argument("--out", default="out", metavar="DIR", help="output folder (default: out)")
    p.add_argument("--format", default="step,stl", metavar="LIST",
                   help="comma-separated formats: step, stl (default: step,stl)")
    p.set_defaults(func=run)


def parse_formats(text: str):
    from gen.export.registry import FORMATS

    fmts = [f.strip().lower() for f in text.split(",") if f.strip()]
    bad = [f for f in fmts if f not in FORMATS]
    if bad or not fmts:
        raise ValueError(f"unknown format '{bad[0] if bad else text}'; allowed: "
                         + ", ".join(FORMATS))
    return fmts


def run(args) -> int:
    from gen.pipeline import check, export_part, write_manifest
    from gen.validate.findings import has_errors

    try:
        formats = parse_formats(args.format)
    except ValueError as exc:
        print(f"pitchline build: {exc}", file=sys.stderr)
        return 2
    result = check(args.paths)
    if not result.ok:
        print(f"not built: {summary_line(len(result.project.parts), len(result.pairs), result.findings)}")
        print_findings(result.findings)
        print("nothing was written", file=sys.stderr)
        return 1
    os.makedirs(args.out, exist_ok=True)
    outcomes = {}
    failed = False
    for name in sorted(result.models):
        oc = export_part(result.models[name], args.out, formats)
        outcomes[name] = oc
        sizes = ", ".join(f"{f} {v['bytes'] / 1024:.0f} kB" for f, v in oc.files.items())
        state = "built " if oc.ok else "FAILED"
        print(f"  {state} {name:<24} {sizes:<28} {oc.seconds:6.2f} s", flush=True)
        if not oc.ok:
            failed = True
            print_findings(oc.findings)
    write_manifest(args.out, result, outcomes)
    if result.pairs:
        from gen.commands.check import write_report

        write_report(os.path.join(args.out, "report.html"), result)
    print(f"wrote {sum(len(o.files) for o in outcomes.values())} files to {args.out}/ "
          f"({summary_line(len(result.models), len(result.pairs), result.findings)})")
    print_findings([f for f in result.findings if f.severity != "info"])
    return 1 if failed or has_errors(result.findings) else 0
