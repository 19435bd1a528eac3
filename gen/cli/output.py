"""Plain-text presentation of findings shared by the commands (no colours, fixed columns)."""

from __future__ import annotations

import sys

from gen.findings import ERROR, INFO, WARNING

MARK = {ERROR: "ERR ", WARNING: "WARN", INFO: "note"}


def count(findings) -> dict:
    out = {ERROR: 0, WARNING: 0, INFO: 0}
    for f in findings:
        out[f.severity] += 1
    return out


def finding_line(f) -> str:
    """One line per finding: mark, who and where, then the message."""
    if f.code == "parameter":          # a ParamError already names file, part and key
        return f"  {MARK[f.severity]}  {f.message}"
    loc = ", ".join(x for x in (f.where, f"key '{f.key}'" if f.key else "") if x)
    who = f"{f.scope} '{f.subject}'" if f.where else (f.subject or "-")
    return f"  {MARK[f.severity]}  {who}{f' ({loc})' if loc else ''}: {f.message}"


def print_findings(findings, *, stream=None, show_info: bool = True) -> None:
    stream = stream or sys.stdout
    for f in findings:
        if show_info or f.severity != INFO:
            stream.write(finding_line(f) + "\n")


def _n(k: int, word: str, plural: str | None = None) -> str:
    return f"{k} {word if k == 1 else (plural or word + 's')}"


def result_summary(result) -> str:
    """'9 parts, 2 meshes, 3 drives, 1 assembly: 0 errors, ...' for a CheckResult."""
    n_parts = len(set(result.project.parts) | set(result.models))
    bits = [_n(n_parts, "part"), _n(len(result.pairs), "mesh", "meshes")]
    if result.drives:
        bits.append(_n(len(result.drives), "drive"))
    if result.assemblies:
        bits.append(_n(len(result.assemblies), "assembly", "assemblies"))
    c = count(result.findings)
    return (", ".join(bits) + f": {_n(c[ERROR], 'error')}, {_n(c[WARNING], 'warning')}, "
            f"{_n(c[INFO], 'note')}")
