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
        except Exception as exc:  # say so, in the help and when used; never drop it silently
            _register_broken(sub, name, exc)
            continue
        mod.register(sub)
    return p


def _register_broken(sub, name: str, exc: Exception) -> None:
    """A command whose module cannot be imported: listed as unavailable, exits 2 with why."""
    why = f"{type(exc).__name__}: {exc}"
    p = sub.add_parser(name, help=f"(unavailable: {why})", add_help=False)
    p.add_argument("rest", nargs="*")

    def run(args):
        print(f"pitchline {name}: this command cannot load ({why}); reinstall pitchline "
              "with its dependencies", file=sys.stderr)
        return 2

    p.set_defaults(func=run)


def main(argv=None) -> int:
    from gen.errors import ParamError, PitchlineError, UsageError
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
    except UsageError as exc:
        print(f"pitchline: {exc}", file=sys.stderr)
        return 2
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
    except (MemoryError, RecursionError) as exc:
        print(f"pitchline: input too large to process ({type(exc).__name__})", file=sys.stderr)
        return 2
    except Exception as exc:  # a bug: one line, the traceback only on request
        import os
        if os.environ.get("PITCHLINE_TRACEBACK"):
            raise
        print(f"pitchline: internal error (a bug, please report it): {type(exc).__name__}: "
              f"{exc}; set PITCHLINE_TRACEBACK=1 to see where", file=sys.stderr)
        return 1


if __name__ == "__main__":
    sys.exit(main())
