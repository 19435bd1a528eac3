"""Part kind ``ring_gear``: an internal involute gear (spur, helical or herringbone) in a rim.

The tooth space is cut by a shaper (pinion-type) cutter of ``cutter_teeth`` teeth and shift
``cutter_shift`` (:mod:`gen.geometry.internal_cut`), so the root is the cutter tip's true
trochoid. Sizes follow ISO 21771 for internal gears with *positive* magnitudes: the ring's
tooth count is written positive and ``profile_shift`` > 0 moves its profile away from the
axis (ISO's signed form has z → −z, x → −x; :mod:`gen.geometry.internal` states it in full):

    d = z m_t,  d_a = d − 2 m_n (h_aP* − x − k),  d_f = d + 2 m_n (h_fP* + x),
    e = m_t (π/2 + 2 x tan α_n) + Δs   (space width on d; Δs = tooth thinning).

Tip shortening defaults to k = 0.2: unshortened ring tips reach inside the interference
point of common pinions (an 18-tooth pinion in a 48-tooth ring at 20°: −0.19 mm, so contact
runs below the pinion's involute; with k = 0.2 the margin is +0.11 mm — computed by
:func:`gen.geometry.internal_pair.mesh_internal`). Set ``tip_shortening: 0`` for the full
ISO 21771 tip.

Frame: ring axis on Z, bottom face at z = 0, tooth 0 centred on +X pointing toward the axis.
Hands follow :mod:`gen.geometry.body`; a pinion meshing inside a ring has the **same** hand
(the contact-point tooth traces run the same way on both: computed from the twist rates).
Mounting holes are straight axial holes on a bolt circle in the rim (hole 0 on +X, turned by
half a hole pitch when ``hole_phase`` asks).
"""

from __future__ import annotations

import functools
import math

from gen.errors import GeometryError
from gen.findings import INFO, WARNING, Finding
from gen.geometry.basic_rack import basic_rack
from gen.geometry.body import Body, Prism, gear_twist
from gen.geometry.internal import ring_base_tip_limit
from gen.geometry.internal_cut import default_cutter_teeth
from gen.geometry.internal_outline import ring_outline, ring_section
from gen.geometry.section import Section, circle
from gen.kinds import common_keys as K
from gen.kinds.base import Formula, Part, RingMate, Role
from gen.params.schema import REQUIRED, Key
from gen.tolerances import LIMITS, TOL
from gen.validate.ring_checks import ring_size_findings, ring_slice_check

KIND = "ring_gear"
ROLE = Role.INTERNAL_GEAR

RING_HELIX = Key("helix_angle", "angle", 0.0, lo=0, hi=45, hi_open=True, unit="deg",
                 doc="reference helix angle β (0: spur)")
RING_HAND = Key("hand", "enum", "right", choices=("right", "left"),
                doc="helix hand; a pinion inside the ring takes the SAME hand")
HERRINGBONE = Key("herringbone", "bool", False,
                  doc="two mirrored helical halves (needs a helix angle)")
GROOVE = Key("groove", "float", 0.0, lo=0, hi=1000, unit="mm",
             doc="plain centre band of a herringbone ring, cut out to the root diameter")
RING_TIP = Key("tip_shortening", "float", 0.2, lo=0, hi=1,
               doc="tip shortening coefficient k: tips moved out by k m_n (clears pinion roots)")
RIM_THICKNESS = Key("rim_thickness", "float", None, lo=0, hi=1000, lo_open=True, unit="mm",
                    doc="rim below the root circle (default 1.2 tooth depths)")
RIM_DIAMETER = Key("rim_outside_diameter", "float", None, lo=0, hi=20000, lo_open=True,
                   unit="mm", doc="outside diameter of the rim (instead of rim_thickness)")
MOUNTING = Key("mounting_holes", "map", None, sub=(
    Key("count", "int", REQUIRED, lo=1, hi=360),
    Key("diameter", "float", REQUIRED, lo=0, hi=1000, lo_open=True, unit="mm"),
    Key("bolt_circle", "float", REQUIRED, lo=0, hi=20000, lo_open=True, unit="mm",
        doc="bolt circle diameter"),
), doc="axial holes on a bolt circle in the rim: {count, diameter, bolt_circle}")
CUTTER_TEETH = Key("cutter_teeth", "int", None, lo=6, hi=10000,
                   doc="teeth of the shaper cutter (default about half the ring, 12…25)")
