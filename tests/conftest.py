"""Shared fixtures and helpers for the pitchline tests."""

from __future__ import annotations

import math
import os

import pytest

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
PARAMS = os.path.join(ROOT, "params")


def spur_flank(z, m=2.0, x=0.0, alpha_deg=20.0, profile="A", thinning=0.0, beta_deg=0.0):
    """(sizes, cutter, flank) for a gear made by the project's own generator."""
    from gen.geometry.basic_rack import basic_rack
    from gen.geometry.cylindrical import cutter_for, gear_sizes
    from gen.geometry.generate import generate_flank

    rack = basic_rack(profile, alpha_deg)
    sizes = gear_sizes(z, m, rack, x=x, beta=math.radians(beta_deg), thinning=thinning)
    cutter = cutter_for(sizes, rack)
    return sizes, cutter, generate_flank(z, sizes.rp, cutter, sizes.ra)


@pytest.fixture
def write_yaml(tmp_path):
    def _write(text, name="parts.yaml"):
        p = tmp_path / name
        p.write_text(text)
        return str(p)
    return _write
