"""Progress lines of a build: a one-line bar on a terminal, plain lines otherwise."""

from __future__ import annotations

import sys


class Progress:
    def __init__(self, total: int, stream=None, enabled: bool | None = None):
        self.total, self.done = total, 0
        self.stream = stream or sys.stdout
        self.tty = self.stream.isatty() if enabled is None else enabled

    def step(self, outcome) -> None:
        self.done += 1
        sizes = ", ".join(f"{f} {v['bytes'] / 1024:.0f} kB" for f, v in outcome.files.items())
        if self.tty:
            n = 24
            fill = int(n * self.done / max(self.total, 1))
            self.stream.write(f"\r  [{'=' * fill}{' ' * (n - fill)}] {self.done}/{self.total} "
                              f"{outcome.name[:30]:<30}")
            if self.done == self.total:
                self.stream.write("\n")
        else:
            state = {"built": "built ", "up_to_date": "kept  ", "failed": "FAILED"}[outcome.status]
            self.stream.write(f"  {state} {outcome.name:<26} {sizes:<30} {outcome.seconds:6.2f} s\n")
        self.stream.flush()
