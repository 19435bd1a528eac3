"""``pitchline check``: validate parts and declared meshes without the CAD kernel."""

from __future__ import annotations

import json
import sys

from gen.cli.output import print_findings, result_summary


def register(sub):
    p = sub.add_parser("check", help="validate parameter files and every declared mesh (no CAD kernel)",
                       description="Validate every part, mesh and drive; exit 1 on any error.")
    p.add_argument("paths", nargs="*", default=["params"], metavar="PATH",
                   help="parameter files or folders of them (default: params)")
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    p.add_argument("--report", metavar="FILE.html", help="also write an HTML page drawing every "
                   "part, mesh, belt drive and assembly")
    p.add_argument("-v", "--verbose", action="store_true", help="also list the notes")
    p.set_defaults(func=run)


def _k_text(p, models) -> str:
    """The pair's tip shortening k (ISO 21771) and whether its gears apply it."""
    k = (p.get("numbers") or {}).get("tip_shortening")
    if k is None or models is None:
        return "–"
    if k <= 1e-9:
        return "0"
    have = [models[n].sizes.get("tip_shortening", 0.0) if n in models else 0.0
            for n in p["parts"]]
    applied = all(h is not None and h >= k - 1e-6 for h in have)
    return f"{k:.3f}{'' if applied else '*'}"


def mesh_table(pairs, models=None) -> list[str]:
    """A short fixed-width table of the declared meshes (mm, degrees). The k column is the
    pair's tip shortening (ISO 21771); a * marks a k the gears do not apply (set
    ``tip_shortening: auto`` on them to apply it)."""
    if not pairs:
        return []
    w = max(12, max(len(p["name"]) for p in pairs))
    head = (f"  {'mesh':<{w}}  {'C mm':>8}  {'αw °':>6}  {'εα':>5}  {'jn mm':>6}  "
            f"{'gap mm':>6}  {'k':>6}  status")
    lines = [head]
    for p in pairs:
        n = p.get("numbers") or {}
        status = "error" if any(f.severity == "error" for f in p["findings"]) else \
            ("warning" if any(f.severity == "warning" for f in p["findings"]) else "ok")
        if not n:
            lines.append(f"  {p['name']:<{w}}  {'–':>8}  {'–':>6}  {'–':>5}  {'–':>6}  {'–':>6}  "
                         f"{'–':>6}  {status}")
            continue
        gap = n.get("min_clearance")
        extra = f"  rack back at {n['rack_mounting_height']:.3f} mm" if "rack_mounting_height" in n else ""
        lines.append(f"  {p['name']:<{w}}  {n['center_distance']:>8.3f}  "
                     f"{n['working_pressure_angle']:>6.2f}  {n['contact_ratio']:>5.2f}  "
                     f"{n['backlash_normal']:>6.3f}  "
                     f"{('%.3f' % gap) if gap is not None else '–':>6}  "
                     f"{_k_text(p, models):>6}  {status}{extra}")
    return lines


def assembly_lines(assemblies) -> list[str]:
    lines = []
    for a in assemblies:
        k = a.kinematics
        if "ratio" in k and "carrier" not in k:   # a gearset: its ratio
            lines.append(f"  assembly {a.name}: ratio {k['ratio']:.4f} ({k['held']} held, "
                         f"{k['input']} in, {k['output']} out)")
            continue
        lines.append(f"  assembly {a.name}: carrier = {k['carrier']}, output roll = {k['output_roll']}")
        lines.append(f"    inverse: {k['inverse']}")
        if "command" in k:
            c = k["command"]
            lines.append(f"    pitch {c['pitch']:g}°, roll {c['roll']:g}° → input 1 "
                         f"{c['theta1']:.3f}°, input 2 {c['theta2']:.3f}°")
        gaps = [r.min_clearance for r in a.reports]
        if gaps:
            lines.append(f"    placed in mesh: smallest gap {min(gaps):.3f} mm over one tooth pitch; "
                         f"input back faces {a.sizes['input_back_face_spacing']:.3f} mm apart")
    return lines


