"""Closed outline of a whole external gear from one generated flank.

Each tooth contributes, counter-clockwise: the −ψ flank (trochoidal root spline, then involute
spline), the tip arc, the +ψ flank back down, and the root arc to the next tooth. Tooth 0 is
centred on +X. Every curve starts exactly where the previous one ends. Each flank spline
carries its exact curve (:class:`FlankSide`), which the solid layer fits instead of the
samples.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.generate import Cutter, Flank, psi_exact
from gen.geometry.section import Arc, Exact, Loop, Spline


def _polar(r, ang):
    return np.column_stack([r * np.cos(ang), r * np.sin(ang)])


@dataclass(frozen=True)
class FlankSide:
    """One piece of a generated flank, tooth centred on +X: radius r(t) from ``r0`` (t = 0)
    to ``r1`` (t = 1), linear in t, or in t² (``square``: the trochoidal root, whose samples
    crowd at the root circle it touches); polar angle ``sign``·ψ(r), ψ the generated half
    tooth angle evaluated afresh (:func:`gen.geometry.generate.psi_exact`)."""

    cutter: Cutter
    rp: float
    z: int
    r0: float
    r1: float
    square: bool
    sign: float

    def __call__(self, t) -> np.ndarray:
        t = np.asarray(t, dtype=float)
        r = self.r0 + (self.r1 - self.r0) * (t * t if self.square else t)
        return _polar(r, self.sign * psi_exact(self.cutter, self.rp, self.z, r))


def flank_splines(flank: Flank, c: float, pieces: list, sign: float) -> list:
    """Splines of one flank of the tooth centred at angle c: ``sign`` −1 the −ψ side, root to
    tip; +1 the +ψ side, tip to root. ``pieces``: slices of the flank samples."""
    r, psi = flank.r, flank.psi
    out = []
    order = pieces if sign < 0 else list(reversed(pieces))
    for sl in order:
        rr, pp = (r[sl], psi[sl]) if sign < 0 else (r[sl][::-1], psi[sl][::-1])
        exact = None
        if flank.cutter is not None:
            lo, hi = r[sl][0], r[sl][-1]
            square = sl.start == 0
            src = FlankSide(flank.cutter, flank.rp, flank.z, float(lo), float(hi), square, sign)
            exact = Exact(src, c, (0.0, 0.0), sign > 0)
        out.append(Spline(_polar(rr, c + sign * pp), exact))
    return out


def flank_pieces(flank: Flank) -> list:
    """Slices of the flank samples: the trochoidal root, then (if any) the involute."""
    n_root = int(np.searchsorted(flank.r, flank.r_junction, side="right"))
    pieces = [slice(0, n_root)]
    if n_root < len(flank.r):
        pieces.append(slice(n_root - 1, len(flank.r)))
    return pieces


def gear_loop(flank: Flank) -> Loop:
    z = flank.z
    psi = flank.psi
    if psi[-1] <= 0:
        raise GeometryError("pointed teeth: the flanks meet below the tip circle")
    pieces = flank_pieces(flank)
    pitch = 2.0 * math.pi / z
    root_span = pitch - 2.0 * psi[0]
    curves = []
    for k in range(z):
        c = k * pitch
        curves.extend(flank_splines(flank, c, pieces, -1.0))
        curves.append(Arc((0.0, 0.0), flank.r_tip, c - psi[-1], c + psi[-1]))
        curves.extend(flank_splines(flank, c, pieces, 1.0))
        if root_span > 1e-9:
            curves.append(Arc((0.0, 0.0), flank.r_root, c + psi[0], c + pitch - psi[0]))
    return Loop(tuple(curves))
