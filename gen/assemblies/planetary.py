"""Assembly ``planetary``: a sun, N planets on a carrier and an internal ring, spur, helical or
herringbone, expanded into printable parts placed in mesh.

    assemblies:
      turntable_stage:
        kind: planetary
        module: 1.5
        sun_teeth: 12
        planet_teeth: 18
        ring_teeth: 48
        planets: 3
        face_width: 12
        held: ring          # sun | ring | carrier
        input: sun          # the output is the remaining member

Parts: ``<name>_sun``, ``<name>_planet_1`` … ``_planet_N`` (one part per planet, so the plate
holds N copies; they share their geometry and are turned only by their poses), ``<name>_ring``
and ``<name>_carrier`` (a plate with the planet pin holes and the output bore, below the gears).

Checks (numbers in ``check --json`` under the assembly's ``kinematics`` and ``sizes``):

* ratio i = ω_in/ω_out by Willis' equation (ω_s − ω_c)/(ω_r − ω_c) = −z_r/z_s for the held,
  input and output members (:mod:`gen.geometry.planetary`);
* coaxial: the sun–planet and planet–ring zero-backlash working distances (ISO 21771 with the
  shifts, helical transverse values) agree within :data:`COAXIAL_TOL`; the carrier fixes the
  planets at the sun–planet distance and both meshes are checked there;
* equal spacing needs (z_s + z_r)/N whole, else the planets go to the nearest angles that
  assemble (2π n/(z_s + z_r)) and the set is reported;
* neighbours: planet tip circles clear by ``neighbour_margin`` (default 0.5 m_n, common
  practice, from memory);
* phasing: each planet is turned so that it meshes with sun and ring at once; the phases go
  into :attr:`Assembly.poses` (4×4, one per part) so the assembly STEP is placed by
  :mod:`gen.build.assembly`;
* the sun–planet mesh (external) and the planet–ring mesh (internal) as declared meshes are:
  formula numbers, interferences, swept outlines;
* with a ``torque`` on the input: torque per planet with the load-sharing factor K_γ and the
  Lewis estimate of sun, planet and ring teeth at their meshes.

Helix hands: a sun of hand H meshes externally with planets of the opposite hand; the planets
mesh *internally* with the ring, which therefore has the planets' hand (same hand in an
internal mesh: the tooth traces at the contact point run the same way on both members). So the
sun is opposite in hand to the planets and the ring, for helical and herringbone sets alike.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from gen.assemblies import Assembly
from gen.errors import GeometryError, ParamError
from gen.findings import ERROR, INFO, WARNING, Finding
from gen.geometry.body import Body, Prism
from gen.geometry.planetary import (LOAD_SHARING, MEMBERS, WILLIS, member_speeds, mesh_loads,
                                    mesh_residuals, nearest_planet_count, phasing,
                                    planet_spacing, planet_speed, tip_gaps, willis_ratio)
from gen.geometry.section import Section, circle
from gen.kinds import common_keys as K
from gen.kinds.base import Part, Role
from gen.params.project import display_path
from gen.params.schema import REQUIRED, Key, check_mapping

KIND = "planetary"
#: largest difference (mm) of the two working distances still called coaxial
COAXIAL_TOL = 1e-3
#: largest phase residual (pitches) of a placed planet
PHASE_TOL = 1e-9

KEYS = (
    Key("kind", "enum", REQUIRED, choices=(KIND,)),
    K.MODULE,
    Key("sun_teeth", "int", REQUIRED, lo=6, hi=1000),
    Key("planet_teeth", "int", REQUIRED, lo=6, hi=1000),
    Key("ring_teeth", "int", REQUIRED, lo=12, hi=3000),
    Key("planets", "int", 3, lo=1, hi=32),
    Key("face_width", "float", REQUIRED, lo=0, hi=1000, lo_open=True, unit="mm"),
    Key("held", "enum", "ring", choices=MEMBERS, doc="member held still"),
    Key("input", "enum", "sun", choices=MEMBERS, doc="driven member; the third is the output"),
    K.PRESSURE_ANGLE, K.PROFILE,
    Key("sun_shift", "float", 0.0, lo=-1.0, hi=1.5, doc="profile shift coefficient of the sun"),
    Key("planet_shift", "float", 0.0, lo=-1.0, hi=1.5, doc="profile shift of the planets"),
    Key("ring_shift", "float", 0.0, lo=-1.0, hi=1.5,
        doc="ring profile shift, > 0 away from the axis (ISO 21771 signed form: −x)"),
    Key("ring_tip_shortening", "float", 0.2, lo=0, hi=1,
        doc="ring tip shortening k (clears the planets' roots)"),
    Key("helix_angle", "angle", 0.0, lo=0, hi=45, hi_open=True, unit="deg",
        doc="helix angle β of every member (0: spur)"),
    Key("hand", "enum", "right", choices=("right", "left"),
        doc="hand of the sun; planets and ring take the other hand"),
    Key("herringbone", "bool", False, doc="mirrored helical halves on every member"),
    K.BACKLASH_ALLOWANCE,
    Key("rim_thickness", "float", None, lo=0, hi=1000, lo_open=True, unit="mm",
        doc="ring rim below its root circle (default 1.2 tooth depths)"),
    Key("sun_bore", "float", 5.0, lo=0, hi=1000, unit="mm", doc="sun bore (0: none)"),
    Key("pin_diameter", "float", 3.0, lo=0, hi=1000, lo_open=True, unit="mm",
        doc="planet pin: planet bores and carrier holes (the fit's hole allowance added)"),
    Key("carrier_bore", "float", 5.0, lo=0, hi=1000, unit="mm", doc="carrier output bore"),
    Key("carrier_thickness", "float", 4.0, lo=0, hi=1000, lo_open=True, unit="mm"),
    Key("carrier_gap", "float", 0.5, lo=0, hi=100, unit="mm",
        doc="axial gap between the gears' bottom faces and the carrier"),
    Key("neighbour_margin", "float", None, lo=0, hi=100, unit="mm",
        doc="least gap between planet tip circles (default 0.5 m_n)"),
    Key("load_sharing", "float", None, lo=1, hi=5,
        doc="load-sharing factor K_γ (default by planet count, common practice)"),
    Key("torque", "float", None, lo=0, hi=1e6, lo_open=True, unit="N·m",
        doc="torque on the input member (Lewis estimate per mesh)"),
    Key("speed", "float", 0.0, lo=0, hi=1e6, unit="rpm", doc="speed of the input member"),
    Key("print_clearance", "float", None, lo=0, hi=5, unit="mm",
        doc="clearance each printed flank needs from its mate"),
    K.MATERIAL, K.SAFETY_FACTOR, K.FIT, K.CHORD,
)

EXAMPLE = {"module": 1.5, "sun_teeth": 12, "planet_teeth": 18, "ring_teeth": 48, "planets": 3,
           "face_width": 12, "sun_shift": 0.3, "ring_shift": 0.3,
           "backlash_allowance": 0.15}

#: keys of the member kinds named in the assembly's terms, for error messages
_KEY_OF = {"sun": {"teeth": "sun_teeth", "profile_shift": "sun_shift", "bore": "sun_bore"},
           "planet": {"teeth": "planet_teeth", "profile_shift": "planet_shift",
                      "bore": "pin_diameter"},
           "ring": {"teeth": "ring_teeth", "profile_shift": "ring_shift",
                    "tip_shortening": "ring_tip_shortening"}}


def build(entry, where) -> tuple[Assembly, dict]:
    """(Assembly, {part name: Part}) from a raw ``assemblies`` entry; raises ParamError."""
    v = check_mapping(entry.values, KEYS, where)
    if v["held"] == v["input"]:
        raise where.error("input", "the input must differ from the held member", v["input"])
    if v["herringbone"] and v["helix_angle"] <= 0:
        raise where.error("herringbone", "a herringbone set needs a helix angle > 0", True)
    zs, zp, zr, n = v["sun_teeth"], v["planet_teeth"], v["ring_teeth"], v["planets"]
    if zr <= zp + zs // 2:
        raise where.error("ring_teeth", f"a ring of {zr} teeth cannot hold a {zs}-tooth sun and "
                          f"{zp}-tooth planets (about z_s + 2 z_p = {zs + 2 * zp} is needed)", zr)
    fit = _fit(v, where)
    name = entry.label
    members = _members(name, v, fit, where)
    sun, planet, ring = members["sun"], members["planet"], members["ring"]
    found = []
    # --- working distances, coaxial -----------------------------------------------------
    from gen.geometry.internal_pair import mesh_internal
    from gen.geometry.pair import mesh_pair

    try:
        a_sp = mesh_pair(sun.mate.sizes, planet.mate.sizes).zero_backlash_center_distance
        a_pr = mesh_internal(planet.mate.sizes, ring.mate.sizes,
                             check_radial=False).zero_backlash_center_distance
    except GeometryError as exc:
        raise where.error("ring_teeth", str(exc), zr) from None
    C = a_sp
    if abs(a_sp - a_pr) > COAXIAL_TOL:
        found.append(_f(ERROR, "planetary-not-coaxial", f"sun–planet distance {a_sp:.4f} mm ≠ "
                        f"planet–ring distance {a_pr:.4f} mm (standard ring: {zs + 2 * zp} "
                        f"teeth; or shift the ring or planets to close {a_sp - a_pr:+.4f} mm)",
                        name, "ISO 21771 working centre distance", "ring_teeth"))
    # --- spacing, neighbours, phasing ---------------------------------------------------
    sp = planet_spacing(zs, zr, n)
    margin = 0.5 * v["module"] if v["neighbour_margin"] is None else v["neighbour_margin"]
    da_p = planet.mate.sizes.da
    gaps = tip_gaps(C, da_p, sp.angles)
    if not sp.equal:
        near = nearest_planet_count(zs, zr, n, C, da_p, margin)
        degs = ", ".join(f"{math.degrees(a):.2f}°" for a in sp.angles)
        found.append(_f(WARNING, "planet-spacing-unequal",
                        f"(z_s + z_r)/N = {sp.quotient:.3f} is not whole: the planets are placed "
                        f"at {degs} (the nearest angles that assemble); planet counts that "
                        f"assemble equally spaced: {near if near else 'none that clears'}",
                        name, "assembly condition (z_s + z_r)/N whole", "planets"))
    if gaps and min(gaps) <= margin:
        found.append(_f(ERROR, "planets-collide", f"planet tip circles {min(gaps):.3f} mm apart, "
                        f"need more than {margin:.3f} mm", name,
                        "neighbour condition 2 a sin(Δψ/2) − d_a > margin", "planets"))
    ph = phasing(zs, zp, zr, sp.angles)
    worst = max(max(abs(e) for e in ph.sun_residual), max(abs(e) for e in ph.ring_residual))
    if worst > PHASE_TOL:
        found.append(_f(ERROR, "planetary-phase", f"a planet meshes {worst:.3f} pitch out of "
                        "phase", name, "tooth phase of a planetary set", "planets"))
    # --- the two meshes -----------------------------------------------------------------
    sun_mesh, ring_mesh, mesh_found = _meshes(name, sun, planet, ring, C, v)
    found += mesh_found
    # --- kinematics, loads --------------------------------------------------------------
    out_member = next(m for m in MEMBERS if m not in (v["held"], v["input"]))
    ratio = willis_ratio(zs, zr, v["held"], v["input"], out_member)
    speeds = member_speeds(zs, zr, v["held"], v["input"], 1.0)
    found.append(_f(INFO, "planetary-ratio", f"{v['held']} held, {v['input']} in, {out_member} "
                    f"out: ratio {ratio:.4f} ({WILLIS}); planets on {C:.3f} mm at "
                    + ", ".join(f"{math.degrees(a):.2f}°" for a in sp.angles), name, WILLIS))
    loads = None
    if v["torque"] is not None:
        loads, load_found = _loads(name, v, members, speeds, C, a_pr)
        found += load_found
    # --- parts and poses ----------------------------------------------------------------
    carrier = _carrier(f"{name}_carrier", v, fit, C, sp.angles, where)
    models = {f"{name}_sun": sun, f"{name}_ring": ring, f"{name}_carrier": carrier}
    roles = {"sun": f"{name}_sun", "ring": f"{name}_ring", "carrier": f"{name}_carrier"}
    for k in range(n):
        pname = f"{name}_planet_{k + 1}"
        # copies of one geometry: the first carries the planet's findings
        models[pname] = planet.with_(name=pname, findings=planet.findings if k == 0 else ())
        roles[f"planet_{k + 1}"] = pname
    models = {k: m.with_(assembly=name) for k, m in models.items()}
    asm = Assembly(name, KIND, v, roles, file=entry.file)
    asm.kinematics = {
        "ratio": ratio, "held": v["held"], "input": v["input"], "output": out_member,
        "willis": WILLIS,
        "speeds_per_input_turn": {m: speeds[m] for m in MEMBERS},
        "planet_speed_per_input_turn": planet_speed(zs, zp, speeds["sun"], speeds["carrier"]),
    }
    asm.sizes = {
        "sun_planet_center_distance": a_sp, "planet_ring_center_distance": a_pr,
        "planet_center_distance": C, "coaxial": abs(a_sp - a_pr) <= COAXIAL_TOL,
        "equal_spacing": sp.equal, "planet_angles": [math.degrees(a) for a in sp.angles],
        "planet_tip_gaps": list(gaps), "neighbour_margin": margin,
        "planet_phases": [math.degrees(p) for p in ph.planets], "sun_phase": math.degrees(ph.sun),
        "sun_mesh": sun_mesh, "ring_mesh": ring_mesh,
        "ring_outside_diameter": ring.sizes["rim_outside_diameter"],
        "carrier_diameter": carrier.sizes["outside_diameter"],
    }
    if loads is not None:
        asm.sizes["loads"] = loads
    asm.detail = {"phasing": ph, "spacing": sp, "center_distance": C}
    asm.poses = poses(asm, 0.0)
    rel = display_path(entry.file)
    asm.findings = [replace(f, where=f.where or f"{rel}:{entry.line(f.key or None)}",
                            scope="assembly") for f in found]
    return asm, models


def poses(asm: Assembly, input_angle: float) -> dict:
    """4×4 poses (mm) of every part after the input member turns by ``input_angle`` (rad)
    from the assembled position, the held member still.

    Member turns from Willis' equation; planet k sits at carrier angle ψ_k + θ_c and turns by
    its assembly phase plus θ_c − (θ_s − θ_c) z_s/z_p about its own axis; the carrier plate
    lies ``carrier_gap`` below the gears.
    """
    v, d = asm.values, asm.detail
    zs, zp, zr = v["sun_teeth"], v["planet_teeth"], v["ring_teeth"]
    turn = member_speeds(zs, zr, v["held"], v["input"], input_angle)
    th_s, th_r, th_c = turn["sun"], turn["ring"], turn["carrier"]
    th_p = planet_speed(zs, zp, th_s, th_c)
    ph, C = d["phasing"], d["center_distance"]
    out = {asm.parts["sun"]: _pose(ph.sun + th_s),
           asm.parts["ring"]: _pose(ph.ring + th_r),
           asm.parts["carrier"]: _pose(th_c, z=-(v["carrier_gap"] + v["carrier_thickness"]))}
    for k, (psi, phi) in enumerate(zip(ph.positions, ph.planets)):
        a = psi + th_c
        out[asm.parts[f"planet_{k + 1}"]] = _pose(phi + th_p, C * math.cos(a), C * math.sin(a))
    return out


def phase_residuals(asm: Assembly, input_angle: float) -> list:
    """(sun-mesh, ring-mesh) residuals in pitches of every planet after turning the input."""
    v, d = asm.values, asm.detail
    zs, zp, zr = v["sun_teeth"], v["planet_teeth"], v["ring_teeth"]
    turn = member_speeds(zs, zr, v["held"], v["input"], input_angle)
    th_p = planet_speed(zs, zp, turn["sun"], turn["carrier"])
    ph = d["phasing"]
    return [mesh_residuals(zs, zp, zr, ph.sun + turn["sun"], ph.ring + turn["ring"],
                           psi + turn["carrier"], phi + th_p)
            for psi, phi in zip(ph.positions, ph.planets)]


def _pose(angle: float, x: float = 0.0, y: float = 0.0, z: float = 0.0) -> np.ndarray:
    c, s = math.cos(angle), math.sin(angle)
    return np.array([[c, -s, 0.0, x], [s, c, 0.0, y], [0.0, 0.0, 1.0, z], [0.0, 0.0, 0.0, 1.0]])


def _f(sev, code, msg, subject, source, key=""):
    return Finding(sev, code, msg, subject, source, key=key, scope="assembly")


def _fit(v, where):
    if v.get("fit") is None:
        return K.NO_FIT
    from gen.params.fits import collect_fits

    fits = collect_fits([])
    if v["fit"] not in fits:
        raise where.error("fit", f"unknown fit profile '{v['fit']}' (an assembly takes a "
                          "built-in profile)", v["fit"], allowed=", ".join(sorted(fits)))
    return fits[v["fit"]]


def _members(name, v, fit, where) -> dict:
    """Sun, one planet and the ring as parts of their kinds, in the assembly's terms."""
    from gen.kinds import cylgear, ring_gear
    from gen.kinds.helical import opposite

    beta, chevron = v["helix_angle"], v["herringbone"]
    hand_s = v["hand"]
    hand_p = opposite(hand_s)
    common = {"module": v["module"], "pressure_angle": math.degrees(v["pressure_angle"]),
              "profile": v["profile"], "face_width": v["face_width"],
              "backlash_allowance": v["backlash_allowance"], "material": v["material"],
              "safety_factor": v["safety_factor"], "chord_tolerance": v["chord_tolerance"]}
    raw = {
        "sun": dict(common, teeth=v["sun_teeth"], profile_shift=v["sun_shift"],
                    **({"bore": v["sun_bore"]} if v["sun_bore"] > 0 else {})),
        "planet": dict(common, teeth=v["planet_teeth"], profile_shift=v["planet_shift"],
                       bore=v["pin_diameter"]),
        "ring": dict(common, teeth=v["ring_teeth"], profile_shift=v["ring_shift"],
                     tip_shortening=v["ring_tip_shortening"],
                     helix_angle=math.degrees(beta), hand=hand_p, herringbone=chevron,
                     **({"rim_thickness": v["rim_thickness"]} if v["rim_thickness"] else {})),
    }
    out = {}
    for member, values in raw.items():
        keys = ring_gear.KEYS if member == "ring" else cylgear.GEAR_KEYS
        try:
            checked = check_mapping(values, keys, where)
            checked["fit"] = fit if fit["name"] != "none" else None
            pname = f"{name}_{member}"
            if member == "ring":
                part = ring_gear.make_ring(pname, checked, where)
            else:
                hand = hand_s if member == "sun" else hand_p
                kind = ("herringbone_gear" if chevron else "helical_gear" if beta
                        else "spur_gear")
                part = cylgear.make_gear(pname, checked, where, kind=kind, beta=beta,
                                         hand=hand if beta else None, chevron=chevron)
        except ParamError as exc:
            key = _KEY_OF[member].get(exc.key, exc.key)
            raise where.error(key, f"{member}: {exc.detail}", v.get(key)) from None
        out[member] = part
    return out


