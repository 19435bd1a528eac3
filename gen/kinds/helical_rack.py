"""Part kind ``helical_rack``: rack with slanted teeth (the transverse section sheared along
the rack); it meshes with a helical pinion of the same normal module and helix angle and
the opposite hand."""

from __future__ import annotations

from gen.kinds.base import Role
from gen.kinds.helical import BASIS, HAND, HELIX, normal_values
from gen.kinds.rack import RACK_KEYS, make_rack

KIND = "helical_rack"
ROLE = Role.RACK
KEYS = RACK_KEYS + (HELIX, HAND, BASIS)
EXAMPLE = {"module": 1.5, "length": 120, "face_width": 10, "height": 8, "helix_angle": 20,
           "hand": "left"}


def make(name, values, where):
    values = normal_values(values)
    return make_rack(name, values, where, kind=KIND, beta=values["helix_angle"],
                     hand=values["hand"])
