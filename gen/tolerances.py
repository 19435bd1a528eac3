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
    #: relative float round-off allowed on top of the chord-tolerance bound when a rotor's mass
    #: properties are measured on slices of its exported triangles (issue 16)
    rotor_slice_rel: float = 1e-6
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
    #: largest normal backlash of a mesh = 2 print clearances + this × ISO/TR 10064-2 j_bn,min
    #: (basis ISO/TR 10064-2; the multiple is this project's choice; ``max_backlash`` in a
    #: mesh overrides it)
    max_backlash_iso_multiple: float = 2.0
    #: nozzle assumed for the printability checks when a part names no fit (mm; common
    #: practice for FDM printers), and lines per load-bearing wall (common practice)
    default_nozzle: float = 0.4
    wall_lines: int = 2
    #: least rim under an internal gear's root, in tooth depths (ISO 6336-3 backup ratio
    #: s_R/h_t ≥ 1.2 for a full rim factor, from memory) — issue 14
    ring_backup_ratio: float = 1.2
    #: least wall (mm) around a mounting hole in a printed rim (common practice: ≥ 2–3 lines
    #: of a 0.4 mm nozzle) — issue 14
    min_wall: float = 1.0
    # issue 15: power screws (common practice)
    #: Euler buckling load over the axial load the screw is to carry, at least
    screw_buckling_safety: float = 2.0
    #: largest share of the first critical (whirling) speed a screw may run at
    screw_whirl_fraction: float = 0.8
    #: least strength / peak stress of a spinning rotor before a warning (issue 16; common
    #: practice for rotating parts designed on yield, the part's own key can raise it)
    rotor_safety_factor: float = 2.0
    #: most outline points of one part (issue 12: a 1000-tooth gear has ~126 000; a rack of
    #: module 0.05 over 5 m, 223 000, builds for minutes) — a work budget, not a standard
    max_outline_points: int = 150_000
    #: most estimated triangles of one part (a binary STL of 4 million is 200 MB)
    max_triangles: int = 4_000_000


TOL = Tolerances()
LIMITS = Limits()
