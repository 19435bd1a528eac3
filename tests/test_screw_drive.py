"""Power-screw torque, efficiency, self-locking, speed, Euler buckling and whirling speed."""

import math

import numpy as np
import pytest

from gen.errors import GeometryError
from gen.geometry.screw import TRAPEZOIDAL, thread_sizes
from gen.geometry.screw_drive import (BUCKLING_C, WHIRL_LAMBDA, buckling_load, critical_speed,
                                      friction_for, linear_speed, screw_rpm, screw_torques)


def test_shigley_power_screw_example():
    # Shigley, Mechanical Engineering Design, Example 8-1 (from memory): square thread,
    # d 32 mm, p 4 mm, double thread, f = f_c = 0.08, collar d_c 40 mm, F 6.4 kN →
    # d_m 30 mm, l 8 mm; T_R = 15.94 + 10.24 = 26.18 N·m; T_L = −0.466 + 10.24 = 9.77 N·m;
    # overall efficiency e = 0.311; the thread alone is not self-locking.
    F, dm, lead, f = 6400.0, 32 - 4 / 2, 2 * 4.0, 0.08
    t = screw_torques(F, dm, lead, 0.0, f, collar_friction=0.08, collar_diameter=40.0)
    assert t.thread_raise == pytest.approx(15.94, abs=0.005)
    assert t.collar == pytest.approx(10.24, abs=0.005)
    assert t.raise_torque == pytest.approx(26.18, abs=0.005)
    assert t.thread_lower == pytest.approx(-0.466, abs=0.0005)
    assert t.lower_torque == pytest.approx(9.77, abs=0.005)
    assert t.efficiency == pytest.approx(0.311, abs=0.0005)
    assert not t.self_locking
    # independent route (inclined plane, any mechanics text): a square thread is a wedge of
    # lead angle λ with friction angle φ = atan f: T_R = F d_m/2 tan(λ + φ),
    # T_L = F d_m/2 tan(φ − λ); thread efficiency tan λ / tan(λ + φ)
    lam, phi = math.atan(lead / (math.pi * dm)), math.atan(f)
    assert t.thread_raise == pytest.approx(F * dm / 2000 * math.tan(lam + phi), rel=1e-12)
    assert t.thread_lower == pytest.approx(F * dm / 2000 * math.tan(phi - lam), rel=1e-12)
    assert t.thread_efficiency == pytest.approx(math.tan(lam) / math.tan(lam + phi), rel=1e-12)


def _exact_raise_torque(F, dm, lead, alpha, f):
    """Force balance on the real helicoidal flank (computed, independent of the sec α form).

    At the mean radius, unit vectors (radial, tangential, axial). The flank contains the helix
    direction h = (0, cos λ, sin λ) and the flank generator in the axial plane
    g = (cos α, 0, −sin α); the nut pushes on the screw along the flank normal n = g × h
    (sign chosen to push against the load), friction f N acts against the screw's sliding,
    which is along +h when raising. Axial balance gives N, the tangential components the
    torque.
    """
    lam = math.atan(lead / (math.pi * dm))
    h = np.array([0.0, math.cos(lam), math.sin(lam)])
    g = np.array([math.cos(alpha), 0.0, -math.sin(alpha)])
    n = np.cross(g, h)
    n /= np.linalg.norm(n)
    if n[2] < 0:
        n = -n
    per_n = n - f * h                  # force on the screw per unit N (normal + friction)
    N = F / per_n[2]                   # axial: nut reaction balances the load F
    drive = -N * per_n[1]              # tangential force the torque must supply
    return drive * dm / 2 / 1000


@pytest.mark.parametrize("d,p,n,f", [(10, 2, 1, 0.15), (12, 3, 2, 0.1), (20, 4, 4, 0.2)])
def test_trapezoidal_torque_against_flank_force_balance(d, p, n, f):
    s = thread_sizes(TRAPEZOIDAL, d, p, starts=n)
    t = screw_torques(1000.0, s.d2, s.lead, s.half_angle, f)
    exact = _exact_raise_torque(1000.0, s.d2, s.lead, s.half_angle, f)
    # Shigley's formula measures α in the axial plane and neglects the lead's tilt of the
    # normal (tan α_n = tan α cos λ); at lead angles ≤ 4° that changes T by well under 1 %
    assert t.thread_raise == pytest.approx(exact, rel=5e-3)
    # the same formula as a wedge with friction angle φ' = atan(f sec α) (computed)
    lam, phi = math.atan(s.lead / (math.pi * s.d2)), math.atan(f / math.cos(s.half_angle))
    assert t.thread_raise == pytest.approx(1000 * s.d2 / 2000 * math.tan(lam + phi), rel=1e-12)


def test_self_locking_and_efficiency():
    s = thread_sizes(TRAPEZOIDAL, 10, 2)
    # computed: π f d2 sec α = π·0.1·9·sec 15° = 2.927 mm > L = 2 mm → self-locking
    t = screw_torques(500.0, s.d2, s.lead, s.half_angle, 0.1)
    assert t.self_locking and t.thread_lower > 0
    # energy check: efficiency is the work on the load per turn over the work put in
    assert t.efficiency == pytest.approx(500 * 2 / 1000 / (2 * math.pi * t.raise_torque), rel=1e-12)
    # three starts: L = 6 mm > 2.927 mm → the load back-drives the screw (T_L < 0)
    s3 = thread_sizes(TRAPEZOIDAL, 10, 2, starts=3)
    t3 = screw_torques(500.0, s3.d2, s3.lead, s3.half_angle, 0.1)
    assert not t3.self_locking and t3.thread_lower < 0
    # common practice: a self-locking square-thread screw is below 50 % efficient
    for f in np.linspace(0.05, 0.4, 8):
        for lead in (1.0, 2.0, 5.0, 10.0):
            tt = screw_torques(100.0, 10.0, lead, 0.0, float(f))
            if tt.self_locking:
                assert tt.thread_efficiency < 0.5