def _meshes(name, sun, planet, ring, C, v):
    """Sun–planet and planet–ring meshes at the carrier's distance C: (numbers, numbers,
    findings)."""
    from gen.geometry.internal_pair import mesh_internal
    from gen.geometry.pair import mesh_pair
    from gen.validate.internal_checks import internal_numbers, internal_pair_findings
    from gen.validate.internal_sweep import sweep_internal
    from gen.validate.pair_checks import pair_findings
    from gen.validate.sweep import sweep_pair

    out = []
    b = v["face_width"]
    label_s, label_r = f"{name} sun+planet", f"{name} planet+ring"
    try:
        pr = mesh_pair(sun.mate.sizes, planet.mate.sizes, C, face_width=b,
                       form_radii=(sun.mate.flank.r_junction, planet.mate.flank.r_junction))
        sw = sweep_pair(sun.outline, planet.outline, pr)
        out += pair_findings(pr, sw, subject=label_s, print_clearance=v["print_clearance"])
        sun_numbers = {"center_distance": C, "working_pressure_angle": pr.working_pressure_angle,
                       "contact_ratio": pr.contact_ratio, "backlash_normal": pr.backlash_normal,
                       "tip_clearance": pr.tip_clearance, "overlap_area": sw.overlap_area,
                       "min_clearance": min(sw.min_clearance_drive, sw.min_clearance_coast)}
    except GeometryError as exc:
        out.append(_f(ERROR, "no-mesh", f"sun and planet: {exc}", label_s, ""))
        sun_numbers = {}
    try:
        pi = mesh_internal(planet.mate.sizes, ring.mate.sizes, C, face_width=b,
                           pinion_form_radius=planet.mate.flank.r_junction,
                           ring_involute_end=ring.mate.flank.r_involute[1])
        si = sweep_internal(planet.outline, ring.outline, pi)
        out += internal_pair_findings(pi, si, subject=label_r,
                                      print_clearance=v["print_clearance"])
        ring_numbers = internal_numbers(pi, si)
    except GeometryError as exc:
        out.append(_f(ERROR, "no-mesh", f"planet and ring: {exc}", label_r, ""))
        ring_numbers = {}
    return sun_numbers, ring_numbers, [replace(f, scope="assembly") for f in out]


