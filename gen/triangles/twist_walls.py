"""Walls of twisted prism stages: a layer count per vertex column, set by an error bound.

A moving section loop is a closed polygon P_0 … P_{N-1} (within ε_p of the exact curve). In
one stage of constant motion (twist rate k rad/mm, shear linear in z) every vertex gets a
*column*: copies of P_i at the heights of n_i equal steps, the stage ends always included.
The strip between columns a = i and b = i + 1 is triangulated with its vertices only: two
triangles per step where n_a = n_b (the diagonal chosen as below), otherwise a zipper that
advances one level on one side at a time, always on the side whose next level is lower.

Error bound (linear interpolation on a triangle, derivation computed)
-------------------------------------------------------------------
Take a point X = Σ λ_i X_i of a wall triangle, X_i the corners at heights z_i (λ_i ≥ 0,
Σ λ_i = 1, z = Σ λ_i z_i). The shear is linear in z within a stage and cancels; undoing the
turn θ(z) of its own height brings X into the section plane at

    Y = Σ λ_i R(φ_i) P_i,    φ_i = k (z_i − z),    Σ λ_i φ_i = 0,    |φ_i| ≤ δ,

δ = |k| × (the triangle's height range). The exact wall at height z is the exact curve turned
by θ(z), so the in-plane distance from Y to the exact curve bounds the 3-D distance from X to
the wall from above. With Q = Σ λ_i P_i (on the chord P_a P_b), the chord frame t̂ = (P_b − P_a)/ℓ,
n̂ = (t_y, −t_x), c = P·n̂ (the same for both ends) and s_i = P_i·t̂, the identity
R(φ) − I = (cos φ − 1) I + sin φ J gives, exactly,

    E_n = (Y − Q)·n̂ = −c A − ℓ W − Σ λ_i (sin φ_i − φ_i) s_i,
    E_t = (Y − Q)·t̂ = −Σ λ_i (1 − cos φ_i) s_i + c Σ λ_i (sin φ_i − φ_i),

with A = Σ λ_i (1 − cos φ_i) ∈ [0, δ²/8] (1 − cos φ ≤ φ²/2, and Popoviciu's inequality: a
weighted variance of values in a range δ is ≤ δ²/4) and W = Σ_{i on b} λ_i φ_i
(Σ λ_i φ_i s_i = ℓ W because Σ λ_i φ_i = 0).
On a triangle with two corners on one column, W = ±λ_3 k Σ_{j≠3} λ_j (z_3 − z_j), so
|W| ≤ λ_3 (1 − λ_3) δ ≤ δ/4. With |sin φ − φ| ≤ |φ|³/6 (Taylor remainder of sin) and
Σ λ |φ|³ ≤ δ · δ²/4:

    |E_n| ≤ |c| δ²/8 + ℓ δ/4 + s_max δ³/24,        |E_t| ≤ τ = s_max δ²/8 + |c| δ³/24.

On a quad of two equal steps, the diagonal fixes the sign of W: from the lower corner of a to
the upper corner of b gives k W ≥ 0 on both triangles, the other diagonal k W ≤ 0. Choosing
the diagonal with c W ≤ 0 makes −c A and −ℓ W of opposite signs, so there the first two terms
become max(|c| δ²/8, ℓ δ/4) instead of their sum (|x − y| ≤ max(x, y) for x, y ≥ 0). The zipper
keeps the plain sum; its triangles span at most the larger of the two steps (merge order).

E_t slides Y along the chord's line; where that leaves the chord, the polygon turns by at
most Γ (the turning at the vertices within τ of the chord's ends), so the polygon point at arc
length τ further lies within τ · 2 sin(min(Γ, π)/2) of the slid point ("spill"). Every polygon
point lies within ε_p of the exact curve, hence

    distance to the exact wall ≤ ε_p + |E_n|bound + spill.

Each strip gets the largest δ that keeps the bound ≤ tol − ε_p (bisection: the bound grows
with δ), for a quad (δ_eq) and for a zipper (δ_zip); a column takes n = ⌈Θ/δ⌉ steps
(Θ = |k| × stage height) from the smaller δ_eq of its two strips, then, wherever two unequal
neighbours leave their strip's zipper short of δ_zip, the lower count is raised (to the
higher count, or to the strip's zipper count if that is lower) until no strip is short. A
vertex near the twist axis (a bore) thus gets one step, a flank vertex a few, a tip-land
vertex the most; a uniform layer stack would give every column the most.
"""

