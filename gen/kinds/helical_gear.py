"""Part kind ``helical_gear``: involute helical gear (true helicoidal flanks)."""

from __future__ import annotations

from gen.kinds.base import Role
from gen.kinds.cylgear import GEAR_KEYS, make_gear
from gen.kinds.helical import BASIS, HAND, HELIX, normal_values

KIND = "helical_gear"
ROLE = Role.EXTERNAL_GEAR
KEYS = GEAR_KEYS + (HELIX, HAND, BASIS)
EXAMPLE = {"module": 1.5, "teeth": 24, "face_width": 10, "helix_angle": 20, "bore": 5}


def make(name, values, where):
    values = normal_values(values)
    return make_gear(name, values, where, kind=KIND, beta=values["helix_angle"],
                     hand=values["hand"])