def _loads(name, v, members, speeds, C, a_pr):
    """Torque per planet (K_γ) and the Lewis estimate of each member at its mesh."""
    from gen.validate.strength import strength_findings

    zs, zp, zr, n = v["sun_teeth"], v["planet_teeth"], v["ring_teeth"], v["planets"]
    k = zr / zs
    t_in = v["torque"]
    t_sun = {"sun": t_in, "ring": t_in / k, "carrier": t_in / (1.0 + k)}[v["input"]]
    ml = mesh_loads(zs, zp, zr, n, t_sun, C, a_pr, v["load_sharing"])
    rpm_in = v["speed"]
    rel = {m: abs(speeds[m] - speeds["carrier"]) * rpm_in for m in ("sun", "ring")}
    rel["planet"] = abs(planet_speed(zs, zp, speeds["sun"], speeds["carrier"])
                        - speeds["carrier"]) * rpm_in
    found = [_f(INFO, "planet-load", f"sun torque {abs(t_sun):.3f} N·m shared by {n} planets "
                f"with K_γ {ml.load_sharing:g}: {ml.planet_share:.3f} N·m on the most loaded "
                f"planet; tangential force {ml.sun_mesh_force:.1f} N at the sun mesh, "
                f"{ml.ring_mesh_force:.1f} N at the ring mesh", name,
                "planetary torque split T_s : T_r : T_c = 1 : k : −(1+k) (Willis)")]
    # torques each tooth set carries at one mesh, referred to its own reference circle
    loads = {"sun": ml.planet_share,
             "planet": ml.sun_mesh_force * members["planet"].mate.sizes.rp / 1000.0,
             "ring": ml.ring_mesh_force * members["ring"].mate.sizes.rp / 1000.0}
    for m, torque in loads.items():
        part = members[m]
        found += [replace(f, message=f"{m}: {f.message}", scope="assembly") for f in
                  strength_findings(part.rating()["loaded"], v["material"], torque=torque,
                                    rpm=rel[m], safety_factor=v["safety_factor"],
                                    subject=name)]
    numbers = {"sun_torque": abs(t_sun), "load_sharing": ml.load_sharing,
               "planet_share": ml.planet_share, "sun_mesh_force": ml.sun_mesh_force,
               "ring_mesh_force": ml.ring_mesh_force,
               "load_sharing_default": LOAD_SHARING.get(n, 1.5)}
    return numbers, found


