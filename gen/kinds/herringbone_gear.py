"""Part kind ``herringbone_gear``: two opposite helical halves, mirror images about the
mid-plane (no axial thrust), with an optional plain centre groove."""

from __future__ import annotations

from gen.kinds.base import Role
from gen.kinds.cylgear import GEAR_KEYS, make_gear
from gen.kinds.helical import BASIS, GROOVE, HAND, HELIX, normal_values

KIND = "herringbone_gear"
ROLE = Role.EXTERNAL_GEAR
KEYS = GEAR_KEYS + (HELIX, HAND, BASIS, GROOVE)
EXAMPLE = {"module": 1.5, "teeth": 24, "face_width": 12, "helix_angle": 25, "bore": 5}


def make(name, values, where):
    values = normal_values(values)
    return make_gear(name, values, where, kind=KIND, beta=values["helix_angle"],
                     hand=values["hand"], chevron=True, groove=values["groove"])
