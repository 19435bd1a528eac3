"""``pitchline new KIND [NAME]``: write a commented starter parameter file for a part kind."""

from __future__ import annotations

import os
import sys


def register(sub):
    from gen.kinds.base import KINDS

    p = sub.add_parser("new", help="write a commented starter parameter file",
                       description="Write NAME.yaml with every key of KIND, its unit, range and "
                                   "default. Kinds: " + ", ".join(sorted(KINDS))
                                   + "; assemblies: planetary, bevel_differential")
    p.add_argument("kind", metavar="KIND")
    p.add_argument("name", nargs="?", default=None, metavar="NAME",
                   help="part name and file stem (default: my_<kind>)")
    p.add_argument("--dir", default=".", help="folder to write into (default: current)")
    p.set_defaults(func=run)


def _fmt(key) -> str:
    d = key.default
    if key.kind == "angle" and isinstance(d, float):
        return f"{d:g}"
    if isinstance(d, bool):
        return "true" if d else "false"
    if isinstance(d, float):
        return f"{d:g}"
    return str(d)


def starter_text(kind: str, name: str) -> str:
    import importlib

    from gen.kinds.base import KINDS

    mod = importlib.import_module(f"gen.kinds.{KINDS[kind]}")
    lines = [f"# pitchline starter file for a {kind}. Units: mm and degrees.",
             "# Keys marked 'required' must be set; the rest show their default.",
             "parts:", f"  {name}:", f"    kind: {kind}"]
    return "\n".join(lines + _key_lines(mod.KEYS, getattr(mod, "EXAMPLE", {}))) + "\n"


def assembly_starter_text(kind: str, name: str) -> str:
    """Starter file for an assembly kind (``assemblies:`` section)."""
    from gen.assemblies import ASSEMBLY_KINDS
    import importlib

    mod = importlib.import_module(f"gen.assemblies.{ASSEMBLY_KINDS[kind]}")
    lines = [f"# pitchline starter file for a {kind} assembly. Units: mm and degrees.",
             "# Keys marked 'required' must be set; the rest show their default.",
             "assemblies:", f"  {name}:", f"    kind: {kind}"]
    keys = [k for k in mod.KEYS if k.name != "kind"]
    return "\n".join(lines + _key_lines(keys, getattr(mod, "EXAMPLE", {}))) + "\n"


def _key_lines(keys, example) -> list[str]:
    lines = []
    for key in keys:
        if (key.kind == "angle" and key.hi == 0) or (key.kind == "enum" and len(key.choices) == 1):
            continue  # keys that only exist so trains can pass shared values through
        if key.kind == "map" and key.name not in example:
            subs = ", ".join(k.name for k in key.sub)
            lines.append(f"    # {key.name}: {{{subs}}}    # {key.doc}")
            continue
        note = key.doc or ""
        rng = key.range_text()
        comment = "; ".join(x for x in (note, rng) if x)
        if key.name in example:
            lines.append(f"    {key.name}: {example[key.name]}    # {comment}")
        elif key.required:
            lines.append(f"    {key.name}:     # required; {comment}")
        elif key.default is None or (key.kind == "angle" and key.hi == 0):
            lines.append(f"    # {key.name}:    # {comment}")
        else:
            lines.append(f"    {key.name}: {_fmt(key)}    # {comment}")
    return lines


def run(args) -> int:
    from gen.kinds.base import KINDS
    from gen.params.schema import suggest

    from gen.assemblies import ASSEMBLY_KINDS

    args.kind = {"coupon": "fit_coupon"}.get(args.kind, args.kind)
    if args.kind not in KINDS and args.kind not in ASSEMBLY_KINDS:
        print(f"pitchline new: unknown kind '{args.kind}'{suggest(args.kind, KINDS)}; "
              f"allowed: {', '.join(sorted(KINDS) + sorted(ASSEMBLY_KINDS))}", file=sys.stderr)
        return 2
    name = args.name or f"my_{args.kind}"
    path = os.path.join(args.dir, f"{name}.yaml")
    if os.path.exists(path):
        print(f"pitchline new: {path} exists; not overwritten", file=sys.stderr)
        return 2
    from gen.export.atomic import write_atomic

    text = (assembly_starter_text if args.kind in ASSEMBLY_KINDS else starter_text)(args.kind, name)
    write_atomic(path, text.encode())
    print(f"wrote {path}")
    return 0
