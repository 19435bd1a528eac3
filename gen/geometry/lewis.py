"""Lewis form factor Y measured on the generated tooth (load at the tip, Lewis's parabola).

The tooth is taken exactly as the generator cuts it (rack-rolling envelope with its true
trochoidal root from :func:`gen.geometry.generate.generate_flank`, or the rack tooth of
:func:`gen.geometry.rack_outline.rack_loop`) and the classic construction is carried out on
those points. Frame: ``u`` along the tooth centre line, outward (measured from the gear axis,
or from the rack pitch line), ``v`` across it (half the tooth thickness).

Construction (Lewis 1892; as derived in Shigley, Mechanical Engineering Design, §14-1)
-------------------------------------------------------------------------------------
1. Load point and direction. The whole load W acts at the tip corner T = (u_T, v_T), along
   the flank normal there. The normal of an involute at radius r is tangent to the base
   circle r_b, so it makes the profile angle α_r (cos α_r = r_b / r) with the tangent to the
   circle through the point. At the tip that circle tangent is itself turned by ψ_a (T lies
   ψ_a off the centre line, ψ_a = half the angular tip thickness), hence the load line makes

       φ_L = α_a − ψ_a,      cos α_a = r_b / r_a,

   with the perpendicular to the tooth centre line. For a rack ψ = 0 and α_a = α: φ_L = α.
2. Apex. The load line meets the centre line at u_L = u_T − v_T tan φ_L. For a gear the load
   line lies at distance r_b from the axis, so u_L = r_b / cos(α_a − ψ_a) (used as a check).
3. Components. W cos φ_L, perpendicular to the centre line, bends the tooth; the radial
   component W sin φ_L only compresses it and is neglected (it lowers the tensile stress on
   the loaded side), as in the Lewis/Shigley form.
4. Uniform strength. A cantilever of face width F loaded at its apex by W_t has stress
   σ = 6 W_t h / (F t²) at a section of thickness t a distance h from the apex; σ is the same
   everywhere when t² ∝ h, i.e. for a parabola with its vertex at the apex. The real tooth is
   weakest where the largest such parabola inside it touches its outline, which is the
   section (u, ±v) minimising t² / h, t = 2v, h = u_L − u (equivalently maximising h / t²).
   It is searched exactly on the generated outline taken as a polyline: on every segment
   both v and h are linear in the segment parameter, so the minimum of v²/h has a closed
   form (see :func:`_weakest_on_polyline`).
5. Form factor. Lewis's x follows from similar triangles, x = t² / (4h), and

       σ = 6 W_t h / (F t²) = 3 W_t / (2 F x) = W_t / (F m Y),   Y = 2x / (3m) = t² / (6 h m)

   with m the module (mm). In diametral pitch P = 1/m (1/in, m in inches) this is Shigley's
   Y = 2xP/3 of σ = W_t P / (F Y); Lewis's original y = Y/π goes with σ = W_t / (F p y).

Assumptions: one tooth carries the whole load at its tip (no load sharing; conservative for
contact ratios above 1); the radial component is neglected; W_t of the stress formula is the
transmitted tangential load at the pitch circle, taken equal to the bending component at the
tip (the factor cos φ_L / cos α between the two is left out, as in the Shigley form; it is
reported as :attr:`LewisSection.y_tip_component`); no fillet stress concentration; load
uniform across the face. Racks are the limit z → ∞ (the gear values converge to the rack
value). Helical gears use the virtual spur gear z_v = z / cos³β in the normal section.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.basic_rack import BasicRack, basic_rack
from gen.geometry.cylindrical import GearSizes, cutter_for, gear_sizes
from gen.geometry.generate import generate_flank
from gen.geometry.rack_outline import rack_loop, rack_sizes

#: flank samples used for the search: root (trochoid) and involute parts. At these densities
#: Y is converged to better than 1e-4 relative (measured against four times as many samples).
ROOT_SAMPLES = 200
INVOLUTE_SAMPLES = 120
#: sections closer to the apex than this fraction of the module are ignored (h → 0)
APEX_CLEARANCE = 1e-9


@dataclass(frozen=True)
class LewisSection:
    """Result of the Lewis construction on one tooth (lengths mm, angles rad).

    ``u`` values are along the tooth centre line (from the gear axis, or from the rack pitch
    line), ``v`` values across it.
    """

    form_factor: float        # Y, σ = W_t / (b m Y)
    module: float             # m (normal module), mm
    x: float                  # Lewis x = t² / (4h), mm
    t: float                  # thickness of the weakest section, mm
    h: float                  # apex to weakest section along the centre line, mm
    section_u: float          # position of the weakest section
    apex_u: float             # where the load line meets the centre line
    tip: tuple                # load point (u_T, v_T)
    load_angle: float         # φ_L, load line to the perpendicular of the centre line
    pressure_angle: float     # reference pressure angle α of the generating rack
    on_fillet: bool           # weakest section on the root fillet (else on the flank)

    @property
    def pitch_form_factor(self) -> float:
        """Lewis's original y = Y / π, for σ = W_t / (F p y)."""
        return self.form_factor / math.pi

    @property
    def y_tip_component(self) -> float:
        """Y with the bending component of the tip load referred to the pitch-line load.

        With normal load W = W_t / cos α, the bending part is W cos φ_L, so the stress is
        W_t / (F m Y') with Y' = Y cos α / cos φ_L. Not the Shigley form; kept for comparison.
        """
        return self.form_factor * math.cos(self.pressure_angle) / math.cos(self.load_angle)


