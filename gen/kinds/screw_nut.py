"""Part kind ``screw_nut``: a printed nut for a ``lead_screw``, with a flange and bolt holes.

Frame: axis on Z, the flange's bottom face on z = 0, the barrel up to the nut length; groove
(start) 0 of the thread centred on +X at z = 0. The threaded hole is the basic nut profile
(ISO 2904 / ISO 68-1) with every face moved back by the clearance c, measured normal to the
face (:func:`gen.geometry.screw.nut_thread`): from the ``clearance`` key, else the fit
profile's flank clearance, else 0.1 mm (common practice for FDM, the fdm-0.4 fit's figure).
A clearance that makes the nut's thread teeth come to a point is refused.

Body: the barrel is a twisted prism (circle outside, the helicoidal hole inside, twist 2π/L);
the flange is a straight prism round it with a plain hole wider than the thread root and the
mounting holes on a bolt circle, so the two overlap in a ring and the union keeps the thread
over the whole length.

Anti-backlash (``anti_backlash`` key): the same nut slit across the axis at mid-length,
leaving a flexure bridge, with a preload screw parallel to the axis opposite the bridge
(:mod:`gen.geometry.screw_split` says which design, why, and the take-up numbers). The
barrel's default diameter grows to hold the screw hole; the slit, bridge and holes are
re-measured on the exported triangles.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.findings import ERROR, INFO, Finding
from gen.geometry.body import Body, Prism
from gen.geometry.screw import nut_section, nut_thread, screw_twist
from gen.geometry.screw_split import PRELOAD_SCREWS, least_outer_radius
from gen.geometry.section import Section, circle
from gen.kinds import common_keys as K
from gen.kinds.base import Formula, Part, Role
from gen.kinds.lead_screw import lead_between
from gen.kinds.thread_common import FORMULAS, THREAD_KEYS, sizes_of, thread_manifest
from gen.params.schema import Key
from gen.kinds.split_nut import (SPLIT_FORMULAS, make_split, split_note, split_sizes,
                                  split_slice_check)
from gen.tolerances import LIMITS, TOL
from gen.validate import measure

KIND = "screw_nut"
ROLE = Role.NUT

#: default printing clearance of the nut thread, normal to its faces (mm; common practice,
#: the flank clearance of the fdm-0.4 fit profile)
DEFAULT_CLEARANCE = 0.1
#: least wall between the thread root and the barrel outside (mm; common practice: two
#: 0.4 mm perimeters)
MIN_WALL = 0.8

KEYS = THREAD_KEYS + (
    Key("clearance", "float", None, lo=0, hi=2, unit="mm",
        doc="thread clearance normal to every face (default: the fit's flank clearance, "
            f"else {DEFAULT_CLEARANCE:g})"),
    Key("outer_diameter", "float", None, lo=0, hi=2000, lo_open=True, unit="mm",
        doc="barrel diameter (default: 1.6 d, at least the thread root + 6 mm)"),
    Key("flange_diameter", "float", None, lo=0, hi=2000, unit="mm",
        doc="0 for none (default: room for the bolt holes round the barrel)"),
    Key("flange_thickness", "float", 3.0, lo=0, hi=200, lo_open=True, unit="mm"),
    Key("holes", "int", 3, lo=0, hi=24, doc="mounting holes in the flange"),
    Key("hole_diameter", "float", 3.4, lo=0, hi=100, lo_open=True, unit="mm",
        doc="mounting hole diameter (3.4: M3 clearance, ISO 273 medium, from memory)"),
    Key("bolt_circle", "float", None, lo=0, hi=2000, lo_open=True, unit="mm",
        doc="diameter of the circle through the hole centres (default: mid-flange)"),
    Key("anti_backlash", "map", None, sub=(
        Key("slit", "float", 1.0, lo=0, hi=10, lo_open=True, unit="mm",
            doc="axial width of the cut across the nut, at mid-length"),
        Key("bridge", "angle", 90.0, lo=0, hi=360, lo_open=True, hi_open=True, unit="deg",
            doc="angular width of the uncut flexure bridge (on +X)"),
        Key("preload_screw", "enum", "M3", choices=tuple(PRELOAD_SCREWS),
            doc="screw parallel to the axis opposite the bridge: clearance hole above the "
                "slit, pilot hole below"),
        Key("screw_radius", "float", None, lo=0, hi=1000, lo_open=True, unit="mm",
            doc="radius of the preload screw's axis (default: mid-wall)"),
    ), doc="split the nut across the axis with a flexure bridge and a preload screw that "
           "closes the slit and takes up the axial float"),
    K.FIT, K.CHORD,
)

EXAMPLE = {"thread": "trapezoidal", "diameter": 8, "pitch": 2, "starts": 4, "length": 12,
           "flange_diameter": 28}

NUT_FORMULAS = FORMULAS + (
    Formula("nut_minor", "D1 + 2c", "basic nut profile (ISO 2904: D1 = d − P) moved back by c"),
    Formula("nut_root", "D4 + 2c", "basic nut profile (ISO 2904: D4 = d + 2 a_c) moved back by c"),
    Formula("axial_play", "2 c / cos(α/2)", "computed (gen.geometry.screw)"),
)


def _clearance(values) -> tuple[float, str, str]:
    """(clearance mm, the key it comes from, how it was chosen)."""
    if values.get("clearance") is not None:
        return values["clearance"], "clearance", "the clearance key"
    fit = K.fit_of(values)
    if fit["name"] != "none":
        return fit["flank_clearance"], "fit", f"fit profile '{fit['name']}'"
    return DEFAULT_CLEARANCE, "clearance", "default, common practice"


def measure_hole(poly: np.ndarray, nut) -> dict:
    """The nut's threaded hole measured on a polygon (mm, rad): its smallest and largest
    radii, the grooves counted on the pitch circle and their axial widths there."""
    s = nut.sizes
    r = measure.radii(poly)
    arcs = measure.material_arcs(poly, s.d2 / 2.0)
    return {"minor": 2.0 * float(r.min()), "root": 2.0 * float(r.max()), "grooves": len(arcs),
            "widths": arcs[:, 1] * s.lead / (2.0 * math.pi) if len(arcs) else np.zeros(0),
            "centres": (arcs[:, 0] + arcs[:, 1] / 2.0) if len(arcs) else np.zeros(0)}


def hole_findings(name, got, nut, tol, where) -> list:
    out = []
    s = nut.sizes

    def bad(msg):
        out.append(Finding(ERROR, "thread-measure", f"{where}: {msg}", name,
                           "basic nut profile moved back by the clearance"))

    if abs(got["minor"] - nut.minor_diameter) > 2 * tol:
        bad(f"nut minor diameter {got['minor']:.4f} mm, expected {nut.minor_diameter:.4f} mm")
    if abs(got["root"] - nut.root_diameter) > 2 * tol:
        bad(f"nut root diameter {got['root']:.4f} mm, expected {nut.root_diameter:.4f} mm")
    if got["grooves"] != s.starts:
        bad(f"{got['grooves']} thread grooves counted, expected {s.starts}")
    else:
        want = float(nut.groove_width(s.d2 / 2.0))
        if np.max(np.abs(got["widths"] - want)) > 2 * tol:
            bad(f"groove width on d2 {got['widths'].mean():.4f} mm, expected {want:.4f} mm")
    return out


def make(name, values, where):
    s = sizes_of(values, where)
    chord = values["chord_tolerance"]
    c, ckey, chow = _clearance(values)
    try:
        nut = nut_thread(s, c)
    except GeometryError as exc:
        raise where.error(ckey, str(exc), c) from None
    sizes, findings, _ = thread_manifest(s, values, where)
    r_root = nut.root_diameter / 2.0
    ab = values.get("anti_backlash")
    od = values.get("outer_diameter") or max(1.6 * s.d, nut.root_diameter + 6.0)
    if ab and not values.get("outer_diameter"):
        screw = PRELOAD_SCREWS[ab["preload_screw"]]
        od = max(od, 2.0 * least_outer_radius(r_root, screw, LIMITS.min_wall))
    R = od / 2.0
    if R - r_root < MIN_WALL:
        raise where.error("outer_diameter", f"a {od:g} mm barrel leaves "
                          f"{R - r_root:.2f} mm of wall over the thread root "
                          f"({nut.root_diameter:.3f} mm); at least {MIN_WALL:g} mm is needed",
                          od)
    twist = screw_twist(s, values["hand"])
    hole = nut_section(nut)
    length = values["length"]
    solids = [Prism(Section(circle(R), (hole,)), 0.0, length, twist=twist)]
    holes, hd, tf = values["holes"], values["hole_diameter"], values["flange_thickness"]
    fd = values.get("flange_diameter")
    if fd is None:
        fd = od + 2.0 * (1.6 * hd + 1.0) if holes else od + 6.0
    bc = None
    if fd:
        if fd <= od:
            raise where.error("flange_diameter", f"the flange ({fd:g} mm) must be wider than the "
                              f"barrel ({od:g} mm)", fd)
        if tf >= length:
            raise where.error("flange_thickness", f"the flange ({tf:g} mm) must be thinner than "
                              f"the nut is long ({length:g} mm)", tf)
        loops = [circle(0.5 * (r_root + R))]
        if holes:
            bc = values.get("bolt_circle") or 0.5 * (od + fd)
            rb, rh = bc / 2.0, hd / 2.0
            if rb - rh < R + 0.5 or rb + rh > fd / 2.0 - 0.8:
                raise where.error("bolt_circle", f"holes of {hd:g} mm on a {bc:g} mm circle do "
                                  f"not fit between the barrel ({od:g} mm, 0.5 mm clear) and the "
                                  f"flange rim ({fd:g} mm, 0.8 mm wall)", bc)
            if holes > 1 and 2.0 * rb * math.sin(math.pi / holes) < hd + 0.8:
                raise where.error("holes", f"{holes} holes of {hd:g} mm on a {bc:g} mm circle "
                                  "run into each other", holes)
            for k in range(holes):
                a = math.pi / holes + 2.0 * math.pi * k / holes
                loops.append(circle(rh, (rb * math.cos(a), rb * math.sin(a))))
        solids.append(Prism(Section(circle(fd / 2.0), tuple(loops)), 0.0, tf))
    elif holes:
        raise where.error("holes", "mounting holes need a flange (flange_diameter)", holes)
    split, cuts = None, ()
    if ab:
        split, cuts = make_split(values, ab, nut, r_root, R, tf if fd else 0.0, length, where)
    body = Body(tuple(solids), cuts=cuts)
    poly = hole.polygon(chord)
    findings += hole_findings(name, measure_hole(poly, nut), nut, chord + TOL.size, "section")
    engaged = length / s.pitch
    findings.append(Finding(INFO, "nut-fit", f"clearance {c:g} mm normal to every face "
                            f"({chow}): "
                            f"nut minor {nut.minor_diameter:.3f} mm, root "
                            f"{nut.root_diameter:.3f} mm, axial play {nut.axial_play:.3f} mm, "
                            f"radial engagement {nut.engagement:.3f} mm over {engaged:.1f} "
                            f"pitches; the thread closes at {nut.max_clearance:.3f} mm",
                            name, "computed (gen.geometry.screw)", key=ckey))
    sizes.update(clearance=c, nut_minor=nut.minor_diameter, nut_root=nut.root_diameter,
                 axial_play=nut.axial_play, engagement=nut.engagement,
                 max_clearance=nut.max_clearance, outer_diameter=od,
                 flange_diameter=fd or None, flange_thickness=tf if fd else None,
                 bolt_circle=bc, holes=holes if fd else 0)
    if split is not None:
        sizes["anti_backlash"] = split_sizes(split)
        findings.append(split_note(name, split))
    sign = 1.0 if values["hand"] == "right" else -1.0

    def slice_check(slicer):
        z0 = tf + 0.5 * (length - tf) if fd else 0.5 * length
        dz = min(0.45 * s.pitch, 0.45 * (length - z0))
        tol = chord + TOL.slice_extra

        def hole_poly(z):
            polys = slicer(z)
            return min(polys, key=lambda p: float(measure.radii(p).max()))

        ga, gb = measure_hole(hole_poly(z0), nut), measure_hole(hole_poly(z0 + dz), nut)
        out = hole_findings(name, ga, nut, tol, f"mesh slice z={z0:g}")
        if not out and len(gb["centres"]):
            lead = lead_between(ga["centres"], gb["centres"], dz, s.starts)
            turn = 2.0 * math.pi * dz / s.lead
            rel = 2.0 * tol / (s.d2 / 2.0) / turn
            if abs(sign * lead - s.lead) > rel * s.lead + 1e-9:
                out.append(Finding(ERROR, "thread-measure", f"mesh slices z={z0:g}/{z0 + dz:g}: "
                                   f"lead {lead:.4f} mm, expected {sign * s.lead:+.4f} mm",
                                   name, "L = n P"))
        return out

    checks = (slice_check,)
    if split is not None:
        checks += (split_slice_check(name, split, length, chord),)
    return Part(name=name, kind=KIND, role=ROLE, values=values, shape=body, sizes=sizes,
                findings=tuple(findings),
                formulas=NUT_FORMULAS + (SPLIT_FORMULAS if split is not None else ()),
                outline=poly, section=solids[0].section,
                slice_checks=checks, chord_tol=chord,
                data={"thread": s, "nut": nut, "twist": twist, "split": split})
