"""Output formats: name → (file suffix, needs the CAD kernel)."""

from __future__ import annotations

FORMATS = {
    "step": (".step", True),
    "stl": (".stl", False),
    "3mf": (".3mf", False),
    "dxf": (".dxf", False),
}
DEFAULT_FORMATS = ("step", "stl")
