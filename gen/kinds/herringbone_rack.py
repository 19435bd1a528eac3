"""Part kind ``herringbone_rack``: V-shaped teeth, two opposite helical halves meeting at the
mid-plane; it meshes with a herringbone pinion of the opposite hand."""

from __future__ import annotations

from gen.kinds.base import Role
from gen.kinds.helical import BASIS, HAND, HELIX, normal_values
from gen.kinds.rack import RACK_KEYS, make_rack

KIND = "herringbone_rack"
ROLE = Role.RACK
KEYS = RACK_KEYS + (HELIX, HAND, BASIS)
EXAMPLE = {"module": 1.5, "length": 120, "face_width": 12, "height": 8, "helix_angle": 25,
           "hand": "left"}


def make(name, values, where):
    values = normal_values(values)
    return make_rack(name, values, where, kind=KIND, beta=values["helix_angle"],
                     hand=values["hand"], chevron=True)
