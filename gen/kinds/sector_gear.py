"""Part kind ``sector_gear``: an involute gear with teeth over the arc a swing needs, on a lever.

The sector is cut from a full gear of ``teeth`` teeth (ISO 21771 sizes, rack-generated flanks,
as :mod:`gen.kinds.cylgear`). Its tooth count comes from the swing (degrees the sector turns)
by :func:`gen.geometry.sector.sector_teeth`: the pitches that pass the pitch point, plus the
contact ratio's reach at each end, plus ``margin`` whole teeth at each end. The contact ratio
used for that sizing is the one with an assumed mate of ``mate_teeth`` teeth of the same tooth
system and shift (default: an identical sector, the 1:1 jaw pair); a declared mesh checks the
real pair over the swing (:mod:`gen.check.sector_pairs`).

Frame: axis on Z, bottom face z = 0, a tooth on +X (the toothed arc is centred on +X when the
sector has an odd tooth count, half a pitch off it when even), so every tooth centre line sits
on a multiple of the angular pitch 2π/z, as on the full gear. The lever body runs from the
toothed arc to a boss round the pivot bore; an optional arm with a hole points away from the
teeth.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.findings import ERROR, INFO, Finding
from gen.geometry.basic_rack import basic_rack
from gen.geometry.body import Body, Prism
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.gear_outline import gear_loop
from gen.geometry.generate import generate_flank
from gen.geometry.involute import inv
from gen.geometry.pair import mesh_pair
from gen.geometry.section import Section, circle
from gen.geometry.sector import SectorArm, sector_section, sector_teeth, teeth_in_arc
from gen.kinds import common_keys as K
from gen.kinds.base import Formula, GearMate, Part, Role
from gen.kinds.cylgear import bore_of, min_feature_findings
from gen.params.schema import REQUIRED, Key
from gen.tolerances import TOL
from gen.validate import measure
from gen.validate.gear_checks import gear_findings

KIND = "sector_gear"
ROLE = Role.EXTERNAL_GEAR

KEYS = (
    K.MODULE,
    Key("teeth", "int", REQUIRED, lo=6, hi=1000, doc="teeth of the full circle the sector is "
                                                     "cut from"),
    Key("swing", "angle", REQUIRED, lo=0, hi=360, lo_open=True, unit="deg",
        doc="angle the sector turns over its working range"),
    Key("margin", "int", 1, lo=0, hi=20, doc="whole teeth added at each end beyond the swing"),
    Key("arc", "angle", None, lo=0, hi=360, lo_open=True, unit="deg",
        doc="toothed arc, when it is fixed by the design (default: sized from the swing)"),
    Key("mate_teeth", "int", None, lo=6, hi=10000,
        doc="full-circle teeth of the mate, for the sizing (default: the same as teeth)"),
    Key("centre_line", "enum", "auto", choices=("auto", "tooth", "space"),
        doc="what sits on the sector's centre line: a mating pair of symmetric sectors wants "
            "a tooth on one and a space on the other"),
    K.PRESSURE_ANGLE, K.PROFILE, K.PROFILE_SHIFT, K.FACE_WIDTH, K.BACKLASH_ALLOWANCE,
    K.TIP_SHORTENING, K.BORE,
    Key("boss_diameter", "float", None, lo=0, hi=2000, lo_open=True, unit="mm",
        doc="lever boss round the pivot (default: twice the bore, at least bore + 4 mm)"),
    Key("arm", "map", None, sub=(
        Key("radius", "float", REQUIRED, lo=0, hi=2000, lo_open=True, unit="mm",
            doc="pivot to arm hole centre"),
        Key("width", "float", REQUIRED, lo=0, hi=500, lo_open=True, unit="mm"),
        Key("hole", "float", 0.0, lo=0, hi=500, unit="mm", doc="hole diameter at the arm end"),
        Key("angle", "angle", 180.0, lo=-360, hi=360, unit="deg",
            doc="direction from the sector's centre line"),
    ), doc="lever arm with a hole (for a link, spring or cable)"),
    K.HUB, K.MATERIAL, K.SAFETY_FACTOR, K.RATING_SPEED, K.FIT, K.FORCE, K.CHORD,
)

EXAMPLE = {"module": 1, "teeth": 30, "swing": 60, "face_width": 6, "bore": 3}

FORMULAS = (
    Formula("pitch_diameter", "d = z·m_n", "ISO 21771"),
    Formula("tip_diameter", "d_a = d + 2 m_n (h_aP* + x − k)", "ISO 21771"),
    Formula("root_diameter", "d_f = d − 2 m_n (h_fP* − x)", "ISO 21771"),
    Formula("sector_teeth", "N ≥ Σ z/2π + 2t + 2g/p_b − 1, + 2 margin", "computed "
            "(gen.geometry.sector)"),
)


@dataclass(frozen=True, eq=False)
class SectorMate(GearMate):
    """A sector gear in a pair check: its teeth, swing (rad) and centre-line angle (rad)."""

    sector_teeth: int = 0
    swing: float = 0.0
    centre: float = 0.0


def flank_offset(sizes, pair) -> float:
    """Half tooth thickness of gear 1 on the operating pitch circle, in pitches:
    t = (s/d + inv α_t − inv α'_w) / τ (ISO 21771 tooth thickness relation)."""
    tau = 2.0 * math.pi / sizes.z
    return (sizes.s / sizes.d + float(inv(sizes.alpha_t)) - float(inv(pair.alpha_w))) / tau


def sector_centre(teeth: int, z: int) -> float:
    """Centre-line angle (rad) that puts every tooth on a multiple of 2π/z: 0 for an odd
    count, half a pitch for an even one."""
    return 0.0 if teeth % 2 else math.pi / z


def _size_sector(values, sizes, rack, where):
    """(SectorTeeth, teeth kept) for the swing; raises ParamError naming the key."""
    z, swing = values["teeth"], values["swing"]
    mate_z = values["mate_teeth"] or z
    fit = K.fit_of(values)
    mate = gear_sizes(mate_z, values["module"], rack, x=values["profile_shift"],
                      thinning=values["backlash_allowance"] + 2.0 * fit["flank_clearance"],
                      tip_shortening=values["tip_shortening"] + fit["outline_offset"] / values["module"])
    pr = mesh_pair(sizes, mate)
    reach = max(pr.contact_path) / sizes.pb
    parity = {"auto": None, "tooth": "odd", "space": "even"}[values["centre_line"]]
    try:
        st = sector_teeth(z, swing, pr.contact_ratio, values["margin"], reach=reach,
                          flank_offset=flank_offset(sizes, pr), parity=parity)
    except GeometryError as exc:
        raise where.error("swing", str(exc), math.degrees(swing)) from None
    if values.get("arc") is None:
        return st, st.teeth, pr
    try:
        n = teeth_in_arc(z, values["arc"])
    except GeometryError as exc:
        raise where.error("arc", str(exc), math.degrees(values["arc"])) from None
    if n < st.teeth:
        raise where.error(
            "swing", f"a {math.degrees(swing):g}° swing needs {st.teeth} teeth ({st.needed} in "
            f"contact over the swing + {st.margin} margin at each end), but the "
            f"{math.degrees(values['arc']):g}° arc holds only {n}: shorten the swing, widen "
            "the arc or lower the margin", math.degrees(swing))
    if parity is not None and (n % 2 == 1) != (parity == "odd"):
        n -= 1  # the asked centre line: drop one tooth, if the swing can spare it
        if n < st.teeth:
            raise where.error("centre_line", f"the {math.degrees(values['arc']):g}° arc holds "
                              f"{n + 1} teeth; with a {values['centre_line']} on the centre "
                              f"line only {n} fit, fewer than the {st.teeth} the swing needs",
                              values["centre_line"])
    return st, n, pr


def _boss(values, bore, sizes, where) -> float:
    if values.get("boss_diameter") is not None:
        return values["boss_diameter"]
    if bore is None:
        return min(8.0, 0.5 * sizes.df)
    d = bore.outer_radius() * 2.0
    return min(max(2.0 * d, d + 4.0), 0.9 * sizes.df)


def measure_sector(poly: np.ndarray, sizes, teeth: int, centre: float) -> dict:
    """Sizes measured on a sector outline (mm, rad): teeth counted on the mid-depth circle
    inside the toothed arc, tip and root radii there, arc thickness on d, angular pitch."""
    r = measure.radii(poly)
    ang = np.arctan2(poly[:, 1], poly[:, 0])
    half = teeth * math.pi / sizes.z
    rel = (ang - centre + math.pi) % (2.0 * math.pi) - math.pi
    in_arc = np.abs(rel) <= half + 1e-9
    arcs = measure.material_arcs(poly, 0.5 * (sizes.ra + sizes.rf))
    mids = arcs[:, 0] + arcs[:, 1] / 2.0 if len(arcs) else np.zeros(0)
    keep = np.abs((mids - centre + math.pi) % (2.0 * math.pi) - math.pi) <= half
    thick = measure.material_arcs(poly, sizes.rp)
    tmid = thick[:, 0] + thick[:, 1] / 2.0 if len(thick) else np.zeros(0)
    tkeep = np.abs((tmid - centre + math.pi) % (2.0 * math.pi) - math.pi) <= half
    th = thick[tkeep, 1] * sizes.rp
    centres = np.sort((tmid[tkeep] - centre + math.pi) % (2.0 * math.pi))
    return {"teeth": int(np.count_nonzero(keep)),
            "tip_radius": float(r[in_arc].max()),
            "root_radius": float(r[in_arc].min()),
            "thickness": float(th.mean()) if len(th) else float("nan"),
            "pitch": np.diff(centres)}


def compare_sector(name, got, sizes, teeth, *, size_tol, thickness_tol, where) -> list:
    """Errors for every measured sector size that disagrees with its formula."""
    out = []

    def bad(what, m, e, tol, formula):
        out.append(Finding(ERROR, "size-mismatch", f"{where}: measured {what} {m:.4f} mm, "
                           f"formula {e:.4f} mm (tolerance {tol:g} mm)", name,
                           f"ISO 21771: {formula}"))

    if got["teeth"] != teeth:
        out.append(Finding(ERROR, "tooth-count", f"{where}: counted {got['teeth']} teeth on the "
                           f"sector, expected {teeth}", name, "sector tooth count"))
    if abs(got["tip_radius"] - sizes.ra) > size_tol:
        bad("tip radius", got["tip_radius"], sizes.ra, size_tol, "da = d + 2 m_n (h_aP* + x − k)")
    if abs(got["root_radius"] - sizes.rf) > size_tol:
        bad("root radius", got["root_radius"], sizes.rf, size_tol, "df = d − 2 m_n (h_fP* − x)")
    if thickness_tol is not None and not math.isnan(got["thickness"]):
        if abs(got["thickness"] - sizes.s) > thickness_tol:
            bad("tooth thickness on d", got["thickness"], sizes.s, thickness_tol,
                "s = m (π/2 + 2 x tan α) − thinning")
    if len(got["pitch"]) and np.max(np.abs(got["pitch"] - 2.0 * math.pi / sizes.z)) > 1e-3:
        out.append(Finding(ERROR, "pitch", f"{where}: angular pitch of the sector varies by "
                           f"{math.degrees(np.max(np.abs(got['pitch'] - 2 * math.pi / sizes.z))):.4f}°",
                           name, "p = 2π/z"))
    return out


def make(name, values, where):
    rack = basic_rack(values["profile"]).with_alpha(values["pressure_angle"])
    m, z, b = values["module"], values["teeth"], values["face_width"]
    fit = K.fit_of(values)
    sizes = gear_sizes(z, m, rack, x=values["profile_shift"],
                       thinning=values["backlash_allowance"] + 2.0 * fit["flank_clearance"],
                       tip_shortening=values["tip_shortening"] + fit["outline_offset"] / m)
    try:
        cutter = cutter_for(sizes, rack)
        flank = generate_flank(z, sizes.rp, cutter, sizes.ra)
    except GeometryError as exc:
        raise where.error("teeth", str(exc), z) from None
    chord = values["chord_tolerance"]
    findings = []
    if flank.psi[-1] <= 0:
        raise where.error("profile_shift", "the teeth come to a point below the tip circle: "
                          "reduce the profile shift or shorten the tips", values["profile_shift"])
    st, n, pr = _size_sector(values, sizes, rack, where)
    centre = sector_centre(n, z)
    bore = bore_of(values)
    boss = _boss(values, bore, sizes, where)
    arm = values.get("arm")
    sarm = None
    if arm:
        sarm = SectorArm(radius=arm["radius"], width=arm["width"], hole_diameter=arm["hole"],
                         angle=centre + arm["angle"])
    try:
        section = sector_section(flank, n, hub_diameter=boss, bore=bore, center=centre, arm=sarm)
    except GeometryError as exc:
        msg = str(exc)
        key = ("arm" if "arm" in msg else "bore" if "bore" in msg else
               "boss_diameter" if "hub boss" in msg else "swing")
        raise where.error(key, msg, values.get(key)) from None
    outer, _ = section.polygons(chord)
    # the full gear the teeth come from: undercut, tip land, module, face width (ISO 21771)
    full = gear_loop(flank).polygon(chord)
    findings += gear_findings(name, sizes, cutter, flank, full, force=values["force"],
                              addendum=rack.addendum, face_width=b, rack_root=rack.root_radius * m)
    findings += min_feature_findings(name, fit, flank, sizes, None)
    got = measure_sector(outer, sizes, n, centre)
    findings += compare_sector(name, got, sizes, n, size_tol=TOL.size + chord,
                               thickness_tol=TOL.thickness_rel * m + 2 * chord
                               if flank.r_junction <= sizes.rp <= sizes.ra else None,
                               where="sector outline")
    findings.append(Finding(INFO, "sector-teeth", f"{n} teeth of {z} over a "
                            f"{math.degrees(n * 2 * math.pi / z):.2f}° arc: "
                            f"{st.engaged:.2f} pitches pass the pitch point over the "
                            f"{math.degrees(st.swing):g}° swing, {st.needed} keep full contact "
                            f"(ε_α {pr.contact_ratio:.3f} with a {pr.z2}-tooth mate), "
                            f"{st.margin} margin each end", name, "computed (gen.geometry.sector)",
                            key="swing"))
    solids = [Prism(section, 0.0, b)]
    hub = values.get("hub")
    if hub:
        holes = (bore.loop(),) if bore is not None else ()
        if hub["diameter"] > boss + 1e-9:
            findings.append(Finding(ERROR, "hub-too-big", f"hub diameter {hub['diameter']:g} mm "
                                    f"is larger than the lever boss ({boss:g} mm)", name,
                                    "geometry", key="hub"))
        if bore is not None and hub["diameter"] / 2.0 <= bore.outer_radius() + 0.5:
            findings.append(Finding(ERROR, "hub-too-thin", f"hub diameter {hub['diameter']:g} mm "
                                    "leaves no wall around the bore", name, "geometry", key="hub"))
        solids.append(Prism(Section(circle(hub["diameter"] / 2.0), holes), b, b + hub["length"]))
    body = Body(tuple(solids))
    manifest = {
        "module": m, "teeth": z, "sector_teeth": n, "swing": math.degrees(st.swing),
        "margin": st.margin, "arc": math.degrees(n * 2.0 * math.pi / z),
        "centre_line": math.degrees(centre),
        "pressure_angle": math.degrees(sizes.alpha_n), "profile_shift": sizes.x,
        "face_width": b, "pitch_diameter": sizes.d, "tip_diameter": sizes.da,
        "root_diameter": sizes.df, "base_diameter": sizes.db, "tooth_thickness": sizes.s,
        "boss_diameter": boss, "sizing_contact_ratio": pr.contact_ratio,
    }
    if arm:
        manifest["arm_radius"] = arm["radius"]
    if fit["name"] != "none":
        manifest["fit"] = {k: fit[k] for k in ("name", "flank_clearance", "hole_allowance",
                                               "outline_offset", "min_feature")}

    def slice_check(slicer):
        polys = slicer(0.5 * b)
        poly = max(polys, key=lambda p: abs(_area(p)))
        got = measure_sector(poly, sizes, n, centre)
        return compare_sector(name, got, sizes, n, size_tol=chord + TOL.slice_extra,
                              thickness_tol=None, where=f"mesh slice z={0.5 * b:g}")

    from gen.kinds.cylgear import gear_rating
    import functools

    rating = functools.lru_cache(maxsize=1)(lambda: gear_rating(name, values, sizes, rack))
    return Part(name=name, kind=KIND, role=ROLE, values=values, shape=body, sizes=manifest,
                findings=tuple(findings), formulas=FORMULAS,
                mate=SectorMate(sizes, flank, values["profile"], b, sector_teeth=n,
                                swing=st.swing, centre=centre),
                outline=outer, section=section, slice_checks=(slice_check,), rating=rating,
                chord_tol=chord, data={"sector": st, "teeth_kept": n, "sizes": sizes,
                                       "sizing_pair": pr, "flank": flank})


def _area(p):
    x, y = p[:, 0], p[:, 1]
    return 0.5 * float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))