def drivetrain_lines(drivetrains) -> list[str]:
    """Each drive train as a stage table (rpm, N·m; a margin is allowable / torque)."""
    lines = []
    for d in drivetrains:
        n = d.numbers
        if "stages" not in n:
            lines.append(f"  drive train {d.name}: differential {n['differential']}: pitch up to "
                         f"{n['max_pitch']:.3g} N·m, roll up to {n['max_roll']:.3g} N·m")
            continue
        lines.append(f"  drive train {d.name}: ratio {n['total_ratio']:.4g}, efficiency "
                     f"{n['efficiency']:.3f}, output {n['output_torque']:.3g} N·m at "
                     f"{n['output_speed']:.4g} rpm")
        w = max(12, max(len(s["name"]) for s in n["stages"]))
        lines.append(f"    {'stage':<{w}}  {'kind':<9}  {'rpm in':>8}  {'rpm out':>8}  "
                     f"{'N·m in':>8}  {'N·m out':>8}  {'margin':>6}")
        for s in n["stages"]:
            m = "–" if s["margin"] is None else f"{s['margin']:.2f}"
            lines.append(f"    {s['name']:<{w}}  {s['kind']:<9}  {s['speed_in']:>8.4g}  "
                         f"{s['speed_out']:>8.4g}  {s['torque_in']:>8.4g}  "
                         f"{s['torque_out']:>8.4g}  {m:>6}")
    return lines


def json_doc(result) -> dict:
    return {
        "ok": result.ok,
        "files": result.project.files,
        "parts": {n: {"kind": m.kind, "sizes": m.sizes} for n, m in sorted(result.models.items())},
        "meshes": [{"name": p["name"], "parts": p["parts"], **p.get("numbers", {}),
                    "status": "error" if any(f.severity == "error" for f in p["findings"]) else "ok"}
                   for p in result.pairs],
        "drives": [{"name": d["name"], **{k: v for k, v in d["solution"].as_dict().items()
                                          if k != "findings"},
                    "status": "error" if any(f.severity == "error" for f in d["findings"]) else "ok"}
                   for d in result.drives],
        "assemblies": [{"name": a.name, "kind": a.kind, "parts": a.parts, "sizes": a.sizes,
                        "kinematics": a.kinematics,
                        **({"ratio": a.kinematics["ratio"]} if "ratio" in a.kinematics else {}),
                        "status": "error" if any(f.severity == "error" for f in a.findings) else "ok"}
                       for a in result.assemblies],
        "drivetrains": [{"name": d.name, **d.numbers,
                         "status": "error" if any(f.severity == "error" for f in d.findings)
                         else "ok"} for d in result.drivetrains],
        "rotors": result.rotors,
        "findings": [f.as_dict() for f in result.findings],
    }


def write_report(path: str, result, *, out_dir=None, outcomes=None,
                 inputs_key: str | None = None) -> bool:
    """The whole-build page (issue 18): every part, mesh, belt drive, assembly and drive train.
    After a build, ``out_dir`` and ``outcomes`` let it draw the parts from the files written;
    ``inputs_key``: see :func:`gen.export.report_build.write` (False: page left as it was)."""
    from gen.export.report_build import write

    title = "pitchline build report" if out_dir else "pitchline check report"
    return write(path, result, out_dir=out_dir, outcomes=outcomes, title=title,
                 inputs_key=inputs_key)


def run(args) -> int:
    from gen.api import check_files

    result = check_files(*args.paths)
    if args.report:
        write_report(args.report, result)
    if args.json:
        json.dump(json_doc(result), sys.stdout, indent=2, sort_keys=True, default=float)
        sys.stdout.write("\n")
        return 0 if result.ok else 1
    print(f"checked {result_summary(result)}")
    from gen.check.drives import drive_table
    from gen.check.rotors import rotor_lines

    for line in mesh_table(result.pairs, result.models) + drive_table(result.drives) + \
            assembly_lines(result.assemblies) + drivetrain_lines(result.drivetrains) + \
            rotor_lines(result.rotors):
        print(line)
    print_findings(result.findings, show_info=args.verbose)
    if args.report:
        print(f"report: {args.report}")
    return 0 if result.ok else 1
