"""Part kind ``miter_gear``: the 1:1, 90° straight bevel gear (its mate has the same teeth)."""

from __future__ import annotations

import math

from gen.kinds.base import Role
from gen.kinds.bevel_gear import COMMON, make_bevel

KIND = "miter_gear"
ROLE = Role.BEVEL_GEAR
KEYS = COMMON
EXAMPLE = {"module": 1.5, "teeth": 20, "face_width": 6, "bore": 5}


def make(name, values, where):
    return make_bevel(name, values, where, kind=KIND, mating_teeth=values["teeth"],
                      shaft_angle=math.pi / 2)
