"""``ratio`` subcommand: tooth counts for a wanted speed ratio, optionally as a parameter file.

TARGET is input speed / output speed (> 1 reduces, < 1 steps up), written as a number
(``37``, ``2.5``), a fraction (``355/113``, ``37:1`` — both mean numerator over denominator),
or with ``pi`` as a factor (``pi``, ``2pi``, ``pi/2``, ``1/pi``).

Imports only numpy-level modules, so it answers without loading the CAD kernel.
Exit codes: 0 trains found, 1 none within the tolerance (or none within the limits),
2 bad input (one line on stderr, no traceback).
"""

from __future__ import annotations

import json
import math
import os
import re
import sys

from gen.errors import PitchlineError
from gen.geometry.pulley import PROFILES
from gen.geometry.ratio_search import KINDS, MAX_STAGES, SearchLimits, search_ratio

NAME = "ratio"


class UsageError(PitchlineError):
    """Bad command-line input for ``ratio``."""


def _term(text: str) -> float:
    m = re.match(r"^\s*((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)?\s*(\*?\s*pi)?\s*$", text,
                 re.IGNORECASE)
    if not m or not (m.group(1) or m.group(2)):
        raise UsageError(f"cannot read {text.strip()!r} as a number or a multiple of pi")
    value = float(m.group(1)) if m.group(1) else 1.0
    return value * (math.pi if m.group(2) else 1.0)


def parse_target(text: str) -> float:
    """The ratio written as ``N``, ``A/B``, ``A:B``, ``pi``, ``2pi``, ``pi/2`` ... (> 0)."""
    parts = re.split(r"[/:]", text)
    if len(parts) > 2:
        raise UsageError(f"target {text!r}: write one number or one fraction A/B")
    value = _term(parts[0])
    if len(parts) == 2:
        den = _term(parts[1])
        if den == 0:
            raise UsageError(f"target {text!r}: the denominator is zero")
        value /= den
    if not (math.isfinite(value) and value > 0):
        raise UsageError(f"target {text!r}: the ratio must be a positive number")
    return value


def _kinds(text: str) -> tuple:
    kinds = tuple(k.strip().lower() for k in text.split(",") if k.strip())
    bad = [k for k in kinds if k not in KINDS]
    if bad or not kinds:
        raise UsageError(f"--kind {text!r}: use one or more of {', '.join(KINDS)}, "
                         f"separated by commas")
    return kinds


def register(subparsers):
    """Add the ``ratio`` subcommand to an argparse subparsers object; returns its parser."""
    p = subparsers.add_parser(
        NAME, help="tooth counts for a wanted speed ratio over 1 to 3 stages",
        description="Find spur, belt or planetary stages whose tooth counts give TARGET "
                    "(input speed / output speed), ranked by ratio error, then fewer "
                    "stages, then pairs without a common factor, then size. TARGET: a "
                    "number (37, 2.5), a fraction (355/113 or 37:1) or a multiple of pi "
                    "(pi, 2pi, pi/2).")
    p.add_argument("target", metavar="TARGET", help="wanted ratio, input/output speed")
    p.add_argument("--stages", type=int, default=2, metavar="N",
                   help=f"most stages, 1 to {MAX_STAGES} (default 2); fewer are tried too")
    p.add_argument("--tolerance", type=float, default=None, metavar="REL",
                   help="largest relative ratio error, e.g. 0.001 (default: none, the "
                        "nearest trains are listed, exact ones first)")
    p.add_argument("--kind", default="spur", metavar="KINDS",
                   help="stage kinds, comma separated: spur, belt, planetary (default spur)")
    p.add_argument("--min-teeth", type=int, default=12, metavar="Z",
                   help="fewest teeth on any gear or pulley (default 12)")
    p.add_argument("--max-teeth", type=int, default=100, metavar="Z",
                   help="most teeth on any gear or pulley (default 100)")
    p.add_argument("--module", type=float, default=1.0, metavar="MM",
                   help="module of spur and planetary gears, mm (default 1)")
    p.add_argument("--belt-profile", default="curv2", metavar="NAME",
                   help="belt profile of belt stages: " + ", ".join(PROFILES) + " (default curv2)")
    p.add_argument("--max-diameter", type=float, default=None, metavar="MM",
                   help="largest pitch diameter of any gear, pulley or ring, mm")
    p.add_argument("--max-center", type=float, default=None, metavar="MM",
                   help="largest center distance of a gear pair or sun and planet, mm")
    p.add_argument("--planets", type=int, default=3, metavar="N",
                   help="planets per planetary stage (default 3)")
    p.add_argument("--count", type=int, default=5, metavar="N",
                   help="how many trains to list (default 5)")
    p.add_argument("--json", action="store_true", help="print JSON instead of text")
    p.add_argument("--write", default=None, metavar="FILE.yaml",
                   help="write the best train as a parameter file (spur and belt stages)")
    p.add_argument("--name", default="drive", help="train name in the written file")
    p.add_argument("--face-width", type=float, default=None, metavar="MM",
                   help="face width of written gears, mm (default 8 x module)")

    def one_line_error(message):          # argparse's own errors: one line, exit 2
        print(f"pitchline {NAME}: {message}", file=sys.stderr)
        sys.exit(2)

    p.error = one_line_error
    p.set_defaults(func=run)
    return p


