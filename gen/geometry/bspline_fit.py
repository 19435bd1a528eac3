"""Least-squares B-spline fit of a plane curve given by dense exact samples, checked against
those samples.

The section curves of a gear (trochoidal root, involute) are known exactly at any point;
the solid layer writes each as one clamped, non-rational B-spline. :func:`fit_curve` finds
one with few poles: simple knots added span by span (the span holding the worst sample is
halved) until every exact sample lies within ``tol`` of the curve.

The method is the usual one for approximating curves (Piegl & Tiller, *The NURBS Book*,
2nd ed., §9.4.1 least squares with fixed end points, and §6.1 point inversion by Newton's
method, from memory): chord-length parameters, then the parameters are corrected by
projecting every sample onto the fitted curve (Hoschek's parameter correction) and the
poles solved again. The error reported is the distance of each sample from its foot point
on the curve, a geometric (not parametric) distance.

numpy only.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


def basis(full: np.ndarray, deg: int, t: np.ndarray) -> np.ndarray:
    """B-spline basis N_j,deg(t) on the full clamped knot vector, (len t, n): the deg + 1
    functions not zero at each t by the triangular recurrence (The NURBS Book, A2.2)."""
    t = np.asarray(t, dtype=float)
    n = len(full) - deg - 1
    span = np.clip(np.searchsorted(full, t, side="right") - 1, deg, n - 1)
    N = np.zeros((len(t), deg + 1))
    N[:, 0] = 1.0
    left = np.zeros((len(t), deg + 1))
    right = np.zeros((len(t), deg + 1))
    for j in range(1, deg + 1):
        left[:, j] = t - full[span + 1 - j]
        right[:, j] = full[span + j] - t
        saved = np.zeros(len(t))
        for r in range(j):
            temp = N[:, r] / (right[:, r + 1] + left[:, j - r])
            N[:, r] = saved + right[:, r + 1] * temp
            saved = left[:, j - r] * temp
        N[:, j] = saved
    B = np.zeros((len(t), n))
    rows = np.arange(len(t))
    for k in range(deg + 1):
        B[rows, span - deg + k] = N[:, k]
    return B


def derivative(full: np.ndarray, deg: int, P: np.ndarray):
    """(knots, degree, poles) of the derivative curve (The NURBS Book eq. 3.8)."""
    d = full[deg + 1:-1] - full[1:-deg - 1]
    Q = deg * (P[1:] - P[:-1]) / np.where(d > 0, d, 1.0)[:, None]
    return full[1:-1], deg - 1, Q


@dataclass(frozen=True, eq=False)
class FittedSpline:
    """Clamped non-rational B-spline: degree, knots (distinct) and multiplicities, poles (n, 2);
    ``error``: largest distance of the exact samples from the curve (mm)."""

    deg: int
    knots: np.ndarray
    mults: tuple
    poles: np.ndarray
    error: float

    @property
    def full(self) -> np.ndarray:
        return np.repeat(self.knots, self.mults)

    def at(self, u) -> np.ndarray:
        return basis(self.full, self.deg, np.atleast_1d(u)) @ self.poles


def _solve(full, deg, u, pts):
    """Poles minimising Σ|C(u_k) − pts_k|² with the first and last pole on the end samples."""
    A = basis(full, deg, u)
    b = pts - np.outer(A[:, 0], pts[0]) - np.outer(A[:, -1], pts[-1])
    inner, *_ = np.linalg.lstsq(A[:, 1:-1], b, rcond=None)
    return np.vstack([pts[0], inner, pts[-1]])


def _project(full, deg, P, u, pts, lo, hi, steps: int = 4):
    """Newton point inversion of each sample from its current parameter; (u, distances)."""
    f1, d1, Q1 = derivative(full, deg, P)
    f2, d2, Q2 = derivative(f1, d1, Q1)
    for _ in range(steps):
        C = basis(full, deg, u) @ P
        D1 = basis(f1, d1, u) @ Q1
        D2 = basis(f2, d2, u) @ Q2 if d2 >= 0 else np.zeros_like(D1)
        r = C - pts
        num = np.sum(r * D1, axis=1)
        den = np.sum(D1 * D1, axis=1) + np.sum(r * D2, axis=1)
        u = np.clip(u - num / np.where(np.abs(den) > 1e-300, den, 1.0), lo, hi)
    C = basis(full, deg, u) @ P
    return u, np.hypot(*(C - pts).T)


def fit_degree(points: np.ndarray, deg: int, tol: float, max_spans: int = 48):
    """The fit of :func:`fit_curve` at one degree, or None when ``max_spans`` spans do not
    reach ``tol``."""
    pts = np.asarray(points, dtype=float)
    u0 = np.concatenate([[0.0], np.cumsum(np.hypot(*np.diff(pts, axis=0).T))])
    length = float(u0[-1])
    if length <= 0.0 or len(pts) < 2 * (deg + 1):
        return None
    breaks = [0.0, length]
    while True:
        knots = np.array(breaks)
        mults = (deg + 1,) + (1,) * (len(breaks) - 2) + (deg + 1,)
        full = np.repeat(knots, mults)
        u = u0.copy()
        P = _solve(full, deg, u, pts)
        for _ in range(3):                      # parameter correction, then solve again
            u, _ = _project(full, deg, P, u, pts, 0.0, length)
            P = _solve(full, deg, u, pts)
        u, dist = _project(full, deg, P, u, pts, 0.0, length)
        k = int(np.argmax(dist))
        if dist[k] <= tol:
            return FittedSpline(deg, knots, mults, P, float(dist[k]))
        if len(breaks) - 1 >= max_spans or len(P) + 1 > len(pts) // 4:
            return None
        j = min(max(int(np.searchsorted(breaks, u[k])) - 1, 0), len(breaks) - 2)
        breaks.insert(j + 1, 0.5 * (breaks[j] + breaks[j + 1]))   # halve the worst span


def fit_curve(points: np.ndarray, tol: float, degrees=(5, 4, 3)) -> FittedSpline | None:
    """A clamped B-spline through the first and last of ``points`` (dense samples (m, 2) of an
    exact curve, in order) whose every sample lies within ``tol`` (mm) of it: the first of
    ``degrees`` that reaches ``tol``; None when none does."""
    for deg in degrees:
        f = fit_degree(points, deg, tol)
        if f is not None:
            return f
    return None
