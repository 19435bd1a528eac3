"""Drive-train stage math: a motor, a chain of stages, a load (numpy only).

Units at the interface: torque N·m, force N, rotary speed rpm, linear speed mm/s, lead and
radius mm, inertia kg·m², mass kg. Inside: SI (rad/s, m).

A stage has a ratio i = input speed / output speed and an efficiency η. Driving forward
(power flows motor → load): ω_out = ω_in / i and T_out = T_in · i · η (power balance with a
loss, common practice). A rotary-to-linear last stage has i in rad per metre: a lead screw
i = 2π/L (L the lead), a cable drum i = 1/r (r the effective radius); its output is a force
and a travel speed.

Default efficiencies per stage kind are common practice for lubricated metal or good printed
parts, rough figures to be replaced by measured ones: spur mesh 0.98, timing belt 0.96,
straight bevel mesh 0.97, planetary stage 0.97, cable drum 1.0 (bending losses ignored). A
lead screw has no default: its efficiency depends on lead angle and friction (Shigley §8-2),
so the caller gives it.

Reflected inertia at the motor: J_motor = Σ J_shaft / i_shaft² with i_shaft the ratio from the
motor to that shaft (kinetic-energy equivalence, efficiency ignored, common practice); a linear
load of mass m: J = m / i² with i in rad/m.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from gen.errors import GeometryError

#: default efficiency per stage kind (common practice, see the module text)
DEFAULT_EFFICIENCY = {"spur": 0.98, "belt": 0.96, "bevel": 0.97, "planetary": 0.97,
                      "drum": 1.0}
ROTARY_KINDS = ("spur", "belt", "bevel", "planetary")
LINEAR_KINDS = ("leadscrew", "drum")
STAGE_KINDS = ROTARY_KINDS + LINEAR_KINDS
RPM = 2.0 * math.pi / 60.0           # rad/s per rpm


# --------------------------------------------------------------------------- motors

@dataclass(frozen=True)
class LineMotor:
    """A motor whose torque falls on a straight line from stall to no-load speed.

    T(n) = T_stall · (1 − n/n_0) (DC-motor characteristic, common practice); T_stall N·m,
    n_0 rpm.
    """

    stall_torque: float
    no_load_speed: float
    name: str = "motor"

    def __post_init__(self):
        _positive(self.stall_torque, "stall torque")
        _positive(self.no_load_speed, "no-load speed")

    @property
    def max_torque(self) -> float:
        return self.stall_torque

    def torque_at(self, speed: float) -> float:
        """Torque (N·m) at ``speed`` rpm; 0 at and beyond no-load speed."""
        return max(0.0, self.stall_torque * (1.0 - speed / self.no_load_speed))

    def speed_for(self, torque: float) -> float | None:
        """Speed (rpm) at which the motor gives ``torque``; None when above stall."""
        if torque > self.stall_torque:
            return None
        return self.no_load_speed * (1.0 - max(torque, 0.0) / self.stall_torque)


@dataclass(frozen=True)
class RatedMotor:
    """A speed-controlled drive: holds its rated speed while the load stays within its rated
    torque (N·m), and cannot turn a heavier load (our model of a servo or stepper driver used
    inside its rating)."""

    rated_torque: float
    rated_speed: float
    name: str = "motor"

    def __post_init__(self):
        _positive(self.rated_torque, "rated torque")
        _positive(self.rated_speed, "rated speed")

    @property
    def max_torque(self) -> float:
        return self.rated_torque

    def torque_at(self, speed: float) -> float:
        return self.rated_torque if 0.0 <= speed <= self.rated_speed else 0.0

    def speed_for(self, torque: float) -> float | None:
        return self.rated_speed if torque <= self.rated_torque else None


@dataclass(frozen=True)
class CurveMotor:
    """A torque–speed curve from points (rpm, N·m), interpolated linearly between them.

    Speeds strictly increasing from 0; beyond the last point the motor gives no torque.
    The operating point for a load is the highest speed at which the curve still gives the
    load torque (the stable side of a falling curve).
    """

    speeds: tuple
    torques: tuple
    name: str = "motor"

    def __post_init__(self):
        n = np.asarray(self.speeds, float)
        t = np.asarray(self.torques, float)
        if n.ndim != 1 or len(n) < 2 or len(n) != len(t):
            raise GeometryError("a motor curve needs at least two (speed, torque) points")
        if n[0] != 0.0 or np.any(np.diff(n) <= 0) or not np.all(np.isfinite(n)):
            raise GeometryError("motor curve speeds must start at 0 rpm and increase")
        if np.any(t < 0) or not np.all(np.isfinite(t)) or t.max() <= 0:
            raise GeometryError("motor curve torques must be >= 0 N·m, some > 0")

    @property
    def max_torque(self) -> float:
        return float(max(self.torques))

    def torque_at(self, speed: float) -> float:
        return float(np.interp(speed, self.speeds, self.torques, left=self.torques[0], right=0.0))

    def speed_for(self, torque: float) -> float | None:
        n = np.asarray(self.speeds, float)
        t = np.asarray(self.torques, float)
        if torque > t.max():
            return None
        k = int(np.nonzero(t >= torque)[0][-1])       # last point still strong enough
        if k == len(n) - 1:
            return float(n[-1])
        return float(n[k] + (t[k] - torque) / (t[k] - t[k + 1]) * (n[k + 1] - n[k]))


# --------------------------------------------------------------------------- stages, load

@dataclass(frozen=True)
class Stage:
    """One stage of a chain.

    ratio : input speed / output speed; dimensionless for rotary stages, rad/m for a lead
        screw (2π/L) or drum (1/r) — use :func:`lead_screw` and :func:`cable_drum`.
    efficiency : forward (driving) efficiency 0 < η ≤ 1; None takes the kind's default.
    back_efficiency : efficiency when the load drives back; None = the forward value;
        ≤ 0 means self-locking (holds any load with the motor off).
    input_shaft, output_shaft : names of the shafts it joins ("" = not named, not checked).
    inertia_in, inertia_out : kg·m² on its input and output shafts (rotary output only).
    allowable : largest torque (N·m) or force (N, linear stages) on its output member.
    """

    kind: str
    ratio: float
    efficiency: float | None = None
    name: str = ""
    input_shaft: str = ""
    output_shaft: str = ""
    back_efficiency: float | None = None
    inertia_in: float = 0.0
    inertia_out: float = 0.0
    allowable: float | None = None

    @property
    def linear(self) -> bool:
        return self.kind in LINEAR_KINDS

    @property
    def eta(self) -> float:
        if self.efficiency is not None:
            return self.efficiency
        if self.kind not in DEFAULT_EFFICIENCY:
            raise GeometryError(f"stage '{self.name}': a {self.kind} stage needs its efficiency "
                                f"(it depends on lead angle and friction)")
        return DEFAULT_EFFICIENCY[self.kind]

    @property
    def eta_back(self) -> float:
        return self.eta if self.back_efficiency is None else self.back_efficiency


def gear_stage(driver: int, driven: int, *, kind: str = "spur", **kw) -> Stage:
    """A gear or belt pair (kind spur, belt or bevel): i = z_driven / z_driver."""
    return Stage(kind, driven / driver, **kw)


def planetary_stage(sun: int, ring: int, **kw) -> Stage:
    """Ring held, sun in, carrier out: i = 1 + z_ring/z_sun (Willis equation)."""
    return Stage("planetary", 1.0 + ring / sun, **kw)


def lead_screw(lead: float, efficiency: float, **kw) -> Stage:
    """Lead screw, lead in mm per turn: i = 2π/L rad/m; F = T·i·η."""
    return Stage("leadscrew", 2.0 * math.pi / (lead / 1000.0), efficiency, **kw)


def cable_drum(diameter: float, **kw) -> Stage:
    """Cable drum of effective diameter (mm, to the cable centre): i = 1/r rad/m."""
    return Stage("drum", 1.0 / (diameter / 2000.0), **kw)


@dataclass(frozen=True)
class Load:
    """What the chain drives: torque N·m (rotary) or force N (linear chain), wanted speed
    (rpm or mm/s, optional), inertia kg·m² (rotary) or mass kg (linear)."""

    torque: float = 0.0
    speed: float | None = None
    inertia: float = 0.0

    @classmethod
    def force_at_radius(cls, force: float, radius: float, **kw) -> "Load":
        """A force (N) acting at a radius (mm) on the last rotary shaft: T = F·r."""
        return cls(torque=force * radius / 1000.0, **kw)


# --------------------------------------------------------------------------- results

@dataclass(frozen=True)
class StageState:
    """A stage at the operating point (and at motor stall).

    Speeds rpm (a linear output: mm/s); torques N·m (a linear output: N). Margins are
    allowable / output torque (None when no allowable was given).
    """

    name: str
    kind: str
    speed_in: float
    speed_out: float
    torque_in: float
    torque_out: float
    torque_out_stall: float
    margin: float | None
    margin_stall: float | None


@dataclass(frozen=True)
class ChainResult:
    """The chain's operating point and limits.

    ``moves`` is False when the reflected load exceeds what the motor can give; the
    operating speeds are then 0 and the torques those at stall.
    ``move_limit``: largest load the chain starts moving (motor at its largest torque, forward
    efficiency); ``move_limit_at_speed``: largest load moved at the wanted load speed (None
    without one); ``hold_limit``: largest load held with the motor at its largest torque and
    the load driving back (inf when a stage is self-locking).
    """

    total_ratio: float
    efficiency: float
    linear: bool
    moves: bool
    motor_speed: float
    motor_torque: float
    output_speed: float
    output_torque: float
    move_limit: float
    move_limit_at_speed: float | None
    hold_limit: float
    reflected_inertia: float
    stages: tuple = field(default_factory=tuple)
    weakest: str | None = None
    weakest_margin: float | None = None


def _positive(v, what):
    if isinstance(v, bool) or not isinstance(v, (int, float)) or not (math.isfinite(v) and v > 0):
        raise GeometryError(f"{what} must be a positive number (got {v!r})")


def check_chain(stages, motor_shaft: str = "") -> None:
    """Refuse a chain that does not connect, in plain words (GeometryError).

    Consecutive stages must share a shaft: the output shaft of one is the input shaft of the
    next (checked where both are named); the first stage starts on the motor shaft when both
    are named; only the last stage may turn rotation into travel.
    """
    if not stages:
        raise GeometryError("a drive chain needs at least one stage")
    prev_name, prev_shaft = "the motor", motor_shaft
    for k, st in enumerate(stages):
        label = st.name or f"stage {k + 1}"
        if st.kind not in STAGE_KINDS:
            raise GeometryError(f"{label}: unknown stage kind '{st.kind}'; valid kinds: "
                                + ", ".join(STAGE_KINDS))
        _positive(st.ratio, f"{label}: ratio")
        eta = st.eta
        if not (0.0 < eta <= 1.0):
            raise GeometryError(f"{label}: efficiency must be in (0, 1] (got {eta!r})")
        if st.eta_back > 1.0:
            raise GeometryError(f"{label}: back-driving efficiency must be <= 1 "
                                f"(got {st.eta_back!r})")
        if prev_shaft and st.input_shaft and prev_shaft != st.input_shaft:
            raise GeometryError(
                f"{label} does not connect: it starts on shaft '{st.input_shaft}' but "
                f"{prev_name} ends on shaft '{prev_shaft}'; consecutive stages must share a "
                f"shaft so they turn at the same speed")
        if st.linear and k != len(stages) - 1:
            raise GeometryError(f"{label} turns rotation into travel, so it must be the last "
                                f"stage; {len(stages) - k - 1} stage(s) follow it")
        if st.linear and st.inertia_out:
            raise GeometryError(f"{label}: a linear stage carries mass through the load, "
                                f"not inertia_out")
        prev_name, prev_shaft = label, st.output_shaft


def solve_chain(motor, stages, load: Load, motor_shaft: str = "") -> ChainResult:
    """Operating point of ``motor`` driving ``load`` through ``stages`` (in order from the motor).

    The load torque reflected to the motor is T_load / (i_total · η_total); the motor runs
    where its curve gives that torque (straight line: n = n_0 (1 − T/T_stall)). Output speed
    n_motor / i_total. Per-stage torques follow T_out = T_in · i · η from the motor torque.
    """
    stages = tuple(stages)
    check_chain(stages, motor_shaft)
    linear = stages[-1].linear
    i_tot = math.prod(s.ratio for s in stages)
    eta_tot = math.prod(s.eta for s in stages)
    eta_back = math.prod(s.eta_back for s in stages)
    t_ref = load.torque / (i_tot * eta_tot)
    n_motor = motor.speed_for(t_ref)
    moves = n_motor is not None
    t_motor = t_ref if moves else motor.max_torque
    n_motor = n_motor or 0.0
    out_scale = 1000.0 * RPM if linear else 1.0          # rpm → mm/s on a linear output
    states, inertia = [], 0.0
    t_in, t_in_stall, n_in, i_to = t_motor, motor.max_torque, n_motor, 1.0
    for k, st in enumerate(stages):
        t_out, t_out_stall = t_in * st.ratio * st.eta, t_in_stall * st.ratio * st.eta
        n_out = n_in / st.ratio
        inertia += st.inertia_in / i_to ** 2
        i_to *= st.ratio
        inertia += st.inertia_out / i_to ** 2
        lin = st.linear
        allow = st.allowable
        states.append(StageState(
            st.name or f"stage {k + 1}", st.kind, n_in, n_out * (out_scale if lin else 1.0),
            t_in, t_out, t_out_stall,
            None if allow is None else (allow / t_out if t_out > 0 else math.inf),
            None if allow is None else (allow / t_out_stall if t_out_stall > 0 else math.inf)))
        t_in, t_in_stall, n_in = t_out, t_out_stall, n_out
    inertia += load.inertia / i_tot ** 2
    move_at = None
    if load.speed is not None:
        n_need = load.speed / out_scale * i_tot if linear else load.speed * i_tot
        move_at = motor.torque_at(n_need) * i_tot * eta_tot
    hold = math.inf if eta_back <= 0 or any(s.eta_back <= 0 for s in stages) else \
        motor.max_torque * i_tot / eta_back
    rated = [s for s in states if s.margin_stall is not None]
    weak = min(rated, key=lambda s: s.margin_stall) if rated else None
    return ChainResult(
        total_ratio=i_tot, efficiency=eta_tot, linear=linear, moves=moves,
        motor_speed=n_motor, motor_torque=t_motor,
        output_speed=n_motor / i_tot * out_scale, output_torque=states[-1].torque_out,
        move_limit=motor.max_torque * i_tot * eta_tot, move_limit_at_speed=move_at,
        hold_limit=hold, reflected_inertia=inertia, stages=tuple(states),
        weakest=weak.name if weak else None, weakest_margin=weak.margin_stall if weak else None)