CUTTER_SHIFT = Key("cutter_shift", "float", 0.0, lo=-0.5, hi=1.0,
                   doc="profile shift coefficient of the shaper cutter")
CUTTER_ROUND = Key("cutter_tip_radius", "float", 0.2, lo=0, hi=0.5,
                   doc="shaper cutter tip corner radius, in modules")

KEYS = (K.MODULE, K.TEETH, K.PRESSURE_ANGLE, K.PROFILE, K.PROFILE_SHIFT, K.FACE_WIDTH,
        K.BACKLASH_ALLOWANCE, RING_TIP, RING_HELIX, RING_HAND, HERRINGBONE, GROOVE,
        RIM_THICKNESS, RIM_DIAMETER, MOUNTING, CUTTER_TEETH, CUTTER_SHIFT, CUTTER_ROUND,
        K.MATERIAL, K.SAFETY_FACTOR, K.RATING_SPEED, K.FIT, K.CHORD)
EXAMPLE = {"module": 1.5, "teeth": 48, "face_width": 12, "rim_thickness": 5}

#: what a ring's sizes are measured against
RING_FORMULAS = (
    Formula("pitch_diameter", "d = z·m_n / cos β", "ISO 21771"),
    Formula("base_diameter", "d_b = d·cos α_t", "ISO 21771"),
    Formula("tip_diameter", "d_a = d − 2 m_n (h_aP* − x − k)", "ISO 21771 (internal, magnitudes)"),
    Formula("root_diameter", "d_f = d + 2 m_n (h_fP* + x)", "ISO 21771 (internal, magnitudes)"),
    Formula("space_width", "e = m_t (π/2 + 2 x tan α_n) + Δs", "ISO 21771 (internal, magnitudes)"),
)


def make(name, values, where):
    return make_ring(name, values, where, kind=KIND)


