"""Sector gears: teeth for a swing, the toothed arc, the outline, and a pair over the swing."""

import math

import numpy as np
import pytest
from shapely.geometry import Point, Polygon

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.gear_outline import gear_loop
from gen.geometry.generate import generate_flank
from gen.geometry.pair import mesh_pair
from gen.geometry.sector import (SectorArm, sector_arc, sector_section, sector_teeth, teeth_in_arc,
                                 tooth_angles)
from gen.geometry.sector_pair import sector_contact

RACK = basic_rack("A")


def _gear(z, m=2.0):
    g = gear_sizes(z, m, RACK)
    return g, generate_flank(z, g.rp, cutter_for(g, RACK), g.ra)


def test_teeth_for_a_swing():
    # computed: z 40, swing 45° → 45·40/360 = 5 pitches pass the pitch point; with ε_α 1.635
    # (m 2, z 20/40; line of action, from memory; computed) N ≥ 5 + 1.635 − ½ → 7,
    # one margin tooth each end → 9
    st = sector_teeth(40, math.radians(45), 1.635, margin=1)
    assert st.engaged == pytest.approx(5.0, rel=1e-12)
    # the same by arc length: r_p Σ / (π m) with r_p = z m / 2
    assert st.engaged == pytest.approx(40 * 2 / 2 * math.radians(45) / (math.pi * 2), rel=1e-12)
    assert (st.needed, st.teeth) == (7, 9)
    assert st.arc == pytest.approx(9 * 2 * math.pi / 40)
    # parity: an even count puts a space on the centre line
    assert sector_teeth(40, math.radians(45), 1.635, margin=0, parity="even").needed == 8
    with pytest.raises(GeometryError, match="full gear"):
        sector_teeth(12, math.radians(300), 1.5, margin=1)


def test_arc_shorter_than_one_tooth_refused():
    # 20 teeth: one pitch is 18°
    assert teeth_in_arc(20, math.radians(18.0)) == 1
    assert teeth_in_arc(20, math.radians(55.0)) == 3
    with pytest.raises(GeometryError) as exc:
        teeth_in_arc(20, math.radians(17.0))
    assert "shorter than one tooth pitch" in str(exc.value)
    with pytest.raises(GeometryError, match="at least one whole tooth"):
        sector_arc(20, 0)
    a0, a1 = sector_arc(20, 5, center=0.3)
    assert (a1 - a0) == pytest.approx(5 * 2 * math.pi / 20) and (a0 + a1) / 2 == pytest.approx(0.3)


def _radius(p):
    return np.hypot(p[:, 0], p[:, 1])


def test_sector_outline_measured():
    g, fl = _gear(20)
    n = 5
    sec = sector_section(fl, n, hub_diameter=12.0, bore=5.0, center=0.4,
                         arm=SectorArm(radius=30.0, width=8.0, hole_diameter=3.0))
    assert sec.outer.gaps() < 1e-9
    outer, holes = sec.polygons(0.002)
    poly = Polygon(outer, holes)
    assert poly.is_valid and len(holes) == 2
    r = _radius(outer)
    arc0, arc1 = sector_arc(20, n, 0.4)
    rel = (np.arctan2(outer[:, 1], outer[:, 0]) - 0.4 + math.pi) % (2 * math.pi) - math.pi
    in_arc = np.abs(rel) <= (arc1 - arc0) / 2 + 1e-9
    # tips on the ISO 21771 tip circle d + 2m (computed: 44 mm); the arm reaches 30 + 4 mm
    assert r[in_arc].max() == pytest.approx(g.ra, abs=1e-9) and g.ra == 22.0
    assert r.max() == pytest.approx(34.0, abs=1e-9)
    # teeth counted on the polygon: runs of vertices on the tip circle
    on_tip = np.abs(r - g.ra) < 1e-6
    runs = np.sum(on_tip & ~np.roll(on_tip, 1))
    assert runs == n
    # the teeth are the full gear's teeth (independent route: the whole-gear outline of
    # gen.geometry.gear_outline turned by the sector's tooth angles): every sector vertex
    # above the root circle lies on the full gear's outline
    full = Polygon(gear_loop(fl).polygon(0.002))
    ang = tooth_angles(20, n, 0.4)
    k = round(ang[0] / (2 * math.pi / 20))  # sector tooth 0 sits on full-gear tooth k (shifted)
    shift = ang[0] - k * 2 * math.pi / 20
    c, s = math.cos(shift), math.sin(shift)
    full_turned = Polygon(full.exterior.coords @ np.array([[c, s], [-s, c]]))
    toothy = outer[(r > g.rf + 0.05) & (r < g.ra + 1e-9) & (np.abs(rel) < math.pi / 2)]
    assert len(toothy) > 50
    assert max(full_turned.exterior.distance(Point(p)) for p in toothy) < 1e-6
    # nothing above the root circle outside the toothed arc except the arm (at the back)
    assert np.all(in_arc[(r > g.rf + 1e-9) & (np.abs(rel) < math.pi / 2)])
    # arm hole centred at the stated radius, opposite the teeth
    hole_c = Polygon(holes[1]).centroid
    assert math.hypot(hole_c.x, hole_c.y) == pytest.approx(30.0, abs=1e-3)
    assert math.atan2(hole_c.y, hole_c.x) == pytest.approx(0.4 + math.pi - 2 * math.pi, abs=1e-4)
    # the body reaches the hub: the nearest outline point to the pivot is on the boss circle
    assert r.min() == pytest.approx(6.0, abs=1e-9)


