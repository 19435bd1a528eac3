"""Golden-section search for many one-dimensional minima at once (numpy only).

Used by the rack-rolling and shaper-cutter envelopes (:mod:`gen.geometry.generate`,
:mod:`gen.geometry.internal_cut`), whose minima can sit right beside a region where the
function is infinite (the cutter point no longer reaches the radius): there the bracket's
middle may fall outside, so the least value *evaluated* is returned, not the middle's.
"""

from __future__ import annotations

import math

import numpy as np

_G = (math.sqrt(5.0) - 1.0) / 2.0


def golden_min(f, a: np.ndarray, b: np.ndarray, done, iterations: int,
               start_value: np.ndarray, start_arg: np.ndarray):
    """Per-element minimum of ``f`` (vectorised over elements) on brackets [a, b].

    ``done(width)`` stops the search once the largest bracket width is small enough, after at
    most ``iterations`` steps. ``start_value``/``start_arg``: a value already known at
    ``start_arg`` (the grid's best), kept if nothing better is found. Returns
    (least value, its argument) per element: the least of the bracket's middle, its two
    inner points and the start.
    """
    c = b - _G * (b - a)
    d = a + _G * (b - a)
    fc, fd = f(c), f(d)
    for _ in range(iterations):
        left = fc < fd
        b = np.where(left, d, b)
        a = np.where(left, a, c)
        new = np.where(left, b - _G * (b - a), a + _G * (b - a))
        fn = f(new)
        d, fd, c, fc = (np.where(left, c, new), np.where(left, fc, fn),
                        np.where(left, new, d), np.where(left, fn, fd))
        if done(np.max(np.abs(b - a))):
            break
    mid = 0.5 * (a + b)
    args = np.stack([mid, c, d, np.broadcast_to(start_arg, mid.shape)])
    values = np.stack([f(mid), fc, fd, np.broadcast_to(start_value, mid.shape)])
    k = np.argmin(values, axis=0)
    cols = np.arange(values.shape[1])
    return values[k, cols], args[k, cols]
