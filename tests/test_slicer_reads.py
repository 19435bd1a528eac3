"""A real slicer as the judge of the printable files: Debian's PrusaSlicer reads every STL and
3MF a build writes (and the print plate), finds each object manifold and in one piece with the
volume of the manifest, and slices the plate to G-code whose top layer is the face width.

Skips, saying why, where ``prusa-slicer`` is not installed (``.ci/run`` installs it).
"""

from __future__ import annotations

import json
import re
import shutil
import struct
import subprocess

import pytest

from conftest import slicer_info
from gen.cli import main

SLICER = shutil.which("prusa-slicer")
pytestmark = pytest.mark.skipif(SLICER is None,
                                reason="prusa-slicer is not installed (Debian package prusa-slicer)")

# two parts of the greenhouse scenario (values invented for this test, in the keys' ranges)
PARTS = """parts:
  seed_tray_pinion:
    kind: spur_gear
    module: 1.5
    teeth: 14
    profile_shift: 0.2
    face_width: 8
    bore: 5
  seed_tray_wheel:
    kind: helical_gear
    module: 1.5
    teeth: 30
    helix_angle: 20
    face_width: 8
    bore: 6
"""
FACE_WIDTH = 8.0


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    root = tmp_path_factory.mktemp("slicer")
    src = root / "tray.yaml"
    src.write_text(PARTS)
    out = root / "out"
    assert main(["build", str(src), "--out", str(out), "--format", "stl,3mf"]) == 0
    return out


def _stl_facets(path) -> int:
    with open(path, "rb") as fh:           # binary STL: 80-byte header, uint32 facet count
        fh.seek(80)
        return struct.unpack("<I", fh.read(4))[0]


def test_slicer_reads_every_file_as_one_manifold_object_of_the_manifest_volume(built):
    doc = json.loads((built / "manifest.json").read_text())
    assert len(doc["parts"]) == 2
    for name, entry in doc["parts"].items():
        volume = entry["mass_properties"]["volume_mm3"]
        facets = _stl_facets(built / entry["files"]["stl"]["path"])
        for fmt in ("stl", "3mf"):
            objs = slicer_info(built / entry["files"][fmt]["path"])
            assert len(objs) == 1, (name, fmt)
            o = objs[0]
            assert o["manifold"] == "yes", (name, fmt)
            assert int(o["number_of_parts"]) == 1, (name, fmt)
            assert int(o["number_of_facets"]) == facets, (name, fmt)
            # float32 vertices in both files: 1e-5 relative
            assert float(o["volume"]) == pytest.approx(volume, rel=1e-5), (name, fmt)
            assert float(o["size_z"]) == pytest.approx(FACE_WIDTH, abs=1e-5), (name, fmt)


def test_slicer_reads_the_plate_and_slices_it(built, tmp_path):
    plates = sorted(built.glob("plate_*.3mf"))
    assert len(plates) == 1
    objs = slicer_info(plates[0])
    doc = json.loads((built / "manifest.json").read_text())
    volumes = sorted(e["mass_properties"]["volume_mm3"] for e in doc["parts"].values())
    assert len(objs) == 2 and all(o["manifold"] == "yes" for o in objs)
    assert sorted(float(o["volume"]) for o in objs) == pytest.approx(volumes, rel=1e-5)
    for o in objs:   # on the build's 220 × 220 mm plate, standing on it
        assert 0.0 <= float(o["min_x"]) and float(o["max_x"]) <= 220.0
        assert 0.0 <= float(o["min_y"]) and float(o["max_y"]) <= 220.0
        assert float(o["min_z"]) == pytest.approx(0.0, abs=1e-6)
    gcode = tmp_path / "plate.gcode"
    subprocess.run([SLICER, "--export-gcode", str(plates[0]), "--output", str(gcode)],
                   capture_output=True, text=True, check=True, timeout=300)
    text = gcode.read_text()
    layers = [float(z) for z in re.findall(r"^;Z:([\d.]+)\s*$", text, re.M)]
    # the slicer's default layers (0.2 mm first and after, from memory) up to the face width
    assert layers and max(layers) == pytest.approx(FACE_WIDTH, abs=0.2)
    assert re.search(r"^; estimated printing time", text, re.M)
