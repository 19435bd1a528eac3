"""ISO 53:1998 basic rack tooth profiles A–D, in units of the module.

The basic rack is the rack a gear meshes with; the generating (cutter) rack is its
counterpart: cutter addendum = basic-rack dedendum h_fP, cutter tip radius = ρ_fP.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from gen.errors import GeometryError


@dataclass(frozen=True)
class BasicRack:
    """Basic rack proportions as multiples of the module (angles in radians)."""

    name: str
    alpha: float          # pressure angle α_P (rad)
    addendum: float       # h_aP / m
    dedendum: float       # h_fP / m
    root_radius: float    # ρ_fP / m

    def with_alpha(self, alpha: float) -> "BasicRack":
        return BasicRack(self.name, alpha, self.addendum, self.dedendum, self.root_radius)


# ISO 53:1998 profiles (from memory, see shared references): α_P = 20°, h_aP = 1.0 m;
# h_fP = 1.25 m (A, B, C) or 1.40 m (D); ρ_fP = 0.38 / 0.30 / 0.25 / 0.39 m.
ISO53 = {
    "A": BasicRack("A", math.radians(20.0), 1.0, 1.25, 0.38),
    "B": BasicRack("B", math.radians(20.0), 1.0, 1.25, 0.30),
    "C": BasicRack("C", math.radians(20.0), 1.0, 1.25, 0.25),
    "D": BasicRack("D", math.radians(20.0), 1.0, 1.40, 0.39),
}


def basic_rack(profile: str = "A", alpha_deg: float | None = None) -> BasicRack:
    """Look up an ISO 53 profile, optionally with another pressure angle (same heights)."""
    try:
        rack = ISO53[profile.upper()]
    except KeyError:
        raise GeometryError(f"unknown basic rack profile {profile!r}; allowed: A, B, C, D") from None
    if alpha_deg is not None:
        rack = rack.with_alpha(math.radians(alpha_deg))
    return rack


def max_root_radius(rack: BasicRack, thickness_factor: float = 1.0) -> float:
    """Largest tip radius (/m) the cutter tooth takes before its two tip fillets meet.

    Half the cutter tip flat is w0 − h_fP tan α − ρ (1 − sin α)/cos α with w0 = π/4·factor.
    """
    a = rack.alpha
    w0 = math.pi / 4.0 * thickness_factor
    return (w0 - rack.dedendum * math.tan(a)) / ((1.0 - math.sin(a)) / math.cos(a))
