"""Plain-text presentation of findings shared by the commands (no colours, fixed columns)."""

from __future__ import annotations

import sys

from gen.validate.findings import ERROR, INFO, WARNING

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
    noun = "mesh" if "+" in f.subject else "part"   # part names never hold '+'
    who = f"{noun} '{f.subject}'" if f.where else (f.subject or "-")
    return f"  {MARK[f.severity]}  {who}{f' ({loc})' if loc else ''}: {f.message}"


def print_findings(findings, *, stream=None, show_info: bool = True) -> None:
    stream = stream or sys.stdout
    for f in findings:
        if show_info or f.severity != INFO:
            stream.write(finding_line(f) + "\n")


def summary_line(n_parts: int, n_meshes: int, findings) -> str:
    c = count(findings)
    return (f"{n_parts} part{'s' if n_parts != 1 else ''}, {n_meshes} mesh"
            f"{'es' if n_meshes != 1 else ''}: {c[ERROR]} error{'s' if c[ERROR] != 1 else ''}, "
            f"{c[WARNING]} warning{'s' if c[WARNING] != 1 else ''}, {c[INFO]} note"
            f"{'s' if c[INFO] != 1 else ''}")
