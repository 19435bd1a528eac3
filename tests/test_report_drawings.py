"""Report drawings of issues 15, 16 and 18: sector pairs over their whole swing, overlap painted
in the static pair drawing, screw and nut axial sections, flywheel section with the stress
along the radius. The SVG is parsed and its elements checked against values worked out here
by other routes (standards' formulas, the rolling relation, Timoshenko's disc formulas)."""

import math
import os
import re
import xml.etree.ElementTree as ET
from functools import lru_cache
from types import SimpleNamespace

import numpy as np
import pytest

from conftest import PARAMS

SVG = "{http://www.w3.org/2000/svg}"


@lru_cache(maxsize=None)
def _check(name):
    from gen.api import check_files

    return check_files(os.path.join(PARAMS, name))


def _cls(root, cls, tag=None):
    return [e for e in root.iter() if cls in (e.get("class") or "").split()
            and (tag is None or e.tag == SVG + tag)]


def _rotate_deg(transform):
    return float(re.search(r"rotate\(([-\d.]+)\)", transform).group(1))


# --- sector pair over the swing -----------------------------------------------------------

def _gripper():
    from gen.export.report_swing import placement

    r = _check("greenhouse_mechanisms.yaml")
    p = r.pairs[0]
    n = p["numbers"]
    a, b = (r.models[k] for k in n["gear_order"])
    pr = p["picture"][2]
    return r, p, pl_of(placement, a, b, pr, n), pr


def pl_of(placement, a, b, pr, n):
    return placement(a, b, pr, math.radians(n["swing"]))


# The demo gripper (params/greenhouse_mechanisms.yaml): both fingers cut from 24-tooth
# circles, swing 40°; the left finger has a tooth on its centre line (centre-line angle 0),
# the right one a space (centre-line angle half a pitch, 360/24/2 = 7.5°). Computed: at
# mid-swing each centre line faces the other gear (left: 0°, right: 180°), so the right
# finger's own frame is turned 180 − 7.5 = 172.5°; rolling 1:1 the fingers turn opposite ways
# by ±Σ/2 = ±20°.
Z1 = Z2 = 24
SWING = 40.0
LEFT_ENDS = (-SWING / 2, SWING / 2)
RIGHT_ENDS = (180 - 360 / Z2 / 2 + SWING / 2 * Z1 / Z2, 180 - 360 / Z2 / 2 - SWING / 2 * Z1 / Z2)


def test_swing_animation_runs_from_one_swing_end_to_the_other_and_back():
    from gen.export.report_motion import scene_svg
    from gen.export.report_swing import swing_scene

    _, _, pl, pr = _gripper()
    root = ET.fromstring(scene_svg(swing_scene(pl, pr, "gripper")))
    rot = [e for e in root.iter(SVG + "animateTransform") if e.get("type") == "rotate"]
    assert len(rot) == 4                       # two members × two panels
    for e, ends in zip(rot, (LEFT_ENDS, RIGHT_ENDS, LEFT_ENDS, RIGHT_ENDS)):
        vals = [float(v) for v in e.get("values").split(";")]
        assert vals == pytest.approx([ends[0], ends[1], ends[0]], abs=1e-3)
        assert e.get("keyTimes") == "0;0.5;1"  # out in the first half, back in the second
        assert e.get("repeatCount") == "indefinite"
    # the travel covers the whole swing, not one pitch (15° here)
    assert abs(LEFT_ENDS[1] - LEFT_ENDS[0]) > 360 / Z1
    # one way takes 1.5 s per pitch of swing, at least 4 s (the module's pacing): 40/15
    # pitches → 4 s each way, 8 s in all
    assert float(rot[0].get("dur").rstrip("s")) == pytest.approx(8.0)
    assert "swinging" in root.find(SVG + "title").text
    assert not list(root.iter(SVG + "script"))


