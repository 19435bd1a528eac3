"""Least-squares B-spline fits of exact curves (gen.geometry.bspline_fit): the fitted curve
stays within the tolerance of the exact curve everywhere (checked far more densely than the
fit's own samples, against closed forms), keeps its end points, and evaluates as the CAD
kernel evaluates the same B-spline."""

from __future__ import annotations

import math

import numpy as np
import pytest

from gen.geometry.bspline_fit import basis, fit_curve
from gen.geometry.involute import inv

TOL = 8e-7   # mm, the tolerance the solid layer asks of a flank fit


def test_basis_is_a_partition_of_unity():
    # common practice (The NURBS Book, property P2.4, from memory): on a clamped knot vector
    # the basis functions are ≥ 0 and sum to 1 everywhere, ends included
    full = np.repeat([0.0, 0.3, 0.35, 1.2, 2.0], [6, 1, 4, 1, 6])
    t = np.linspace(0.0, 2.0, 1001)
    B = basis(full, 5, t)
    assert B.shape == (1001, len(full) - 6)
    assert np.all(B >= -1e-15)
    assert np.allclose(B.sum(axis=1), 1.0, atol=1e-14)


def _dense(fit, n=20001):
    full = fit.full
    return fit.at(np.linspace(full[0], full[-1], n))


def test_arc_fit_stays_on_the_circle_between_its_samples():
    # a 40° arc of radius 25 sampled at 200 points; the fit is checked at 20,001 points of
    # the curve against the circle itself (computed: | |p| − R |)
    R = 25.0
    a = np.linspace(0.1, 0.1 + math.radians(40.0), 200)
    pts = np.column_stack([R * np.cos(a), R * np.sin(a)])
    fit = fit_curve(pts, TOL)
    assert fit is not None and fit.error <= TOL
    dense = _dense(fit)
    assert np.abs(np.hypot(*dense.T) - R).max() <= TOL
    assert np.array_equal(fit.poles[0], pts[0]) and np.array_equal(fit.poles[-1], pts[-1])


def test_involute_fit_stays_on_the_involute_between_its_samples():
    # involute of a base circle rb (ISO 21771 / any gear handbook, from memory): the point
    # at radius r has polar angle inv α_r, cos α_r = rb / r. Two involutes of one base
    # circle turned by δ are rb·δ apart along their common normal, so a point at radius r
    # and polar angle θ lies rb·|θ − inv α_r| from the involute (computed)
    rb = 37.59
    r = np.linspace(rb + 0.05, 42.0, 200)
    th = inv(np.arccos(rb / r))
    pts = np.column_stack([r * np.cos(th), r * np.sin(th)])
    fit = fit_curve(pts, TOL)
    assert fit is not None and fit.error <= TOL
    dense = _dense(fit)
    rr = np.hypot(*dense.T)
    dist = rb * np.abs(np.arctan2(dense[:, 1], dense[:, 0]) - inv(np.arccos(rb / rr)))
    assert dist.max() <= TOL
    # far fewer poles than samples: the point of fitting
    assert len(fit.poles) <= 16


def test_fit_evaluates_as_the_kernel_evaluates_it():
    # the same poles, knots and multiplicities handed to OpenCASCADE's Geom2d_BSplineCurve
    # (a general reference library) give the same points
    occ = pytest.importorskip("OCP.Geom2d")
    from OCP.gp import gp_Pnt2d
    from OCP.TColgp import TColgp_Array1OfPnt2d
    from OCP.TColStd import TColStd_Array1OfInteger, TColStd_Array1OfReal

    a = np.linspace(0.0, 1.5, 200)
    pts = np.column_stack([10.0 * np.cos(a) + 0.3 * a ** 3, 10.0 * np.sin(a)])
    fit = fit_curve(pts, TOL)
    P = TColgp_Array1OfPnt2d(1, len(fit.poles))
    for i, (x, y) in enumerate(fit.poles, 1):
        P.SetValue(i, gp_Pnt2d(float(x), float(y)))
    K = TColStd_Array1OfReal(1, len(fit.knots))
    M = TColStd_Array1OfInteger(1, len(fit.knots))
    for i, (k, m) in enumerate(zip(fit.knots, fit.mults), 1):
        K.SetValue(i, float(k))
        M.SetValue(i, int(m))
    curve = occ.Geom2d_BSplineCurve(P, K, M, fit.deg)
    u = np.linspace(fit.knots[0], fit.knots[-1], 57)
    ours = fit.at(u)
    theirs = np.array([[curve.Value(float(x)).X(), curve.Value(float(x)).Y()] for x in u])
    assert np.abs(ours - theirs).max() < 1e-12


def test_too_tight_a_tolerance_gives_no_fit():
    # samples with noise of 1e-3 mm cannot be followed within 1e-9 mm by a few spans
    rng = np.random.default_rng(7)
    a = np.linspace(0.0, 1.0, 200)
    pts = np.column_stack([a, 1e-3 * rng.standard_normal(200)])
    assert fit_curve(pts, 1e-9) is None
