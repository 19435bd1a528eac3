"""Build: export every checked part (and assembly) to files, incrementally, in parallel.

``run`` orchestrates; ``export`` writes one part; ``cache`` decides what is up to date;
``manifest``, ``plate``, ``assembly``, ``clean``, ``cluster`` and ``progress`` do one job each.
"""

from gen.build.export import export_part, make_solid, make_triangles
from gen.build.outcome import PartOutcome
from gen.build.progress import Progress
from gen.build.run import BuildResult, build

__all__ = ["BuildResult", "PartOutcome", "Progress", "build", "export_part", "make_solid",
           "make_triangles"]
