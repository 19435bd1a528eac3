"""The ``pitchline`` command line. Subcommands live in :mod:`gen.cli`, one module each.

Exit codes: 0 fine, 1 validation or check failure, 2 usage or unreadable input.
"""

from __future__ import annotations

import argparse
import importlib
import sys

COMMANDS = ("build", "check", "new", "belt", "ratio")


def parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="pitchline",
        description="Parameter files to verified, printable gears, racks and pulleys. "
                    "Units: mm and degrees.")
    from gen import __version__
    p.add_argument("--version", action="version", version=f"pitchline {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    for name in COMMANDS:
        try:
            mod = importlib.import_module(f"gen.cli.{name}")
        except ModuleNotFoundError:
            continue
        mod.register(sub)
    return p


def main(argv=None) -> int:
    from gen.errors import ParamError, PitchlineError
    from gen.params.yamlio import InputError

    p = parser()
    args = p.parse_args(argv)
    if not getattr(args, "func", None):
        p.print_help()
        return 2
    try:
        return int(args.func(args) or 0)
    except InputError as exc:
        print(f"pitchline: {exc.one_line()}", file=sys.stderr)
        return 2
    except ParamError as exc:
        print(f"pitchline: {exc.one_line()}", file=sys.stderr)
        return 1
    except PitchlineError as exc:
        print(f"pitchline: {exc}", file=sys.stderr)
        return 1
    except BrokenPipeError:  # output piped into a pager or head that closed early
        import os
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return 0
    except KeyboardInterrupt:
        print("pitchline: interrupted", file=sys.stderr)
        return 130


if __name__ == "__main__":
    sys.exit(main())
