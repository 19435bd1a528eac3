"""``belt`` subcommand: size an open timing-belt drive from a center distance or a belt.

Imports only numpy-level modules, so it answers without loading the CAD kernel.
Exit codes: 0 done, 1 a finding of severity error, 2 bad input (one line on stderr).
"""

from __future__ import annotations

import json
import sys

from gen.errors import PitchlineError
from gen.geometry.belt import solve_drive
from gen.geometry.pulley import PROFILES
from gen.findings import has_errors

NAME = "belt"


def register(subparsers):
    """Add the ``belt`` subcommand to an argparse subparsers object; returns its parser."""
    p = subparsers.add_parser(
        NAME, help="open belt drive: belt length, center distance, wrap, teeth in mesh",
        description="Size an open drive between two timing pulleys. Give the center "
                    "distance to get the nearest whole-tooth belt, or the belt tooth count "
                    "to get the center distance.")
    p.add_argument("--profile", required=True, metavar="NAME",
                   help="belt profile: " + ", ".join(PROFILES))
    p.add_argument("--teeth", required=True, nargs=2, type=int, metavar=("Z1", "Z2"),
                   help="pulley tooth counts, driver then driven")
    way = p.add_mutually_exclusive_group(required=True)
    way.add_argument("--center", type=float, metavar="C", help="center distance, mm")
    way.add_argument("--belt-teeth", type=int, metavar="N", help="belt tooth count")
    p.add_argument("--stock", nargs="+", type=int, metavar="N",
                   help="belt tooth counts on hand (default: any whole count)")
    p.add_argument("--adjust", type=float, default=1.0, metavar="PCT",
                   help="tensioner range as belt length ±PCT %% (default 1)")
    p.add_argument("--force", action="store_true",
                   help="accept pulleys below the profile's minimum tooth count")
    p.add_argument("--json", action="store_true", help="print JSON instead of text")
    p.set_defaults(func=run)
    return p


def _row(label: str, value: str) -> str:
    return f"{label:<12}{value}"


def summary(sol) -> str:
    """Plain aligned text for a :class:`~gen.geometry.belt.DriveSolution`."""
    z1, z2 = sol.teeth
    d1, d2 = sol.pitch_diameters
    zs = min(z1, z2)
    lines = [
        _row("profile", f"{sol.profile}, pitch {sol.pitch:g} mm"),
        _row("pulleys", f"{z1} / {z2} teeth, ratio {sol.ratio:.4f}"),
        _row("pitch dia", f"{d1:.3f} / {d2:.3f} mm"),
        _row("belt", f"{sol.belt_teeth} teeth, {sol.belt_length:.3f} mm"),
        _row("center", f"{sol.center_distance:.3f} mm"),
    ]
    if sol.requested_center is not None:
        lines.append(_row("asked", f"{sol.requested_center:.3f} mm -> belt "
                                   f"{sol.requested_length:.3f} mm "
                                   f"({sol.requested_belt_teeth:.2f} teeth)"))
    lines += [
        _row("tensioner", f"{sol.center_min:.3f} to {sol.center_max:.3f} mm "
                          f"(belt length +/-{sol.adjust_pct:g} %)"),
        _row("wrap", f"{sol.wrap_angle:.2f} deg on the {zs}-tooth pulley"),
        _row("in mesh", f"{sol.teeth_in_mesh:.2f} teeth"),
    ]
    for f in sol.findings:
        lines.append(_row(f.severity, f"{f.code}: {f.message}"))
    return "\n".join(lines)


def run(args) -> int:
    """Solve the drive described by parsed ``args``; print text or JSON; return exit code."""
    try:
        z1, z2 = args.teeth
        sol = solve_drive(args.profile, z1, z2, center=args.center,
                          belt_teeth=args.belt_teeth, stock=args.stock,
                          adjust_pct=args.adjust, force=args.force)
    except PitchlineError as exc:
        print(f"{NAME}: {exc}", file=sys.stderr)
        return 2
    if args.json:
        print(json.dumps(sol.as_dict(), indent=2))
    else:
        print(summary(sol))
    return 1 if has_errors(sol.findings) else 0
