"""Every numeric tolerance and design limit in one place (mm unless stated)."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Tolerances:
    #: golden-section refinement of the rack-rolling envelope (mm of arc)
    envelope: float = 1e-9
    #: generated flank vs analytic involute, and undercut detection (mm)
    flank: float = 1e-6
    #: measured profile size vs ISO 21771 formula (mm, absolute)
    size: float = 2e-4
    #: measured tooth thickness vs formula, as a fraction of the module
    thickness_rel: float = 2e-3
    #: chordal deviation of meshes from the exact profile (mm)
    chord: float = 0.01
    #: measured size on an exported STL vs formula (mm)
    mesh_size: float = 0.02
    #: angular pitch uniformity (rad)
    angle: float = 1e-6
    #: added to the chord tolerance when sizes are measured on slices of exported triangles
    #: (slicing and polygon measurement round-off, mm)
    slice_extra: float = 2e-3


@dataclass(frozen=True)
class Limits:
    """Design limits the checks apply (each names its basis)."""

    #: least transverse contact ratio of a pair (common practice)
    min_contact_ratio: float = 1.1
    #: most outline points of one part (issue 12: a 1000-tooth gear has ~126 000; a rack of
    #: module 0.05 over 5 m, 223 000, builds for minutes) — a work budget, not a standard
    max_outline_points: int = 150_000
    #: most estimated triangles of one part (a binary STL of 4 million is 200 MB)
    max_triangles: int = 4_000_000


TOL = Tolerances()
LIMITS = Limits()