def make_ring(name: str, values: dict, where, *, kind: str = KIND) -> Part:
    """Generate, measure and describe one ring gear (values checked against :data:`KEYS`)."""
    rack = basic_rack(values["profile"]).with_alpha(values["pressure_angle"])
    m, z, b = values["module"], values["teeth"], values["face_width"]
    beta, chevron = values["helix_angle"], values["herringbone"]
    if chevron and beta <= 0:
        raise where.error("herringbone", "a herringbone ring needs a helix angle > 0", True)
    fit = K.fit_of(values)
    thinning = values["backlash_allowance"] + 2.0 * fit["flank_clearance"]
    k = values["tip_shortening"] + fit["outline_offset"] / m
    z0 = values["cutter_teeth"]
    try:
        if z0 is not None and not 6 <= z0 < z:
            raise GeometryError(f"the shaper cutter needs 6 ≤ teeth < {z} (the ring's)")
        sizes, cutter, flank, loop = ring_outline(
            z, m, rack, x=values["profile_shift"], beta=beta, thinning=thinning,
            tip_shortening=k, cutter_teeth=z0, cutter_shift=values["cutter_shift"],
            cutter_rounding=values["cutter_tip_radius"])
    except GeometryError as exc:
        key = "cutter_teeth" if "cutter" in str(exc) else "teeth"
        raise where.error(key, str(exc), values[key] if values.get(key) is not None
                          else default_cutter_teeth(z)) from None
    rim_d = _rim_diameter(values, sizes, where)
    findings = _ring_findings(name, values, sizes, flank, cutter, rim_d, k)
    chord = values["chord_tolerance"]
    hole_poly = loop.polygon(chord)
    in_involute = flank.r_involute[0] <= sizes.rp <= flank.r_involute[1]
    width_tol = TOL.thickness_rel * m + chord
    findings += ring_size_findings(name, hole_poly, sizes, size_tol=TOL.size,
                                   width_tol=width_tol, check_width=in_involute)
    bolts = _bolt_holes(values, sizes, rim_d, fit, where)
    section = ring_section(loop, rim_d, root_diameter=sizes.df)
    twist = gear_twist(beta, sizes.rp, values["hand"]) if beta else 0.0
    solids, cuts = _prisms(section, b, twist, chevron, values["groove"], rim_d, sizes, bolts,
                           where)
    body = Body(tuple(solids), cuts=tuple(cuts))
    # a herringbone is measured in the middle of its lower toothed half, clear of any groove
    z_slice = 0.25 * (b - values["groove"]) if chevron else b / 2.0
    checks = [ring_slice_check(name, sizes, z_slice, chord + TOL.slice_extra,
                               2 * chord + TOL.slice_extra + TOL.thickness_rel * m, in_involute)]
    if beta:
        from gen.kinds.helical import helix_slice_check
        from gen.validate.ring_checks import toothed_hole

        # the toothed hole, measured midway between tip and root (with x = 1 a ring's tips lie
        # outside r_p); the turn is the same on every radius
        checks.append(helix_slice_check(name, sizes, twist, chevron, b, values["groove"],
                                        chord=chord, pick=toothed_hole))
    dxf = Section(section.outer, section.holes + tuple(bolts))
    manifest = {
        "module": sizes.mn, "teeth": z, "pressure_angle": math.degrees(sizes.alpha_n),
        "profile_shift": sizes.x, "tip_shortening": sizes.k, "face_width": b,
        "pitch_diameter": sizes.d, "tip_diameter": sizes.da, "root_diameter": sizes.df,
        "base_diameter": sizes.db, "space_width": sizes.e, "tooth_thickness": sizes.s,
        "rim_outside_diameter": rim_d, "rim_thickness": (rim_d - sizes.df) / 2.0,
        "cutter_teeth": cutter.z, "cutter_shift": cutter.x,
    }
    if beta:
        manifest.update(helix_angle=math.degrees(beta), hand=values["hand"],
                        transverse_module=sizes.mt,
                        transverse_pressure_angle=math.degrees(sizes.alpha_t))
    if fit["name"] != "none":
        manifest["fit"] = {k2: fit[k2] for k2 in ("name", "flank_clearance", "hole_allowance",
                                                  "outline_offset", "min_feature")}
    rating = functools.lru_cache(maxsize=1)(lambda: ring_rating(name, values, sizes, rack))
    return Part(name=name, kind=kind, role=ROLE, values=values, shape=body, sizes=manifest,
                findings=tuple(findings), formulas=RING_FORMULAS,
                mate=RingMate(sizes, flank, cutter, values["profile"], b,
                              hand=values["hand"] if beta else None, chevron=chevron),
                outline=hole_poly, section=dxf, slice_checks=tuple(checks), rating=rating,
                chord_tol=chord, data={"loop": loop, "rim_diameter": rim_d})


def ring_rating(name, values, sizes, rack) -> dict:
    """Lewis rating of the ring with the form factor of the basic rack's tooth: an internal
    gear's tooth widens toward its root more than a rack's, so the rack's Y is a lower bound
    (common practice, from memory). Torque (N·m) at the ring's reference diameter."""
    from gen.geometry.lewis import lewis_rack
    from gen.validate.strength import LoadedGear, rated_torque

    y = lewis_rack(rack, sizes.mn, thinning=sizes.thinning).form_factor
    gear = LoadedGear(name=name, module=sizes.mn, face_width=values["face_width"],
                      form_factor=y, pitch_diameter=sizes.d, teeth=sizes.z)
    torque = rated_torque(gear, values["material"], values["safety_factor"], values["rpm"])
    return {"lewis_form_factor": y, "rated_torque": torque, "material": values["material"],
            "safety_factor": values["safety_factor"], "rpm": values["rpm"], "loaded": gear}


