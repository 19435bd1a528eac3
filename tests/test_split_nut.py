"""Anti-backlash split nut (``screw_nut`` with ``anti_backlash``): the axial float from the
thread geometry, the take-up numbers, refusals, and the slit, bridge and preload holes measured
on the exported triangles (one triangle build and one STEP solid, module fixture)."""

import math

import numpy as np
import pytest

from gen.errors import ParamError
from gen.geometry.screw import nut_axial_profile, nut_thread, thread_sizes
from gen.geometry.screw_split import PRELOAD_SCREWS, axial_float, sector_centroid
from gen.kinds.base import resolve
from gen.params.project import RawPart

NUT = dict(thread="trapezoidal", diameter=8, pitch=2, starts=4, length=10, flange_diameter=34,
           anti_backlash={"slit": 1.0, "bridge": 90, "preload_screw": "M3"})


def nut(**over):
    values = {**NUT, **over}
    raw = RawPart(name="n", kind="screw_nut", values=values, file="t.yaml", train=None, lines={})
    return resolve(raw)


def refused(**over) -> ParamError:
    with pytest.raises(ParamError) as exc:
        nut(**over)
    return exc.value


# --- axial float from the thread geometry -------------------------------------------------------

@pytest.mark.parametrize("form,d,p,c", [("trapezoidal", 8, 2, 0.1), ("trapezoidal", 12, 3, 0.25),
                                        ("metric", 8, 1.25, 0.1), ("metric", 20, 2.5, 0.05)])
def test_axial_float_two_routes(form, d, p, c):
    s = thread_sizes(form, d, p)
    ha = s.half_angle
    # computed, route 1: a flank moved back by c normal to itself sits c_r = c / sin(α/2)
    # further out radially; a radial offset c_r moves a flank inclined at α/2 to the radial
    # plane axially by c_r tan(α/2) — for the 30° thread 2 c_r tan 15° over the two flanks
    c_r = c / math.sin(ha)
    assert axial_float(ha, c) == pytest.approx(2 * c_r * math.tan(ha), rel=1e-12)
    # computed, route 2: on the nut's axial profile (a polygon of the nut's material), the groove
    # width at the pitch radius, interpolated between its flank corners, less the screw thread's
    # width there, P/2 (ISO 2904 / ISO 68-1: thread and groove equal on d2)
    prof = nut_axial_profile(nut_thread(s, c), outer_radius=d)
    (r4, z4), (r1, z1) = prof[3], prof[4]          # one flank: root corner, crest corner
    r2 = s.d2 / 2
    z_flank = z4 + (z1 - z4) * (r2 - r4) / (r1 - r4)
    groove = 2 * (p - z_flank)                      # the groove is centred on z = P
    assert groove - p / 2 == pytest.approx(axial_float(ha, c), abs=1e-12)


def test_manifest_float_and_take_up_hand_computed():
    part = nut()
    ab = part.sizes["anti_backlash"]
    # computed: Tr 8×2, clearance 0.1 (default): f = 2·0.1/cos 15° = 0.20706 mm
    assert ab["axial_play"] == pytest.approx(0.2 / math.cos(math.radians(15)), rel=1e-12)
    assert ab["axial_play"] == pytest.approx(0.20706, abs=1e-5)
    # computed: root D4 + 2c = 8.5 + 0.2 → r4 4.35; barrel grows to r4 + 2·1.0 + 3.4 (M3
    # clearance, ISO 273 medium, from memory, with 1 mm walls) = 9.75 → 19.5 mm
    assert part.sizes["outer_diameter"] == pytest.approx(19.5, abs=1e-12)
    r4, R, rs = 4.35, 9.75, (4.35 + 9.75) / 2
    assert ab["screw_radius"] == pytest.approx(rs, abs=1e-12)
    # hinge at the bridge centroid, found here by summing the sector on a fine polar grid
    # (midpoint rule; independent of the closed form)
    r = np.linspace(r4, R, 801)[:-1] + (R - r4) / 1600
    t = np.linspace(-math.pi / 4, math.pi / 4, 801)[:-1] + (math.pi / 2) / 1600
    rr, tt = np.meshgrid(r, t)
    xh = float(np.sum(rr * np.cos(tt) * rr) / np.sum(rr))
    assert ab["hinge_radius"] == pytest.approx(xh, rel=1e-5)
    assert sector_centroid(r4, R, math.pi / 4) == pytest.approx(xh, rel=1e-5)
    # rigid upper half turning about the hinge: closure at the axis / closure at the screw
    assert ab["takeup_ratio"] == pytest.approx(xh / (xh + rs), rel=1e-5)
    assert ab["slit_needed"] == pytest.approx(ab["axial_play"] * (xh + rs) / xh, rel=1e-5)
    assert ab["takes_up"] is True and ab["slit"] == 1.0
    assert ab["slit_z"] == [4.5, 5.5]                        # mid-length of a 10 mm nut
    assert ab["pilot_hole"] == pytest.approx(2.5)             # M3 − 0.5 (tap-drill rule)
    # computed: chord of 90° on the root circle, 2·4.35·sin 45°
    assert ab["bridge_chord"] == pytest.approx(2 * 4.35 * math.sin(math.pi / 4), rel=1e-12)
    assert "split-nut" in {f.code for f in part.findings}


