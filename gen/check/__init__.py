"""Check: parameter files → validated parts, meshes (gears in engagement), drives, assemblies.

No CAD kernel and no triangle library is imported here; :mod:`gen.build` exports what passes.
"""

from gen.check.project import CheckResult, check

__all__ = ["CheckResult", "check"]
