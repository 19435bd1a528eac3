"""What exporting one part (or an assembly, or a plate) produced."""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass
class PartOutcome:
    name: str
    ok: bool
    status: str = "built"                       # built | up_to_date | failed
    files: dict = field(default_factory=dict)   # format -> {"path", "bytes", "sha256"}
    seconds: float = 0.0
    findings: list = field(default_factory=list)
    mass: dict = field(default_factory=dict)
    params_hash: str | None = None
    extra: dict = field(default_factory=dict)   # e.g. a plate's list of files and parts
