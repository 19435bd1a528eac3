"""The ``pitchline`` command line. Subcommands live in :mod:`gen.cli`, one module each.

Exit codes: 0 fine, 1 validation or check failure, 2 usage or unreadable input.
"""

from __future__ import annotations

import argparse
import importlib
import sys

#: command -> one-line help for the top-level ``--help``. The command's own module (which may
#: import numpy and the rest) is imported only when that command is named on the line, so
#: ``pitchline --help`` loads argparse and nothing else.
COMMANDS = {
    "build": "validate, then write STEP/STL files, a manifest and a report",
    "check": "validate parameter files and every declared mesh (no CAD kernel)",
    "new": "write a commented starter parameter file",
    "belt": "open belt drive: belt length, center distance, wrap, teeth in mesh",
    "ratio": "tooth counts for a wanted speed ratio over 1 to 3 stages",
}


class _Stub:
    """Stands in for a command module that is not imported: registers a help-only parser."""

    def __init__(self, name: str):
        self.name = name

    def register(self, sub):
        sub.add_parser(self.name, help=COMMANDS[self.name], add_help=False)


def _named_command(argv) -> str | None:
    """The first word of ``argv`` that is a command (options before it are skipped)."""
    for word in argv:
        if word in COMMANDS:
            return word
        if not word.startswith("-"):
            return None
    return None


def parser(argv=None) -> argparse.ArgumentParser:
    """The top-level parser. Without ``argv`` every command module is imported (full
    parsers); with it, only the command that ``argv`` names."""
    p = argparse.ArgumentParser(
        prog="pitchline",
        description="Parameter files to verified, printable gears, racks and pulleys. "
                    "Units: mm and degrees.")
    from gen import __version__
    p.add_argument("--version", action="version", version=f"pitchline {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    wanted = None if argv is None else _named_command(argv)
    for name in COMMANDS:
        if argv is not None and name != wanted:
            _Stub(name).register(sub)
            continue
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
    argv = sys.argv[1:] if argv is None else list(argv)
    p = parser(argv)
    args = p.parse_args(argv)
    from gen.errors import ParamError, PitchlineError, UsageError
    from gen.params.yamlio import InputError

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
