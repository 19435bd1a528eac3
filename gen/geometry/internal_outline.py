"""Closed outlines of an internal gear: the toothed hole and the annular section with its rim.

Frame: ring axis at the origin, tooth 0 of the ring centred on +X (the tooth points inward,
toward the axis), transverse plane, mm and radians. The toothed hole is walked counter-
clockwise: for each tooth the tip arc (r_a2), the +ψ side of the tooth from tip to root
(cutter-trimmed part, involute, trochoidal fillet: one spline each), the root arc (r_f2) across
the tooth space, then the next tooth's −ψ side from root to tip. Every curve starts exactly
where the previous one ends. The tip and root arcs are exact circles: the tip is the blank's
bore, the root is reached by the cutter tip arc (see :mod:`gen.geometry.internal_cut`).
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.geometry.basic_rack import BasicRack
from gen.geometry.internal import RingSizes, ring_sizes
from gen.geometry.internal_cut import (RingFlank, ShaperCutter, default_cutter_teeth,
                                       generate_ring_flank, shaper_cutter)
from gen.geometry.section import Arc, Loop, Section, Spline, circle


def _polar(r, ang):
    return np.column_stack([r * np.cos(ang), r * np.sin(ang)])


def _split_indices(flank: RingFlank):
    """Index slices of the flank samples for one spline per generating piece."""
    r = flank.r
    lo, hi = flank.r_involute
    cuts = [0]
    for b in (lo, hi):
        i = int(np.argmin(np.abs(r - b)))
        if abs(r[i] - b) < 1e-9 and 0 < i < len(r) - 1 and i not in cuts:
            cuts.append(i)
    cuts.append(len(r) - 1)
    cuts = sorted(set(cuts))
    return [slice(a, b + 1) for a, b in zip(cuts[:-1], cuts[1:]) if b > a]


def ring_loop(flank: RingFlank) -> Loop:
    """The ring's toothed hole as a closed Loop (tooth 0 on +X, see the module notes)."""
    z = flank.z
    r = flank.r
    psi = flank.tooth_psi()
    if psi[0] <= 0.0:
        raise GeometryError("the ring's teeth are pointed at the tip circle")
    pieces = _split_indices(flank)
    pitch = 2.0 * math.pi / z
    curves = []
    for k in range(z):
        c = k * pitch
        curves.append(Arc((0.0, 0.0), flank.r_tip, c - psi[0], c + psi[0]))
        for sl in pieces:   # +ψ side, tip → root
            curves.append(Spline(_polar(r[sl], c + psi[sl])))
        if flank.root_half > 1e-12:
            curves.append(Arc((0.0, 0.0), flank.r_root, c + psi[-1], c + pitch - psi[-1]))
        for sl in reversed(pieces):   # next tooth's −ψ side, root → tip
            curves.append(Spline(_polar(r[sl][::-1], c + pitch - psi[sl][::-1])))
    return Loop(tuple(curves))


def ring_section(hole: Loop, outer_diameter: float, *, root_diameter: float | None = None) -> Section:
    """Annular section: the rim circle of ``outer_diameter`` with the toothed hole.

    ``root_diameter`` (the ring's d_f), when given, is checked to lie inside the rim.
    """
    if root_diameter is not None and outer_diameter <= root_diameter:
        raise GeometryError(f"rim outside diameter {outer_diameter:.3f} mm is not outside the "
                            f"root diameter {root_diameter:.3f} mm")
    return Section(circle(outer_diameter / 2.0), (hole,))


def ring_outline(z: int, mn: float, rack: BasicRack, *, x: float = 0.0, beta: float = 0.0,
                 thinning: float = 0.0, tip_shortening: float = 0.0,
                 cutter_teeth: int | None = None, cutter_shift: float = 0.0,
                 cutter_rounding: float = 0.2):
    """Sizes, cutter, generated flank and toothed-hole Loop of a ring in one call.

    ``cutter_teeth`` defaults to :func:`~gen.geometry.internal_cut.default_cutter_teeth`;
    ``cutter_rounding`` is the cutter tip corner radius in modules.
    Returns (RingSizes, ShaperCutter, RingFlank, Loop).
    """
    ring: RingSizes = ring_sizes(z, mn, rack, x=x, beta=beta, thinning=thinning,
                                 tip_shortening=tip_shortening)
    z0 = default_cutter_teeth(z) if cutter_teeth is None else cutter_teeth
    cut: ShaperCutter = shaper_cutter(ring, z0, cutter_shift, cutter_rounding)
    flank = generate_ring_flank(ring, cut)
    return ring, cut, flank, ring_loop(flank)
