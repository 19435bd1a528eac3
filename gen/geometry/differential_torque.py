"""Pitch and roll torques of a bevel differential driven by two motors (numpy only).

Kinematics (see :mod:`gen.geometry.differential`): pitch p = (θ1 + θ2)/2 (the carrier) and
roll r = (θ1 − θ2)/2 · z_in/z_out (an output gear on the carrier), θ1, θ2 the input angles.
Inverse: θ1 = p + k·r, θ2 = p − k·r with k = z_out/z_in.

Torques by virtual work (the work of the inputs equals the work delivered to the outputs,
lossless, then scaled by the efficiency η): τ1 δθ1 + τ2 δθ2 = τp δp + τr δr for every δp, δr,
so with δθ1 = δp + k δr and δθ2 = δp − k δr:

    τp = η (τ1 + τ2),        τr = η k (τ1 − τ2).

Each input torque is bounded, |τ1| ≤ T1, |τ2| ≤ T2 (motor torque times an optional reduction
between motor and input gear), so the reachable (τp, τr) form a parallelogram with corners at
(±T1, ±T2) mapped by the relation above. Along the axes: the largest pitch torque with no
roll torque is 2η·min(T1, T2) (both motors push the same way), the largest roll torque with no
pitch torque is 2ηk·min(T1, T2) (the motors push against each other).

Torques N·m.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError


def _k(z_in: int, z_out: int) -> float:
    for z, what in ((z_in, "input"), (z_out, "output")):
        if isinstance(z, bool) or not isinstance(z, int) or z < 1:
            raise GeometryError(f"differential {what} tooth count must be a whole number >= 1 "
                                f"(got {z!r})")
    return z_out / z_in


def pitch_roll_torques(tau1: float, tau2: float, z_in: int, z_out: int,
                       efficiency: float = 1.0) -> tuple[float, float]:
    """(pitch torque, roll torque) N·m delivered for input torques τ1, τ2 (N·m)."""
    k = _k(z_in, z_out)
    return efficiency * (tau1 + tau2), efficiency * k * (tau1 - tau2)


def input_torques(pitch: float, roll: float, z_in: int, z_out: int,
                  efficiency: float = 1.0) -> tuple[float, float]:
    """Input torques (τ1, τ2) N·m that deliver a pitch and roll torque (inverse relation)."""
    k = _k(z_in, z_out)
    s, d = pitch / efficiency, roll / (efficiency * k)
    return 0.5 * (s + d), 0.5 * (s - d)


@dataclass(frozen=True)
class TorqueEnvelope:
    """What two motors can give at the differential's outputs (N·m).

    ``corners``: (4, 2) array of (pitch, roll) for input torques (+T1, +T2), (+T1, −T2),
    (−T1, −T2), (−T1, +T2). ``max_pitch``: with no roll torque; ``max_roll``: with no pitch
    torque. ``input_limits``: (T1, T2) at the input gears.
    """

    corners: np.ndarray
    max_pitch: float
    max_roll: float
    input_limits: tuple
    z_in: int
    z_out: int
    efficiency: float

    def holds(self, pitch: float, roll: float) -> bool:
        """True when the two inputs can give (pitch, roll) within their limits."""
        t1, t2 = input_torques(pitch, roll, self.z_in, self.z_out, self.efficiency)
        tol = 1e-12 * max(self.input_limits)
        return abs(t1) <= self.input_limits[0] + tol and abs(t2) <= self.input_limits[1] + tol

    def as_dict(self) -> dict:
        return {"corners": self.corners.tolist(), "max_pitch": self.max_pitch,
                "max_roll": self.max_roll, "input_limits": list(self.input_limits)}


def torque_envelope(motor_torque_1: float, motor_torque_2: float, z_in: int, z_out: int, *,
                    input_ratio: float = 1.0, efficiency: float = 1.0) -> TorqueEnvelope:
    """Pitch/roll torque envelope of two motors (N·m each) driving the two inputs.

    ``input_ratio`` is the reduction from each motor to its input gear (torque × ratio);
    ``efficiency`` covers that reduction and the differential together (0 < η ≤ 1).
    """
    for v, what in ((motor_torque_1, "motor 1 torque"), (motor_torque_2, "motor 2 torque"),
                    (input_ratio, "input ratio")):
        if not (isinstance(v, (int, float)) and math.isfinite(v) and v > 0):
            raise GeometryError(f"{what} must be a positive number (got {v!r})")
    if not (0.0 < efficiency <= 1.0):
        raise GeometryError(f"efficiency must be in (0, 1] (got {efficiency!r})")
    t1, t2 = motor_torque_1 * input_ratio, motor_torque_2 * input_ratio
    corners = np.array([pitch_roll_torques(a, b, z_in, z_out, efficiency)
                        for a, b in ((t1, t2), (t1, -t2), (-t1, -t2), (-t1, t2))])
    k, low = _k(z_in, z_out), min(t1, t2)
    return TorqueEnvelope(corners, 2.0 * efficiency * low, 2.0 * efficiency * k * low,
                          (t1, t2), z_in, z_out, efficiency)
