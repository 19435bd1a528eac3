"""Crossings with a measuring circle where outline vertices lie exactly on it (a thread section
has its flank ends on d2)."""

from gen import api


def test_single_start_screw_section_measures_half_a_pitch():
    # ISO 2904 Tr 8×2, one start: thread thickness P/2 = 1 mm on d2 = 7 mm (from memory);
    # the section's flank vertices fall exactly on the pitch circle
    p = api.make("lead_screw", "s", thread="trapezoidal", diameter=8, pitch=2, starts=1,
                 length=20)
    assert not p.errors, [f.message for f in p.errors]


def test_crossings_at_vertices_on_the_circle_are_counted_once_where_they_are():
    # an outline whose every crossing vertex lies exactly on R (inside R − 0.15, on R, outside
    # R + 0.15, on R, inside …): each must be found once, at its vertex (rounding used to put
    # the edge's root a hair outside [0, 1] and take the other root, far off the edge)
    import math

    import numpy as np

    from gen.validate import measure

    R, n = 3.0, 40
    ang = np.linspace(0.0, 2.0 * math.pi, n, endpoint=False) + 0.1
    rad = R + np.array([-0.15, 0.0, 0.15, 0.0] * (n // 4))
    poly = np.column_stack([rad * np.cos(ang), rad * np.sin(ang)])
    got, outward = measure.circle_crossings(poly, R)
    want = ang[1::2]                         # the vertices on R, by construction
    assert len(got) == len(want)
    assert np.allclose(np.sort(np.mod(got, 2 * math.pi)), np.sort(np.mod(want, 2 * math.pi)),
                       atol=1e-12)
    assert outward.sum() == n // 4           # half of them leave the circle
    assert len(measure.material_arcs(poly, R)) == n // 4


def test_nut_grooves_counted_where_flank_ends_lie_on_d2():
    # Tr 8×4 (ISO 2904: d2 = d − P/2 = 6 mm, from memory) with 2, 5 or 6 starts: the nut's
    # section has its flank ends exactly on d2 and was refused ("0 thread grooves counted,
    # expected 5"). The grooves are counted again here by shapely: the circle d2 inside the
    # hole's polygon falls into one piece per start.
    import numpy as np
    from shapely.geometry import LinearRing, Polygon
    from shapely.ops import linemerge

    from gen.geometry.screw import nut_section, nut_thread
    from gen.kinds.screw_nut import measure_hole
    from gen.kinds.thread_common import sizes_of

    for starts in (2, 5, 6):
        p = api.make("screw_nut", "n", thread="trapezoidal", diameter=8, pitch=4,
                     starts=starts, length=11)
        assert not p.errors, [f.message for f in p.errors]
    # the same holes measured by both routes
    t = np.linspace(0.0, 2.0 * np.pi, 20001)
    for starts in (2, 5, 6):
        s = sizes_of({"thread": "trapezoidal", "diameter": 8.0, "pitch": 4.0, "starts": starts,
                      "hand": "right"}, None)
        nut = nut_thread(s, 0.0)
        poly = nut_section(nut).polygon(0.005)
        ring = LinearRing(np.column_stack([3.0 * np.cos(t), 3.0 * np.sin(t)]))
        pieces = linemerge(Polygon(poly).intersection(ring))   # joined across the ring's start
        count = len(getattr(pieces, "geoms", [pieces]))
        assert measure_hole(poly, nut)["grooves"] == count == starts
