"""What a spinning rotor does: momentum, energy, spin-up, and three uses.

Rigid-body relations (any dynamics text; standard):

* angular momentum h = I ω (N·m·s), kinetic energy E = ½ I ω² (J);
* spin-up from rest under a constant net torque T: t = I ω / T (s);
* reaction wheel on a free body of inertia I_b (momentum exchange, no external torque): the
  motor's torque T turns the body at α_b = T / I_b the other way; the wheel saturates at its
  top speed ω_max after t_sat = I_w ω_max / T, when the body turns at Ω_b = I_w ω_max / I_b;
* gyroscopic rotor on a gimbal turned at Ω ⟂ the spin axis: output torque τ = h Ω (about the
  third axis, τ = Ω × h);
* counter-rotating pair on one axis: net momentum h₁ + h₂ with signs (+ = counter-clockwise
  seen from +z); equal and opposite momenta cancel, so a transverse rate makes no net
  gyroscopic torque; the body feels −(T₁ + T₂) from the two motors.

Units: inertia kg·m², ω rad/s, torque N·m, time s.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from gen.errors import ParamError


def rpm_to_rad(rpm: float) -> float:
    """ω = 2π n / 60 (rad/s) for n in rpm."""
    return 2.0 * math.pi * rpm / 60.0


def angular_momentum(inertia: float, omega: float) -> float:
    """h = I ω (N·m·s)."""
    return inertia * omega


def kinetic_energy(inertia: float, omega: float) -> float:
    """E = ½ I ω² (J)."""
    return 0.5 * inertia * omega * omega


def _pos(value: float, key: str) -> float:
    if not value > 0:
        raise ParamError("must be > 0", key=key, value=value)
    return float(value)


def spin_up_time(inertia: float, omega: float, torque: float) -> float:
    """t = I ω / T (s) from rest at constant net torque T (N·m); friction not included."""
    return inertia * abs(omega) / _pos(torque, "torque")


@dataclass(frozen=True)
class ReactionWheel:
    """Reaction-wheel figures: body α (rad/s²), time to saturate (s), body rate then (rad/s)."""

    body_acceleration: float
    saturation_time: float
    body_rate_at_saturation: float
    wheel_momentum: float          # I_w ω_max, N·m·s


def reaction_wheel(wheel_inertia: float, body_inertia: float, torque: float,
                   max_wheel_speed: float) -> ReactionWheel:
    """Figures for a wheel of I_w driven at T up to ω_max on a free body of I_b (module notes)."""
    iw, ib = _pos(wheel_inertia, "wheel_inertia"), _pos(body_inertia, "body_inertia")
    t, w = _pos(torque, "torque"), _pos(max_wheel_speed, "max_wheel_speed")
    h = iw * w
    return ReactionWheel(body_acceleration=t / ib, saturation_time=h / t,
                         body_rate_at_saturation=h / ib, wheel_momentum=h)


def gyroscopic_torque(momentum: float, gimbal_rate: float) -> float:
    """τ = h Ω (N·m) for a gimbal rate Ω (rad/s) perpendicular to the spin axis."""
    return momentum * gimbal_rate


@dataclass(frozen=True)
class CounterPair:
    """Net figures of two rotors on one axis (signed: + counter-clockwise seen from +z)."""

    net_momentum: float             # N·m·s
    net_reaction_torque: float      # N·m on the body, −(T₁ + T₂)
    reaction_direction: str         # "+z", "-z" or "none"
    gyroscopic_torque: float        # N·m under the given transverse rate


def counter_rotating_pair(inertia_1: float, omega_1: float, inertia_2: float, omega_2: float,
                          torque_1: float = 0.0, torque_2: float = 0.0,
                          transverse_rate: float = 0.0, tol: float = 1e-12) -> CounterPair:
    """Net momentum, net motor reaction on the body and its direction, net gyroscopic torque.

    ω and T are signed about +z (ω₂ < 0 for the counter-rotating member).
    """
    h = inertia_1 * omega_1 + inertia_2 * omega_2
    react = -(torque_1 + torque_2)
    scale = max(abs(torque_1), abs(torque_2), 1.0) * tol
    direction = "none" if abs(react) <= scale else ("+z" if react > 0 else "-z")
    return CounterPair(net_momentum=h, net_reaction_torque=react, reaction_direction=direction,
                       gyroscopic_torque=h * transverse_rate)