def _carrier(pname, v, fit, C, angles, where) -> Part:
    """The carrier plate: pin holes at the planet angles, output bore, outside diameter
    2 (C + pin radius + wall), wall = max(pin radius, 2 mm)."""
    pin = v["pin_diameter"] + fit["hole_allowance"]
    wall = max(v["pin_diameter"] / 2.0, 2.0)
    R = C + pin / 2.0 + wall
    bore = v["carrier_bore"]
    holes = [circle(pin / 2.0, (C * math.cos(a), C * math.sin(a))) for a in angles]
    if bore > 0:
        bore_d = bore + fit["hole_allowance"]
        if bore_d / 2.0 + wall > C - pin / 2.0:
            raise where.error("carrier_bore", f"carrier bore {bore:g} mm reaches the planet pin "
                              f"holes (pin circle {2 * C:.3f} mm)", bore)
        holes.append(circle(bore_d / 2.0))
    if len(angles) > 1 and min(2 * C * math.sin(((angles[(i + 1) % len(angles)] - a)
                                                 % (2 * math.pi)) / 2)
                               for i, a in enumerate(angles)) < pin + 1.0:
        raise where.error("pin_diameter", f"planet pin holes of {pin:g} mm overlap", pin)
    t = v["carrier_thickness"]
    section = Section(circle(R), tuple(holes))
    body = Body((Prism(section, 0.0, t),))
    sizes = {"outside_diameter": 2 * R, "thickness": t, "pin_circle_diameter": 2 * C,
             "pin_hole_diameter": pin, "output_bore": bore,
             "pin_angles": [math.degrees(a) for a in angles]}
    return Part(name=pname, kind="planet_carrier", role=Role.PLAIN,
                values={"material": v["material"], "carrier_thickness": t, "pin": pin,
                        "C": C, "angles": list(angles), "bore": bore, "R": R},
                shape=body, sizes=sizes, section=section, chord_tol=v["chord_tolerance"])