def test_speed():
    # computed: 300 rpm × 8 mm lead = 2400 mm/min = 40 mm/s
    assert linear_speed(300, 8) == pytest.approx(40.0)
    assert screw_rpm(40.0, 8) == pytest.approx(300.0)


def _root(f, lo, hi):
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if (f(lo) < 0) == (f(mid) < 0):
            lo = mid
        else:
            hi = mid
    return 0.5 * (lo + hi)


def test_end_condition_constants_from_beam_equations():
    # Euler column, fixed–pinned: tan(kl) = kl, first root 4.4934 → C = (kl/π)² (from memory,
    # classical column theory; root recomputed here)
    kl = _root(lambda x: math.tan(x) - x, 4.0, 4.6)
    assert BUCKLING_C["fixed-pinned"] == pytest.approx((kl / math.pi) ** 2, abs=1e-3)
    # fixed–free kl = π/2, fixed–fixed kl = 2π (from memory) → C = ¼ and 4
    assert BUCKLING_C["fixed-free"] == (0.5 * math.pi / math.pi) ** 2
    assert BUCKLING_C["fixed-fixed"] == (2 * math.pi / math.pi) ** 2
    # beam frequency equations (from memory): cantilever cos λ cosh λ = −1, clamped–clamped
    # cos λ cosh λ = 1, clamped–pinned tan λ = tanh λ; roots recomputed
    cf = _root(lambda x: math.cos(x) * math.cosh(x) + 1, 1.5, 2.5)
    cc = _root(lambda x: math.cos(x) * math.cosh(x) - 1, 4.5, 5.0)
    cp = _root(lambda x: math.tan(x) - math.tanh(x), 3.5, 4.5)
    assert WHIRL_LAMBDA["fixed-free"] == pytest.approx(cf, abs=1e-3)
    assert WHIRL_LAMBDA["fixed-fixed"] == pytest.approx(cc, abs=1e-3)
    assert WHIRL_LAMBDA["fixed-pinned"] == pytest.approx(cp, abs=1e-3)


def test_euler_buckling_tr12():
    # Tr 12×3 steel screw (E 207 GPa, from memory), root d3 8.5 mm, 500 mm between pinned
    # ends. Independent route (computed): critical stress σ = C π² E / (l/k)², k = d3/4 the
    # radius of gyration of a round section, times the root area.
    d3, l, E = 8.5, 500.0, 207000.0
    k = d3 / 4
    sigma = math.pi ** 2 * E / (l / k) ** 2
    expect = sigma * math.pi * d3 ** 2 / 4
    assert buckling_load(d3, l, E) == pytest.approx(expect, rel=1e-12)
    assert buckling_load(d3, l, E) == pytest.approx(2094, abs=1)  # computed by hand
    assert buckling_load(d3, l, E, "fixed-free") == pytest.approx(expect / 4, rel=1e-12)
    with pytest.raises(GeometryError, match="unknown end condition"):
        buckling_load(d3, l, E, "clamped")


def test_whirling_speed_against_finite_difference_beam():
    # Independent route (computed): the first natural frequency of a pinned–pinned
    # Euler–Bernoulli beam from a finite-difference eigenproblem EI w'''' = ω² ρ A w,
    # w = w'' = 0 at both ends (the fourth-difference matrix is the square of the second).
    d3, l, E, rho = 8.5, 500.0, 207000.0, 7850.0
    m = 400
    hstep = (l / 1000) / (m + 1)
    D2 = (np.diag(-2 * np.ones(m)) + np.diag(np.ones(m - 1), 1) + np.diag(np.ones(m - 1), -1)) / hstep ** 2
    lam_min = np.linalg.eigvalsh(D2 @ D2)[0]
    EI = E * 1e6 * math.pi * (d3 / 1000) ** 4 / 64
    rhoA = rho * math.pi * (d3 / 1000) ** 2 / 4
    rpm_fd = 60 * math.sqrt(lam_min * EI / rhoA) / (2 * math.pi)
    # tolerance: second-order differences with 400 nodes, error ~ (π h / l)² / 12 ≈ 5e-6
    assert critical_speed(d3, l, E, rho) == pytest.approx(rpm_fd, rel=1e-4)
    # the other ends scale as λ² (same formula, constants checked above)
    ratio = critical_speed(d3, l, E, rho, "fixed-fixed") / critical_speed(d3, l, E, rho)
    assert ratio == pytest.approx((4.730 / math.pi) ** 2, rel=1e-12)


def test_friction_table():
    pair = friction_for("steel", "bronze", "oil")
    # Shigley Table 8-5 (from memory): steel on bronze, machine oil 0.10–0.16
    assert (pair.low, pair.high) == (0.10, 0.16) and "Shigley" in pair.source
    assert friction_for("Steel", "pom").source == "common practice"
    with pytest.raises(GeometryError, match="give the friction coefficient"):
        friction_for("brass", "PLA")


def test_bad_torque_input_refused():
    with pytest.raises(GeometryError, match="locks"):
        screw_torques(100, 5.0, 20.0, 0.0, 0.9)
    with pytest.raises(GeometryError, match="negative"):
        screw_torques(100, 10.0, 2.0, 0.0, -0.1)