def test_swing_drawing_ghosts_both_ends_and_marks_the_hard_stops():
    from gen.export.report_swing import swing_svg

    _, p, pl, pr = _gripper()
    stops = tuple(math.radians(v) for v in p["numbers"]["stops"])
    stops2 = tuple(math.radians(v) for v in p["numbers"]["stops_gear2"])
    root = ET.fromstring(swing_svg(pl, pr, stops, stops2, title="gripper"))
    mid = _cls(root, "outline", "use")
    assert [_rotate_deg(e.get("transform")) for e in mid] == pytest.approx(
        [0.0, 180 - 7.5], abs=1e-3)            # mid-swing (computed above)
    for k, (left, right) in enumerate(zip(LEFT_ENDS, RIGHT_ENDS)):
        ghosts = _cls(root, f"end-{k}", "use")
        assert [_rotate_deg(e.get("transform")) for e in ghosts] == pytest.approx(
            [left, right], abs=1e-3)
        assert all(e.get("stroke-dasharray") for e in ghosts)
    # hard-stop ticks: two per member, on the radial lines at the stated angles from the
    # centre line (left finger about the origin, facing +X)
    ticks = _cls(root, "hard-stop", "line")
    assert len(ticks) == 4
    left = [t for t in ticks if "member-1" in t.get("class")]
    ang = sorted(math.degrees(math.atan2(float(t.get("y1")), float(t.get("x1")))) for t in left)
    assert ang == pytest.approx(sorted(p["numbers"]["stops"]), abs=1e-2)
    # the hard stops lie beyond the swing ends (the swing is inside the contact range)
    assert min(p["numbers"]["stops"]) < LEFT_ENDS[0] and max(p["numbers"]["stops"]) > LEFT_ENDS[1]
    labels = [t.text for t in root.iter(SVG + "text") if t.text]
    assert any("40.00°" in t for t in labels)
    assert any("hard stops" in t and f"{p['numbers']['stops'][1]:+.2f}°" in t for t in labels)


def test_swing_overlap_frames_are_shown_on_the_way_out_and_back():
    from gen.export.report_motion import WARN, _frame_slots, scene_svg
    from gen.export.report_swing import swing_scene
    from gen.geometry.pair import mesh_pair

    # slots: travel i/n is shown in slot i going out and slot 2n − i coming back
    slots = _frame_slots("swing", 4)
    assert [t for t, _ in slots] == [0, 0.25, 0.5, 0.75, 1.0]
    assert slots[1][1] == ((1 / 8, 2 / 8), (7 / 8, 1.0))
    assert slots[4][1] == ((4 / 8, 5 / 8),)
    # the gripper pushed 0.6 mm too close: its teeth overlap and each overlap is painted
    r, _, pl, pr = _gripper()
    a, b = (r.models[k] for k in ("gripper_finger_left", "gripper_finger_right"))
    close = mesh_pair(a.mate.sizes, b.mate.sizes, pr.center_distance - 0.6)
    from dataclasses import replace
    scene = swing_scene(replace(pl, center_distance=close.center_distance), close, "close")
    assert scene.max_overlap > 0
    root = ET.fromstring(scene_svg(scene))
    painted = _cls(root, "overlap", "path")
    assert painted and all(e.get("fill") == WARN for e in painted)
    shown_twice = [e for e in painted
                   if e.find(SVG + "animate").get("values").count("visible") == 2]
    assert shown_twice, "a pose inside the swing is passed twice per cycle"


# --- overlap in the static pair drawing ---------------------------------------------------

@lru_cache(maxsize=None)
def _spur_pair(shift):
    from gen.geometry.basic_rack import basic_rack
    from gen.geometry.cylindrical import cutter_for, gear_sizes
    from gen.geometry.gear_outline import gear_loop
    from gen.geometry.generate import generate_flank
    from gen.geometry.pair import mesh_pair
    from gen.validate.sweep import sweep_pair

    rack = basic_rack("A")
    out = []
    for z, x in ((12, 0.4), (30, 0.2)):
        s = gear_sizes(z, 2.0, rack, x, thinning=0.1)
        out.append((s, gear_loop(generate_flank(z, s.rp, cutter_for(s, rack), s.ra))
                    .polygon(0.01)))
    (s1, p1), (s2, p2) = out
    pr = mesh_pair(s1, s2, mesh_pair(s1, s2).center_distance - shift)
    return p1, p2, pr, sweep_pair(p1, p2, pr)


