"""Part kind ``cable_drum``: a helically grooved drum that winds a cable, with flanges and hub.

Stacked along +Z from z = 0: hub (if any), lower flange, grooved band, upper flange. The
groove is a helicoid of lead p (one groove pitch per turn): the transverse section of
:func:`gen.geometry.drum.drum_section` carried by a twisted prism of twist 2π/p (+ right-hand).
Sizes (groove pitch, radius and depth from the cable diameter, turns for the travel plus dead
turns, drum-to-cable ratio against the cable's minimum) come from
:func:`gen.geometry.drum.drum_sizes`; a drum smaller than the cable allows is refused.

The anchor is a radial hole through the groove bottom at the start of the dead turns (next to
the lower flange), from the bore (or the axis) out: the cable end goes in there and is knotted
or crimped inside. Holding: the dead turns hold the load with the capstan (Euler–Eytelwein)
ratio e^(μ θ), θ = 2π × dead turns (from memory), at the stated cable-on-drum friction μ.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.findings import ERROR, INFO, WARNING, Finding
from gen.geometry.body import Body, Prism, RadialHole
from gen.geometry.drum import (MIN_RATIO, capstan_ratio, drum_section, drum_sizes, drum_twist,
                               joint_drive)
from gen.geometry.section import Section, circle
from gen.geometry.stack import fixed_loop
from gen.kinds import common_keys as K
from gen.kinds.base import Formula, Part, Role
from gen.kinds.cylgear import bore_of
from gen.kinds.timing_pulley import SET_SCREW_DRILL
from gen.params.schema import REQUIRED, Key
from gen.tolerances import TOL
from gen.validate import measure

KIND = "cable_drum"
ROLE = Role.PLAIN

KEYS = (
    Key("cable_diameter", "float", REQUIRED, lo=0.1, hi=50, unit="mm"),
    Key("drum_diameter", "float", REQUIRED, lo=1, hi=2000, unit="mm",
        doc="diameter at the groove bottom"),
    Key("travel", "float", REQUIRED, lo=0, hi=1e6, unit="mm", doc="cable paid out over the "
                                                                  "working range"),
    Key("cable", "enum", "polyester-braid", choices=tuple(MIN_RATIO),
        doc="cable construction: sets the least drum-to-cable diameter ratio"),
    Key("dead_turns", "float", 2.0, lo=0, hi=100,
        doc="turns that always stay on the drum (at least 2, common practice)"),
    Key("friction", "float", 0.2, lo=0, hi=2, lo_open=True,
        doc="cable-on-drum friction coefficient μ for the capstan holding ratio"),
    Key("hand", "enum", "right", choices=("right", "left"), doc="groove hand"),
    Key("groove_gap", "float", None, lo=0, hi=20, unit="mm",
        doc="gap between turns (default 0.1 × cable diameter)"),
    Key("groove_radius", "float", None, lo=0, hi=30, lo_open=True, unit="mm",
        doc="default 0.53 × cable diameter"),
    Key("groove_depth", "float", None, lo=0, hi=30, lo_open=True, unit="mm",
        doc="default 0.35 × cable diameter"),
    Key("flanges", "enum", "both", choices=("none", "one", "both")),
    Key("flange_height", "float", None, lo=0, hi=200, lo_open=True, unit="mm",
        doc="flange rim above the lands (default 2 × cable diameter, at least 1.5 mm)"),
    Key("flange_thickness", "float", 1.5, lo=0, hi=50, lo_open=True, unit="mm"),
    Key("anchor_hole", "float", None, lo=0, hi=50, unit="mm",
        doc="diameter of the anchor hole (0: none; default 1.5 × cable diameter, at least "
            "cable + 0.4 mm)"),
    K.BORE, K.HUB,
    Key("set_screw", "map", None, sub=(
        Key("size", "enum", "M3", choices=tuple(SET_SCREW_DRILL)),
        Key("count", "int", 1, lo=1, hi=2),
    ), doc="radial set screws through the hub (tap-drill holes)"),
    Key("torque", "float", None, lo=0, hi=1e5, lo_open=True, unit="N·m",
        doc="motor torque on the drum, for the cable tension"),
    Key("joint_diameter", "float", None, lo=0, hi=1e4, lo_open=True, unit="mm",
        doc="pitch diameter of the joint pulley the cable drives"),
    K.MATERIAL, K.CHORD,
)

EXAMPLE = {"cable_diameter": 1.0, "drum_diameter": 20, "travel": 150, "bore": 5,
           "hub": "{diameter: 14, length: 6}", "set_screw": "{size: M3}"}

FORMULAS = (
    Formula("pitch_diameter", "D_p = D + d_c", "computed (cable centre line on the groove bottom)"),
    Formula("groove_pitch", "p = d_c + gap, gap ≈ 0.1 d_c", "common practice"),
    Formula("active_turns", "s / (π D_p)", "computed"),
    Formula("holding_ratio", "e^(μ θ), θ = 2π × dead turns", "Euler–Eytelwein (capstan)"),
    Formula("diameter_ratio", "D_p / d_c ≥ minimum of the cable type", "common practice"),
)


def measure_drum(poly: np.ndarray, s) -> dict:
    """The drum measured on a transverse section (mm): groove-bottom and land diameters, the
    lands counted on a circle near mid-depth (material arcs, gaps under 0.1 rad merged: the
    land's flank runs nearly round the circle there, so a faceted slice may cross it more
    than once), the land's axial width at that circle from the material angle."""
    r = measure.radii(poly)
    # a little under mid-depth: the flank samples can fall exactly on mid-depth, where a
    # vertex on the circle hides the crossing
    rm = s.drum_diameter / 2.0 + 0.4713 * s.groove_depth
    arcs = measure.material_arcs(poly, rm)
    count = 0
    if len(arcs):
        a = arcs[np.argsort(arcs[:, 0] % (2.0 * math.pi))]
        start = a[:, 0] % (2.0 * math.pi)
        gaps = (np.roll(start, -1) - (start + a[:, 1])) % (2.0 * math.pi)
        # a run of arcs separated by gaps under 0.1 rad is one land; runs under 0.05 rad
        # wide are facet slivers, not lands
        big = np.nonzero(gaps > 0.1)[0]
        if len(big) == 0:
            runs = [float(a[:, 1].sum())]
        else:
            order = np.roll(np.arange(len(a)), -(int(big[0]) + 1))
            runs, width = [], 0.0
            for i in order:
                width += float(a[i, 1])
                if gaps[i] > 0.1:
                    runs.append(width)
                    width = 0.0
        count = sum(1 for w in runs if w >= 0.05)
    total = float(arcs[:, 1].sum()) if len(arcs) else 0.0
    return {"bottom": 2.0 * float(r.min()), "outer": 2.0 * float(r.max()),
            "lands": count, "mid_radius": rm,
            "land_width": total * s.groove_pitch / (2.0 * math.pi)}


