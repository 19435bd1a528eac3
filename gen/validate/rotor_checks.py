"""Mass properties of a body measured on slices of its exported triangles, and the error bound
that a chord tolerance allows against the exact body of revolution.

A rotor whose half-section has only axial (r = const) and radial (z = const) edges is, between
two neighbouring z breakpoints of its section, a straight prism: its triangles are too (the
revolve and the axial hole cylinders only have vertical walls there). One slice at each band's
mid-height therefore gives the triangles' volume and inertia exactly (up to float round-off):

    V = Σ h_k A_k,  I_z = ρ Σ h_k J_k,
    ½(I_x + I_y) about the origin = ρ Σ (h_k J_k / 2 + A_k ∫ z² dz over band k),

with A the slice's area and J = ∫∫ (x² + y²) dA its polar moment (polygon formulas by Green's
theorem, standard: ∫∫ x² dA = Σ c_i (x_i² + x_i x_i+1 + x_i+1²)/12, c_i = x_i y_i+1 − x_i+1 y_i).
Slices may hold several loops (outer boundary, bore, lightening holes) in either orientation;
a loop inside an odd number of others is a hole.

Error bound (computed): an inscribed regular polygon of sagitta s on a circle of radius R has
θ = 2π/n ≤ 2·acos(1 − s/R) (s = R (1 − cos θ/2)); its area falls short by 1 − sin θ/θ ≤ θ²/6 of the circle's, its
polar moment by 1 − sin θ (2 + cos θ)/(3θ) ≤ θ²/3 (Taylor series with alternating terms).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class SliceMass:
    """Triangles' mass properties from slices. volume mm³, mass kg, inertias kg·m², z̄ mm."""

    volume: float
    mass: float
    centroid_z: float
    axial_inertia: float
    transverse_inertia: float


def _loop_moments(p: np.ndarray) -> tuple[float, float]:
    """(signed area mm², signed polar moment mm⁴ about the origin) of one closed polygon."""
    x, y = p[:, 0], p[:, 1]
    xn, yn = np.roll(x, -1), np.roll(y, -1)
    c = x * yn - xn * y
    area = 0.5 * float(np.sum(c))
    jx = float(np.sum(c * (y * y + y * yn + yn * yn))) / 12.0   # ∫∫ y² dA
    jy = float(np.sum(c * (x * x + x * xn + xn * xn))) / 12.0   # ∫∫ x² dA
    return area, jx + jy


def _inside(poly: np.ndarray, pt) -> bool:
    """Even-odd point-in-polygon (crossing number)."""
    a, b = poly, np.roll(poly, -1, axis=0)
    x, y = pt
    cond = (a[:, 1] > y) != (b[:, 1] > y)
    with np.errstate(divide="ignore", invalid="ignore"):
        xc = a[:, 0] + (y - a[:, 1]) * (b[:, 0] - a[:, 0]) / (b[:, 1] - a[:, 1])
    return bool(np.count_nonzero(cond & (x < xc)) % 2)


def slice_moments(loops) -> tuple[float, float]:
    """(area mm², polar moment mm⁴) of the material in one slice given as closed loops."""
    loops = [np.asarray(p, dtype=float)[:, :2] for p in loops if len(p) >= 3]
    area = polar = 0.0
    for i, p in enumerate(loops):
        a, j = _loop_moments(p)
        if a < 0.0:
            a, j = -a, -j
        depth = sum(_inside(q, p[0]) for k, q in enumerate(loops) if k != i)
        sign = -1.0 if depth % 2 else 1.0
        area += sign * a
        polar += sign * j
    return area, polar


def slice_mass(slicer, z_breaks, density: float) -> SliceMass:
    """Mass properties of a body that is a straight prism between neighbouring ``z_breaks``.

    ``slicer(z)`` returns the closed loops of the body cut at height z (mm); ``density``
    kg/m³. The transverse inertia is the mean about the two frame axes through the centre of
    mass, perpendicular to z.
    """
    z = np.unique(np.asarray(z_breaks, dtype=float))
    rho = density * 1e-9                       # kg/mm³
    vol = vz = jz = ixy = 0.0
    for z0, z1 in zip(z[:-1], z[1:]):
        h = z1 - z0
        area, polar = slice_moments(slicer(0.5 * (z0 + z1)))
        vol += h * area
        vz += area * 0.5 * (z1 * z1 - z0 * z0)
        jz += h * polar
        ixy += 0.5 * h * polar + area * (z1 ** 3 - z0 ** 3) / 3.0
    if not vol > 0.0:
        return SliceMass(0.0, 0.0, 0.0, 0.0, 0.0)
    mass = rho * vol
    zbar = vz / vol
    return SliceMass(vol, mass, zbar, rho * jz * 1e-6, (rho * ixy - mass * zbar * zbar) * 1e-6)


def polygon_error_bound(radius: float, tol: float) -> tuple[float, float]:
    """(relative area bound, relative polar-moment bound) of circles drawn at chord tolerance
    ``tol`` (mm) with the polygon's sides chosen for ``radius`` (mm): θ²/6 and θ²/3."""
    c = max(-1.0, 1.0 - tol / radius)
    theta = 2.0 * math.acos(c)
    return theta * theta / 6.0, theta * theta / 3.0
