"""Part kind ``flywheel``: a rotor of revolution (flywheel, reaction wheel, gyroscope rotor).

Frame: spin axis Z, the face z = 0 at the bottom (the motor pocket opens there), the rotor
up to z = thickness. Layouts (:mod:`gen.geometry.rotor`): a plain disc, or a rim + web + hub.
Either the rim width is given, or a ``target`` (axial inertia, or angular momentum at
``max_speed``) and the rest of the envelope: the thinnest rim that meets it is found
(:func:`gen.geometry.rotor_sizing.size_rim`) and a note says how.

Every number comes from the generated half-section (exact mass properties of the section of
revolution, holes in closed form), and the build re-measures the exported triangles on slices
(:func:`gen.validate.rotor_checks.slice_mass`) within the error the chord tolerance allows.
Stress: Timoshenko's rotating-disc and thin-ring formulas (:mod:`gen.geometry.rotor_stress`);
balance: ISO 21940-11 e_per = G/ω (from memory). Holes (bolt circle, lightening holes) raise
the stress at their edges: Kirsch's factor on the disc stress at their circle
(:mod:`gen.geometry.rotor_holes`), part of the peak stress, safety factor and speed limit. Units in the manifest: mass kg, inertia
kg·m², angular momentum N·m·s, energy J, stress MPa, speed rpm, unbalance g·mm, e_per µm,
time s; lengths mm.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from gen.errors import GeometryError, ParamError
from gen.findings import ERROR, INFO, WARNING, Finding
from gen.geometry.body import HoleCircle, Revolved
from gen.geometry.section import area_centroid
from gen.geometry.rotor import (Holes, Pocket, Rotor, bolt_slab, cell_grid, half_section,
                                mass_properties)
from gen.geometry.rotor_holes import SOURCE as HOLE_SOURCE, hole_stress
from gen.geometry.rotor_materials import rotor_material
from gen.geometry.rotor_sizing import size_rim
from gen.geometry.rotor_stress import (SOURCE as STRESS_SOURCE, permissible_unbalance,
                                       rotor_stress, speed_limit)
from gen.geometry.rotor_use import angular_momentum, kinetic_energy, rpm_to_rad, spin_up_time
from gen.kinds import common_keys as K
from gen.kinds.base import Formula, Part, Role
from gen.params.schema import REQUIRED, Key
from gen.tolerances import LIMITS, TOL
from gen.validate.rotor_checks import polygon_error_bound, slice_mass
from gen.validate.strength import Material

KIND = "flywheel"
ROLE = Role.PLAIN
FORMULAS = (
    Formula("mass", "m = ρ (2π ∫∫ r dA − holes)", "Pappus–Guldinus over the half-section"),
    Formula("inertia_axial", "I_z = ρ 2π ∫∫ r³ dA − Σ m_h (R_c² + d_h²/8)",
            "standard (parallel-axis theorem for the holes)"),
    Formula("inertia_transverse", "I_x = ρ (π ∫∫ r³ dA + 2π ∫∫ r z² dA) − m z̄²", "standard"),
    Formula("angular_momentum", "h = I_z ω", "standard"),
    Formula("kinetic_energy", "E = ½ I_z ω²", "standard"),
    Formula("spin_up_time", "t = I_z ω / T", "standard (constant torque, no friction)"),
    Formula("peak_stress", "σ = (3+ν)/8 ρω²R² (solid), (3+ν)/4 ρω²(R² + (1−ν)/(3+ν) a²) "
            "(bore), ρω²R² (thin rim)", STRESS_SOURCE + " (from memory)"),
    Formula("hole_stress", "σ_hole = K σ_θ(R_c) = 3 σ_θ(R_c) − σ_r(R_c), K from 2 to 3",
            HOLE_SOURCE),
    Formula("permissible_unbalance", "e_per = G/ω, U_per = m e_per", "ISO 21940-11 (from memory)"),
)
#: material words accepted (the rotor table's names and common aliases)
MATERIAL_CHOICES = ("PLA", "PETG", "ABS", "PA", "nylon", "POM", "acetal", "steel", "aluminium",
                    "brass")

KEYS = (
    Key("outer_diameter", "float", REQUIRED, lo=0, hi=5000, lo_open=True, unit="mm"),
    Key("thickness", "float", REQUIRED, lo=0, hi=2000, lo_open=True, unit="mm",
        doc="axial length of the rotor (of its rim, for a rim + web layout)"),
    Key("material", "enum", "PLA", choices=MATERIAL_CHOICES,
        doc="rotor material: density, strength and Poisson's ratio from the rotor table"),
    Key("max_speed", "float", REQUIRED, lo=0, hi=200000, lo_open=True, unit="rpm",
        doc="highest speed the rotor will ever run at"),
    Key("bore", "float", 0.0, lo=0, hi=5000, unit="mm", doc="hole along the axis (0: none)"),
    Key("layout", "enum", "disc", choices=("disc", "rim_web"),
        doc="plain disc, or a rim joined to a hub by a thinner web"),
    Key("rim_width", "float", None, lo=0, hi=2500, lo_open=True, unit="mm",
        doc="radial width of the rim (rim_web; omit when a target sizes it)"),
    Key("web_thickness", "float", None, lo=0, hi=2000, lo_open=True, unit="mm",
        doc="axial thickness of the web (rim_web)"),
    Key("web_offset", "float", None, lo=0, hi=2000, unit="mm",
        doc="height of the web's lower face above z = 0 (default: centred)"),
    Key("hub_diameter", "float", None, lo=0, hi=5000, lo_open=True, unit="mm",
        doc="outer diameter of the hub (rim_web)"),
    Key("hub_length", "float", None, lo=0, hi=2000, lo_open=True, unit="mm",
        doc="axial length of the hub (default: from hub_offset to the far face)"),
    Key("hub_offset", "float", 0.0, lo=0, hi=2000, unit="mm",
        doc="height of the hub's lower face above z = 0"),
    Key("pocket", "map", None, sub=(
        Key("diameter", "float", REQUIRED, lo=0, hi=5000, lo_open=True, unit="mm"),
        Key("depth", "float", REQUIRED, lo=0, hi=2000, lo_open=True, unit="mm"),
    ), doc="motor pocket: a recess from the face z = 0, inside the rim"),
    Key("holes", "map", None, sub=(
        Key("count", "int", REQUIRED, lo=3, hi=64),
        Key("diameter", "float", REQUIRED, lo=0, hi=2000, lo_open=True, unit="mm"),
        Key("circle", "float", REQUIRED, lo=0, hi=5000, lo_open=True, unit="mm",
            doc="diameter of the circle through the hole centres"),
    ), doc="lightening holes through the web (rim_web)"),
    Key("bolt_circle", "map", None, sub=(
        Key("diameter", "float", REQUIRED, lo=0, hi=5000, lo_open=True, unit="mm",
            doc="diameter of the circle through the hole centres"),
        Key("count", "int", REQUIRED, lo=2, hi=64),
        Key("hole", "float", REQUIRED, lo=0, hi=500, lo_open=True, unit="mm",
            doc="hole diameter (3.4: M3 clearance, ISO 273 medium, from memory)"),
    ), doc="axial holes to bolt the rotor to a motor or hub, through the hub (or disc)"),
    Key("target", "map", None, sub=(
        Key("inertia", "float", None, lo=0, hi=1e6, lo_open=True, unit="kg·m²"),
        Key("angular_momentum", "float", None, lo=0, hi=1e6, lo_open=True, unit="N·m·s",
            doc="at max_speed"),
    ), doc="size the rim for this (rim_web, rim_width omitted): give one of the two"),
    Key("balance_grade", "float", 6.3, lo=0, hi=4000, lo_open=True, unit="mm/s",
        doc="ISO 21940-11 balance quality grade G"),
    Key("motor_torque", "float", None, lo=0, hi=1e5, lo_open=True, unit="N·m",
        doc="net driving torque, for the spin-up time"),
    Key("min_safety_factor", "float", LIMITS.rotor_safety_factor, lo=1.0, hi=20.0,
        doc="least strength / peak stress at max_speed before a warning"),
    K.CHORD,
)
EXAMPLE = {"outer_diameter": 120, "thickness": 20, "material": "steel", "max_speed": 3000,
           "bore": 8}

#: the cautions attached to every rotor (and summarised in the README)
CAUTIONS = ("a spinning rotor stores {energy:.3g} J at max_speed: a burst throws fragments, so "
            "run it inside a containment ring or guard; never exceed max_speed; printed plastics "
            "creep and fatigue under sustained spin (inspect for growth and cracks, print solid); "
            "test first behind a guard at reduced speed; these figures are estimates: follow "
            "local codes and have the design reviewed by a qualified person")
#: rotor-geometry keys (gen.geometry.rotor) → the keys users write here
_KEY_OF = {"pocket": "pocket.diameter", "holes.circle_radius": "holes.circle",
           "holes": "holes", "web_offset": "web_offset", "density": "material"}


def _rotor(values, rim_width) -> Rotor:
    v = values
    pocket = Pocket(v["pocket"]["diameter"], v["pocket"]["depth"]) if v["pocket"] else None
    holes = (Holes(v["holes"]["count"], v["holes"]["diameter"], v["holes"]["circle"] / 2.0)
             if v["holes"] else None)
    bc = v.get("bolt_circle")
    bolts = Holes(bc["count"], bc["hole"], bc["diameter"] / 2.0) if bc else None
    if v["layout"] == "disc":
        return Rotor(v["outer_diameter"], v["thickness"], bore=v["bore"], pocket=pocket,
                     holes=holes, bolts=bolts)
    return Rotor(v["outer_diameter"], v["thickness"], bore=v["bore"], rim_width=rim_width,
                 web_thickness=v["web_thickness"], hub_diameter=v["hub_diameter"],
                 hub_length=(v["hub_length"] if v["hub_length"] is not None
                             else v["thickness"] - v["hub_offset"]),
                 hub_offset=v["hub_offset"],
                 web_offset=v["web_offset"], pocket=pocket, holes=holes, bolts=bolts)


def _refuse(where, exc: ParamError):
    key = _KEY_OF.get(exc.key, exc.key)
    return where.error(key, exc.detail, exc.value, exc.allowed)


def _layout_keys(values, where) -> None:
    """Keys that belong to one layout only, and the target's exclusive choices."""
    v = values
    if v["layout"] == "disc":
        for k in ("rim_width", "web_thickness", "web_offset", "hub_diameter", "hub_length",
                  "target", "holes"):
            if v[k] is not None:
                raise where.error(k, "belongs to layout: rim_web (a plain disc has no rim, web, "
                                  "hub or lightening holes)", v[k])
        if v["hub_offset"]:
            raise where.error("hub_offset", "belongs to layout: rim_web", v["hub_offset"])
        return
    for k in ("web_thickness", "hub_diameter"):
        if v[k] is None:
            raise where.error(k, "is required for layout: rim_web")
    if v["hub_length"] is None and v["hub_offset"] >= v["thickness"]:
        raise where.error("hub_offset", "leaves no hub inside the thickness: give hub_length "
                          "for a hub standing out of the rotor", v["hub_offset"],
                          f"< thickness {v['thickness']:g} mm")
    t = v["target"]
    if t is None and v["rim_width"] is None:
        raise where.error("rim_width", "give rim_width, or a target to size the rim for")
    if t is not None:
        if v["rim_width"] is not None:
            raise where.error("rim_width", "give rim_width or target, not both: the target "
                              "sizes the rim", v["rim_width"])
        if (t["inertia"] is None) == (t["angular_momentum"] is None):
            raise where.error("target", "give exactly one of inertia (kg·m²) or "
                              "angular_momentum (N·m·s at max_speed)")


