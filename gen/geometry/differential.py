"""Bevel-gear differential: two input gears on one axis, one or two output gears on a carrier.

World frame (mm, rad); the common pitch-cone apex is the origin.

* The inputs turn about the world X axis and face each other: ``input_1`` sits on the −X
  side, ``input_2`` on the +X side. The carrier turns about X as well; its axis is
  perpendicular to X and lies along world +Z when the carrier angle is 0. ``output_1`` sits on
  the carrier axis on the +Z side (at carrier angle 0), ``output_2`` opposite it.
* Signs (right-hand rule): the input angles θ1, θ2 and the carrier angle c are rotations about
  world +X; the output roll is the rotation of each output relative to the carrier, about the
  carrier axis pointing from the apex out to that output.
* Kinematics: c = (θ1 + θ2)/2, roll = (θ1 − θ2)/2 · z_in/z_out. Derivation: in the carrier
  frame the inputs turn θ1 − c and θ2 − c; the pitch-point velocities at the two meshes of one
  output (pitch radii r_in = m z_in/2, r_out = m z_out/2) give
  r_in (θ1 − c) = r_out·roll = −r_in (θ2 − c), which solves to the two formulas.
  Inverse: θ1 = c + roll·z_out/z_in, θ2 = c − roll·z_out/z_in.

Every gear is built in its own frame (axis +Z, back face z = 0, apex at z = its mounting
distance, tooth 0 centred on own +X; see :mod:`gen.geometry.bevel`). Its pose maps that frame
to the world: own +Z points from the gear to the origin and the apex lands on the origin.

Tooth phase (how the teeth are made to mesh): at a pitch point P a gear's teeth lie along the
common pitch line at arcs πm(k − f) from P, where f = β/p is P's own polar angle β in units
of the angular pitch p = 2π/z (f integer: a tooth centred on P). The two gears' increasing own
angles move P's material along t = w × P (w the own axis), with σ = sign(t_a · t_b). A tooth
of one gear enters a space of the other when f_b ≡ σ f_a + ½ (mod 1); the phase of gear b is
solved from that. Rolling keeps the relation because the kinematics turn the gears by angles
in the ratio σ z_a/z_b. ``input_1`` is the reference (its tooth 0 on P of its mesh with
``output_1``); ``output_1``, ``input_2`` and ``output_2`` follow, and the fourth mesh
(``input_2``/``output_2``) is then checked, not imposed (it always holds).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from gen.errors import GeometryError
from gen.geometry.basic_rack import BasicRack
from gen.geometry.bevel import BevelSizes, bevel_sizes

INPUTS = ("input_1", "input_2")
OUTPUTS = ("output_1", "output_2")
#: the meshing pairs (input, output)
MESHES = (("input_1", "output_1"), ("input_2", "output_1"),
          ("input_1", "output_2"), ("input_2", "output_2"))

# own-frame axes (columns: images of own X, Y, Z) at rest, carrier angle 0
_X, _Y, _Z = np.eye(3)
_REST = {
    "input_1": np.column_stack([_Z, -_Y, _X]),
    "input_2": np.column_stack([_Z, _Y, -_X]),
    "output_1": np.column_stack([-_X, _Y, -_Z]),
    "output_2": np.column_stack([-_X, -_Y, _Z]),
}


def carrier_and_roll(theta1: float, theta2: float, z_in: int, z_out: int) -> tuple[float, float]:
    """(carrier angle, output roll) for input angles θ1, θ2 (rad): ((θ1+θ2)/2, (θ1−θ2)/2 · z_in/z_out)."""
    return 0.5 * (theta1 + theta2), 0.5 * (theta1 - theta2) * z_in / z_out


def input_commands(carrier: float, roll: float, z_in: int, z_out: int) -> tuple[float, float]:
    """(θ1, θ2) that give the wanted carrier angle and output roll (rad)."""
    d = roll * z_out / z_in
    return carrier + d, carrier - d


def rot_x(a: float) -> np.ndarray:
    c, s = math.cos(a), math.sin(a)
    return np.array([[1.0, 0.0, 0.0], [0.0, c, -s], [0.0, s, c]])


def rot_z(a: float) -> np.ndarray:
    c, s = math.cos(a), math.sin(a)
    return np.array([[c, -s, 0.0], [s, c, 0.0], [0.0, 0.0, 1.0]])


def own_to_world(rotation: np.ndarray, mounting_distance: float, axial_shift: float = 0.0) -> np.ndarray:
    """4×4 transform: own frame (apex at (0, 0, H)) → world with the apex at the origin.

    ``axial_shift`` moves the gear along its own +Z (toward the apex) by that many mm.
    """
    T = np.eye(4)
    T[:3, :3] = rotation
    T[:3, 3] = rotation @ np.array([0.0, 0.0, axial_shift - mounting_distance])
    return T


def apply(T: np.ndarray, pts: np.ndarray) -> np.ndarray:
    """Apply a 4×4 transform to (n, 3) points."""
    return pts @ T[:3, :3].T + T[:3, 3]


def pitch_point(Ta: np.ndarray, sa: BevelSizes, Tb: np.ndarray, sb: BevelSizes) -> np.ndarray:
    """Large-end pitch point of two posed gears with a common apex (world).

    With u the unit vectors from the apex toward each gear (−own Z), the pitch line lies in
    their plane at δa from ua and δb from ub: (sin δb ua + sin δa ub) / sin Σ, length Re.
    """
    ua, ub = -Ta[:3, 2], -Tb[:3, 2]
    sig = math.acos(float(np.clip(ua @ ub, -1.0, 1.0)))
    d = (math.sin(sb.delta) * ua + math.sin(sa.delta) * ub) / math.sin(sig)
    return sa.Re * d / np.linalg.norm(d)


def _pitch_fraction(T: np.ndarray, z: int, P: np.ndarray) -> float:
    """f = β / (2π/z): the pitch point's own polar angle in units of the angular pitch."""
    q = np.linalg.solve(T[:3, :3], P - T[:3, 3])
    return math.atan2(q[1], q[0]) * z / (2.0 * math.pi)


