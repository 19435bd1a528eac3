"""Shaft features cut through a part: plain bore, D-flat, DIN 6885-1 keyway (numpy only)."""

from __future__ import annotations

import math
from dataclasses import dataclass

from gen.errors import GeometryError
from gen.geometry.section import Arc, Line, Loop, circle

# DIN 6885-1 parallel keys (doc, see shared references): shaft over–up to (mm) → b, h, t1, t2
DIN6885 = (
    (6, 8, 2, 2, 1.2, 1.0),
    (8, 10, 3, 3, 1.8, 1.4),
    (10, 12, 4, 4, 2.5, 1.8),
    (12, 17, 5, 5, 3.0, 2.3),
    (17, 22, 6, 6, 3.5, 2.8),
    (22, 30, 8, 7, 4.0, 3.3),
)


def keyway_for(diameter: float) -> tuple[float, float]:
    """(key width b, hub groove depth t2) for a shaft diameter, DIN 6885-1 form A."""
    for lo, hi, b, _h, _t1, t2 in DIN6885:
        if lo < diameter <= hi:
            return float(b), float(t2)
    raise GeometryError(f"no DIN 6885-1 key listed for a {diameter:g} mm shaft "
                        "(table covers over 6 up to 30 mm)")


@dataclass(frozen=True)
class Bore:
    """A hole along the part axis. ``flat`` is the D-flat depth (mm, on +Y side); ``keyway``
    adds a DIN 6885-1 hub groove on +Y. ``allowance`` enlarges the diameter for printing."""

    diameter: float
    flat: float = 0.0
    keyway: bool = False
    allowance: float = 0.0

    @property
    def d(self) -> float:
        return self.diameter + self.allowance

    def outer_radius(self) -> float:
        """Largest radius the hole reaches (keyway bottom included)."""
        r = self.d / 2.0
        if self.keyway:
            b, t2 = keyway_for(self.diameter)
            return math.hypot(b / 2.0, r + t2)
        return r

    def loop(self) -> Loop:
        r = self.d / 2.0
        if self.flat and self.keyway:
            raise GeometryError("a bore takes a D-flat or a keyway, not both")
        if self.flat:
            if not 0 < self.flat < r:
                raise GeometryError("D-flat depth must be between 0 and the bore radius")
            yf = r - self.flat
            a = math.asin(yf / r)
            # arc from the flat's right end round the bottom to its left end, then the flat
            arc = Arc((0.0, 0.0), r, math.pi - a, 2 * math.pi + a)
            return Loop((arc, Line(tuple(arc.end), tuple(arc.start))))
        if self.keyway:
            b, t2 = keyway_for(self.diameter)
            if b / 2.0 >= r:
                raise GeometryError("keyway wider than the bore")
            a = math.asin(b / 2.0 / r)
            arc = Arc((0.0, 0.0), r, math.pi / 2 + a, 2 * math.pi + math.pi / 2 - a)
            y_top = r + t2
            p_r = arc.end
            p_l = arc.start
            return Loop((arc, Line(tuple(p_r), (b / 2.0, y_top)),
                         Line((b / 2.0, y_top), (-b / 2.0, y_top)),
                         Line((-b / 2.0, y_top), tuple(p_l))))
        return circle(r)