def _shoelace(pts):
    x, y = pts[:, 0], pts[:, 1]
    return 0.5 * abs(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))


def test_static_pair_drawing_paints_the_worst_overlap_with_its_area():
    from gen.export.report_svg import mesh_svg

    p1, p2, pr, sw = _spur_pair(0.6)            # centre distance 0.6 mm too short
    assert sw.overlap_area > 0
    root = ET.fromstring(mesh_svg(p1, p2, pr, sw, title="too close"))
    painted = _cls(root, "overlap", "path")
    assert len(painted) == 2                    # the whole pair and the mesh zone
    assert all(e.get("fill") == "#D55E00" for e in painted)   # Okabe–Ito vermillion
    # the painted area, measured here by the shoelace formula on the path's rings, is the
    # area written on the drawing, and the sweep's largest overlap (drawn at its angle;
    # 5 % slack for the sweep's cropped mesh-zone outlines)
    rings = re.findall(r"M ([^MZ]+) Z", painted[0].get("d"))
    area = sum(_shoelace(np.array([float(v) for v in r.split()]).reshape(-1, 2))
               for r in rings)
    label = _cls(root, "overlap-label", "text")[0].text
    shown = float(re.search(r"([\d.]+) mm²", label).group(1))
    assert shown == pytest.approx(area, abs=2e-4)
    assert area == pytest.approx(sw.overlap_area, rel=0.05)
    assert f"{math.degrees(sw.angle_at_overlap):.2f}°" in label
    assert not _cls(root, "tightest")           # no gap to mark where the teeth overlap


def test_clear_pair_drawing_paints_no_overlap():
    from gen.export.report_svg import mesh_svg

    p1, p2, pr, sw = _spur_pair(0.0)
    assert sw.overlap_area == 0
    root = ET.fromstring(mesh_svg(p1, p2, pr, sw))
    assert not _cls(root, "overlap") and not _cls(root, "overlap-label")
    assert len(_cls(root, "tightest")) == 1


# --- screw and nut section ----------------------------------------------------------------

def test_screw_edge_follows_the_iso_2904_basic_profile():
    from gen.export.report_screw import nut_edge, screw_edge

    r = _check("greenhouse_mechanisms.yaml")
    screw, nut = r.models["camera_mast_screw"], r.models["camera_mast_nut"]
    e = np.array(screw_edge(screw.data["thread"], 0, 3))
    # ISO 2904 (from memory) for Tr 8×2: a_c = 0.25 (P 2–5); d3 = d − 2 (P/2 + a_c) = 5.5;
    # crest flat 0.366 P wide (P/2 − 2 (P/4) tan 15°, computed)
    assert e[:, 1].max() == pytest.approx(4.0, abs=1e-9)
    assert e[:, 1].min() == pytest.approx(2.75, abs=1e-9)
    crest = e[np.isclose(e[:, 1], 4.0)][:, 0]
    assert crest[1] - crest[0] == pytest.approx(2 / 2 - 2 * (2 / 4) * math.tan(math.radians(15)),
                                                abs=1e-9)
    assert crest[2] - crest[0] == pytest.approx(2.0, abs=1e-9)       # repeats every P
    c = nut.sizes["clearance"]
    n = np.array(nut_edge(nut.data["nut"], 6.0, 0, 3))
    # nut: D1 = d − P = 6 and D4 = d + 2 a_c = 8.5 (ISO 2904), each moved out by c
    assert n[:, 1].min() == pytest.approx(3.0 + c, abs=1e-9)
    assert n[:, 1].max() == pytest.approx(4.25 + c, abs=1e-9)