from __future__ import annotations

import math
from functools import lru_cache

import numpy as np


# --------------------------------------------------------------------------- bound
def chord_terms(poly: np.ndarray):
    """Per chord i (P_i → P_{i+1}): length ℓ, |c|, s_max, sign of c (see the module docstring)."""
    p = np.asarray(poly, dtype=float)
    q = np.roll(p, -1, axis=0)
    d = q - p
    ell = np.maximum(np.hypot(d[:, 0], d[:, 1]), 1e-300)
    t = d / ell[:, None]
    n = np.column_stack([t[:, 1], -t[:, 0]])
    c = np.einsum("ij,ij->i", p, n)
    s_max = np.maximum(np.abs(np.einsum("ij,ij->i", p, t)), np.abs(np.einsum("ij,ij->i", q, t)))
    return ell, np.abs(c), s_max, np.sign(c)


def turning_within(poly: np.ndarray, reach: np.ndarray) -> np.ndarray:
    """Per chord: the larger, over its two ends, of the polygon's total turning (rad) at the
    vertices lying within arc length ``reach`` beyond that end (the end vertex included)."""
    p = np.asarray(poly, dtype=float)
    n = len(p)
    d = np.roll(p, -1, axis=0) - p
    ell = np.hypot(d[:, 0], d[:, 1])
    ang = np.arctan2(d[:, 1], d[:, 0])
    turn = np.abs((ang - np.roll(ang, 1) + math.pi) % (2.0 * math.pi) - math.pi)  # at vertex i
    reach = np.minimum(np.asarray(reach, dtype=float), ell.sum())
    # forward: beyond the end vertex i+1, over chords i+1, i+2, ... (three laps cover a wrap)
    ell3, turn3 = np.tile(ell, 3), np.tile(turn, 3)
    s = np.concatenate([[0.0], np.cumsum(ell3)])        # arc length at vertex j (of 3 laps)
    ct = np.concatenate([[0.0], np.cumsum(turn3)])      # turning at vertices < j
    i = np.arange(n)
    end = i + 1
    last = np.searchsorted(s, s[end] + reach, side="right") - 1   # last vertex within reach
    fwd = ct[last + 1] - ct[end]
    # backward: before the start vertex i, over chords i-1, i-2, ... (same on the reversed loop)
    start = i + n
    first = np.searchsorted(s, s[start] - reach, side="left")
    bwd = ct[start + 1] - ct[first]
    return np.maximum(fwd, bwd)


def largest_within(f, hi: np.ndarray, tol: float) -> np.ndarray:
    """Largest δ in [0, hi] with f(δ) ≤ tol, f increasing (rounded down, within 2⁻²⁴ of hi:
    a step count ⌈Θ/δ⌉ can only come out higher than exact, never lower)."""
    lo = np.zeros_like(hi)
    ok = f(hi) <= tol
    top = hi.copy()
    for _ in range(24):
        m = 0.5 * (lo + top)
        good = f(m) <= tol
        lo = np.where(good, m, lo)
        top = np.where(good, top, m)
    return np.where(ok, hi, lo)


def strip_steps(poly: np.ndarray, theta: float, tol: float):
    """(δ_eq, δ_zip): per strip, the largest turn (rad) per triangle height range that keeps the
    bound of the module docstring ≤ ``tol`` (the twist's share), for an equal-step quad strip
    and for a zipper. ``theta`` is the stage's whole turn (no strip needs a larger δ)."""
    ell, c, s_max, _ = chord_terms(poly)
    hi = np.full(len(ell), float(theta))

    def tau(d):
        return s_max * d * d / 8.0 + c * d ** 3 / 24.0

    def normal(d, eq):
        sag, mixed = c * d * d / 8.0, ell * d / 4.0
        return (np.maximum(sag, mixed) if eq else sag + mixed) + s_max * d ** 3 / 24.0

    # the spill needs the turning within τ of the chord ends; τ grows with δ, and the δ without
    # spill bounds the final one from above, so its τ is a safe reach
    out = []
    for eq in (True, False):
        d0 = largest_within(lambda d: normal(d, eq), hi, tol)
        g = 2.0 * np.sin(np.minimum(turning_within(poly, tau(d0)), math.pi) / 2.0)
        out.append(largest_within(lambda d: normal(d, eq) + g * tau(d), d0, tol))
    return out[0], out[1]