def _sense(Ta: np.ndarray, Tb: np.ndarray, P: np.ndarray) -> float:
    ta = np.cross(Ta[:3, 2], P - Ta[:3, 3])
    tb = np.cross(Tb[:3, 2], P - Tb[:3, 3])
    return 1.0 if float(ta @ tb) > 0 else -1.0


def mesh_phase(Ta: np.ndarray, za: int, Tb_rest: np.ndarray, zb: int, P: np.ndarray) -> float:
    """Phase φ (rad about own +Z) that puts gear b's teeth into gear a's spaces at P.

    ``Tb_rest`` is b's pose without phase; the meshed pose is ``Tb_rest`` composed with a
    rotation by φ about b's own Z.
    """
    fa = _pitch_fraction(Ta, za, P)
    fb0 = _pitch_fraction(Tb_rest, zb, P)
    fb = (_sense(Ta, Tb_rest, P) * fa + 0.5) % 1.0
    return (fb0 - fb) * 2.0 * math.pi / zb


def mesh_residual(Ta: np.ndarray, za: int, Tb: np.ndarray, zb: int, P: np.ndarray) -> float:
    """How far (in pitches, −½…½) two posed gears are from tooth-into-space at P; 0 = meshed."""
    fa = _pitch_fraction(Ta, za, P)
    fb = _pitch_fraction(Tb, zb, P)
    r = (fb - _sense(Ta, Tb, P) * fa - 0.5) % 1.0
    return r - 1.0 if r >= 0.5 else r


def _with_phase(T: np.ndarray, phi: float) -> np.ndarray:
    R = np.eye(4)
    R[:3, :3] = rot_z(phi)
    return T @ R


@dataclass(frozen=True)
class BevelDifferential:
    """Sizes of the input and output gears (90° shafts) and the rest phases of all gears."""

    input: BevelSizes
    output: BevelSizes
    outputs: int
    phases: dict = field(default_factory=dict)

    @property
    def names(self) -> tuple:
        return INPUTS + OUTPUTS[: self.outputs]

    @property
    def meshes(self) -> tuple:
        return tuple(p for p in MESHES if p[1] in self.names)

    def sizes_of(self, name: str) -> BevelSizes:
        return self.input if name in INPUTS else self.output


def _spin(name: str, theta1: float, theta2: float, roll: float) -> float:
    """Own-axis angle of a gear from the world-stated angles (see the module docstring)."""
    return {"input_1": theta1, "input_2": -theta2, "output_1": -roll, "output_2": -roll}[name]


def gear_poses(diff: BevelDifferential, theta1: float = 0.0, theta2: float = 0.0,
               axial_shift: dict | None = None) -> dict:
    """World 4×4 poses of every gear for input angles θ1, θ2 (rad).

    ``axial_shift`` maps a gear name to a displacement along its own axis toward the apex
    (mm); a mounting distance too large by e is a shift of −e.
    """
    shift = axial_shift or {}
    zi, zo = diff.input.z, diff.output.z
    c, roll = carrier_and_roll(theta1, theta2, zi, zo)
    out = {}
    for name in diff.names:
        s = diff.sizes_of(name)
        R = _REST[name] if name in INPUTS else rot_x(c) @ _REST[name]
        T = own_to_world(R, s.mounting_distance, shift.get(name, 0.0))
        out[name] = _with_phase(T, diff.phases.get(name, 0.0) + _spin(name, theta1, theta2, roll))
    return out


def bevel_differential(z_in: int, z_out: int, module: float, face_width: float, rack: BasicRack,
                       *, outputs: int = 2, x: float = 0.0, thinning: float = 0.0) -> BevelDifferential:
    """A 90° bevel differential: inputs with z_in teeth (shift x), outputs with z_out (shift −x)."""
    if outputs not in (1, 2):
        raise GeometryError(f"a differential has one or two output gears (got {outputs})")
    si = bevel_sizes(z_in, z_out, module, math.pi / 2, face_width, rack, x, thinning=thinning)
    so = bevel_sizes(z_out, z_in, module, math.pi / 2, face_width, rack, -x, thinning=thinning)
    d = BevelDifferential(si, so, outputs, {})
    phases = {"input_1": 0.0}
    order = [("input_1", "output_1"), ("output_1", "input_2")]
    if outputs == 2:
        order.append(("input_1", "output_2"))
    for a, b in order:
        poses = gear_poses(BevelDifferential(si, so, outputs, dict(phases, **{b: 0.0})))
        P = pitch_point(poses[a], d.sizes_of(a), poses[b], d.sizes_of(b))
        phases[b] = mesh_phase(poses[a], d.sizes_of(a).z, poses[b], d.sizes_of(b).z, P)
    d = BevelDifferential(si, so, outputs, phases)
    poses = gear_poses(d)
    for a, b in d.meshes:
        P = pitch_point(poses[a], d.sizes_of(a), poses[b], d.sizes_of(b))
        if abs(mesh_residual(poses[a], d.sizes_of(a).z, poses[b], d.sizes_of(b).z, P)) > 1e-9:
            raise GeometryError(f"tooth phases of {a} and {b} cannot be matched")
    return d
