"""Build: export every part that passed :func:`gen.check.check` (see :mod:`gen.build.run`)."""

from gen.build.export import export_part
from gen.build.progress import Progress
from gen.build.run import BuildResult, build

__all__ = ["BuildResult", "Progress", "build", "export_part"]