def column_counts(d_eq: np.ndarray, d_zip: np.ndarray, theta: float,
                  least: np.ndarray | None = None) -> np.ndarray:
    """Steps per column (column i borders strips i − 1 and i) for a stage turning ``theta``;
    ``least``: steps a column must have at least."""
    def steps(d):
        return np.maximum(1, np.ceil(theta / np.maximum(d, 1e-300) - 1e-9)).astype(np.int64)

    n_eq, n_zip = steps(d_eq), steps(d_zip)
    cols = np.maximum(n_eq, np.roll(n_eq, 1))
    if least is not None:
        cols = np.maximum(cols, least)
    while True:
        a, b = cols, np.roll(cols, -1)               # strip i: columns i and i + 1
        short = (a != b) & (np.minimum(a, b) < n_zip)
        if not short.any():
            return cols
        idx = np.nonzero(short)[0]
        low = np.where(a[idx] < b[idx], idx, (idx + 1) % len(cols))
        want = np.minimum(np.maximum(a[idx], b[idx]), n_zip[idx])
        np.maximum.at(cols, low, want)


# --------------------------------------------------------------------------- triangles
@lru_cache(maxsize=256)
def strip_pattern(na: int, nb: int, a_leads: bool) -> np.ndarray:
    """Triangles of one strip as (side, level) corners, side 0 = column a, 1 = column b, in the
    wall's outward order (a_m, b_m, b_{m+1}, a_{m+1} counter-clockwise seen from outside).
    Equal steps: quads, diagonal b_m–a_{m+1} if ``a_leads`` else a_m–b_{m+1}; otherwise the
    merge zipper."""
    tris = []
    if na == nb:
        for m in range(na):
            if a_leads:
                tris += [((0, m), (1, m), (0, m + 1)), ((1, m), (1, m + 1), (0, m + 1))]
            else:
                tris += [((0, m), (1, m), (1, m + 1)), ((0, m), (1, m + 1), (0, m + 1))]
    else:
        i = j = 0
        while i < na or j < nb:
            # advance the side whose next level is lower (levels i/na, j/nb of the stage)
            if j == nb or (i < na and (i + 1) * nb <= (j + 1) * na):
                tris.append(((0, i), (1, j), (0, i + 1)))
                i += 1
            else:
                tris.append(((0, i), (1, j), (1, j + 1)))
                j += 1
    return np.array(tris, dtype=np.int64)   # (m, 3, 2)


def stage_walls(first: np.ndarray, counts: np.ndarray, a_leads: np.ndarray,
                keep: np.ndarray | None = None) -> np.ndarray:
    """Wall triangles of one stage of one loop.

    ``first[i]`` is the global index of column i's vertex at the stage's bottom, its levels
    following consecutively (``counts[i]`` steps); ``a_leads[i]`` picks strip i's diagonal;
    ``keep[i]`` False leaves strip i (from column i to the next) to another mesher."""
    n = len(counts)
    nxt = (np.arange(n) + 1) % n
    top = int(counts.max()) + 1
    keys = (counts * top + counts[nxt]) * 2 + a_leads.astype(np.int64)
    idx = np.arange(n) if keep is None else np.flatnonzero(keep)
    order = idx[np.argsort(keys[idx], kind="stable")]
    if not len(order):
        return np.zeros((0, 3), dtype=np.int64)
    cut = np.flatnonzero(np.diff(keys[order])) + 1
    out = []
    for strips in np.split(order, cut):
        na, rest = divmod(int(keys[strips[0]]), 2 * top)
        nb, lead = divmod(rest, 2)
        pat = strip_pattern(int(na), int(nb), bool(lead))
        base = np.where(pat[None, :, :, 0] == 0, first[strips][:, None, None],
                        first[nxt[strips]][:, None, None])
        out.append((base + pat[None, :, :, 1]).reshape(-1, 3))
    return np.concatenate(out)
