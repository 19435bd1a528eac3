"""Shared fixtures and helpers for the pitchline tests."""

from __future__ import annotations

import math
import os

import pytest

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
PARAMS = os.path.join(ROOT, "params")


def slicer_info(path) -> list[dict]:
    """Debian's PrusaSlicer ``--info`` of an STL or 3MF file: one dict per object it reports
    (size_x, manifold, number_of_parts, number_of_facets, volume, …, as text)."""
    import re
    import shutil
    import subprocess

    text = subprocess.run([shutil.which("prusa-slicer"), "--info", str(path)],
                          capture_output=True, text=True, check=True, timeout=120).stdout
    return [dict(re.findall(r"^(\w+)\s*=\s*(.+?)\s*$", block, re.M))
            for block in re.split(r"^\[[^\]]+\]\s*$", text, flags=re.M)[1:]]


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