def drum_findings(name, got, s, tol, where) -> list:
    out = []

    def bad(msg):
        out.append(Finding(ERROR, "size-mismatch", f"{where}: {msg}", name,
                           "gen.geometry.drum groove sizes"))

    if abs(got["bottom"] - s.drum_diameter) > 2 * tol:
        bad(f"groove-bottom diameter {got['bottom']:.4f} mm, expected {s.drum_diameter:.4f} mm")
    if abs(got["outer"] - s.outer_diameter) > 2 * tol:
        bad(f"land diameter {got['outer']:.4f} mm, expected {s.outer_diameter:.4f} mm")
    if got["lands"] != 1:
        bad(f"{got['lands']} grooves counted on the section, expected 1 (single start)")
    else:
        rm = got["mid_radius"]
        want = float(s.land_width_at(rm))
        # a facet error δ normal to the surface moves the land edge on the circle by the
        # width's change over δ of radius (the flank runs obliquely through the circle)
        lim = abs(float(s.land_width_at(rm - tol) - s.land_width_at(rm + tol))) + 2 * tol
        if abs(got["land_width"] - want) > lim:
            bad(f"land width at mid depth {got['land_width']:.4f} mm, expected {want:.4f} mm")
    return out


def make(name, values, where):
    dc = values["cable_diameter"]
    try:
        s = drum_sizes(dc, values["drum_diameter"], values["travel"], cable=values["cable"],
                       dead_turns=values["dead_turns"], gap=values.get("groove_gap"),
                       groove_radius=values.get("groove_radius"),
                       groove_depth=values.get("groove_depth"))
    except GeometryError as exc:
        msg = str(exc)
        key = ("drum_diameter" if "too small" in msg else "dead_turns" if "dead turns" in msg
               else "groove_radius" if "groove radius" in msg else "groove_depth"
               if "depth" in msg else "groove_gap" if "gap" in msg or "run into" in msg
               else "cable_diameter")
        raise where.error(key, msg, values.get(key)) from None
    chord = values["chord_tolerance"]
    findings = []
    bore = bore_of(values)
    holes, round_hole, straight_cuts = (), (), ()
    r_bore = 0.0
    if bore is not None:
        try:
            holes = (bore.loop(),)
        except GeometryError as exc:
            raise where.error("bore", str(exc), values["bore"]) from None
        r_bore = bore.outer_radius()
        round_hole = holes
        if not fixed_loop(holes[0]):
            # a D-flat or keyway would turn with the grooved band's section: it is cut
            # straight through every layer instead (a plain hole of each, no boolean)
            straight_cuts, holes, round_hole = holes, (), ()
        if r_bore >= s.drum_diameter / 2.0 - 1.0:
            raise where.error("bore", f"the bore (radius {r_bore:.2f} mm) leaves under 1 mm "
                              f"below the groove bottom ({s.drum_diameter:g} mm)",
                              values["bore"]["diameter"])
    hub, screw = values.get("hub"), values.get("set_screw")
    solids, z = [], 0.0
    if hub:
        if bore is not None and hub["diameter"] / 2.0 < r_bore + 1.5:
            findings.append(Finding(ERROR, "bore-too-big-for-hub", f"hub diameter "
                                    f"{hub['diameter']:g} mm leaves under 1.5 mm of wall round "
                                    "the bore", name, "common practice", key="hub"))
        solids.append(Prism(Section(circle(hub["diameter"] / 2.0), holes), 0.0, hub["length"]))
        z = hub["length"]
    fh = values.get("flange_height") or max(1.5, 2.0 * dc)
    flange_r = s.outer_diameter / 2.0 + fh
    t = values["flange_thickness"]
    if values["flanges"] in ("one", "both"):
        solids.append(Prism(Section(circle(flange_r), holes), z, z + t))
        z += t
    twist = drum_twist(s, values["hand"])
    loop = drum_section(s, sag=chord / 4.0)
    band0, band1 = z, z + s.length
    solids.append(Prism(Section(loop, round_hole), band0, band1, twist=twist))
    z = band1
    if values["flanges"] == "both":
        solids.append(Prism(Section(circle(flange_r), holes), z, z + t))
        z += t
    radial = []
    anchor = values.get("anchor_hole")
    if anchor is None:
        anchor = max(1.5 * dc, dc + 0.4)
    margin = (s.length - s.grooved_length) / 2.0
    z_anchor = band0 + margin + 0.5 * s.groove_pitch
    if anchor:
        if anchor >= s.groove_pitch * 1.9:
            findings.append(Finding(WARNING, "drum-sizes", f"anchor hole {anchor:g} mm is wider "
                                    "than two grooves", name, "", key="anchor_hole"))
        # the groove centre passes angle 0 at the band bottom and turns with the twist
        ang = twist * (z_anchor - band0)
        radial.append(RadialHole(anchor, z_anchor, ang, max(0.0, r_bore - 0.2),
                                 s.outer_diameter / 2.0 + 0.5))
    radial += list(K.set_screw_holes(name, screw, hub, r_bore if bore is not None else None,
                                     bore is not None and bool(bore.flat or bore.keyway),
                                     findings))
    body = Body(tuple(solids), tuple(Prism(Section(h), 0.0, z) for h in straight_cuts),
                radial_holes=tuple(radial))
    poly = loop.polygon(chord)
    findings += drum_findings(name, measure_drum(poly, s), s, chord + TOL.size, "section")
    mu = values["friction"]
    hold = capstan_ratio(mu, 2.0 * math.pi * s.dead_turns)
    sizes = {
        "cable": s.cable, "cable_diameter": dc, "drum_diameter": s.drum_diameter,
        "pitch_diameter": s.pitch_diameter, "outer_diameter": s.outer_diameter,
        "groove_pitch": s.groove_pitch, "groove_radius": s.groove_radius,
        "groove_depth": s.groove_depth, "land_width": s.land_width, "travel": s.travel,
        "active_turns": s.active_turns, "dead_turns": s.dead_turns, "turns": s.total_turns,
        "grooved_length": s.grooved_length, "band_length": s.length,
        "diameter_ratio": s.ratio, "min_diameter_ratio": s.min_ratio,
        "friction": mu, "holding_ratio": hold, "height": z,
        "flange_diameter": 2.0 * flange_r if values["flanges"] != "none" else None,
        "anchor_hole": anchor or None, "anchor_height": z_anchor if anchor else None,
    }
    findings.append(Finding(INFO, "drum-sizes", f"{s.total_turns:.2f} turns ({s.active_turns:.2f} "
                            f"for {s.travel:g} mm of travel + {s.dead_turns:g} dead) at a "
                            f"{s.groove_pitch:.3f} mm groove pitch: grooved length "
                            f"{s.grooved_length:.2f} mm, band {s.length:.2f} mm", name,
                            "computed: turns = s/(π D_p)", key="travel"))
    findings.append(Finding(INFO, "drum-ratio", f"drum-to-cable ratio D_p/d_c {s.ratio:.1f} "
                            f"(at least {s.min_ratio:g} for {s.cable})", name,
                            "common practice (cable makers' bend ratios)", key="drum_diameter"))
    findings.append(Finding(INFO, "capstan", f"{s.dead_turns:g} dead turns at μ {mu:g} hold "
                            f"{hold:.1f}× the pull at the anchor (the anchor sees 1/{hold:.1f} "
                            "of the cable tension)", name, "Euler–Eytelwein e^(μθ)",
                            key="dead_turns"))
    if values.get("torque") is not None:
        jd = values.get("joint_diameter") or s.pitch_diameter
        jt = joint_drive(s.pitch_diameter, jd, values["torque"])
        sizes.update(cable_tension=jt.tension, joint_ratio=jt.ratio,
                     joint_torque=jt.joint_torque)
        findings.append(Finding(INFO, "cable-drive", f"{values['torque']:g} N·m on the drum "
                                f"pulls the cable with {jt.tension:.1f} N"
                                + (f"; the {jd:g} mm joint pulley turns 1/{jt.ratio:.3f} of the "
                                   f"drum angle with {jt.joint_torque:.3f} N·m"
                                   if values.get("joint_diameter") else ""), name,
                                "T = τ/(D_p/2); ratio D_j/D_p", key="torque"))
    elif values.get("joint_diameter"):
        sizes["joint_ratio"] = values["joint_diameter"] / s.pitch_diameter
    band_mid = 0.5 * (band0 + band1)
    # slice clear of the anchor hole (it sits one margin and half a pitch above the band start)
    z_check = band_mid if abs(band_mid - z_anchor) > anchor + 0.5 else band1 - s.groove_pitch

    def slice_check(slicer):
        polys = slicer(z_check)
        outer = max(polys, key=lambda p: float(measure.radii(p).max()))
        return drum_findings(name, measure_drum(outer, s), s, chord + TOL.slice_extra,
                             f"mesh slice z={z_check:g}")

    return Part(name=name, kind=KIND, role=ROLE, values=values, shape=body, sizes=sizes,
                findings=tuple(findings), formulas=FORMULAS, outline=poly,
                section=Section(loop, round_hole + straight_cuts), slice_checks=(slice_check,),
                chord_tol=chord,
                data={"drum": s, "twist": twist, "band": (band0, band1), "anchor": z_anchor})
