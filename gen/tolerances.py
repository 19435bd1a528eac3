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


@dataclass(frozen=True)
class Limits:
    """Design limits the checks apply (each names its basis)."""

    #: least transverse contact ratio of a pair (common practice)
    min_contact_ratio: float = 1.1
    #: least strength / peak stress of a spinning rotor before a warning (issue 16; common
    #: practice for rotating parts designed on yield, the part's own key can raise it)
    rotor_safety_factor: float = 2.0


TOL = Tolerances()
LIMITS = Limits()
