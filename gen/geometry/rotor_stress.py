"""Stresses in spinning rotors, speed limits and balance tolerance.

Closed forms for a thin disc of constant thickness in plane stress (Timoshenko, Strength of
Materials, Part II, "rotating discs" — from memory). Outer radius b, bore radius a, ρ density,
ν Poisson's ratio, ω spin (rad/s):

* solid disc (a = 0):   σ_r = (3+ν)/8 ρω² (b² − r²),
                        σ_θ = (3+ν)/8 ρω² b² − (1+3ν)/8 ρω² r²;
  peak at the centre, σ_r = σ_θ = (3+ν)/8 ρω² b².
* disc with a bore:     σ_r = (3+ν)/8 ρω² (a² + b² − a²b²/r² − r²),
                        σ_θ = (3+ν)/8 ρω² (a² + b² + a²b²/r² − (1+3ν)/(3+ν) r²);
  peak hoop at the bore, σ_θ(a) = (3+ν)/4 ρω² (b² + (1−ν)/(3+ν) a²).
* thin ring of radius r: σ_θ = ρω² r².

A rim + web rotor is ESTIMATED as the larger of (i) the thin-ring stress at the outer radius,
ρω²R² — never less than the bore hoop stress of a free rim of any width, since
((3+ν)b² + (1−ν)a²)/4 ≤ b² — and (ii) the bore hoop stress of a constant-thickness disc of the
full outer radius (the web and hub as if they continued to the rim). The pull of a heavy rim on
a thin web and printed-layer weaknesses are not modelled; treat the figures as estimates. The
stress raised around bolt and lightening holes is added by :mod:`gen.geometry.rotor_holes`.

ISO 21940-11 balance quality (from memory): permissible residual specific unbalance
e_per = G/ω (G the grade in mm/s, ω in rad/s → mm); permissible residual unbalance
U_per = m·e_per (g·mm with m in g).

Units: ρ kg/m³, radii mm, ω rad/s, stresses MPa.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import ParamError
from gen.geometry.rotor import Rotor
from gen.geometry.rotor_materials import RotorMaterial, rotor_material

SOURCE = "Timoshenko, Strength of Materials II, rotating discs of constant thickness"


def _k(density: float, omega: float) -> float:
    """ρω² in MPa/mm² (ρ kg/m³, ω rad/s; 1 kg/m³·s⁻²·mm² = 1e-12 MPa)."""
    return density * omega * omega * 1e-12


def disc_stresses(r, omega: float, density: float, poisson: float, outer_radius: float,
                  bore_radius: float = 0.0):
    """(σ_r, σ_θ) in MPa at radii ``r`` (mm) of a spinning constant-thickness disc.

    Timoshenko's closed forms (module docstring); ``bore_radius`` 0 for a solid disc.
    Radii outside [bore, outer] are refused.
    """
    r = np.asarray(r, dtype=float)
    a, b, nu = float(bore_radius), float(outer_radius), float(poisson)
    if not 0.0 <= a < b:
        raise ParamError("need 0 ≤ bore radius < outer radius", key="bore", value=a)
    if np.any(r < a - 1e-12) or np.any(r > b + 1e-12):
        raise ParamError("radius outside the disc", key="r")
    k = _k(density, omega)
    c = (3.0 + nu) / 8.0 * k
    if a == 0.0:
        sr = c * (b * b - r * r)
        st = c * b * b - (1.0 + 3.0 * nu) / 8.0 * k * r * r
    else:
        rr = np.maximum(r, a)
        sr = c * (a * a + b * b - a * a * b * b / (rr * rr) - rr * rr)
        st = c * (a * a + b * b + a * a * b * b / (rr * rr) - (1.0 + 3.0 * nu) / (3.0 + nu) * rr * rr)
    return sr, st


def solid_disc_peak(omega: float, density: float, poisson: float, radius: float) -> float:
    """σ at the centre of a solid disc, (3+ν)/8 ρω²R² (MPa)."""
    return (3.0 + poisson) / 8.0 * _k(density, omega) * radius * radius


def bored_disc_peak(omega: float, density: float, poisson: float, outer_radius: float,
                    bore_radius: float) -> float:
    """Hoop σ at the bore of a disc, (3+ν)/4 ρω² (R² + (1−ν)/(3+ν) r²) (MPa)."""
    nu = poisson
    return (3.0 + nu) / 4.0 * _k(density, omega) * (
        outer_radius ** 2 + (1.0 - nu) / (3.0 + nu) * bore_radius ** 2)


def thin_ring_stress(omega: float, density: float, radius: float) -> float:
    """Hoop σ of a thin spinning ring, ρω²r² (MPa)."""
    return _k(density, omega) * radius * radius


@dataclass(frozen=True)
class RotorStress:
    """Peak stress estimate at one speed (MPa) and where it is; ``method`` says how."""

    omega: float
    peak: float
    where: str            # "centre" | "bore" | "rim"
    rim: float | None     # thin-ring estimate (rim + web rotors)
    web: float | None     # disc estimate at the bore or centre
    method: str


def rotor_stress(rotor: Rotor, mat: str | RotorMaterial, omega: float) -> RotorStress:
    """Peak stress in ``rotor`` spinning at ``omega`` (rad/s), estimated as in the module notes.

    A plain disc (with or without pocket) is taken as a constant-thickness disc of the outer
    radius (the pocket, a local thinning near the axis, is ignored).
    """
    m = rotor_material(mat)
    R, a = rotor.outer_radius, rotor.bore_radius
    if a > 0.0:
        disc, at = bored_disc_peak(omega, m.density, m.poisson, R, a), "bore"
    else:
        disc, at = solid_disc_peak(omega, m.density, m.poisson, R), "centre"
    if rotor.is_plain:
        return RotorStress(omega, disc, at, None, disc,
                           f"constant-thickness disc, peak at the {at} ({SOURCE})")
    ring = thin_ring_stress(omega, m.density, R)
    if ring >= disc:
        peak, at = ring, "rim"
    else:
        peak = disc
    return RotorStress(omega, peak, at, ring, disc,
                       "estimate: larger of thin-ring stress at the outer radius (rim) and "
                       f"constant-thickness disc stress at the {'bore' if a > 0 else 'centre'} "
                       f"(web); rim–web interaction not modelled ({SOURCE})")


def speed_limit(rotor: Rotor, mat: str | RotorMaterial, safety_factor: float = 1.0) -> float:
    """Spin (rad/s) at which the peak stress reaches strength / safety factor.

    Every stress here grows with ω², so ω_lim = ω₁ √(σ_allow / σ(ω₁)) for any reference ω₁.
    """
    if not safety_factor > 0:
        raise ParamError("safety factor must be > 0", key="safety_factor", value=safety_factor)
    m = rotor_material(mat)
    ref = rotor_stress(rotor, m, 1.0).peak
    return math.sqrt(m.strength / safety_factor / ref)


def safety_factor_at(rotor: Rotor, mat: str | RotorMaterial, omega: float) -> float:
    """Strength / peak stress at ``omega`` (rad/s); infinite at rest."""
    m = rotor_material(mat)
    peak = rotor_stress(rotor, m, omega).peak
    return math.inf if peak == 0.0 else m.strength / peak


@dataclass(frozen=True)
class Unbalance:
    """ISO 21940-11 permissible residual unbalance for one grade at one speed."""

    grade: float          # G, mm/s
    omega: float          # rad/s
    specific: float       # e_per, mm
    unbalance: float      # U_per, g·mm


def permissible_unbalance(grade: float, omega: float, mass_kg: float) -> Unbalance:
    """e_per = G/ω (mm) and U_per = m·e_per (g·mm) — ISO 21940-11, from memory."""
    if not grade > 0 or not omega > 0 or not mass_kg > 0:
        raise ParamError("balance grade, speed and mass must be > 0", key="balance_grade",
                         value=(grade, omega, mass_kg))
    e = grade / omega
    return Unbalance(grade, omega, e, mass_kg * 1000.0 * e)


@dataclass(frozen=True, eq=False)
class StressCurve:
    """Stresses along the radius of a rotor at one speed, for drawing (mm, MPa).

    ``radial``/``hoop`` are the constant-thickness disc of the rotor's outer and bore radii
    (:func:`disc_stresses`); for a rim + web rotor ``ring_r``/``ring_hoop`` add the thin-ring
    hoop stress ρω²r² across the rim (None for a plain disc). ``peak`` is the estimate of
    :func:`rotor_stress` and ``peak_radius`` where it acts.
    """

    r: np.ndarray
    radial: np.ndarray
    hoop: np.ndarray
    ring_r: np.ndarray | None
    ring_hoop: np.ndarray | None
    peak: RotorStress
    peak_radius: float
    allowable: float          # the material's strength (MPa, its ``strength_kind``)


def stress_curve(rotor: Rotor, mat: str | RotorMaterial, omega: float,
                 samples: int = 121) -> StressCurve:
    """Radial and hoop stress against radius at ``omega`` (rad/s), with the peak estimate.

    The disc curves are Timoshenko's closed forms (module notes) over [bore, outer radius];
    the rim curve (rim + web rotors) is the thin-ring hoop stress over the rim's radii.
    """
    if samples < 2:
        raise ParamError("a stress curve needs at least 2 samples", key="samples",
                         value=samples)
    m = rotor_material(mat)
    a, b = rotor.bore_radius, rotor.outer_radius
    r = np.linspace(a, b, samples)
    sr, st = disc_stresses(r, omega, m.density, m.poisson, b, a)
    ring_r = ring = None
    if not rotor.is_plain:
        ring_r = np.linspace(b - rotor.rim_width, b, max(2, samples // 4))
        ring = _k(m.density, omega) * ring_r * ring_r
    peak = rotor_stress(rotor, m, omega)
    where = {"centre": 0.0, "bore": a, "rim": b}[peak.where]
    return StressCurve(r, sr, st, ring_r, ring, peak, where, m.strength)
