"""Mesh relations of a declared gear pair or pinion–rack pair (ISO 21771 notation).

Everything is worked in the transverse plane, so spur and helical gears share one code path:
helical gears enter through their transverse module m_t, transverse pressure angle α_t and
reference radii from :func:`gen.geometry.cylindrical.gear_sizes`. Lengths mm, angles radians
(the one degree value, ``PairResult.working_pressure_angle``, is for people to read).

Relations used (ISO 21771, any gear handbook):

* standard center distance a = (d₁ + d₂)/2;
* working transverse pressure angle inv α_wt = inv α_t + 2 tan α_n (x₁ + x₂)/(z₁ + z₂),
  zero-backlash center distance a_w = a cos α_t / cos α_wt;
* center-distance modification y = (a_w − a)/m_n, tip shortening k = (x₁ + x₂) − y;
* at any center distance C: the operating pressure angle cos α'_w = a cos α_t / C (the sum of
  the base radii r_b1 + r_b2 = a cos α_t is fixed by the gears);
* transverse contact ratio ε_α = [√(r_a1² − r_b1²) + √(r_a2² − r_b2²) − C sin α'_w] / p_bt;
  overlap ratio ε_β = b sin β / (π m_n).

Backlash (exact involute relation, not the small-change one). The transverse tooth thickness
on the operating pitch circle r_w = r_b / cos α'_w is s_w = 2 r_w (s/d + inv α_t − inv α'_w).
Adding the two thicknesses and subtracting them from the operating pitch p_w = 2π r_w/z gives
the circumferential backlash on the operating pitch circle

    j_wt = 2 C (inv α'_w − inv α_wt) + (Δs₁ + Δs₂) cos α_t / cos α'_w + j_allow,

where Δs are the reference-circle thinnings carried by the GearSizes and j_allow the per-flank
print allowance (below). Along the line of action (base tangent) j_bt = j_wt cos α'_w and in
the normal plane j_n = j_bt cos β_b. For a small change ΔC from a_w the first term becomes
2 ΔC tan α, i.e. j_n ≈ 2 ΔC sin α (ISO/TR 10064-2 relation); it is *not* used here, the
tests compare it with the exact value.

Print allowance: ``flank_allowance`` c (mm) is material removed normal to every flank of both
members when printing (e.g. an inward offset of the outline). Each tooth/space pair has four
flanks, so it adds 4c to j_n, 4c/cos β_b to j_bt.

Pinion–rack. A rack of the basic-rack form with tooth thickness p/2 on its datum (pitch)
line is the negative of the generating rack, so it meshes without backlash exactly where the
generator sat while cutting the pinion: the datum line at r_p + x m_n from the pinion axis.
Hence the mounting height

    pinion axis → rack datum line  H₀ = r_p + x m_n,
    pinion axis → rack back         H₀ + h_rack   (h_rack = datum line to back, RackSizes.height).

Rack flanks are straight, so moving the rack out by Δ opens each flank by Δ sin α_t along the
line of action, exactly: j_bt = 2 Δ sin α_t + (Δs₁ + Δs_rack) cos α_t (+ allowance); the
operating pitch circle stays r_p and the operating pressure angle stays α_t. The contact
path runs from the rack tip line to the pinion tip circle:
g_α = [h_a,rack − x m_n − Δ]/sin α_t + √(r_a² − r_b²) − r_p sin α_t, ε_α = g_α / p_bt.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass

from gen.errors import GeometryError
from gen.geometry.basic_rack import BasicRack
from gen.geometry.cylindrical import GearSizes
from gen.geometry.involute import inv, inv_inverse
from gen.geometry.rack_outline import RackSizes

PAIR, RACK = "pair", "rack"
_RAD_FIELDS = ("alpha_t", "beta_b", "alpha_wt", "alpha_w")


@dataclass(frozen=True)
class PairResult:
    """Mesh numbers of a gear pair (``kind`` "pair") or a pinion–rack pair ("rack").

    Member 1 is the first gear (the pinion); member 2 the second gear or the rack. Tuples are
    (member 1, member 2); rack entries that have no meaning are ``None``.
    For a rack, "center distance" means pinion axis → rack datum (pitch) line.
    """

    kind: str
    z1: int
    z2: int | None
    mn: float                         # normal module (mm)
    alpha_t: float                    # transverse reference pressure angle (rad)
    beta_b: float                     # base helix angle (rad), tan β_b = tan β cos α_t
    reference_center_distance: float  # a = (d1 + d2)/2; rack: r_p
    zero_backlash_center_distance: float  # a_w (theoretical, no thinning); rack: r_p + x m_n
    alpha_wt: float                   # working transverse pressure angle at a_w (rad)
    y: float                          # center-distance modification coefficient
    k: float                          # tip shortening coefficient
    center_distance: float            # C in use (given, or a_w)
    alpha_w: float                    # operating transverse pressure angle at C (rad)
    working_pressure_angle: float     # the same in degrees, for reports
    pitch_radii: tuple                # operating pitch radii r_w (rack: r_p, None)
    base_radii: tuple
    tip_radii: tuple                  # rack: (r_a, rack addendum: datum → tip line)
    root_radii: tuple                 # rack: (r_f, rack dedendum: datum → root line)
    contact_path: tuple               # (approach, recess) along the line of action (mm)
    contact_ratio: float              # ε_α at C
    overlap_ratio: float              # ε_β (0 when no face width was given)
    total_contact_ratio: float        # ε_γ = ε_α + ε_β
    backlash_circumferential: float   # j_wt on the operating pitch circle (mm)
    backlash_base: float              # j_bt along the transverse line of action (mm)
    backlash_normal: float            # j_n (mm)
    backlash_from_thinning: float     # circumferential parts of j_wt (mm)
    backlash_from_center: float
    backlash_from_allowance: float
    flank_allowance: float            # per-flank print allowance used (mm, normal)
    tight_center_distance: float      # C at which j = 0 with thinning and allowance
    tip_clearances: tuple             # (tip 1 → root 2, tip 2 → root 1) (mm)
    tip_clearance: float              # the smaller of the two
    active_start_radii: tuple         # lowest radius reached by contact on each gear
    interference_free: tuple          # contact path inside the tangent points T1 T2
    form_radii: tuple                 # involute start radii if known, else (None, None)
    rack_back_distance: float | None  # pinion axis → rack back (rack only)

    def as_dict(self) -> dict:
        """Plain dict; the radian fields appear as ``<name>_deg`` in degrees."""
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
    """α_wt from inv α_wt = inv α_t + 2 tan α_n (x₁ + x₂)/(z₁ + z₂) (ISO 21771), radians."""
    return float(inv_inverse(float(inv(alpha_t)) + 2.0 * math.tan(alpha_n) * (x1 + x2) / (z1 + z2)))


def operating_pressure_angle(a: float, alpha_t: float, center_distance: float) -> float:
    """α'_w at center distance C: cos α'_w = a cos α_t / C (radians)."""
    c = a * math.cos(alpha_t) / center_distance
    if c >= 1.0:
        raise GeometryError(f"center distance {center_distance:.4f} mm is inside the base circles' "
                            f"sum {a * math.cos(alpha_t):.4f} mm: the involutes cannot mesh")
    return math.acos(c)


def center_distance_at(a: float, alpha_t: float, alpha_w: float) -> float:
    """C = a cos α_t / cos α_w, the inverse of :func:`operating_pressure_angle`."""
    return a * math.cos(alpha_t) / math.cos(alpha_w)


def base_helix_angle(beta: float, alpha_t: float) -> float:
    """tan β_b = tan β cos α_t (ISO 21771)."""
    return math.atan(math.tan(abs(beta)) * math.cos(alpha_t))


def overlap_ratio(face_width: float | None, beta: float, mn: float) -> float:
    """ε_β = b sin β / (π m_n); 0 when no face width is given."""
    if not face_width:
        return 0.0
    return face_width * math.sin(abs(beta)) / (math.pi * mn)


def form_radius(sizes: GearSizes, rack: BasicRack) -> float | None:
    """Radius where the involute starts on a rack-generated gear (the form circle), mm.

    The lowest point of the generating rack's straight flank (above its tip fillet) sits
    h = m_n (h_fP* − x) − ρ_fP (1 − sin α_n) below the rolling line. It generates the gear
    point on the line of action h / sin α_t from the pitch point, so
    r_F = √(r_b² + (r_p sin α_t − h / sin α_t)²). Returns None when that point lies past the
    tangent point (undercut: the involute start is then set by the undercut edge, take it from
    the generated Flank's ``r_junction`` instead).
    """
    mn, at = sizes.mn, sizes.alpha_t
    h = mn * (rack.dedendum - sizes.x) - rack.root_radius * mn * (1.0 - math.sin(rack.alpha))
    g = sizes.rp * math.sin(at) - h / math.sin(at)
    if g < 0.0:
        return None
    return math.hypot(sizes.rb, g)


def _check_family(g1: GearSizes, mn: float, alpha_n: float, beta: float, what: str):
    if abs(g1.mn - mn) > 1e-9 or abs(g1.alpha_n - alpha_n) > 1e-12:
        raise GeometryError(f"{what}: normal module and pressure angle must match "
                            f"(m_n {g1.mn} vs {mn}, α_n {math.degrees(g1.alpha_n):.4f}° vs "
                            f"{math.degrees(alpha_n):.4f}°)")
    if abs(abs(g1.beta) - abs(beta)) > 1e-12:
        raise GeometryError(f"{what}: helix angles must be equal in size "
                            f"({math.degrees(g1.beta):.4f}° vs {math.degrees(beta):.4f}°)")


def _ends(rb1, ra1, rb2, ra2, C, aw):
    """Contact path ends on the line of action T1–T2 (transverse), as distances from T1.

    Start of contact A: gear 2's tip circle, T1A = C sin α'_w − √(r_a2² − r_b2²);
    end E: gear 1's tip circle, T1E = √(r_a1² − r_b1²).
    """
    t1t2 = C * math.sin(aw)
    ta = t1t2 - math.sqrt(max(ra2 * ra2 - rb2 * rb2, 0.0))
    te = math.sqrt(max(ra1 * ra1 - rb1 * rb1, 0.0))
    return t1t2, ta, te


# --- gear pair ----------------------------------------------------------------------------

def mesh_pair(g1: GearSizes, g2: GearSizes, center_distance: float | None = None, *,
              face_width: float | None = None, flank_allowance: float = 0.0,
              form_radii: tuple | None = None) -> PairResult:
    """Mesh numbers of an external gear pair at ``center_distance`` (default a_w), mm.

    ``face_width`` (the common width b) feeds ε_β; ``flank_allowance`` is the per-flank
    print allowance (see the module notes); ``form_radii`` the involute start radii if known
    (e.g. from the generated flanks' ``r_junction`` or :func:`form_radius`).
    """
    _check_family(g2, g1.mn, g1.alpha_n, g1.beta, "gear pair")
    mn, at, an = g1.mn, g1.alpha_t, g1.alpha_n
    z1, z2 = g1.z, g2.z
    a = (g1.d + g2.d) / 2.0
    awt = working_pressure_angle(z1, z2, g1.x, g2.x, an, at)
    aw_dist = center_distance_at(a, at, awt)
    y = (aw_dist - a) / mn
    k = (g1.x + g2.x) - y
    C = aw_dist if center_distance is None else float(center_distance)
    aop = operating_pressure_angle(a, at, C)
    bb = base_helix_angle(g1.beta, at)
    rb1, rb2 = g1.rb, g2.rb
    rw1, rw2 = rb1 / math.cos(aop), rb2 / math.cos(aop)
    pbt = g1.pb

    # backlash, circumferential on the operating pitch circle (exact involute relation)
    j_center = 2.0 * C * (float(inv(aop)) - float(inv(awt)))
    j_thin = (g1.thinning + g2.thinning) * math.cos(at) / math.cos(aop)
    j_allow = 4.0 * flank_allowance / (math.cos(bb) * math.cos(aop))
    jwt = j_center + j_thin + j_allow
    jbt = jwt * math.cos(aop)
    jn = jbt * math.cos(bb)

    # j_bt(C) = 2 a cos α_t (inv α'_w − inv α_wt) + Σ Δs cos α_t + 4c / cos β_b = 0
    base_sum = a * math.cos(at)
    inv_tight = float(inv(awt)) - ((g1.thinning + g2.thinning) * math.cos(at)
                                   + 4.0 * flank_allowance / math.cos(bb)) / (2.0 * base_sum)
    tight = center_distance_at(a, at, float(inv_inverse(max(inv_tight, 0.0))))

    t1t2, ta, te = _ends(rb1, g1.ra, rb2, g2.ra, C, aop)
    g_f = rw1 * math.sin(aop) - ta         # approach: from A to the pitch point
    g_a = te - rw1 * math.sin(aop)         # recess: from the pitch point to E
    eps_a = (g_f + g_a) / pbt
    eps_b = overlap_ratio(face_width, g1.beta, mn)
    r_start1 = math.hypot(rb1, max(ta, 0.0))
    r_start2 = math.hypot(rb2, max(t1t2 - te, 0.0))
    c12 = C - g1.ra - g2.rf
    c21 = C - g2.ra - g1.rf
    return PairResult(
        kind=PAIR, z1=z1, z2=z2, mn=mn, alpha_t=at, beta_b=bb,
        reference_center_distance=a, zero_backlash_center_distance=aw_dist, alpha_wt=awt,
        y=y, k=k, center_distance=C, alpha_w=aop, working_pressure_angle=math.degrees(aop),
        pitch_radii=(rw1, rw2), base_radii=(rb1, rb2), tip_radii=(g1.ra, g2.ra),
        root_radii=(g1.rf, g2.rf), contact_path=(g_f, g_a), contact_ratio=eps_a,
        overlap_ratio=eps_b, total_contact_ratio=eps_a + eps_b,
        backlash_circumferential=jwt, backlash_base=jbt, backlash_normal=jn,
        backlash_from_thinning=j_thin, backlash_from_center=j_center,
        backlash_from_allowance=j_allow, flank_allowance=flank_allowance,
        tight_center_distance=tight, tip_clearances=(c12, c21), tip_clearance=min(c12, c21),
        active_start_radii=(r_start1, r_start2), interference_free=(ta >= 0.0, te <= t1t2),
        form_radii=tuple(form_radii) if form_radii is not None else (None, None),
        rack_back_distance=None)


# --- pinion and rack ----------------------------------------------------------------------

def rack_mounting_distance(pinion: GearSizes) -> float:
    """Pinion axis → rack datum line for a zero-backlash mesh: H₀ = r_p + x m_n (mm)."""
    return pinion.rp + pinion.x * pinion.mn


def mesh_rack(pinion: GearSizes, rack: RackSizes, datum_distance: float | None = None, *,
              face_width: float | None = None, flank_allowance: float = 0.0,
              form_radius: float | None = None) -> PairResult:
    """Mesh numbers of a pinion and a rack with the datum line ``datum_distance`` from the
    pinion axis (default H₀ = r_p + x m_n, see the module notes), mm.

    ``rack_back_distance`` of the result is the mounting height to the rack back.
    """
    _check_family(pinion, rack.mn, rack.alpha_n, rack.beta, "pinion and rack")
    mn, at = pinion.mn, pinion.alpha_t
    rp, rb, ra, rf = pinion.rp, pinion.rb, pinion.ra, pinion.rf
    h0 = rack_mounting_distance(pinion)
    H = h0 if datum_distance is None else float(datum_distance)
    delta = H - h0
    bb = base_helix_angle(pinion.beta, at)
    rack_thin = rack.pitch / 2.0 - rack.s
    j_center = 2.0 * delta * math.tan(at)
    j_thin = pinion.thinning + rack_thin
    j_allow = 4.0 * flank_allowance / (math.cos(bb) * math.cos(at))
    jt = j_center + j_thin + j_allow
    jbt = jt * math.cos(at)
    jn = jbt * math.cos(bb)
    tight = h0 - (j_thin + j_allow) / (2.0 * math.tan(at))

    g_f = (rack.addendum - pinion.x * mn - delta) / math.sin(at)   # rack tip line → pitch point
    g_a = math.sqrt(ra * ra - rb * rb) - rp * math.sin(at)        # pitch point → pinion tip
    eps_a = (g_f + g_a) / pinion.pb
    eps_b = overlap_ratio(face_width, pinion.beta, mn)
    t_dist = rp * math.sin(at) - g_f  # from the tangent point T1 to the start of contact
    c_pinion_tip = H + rack.dedendum - ra   # pinion tip → rack root line (H + h_f)
    c_rack_tip = H - rack.addendum - rf     # rack tip line (H − h_a) → pinion root circle
    return PairResult(
        kind=RACK, z1=pinion.z, z2=None, mn=mn, alpha_t=at, beta_b=bb,
        reference_center_distance=rp, zero_backlash_center_distance=h0, alpha_wt=at,
        y=pinion.x, k=0.0, center_distance=H, alpha_w=at, working_pressure_angle=math.degrees(at),
        pitch_radii=(rp, None), base_radii=(rb, None), tip_radii=(ra, rack.addendum),
        root_radii=(rf, rack.dedendum), contact_path=(g_f, g_a), contact_ratio=eps_a,
        overlap_ratio=eps_b, total_contact_ratio=eps_a + eps_b,
        backlash_circumferential=jt, backlash_base=jbt, backlash_normal=jn,
        backlash_from_thinning=j_thin, backlash_from_center=j_center,
        backlash_from_allowance=j_allow, flank_allowance=flank_allowance,
        tight_center_distance=tight, tip_clearances=(c_pinion_tip, c_rack_tip),
        tip_clearance=min(c_pinion_tip, c_rack_tip),
        active_start_radii=(math.hypot(rb, max(t_dist, 0.0)), None),
        interference_free=(t_dist >= 0.0, True), form_radii=(form_radius, None),
        rack_back_distance=H + rack.height)
