"""Checks of a generated rack outline: pitch π m and tooth thickness π m/2 on the pitch line."""

from __future__ import annotations

import numpy as np

from gen.geometry.rack_outline import RackSizes
from gen.validate import measure
from gen.findings import ERROR, Finding


def rack_measure(poly: np.ndarray, sizes: RackSizes) -> dict:
    teeth = measure.rack_teeth_on_line(poly, 0.0, -sizes.height)
    ys = poly[:, 1]
    centres = teeth.mean(axis=1) if len(teeth) else np.zeros(0)
    return {
        "teeth": int(len(teeth)),
        "thickness": float(np.mean(teeth[:, 1] - teeth[:, 0])) if len(teeth) else float("nan"),
        "pitch": float(np.mean(np.diff(centres))) if len(centres) > 1 else float("nan"),
        "pitch_spread": float(np.ptp(np.diff(centres))) if len(centres) > 2 else 0.0,
        "top": float(ys.max()),
        "bottom": float(ys.min()),
    }


def rack_compare(subject: str, got: dict, sizes: RackSizes, tol: float, where="profile"):
    out = []

    def bad(what, measured, expected, formula):
        out.append(Finding(ERROR, "size-mismatch", f"{where}: measured {what} {measured:.4f} mm, "
                           f"formula {expected:.4f} mm (tolerance {tol:g} mm)", subject,
                           f"ISO 53 basic rack: {formula}"))

    if got["teeth"] != sizes.teeth:
        out.append(Finding(ERROR, "tooth-count", f"{where}: counted {got['teeth']} teeth, "
                           f"expected {sizes.teeth}", subject, "rack length / pitch"))
    if sizes.teeth > 1 and abs(got["pitch"] - sizes.pitch) > tol:
        bad("pitch", got["pitch"], sizes.pitch, "p = π m_n / cos β")
    if sizes.teeth > 2 and got["pitch_spread"] > tol:
        bad("pitch spread", got["pitch_spread"], 0.0, "equal pitch")
    if abs(got["thickness"] - sizes.s) > tol:
        bad("tooth thickness on the pitch line", got["thickness"], sizes.s, "s = p/2 − thinning")
    if abs(got["top"] - sizes.addendum) > tol:
        bad("tip height", got["top"], sizes.addendum, "h_aP = 1.0 m")
    if abs(got["bottom"] + sizes.height) > tol:
        bad("back position", got["bottom"], -sizes.height, "height from the pitch line")
    return out