def _stage_text(k: int, st) -> str:
    if st.kind == "planetary":
        zs, zp, zr = st.teeth
        how = "ring held, sun in, carrier out" if st.driven_by == "sun" else \
            "ring held, carrier in, sun out"
        teeth = f"sun {zs}, planets {zp}, ring {zr} ({how})"
    else:
        teeth = f"{st.teeth[0]} -> {st.teeth[1]}"
    mark = "" if st.hunting else "  (common factor)"
    return f"    stage {k}  {st.kind:<9} {teeth:<24} i {st.ratio:.6g}{mark}"


def summary(result) -> str:
    """Plain text for a :class:`~gen.geometry.ratio_search.RatioSearch`."""
    tol = "none" if result.tolerance is None else f"{result.tolerance:g}"
    stages = f"{result.max_stages} stage{'s' if result.max_stages > 1 else ''}"
    lines = [f"target      {result.target:.10g}  (up to {stages} of "
             f"{', '.join(result.kinds)}; tolerance {tol})"]
    for n, sol in enumerate(result.solutions, start=1):
        err = "exact" if sol.exact else f"error {sol.error:+.3e}"
        turn = "same sense" if sol.direction > 0 else "reversed"
        lines.append(f"#{n:<3} ratio {sol.ratio:.10g}  {err}  {len(sol.stages)} "
                     f"stage{'s' if len(sol.stages) > 1 else ''}  size {sol.size:.1f} mm  "
                     f"output {turn}")
        lines += [_stage_text(k, st) for k, st in enumerate(sol.stages, start=1)]
    return "\n".join(lines)


def _limits(args) -> SearchLimits:
    return SearchLimits(min_teeth=args.min_teeth, max_teeth=args.max_teeth, module=args.module,
                        belt_profile=args.belt_profile, max_diameter=args.max_diameter,
                        max_center=args.max_center, planets=args.planets)


def run(args) -> int:
    """Search, print text or JSON, optionally write the best train; return the exit code."""
    from gen.geometry.ratio_yaml import train_yaml

    try:
        target = parse_target(args.target)
        kinds = _kinds(args.kind)
        if args.write is not None and os.path.exists(args.write):
            raise UsageError(f"{args.write} exists; not overwritten")
        result = search_ratio(target, max_stages=args.stages, kinds=kinds,
                              tolerance=args.tolerance, limits=_limits(args), count=args.count)
        text = None
        if args.write is not None and result.best is not None:
            text = train_yaml(result.best, name=args.name, module=args.module,
                              face_width=args.face_width, belt_profile=args.belt_profile)
    except PitchlineError as exc:
        print(f"pitchline {NAME}: {exc}", file=sys.stderr)
        return 2
    if args.json:
        print(json.dumps(result.as_dict(), indent=2))
    else:
        print(summary(result))
    if result.best is None:
        within = "within the tolerance" if args.tolerance is not None else "within the limits"
        print(f"pitchline {NAME}: no train found {within}", file=sys.stderr)
        return 1
    if text is not None:
        from gen.export.atomic import write_atomic

        write_atomic(args.write, text.encode())
        print(f"wrote {args.write}", file=sys.stderr if args.json else sys.stdout)
    return 0
