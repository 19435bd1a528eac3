"""Sizing a rotor's rim for a wanted inertia (or angular momentum at a speed).

The envelope is a rim + web rotor (outer diameter, thickness, web, hub, bore, optional pocket
and lightening holes); only the radial rim width w varies. Widening the rim replaces web
material (thickness t_w ≤ T) by full-thickness material at larger radius, so the axial inertia
I(w) never decreases: the smallest w with I(w) ≥ target is found by bisection. w runs from 0
(web out to the rim) to the widest rim the envelope allows: the rim may not pass the hub, the
motor pocket or the lightening holes' outer edge.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

from gen.errors import ParamError
from gen.geometry.rotor import Rotor, mass_properties


@dataclass(frozen=True)
class RimSizing:
    """Result of :func:`size_rim`. Inertias kg·m², rim width mm."""

    met: bool
    target_inertia: float
    rim_width: float | None        # thinnest rim that meets the target (None if not met)
    inertia: float                 # inertia of ``rotor`` (the sized one, or the largest)
    rotor: Rotor                   # the sized rotor, or the one with the widest rim
    max_rim_width: float
    max_inertia: float             # largest inertia the envelope reaches
    message: str


def max_rim_width(envelope: Rotor) -> float:
    """Widest rim (mm) the envelope allows: inside the hub, pocket, holes and bolt holes."""
    R = envelope.outer_radius
    inner = envelope.hub_diameter / 2.0
    if envelope.pocket is not None:
        inner = max(inner, envelope.pocket.diameter / 2.0)
    if envelope.holes is not None:
        inner = max(inner, envelope.holes.circle_radius + envelope.holes.diameter / 2.0)
    if envelope.bolts is not None:  # bolt holes keep their wall (gen.geometry.rotor.bolt_slab)
        from gen.tolerances import LIMITS

        inner = max(inner, envelope.bolts.circle_radius + envelope.bolts.diameter / 2.0
                    + LIMITS.min_wall)
    return max(R - inner, 0.0)


def size_rim(envelope: Rotor, density: float, target_inertia: float | None = None, *,
             target_momentum: float | None = None, omega: float | None = None,
             rel_tol: float = 1e-5) -> RimSizing:
    """Thinnest rim meeting ``target_inertia`` (kg·m²), or h = ``target_momentum`` (N·m·s)
    at ``omega`` (rad/s) — I = h/ω. ``envelope.rim_width`` is ignored.

    Returns the sized rotor (its inertia ≥ target and within ``rel_tol`` of it, bisection on w)
    or, if the envelope cannot reach the target, the largest reachable inertia.
    """
    if target_inertia is None:
        if target_momentum is None or omega is None or not omega > 0:
            raise ParamError("give a target inertia, or a target momentum and a speed > 0",
                             key="target")
        target_inertia = target_momentum / omega
    if not target_inertia > 0:
        raise ParamError("target inertia must be > 0 kg·m²", key="target", value=target_inertia)
    if envelope.web_thickness is None or envelope.hub_diameter is None:
        raise ParamError("the envelope needs a web thickness and a hub diameter", key="rim_width")

    def at(w: float) -> tuple[Rotor, float]:
        rotor = dataclasses.replace(envelope, rim_width=w)
        return rotor, mass_properties(rotor, density).axial_inertia

    w_hi = max_rim_width(envelope)
    top, i_hi = at(w_hi)
    if i_hi < target_inertia:
        return RimSizing(False, target_inertia, None, i_hi, top, w_hi, i_hi,
                         f"target {target_inertia:.4g} kg·m² is beyond the envelope: the widest "
                         f"rim ({w_hi:.3f} mm) gives {i_hi:.4g} kg·m²")
    lo, hi = 0.0, w_hi
    rotor, i_lo = at(lo)
    if i_lo >= target_inertia:
        return RimSizing(True, target_inertia, 0.0, i_lo, rotor, w_hi, i_hi,
                         "the web alone meets the target; no rim needed")
    best, i_best = top, i_hi
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        rotor, i_mid = at(mid)
        if i_mid >= target_inertia:
            hi, best, i_best = mid, rotor, i_mid
        else:
            lo = mid
        if i_best - target_inertia <= rel_tol * target_inertia or hi - lo < 1e-9:
            break
    return RimSizing(True, target_inertia, hi, i_best, best, w_hi, i_hi,
                     f"rim width {hi:.3f} mm gives {i_best:.4g} kg·m²")
