"""Closed outline of a whole external gear from one generated flank.

Each tooth contributes, counter-clockwise: the −ψ flank (trochoidal root spline, then involute
spline), the tip arc, the +ψ flank back down, and the root arc to the next tooth. Tooth 0 is
centred on +X. Every curve starts exactly where the previous one ends.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.geometry.generate import Flank
from gen.geometry.section import Arc, Loop, Spline


def _polar(r, ang):
    return np.column_stack([r * np.cos(ang), r * np.sin(ang)])


def gear_loop(flank: Flank) -> Loop:
    z = flank.z
    r, psi = flank.r, flank.psi
    if psi[-1] <= 0:
        raise GeometryError("pointed teeth: the flanks meet below the tip circle")
    n_root = int(np.searchsorted(r, flank.r_junction, side="right"))
    pieces = [slice(0, n_root)]
    if n_root < len(r):
        pieces.append(slice(n_root - 1, len(r)))
    pitch = 2.0 * math.pi / z
    root_span = pitch - 2.0 * psi[0]
    curves = []
    for k in range(z):
        c = k * pitch
        for sl in pieces:  # −ψ side, root to tip
            curves.append(Spline(_polar(r[sl], c - psi[sl])))
        curves.append(Arc((0.0, 0.0), flank.r_tip, c - psi[-1], c + psi[-1]))
        for sl in reversed(pieces):  # +ψ side, tip to root
            curves.append(Spline(_polar(r[sl][::-1], c + psi[sl][::-1])))
        if root_span > 1e-9:
            curves.append(Arc((0.0, 0.0), flank.r_root, c + psi[0], c + pitch - psi[0]))
    return Loop(tuple(curves))