def _weakest_on_polyline(u: np.ndarray, v: np.ndarray, u_apex: float, clearance: float):
    """Minimum of v²/h, h = u_apex − u, over the polyline through (u, v).

    On a segment u = u0 + du·s, v = v0 + dv·s (0 ≤ s ≤ 1), f(s) = (v0 + dv s)² / (h0 + dh s)
    with dh = −du; f'(s) = 0 at s* = (dh v0 − 2 dv h0) / (dv dh). Candidates are the vertices
    and the clipped s* of every segment below the apex (a segment crossing it is cut there).
    Returns (f, u, v, index of the segment).
    """
    h = u_apex - u
    keep = h[:-1] > clearance
    if not np.any(keep):
        raise GeometryError("the tip load line meets the tooth centre line below the root")
    idx = np.nonzero(keep)[0]
    u0, v0, h0 = u[idx], v[idx], h[idx]
    u1, v1, h1 = u[idx + 1], v[idx + 1], h[idx + 1]
    # a segment running past the apex is cut where h = clearance
    cut = h1 <= clearance
    w = np.where(cut, (h0 - clearance) / np.where(cut, h0 - h1, 1.0), 1.0)
    du, dv = (u1 - u0) * w, (v1 - v0) * w
    dh = -du
    with np.errstate(divide="ignore", invalid="ignore"):
        s_star = (dh * v0 - 2.0 * dv * h0) / (dv * dh)
    s_star = np.where(np.isfinite(s_star), np.clip(s_star, 0.0, 1.0), 0.0)
    cand_s = np.concatenate([np.zeros_like(s_star), np.ones_like(s_star), s_star])
    cand_i = np.concatenate([idx, idx, idx])
    k = np.tile(np.arange(len(idx)), 3)
    cu = u0[k] + du[k] * cand_s
    cv = v0[k] + dv[k] * cand_s
    f = cv * cv / (u_apex - cu)
    j = int(np.argmin(f))
    return float(f[j]), float(cu[j]), float(cv[j]), int(cand_i[j])


def _construct(u, v, tip, load_angle, module, pressure_angle, u_form) -> LewisSection:
    """Lewis construction on a half profile (u, v), root to tip; ``u_form`` = flank start."""
    u_t, v_t = tip
    u_apex = u_t - v_t * math.tan(load_angle)
    f, su, sv, _ = _weakest_on_polyline(np.asarray(u, float), np.asarray(v, float), u_apex,
                                        APEX_CLEARANCE * module)
    x = f                       # v²/h = (t/2)²/h = t²/(4h)
    return LewisSection(form_factor=2.0 * x / (3.0 * module), module=module, x=x, t=2.0 * sv,
                        h=u_apex - su, section_u=su, apex_u=u_apex, tip=(u_t, v_t),
                        load_angle=load_angle, pressure_angle=pressure_angle,
                        on_fillet=bool(su < u_form))


