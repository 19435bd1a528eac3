"""Output formats: the table the build picks writers from.

Each format names a module in :mod:`gen.export` whose ``write_part(part, path, made) -> int |
None`` writes one part (``made.triangles`` is its checked triangle mesh, ``made.solid()`` its
solid, built on first use) and returns the bytes written, or None when the part has nothing to
write in that format.
"""

from __future__ import annotations

import importlib
from dataclasses import dataclass


@dataclass(frozen=True)
class Format:
    name: str
    suffix: str
    module: str          # module under gen.export holding write_part
    kernel: bool         # needs the CAD kernel


FORMATS = {f.name: f for f in (
    Format("step", ".step", "step", True),
    Format("stl", ".stl", "stl", False),
    Format("3mf", ".3mf", "threemf", False),
    Format("dxf", ".dxf", "dxf", False),
)}
DEFAULT_FORMATS = ("step", "stl")


def writer(name: str):
    """The ``write_part`` function of format ``name``."""
    return importlib.import_module(f"gen.export.{FORMATS[name].module}").write_part


def parse_formats(text: str) -> list[str]:
    """Format names from a comma-separated list, in order, without repeats; ValueError names
    the unknown one and the allowed ones."""
    fmts = [f.strip().lower() for f in text.split(",") if f.strip()]
    bad = [f for f in fmts if f not in FORMATS]
    if bad or not fmts:
        raise ValueError(f"unknown format '{bad[0] if bad else text}'; allowed: "
                         + ", ".join(FORMATS))
    return list(dict.fromkeys(fmts))