def _rim_diameter(values, sizes, where) -> float:
    t, d = values["rim_thickness"], values["rim_outside_diameter"]
    if t is not None and d is not None:
        raise where.error("rim_outside_diameter", "give rim_thickness or rim_outside_diameter, "
                          "not both", d)
    if d is not None:
        if d <= sizes.df:
            raise where.error("rim_outside_diameter", f"rim outside diameter {d:g} mm is not "
                              f"outside the root diameter {sizes.df:.3f} mm", d)
        return float(d)
    if t is None:
        t = LIMITS.ring_backup_ratio * (sizes.addendum + sizes.dedendum) * sizes.mn
    return sizes.df + 2.0 * t


def _ring_findings(name, values, sizes, flank, cutter, rim_d, k) -> list:
    out = []
    depth = (sizes.df - sizes.da) / 2.0
    rim = (rim_d - sizes.df) / 2.0
    ratio = LIMITS.ring_backup_ratio
    if rim < ratio * depth - 1e-9:
        out.append(Finding(WARNING, "thin-rim", f"rim {rim:.2f} mm under the teeth is less than "
                           f"{ratio:g} tooth depths ({ratio * depth:.2f} mm): the rim flexes "
                           f"under load", name, "ISO 6336-3 backup ratio (from memory)",
                           key="rim_thickness"))
    if not ring_base_tip_limit(sizes.z, sizes.alpha_t, sizes.x, sizes.addendum, sizes.k):
        out.append(Finding(WARNING, "ring-tip-inside-base", f"tip diameter {sizes.da:.3f} mm lies "
                           f"inside the base circle {sizes.db:.3f} mm: the tips are not involute "
                           "(raise profile_shift or tip_shortening)", name, "ISO 21771",
                           key="tip_shortening"))
    mf = K.fit_of(values)["min_feature"]
    if mf and rim < mf:
        out.append(Finding(WARNING, "below-min-feature", f"rim {rim:.2f} mm is under the "
                           f"{mf:g} mm smallest feature of the fit", name, "fit profile",
                           key="fit"))
    out.append(Finding(INFO, "shaper-cut", f"tooth spaces cut by a {cutter.z}-tooth shaper "
                       f"cutter (shift {cutter.x:g}); involute from r {flank.r_involute[0]:.3f} to "
                       f"{flank.r_involute[1]:.3f} mm, tip shortening k {k:.3f}", name,
                       "shaper-cutter envelope"))
    return out


def _bolt_holes(values, sizes, rim_d, fit, where) -> list:
    spec = values.get("mounting_holes")
    if not spec:
        return []
    n, bc = spec["count"], spec["bolt_circle"]
    d = spec["diameter"] + fit["hole_allowance"]
    wall = max(LIMITS.min_wall, fit["min_feature"])
    r_in, r_out = bc / 2.0 - d / 2.0, bc / 2.0 + d / 2.0
    if r_in < sizes.rf + wall or r_out > rim_d / 2.0 - wall:
        raise where.error("mounting_holes", f"holes of {d:g} mm on a {bc:g} mm bolt circle do "
                          f"not fit the rim between the root circle {sizes.df:.3f} mm and the "
                          f"outside {rim_d:.3f} mm with {wall:g} mm walls", bc)
    if n > 1 and bc * math.sin(math.pi / n) < d + wall:
        raise where.error("mounting_holes", f"{n} holes of {d:g} mm on a {bc:g} mm bolt circle "
                          f"leave less than {wall:g} mm between them", n)
    return [circle(d / 2.0, (bc / 2.0 * math.cos(2 * math.pi * i / n),
                             bc / 2.0 * math.sin(2 * math.pi * i / n))) for i in range(n)]


def _prisms(section, b, twist, chevron, groove, rim_d, sizes, bolts, where):
    """(solids, cuts): the ring's prisms; bolt holes as straight cuts through all of them
    (built as plain holes: they stay clear of the twisting toothed hole)."""
    cuts = [Prism(Section(h), 0.0, b) for h in bolts]
    if not twist:
        return [Prism(Section(section.outer, section.holes + tuple(bolts)), 0.0, b)], []
    from gen.kinds.helical import twisted_gear_body

    solids, _ = twisted_gear_body(section, b, twist, chevron, groove, rim_d / 2.0,
                                  (circle(sizes.rf),), where)
    return list(solids), cuts