def _size(values, density, omega, where, name):
    """Rim width (given or sized) and the sizing note (None when given)."""
    t = values["target"]
    if t is None:
        return values["rim_width"], None
    envelope = _rotor(values, 0.0)
    try:
        if t["inertia"] is not None:
            res = size_rim(envelope, density, t["inertia"])
        else:
            res = size_rim(envelope, density, target_momentum=t["angular_momentum"], omega=omega)
    except ParamError as exc:
        raise _refuse(where, exc) from None
    except GeometryError as exc:
        raise where.error("target", f"the envelope does not make a rotor: {exc}") from None
    if t["inertia"] is not None:
        want, most, unit, what = t["inertia"], res.max_inertia, "kg·m²", "inertia"
    else:
        want, most = t["angular_momentum"], res.max_inertia * omega
        unit, what = "N·m·s", "angular momentum at max_speed"
    if not res.met:
        raise where.error("target.inertia" if t["inertia"] is not None else
                          "target.angular_momentum",
                          f"{what} {want:.4g} {unit} cannot be reached inside the envelope: the "
                          f"widest rim ({res.max_rim_width:.2f} mm, up to the hub, pocket or "
                          f"holes) gives at most {most:.4g} {unit}", want,
                          f"≤ {most:.4g} {unit}, or a larger outer_diameter or thickness")
    note = Finding(INFO, "rotor-sizing",
                   f"rim sized for {what} {want:.4g} {unit}: the thinnest rim meeting it by "
                   f"bisection on the rim width is {res.rim_width:.3f} mm "
                   f"(the envelope allows up to {res.max_rim_width:.2f} mm, "
                   f"{most:.4g} {unit})", name, "gen.geometry.rotor_sizing", key="target")
    return res.rim_width, note


