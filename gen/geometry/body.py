"""Neutral solid descriptions that the mesh and CAD-kernel layers both build (numpy only).

A :class:`Body` is the union of :class:`Prism` solids minus straight cuts. A prism is a planar
section swept along +Z from z0 to z1, optionally twisted about Z (helical gears), sheared along
+X (helical racks) or, with ``chevron``, twisted/sheared one way to the mid-height and back
(herringbone).
"""

from __future__ import annotations

from dataclasses import dataclass, field

from gen.geometry.section import Section


@dataclass(frozen=True, eq=False)
class Prism:
    section: Section
    z0: float
    z1: float
    twist: float = 0.0     # rad per mm of z, counter-clockwise seen from +Z
    shear: float = 0.0     # mm of +X per mm of z
    chevron: bool = False  # reverse twist/shear at mid-height

    @property
    def height(self) -> float:
        return self.z1 - self.z0

    @property
    def straight(self) -> bool:
        return self.twist == 0.0 and self.shear == 0.0


@dataclass(frozen=True, eq=False)
class RadialHole:
    """A cylindrical hole along a radius (set screws): axis in the XY plane at height z,
    at polar angle ``angle`` (rad), from radius r0 out to r1."""

    diameter: float
    z: float
    angle: float
    r0: float
    r1: float


@dataclass(frozen=True, eq=False)
class Body:
    solids: tuple
    cuts: tuple = field(default_factory=tuple)
    radial_holes: tuple = field(default_factory=tuple)