def test_screw_section_drawing_labels_diameters_lead_and_hatches_per_part():
    from gen.export.report_screw import screw_section_svg

    r = _check("greenhouse_mechanisms.yaml")
    screw, nut = r.models["camera_mast_screw"], r.models["camera_mast_nut"]
    root = ET.fromstring(screw_section_svg(screw, nut, title="mast"))
    dia = {g.get("class").split()[-1]: float(g.find(SVG + "text").get("data-diameter"))
           for g in _cls(root, "level", "g")}
    c = nut.sizes["clearance"]
    assert dia == pytest.approx({"level-major": 8.0, "level-pitch": 7.0, "level-minor": 5.5,
                                 "level-nut-minor": 6.0 + 2 * c,
                                 "level-nut-root": 8.5 + 2 * c}, abs=1e-9)
    pats = list(root.iter(SVG + "pattern"))
    angles = sorted(float(re.search(r"rotate\(([-\d.]+)\)", p.get("patternTransform"))
                          .group(1)) for p in pats)
    assert angles == [-45.0, 45.0]              # ISO 128-50: adjacent parts hatched apart
    assert _cls(root, "screw-profile") and _cls(root, "nut-profile")
    text = " ".join(t.text or "" for t in root.iter(SVG + "text"))
    # lead L = n P = 8 mm; lead angle atan(L / (π d2)) = atan(8 / 7π) = 19.99° (computed)
    assert "L = 4 × P = 8 mm" in text
    assert f"{math.degrees(math.atan(8 / (7 * math.pi))):.2f}°" in text
    assert "right hand" in text and "ISO 2904" in text


# --- flywheel section and stress along the radius -----------------------------------------

def test_stress_curve_meets_timoshenko_at_the_edges():
    from gen.geometry.rotor import Rotor
    from gen.geometry.rotor_stress import stress_curve

    # steel (ρ 7850 kg/m³, ν 0.3) at 3000 rpm; ρω² in MPa/mm² = ρ ω² 1e-12
    w = 3000 * 2 * math.pi / 60
    k = 7850 * w * w * 1e-12
    solid = stress_curve(Rotor(outer_diameter=120, thickness=20), "steel", w)
    # Timoshenko (from memory): solid disc, centre σr = σθ = (3+ν)/8 ρω²b²; rim σr = 0
    assert solid.radial[0] == pytest.approx(3.3 / 8 * k * 60 ** 2, rel=1e-12)
    assert solid.hoop[0] == pytest.approx(3.3 / 8 * k * 60 ** 2, rel=1e-12)
    assert solid.radial[-1] == pytest.approx(0.0, abs=1e-12)
    assert solid.peak_radius == 0.0 and solid.ring_r is None
    bored = stress_curve(Rotor(outer_diameter=120, thickness=20, bore=20), "steel", w)
    # bored disc: σr = 0 on both free edges, hoop at the bore (3+ν)/4 ρω² (b² + (1−ν)/(3+ν) a²)
    assert bored.radial[0] == pytest.approx(0.0, abs=1e-12)
    assert bored.radial[-1] == pytest.approx(0.0, abs=1e-12)
    assert bored.hoop[0] == pytest.approx(3.3 / 4 * k * (60 ** 2 + 0.7 / 3.3 * 10 ** 2),
                                          rel=1e-12)
    assert bored.hoop.max() == pytest.approx(bored.hoop[0])   # the largest, at the bore
    assert bored.peak_radius == 10.0 and bored.allowable == 235.0


def test_rim_rotor_curve_adds_the_thin_ring_stress():
    from gen.geometry.rotor_stress import stress_curve

    part = _check("rover_rotor.yaml").models["rover_rotor"]
    w = 3000 * 2 * math.pi / 60
    c = stress_curve(part.data["rotor"], part.data["material"], w)
    # thin ring at R = 60 mm: ρω²R² = 7850 · 314.16² · 0.06² Pa = 2.789 MPa (computed)
    assert c.ring_hoop[-1] == pytest.approx(7850 * w * w * 0.06 ** 2 / 1e6, rel=1e-12)
    assert c.peak.where == "rim" and c.peak_radius == 60.0
    assert c.peak.peak == pytest.approx(c.ring_hoop[-1])