def make(name, values, where):
    values = dict(values)
    _layout_keys(values, where)
    try:
        mat = rotor_material(values["material"])
    except ParamError as exc:
        raise _refuse(where, exc) from None
    n_max = values["max_speed"]
    omega = rpm_to_rad(n_max)
    findings = []
    rim, note = _size(values, mat.density, omega, where, name)
    if note is not None:
        findings.append(note)
    rotor = _rotor(values, rim)
    try:
        profile = half_section(rotor)
        mp = mass_properties(rotor, mat.density)
    except ParamError as exc:
        raise _refuse(where, exc) from None
    except GeometryError as exc:
        raise where.error("pocket" if rotor.pocket else "web_thickness", str(exc)) from None

    # stress, speed limit, balance, spin-up
    st = rotor_stress(rotor, mat, omega)
    at_holes = _hole_stresses(rotor, mat, omega)
    peak, peak_at = st.peak, st.where
    for what, hs in at_holes:
        if hs.peak > peak:
            peak, peak_at = hs.peak, what
    sf = mat.strength / peak
    # every stress here grows with ω² (Timoshenko; Kirsch is linear in the field)
    w_lim = (speed_limit(rotor, mat) if not at_holes else
             omega * math.sqrt(mat.strength / peak))
    n_lim = w_lim * 60.0 / (2.0 * math.pi)
    unb = permissible_unbalance(values["balance_grade"], omega, mp.mass)
    h = angular_momentum(mp.axial_inertia, omega)
    energy = kinetic_energy(mp.axial_inertia, omega)
    t_up = (spin_up_time(mp.axial_inertia, omega, values["motor_torque"])
            if values["motor_torque"] else None)
    strength = f"{mat.strength:g} MPa ({mat.strength_kind}, {mat.status_of('strength')})"
    if sf < 1.0:
        findings.append(Finding(ERROR, "rotor-overspeed",
                                f"max_speed {n_max:g} rpm is above the burst estimate: peak "
                                f"stress {peak:.3g} MPa at the {peak_at} exceeds {mat.name} "
                                f"{strength}; the speed limit is {n_lim:.0f} rpm",
                                name, STRESS_SOURCE, key="max_speed"))
    elif sf < values["min_safety_factor"]:
        findings.append(Finding(WARNING, "rotor-margin",
                                f"safety factor {sf:.2f} at {n_max:g} rpm is below "
                                f"{values['min_safety_factor']:g} (peak {peak:.3g} MPa at the "
                                f"{peak_at}, {mat.name} {strength}); at that factor the speed "
                                f"limit is {n_lim / math.sqrt(values['min_safety_factor']):.0f} "
                                f"rpm", name, STRESS_SOURCE, key="max_speed"))
    method = st.method + ("; the holes' concentration is estimated in the notes on the holes "
                          "and included in the peak" if at_holes else "")
    findings.append(Finding(INFO, "rotor-stress-method", method, name, STRESS_SOURCE,
                            key="max_speed"))
    for what, hs in at_holes:
        findings.append(Finding(
            INFO, "bolt-circle" if what == "bolt holes" else "rotor-stress-method",
            f"{what} on a {2 * hs.circle_radius:g} mm circle raise the stress at their edges: "
            f"disc stress there σ_θ {hs.sigma_theta:.3g} MPa, σ_r {hs.sigma_r:.3g} MPa, "
            f"concentration factor {hs.factor:.2f} (3σ_θ − σ_r, between 2 and 3) → "
            f"{hs.peak:.3g} MPa at {n_max:g} rpm, included in the peak stress and safety "
            "factor (an estimate: small holes far apart)", name, HOLE_SOURCE,
            key="bolt_circle" if what == "bolt holes" else "holes"))
    findings.append(Finding(INFO, "rotor-cautions", CAUTIONS.format(energy=energy), name,
                            "common practice", key="max_speed"))

    holes = ()
    if rotor.holes is not None:
        holes = (HoleCircle(rotor.holes.count, rotor.holes.diameter, rotor.holes.circle_radius),)
    if rotor.bolts is not None:
        holes += (HoleCircle(rotor.bolts.count, rotor.bolts.diameter, rotor.bolts.circle_radius),)
    shape = Revolved(profile, holes)
    sizes = {
        "outer_diameter": rotor.outer_diameter, "thickness": rotor.thickness,
        "bore": rotor.bore, "layout": values["layout"],
        "rim_width": None if rotor.is_plain else rotor.rim_width,
        "material": mat.name, "max_speed": n_max,
        "mass": mp.mass, "volume": mp.volume, "centroid_z": mp.centroid_z,
        "inertia_axial": mp.axial_inertia, "inertia_transverse": mp.transverse_inertia,
        "angular_momentum": h, "kinetic_energy": energy,
        "peak_stress": peak, "peak_stress_at": peak_at, "strength": mat.strength,
        "safety_factor": sf, "speed_limit": n_lim,
        "balance_grade": values["balance_grade"],
        "permissible_eccentricity": unb.specific * 1000.0,     # µm
        "permissible_unbalance": unb.unbalance,                # g·mm
        "spin_up_time": t_up, "motor_torque": values["motor_torque"],
    }
    for what, hs in at_holes:
        entry = {"circle_stress_theta": hs.sigma_theta, "circle_stress_r": hs.sigma_r,
                 "stress_factor": hs.factor, "hole_stress": hs.peak}
        if what == "bolt holes":
            b = rotor.bolts
            sizes["bolt_circle"] = {"diameter": 2 * b.circle_radius, "count": b.count,
                                    "hole": b.diameter, **entry}
        else:
            sizes["lightening_hole_stress"] = entry
    # the build's own mass report reads values["material"]: give it this rotor's density
    values["material"] = Material(mat.name, mat.strength, mat.density / 1000.0,
                                  f"rotor material ({mat.strength_kind} stress)")
    chord = values["chord_tolerance"]
    return Part(name=name, kind=KIND, role=ROLE, values=values, shape=shape, sizes=sizes,
                findings=tuple(findings), formulas=FORMULAS, outline=None, section=None,
                slice_checks=(_mass_check(name, rotor, mp, mat.density, chord),)
                + ((_bolt_check(name, rotor, chord),) if rotor.bolts is not None else ()),
                chord_tol=chord,
                data={"rotor": rotor, "mass_properties": mp, "stress": st, "material": mat,
                      "unbalance": unb, "profile": profile})