def test_wide_sector_uses_root_disc():
    g, fl = _gear(20)
    sec = sector_section(fl, 15, hub_diameter=12.0, bore=5.0)
    outer, holes = sec.polygons(0.002)
    assert Polygon(outer, holes).is_valid
    # 15 of 20 teeth: tangent sides would cross, the back is the root circle
    assert _radius(outer).min() == pytest.approx(g.rf, abs=1e-9)


def test_outline_refusals():
    g, fl = _gear(20)
    with pytest.raises(GeometryError, match="smaller than the root"):
        sector_section(fl, 5, hub_diameter=40.0)
    with pytest.raises(GeometryError, match="no wall"):
        sector_section(fl, 5, hub_diameter=12.0, bore=12.0)
    with pytest.raises(GeometryError, match="toothed side"):
        sector_section(fl, 5, hub_diameter=12.0, arm=SectorArm(30.0, 8.0, 3.0, angle=0.0))
    with pytest.raises(GeometryError, match="at least one whole tooth"):
        sector_section(fl, 0, hub_diameter=12.0)


def test_full_gears_average_the_contact_ratio():
    g1, _ = _gear(20)
    g2, _ = _gear(40)
    eps = mesh_pair(g1, g2).contact_ratio
    assert eps == pytest.approx(1.635, abs=5e-4)  # line of action (from memory; computed)
    # over whole pitches, evenly sampled, the mean number of pairs in contact is ε_α
    # (common practice: ε_α is the average number of tooth pairs in contact)
    swing = 6 * 2 * math.pi / 20
    c = sector_contact(g1, g2, 20, 40, swing)
    # time average of the piecewise-constant count (the samples include every engagement and
    # separation, so the count is constant between neighbouring samples)
    mean = np.sum(c.pairs_leading[:-1] * np.diff(c.angles)) / swing
    assert mean == pytest.approx(eps, abs=1e-6)
    assert set(np.unique(c.pairs_leading)) == {1, 2}
    assert c.full_ratio_kept and c.min_pairs == 1


def test_single_tooth_contact_span():
    g1, _ = _gear(20)
    g2, _ = _gear(40)
    res = mesh_pair(g1, g2)
    c = sector_contact(g1, g2, 1, 40, math.radians(30))
    # computed: one tooth engages over the path of contact, ε_α base pitches = ε_α τ₁ of turn,
    # from t + g_f/p_b before to g_a/p_b − t after its centre passes the line of centres
    tau = 2 * math.pi / 20
    lo, hi = c.leading_range
    assert hi - lo == pytest.approx(res.contact_ratio * tau, rel=1e-12)
    gf, ga = (x / g1.pb for x in res.contact_path)
    assert lo == pytest.approx((-0.25 - gf) * tau, abs=1e-9)
    assert hi == pytest.approx((-0.25 + ga) * tau, abs=1e-9)
    # a 30° swing centred on the tooth is more than it covers (−19.9° … 9.5° leading,
    # mirrored trailing: computed from the numbers above)
    assert not c.always_in_contact and c.min_pairs == 0


def test_sector_pair_sized_by_sector_teeth_keeps_full_contact():
    g1, _ = _gear(20)
    g2, _ = _gear(40)
    res = mesh_pair(g1, g2)
    swing = math.radians(90)
    reach = max(res.contact_path) / g1.pb
    st1 = sector_teeth(20, swing, res.contact_ratio, margin=0, reach=reach, parity="odd")
    st2 = sector_teeth(40, swing * 20 / 40, res.contact_ratio, margin=0, reach=reach,
                       parity="even")
    # computed: 90° of a 20-tooth gear = 5 pitches; 5 + 1.635 − ½ = 6.1 → 7 (odd);
    # the 40-tooth member turns 45° = 5 pitches too → 7 → 8 (even)
    assert (st1.teeth, st2.teeth) == (7, 8)
    c = sector_contact(g1, g2, st1.teeth, st2.teeth, swing)
    assert c.full_ratio_kept and c.always_in_contact and c.offset2 == 0.0
    # the contact band reaches past the swing on both sides (hard stops outside it)
    assert c.stops[0] <= -swing / 2 and c.stops[1] >= swing / 2
    assert c.stops_gear2[1] == pytest.approx(c.stops[1] * 20 / 40, rel=1e-12)
    # one tooth fewer on either member loses full contact somewhere in the swing
    assert not sector_contact(g1, g2, st1.teeth - 2, st2.teeth, swing).full_ratio_kept
    assert not sector_contact(g1, g2, st1.teeth, st2.teeth - 2, swing).full_ratio_kept
    # brute force (a second route): the fewest odd teeth on gear 1 against a full gear 2
    # that keep the full-gear counts over the swing
    fewest = next(n for n in range(1, 20, 2)
                  if sector_contact(g1, g2, n, 40, swing).full_ratio_kept)
    assert fewest == st1.teeth


def test_short_sector_loses_contact_and_reports_stops():
    g1, _ = _gear(20)
    g2, _ = _gear(40)
    swing = math.radians(90)
    c = sector_contact(g1, g2, 3, 4, swing)
    assert not c.always_in_contact and c.min_pairs == 0
    # the stops bound the band with contact on both flank sides, inside the swing here
    assert -swing / 2 < c.stops[0] < 0 < c.stops[1] < swing / 2
    inside = (c.angles > c.stops[0] + 1e-6) & (c.angles < c.stops[1] - 1e-6)
    assert np.all(c.pairs_leading[inside] >= 1) and np.all(c.pairs_trailing[inside] >= 1)
