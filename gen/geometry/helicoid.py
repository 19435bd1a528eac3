"""Transverse section of a helicoid (screw thread, helical groove) from its axial profile.

A helicoid is a planar profile in the axial (r, z) half-plane that turns uniformly about the
axis while it advances: one full turn per lead L. Seen in the transverse plane z = 0, the
point of the axial profile at (r, z) lies at polar angle θ = −2π z / L (computed from the
helix x = r cos t, y = r sin t, z = L t / 2π). So if, at radius r, the material of one start
occupies the axial interval |z − z_c| ≤ w(r)/2 (per pitch P = L / n for n starts), the
transverse section at radius r occupies the angular interval

    |θ − θ_c| ≤ φ(r) = π w(r) / L,          θ_c = −2π z_c / L + 2π k / n,  k = 0 … n − 1.

Carried along the axis by a twisted prism with twist 2π / L (rad/mm, > 0 right-hand, see
:mod:`gen.geometry.body`) that section sweeps out the helicoid exactly: the section at height
z is the one at 0 turned by 2π z / L, which is the definition above read backwards. The flank
curves r ↦ φ(r) are generally not circles (a straight axial flank gives an Archimedean
spiral), so they are kept as :class:`~gen.geometry.section.Spline` point sets; the crest
and root are circular arcs.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.geometry.section import Arc, Loop, Spline


def _polar(r, ang):
    return np.column_stack([r * np.cos(ang), r * np.sin(ang)])


def helicoid_loop(r, width, lead: float, starts: int = 1, phase: float = 0.0) -> Loop:
    """Transverse section (z = 0) of a thread whose axial material width is ``width`` at ``r``.

    Parameters
    ----------
    r : array (m,)
        Radii, mm, strictly increasing: r[0] is the root (material all round below it),
        r[-1] the crest (no material above it).
    width : array (m,)
        Axial width of the material of one start at each radius, mm, with
        0 ≤ width ≤ L / starts (the pitch).
    lead : float
        Lead L, mm (axial advance per turn).
    starts : int
        Number of starts n; the lobes repeat every 2π / n.
    phase : float
        Polar angle of lobe 0's centre line, rad.

    Returns
    -------
    Loop
        Counter-clockwise loop: per lobe, the rising flank (spline), the crest arc (if the
        crest is not pointed), the falling flank, and the root arc to the next lobe (if the
        root has a gap). Angular half-width of a lobe: φ(r) = π w(r) / L.
    """
    r = np.asarray(r, dtype=float)
    w = np.asarray(width, dtype=float)
    if r.ndim != 1 or r.shape != w.shape or len(r) < 2:
        raise GeometryError("helicoid profile needs matching radius and width arrays of ≥ 2 samples")
    if np.any(np.diff(r) <= 0) or r[0] <= 0:
        raise GeometryError("helicoid profile radii must be positive and strictly increasing")
    if lead <= 0 or starts < 1:
        raise GeometryError("a helicoid needs a positive lead and at least one start")
    pitch = lead / starts
    tol = 1e-9 * max(pitch, 1.0)
    if np.any(w < -tol) or np.any(w > pitch + tol):
        raise GeometryError("the thread's axial width must lie between 0 and the pitch "
                            f"(got {w.min():.4f} … {w.max():.4f} mm for a pitch of {pitch:.4f} mm)")
    w = np.clip(w, 0.0, pitch)
    phi = math.pi * w / lead
    step = 2.0 * math.pi / starts
    curves = []
    for k in range(starts):
        c = phase + k * step
        curves.append(Spline(_polar(r, c - phi)))                       # rising flank
        if phi[-1] > 1e-12:
            curves.append(Arc((0.0, 0.0), float(r[-1]), c - phi[-1], c + phi[-1]))
        curves.append(Spline(_polar(r[::-1], c + phi[::-1])))           # falling flank
        if step - 2.0 * phi[0] > 1e-12:
            curves.append(Arc((0.0, 0.0), float(r[0]), c + phi[0], c + step - phi[0]))
    return Loop(tuple(curves))


def flank_samples(turn: float, r_max: float, sag: float = 1e-4, least: int = 16) -> int:
    """Samples for a flank that turns through ``turn`` rad at radii up to ``r_max`` (mm) so
    that its polyline stays within ``sag`` mm of the curve: a chord spanning Δθ on radius r
    sags about r Δθ² / 8, so Δθ = √(8 sag / r) (computed; assumes roughly even angle steps).
    """
    step = math.sqrt(8.0 * sag / r_max)
    return max(least, int(math.ceil(abs(turn) / step)) + 1)


def twist_rate(lead: float, hand: str = "right") -> float:
    """Twist (rad per mm of height) that sweeps a helicoid of lead L: ±2π / L, + right-hand."""
    if lead <= 0:
        raise GeometryError("lead must be positive")
    if hand not in ("right", "left"):
        raise GeometryError(f"hand must be 'right' or 'left' (got {hand!r})")
    t = 2.0 * math.pi / lead
    return t if hand == "right" else -t