def mass_error_bound(rotor: Rotor, chord: float) -> dict:
    """Relative bounds on how far triangles drawn at ``chord`` (mm) may depart from the exact
    rotor: {"volume", "inertia_axial", "inertia_transverse"} (fractions of the exact values).

    The body's circles share the side count chosen for the outer radius, so its volume and
    polar moment (of the rotor without holes, V₁ and I₁) fall short by at most the relative
    bounds ε_V, ε_J of :func:`gen.validate.rotor_checks.polygon_error_bound` at that radius;
    the hole cylinders remove too little by at most their own ε_V,h, ε_J,h of what they remove
    (V₁ − V, I₁ − I). The transverse inertia about the centre of mass, I_o − m z̄², adds the
    error of m z̄² = ρ (∫ z dV)²/V (at most three volume-like errors) to that of I_o.
    """
    ev, ej = polygon_error_bound(rotor.outer_radius, chord)
    full = mass_properties(dataclasses.replace(rotor, holes=None, bolts=None), 1000.0)
    net = mass_properties(rotor, 1000.0)
    dv, di = ev * full.volume, ej * full.axial_inertia
    for h in (rotor.holes, rotor.bolts):
        if h is None:
            continue
        hv, hj = polygon_error_bound(h.diameter / 2.0, chord)
        one = mass_properties(dataclasses.replace(
            rotor, holes=h if h is rotor.holes else None,
            bolts=h if h is rotor.bolts else None), 1000.0)
        dv += hv * (full.volume - one.volume)
        di += max(hv, hj) * (full.axial_inertia - one.axial_inertia)
    rel_v, rel_i = dv / net.volume, di / net.axial_inertia
    mz2 = net.mass * net.centroid_z ** 2 * 1e-6                  # kg·m²
    rel_t = (max(rel_v, rel_i) * (net.transverse_inertia + mz2) + 3.0 * rel_v * mz2) / \
        net.transverse_inertia
    return {"volume": rel_v, "inertia_axial": rel_i, "inertia_transverse": rel_t}


