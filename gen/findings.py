"""Findings: what validation says about a part, a pair, a drive or an assembly.

A leaf module (like :mod:`gen.errors`) so every layer can report without importing upward.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

ERROR, WARNING, INFO = "error", "warning", "info"
_RANK = {ERROR: 0, WARNING: 1, INFO: 2}


@dataclass(frozen=True)
class Finding:
    severity: str         # error | warning | info
    code: str             # short stable identifier, e.g. "undercut"
    message: str          # one line a person reads
    subject: str = ""     # part, mesh or drive name
    source: str = ""      # formula / standard behind it
    key: str = ""         # parameter the finding is about, when there is one
    where: str = ""       # file:line of that parameter (filled in by the pipeline)
    scope: str = "part"   # what the subject is: part, mesh, drive or assembly

    def as_dict(self) -> dict:
        return asdict(self)


def worst(findings) -> str | None:
    ranked = sorted((_RANK[f.severity] for f in findings), default=None)
    if ranked is None:
        return None
    return {v: k for k, v in _RANK.items()}[ranked[0]]


def has_errors(findings) -> bool:
    return any(f.severity == ERROR for f in findings)
