"""Work budget of a part: refuse sizes whose triangles would take absurdly long to make.

A rack of module 0.05 over 5 m has some 32 000 teeth and an outline of over 200 000 points;
it passes every tooth check, yet turning it into triangles and a solid runs for many minutes
and yields files nobody can slice. The estimate here is cheap (numbers already known after
``check``) and deliberately coarse:

* outline points: the measured outline polygon (mm) of a prismatic part;
* triangles ≈ 2 · points · (layers + 1): two per wall quad per layer, plus the two caps;
  a twisted prism gets ⌈|twist|·h/δ⌉ layers with δ = √(8·tol/r_max), the layer turn at
  which a chord of radius r_max deviates by tol (sagitta s = r δ²/8, a fact of geometry).

Limits are in :data:`gen.tolerances.LIMITS` (``max_outline_points``, ``max_triangles``).
"""

from __future__ import annotations

import math

import numpy as np

from gen.findings import ERROR, Finding
from gen.tolerances import LIMITS


def estimate_layers(prism, r_max: float, tol: float) -> int:
    """Mesh layers of a prism: 1 when straight or sheared, else by the sagitta rule."""
    if not getattr(prism, "twist", 0.0) or r_max <= 0.0:
        return 1
    delta = math.sqrt(8.0 * tol / r_max)
    return max(1, math.ceil(abs(prism.twist) * (prism.z1 - prism.z0) / delta))


def work_findings(name: str, kind: str, outline, shape, tol: float, sizes: dict) -> list:
    """Error findings when a part's outline or estimated triangles exceed the budget.

    Parameters
    ----------
    outline : (N, 2) array or None
        The measured outline polygon, mm.
    shape : Body-like with ``solids`` (prisms with ``twist``, ``z0``, ``z1``) or anything else
    tol : float
        Chord tolerance, mm.
    """
    if outline is None:
        return []
    pts = np.asarray(outline)
    n = int(len(pts))
    key = "length" if "rack" in kind else "teeth"
    teeth = sizes.get("teeth")
    about = f" ({teeth} teeth)" if teeth else ""
    if n > LIMITS.max_outline_points:
        return [Finding(ERROR, "work-too-large",
                        f"outline of {n} points{about} exceeds the budget of "
                        f"{LIMITS.max_outline_points} points: making its triangles and solid "
                        "would take many minutes; use a larger module or a shorter part",
                        name, "pitchline work budget", key=key)]
    r_max = float(np.max(np.hypot(pts[:, 0], pts[:, 1]))) if n else 0.0
    layers = max((estimate_layers(p, r_max, tol) for p in getattr(shape, "solids", ())),
                 default=1)
    tris = 2 * n * (layers + 1)
    if tris > LIMITS.max_triangles:
        return [Finding(ERROR, "work-too-large",
                        f"about {tris} triangles ({n} outline points × {layers} layers) "
                        f"exceed the budget of {LIMITS.max_triangles}: use a coarser "
                        "chord_tolerance, a smaller helix angle or a smaller part",
                        name, "pitchline work budget", key=key)]
    return []