def _hole_stresses(rotor: Rotor, mat, omega: float) -> list:
    """[(what, HoleStress)] for the bolt circle and the lightening holes (MPa)."""
    out = []
    if rotor.bolts is not None:
        out.append(("bolt holes", hole_stress(rotor, mat, omega, rotor.bolts.circle_radius)))
    if rotor.holes is not None:
        out.append(("lightening holes", hole_stress(rotor, mat, omega,
                                                    rotor.holes.circle_radius)))
    return out


def measure_bolts(loops, rotor: Rotor, tol: float) -> dict:
    """Bolt holes found in one slice (closed loops, mm): loops whose area centroid lies on the
    bolt circle and whose farthest corner gives the hole diameter, each within ``tol``."""
    b = rotor.bolts
    found = []
    for p in loops:
        p = np.asarray(p, dtype=float)[:, :2]
        _, c = area_centroid(p)
        if c is None:
            continue
        d = 2.0 * float(np.max(np.hypot(*(p - c).T)))
        if abs(float(np.hypot(*c)) - b.circle_radius) <= tol and abs(d - b.diameter) <= 2 * tol:
            found.append((c, d))
    radii = [float(np.hypot(*c)) for c, _ in found]
    return {"count": len(found), "circle": 2.0 * float(np.mean(radii)) if radii else 0.0,
            "holes": [d for _, d in found]}


