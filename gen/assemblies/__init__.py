"""Assembly kinds: one module per kind, each expanding an ``assemblies:`` entry into parts.

An assembly kind module defines ``KIND``, ``KEYS`` (its key table, including ``kind``) and
``build(entry, where) -> (Assembly, {part name: Part})``; it registers by one line in
:data:`ASSEMBLY_KINDS`.
"""

from __future__ import annotations

import importlib
from dataclasses import dataclass, field

from gen.params.schema import Where, suggest

#: assembly kind word -> module under gen.assemblies
ASSEMBLY_KINDS = {
    "bevel_differential": "bevel_differential",
    "planetary": "planetary",
}


def assembly_module(kind, where: Where):
    if kind not in ASSEMBLY_KINDS:
        raise where.error("kind", f"unknown assembly kind {kind!r}"
                          f"{suggest(str(kind), ASSEMBLY_KINDS)}",
                          allowed=", ".join(ASSEMBLY_KINDS))
    return importlib.import_module(f"gen.assemblies.{ASSEMBLY_KINDS[kind]}")


@dataclass
class Assembly:
    """What an assembly kind returns besides its parts (lengths mm, angles deg)."""

    name: str
    kind: str
    values: dict
    parts: dict                                    # member role -> part name
    findings: list = field(default_factory=list)
    kinematics: dict = field(default_factory=dict)
    file: str = ""
    reports: list = field(default_factory=list)    # interference sweeps of the placed parts
    sizes: dict = field(default_factory=dict)
    poses: dict = field(default_factory=dict)      # part name -> 4×4 pose in the assembly
    detail: object = None                          # the kind's own geometry (e.g. the differential)