def lewis_spur(z: float, module: float, rack: BasicRack | None = None, x: float = 0.0,
               thinning: float = 0.0, tip_shortening: float = 0.0) -> LewisSection:
    """Lewis construction on the generated tooth of a spur gear.

    ``z`` may be a virtual (non-integer) tooth count; ``thinning`` is the arc thinning on the
    reference circle (mm, both flanks), ``tip_shortening`` the coefficient k. Defaults to the
    ISO 53 profile A basic rack.
    """
    rack = rack or basic_rack("A")
    sizes = gear_sizes(z, module, rack, x=x, thinning=thinning, tip_shortening=tip_shortening)
    flank = generate_flank(z, sizes.rp, cutter_for(sizes, rack), sizes.ra,
                           n_root=ROOT_SAMPLES, n_involute=INVOLUTE_SAMPLES)
    if flank.r_junction >= flank.r_tip:
        raise GeometryError(f"no involute at the tip of the {z}-tooth gear: the Lewis tip load "
                            "direction is undefined (too much undercut)")
    psi_a = float(flank.psi[-1])
    if psi_a <= 0.0:
        raise GeometryError(f"pointed teeth on the {z}-tooth gear: no tip to load")
    alpha_a = math.acos(sizes.rb / sizes.ra)
    u = flank.r * np.cos(flank.psi)
    v = flank.r * np.sin(flank.psi)
    tip = (sizes.ra * math.cos(psi_a), sizes.ra * math.sin(psi_a))
    # the flank starts at the junction radius; compare along the centre line there
    u_form = float(np.interp(flank.r_junction, flank.r, u))
    return _construct(u, v, tip, alpha_a - psi_a, module, rack.alpha, u_form)


def lewis_gear(sizes: GearSizes, rack: BasicRack) -> LewisSection:
    """Lewis construction for a gear of ``sizes`` cut by ``rack``.

    Spur gears use their own tooth. A helical gear uses the virtual spur gear of its normal
    section, z_v = z / cos³β with the normal module, the normal thinning Δs·cos β and the
    same addendum (from memory, the usual formative-gear rule).
    """
    mn = sizes.mn
    k = rack.addendum + sizes.x - (sizes.ra - sizes.rp) / mn
    if abs(sizes.beta) < 1e-12:
        return lewis_spur(sizes.z, mn, rack, x=sizes.x, thinning=sizes.thinning,
                          tip_shortening=k)
    cb = math.cos(sizes.beta)
    return lewis_spur(sizes.z / cb ** 3, mn, rack, x=sizes.x,
                      thinning=sizes.thinning * cb, tip_shortening=k)


def lewis_rack(rack: BasicRack | None = None, module: float = 1.0,
               thinning: float = 0.0) -> LewisSection:
    """Lewis construction on one tooth of the rack outline (normal section, z → ∞).

    The tooth comes from :func:`gen.geometry.rack_outline.rack_loop`; the load acts at the tip
    corner along the normal of the straight flank segment that ends there.
    """
    rack = rack or basic_rack("A")
    hf = rack.dedendum * module
    sizes = rack_sizes(module, rack, height=hf + module, teeth=1, thinning=thinning)
    poly = rack_loop(sizes, rack).polygon(module * 1e-3)
    centre = sizes.pitch / 2.0            # with one tooth, the tooth is centred on p/2
    side = poly[(poly[:, 1] > -sizes.height + 1e-12 * module) & (poly[:, 0] >= centre)]
    side = side[np.lexsort((-side[:, 0], side[:, 1]))]   # root → tip; tip land inner last
    tip_y = side[:, 1].max()
    on_tip = side[:, 1] >= tip_y - 1e-12 * module
    corner = side[on_tip][np.argmax(side[on_tip][:, 0])]
    below = side[~on_tip]
    foot = below[-1]                       # lower end of the straight flank segment
    d = corner - foot
    load_angle = math.atan2(abs(d[0]), abs(d[1]))   # normal to the flank vs the horizontal
    half = np.vstack([below, corner])
    u = half[:, 1]
    v = half[:, 0] - centre
    return _construct(u, v, (float(corner[1]), float(corner[0] - centre)), load_angle, module,
                      rack.alpha, float(foot[1]))


def form_factor(z: float | None, rack: BasicRack | None = None, x: float = 0.0) -> float:
    """Y of a standard spur gear (``z``) or of the rack (``z=None``); Y is independent of m."""
    if z is None:
        return lewis_rack(rack).form_factor
    return lewis_spur(z, 1.0, rack, x=x).form_factor