def _fake(part, rpm):
    return SimpleNamespace(name=part.name, shape=part.shape, data=part.data,
                           sizes={**part.sizes, "max_speed": rpm})


def _tick_map(root):
    """σ (MPa) → y (px) from the plot's own tick labels (a straight line through them)."""
    ticks = _cls(root, "tick-s", "text")
    v = np.array([float(t.text) for t in ticks])
    y = np.array([float(t.get("y")) - 4 for t in ticks])
    return np.polyfit(v, y, 1)


def test_rotor_drawing_has_section_curves_peak_and_allowable():
    from gen.export.report_rotor import rotor_svg

    part = _check("rover_rotor.yaml").models["rover_rotor"]
    root = ET.fromstring(rotor_svg(part, "rover"))
    assert len(_cls(root, "rotor-profile", "path")) == 2        # the section and its mirror
    assert _cls(root, "axis", "line")
    assert {"hoop", "radial", "ring"} <= {c for e in _cls(root, "curve", "path")
                                         for c in e.get("class").split()}
    labels = [t.text for t in _cls(root, "axis-label", "text")]
    assert "radius r (mm)" in labels and "stress σ (MPa)" in labels
    peak = _cls(root, "peak", "g")[0]
    slope, icpt = _tick_map(root)

    def mpa(g):
        return (float(g.find(SVG + "circle").get("cy")) - icpt) / slope
    # the rim: 2.789 MPa (computed above) read back through the tick scale
    assert any(mpa(g) == pytest.approx(2.789, abs=0.01) for g in _cls(root, "stress-mark", "g"))
    # the peak at the 14 mm bolt circle: Timoshenko's bored disc (a 4, b 60 mm, ν 0.3, from
    # memory) at r 7 mm, raised by Kirsch's 3σ_θ − σ_r at a small hole (Timoshenko & Goodier,
    # from memory); computed here by hand
    w = 3000 * 2 * np.pi / 60
    k, a, b, r, nu = 7850 * w * w / 1e6 * 1e-6, 4.0, 60.0, 7.0, 0.3   # ρω² in MPa/mm²
    s_r = (3 + nu) / 8 * k * (b * b + a * a - a * a * b * b / r ** 2 - r * r)
    s_t = (3 + nu) / 8 * k * (b * b + a * a + a * a * b * b / r ** 2 - (1 + 3 * nu) / (3 + nu) * r * r)
    assert mpa(peak) == pytest.approx(3 * s_t - s_r, abs=0.01)
    assert "bolt holes" in "".join(peak.itertext())
    # at 3000 rpm the yield (235 MPa) is far above the curves: written, not drawn
    assert "above the scale" in _cls(root, "allowable", "text")[0].text
    # at 18000 rpm (36× the stress: 100 MPa) the yield line is drawn at 235 MPa on the scale
    fast = ET.fromstring(rotor_svg(_fake(part, 18000), "rover fast"))
    line = _cls(fast, "allowable", "line")[0]
    slope, icpt = _tick_map(fast)
    assert (float(line.get("y1")) - icpt) / slope == pytest.approx(235.0, abs=0.5)


# --- the page ------------------------------------------------------------------------------

def test_page_has_the_section_band_with_its_drawings():
    from gen.export.report_build import render

    r = _check("greenhouse_mechanisms.yaml")
    page = render(r)
    band = page[page.index('id="sections"'):]
    band = band[:band.index("</section>")]
    assert band.count('class="screw-section"') == 1        # the mast screw in its nut
    assert 'id="section-camera_mast_screw-in-camera_mast_nut"' in band
    meshes = page[page.index('id="meshes"'):]
    assert 'class="swing"' in meshes and "swinging" in meshes
    ids = re.findall(r' id="([^"]+)"', page)
    assert len(ids) == len(set(ids))
    assert "<script" not in page
