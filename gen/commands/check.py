"""``pitchline check``: validate parts and declared meshes without the CAD kernel."""

from __future__ import annotations

import json
import sys

from gen.commands.output import print_findings, summary_line


def register(sub):
    p = sub.add_parser("check", help="validate parameter files and every declared mesh (no CAD kernel)",
                       description="Validate every part and declared mesh; exit 1 on any error.")
    p.add_argument("paths", nargs="*", default=["params"], metavar="PATH",
                   help="parameter files or folders of them (default: params)")
    p.add_argument("--json", action="store_true", help="print the findings as JSON")
    p.set_defaults(func=run)


def run(args) -> int:
    from gen.pipeline import check

    result = check(args.paths)
    if args.json:
        doc = {
            "ok": result.ok,
            "files": result.project.files,
            "parts": {n: {"kind": m.kind, "sizes": m.sizes} for n, m in sorted(result.models.items())},
            "meshes": [{"name": p["name"], "parts": p["parts"], **p.get("numbers", {}),
                        "status": "error" if any(f.severity == "error" for f in p["findings"]) else "ok"}
                       for p in result.pairs],
            "findings": [f.as_dict() for f in result.findings],
        }
        json.dump(doc, sys.stdout, indent=2, sort_keys=True, default=float)
        sys.stdout.write("\n")
    else:
        print(f"checked {summary_line(len(result.project.parts), len(result.pairs), result.findings)}")
        print_findings(result.findings)
    return 0 if result.ok else 1
