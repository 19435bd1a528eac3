"""Anti-backlash split nut: a slit across the nut, a flexure bridge and one preload screw.

Lengths mm, angles radians. Frame of :mod:`gen.kinds.screw_nut`: axis Z, barrel of outer
radius R over the nut length, thread root radius r₄ (the nut's root diameter / 2).

Design (one printed solid; common practice for machined anti-backlash nuts, where a saw cut
across the nut leaves a web and a clamp screw pinches the cut)
-----------------------------------------------------------------------------------------
The barrel is cut across the axis by a slit of axial width s centred at z_m, everywhere
except a *bridge*: the annular sector r₄ ≤ r ≤ R, |polar angle| ≤ β/2 about +X. The preload
screw runs parallel to the axis at polar angle π (opposite the bridge) on radius r_s: a
clearance hole through the upper half and a pilot hole (the screw forms its own thread in the
plastic) in the lower half. Tightening it closes the slit on the screw side; the upper half
turns about the bridge, which bends as a hinge, so the upper thread half moves axially against
the lower one and the two halves bear on opposite flanks of the screw: the free axial float is
taken up, and further tightening preloads the flanks through the bent bridge.

Why this design: axial preload works with any flank angle. Squeezing a nut radially (an axial
slot and a clamp, as on a shaft collar) needs the flanks to close by c / sin(α/2) radially
while the crest and root gaps are only c (the nut's faces are moved back by c normal to every
face), so the crests would bottom before the flanks touch (computed).

Axial float of the plain nut (computed)
---------------------------------------
With every nut face moved back by c measured normal to the face, each flank of the groove
moves axially by c / cos(α/2), so a centred screw floats axially by

    f = 2 c / cos(α/2)                      (= :attr:`NutThread.axial_play`)

The same figure by another route: a normal offset c of a flank inclined at α/2 to the radial
plane is a radial offset c_r = c / sin(α/2) of that flank, and a radial offset c_r moves the
flank axially by c_r · tan(α/2); two flanks: f = 2 c_r tan(α/2). (For the 30° trapezoidal
thread, 2 c_r tan 15° total, c_r tan 15° per flank.)

Take-up (computed, rigid halves turning about the bridge)
--------------------------------------------------------
The hinge line lies at the bridge's centroid, x_h = ⅔ (R³ − r₄³)/(R² − r₄²) · sin φ / φ
(centroid of an annular sector of half-angle φ = β/2, standard). Closing the slit by δ at the
screw (x = −r_s) closes it by δ · x_h / (x_h + r_s) on the nut axis. The float is taken up on
the axis when δ reaches

    s_needed = f · (x_h + r_s) / x_h,

so the slit must be at least that wide (else the cut closes before the float is gone).

Printability: the bridge's narrowest width is its chord on the thread root, 2 r₄ sin(β/2),
and its radial wall R − r₄; both must hold ``lines`` extrusion lines of the nozzle. The slit's
upper face is a flat overhang carried by the bridge; it prints as such (slicer bridging
settings matter) — this is stated in the part's notes, not hidden.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from gen.errors import ParamError


@dataclass(frozen=True)
class PreloadScrew:
    """A metric screw for the preload: nominal d, coarse pitch P (ISO 261, from memory),
    clearance hole (ISO 273 medium, from memory) and pilot hole d − P (tap-drill rule, common
    practice; the screw forms its thread in the printed pilot). All mm."""

    name: str
    d: float
    pitch: float
    clearance: float

    @property
    def pilot(self) -> float:
        return self.d - self.pitch


PRELOAD_SCREWS = {s.name: s for s in (
    PreloadScrew("M2", 2.0, 0.4, 2.4),
    PreloadScrew("M2.5", 2.5, 0.45, 2.9),
    PreloadScrew("M3", 3.0, 0.5, 3.4),
    PreloadScrew("M4", 4.0, 0.7, 4.5),
    PreloadScrew("M5", 5.0, 0.8, 5.5),
)}


def axial_float(half_angle: float, clearance: float) -> float:
    """Free axial float (mm) of a screw centred in a nut whose faces are moved back by
    ``clearance`` (mm) normal to every face: 2 c / cos(α/2) (module docstring)."""
    return 2.0 * clearance / math.cos(half_angle)


def sector_centroid(r_in: float, r_out: float, half_angle: float) -> float:
    """Distance (mm) from the axis to the centroid of the annular sector r_in … r_out,
    |angle| ≤ half_angle: ⅔ (r_out³ − r_in³)/(r_out² − r_in²) · sin φ / φ (standard)."""
    phi = half_angle
    return (2.0 / 3.0 * (r_out ** 3 - r_in ** 3) / (r_out ** 2 - r_in ** 2)
            * math.sin(phi) / phi)


@dataclass(frozen=True)
class SplitNut:
    """Layout and numbers of an anti-backlash slit (mm, rad)."""

    slit: float            # s, axial width of the cut
    z_lo: float            # cut from z_lo …
    z_hi: float            # … to z_hi
    bridge: float          # β, angular width of the bridge about +X
    root_radius: float     # r₄, the bridge's inner radius (thread root)
    outer_radius: float    # R
    axial_play: float      # f, free axial float of the plain nut
    hinge_radius: float    # x_h
    screw: PreloadScrew
    screw_radius: float    # r_s (screw at polar angle π)
    takeup_ratio: float    # x_h / (x_h + r_s): axis closure per closure at the screw
    slit_needed: float     # f / takeup_ratio

    @property
    def bridge_chord(self) -> float:
        """Narrowest width of the bridge: its chord on the thread root (mm)."""
        return 2.0 * self.root_radius * math.sin(self.bridge / 2.0)

    @property
    def bridge_wall(self) -> float:
        return self.outer_radius - self.root_radius

    @property
    def takes_up(self) -> bool:
        return self.slit >= self.slit_needed

    def screw_xy(self) -> tuple[float, float]:
        return (-self.screw_radius, 0.0)


def screw_radius_default(root_radius: float, outer_radius: float) -> float:
    """Preload screw on the middle of the wall (mm)."""
    return 0.5 * (root_radius + outer_radius)


def least_outer_radius(root_radius: float, screw: PreloadScrew, wall: float) -> float:
    """Smallest barrel radius (mm) holding the screw's clearance hole with ``wall`` each side."""
    return root_radius + 2.0 * wall + screw.clearance


