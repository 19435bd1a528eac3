"""Power-screw mechanics: torque, efficiency, self-locking, speed, buckling and whirling.

Units: forces N, lengths mm, torques N·m, Young's modulus MPa (N/mm²), density kg/m³,
speeds rpm and mm/s, angles radians.

Torque (Shigley, Mechanical Engineering Design, §8-2, from memory). With mean (pitch)
diameter d_m = d2, lead L, friction f and thread half-angle α (measured in the axial plane;
the small-lead approximation sec α for the normal-plane angle is kept, as in the source):

    raise  T_R = F d_m/2 · (L + π f d_m sec α) / (π d_m − f L sec α)
    lower  T_L = F d_m/2 · (π f d_m sec α − L) / (π d_m + f L sec α)
    collar T_c = F f_c d_c / 2    (added to both)
    overall efficiency e = F L / (2π T_R);  self-locking (thread alone) when π f d_m sec α > L.

A negative thread lowering torque means the load drives the screw back (not self-locking).

Buckling (Euler): P_cr = C π² E I / l², I = π d3⁴ / 64 on the root diameter, with the end
condition constant C: both ends pinned 1, fixed–free ¼, fixed–pinned 2.046 (theory; 2 is the
usual rounded value), fixed–fixed 4 (from memory; classical column theory).

Whirling (first critical speed of a uniform shaft = its first bending natural frequency,
Euler–Bernoulli beam): n = λ² / (2π l²) · √(E I / (ρ A)), λ by end condition: pinned–pinned
π, fixed–free 1.875, fixed–pinned 3.927, fixed–fixed 4.730 (from memory; the roots of the
beam frequency equations).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from gen.errors import GeometryError

END_CONDITIONS = ("pinned-pinned", "fixed-free", "fixed-pinned", "fixed-fixed")

#: Euler column constant C by end condition (from memory, classical column theory)
BUCKLING_C = {"pinned-pinned": 1.0, "fixed-free": 0.25, "fixed-pinned": 2.046,
              "fixed-fixed": 4.0}
#: first-mode beam eigenvalue λ by end condition (from memory, beam frequency equations)
WHIRL_LAMBDA = {"pinned-pinned": math.pi, "fixed-free": 1.875, "fixed-pinned": 3.927,
                "fixed-fixed": 4.730}


@dataclass(frozen=True)
class FrictionPair:
    """Thread friction coefficient range for a screw/nut material pair."""

    screw: str
    nut: str
    low: float
    high: float
    source: str

    @property
    def typical(self) -> float:
        return 0.5 * (self.low + self.high)


# Screw/nut thread friction. Metal pairs: Shigley, Mechanical Engineering Design, Table 8-5
# (from memory). Plastic nuts on a steel screw: common practice for dry printed or moulded
# nuts, no single source; measure your own pair when the figure matters.
FRICTION = {
    ("steel", "steel", "dry"): FrictionPair("steel", "steel", 0.15, 0.25, "Shigley Table 8-5, from memory"),
    ("steel", "bronze", "dry"): FrictionPair("steel", "bronze", 0.15, 0.23, "Shigley Table 8-5, from memory"),
    ("steel", "brass", "dry"): FrictionPair("steel", "brass", 0.15, 0.19, "Shigley Table 8-5, from memory"),
    ("steel", "cast iron", "dry"): FrictionPair("steel", "cast iron", 0.15, 0.25, "Shigley Table 8-5, from memory"),
    ("steel", "steel", "oil"): FrictionPair("steel", "steel", 0.11, 0.17, "Shigley Table 8-5, from memory"),
    ("steel", "bronze", "oil"): FrictionPair("steel", "bronze", 0.10, 0.16, "Shigley Table 8-5, from memory"),
    ("steel", "brass", "oil"): FrictionPair("steel", "brass", 0.10, 0.15, "Shigley Table 8-5, from memory"),
    ("steel", "cast iron", "oil"): FrictionPair("steel", "cast iron", 0.11, 0.17, "Shigley Table 8-5, from memory"),
    ("steel", "POM", "dry"): FrictionPair("steel", "POM", 0.15, 0.25, "common practice"),
    ("steel", "PA", "dry"): FrictionPair("steel", "PA", 0.20, 0.35, "common practice"),
    ("steel", "PETG", "dry"): FrictionPair("steel", "PETG", 0.25, 0.40, "common practice"),
    ("steel", "PLA", "dry"): FrictionPair("steel", "PLA", 0.25, 0.45, "common practice"),
}


def friction_for(screw: str, nut: str, lubrication: str = "dry") -> FrictionPair:
    """Look up the thread friction range of a material pair (names as in :data:`FRICTION`)."""
    want = (screw.lower(), nut.lower(), lubrication.lower())
    for (a, b, c), v in FRICTION.items():
        if (a.lower(), b.lower(), c) == want:
            return v
    known = ", ".join(f"{a}/{b} {c}" for a, b, c in FRICTION)
    raise GeometryError(f"no friction figure for a {screw} screw in a {nut} nut ({lubrication}); "
                        f"known pairs: {known}; give the friction coefficient instead")


@dataclass(frozen=True)
class ScrewTorques:
    """Torques (N·m) to raise and lower a load with a power screw, and what follows."""

    force: float            # axial load F (N)
    thread_raise: float     # thread part of T_R
    thread_lower: float     # thread part of T_L (< 0: the load back-drives the screw)
    collar: float           # collar friction torque T_c (added to both)
    raise_torque: float     # T_R incl. collar
    lower_torque: float     # T_L incl. collar
    efficiency: float       # F L / (2π T_R), collar included
    thread_efficiency: float  # the same without the collar
    self_locking: bool      # π f d_m sec α > L (thread alone)
    lead_angle: float       # λ, tan λ = L / (π d_m)


def screw_torques(force: float, d2: float, lead: float, half_angle: float, friction: float,
                  collar_friction: float = 0.0, collar_diameter: float = 0.0) -> ScrewTorques:
    """Raise/lower torque, efficiency and self-locking of a power screw (Shigley §8-2).

    Parameters: axial load ``force`` (N), mean diameter ``d2`` (mm), ``lead`` L (mm), thread
    ``half_angle`` α (rad; 0 for a square thread, 15° trapezoidal, 30° metric), thread
    ``friction`` f, collar friction f_c at mean collar diameter d_c (mm).
    """
    if force < 0 or d2 <= 0 or lead <= 0:
        raise GeometryError("screw torque needs a load ≥ 0 and positive diameter and lead")
    if friction < 0 or collar_friction < 0 or collar_diameter < 0:
        raise GeometryError("friction coefficients and collar diameter must not be negative")
    sec = 1.0 / math.cos(half_angle)
    den = math.pi * d2 - friction * lead * sec
    if den <= 0:
        raise GeometryError("friction this high locks the screw against raising the load")
    half = force * d2 / 2.0 / 1000.0  # N·m per unit of the bracket
    t_raise = half * (lead + math.pi * friction * d2 * sec) / den
    t_lower = half * (math.pi * friction * d2 * sec - lead) / (math.pi * d2 + friction * lead * sec)
    t_collar = force * collar_friction * collar_diameter / 2.0 / 1000.0
    work = force * lead / 1000.0  # N·m per turn
    total = t_raise + t_collar

    def eff(t):
        return work / (2.0 * math.pi * t) if t > 0 else 0.0

    return ScrewTorques(force=force, thread_raise=t_raise, thread_lower=t_lower, collar=t_collar,
                        raise_torque=total, lower_torque=t_lower + t_collar,
                        efficiency=eff(total), thread_efficiency=eff(t_raise),
                        self_locking=math.pi * friction * d2 * sec > lead,
                        lead_angle=math.atan(lead / (math.pi * d2)))


def linear_speed(rpm: float, lead: float) -> float:
    """Nut travel speed (mm/s) at ``rpm`` screw speed: v = n L / 60."""
    return rpm * lead / 60.0


def screw_rpm(speed: float, lead: float) -> float:
    """Screw speed (rpm) for a nut speed (mm/s)."""
    if lead <= 0:
        raise GeometryError("lead must be positive")
    return 60.0 * speed / lead


def _end(end: str) -> str:
    if end not in END_CONDITIONS:
        raise GeometryError(f"unknown end condition {end!r}; allowed: {', '.join(END_CONDITIONS)}")
    return end


def _section(root_diameter: float, length: float):
    if root_diameter <= 0 or length <= 0:
        raise GeometryError("root diameter and length must be positive")
    area = math.pi * root_diameter ** 2 / 4.0
    inertia = math.pi * root_diameter ** 4 / 64.0
    return area, inertia


def buckling_load(root_diameter: float, length: float, modulus: float,
                  end: str = "pinned-pinned") -> float:
    """Euler critical load P_cr = C π² E I / l² (N) on the root diameter d3 (mm), E in MPa."""
    _, inertia = _section(root_diameter, length)
    return BUCKLING_C[_end(end)] * math.pi ** 2 * modulus * inertia / length ** 2


def critical_speed(root_diameter: float, length: float, modulus: float, density: float,
                   end: str = "pinned-pinned") -> float:
    """First whirling speed (rpm) n = λ²/(2π l²) √(E I / (ρ A)) on the root diameter.

    Lengths mm, E MPa, ρ kg/m³; worked in SI inside (E Pa, lengths m).
    """
    area, inertia = _section(root_diameter, length)
    lam = WHIRL_LAMBDA[_end(end)]
    e_pa, i_m4, a_m2, l_m = modulus * 1e6, inertia * 1e-12, area * 1e-6, length * 1e-3
    hz = lam ** 2 / (2.0 * math.pi * l_m ** 2) * math.sqrt(e_pa * i_m4 / (density * a_m2))
    return 60.0 * hz
