"""Stress raised at axial holes (bolt circle, lightening holes) of a spinning rotor.

A small round hole in a plate under the principal stresses σ₁ ≥ σ₂ (in-plane, far from the
hole) carries, at its edge, a peak hoop stress of 3σ₁ − σ₂ (Kirsch's solution; Timoshenko &
Goodier, Theory of Elasticity, "effect of circular holes on stress distributions in plates" —
from memory). The concentration factor K = (3σ₁ − σ₂)/σ₁ runs from 2 (equal biaxial tension)
to 3 (uniaxial). In a spinning disc the field at the hole's circle radius R_c is the disc's own
(σ_θ ≥ σ_r ≥ 0 at every inner radius), so the estimate here is

    σ_hole = 3 σ_θ(R_c) − σ_r(R_c),   K = 3 − σ_r/σ_θ,

with σ_r, σ_θ from the constant-thickness disc of the rotor's outer radius and bore
(:func:`gen.geometry.rotor_stress.disc_stresses`, Timoshenko) — the same disc the rotor's web
estimate uses. The holes are taken as small against their circle's radius and against their
spacing (Kirsch's plate is infinite): an estimate, said so wherever it is reported.

Units: radii mm, ω rad/s, stresses MPa.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from gen.geometry.rotor import Rotor
from gen.geometry.rotor_materials import RotorMaterial, rotor_material
from gen.geometry.rotor_stress import disc_stresses

SOURCE = ("Kirsch's small-hole solution, peak 3σ₁ − σ₂ (Timoshenko & Goodier, Theory of "
          "Elasticity, from memory) in Timoshenko's rotating-disc field")


def concentration(sigma_1: float, sigma_2: float) -> tuple[float, float]:
    """(peak MPa, factor) at the edge of a small round hole in the field σ₁, σ₂ (MPa): the
    peak is the larger of |3σ₁ − σ₂| and |3σ₂ − σ₁|, the factor that peak over max |σ|."""
    s1, s2 = float(sigma_1), float(sigma_2)
    peak = max(abs(3.0 * s1 - s2), abs(3.0 * s2 - s1))
    base = max(abs(s1), abs(s2))
    return peak, (peak / base if base > 0.0 else 3.0)


@dataclass(frozen=True)
class HoleStress:
    """Disc stress at a hole circle and the peak at the holes' edges (MPa)."""

    circle_radius: float   # R_c, mm
    sigma_r: float
    sigma_theta: float
    factor: float          # K
    peak: float            # K · max(σ_r, σ_θ)


def hole_stress(rotor: Rotor, mat: str | RotorMaterial, omega: float,
                circle_radius: float) -> HoleStress:
    """Peak stress at holes on ``circle_radius`` (mm) of ``rotor`` at ``omega`` (rad/s)."""
    m = rotor_material(mat)
    sr, st = disc_stresses(circle_radius, omega, m.density, m.poisson, rotor.outer_radius,
                           rotor.bore_radius)
    sr, st = float(np.asarray(sr)), float(np.asarray(st))
    peak, k = concentration(st, sr)
    return HoleStress(float(circle_radius), sr, st, k, peak)