def _bolt_check(name, rotor, chord):
    """A slice check: the bolt holes counted and their circle measured mid-slab."""
    z0, z1 = bolt_slab(rotor)
    tol = chord + TOL.slice_extra

    def check(slicer):
        got = measure_bolts(slicer(0.5 * (z0 + z1)), rotor, tol)
        b = rotor.bolts
        if got["count"] == b.count and abs(got["circle"] - 2 * b.circle_radius) <= tol:
            return []
        return [Finding(ERROR, "bolt-measure", f"triangles: {got['count']} bolt holes on a "
                        f"{got['circle']:.3f} mm circle, expected {b.count} of {b.diameter:g} mm "
                        f"on {2 * b.circle_radius:g} mm", name, "bolt circle layout",
                        key="bolt_circle")]

    return check


def _mass_check(name, rotor, mp, density, chord):
    """A slice check: the triangles' mass properties against the section's (see module)."""
    z_breaks = cell_grid(rotor).z

    def check(slicer):
        got = slice_mass(slicer, z_breaks, density)
        bound = mass_error_bound(rotor, chord)
        rel = TOL.rotor_slice_rel
        out = []
        checks = (("volume", got.volume, mp.volume, bound["volume"] + rel, "mm³"),
                  ("mass", got.mass, mp.mass, bound["volume"] + rel, "kg"),
                  ("inertia_axial", got.axial_inertia, mp.axial_inertia,
                   bound["inertia_axial"] + rel, "kg·m²"),
                  ("inertia_transverse", got.transverse_inertia, mp.transverse_inertia,
                   bound["inertia_transverse"] + rel, "kg·m²"))
        for what, g, want, tol, unit in checks:
            if abs(g - want) > tol * abs(want):
                out.append(Finding(ERROR, "mass-mismatch",
                                   f"triangles: {what} {g:.6g} {unit}, section {want:.6g} {unit} "
                                   f"(differ by {abs(g - want) / abs(want):.2e}, allowed "
                                   f"{tol:.2e} at chord tolerance {chord:g} mm)", name,
                                   "Pappus–Guldinus; inscribed-polygon bound"))
        return out

    return check
