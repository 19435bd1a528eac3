"""Sizes of cylindrical (spur and helical) involute gears, ISO 21771 relations.

All lengths mm, angles radians. For a spur gear β = 0 and transverse = normal values.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from gen.errors import GeometryError
from gen.geometry.basic_rack import BasicRack
from gen.geometry.generate import Cutter


@dataclass(frozen=True)
class GearSizes:
    """Reference sizes of one cylindrical gear (ISO 21771 notation in the field names' docs)."""

    z: int
    mn: float            # normal module m_n
    mt: float            # transverse module m_t = m_n / cos β
    alpha_n: float       # normal pressure angle α_n
    alpha_t: float       # transverse pressure angle, tan α_t = tan α_n / cos β
    beta: float          # helix angle β at the reference circle
    x: float             # profile shift coefficient (normal)
    d: float             # reference (pitch) diameter d = z·m_t
    db: float            # base diameter d_b = d·cos α_t
    da: float            # tip diameter d_a = d + 2 m_n (h_aP* + x − k)
    df: float            # root diameter d_f = d − 2 m_n (h_fP* − x)
    p: float             # transverse pitch p_t = π m_t
    pb: float            # transverse base pitch p_bt = p_t cos α_t
    s: float             # transverse tooth thickness on d: m_t (π/2 + 2 x tan α_n) − thinning
    thinning: float      # circumferential thinning on d (both flanks together)

    @property
    def rp(self) -> float:
        return self.d / 2.0

    @property
    def rb(self) -> float:
        return self.db / 2.0

    @property
    def ra(self) -> float:
        return self.da / 2.0

    @property
    def rf(self) -> float:
        return self.df / 2.0


def transverse_pressure_angle(alpha_n: float, beta: float) -> float:
    """tan α_t = tan α_n / cos β (ISO 21771)."""
    return math.atan(math.tan(alpha_n) / math.cos(beta))


def gear_sizes(z: int, mn: float, rack: BasicRack, x: float = 0.0, beta: float = 0.0,
               thinning: float = 0.0, tip_shortening: float = 0.0) -> GearSizes:
    """ISO 21771 sizes of an external gear cut by the counterpart of ``rack``.

    ``thinning`` is the transverse arc thinning on the reference circle (mm, total of both
    flanks), ``tip_shortening`` the coefficient k (tip reduced by 2 k m_n).
    """
    mt = mn / math.cos(beta)
    at = transverse_pressure_angle(rack.alpha, beta)
    d = z * mt
    db = d * math.cos(at)
    da = d + 2.0 * mn * (rack.addendum + x - tip_shortening)
    df = d - 2.0 * mn * (rack.dedendum - x)
    p = math.pi * mt
    s = mt * (math.pi / 2.0 + 2.0 * x * math.tan(rack.alpha)) - thinning
    return GearSizes(z=z, mn=mn, mt=mt, alpha_n=rack.alpha, alpha_t=at, beta=beta, x=x, d=d,
                     db=db, da=da, df=df, p=p, pb=p * math.cos(at), s=s, thinning=thinning)


def cutter_for(sizes: GearSizes, rack: BasicRack) -> Cutter:
    """The generating rack that cuts ``sizes`` (transverse section of the normal-plane rack).

    Thinning widens the cutter tooth: the transverse arc thinning Δs becomes Δs·cos β in the
    normal plane, half of it per flank. Where the basic rack's root radius does not fit on the
    cutter tip (large pressure angles) the tip is made a full round instead.
    """
    mn = sizes.mn
    cb = math.cos(sizes.beta)
    a = rack.alpha
    half = math.pi * mn / 4.0 + sizes.thinning * cb / 2.0
    # a large pressure angle leaves no tip flat for the profile's root radius: then the cutter
    # tip becomes a full round, the largest radius that fits
    rho_max = (half - rack.dedendum * mn * math.tan(a)) * math.cos(a) / (1.0 - math.sin(a))
    if rho_max <= 0:
        raise GeometryError("the generating rack tooth comes to a point above its full depth at "
                            "this pressure angle: lower the pressure angle or the dedendum")
    return Cutter(alpha_n=a,
                  half_width_n=half,
                  tip_depth=rack.dedendum * mn,
                  tip_radius=min(rack.root_radius * mn, rho_max),
                  shift=sizes.x * mn,
                  stretch=1.0 / cb,
                  top=(sizes.ra - sizes.rp) + mn)


def undercut_limit_teeth(alpha: float, x: float = 0.0, addendum: float = 1.0) -> float:
    """Fewest teeth without undercut for a rack-generated gear: z_min = 2 (h* − x) / sin²α."""
    return 2.0 * (addendum - x) / math.sin(alpha) ** 2


def undercut_limit_shift(z: float, alpha: float, addendum: float = 1.0) -> float:
    """Least profile shift that avoids undercut: x_min = h* − z sin²α / 2."""
    return addendum - z * math.sin(alpha) ** 2 / 2.0
