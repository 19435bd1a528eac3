"""Part kind ``spur_gear``: external involute spur gear, rack-generated profile."""

from __future__ import annotations

from gen.params.schema import Key
from gen.kinds.base import Role
from gen.kinds.cylgear import GEAR_KEYS, make_gear

KIND = "spur_gear"
ROLE = Role.EXTERNAL_GEAR
KEYS = GEAR_KEYS + (
    Key("helix_angle", "angle", 0.0, lo=0, hi=0, doc="spur gears have none; use helical_gear"),
    Key("module_basis", "enum", "normal", choices=("normal",)),
)


def make(name, values, where):
    return make_gear(name, values, where, kind=KIND)

#: values filled into the starter file written by ``pitchline new spur_gear``
EXAMPLE = {"module": 1.5, "teeth": 24, "face_width": 8, "bore": 5}
