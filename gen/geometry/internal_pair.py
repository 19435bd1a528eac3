"""A pinion (external gear z₁, x₁) in a ring (internal gear z₂, x₂): mesh numbers and the
interference checks only internal pairs have. Transverse plane, lengths mm, angles radians.

Relations (ISO 21771 in its signed form with z₂ → −z₂, x₂ → −x₂, see
:mod:`gen.geometry.internal`; written here with positive ring values):

* reference center distance a = m_t (z₂ − z₁)/2;
* working pressure angle inv α_wt = inv α_t + 2 tan α_n (x₂ − x₁)/(z₂ − z₁), zero-backlash
  center distance a_w = a cos α_t / cos α_wt, y = (a_w − a)/m_n, k = (x₂ − x₁) − y;
* at any center distance C: cos α'_w = a cos α_t / C (the base-radius difference
  r_b2 − r_b1 = a cos α_t is fixed); operating pitch radii r_w = r_b / cos α'_w;
* line of action: T₁ lies between T₂ and the pitch point, T₂T₁ = C sin α'_w. Contact runs
  from the ring tip (T₁A = √(r_a2² − r_b2²) − C sin α'_w) to the pinion tip
  (T₁E = √(r_a1² − r_b1²)): ε_α = [√(r_a1² − r_b1²) − √(r_a2² − r_b2²) + C sin α'_w] / p_bt
  (the internal form of the contact-ratio formula, any gear handbook, from memory);
* backlash on the operating pitch circle, exact involute relation (derived like
  :mod:`gen.geometry.pair`, ring space e₂ minus pinion tooth s₁ at r_w):
  j_wt = 2 C (inv α_wt − inv α'_w) + (Δs₁ + Δs₂) cos α_t / cos α'_w + 4c/(cos β_b cos α'_w).
  Moving the pinion *away* from the ring axis tightens the mesh (opposite to external pairs).
* tip clearances: pinion tip → ring root r_f2 − C − r_a1; ring tip → pinion root
  r_a2 − C − r_f1.

Checks that only internal pairs need:

* involute (tip) interference: the ring's tip circle must lie outside the interference
  point T₁: r_a2 ≥ √(r_b2² + (C sin α'_w)²), equivalently z₁/z₂ ≥ 1 − tan α_a2 / tan α'_w
  (gear handbooks, from memory); it needs r_a2 ≥ r_b2 (z₂ ≥ 33.2 at 20° unshifted).
* trochoid (tip-to-tip) interference as the pinion tooth leaves the ring's tooth space.
  Q is where the two tip circles cross: seen from the pinion axis at ε₁,
  cos ε₁ = (r_a2² − r_a1² − C²)/(2 C r_a1); from the ring axis at ε₂,
  cos ε₂ = (C² + r_a2² − r_a1²)/(2 C r_a2). The pinion's tip corner reaches Q after the pinion
  turns θ₁ = ε₁ + inv α_a1 − inv α'_w from the pitch-point contact, the ring's tip corner
  after the ring turns θ₂ = ε₂ + inv α_a2 − inv α'_w. The ring tooth must pass first:
  z₁ θ₁ − z₂ θ₂ ≥ 0, i.e. z₁(ε₁ + inv α_a1) − z₂(ε₂ + inv α_a2) + (z₂ − z₁) inv α'_w ≥ 0.
  This is the classic condition printed in gear handbooks (from memory, not re-read); it is
  derived here from the involute angles, and :mod:`gen.validate.internal_sweep` checks it on
  real outlines.
* radial assembly: whether the pinion can be pushed into the ring along a radius (its
  final mesh phase chosen freely) or only slid in axially. Checked by moving sample points
  of both tooth outlines (involute flanks and tip lands, involute extended radially below
  the base circle) along the insertion path and testing them against the other member's
  teeth (:func:`radial_assembly`; derived here, the sweep module checks it on outlines).
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.cylindrical import GearSizes
from gen.geometry.internal import RingSizes, tooth_half_angle
from gen.geometry.involute import half_thickness_angle, inv, inv_inverse
from gen.geometry.pair import base_helix_angle, overlap_ratio

_RAD_FIELDS = ("alpha_t", "beta_b", "alpha_wt", "alpha_w")


@dataclass(frozen=True)
class InternalPairResult:
    """Mesh numbers of a pinion in a ring; tuples are (pinion, ring)."""

    z1: int
    z2: int
    tooth_difference: int
    mn: float
    alpha_t: float
    beta_b: float
    reference_center_distance: float      # a = m_t (z₂ − z₁)/2
    zero_backlash_center_distance: float  # a_w
    alpha_wt: float                       # working pressure angle at a_w (rad)
    y: float
    k: float
    center_distance: float                # C in use
    alpha_w: float                        # operating pressure angle at C (rad)
    working_pressure_angle: float         # the same in degrees
    pitch_radii: tuple
    base_radii: tuple
    tip_radii: tuple
    root_radii: tuple
    contact_path: tuple                   # (ring-tip side, pinion-tip side) from the pitch point
    contact_ratio: float
    overlap_ratio: float
    total_contact_ratio: float
    backlash_circumferential: float       # j_wt (mm)
    backlash_base: float                  # j_bt
    backlash_normal: float                # j_n
    backlash_from_thinning: float
    backlash_from_center: float
    backlash_from_allowance: float
    flank_allowance: float
    tight_center_distance: float          # C where j = 0 (larger than a_w when thinned)
    tip_clearances: tuple                 # (pinion tip → ring root, ring tip → pinion root)
    tip_clearance: float
    active_radii: tuple                   # (lowest pinion radius in contact, deepest ring radius)
    interference_point_radius: float      # √(r_b2² + (C sin α'_w)²), on the ring
    involute_margin: float                # r_a2 − that radius (≥ 0: no involute interference)
    trochoid_margin: float | None         # z₁θ₁ − z₂θ₂ (rad; ≥ 0 clear; None: not evaluable)
    min_tooth_difference: int | None      # least z₂ − z₁ passing the trochoid check
    max_tooth_difference: int | None      # largest z₂ − z₁ passing the involute check
    radial_assembly: bool                 # the pinion can be put in along a radius
    radial_phase: float | None            # pinion turn (rad) at which it goes in, if it can
    problems: tuple                       # plain-words problems

    def as_dict(self) -> dict:
        out = {}
        for key, val in asdict(self).items():
            if key in _RAD_FIELDS:
                out[key + "_deg"] = math.degrees(val)
            elif isinstance(val, tuple):
                out[key] = list(val)
            else:
                out[key] = val
        return out


# --- single relations ---------------------------------------------------------------------

def working_pressure_angle(z1: int, z2: int, x1: float, x2: float, alpha_n: float,
                           alpha_t: float) -> float:
    """α_wt of an internal pair: inv α_wt = inv α_t + 2 tan α_n (x₂ − x₁)/(z₂ − z₁) (rad)."""
    if z2 <= z1:
        raise GeometryError(f"the ring needs more teeth than the pinion (z₁ {z1}, z₂ {z2})")
    v = float(inv(alpha_t)) + 2.0 * math.tan(alpha_n) * (x2 - x1) / (z2 - z1)
    if v <= 0.0:
        raise GeometryError("the shifts give a working pressure angle ≤ 0: raise x₂ − x₁")
    return float(inv_inverse(v))


def involute_margin(rb2: float, ra2: float, C: float, alpha_w: float) -> float:
    """r_a2 − √(r_b2² + (C sin α'_w)²): ≥ 0 when the ring tip clears the interference point."""
    return ra2 - math.hypot(rb2, C * math.sin(alpha_w))


def trochoid_margin(z1: int, z2: int, ra1: float, ra2: float, rb1: float, rb2: float,
                    C: float, alpha_w: float) -> float | None:
    """z₁ θ₁ − z₂ θ₂ of the tip-circle condition (module notes), rad; None when the tip
    circles do not cross or the ring tip lies inside its base circle (not evaluable)."""
    c1 = (ra2 * ra2 - ra1 * ra1 - C * C) / (2.0 * C * ra1)
    c2 = (C * C + ra2 * ra2 - ra1 * ra1) / (2.0 * C * ra2)
    if abs(c1) > 1.0 or abs(c2) > 1.0 or ra2 < rb2 or ra1 < rb1:
        return None
    e1, e2 = math.acos(c1), math.acos(c2)
    iw = float(inv(alpha_w))
    t1 = e1 + float(inv(math.acos(rb1 / ra1))) - iw
    t2 = e2 + float(inv(math.acos(rb2 / ra2))) - iw
    return z1 * t1 - z2 * t2


def _family_checks(pinion: GearSizes, ring: RingSizes, z1: int):
    """(trochoid margin, involute margin) at a_w for a pinion of z1 teeth with the same
    module, shift and addendum as ``pinion`` (for the tooth-difference limits)."""
    mt, at = ring.mt, ring.alpha_t
    add1 = pinion.ra - pinion.rp
    rp1 = z1 * mt / 2.0
    ra1, rb1 = rp1 + add1, rp1 * math.cos(at)
    awt = working_pressure_angle(z1, ring.z, pinion.x, ring.x_space, ring.alpha_n, at)
    C = (ring.z - z1) * mt * math.cos(at) / (2.0 * math.cos(awt))
    return (trochoid_margin(z1, ring.z, ra1, ring.ra, rb1, ring.rb, C, awt),
            involute_margin(ring.rb, ring.ra, C, awt))


def tooth_difference_limits(pinion: GearSizes, ring: RingSizes) -> tuple:
    """(least z₂ − z₁ passing the trochoid check, largest passing the involute check) for
    pinions of this module, shift and addendum in this ring; None where no count passes."""
    lo = hi = None
    for d in range(1, ring.z - 4):
        try:
            t, i = _family_checks(pinion, ring, ring.z - d)
        except GeometryError:
            continue
        if lo is None and t is not None and t >= 0.0:
            lo = d
        if i >= 0.0:
            hi = d
    return lo, hi


# --- radial assembly ----------------------------------------------------------------------

def _wrap(a, pitch):
    return (a + pitch / 2.0) % pitch - pitch / 2.0


def radial_assembly(pinion: GearSizes, ring: RingSizes, C: float, *, phases: int = 24,
                    steps: int = 160, tol: float = 1e-6):
    """Can the pinion be pushed into the ring along the line of centres to C, in some mesh
    phase, without its teeth crossing the ring's? Returns (possible, pinion turn or None).

    The pinion centre moves from the ring axis to (C, 0); in the final phase the ring has tooth
    0 on +X and the pinion a tooth space there, both turned on by the rolling angle t (pinion t,
    ring t z₁/z₂, t in [0, half a pinion pitch]: the mirror image covers the rest). Tooth
    outlines are taken as involutes (radial below the base circle); a point counts as inside
    the other member when it is more than ``tol`` mm within it.
    """
    z1, z2 = pinion.z, ring.z
    p1, p2 = 2.0 * math.pi / z1, 2.0 * math.pi / z2
    ra1, rf1, rb1 = pinion.ra, pinion.rf, pinion.rb
    ra2, rf2, rb2 = ring.ra, ring.rf, ring.rb

    def psi1(r):
        return half_thickness_angle(np.maximum(r, rb1), rp=pinion.rp, rb=rb1, s=pinion.s)

    def psi2(r):
        return tooth_half_angle(ring, np.maximum(r, rb2))

    # boundary samples in each member's own frame (tooth 0 on +X)
    r1 = np.linspace(max(rf1, ra2 - C), ra1, 10)
    a1 = psi1(r1)
    t1 = np.linspace(-1.0, 1.0, 5) * a1[-1]
    one1 = np.concatenate([np.column_stack([r1, a1]), np.column_stack([r1, -a1]),
                           np.column_stack([np.full(5, ra1), t1])])
    r2 = np.linspace(ra2, min(rf2, C + ra1), 10)
    a2 = psi2(r2)
    t2 = np.linspace(-1.0, 1.0, 5) * a2[0]
    one2 = np.concatenate([np.column_stack([r2, a2]), np.column_stack([r2, -a2]),
                           np.column_stack([np.full(5, ra2), t2])])

    def all_teeth(one, z, pitch):
        k = np.arange(z)[:, None] * pitch
        r = np.broadcast_to(one[:, 0], (z, len(one))).ravel()
        a = (one[:, 1][None, :] + k).ravel()
        return r, a

    pr, pa = all_teeth(one1, z1, p1)
    qr, qa = all_teeth(one2, z2, p2)
    u = np.linspace(0.0, C, steps + 1)[:, None]
    for t in np.linspace(0.0, p1 / 2.0, phases):
        f1 = math.pi / z1 + t          # pinion turn (a tooth space on +X at t = 0)
        f2 = t * z1 / z2               # ring turn
        # pinion points in the ring frame, tested against the ring's teeth
        x = u + pr * np.cos(pa + f1)
        y = pr * np.sin(pa + f1)
        rr = np.hypot(x, y)
        aa = _wrap(np.arctan2(y, x) - f2, p2)
        in_ring = (rr >= rf2 + tol) | ((rr > ra2 + tol) & (np.abs(aa) * rr < psi2(rr) * rr - tol))
        if np.any(in_ring):
            continue
        # ring points in the pinion frame, tested against the pinion's teeth
        x = qr * np.cos(qa + f2) - u
        y = qr * np.sin(qa + f2)
        rr = np.hypot(x, y)
        aa = _wrap(np.arctan2(y, x) - f1, p1)
        in_pin = (rr <= rf1 - tol) | ((rr < ra1 - tol) & (np.abs(aa) * rr < psi1(rr) * rr - tol))
        if not np.any(in_pin):
            return True, f1
    return False, None


# --- the pair -----------------------------------------------------------------------------

def mesh_internal(pinion: GearSizes, ring: RingSizes, center_distance: float | None = None, *,
                  face_width: float | None = None, flank_allowance: float = 0.0,
                  pinion_form_radius: float | None = None,
                  ring_involute_end: float | None = None,
                  check_radial: bool = True) -> InternalPairResult:
    """Mesh numbers and internal-pair checks of ``pinion`` in ``ring`` at ``center_distance``
    (default the zero-backlash a_w), mm.

    ``pinion_form_radius`` (the pinion's involute start, e.g. ``Flank.r_junction``) and
    ``ring_involute_end`` (the ring's involute end toward its root, ``RingFlank.r_involute[1]``)
    add the checks that contact stays on the involutes. Helical members must have the same
    helix angle and the *same* hand (internal mesh); hands are not carried by the sizes.
    """
    if abs(pinion.mn - ring.mn) > 1e-9 or abs(pinion.alpha_n - ring.alpha_n) > 1e-12:
        raise GeometryError("pinion and ring: normal module and pressure angle must match")
    if abs(abs(pinion.beta) - abs(ring.beta)) > 1e-12:
        raise GeometryError("pinion and ring: helix angles must be equal")
    z1, z2, mn, mt = pinion.z, ring.z, ring.mn, ring.mt
    at, an = ring.alpha_t, ring.alpha_n
    a = mt * (z2 - z1) / 2.0
    # the ring's thinning is kept out of α_wt (as for external gears): the geometric shifts
    awt = working_pressure_angle(z1, z2, pinion.x, ring.x, an, at)
    aw = a * math.cos(at) / math.cos(awt)
    y = (aw - a) / mn
    k = (ring.x - pinion.x) - y
    C = aw if center_distance is None else float(center_distance)
    c = a * math.cos(at) / C
    if c >= 1.0:
        raise GeometryError(f"center distance {C:.4f} mm is smaller than the base-radius "
                            f"difference {a * math.cos(at):.4f} mm: the involutes cannot mesh")
    aop = math.acos(c)
    bb = base_helix_angle(ring.beta, at)
    rb1, rb2, ra1, ra2, rf1, rf2 = pinion.rb, ring.rb, pinion.ra, ring.ra, pinion.rf, ring.rf
    rw1, rw2 = rb1 / math.cos(aop), rb2 / math.cos(aop)

    j_center = 2.0 * C * (float(inv(awt)) - float(inv(aop)))
    j_thin = (pinion.thinning + ring.thinning) * math.cos(at) / math.cos(aop)
    j_allow = 4.0 * flank_allowance / (math.cos(bb) * math.cos(aop))
    jwt = j_center + j_thin + j_allow
    jbt = jwt * math.cos(aop)
    jn = jbt * math.cos(bb)
    base_diff = a * math.cos(at)
    inv_tight = float(inv(awt)) + ((pinion.thinning + ring.thinning) * math.cos(at)
                                   + 4.0 * flank_allowance / math.cos(bb)) / (2.0 * base_diff)
    tight = base_diff / math.cos(float(inv_inverse(inv_tight)))

    t1t2 = C * math.sin(aop)
    l_a2 = math.sqrt(max(ra2 * ra2 - rb2 * rb2, 0.0))
    t1a = l_a2 - t1t2                        # T₁ → contact at the ring tip
    t1e = math.sqrt(ra1 * ra1 - rb1 * rb1)   # T₁ → contact at the pinion tip
    g_ring = rw1 * math.sin(aop) - t1a
    g_pin = t1e - rw1 * math.sin(aop)
    eps_a = (g_ring + g_pin) / ring.pb
    eps_b = overlap_ratio(face_width, ring.beta, mn)
    r_act1 = math.hypot(rb1, max(t1a, 0.0))
    r_act2 = math.hypot(rb2, t1t2 + t1e)
    c12, c21 = rf2 - C - ra1, ra2 - C - rf1
    r_int = math.hypot(rb2, t1t2)
    i_marg = ra2 - r_int
    t_marg = trochoid_margin(z1, z2, ra1, ra2, rb1, rb2, C, aop)
    d_lo, d_hi = tooth_difference_limits(pinion, ring)
    if check_radial and ra1 < ra2:
        radial, phase = radial_assembly(pinion, ring, C)
    else:
        radial, phase = False, None

    problems = []
    if ra2 < rb2:
        problems.append(f"the ring's tip circle (d_a {2 * ra2:.3f} mm) lies inside its base circle "
                        f"(d_b {2 * rb2:.3f} mm): its teeth are not involute at the tip; give the "
                        f"ring a positive shift or shorten its tips")
    if i_marg < 0.0:
        problems.append(f"involute interference: the ring's tips reach {-i_marg:.3f} mm inside the "
                        f"pinion's interference point (ring tip circle must be ≥ "
                        f"{2 * r_int:.3f} mm); use a pinion with more teeth or shorten the ring's tips")
    if t_marg is None:
        problems.append("the trochoid (tip-to-tip) check cannot be evaluated for these tip circles")
    elif t_marg < 0.0:
        problems.append(f"trochoid interference: the pinion's tips strike the ring's tips as they "
                        f"leave the mesh (margin {t_marg:.4f} rad); the tooth-count difference "
                        f"{z2 - z1} is too small" + (f", at least {d_lo} is needed" if d_lo else ""))
    if c12 < 0.0 or c21 < 0.0:
        problems.append(f"tip clearance is negative ({min(c12, c21):.3f} mm): tips reach the "
                        f"other member's root")
    if jwt < -1e-9:
        problems.append(f"the mesh binds: backlash {jwt:.4f} mm < 0 at center distance {C:.4f} mm")
    if eps_a < 1.0:
        problems.append(f"contact ratio {eps_a:.3f} < 1: the teeth lose contact")
    if pinion_form_radius is not None and r_act1 < pinion_form_radius - 1e-9:
        problems.append(f"contact reaches {r_act1:.3f} mm on the pinion, below its involute start "
                        f"{pinion_form_radius:.3f} mm")
    if ring_involute_end is not None and r_act2 > ring_involute_end + 1e-9:
        problems.append(f"contact reaches {r_act2:.3f} mm on the ring, beyond its involute end "
                        f"{ring_involute_end:.3f} mm (into the root fillet)")
    if check_radial and not radial:
        problems.append("the pinion cannot be put into the ring along a radius: slide it in "
                        "axially")
    return InternalPairResult(
        z1=z1, z2=z2, tooth_difference=z2 - z1, mn=mn, alpha_t=at, beta_b=bb,
        reference_center_distance=a, zero_backlash_center_distance=aw, alpha_wt=awt, y=y, k=k,
        center_distance=C, alpha_w=aop, working_pressure_angle=math.degrees(aop),
        pitch_radii=(rw1, rw2), base_radii=(rb1, rb2), tip_radii=(ra1, ra2),
        root_radii=(rf1, rf2), contact_path=(g_ring, g_pin), contact_ratio=eps_a,
        overlap_ratio=eps_b, total_contact_ratio=eps_a + eps_b,
        backlash_circumferential=jwt, backlash_base=jbt, backlash_normal=jn,
        backlash_from_thinning=j_thin, backlash_from_center=j_center,
        backlash_from_allowance=j_allow, flank_allowance=flank_allowance,
        tight_center_distance=tight, tip_clearances=(c12, c21), tip_clearance=min(c12, c21),
        active_radii=(r_act1, r_act2), interference_point_radius=r_int, involute_margin=i_marg,
        trochoid_margin=t_marg, min_tooth_difference=d_lo, max_tooth_difference=d_hi,
        radial_assembly=radial, radial_phase=phase, problems=tuple(problems))