def test_preload_screw_table():
    # ISO 261 coarse pitch and ISO 273 medium clearance (from memory)
    assert {k: (s.pitch, s.clearance) for k, s in PRELOAD_SCREWS.items()} == {
        "M2": (0.4, 2.4), "M2.5": (0.45, 2.9), "M3": (0.5, 3.4), "M4": (0.7, 4.5),
        "M5": (0.8, 5.5)}


# --- refusals ------------------------------------------------------------------------------------

def test_slit_narrower_than_the_float_it_must_take_up():
    e = refused(anti_backlash={"slit": 0.3})
    assert e.key == "anti_backlash.slit" and "0.426" in str(e.allowed)


def test_bridge_too_thin_for_the_nozzle():
    # 5° on a 4.35 mm root: 0.38 mm, under two 0.4 mm lines (common practice)
    e = refused(anti_backlash={"bridge": 5})
    assert e.key == "anti_backlash.bridge" and "nozzle" in e.detail


def test_bridge_reaching_the_preload_hole():
    e = refused(anti_backlash={"bridge": 340})
    assert e.key == "anti_backlash.bridge" and "preload screw hole" in e.detail


def test_preload_hole_into_the_thread_or_out_of_the_body():
    e = refused(anti_backlash={"screw_radius": 5.5})
    assert e.key == "anti_backlash.screw_radius" and "breaks into the thread" in e.detail
    e = refused(anti_backlash={"screw_radius": 9.0})
    assert e.key == "anti_backlash.screw_radius" and "breaks out of the body" in e.detail
    e = refused(outer_diameter=14)
    assert e.key == "outer_diameter" and "19.50" in str(e.allowed)


def test_slit_over_the_flange_and_unknown_screw():
    e = refused(length=6)
    assert e.key == "anti_backlash.slit" and "flange" in e.detail
    e = refused(anti_backlash={"preload_screw": "M7"})
    assert e.key == "anti_backlash.preload_screw"


# --- measured on the triangles and the solid -----------------------------------------------------

@pytest.fixture(scope="module")
def built():
    import cadquery as cq

    from gen.solid import solid
    from gen.triangles import triangles

    part = nut(chord_tolerance=0.02)
    return part, triangles(part.shape, part.chord_tol), cq.Solid(solid(part.shape))


def test_slit_gap_measured_on_the_triangles(built):
    part, tm, _ = built
    # the slit faces are the only horizontal facets inside the barrel's length: their heights
    # give the gap
    up = np.abs(tm.face_normals[:, 2]) > 1 - 1e-9
    z = np.unique(np.round(tm.triangles_center[up, 2], 9))
    inner = z[(z > part.sizes["flange_thickness"] + 1e-6) & (z < 10 - 1e-6)]
    assert inner.tolist() == pytest.approx([4.5, 5.5], abs=1e-9)


def test_bridge_measured_on_the_triangles(built):
    from gen.triangles.prism import slice_polygons

    part, tm, _ = built
    loops = slice_polygons(tm, 5.0)
    assert len(loops) == 1
    p = np.asarray(loops[0])[:, :2]
    th, r = np.arctan2(p[:, 1], p[:, 0]), np.hypot(p[:, 0], p[:, 1])
    assert np.degrees(np.abs(th)).max() == pytest.approx(45.0, abs=1e-6)
    assert r.max() <= 9.75 + 1e-9 and r.max() > 9.75 - 0.02        # chord tolerance
    # shoelace area between the 90° sectors of the thread root (4.35) and of the nut's minor
    # radius (3.1): the thread teeth fill part of the gap between them
    area = 0.5 * abs(np.sum(p[:, 0] * np.roll(p[:, 1], -1) - np.roll(p[:, 0], -1) * p[:, 1]))
    sector = lambda a: math.pi / 4 * (9.75 ** 2 - a ** 2)  # noqa: E731
    assert sector(4.35) - 0.05 < area < sector(3.1)


def test_part_slice_checks_pass_and_catch_a_wrong_slit(built):
    from gen.triangles.prism import slice_polygons

    part, tm, _ = built
    slicer = lambda z: slice_polygons(tm, z)  # noqa: E731
    assert [f.message for c in part.slice_checks for f in c(slicer)] == []
    other = nut(chord_tolerance=0.02, anti_backlash={"slit": 1.4, "bridge": 120})
    bad = [f for c in other.slice_checks for f in c(slicer)]
    assert {f.code for f in bad} == {"split-measure"} and len(bad) >= 2


def test_step_and_stl_volumes_agree(built):
    part, tm, sol = built
    assert sol.isValid()
    # every triangle point lies within the chord tolerance of the exact surface, so the
    # volumes differ by at most area × tolerance (computed bound)
    assert abs(sol.Volume() - tm.volume) <= tm.area * part.chord_tol
    assert tm.is_watertight
