"""Crossings of an outline with a circle when a vertex lies exactly on it (computed)."""

import math

import numpy as np

from gen import api
from gen.validate import measure


def test_a_vertex_on_the_circle_is_one_crossing():
    # a lobe (half disc of radius 2 closed through a notch) whose flank vertices (0, ±1) lie
    # exactly on R = 1: material from −90° to +90° through 0°, one interval of width π
    # (computed); counting only edges with ends strictly on both sides found none
    theta = np.linspace(-math.pi / 2, math.pi / 2, 41)
    outer = np.column_stack([2 * np.cos(theta), 2 * np.sin(theta)])
    poly = np.vstack([outer, [[0.0, 1.0]], [[-0.5, 0.0]], [[0.0, -1.0]]])
    arcs = measure.material_arcs(poly, 1.0)
    assert len(arcs) == 1
    assert arcs[0, 1] == math.pi or abs(arcs[0, 1] - math.pi) < 1e-12


def test_single_start_screw_section_measures_half_a_pitch():
    # ISO 2904 Tr 8×2, one start: thread thickness P/2 = 1 mm on d2 = 7 mm (from memory);
    # the section's flank vertices fall exactly on the pitch circle
    p = api.make("lead_screw", "s", thread="trapezoidal", diameter=8, pitch=2, starts=1,
                 length=20)
    assert not p.errors, [f.message for f in p.errors]
