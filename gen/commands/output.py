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


def print_findings(findings, *, stream=None, show_info: bool = True) -> None:
    stream = stream or sys.stdout
    rows = [f for f in findings if show_info or f.severity != INFO]
    if not rows:
        return
    width = min(28, max(len(f.subject or "-") for f in rows))
    for f in rows:
        stream.write(f"  {MARK[f.severity]}  {(f.subject or '-'):<{width}}  {f.message}\n")


def summary_line(n_parts: int, n_meshes: int, findings) -> str:
    c = count(findings)
    return (f"{n_parts} part{'s' if n_parts != 1 else ''}, {n_meshes} mesh"
            f"{'es' if n_meshes != 1 else ''}: {c[ERROR]} error{'s' if c[ERROR] != 1 else ''}, "
            f"{c[WARNING]} warning{'s' if c[WARNING] != 1 else ''}, {c[INFO]} note"
            f"{'s' if c[INFO] != 1 else ''}")
