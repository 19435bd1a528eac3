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
    #: issue 11: a facet thinner than this (twice its area over its longest edge, mm) in a
    #: re-read STL/3MF is degenerate; far below the chord tolerance, above float32 round-off
    #: of a true sliver (area exactly 0 in the file)
    facet_height: float = 1e-7
    #: issue 11: edge tolerance (mm) a solid's edges may carry before STEP export
    edge_tolerance: float = 1e-4


@dataclass(frozen=True)
class Limits:
    """Design limits the checks apply (each names its basis)."""

    #: least transverse contact ratio of a pair (common practice)
    min_contact_ratio: float = 1.1


TOL = Tolerances()
LIMITS = Limits()
