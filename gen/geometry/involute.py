"""Involute function, its inverse and the involute curve.

inv(α) = tan α − α (ISO 21771 notation; any gear handbook).
"""

from __future__ import annotations

import numpy as np


def inv(alpha):
    """Involute function inv α = tan α − α (α in radians)."""
    alpha = np.asarray(alpha, dtype=float)
    return np.tan(alpha) - alpha


def inv_inverse(value, *, tol: float = 1e-15, max_iter: int = 60):
    """Solve inv α = value for α in [0, π/2) by Newton's method.

    d(inv α)/dα = tan²α; the start α₀ = (3 v)^(1/3) comes from inv α ≈ α³/3 for small α.
    """
    v = np.asarray(value, dtype=float)
    if np.any(v < 0):
        raise ValueError("inverse involute needs a value ≥ 0")
    a = np.cbrt(3.0 * v)
    a = np.where(v > 0.5, 1.2, a)  # large values: start high (inv 1.2 ≈ 1.37)
    for _ in range(max_iter):
        t = np.tan(a)
        f = t - a - v
        step = np.where(t * t > 0, f / np.maximum(t * t, 1e-300), 0.0)
        a = np.clip(a - step, 0.0, np.pi / 2 - 1e-12)
        if np.all(np.abs(f) < tol):
            break
    return a if a.ndim else float(a)


def pressure_angle_at(rb: float, r):
    """Profile angle α_r at radius r on an involute of base radius rb: cos α_r = rb / r."""
    r = np.asarray(r, dtype=float)
    return np.arccos(np.clip(rb / r, -1.0, 1.0))


def half_thickness_angle(r, *, rp: float, rb: float, s: float):
    """Half the angular tooth thickness at radius r (rad) for a tooth of arc thickness s on rp.

    ψ(r) = s/(2 rp) + inv α − inv α_r, with cos α = rb/rp (ISO 21771 tooth thickness relation).
    """
    alpha = np.arccos(rb / rp)
    return s / (2.0 * rp) + inv(alpha) - inv(pressure_angle_at(rb, r))


def involute_points(rb: float, r, start_angle: float = 0.0):
    """Points of the involute of the base circle rb (unwinding counter-clockwise) at radii r.

    The involute starts on the base circle at polar angle ``start_angle``; a point at radius r
    has polar angle start_angle + inv α_r. Returns an (n, 2) array.
    """
    r = np.atleast_1d(np.asarray(r, dtype=float))
    th = start_angle + inv(pressure_angle_at(rb, r))
    return np.column_stack([r * np.cos(th), r * np.sin(th)])
