"""The tooth space of an internal gear as the envelope of a shaper (pinion-type) cutter.

Cutter. An external gear of z₀ teeth and shift x₀ made by the project's own rack generator
(:func:`gen.geometry.cylindrical.gear_sizes`, :func:`~gen.geometry.cylindrical.cutter_for`,
:func:`gen.geometry.generate.generate_flank`); its flank above the rack-generated root is the
analytic involute ψ₀(ρ) = s₀/d₀ + inv α_t − inv α_ρ. Its tip corners are rounded by a circle
of radius ρ₀ tangent to the tip circle and to the flank. An involute offset by ρ₀ along its
normal is the same involute turned by ρ₀/r_b0, so the rounding centre sits at radius
r_c = r_a0 − ρ₀ and half angle β_c = ψ₀(r_c) − ρ₀/r_b0; it touches the flank at roll length
√(r_c² − r_b0²) + ρ₀ and the tip circle on the ray β_c.

Kinematics (ring fixed, lengths mm, angles rad). The cutter centre turns about the ring axis
at distance a₀ by the angle λ; the cutter turns by λ (1 − z₂/z₀) (its pitch circle rolls
inside the ring's), so the ratio cutter : ring is z₂/z₀ in the same sense. A cutter point
at polar (ρ, β) in its own frame (tooth 0 on its +X, pointing outward) lies at

    P = a₀ (cos λ, sin λ) + ρ (cos(β + λ(1 − k)), sin(β + λ(1 − k))),   k = z₂/z₀,
    |P|² = a₀² + ρ² + 2 a₀ ρ cos δ,   δ = β − λ k,
    polar angle of P: θ = λ + atan2(ρ sin δ, a₀ + ρ cos δ).

For a ring radius r the point passes r at δ = ±γ, cos γ = (r² − a₀² − ρ²)/(2 a₀ ρ), i.e. at
λ = (β ∓ γ)/k, in closed form. Over one pass (δ from −π to π, innermost → outermost →
innermost) the region cut at radius r is the angular interval swept by the cutter tooth, and
its edge is the extremum of θ over the cutter outline: the space half angle η(r) = max θ.
It is found on a dense sample of the outline and polished by golden-section search (the same
scheme as :mod:`gen.geometry.generate` for the rack). The cutter's involute yields the ring's
involute; its rounded tip yields the true trochoidal root; the cutter tip arc reaches the
root circle r_f2 = a₀ + r_a0 exactly, over the half angle β_t z₀/z₂ (β_t = tip-arc half angle
on the cutter), which is the ring's root arc.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.basic_rack import BasicRack
from gen.geometry.cylindrical import GearSizes, cutter_for, gear_sizes
from gen.geometry.generate import Flank, generate_flank, psi_exact
from gen.geometry.golden import golden_min
from gen.geometry.internal import RingSizes
from gen.geometry.involute import half_thickness_angle, inv, inv_inverse
from gen.tolerances import TOL

TRIM, INVOLUTE, FILLET = 0, 1, 2   # ring flank sample made by: cutter root, cutter involute, cutter tip
ROOT_CLEARANCE = 0.25              # cutter root kept this many m_n inside the ring tip circle


@dataclass(frozen=True, eq=False)
class ShaperCutter:
    """A shaper cutter placed for cutting one ring (transverse plane, mm, rad)."""

    z: int
    x: float
    sizes: GearSizes          # the cutter as an external gear (its own rack-generated sizes)
    flank: Flank              # its generated flank (root trochoid + involute), r_f0 … r_a0
    a0: float                 # cutting center distance (ring axis → cutter axis)
    alpha_w: float            # working transverse pressure angle of the cutter–ring pair
    ra: float                 # tip radius = r_f2 − a₀
    rf: float                 # root radius = r_a2 − a₀ − 0.25 m_n (never touches the ring tips)
    rounding: float           # tip corner radius ρ₀
    r_c: float                # rounding centre radius r_a0 − ρ₀
    beta_c: float             # rounding centre half angle (= tip arc half angle β_t)
    r_flank_end: float        # radius where the rounding meets the flank
    ratio: float              # k = z₂ / z₀
    root_r: np.ndarray        # table of the generated root below the involute: radii …
    root_psi: np.ndarray      # … and half tooth angles (interpolated linearly)

    def psi(self, rho):
        """Half tooth angle of the cutter at radius ρ on its flank (rad): the analytic
        involute above the rack-generated form circle, the generated root below."""
        rho = np.asarray(rho, dtype=float)
        invol = half_thickness_angle(np.maximum(rho, self.sizes.rb), rp=self.sizes.rp,
                                     rb=self.sizes.rb, s=self.sizes.s)
        low = rho < self.flank.r_junction
        if np.any(low):
            root = np.interp(rho, self.root_r, self.root_psi)
            invol = np.where(low, root, invol)
        return invol

    def points(self, q):
        """Cutter half-tooth outline, polar (ρ, β): q in [0, 1] flank from r_f0 to the
        rounding, [1, 2] rounding arc, [2, 3] tip arc from β_c to 0."""
        q = np.asarray(q, dtype=float)
        rho = np.empty_like(q)
        beta = np.empty_like(q)
        m0 = q < 1.0
        m1 = (q >= 1.0) & (q < 2.0)
        m2 = q >= 2.0
        t0 = np.clip(q[m0], 0.0, 1.0)
        rho[m0] = self.rf + (self.r_flank_end - self.rf) * t0
        beta[m0] = self.psi(rho[m0])
        # rounding: directions from its centre, from the flank tangent point to the tip ray
        cx, cy = self.r_c * math.cos(self.beta_c), self.r_c * math.sin(self.beta_c)
        bf = float(self.psi(self.r_flank_end))
        fx, fy = self.r_flank_end * math.cos(bf), self.r_flank_end * math.sin(bf)
        a_f = math.atan2(fy - cy, fx - cx) if self.rounding > 0 else self.beta_c
        a_t = self.beta_c
        da = (a_t - a_f + math.pi) % (2.0 * math.pi) - math.pi
        ang = a_f + (np.clip(q[m1], 1.0, 2.0) - 1.0) * da
        px = cx + self.rounding * np.cos(ang)
        py = cy + self.rounding * np.sin(ang)
        rho[m1] = np.hypot(px, py)
        beta[m1] = np.arctan2(py, px)
        rho[m2] = self.ra
        beta[m2] = self.beta_c * (3.0 - np.clip(q[m2], 2.0, 3.0))
        return rho, beta


def shaper_cutter(ring: RingSizes, z0: int, x0: float = 0.0, rounding: float = 0.2) -> ShaperCutter:
    """Place a z₀-tooth shaper cutter (shift x₀, tip rounding ``rounding``·m_n) for ``ring``.

    Raises GeometryError when the cutter does not fit (z₀ ≥ z₂, pointed or negative radii).
    """
    z2, mn, mt, an, at = ring.z, ring.mn, ring.mt, ring.alpha_n, ring.alpha_t
    if z0 < 6 or z0 >= z2:
        raise GeometryError(f"shaper cutter needs 6 ≤ z₀ < z₂ (got z₀ {z0}, z₂ {z2})")
    inv_awt = float(inv(at)) + 2.0 * math.tan(an) * (ring.x_space - x0) / (z2 - z0)
    if inv_awt <= 0.0:
        # the cutter would have to cut at a working pressure angle ≤ 0: it cannot reach the
        # ring's tooth spaces at any centre distance (small α with a negative ring shift)
        raise GeometryError(f"shaper cutter of {z0} teeth (shift {x0:g}) cannot cut this ring: "
                            f"inv α_w0 = {inv_awt:.5f} ≤ 0; a cutter_shift ≤ {ring.x_space:.3g} "
                            f"(then α_w0 ≥ α_t), fewer cutter teeth, or a larger profile shift "
                            f"or pressure angle")
    awt = float(inv_inverse(inv_awt))
    a0 = (z2 - z0) * mt * math.cos(at) / (2.0 * math.cos(awt))
    ra0 = ring.rf - a0
    rf0 = ring.ra - a0 - ROOT_CLEARANCE * mn
    rp0 = z0 * mt / 2.0
    if rf0 <= 0.0 or ra0 <= rp0 or rf0 >= rp0:
        raise GeometryError(f"shaper cutter of {z0} teeth does not fit this ring "
                            f"(tip {ra0:.3f}, root {rf0:.3f}, pitch radius {rp0:.3f} mm)")
    rack0 = BasicRack("shaper", an, (ra0 - rp0) / mn - x0, (rp0 - rf0) / mn + x0, 0.2)
    sizes0 = gear_sizes(z0, mn, rack0, x=x0, beta=ring.beta)
    flank0 = generate_flank(z0, sizes0.rp, cutter_for(sizes0, rack0), ra0)
    rb0 = sizes0.rb
    rho_c = rounding * mn
    r_c = ra0 - rho_c
    if r_c < rb0:
        raise GeometryError("shaper cutter tip rounding reaches below its base circle")
    psi_c = float(half_thickness_angle(r_c, rp=sizes0.rp, rb=rb0, s=sizes0.s))
    beta_c = psi_c - rho_c / rb0
    if beta_c < 0.0:
        raise GeometryError("shaper cutter tooth is pointed at its tip rounding: lower the "
                            "rounding or the cutter shift")
    r_fe = math.hypot(rb0, math.sqrt(r_c * r_c - rb0 * rb0) + rho_c)
    if r_fe < flank0.r_junction:
        raise GeometryError("shaper cutter tip rounding reaches below its involute")
    rr = flank0.r_junction - (flank0.r_junction - rf0) * np.linspace(1.0, 0.0, 120) ** 2
    root_psi = psi_exact(cutter_for(sizes0, rack0), sizes0.rp, z0, rr)
    return ShaperCutter(z=z0, x=x0, sizes=sizes0, flank=flank0, a0=a0, alpha_w=awt, ra=ra0,
                        rf=rf0, rounding=rho_c, r_c=r_c, beta_c=beta_c, r_flank_end=r_fe,
                        ratio=z2 / z0, root_r=rr, root_psi=root_psi)


def default_cutter_teeth(z2: int) -> int:
    """Our choice of cutter size when none is given: about half the ring, 12 … 25 teeth."""
    return int(min(25, max(12, z2 // 2), z2 - 1))


def _theta(cut: ShaperCutter, q, r):
    """Largest ring-frame polar angle at which cutter point q passes radius r (−inf: never)."""
    rho, beta = cut.points(q)
    a0, k = cut.a0, cut.ratio
    c = (r * r - a0 * a0 - rho * rho) / (2.0 * a0 * rho)
    ok = np.abs(c) <= 1.0 + 1e-12
    g = np.arccos(np.clip(c, -1.0, 1.0))
    along = a0 + rho * np.cos(g)
    th_p = (beta - g) / k + np.arctan2(rho * np.sin(g), along)
    th_m = (beta + g) / k - np.arctan2(rho * np.sin(g), along)
    return np.where(ok, np.maximum(th_p, th_m), -np.inf)


def _envelope(cut: ShaperCutter, r, n: int = 480):
    """max over the cutter outline of θ(q, r) for each r; returns (η, q at the max)."""
    r = np.atleast_1d(np.asarray(r, dtype=float))
    q = np.concatenate([np.linspace(0.0, 1.0, n // 2, endpoint=False),
                        np.linspace(1.0, 2.0, n // 4, endpoint=False),
                        np.linspace(2.0, 3.0, n // 4)])
    th = _theta(cut, q[None, :], r[:, None])
    i = np.argmax(th, axis=1)
    if np.any(~np.isfinite(th[np.arange(len(r)), i])):
        raise GeometryError("the shaper cutter never reaches part of the ring's tooth zone")
    a = q[np.clip(i - 1, 0, len(q) - 1)]
    b = q[np.clip(i + 1, 0, len(q) - 1)]
    cols = np.arange(len(r))
    neg, at = golden_min(lambda t: -_theta(cut, t, r), a, b,
                         lambda width: width * (cut.ra + cut.a0) < TOL.envelope, 80,
                         -th[cols, i], q[i])
    return -neg, at


def eta_exact(cut: ShaperCutter, r) -> np.ndarray:
    """Generated space half angle of the ring at radii r, evaluated afresh (rad)."""
    return _envelope(cut, r)[0]


@dataclass(frozen=True, eq=False)
class RingFlank:
    """One generated flank of a ring's tooth space, polar samples from tip to root.

    ``eta`` is the half angle of the tooth space at ``r`` (a space spans −η … +η about its
    centre line); the ring tooth's half angle there is π/z − η. ``piece`` says which cutter
    part made each sample (TRIM: the cutter's root, INVOLUTE, FILLET: its rounded tip).
    ``r_involute`` is the radius range the cutter's involute generates (the ring's involute).
    """

    z: int
    r: np.ndarray
    eta: np.ndarray
    piece: np.ndarray
    r_tip: float
    r_root: float
    r_involute: tuple
    root_half: float

    def tooth_psi(self) -> np.ndarray:
        return math.pi / self.z - self.eta


def involute_range(ring: RingSizes, cut: ShaperCutter) -> tuple:
    """Ring radii generated by the cutter's involute (from its form circle to its rounding).

    On the line of action of the cutter–ring pair the ring's tangent point T₂ lies a₀ sin α_w0
    behind the cutter's T₀, so a cutter point of roll length L₀ = √(ρ² − r_b0²) makes the ring
    point of roll length L₀ + a₀ sin α_w0 (derived from the pair's geometry).
    """
    rb0, rb2 = cut.sizes.rb, ring.rb
    t0t2 = cut.a0 * math.sin(cut.alpha_w)
    lo = math.hypot(rb2, math.sqrt(max(cut.flank.r_junction ** 2 - rb0 ** 2, 0.0)) + t0t2)
    hi = math.hypot(rb2, math.sqrt(cut.r_flank_end ** 2 - rb0 ** 2) + t0t2)
    return lo, hi


def generate_ring_flank(ring: RingSizes, cut: ShaperCutter, n_tip: int = 12,
                        n_involute: int = 48, n_fillet: int = 28) -> RingFlank:
    """Generate the flank of the ring's tooth space cut by ``cut``, from r_a2 to r_f2.

    Samples: the part below the involute range (made by the cutter's root, where the cutter
    trims the ring's tips), the involute, and the fillet clustered toward the root circle.
    """
    ra, rf = ring.ra, ring.rf
    lo, hi = involute_range(ring, cut)
    lo_e, hi_e = min(max(lo, ra), rf), min(hi, rf)
    parts = []
    if lo_e > ra + 1e-9:
        parts.append(np.linspace(ra, lo_e, n_tip))
    if hi_e > lo_e + 1e-9:
        parts.append(np.linspace(lo_e, hi_e, n_involute))
    start = max(hi_e, lo_e)
    t = np.linspace(0.0, 1.0, n_fillet)
    parts.append(start + (rf - start) * (1.0 - (1.0 - t) ** 2))
    r = parts[0]
    for p in parts[1:]:
        r = np.concatenate([r, p[1:]])
    eta, q = _envelope(cut, r)
    root_half = cut.beta_c / cut.ratio
    eta[-1] = root_half
    # labels by the analytic ranges (the samples at the range ends belong to the involute)
    piece = np.where(r < lo - 1e-9, TRIM, np.where(r > hi + 1e-9, FILLET, INVOLUTE))
    if math.pi / ring.z - eta[0] <= 0.0:
        raise GeometryError("the ring's teeth come to a point at the tip circle (the cutter "
                            "trims them away): raise the ring's shift or tip shortening")
    return RingFlank(z=ring.z, r=r, eta=eta, piece=piece, r_tip=ra, r_root=rf,
                     r_involute=(lo, hi), root_half=root_half)
