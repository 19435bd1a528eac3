"""The project's exception root and the parameter error that names where a value came from."""

from __future__ import annotations


#: longest value a message repeats (characters); longer values are cut with "…"
MAX_SHOWN = 60


class PitchlineError(Exception):
    """Base of every error pitchline raises on purpose (never a bare Exception)."""


class ParamError(PitchlineError):
    """A parameter file value is missing, malformed or out of range.

    The message names the file, line, section entry (a part, mesh, drive, assembly, fit …),
    key, value and what is allowed, in one line.
    """

    def __init__(self, message: str, *, file: str | None = None, line: int | None = None,
                 part: str | None = None, key: str | None = None, value=None,
                 allowed: str | None = None, section: str = "part"):
        self.file, self.line, self.part, self.key = file, line, part, key
        self.section = section
        self.value, self.allowed, self.detail = value, allowed, message
        super().__init__(self.one_line())

    def one_line(self) -> str:
        where = self.file or "<input>"
        if self.line is not None:
            where += f":{self.line}"
        bits = [where]
        if self.part:
            bits.append(f"{self.section} '{self.part}'")
        if self.key:
            bits.append(f"key '{self.key}'")
        text = ", ".join(bits) + ": " + self.detail
        if self.value is not None and "got" not in self.detail:
            shown = repr(self.value)
            if len(shown) > MAX_SHOWN:
                shown = shown[:MAX_SHOWN - 1] + "…"
            text += f" (got {shown})"
        if self.allowed:
            text += f"; allowed: {self.allowed}"
        return text


class UsageError(PitchlineError):
    """A command-line value cannot be used (exit code 2): an output folder that is a file …"""


class GeometryError(PitchlineError):
    """Geometry could not be generated for otherwise well-formed parameters."""


class ExportError(PitchlineError):
    """Writing an output file failed; no partial file is left behind."""
