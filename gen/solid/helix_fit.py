"""Numpy B-spline fit along the axis: the v-direction of twisted (helicoidal) faces.

Because rotation is linear, a clamped cubic B-spline in v = z whose control points are the
section's control points moved to the Greville heights reproduces the exact moved curve at
those heights; between them the surface leaves the true helicoid by at most ρ_max · e(Θ), e
the fit error of the unit circle, checked numerically (spans added until ≤ HELIX_FIT).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from gen.errors import GeometryError
from gen.geometry.bspline_fit import basis

from gen.solid.kernel import HELIX_FIT


@dataclass(eq=False)
class _VFit:
    """Clamped B-spline in v = z over one stage, and the weights A mapping data to poles."""

    deg: int
    knots: list
    mults: list
    zs: np.ndarray       # data heights (Greville points)
    A: np.ndarray        # poles_j = Σ_k A_jk data_k
    error: float         # fit error of a unit-radius helix (mm per mm of radius)


@lru_cache(maxsize=256)
def vfit(za: float, zb: float, turn: float, rho: float) -> _VFit:
    """Smallest uniform cubic fit whose helix error ρ·e ≤ HELIX_FIT (turn = Δθ over the stage).

    The error of cubic interpolation falls as (Θ/spans)⁴, so one trial span count gives an
    estimate; the estimate is then checked and raised until the measured error fits.
    """
    if turn == 0.0:
        return _VFit(1, [za, zb], [2, 2], np.array([za, zb]), np.eye(2), 0.0)
    spans = max(1, int(math.ceil(abs(turn) / 0.5)))
    fit = _vfit_spans(za, zb, turn, spans)
    if fit.error * rho > HELIX_FIT:
        spans = int(math.ceil(spans * (fit.error * rho / HELIX_FIT) ** 0.25))
    for _ in range(64):
        fit = _vfit_spans(za, zb, turn, spans)
        if fit.error * rho <= HELIX_FIT:
            return fit
        spans += max(1, spans // 8)
    raise GeometryError(f"twist of {turn:.3f} rad over one stage is too large to fit")


def _vfit_spans(za: float, zb: float, turn: float, spans: int) -> _VFit:
    """Cubic interpolation at the Greville points of ``spans`` uniform spans; error measured."""
    knots = np.linspace(za, zb, spans + 1)
    full = np.concatenate([[za] * 3, knots, [zb] * 3])
    n = spans + 3
    zs = np.array([full[j + 1:j + 4].mean() for j in range(n)])
    A = np.linalg.inv(basis(full, 3, zs))
    th = (zs - za) / (zb - za) * turn
    P = A @ np.column_stack([np.cos(th), np.sin(th)])
    ts = np.linspace(za, zb, 24 * spans + 1)
    E = basis(full, 3, ts) @ P
    the = (ts - za) / (zb - za) * turn
    err = float(np.max(np.hypot(E[:, 0] - np.cos(the), E[:, 1] - np.sin(the))))
    return _VFit(3, [float(k) for k in knots], [4] + [1] * (spans - 1) + [4], zs, A, err)


def place(Q: np.ndarray, c, s, t):
    """x, y of points Q (n, 2) under the affine map [[c, −s], [s, c]]·Q + (t, 0) (broadcasts)."""
    return c * Q[:, 0:1] - s * Q[:, 1:2] + t, s * Q[:, 0:1] + c * Q[:, 1:2]

