"""pitchline: parameter files to verified, printable gears, racks and pulleys.

Importing the package is cheap: numpy-level modules load on demand and the CAD
kernel (cadquery/OCP) is imported only inside :mod:`gen.solid` when a STEP is made.
"""

__version__ = "0.1.0"
