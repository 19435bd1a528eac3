"""pitchline: parameter files to verified, printable gears, racks and pulleys.

Importing the package is cheap: numpy-level modules load on demand and the CAD
kernel (OCP) is imported only inside :mod:`gen.solid` and :mod:`gen.export.step` when a STEP
is made; cadquery only by :func:`gen.api.to_cadquery`.
"""

__version__ = "0.1.0"