def split_nut(*, axial_play: float, root_radius: float, outer_radius: float, slit: float,
              z_mid: float, bridge: float, screw: PreloadScrew, screw_radius: float | None,
              least_line: float, wall: float) -> SplitNut:
    """Check and lay out the slit, bridge and preload screw (module docstring).

    ``least_line`` is the narrowest printable feature (mm: nozzle × lines); ``wall`` the least
    wall (mm) round the screw hole. Raises :class:`ParamError` with the key to blame
    (``anti_backlash.<sub-key>`` or ``outer_diameter``).
    """
    r4, R = float(root_radius), float(outer_radius)
    if not 0.0 < bridge < 2.0 * math.pi:
        raise ParamError("the bridge must be an angle between 0° and 360°",
                         key="anti_backlash.bridge", value=math.degrees(bridge))
    chord = 2.0 * r4 * math.sin(bridge / 2.0) if bridge < math.pi else 2.0 * r4
    if chord < least_line:
        need = math.degrees(2.0 * math.asin(min(1.0, least_line / (2.0 * r4))))
        raise ParamError(f"a {math.degrees(bridge):g}° bridge is {chord:.2f} mm wide on the "
                         f"thread root ({2 * r4:.3f} mm): thinner than {least_line:g} mm, the "
                         "narrowest wall the nozzle prints", key="anti_backlash.bridge",
                         value=math.degrees(bridge), allowed=f"≥ {need:.1f}°")
    if R - r4 < least_line:
        raise ParamError(f"the bridge's wall ({R - r4:.2f} mm over the thread root) is thinner "
                         f"than {least_line:g} mm", key="outer_diameter", value=2 * R)
    key_rs = "outer_diameter" if screw_radius is None else "anti_backlash.screw_radius"
    rs = screw_radius_default(r4, R) if screw_radius is None else float(screw_radius)
    rh = screw.clearance / 2.0
    def refuse(what: str, left: float, where: str, bound: str):
        raise ParamError(f"the {screw.name} preload hole ({screw.clearance:g} mm) on radius "
                         f"{rs:.2f} mm breaks {what}: {left:.2f} mm of wall {where}, at least "
                         f"{wall:g} mm needed", key=key_rs,
                         value=2 * R if screw_radius is None else rs,
                         allowed=(f"outer_diameter ≥ {2 * least_outer_radius(r4, screw, wall):.2f}"
                                  " mm" if screw_radius is None else bound))

    if rs - rh - r4 < wall:
        refuse("into the thread", rs - rh - r4,
               f"over the thread root ({2 * r4:.3f} mm)", f"screw_radius ≥ {r4 + wall + rh:.2f} mm")
    if rs + rh > R - wall:
        refuse("out of the body", R - rs - rh, f"inside the barrel ({2 * R:g} mm)",
               f"screw_radius ≤ {R - wall - rh:.2f} mm")
    # the hole (and a wall round it) must lie in the cut, clear of the bridge
    reach = math.asin(min(1.0, (rh + wall) / rs))
    if bridge / 2.0 > math.pi - reach:
        most = math.degrees(2.0 * (math.pi - reach))
        raise ParamError(f"a {math.degrees(bridge):g}° bridge reaches the preload screw hole "
                         "opposite it", key="anti_backlash.bridge", value=math.degrees(bridge),
                         allowed=f"≤ {most:.1f}°")
    xh = sector_centroid(r4, R, bridge / 2.0)
    ratio = xh / (xh + rs)
    need = axial_play / ratio
    if slit < need:
        raise ParamError(f"a {slit:g} mm slit cannot take up the nut's axial float: the plain "
                         f"nut floats {axial_play:.3f} mm (2c/cos(α/2)), and closing the slit "
                         f"at the screw moves the thread only {ratio:.3f} × as far (hinge on "
                         f"the bridge), so the slit must be at least {need:.3f} mm",
                         key="anti_backlash.slit", value=slit, allowed=f"≥ {need:.3f} mm")
    return SplitNut(slit=float(slit), z_lo=z_mid - slit / 2.0, z_hi=z_mid + slit / 2.0,
                    bridge=float(bridge), root_radius=r4, outer_radius=R,
                    axial_play=float(axial_play), hinge_radius=xh, screw=screw,
                    screw_radius=rs, takeup_ratio=ratio, slit_needed=need)
