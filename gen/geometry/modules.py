"""Preferred module series (DIN 780 / ISO 54), in mm."""

from __future__ import annotations

# DIN 780 table (doc, see shared references): series I and II, and the series-I values below 1.
SERIES_I = (0.05, 0.06, 0.08, 0.1, 0.12, 0.15, 0.2, 0.25, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9,
            1, 1.25, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10, 12, 16, 20, 25, 32, 40, 50)
SERIES_II = (1.125, 1.375, 1.75, 2.25, 2.75, 3.5, 4.5, 5.5, 7, 9, 11, 14, 18, 22, 28, 36, 45)


def module_series(m: float) -> str | None:
    """'I', 'II' or None when m is not a preferred module."""
    for name, series in (("I", SERIES_I), ("II", SERIES_II)):
        if any(abs(m - v) < 1e-9 for v in series):
            return name
    return None
