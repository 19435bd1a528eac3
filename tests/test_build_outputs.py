"""Issue 11 items 5–8 through ``pitchline build``: numbered plates or exit 1 (never a stale
plate), folder and manifest always agree, DXF says when a part has none and offers closed
polylines, manifest sizes of a pulley and a stable ``source``. Triangle formats only (cheap)."""

from __future__ import annotations

import json
import math
import os

import numpy as np
import pytest

from gen.cli import main
from gen.export.readback import check_written

PARTS = """parts:
  small_gear: {kind: spur_gear, module: 1, teeth: 20, face_width: 4}
  big_gear: {kind: spur_gear, module: 1, teeth: 30, face_width: 4}
  bar: {kind: rack, module: 1, teeth: 10, face_width: 4, height: 5}
  corner: {kind: miter_gear, module: 1, teeth: 16, face_width: 3, bore: 3}
  belt_wheel: {kind: timing_pulley, profile: curv2, teeth: 20, belt_width: 6, bore: 5,
               fit_allowance: 0.05}
"""


@pytest.fixture
def project(tmp_path):
    folder = tmp_path / "proj"
    folder.mkdir()
    (folder / "parts.yaml").write_text(PARTS)
    return folder


def _manifest(out):
    return json.load(open(os.path.join(out, "manifest.json")))


def _listed(doc):
    names = {"manifest.json", "report.html"}   # the whole-build page is written every build
    for entry in doc["parts"].values():
        names |= {f["path"] for f in entry["files"].values()}
    names |= {p["path"] for p in doc["plates"]}
    return names


def test_parts_that_need_two_plates_get_two_plates(project, tmp_path):
    out = str(tmp_path / "out")
    # footprints (mm, computed): tip diameters 22 and 32, rack 10 π = 31.4 × 6, pulley about
    # 13 + flanges, miter about 18: they cannot share one 40 × 40 plate with 5 mm gaps
    assert main(["build", str(project), "--out", out, "--format", "stl,3mf",
                 "--plate", "40x40"]) == 0
    doc = _manifest(out)
    plates = doc["plates"]
    assert len(plates) >= 2
    assert [p["path"] for p in plates] == [f"plate_{i}.3mf" for i in range(1, len(plates) + 1)]
    on_plates = sorted(n for p in plates for n in p["parts"])
    assert on_plates == sorted(doc["parts"])
    for p in plates:                       # every plate re-reads as closed solids
        reps = check_written(os.path.join(out, p["path"]), "3mf", len(p["parts"]))
        assert all(r.ok for r in reps)
    assert not os.path.exists(os.path.join(out, "plate.3mf"))
    # nothing changed: the plates are kept as written (not packed and written again)
    stamps = {p["path"]: os.stat(os.path.join(out, p["path"])).st_mtime_ns for p in plates}
    assert main(["build", str(project), "--out", out, "--format", "stl,3mf",
                 "--plate", "40x40"]) == 0
    assert _manifest(out)["plates"] == plates
    assert {p: os.stat(os.path.join(out, p)).st_mtime_ns for p in stamps} == stamps
    # a plate no part fits on: exit 1, and no plate of the earlier build is left behind
    assert main(["build", str(project), "--out", out, "--format", "stl,3mf",
                 "--plate", "15x15"]) == 1
    assert not [f for f in os.listdir(out) if f.startswith("plate")]
    assert _manifest(out)["plates"] == []


def test_folder_and_manifest_agree_after_fewer_formats(project, tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    (out / "notes.txt").write_text("mine")             # not pitchline's: never touched
    assert main(["build", str(project), "--out", str(out), "--format", "stl,3mf,dxf"]) == 0
    assert set(os.listdir(out)) == _listed(_manifest(out)) | {"notes.txt"}
    assert (out / "small_gear.dxf").exists() and (out / "plate_1.3mf").exists()
    assert main(["build", str(project), "--out", str(out), "--format", "stl"]) == 0
    doc = _manifest(out)
    assert set(os.listdir(out)) == _listed(doc) | {"notes.txt"}
    assert not [f for f in os.listdir(out) if f.endswith((".3mf", ".dxf"))]
    assert (out / "notes.txt").read_text() == "mine"


def test_dxf_says_when_a_part_has_none_and_offers_polylines(project, tmp_path, capsys):
    ezdxf = pytest.importorskip("ezdxf")
    out = str(tmp_path / "out")
    assert main(["build", str(project), "--out", out, "--format", "dxf",
                 "--dxf-curves", "both"]) == 0
    text = capsys.readouterr().out
    assert "corner" in text and "no DXF" in text             # the miter gear is named
    assert not os.path.exists(os.path.join(out, "corner.dxf"))
    doc = ezdxf.readfile(os.path.join(out, "small_gear.dxf"))
    msp = doc.modelspace()
    splines = [e for e in msp if e.dxftype() == "SPLINE"]
    polys = [e for e in msp if e.dxftype() == "LWPOLYLINE"]
    assert splines and all(e.dxf.layer == "small_gear" for e in splines)
    assert len(polys) == 1 and polys[0].closed and polys[0].dxf.layer == "small_gear_polyline"
    pts = np.array([(x, y) for x, y, *_ in polys[0].get_points()])
    # every spline fit point (an exact sample of the generated flank) lies within the chord
    # tolerance (0.01 mm, the default) of the polyline: point-to-segment distances (computed)
    a, b = pts, np.roll(pts, -1, axis=0)
    for sp in splines:
        for q in np.asarray(sp.fit_points)[:, :2]:
            t = np.clip(np.einsum("ij,ij->i", q - a, b - a) /
                        np.maximum(np.einsum("ij,ij->i", b - a, b - a), 1e-300), 0.0, 1.0)
            d = np.hypot(*(a + t[:, None] * (b - a) - q).T).min()
            assert d <= 0.01 + 1e-9
    # polyline only: no splines at all, for cutting software that reads none
    out2 = str(tmp_path / "out2")
    assert main(["build", str(project), "--out", out2, "--format", "dxf",
                 "--dxf-curves", "polyline"]) == 0
    kinds = {e.dxftype() for e in ezdxf.readfile(os.path.join(out2, "bar.dxf")).modelspace()}
    assert kinds == {"LWPOLYLINE"}


def test_pulley_sizes_and_stable_sources(project, tmp_path, monkeypatch, write_yaml):
    out = str(tmp_path / "out")
    monkeypatch.chdir(tmp_path)                        # run from outside the project folder
    assert main(["build", str(project), "--out", out, "--format", "stl"]) == 0
    doc = _manifest(out)
    pulley = doc["parts"]["belt_wheel"]["sizes"]
    # curv2 (2 mm pitch), 20 teeth: d_p = z p / π, d_o = d_p − 2 a (ISO 5288 form; a from the
    # profile table) is the nominal; the generated outline is smaller by 2 × allowance
    assert pulley["pitch_diameter"] == pytest.approx(20 * 2.0 / math.pi, abs=1e-9)
    assert pulley["outside_diameter_fitted"] == pytest.approx(
        pulley["outside_diameter"] - 2 * 0.05, abs=1e-6)
    assert doc["parts"]["small_gear"]["source"] == "parts.yaml"
    monkeypatch.chdir(project)
    out2 = str(tmp_path / "out2")
    assert main(["build", ".", "--out", out2, "--format", "stl"]) == 0
    assert _manifest(out2)["parts"]["small_gear"]["source"] == "parts.yaml"


WRIST = """assemblies:
  wrist: {kind: bevel_differential, module: 1, input_teeth: 16, output_teeth: 12,
          face_width: 3, input_bore: 3, output_bore: 3}
"""


def test_assembly_gears_have_a_source(tmp_path):
    folder = tmp_path / "p"
    folder.mkdir()
    (folder / "w.yaml").write_text(WRIST)
    out = str(tmp_path / "out")
    assert main(["build", str(folder / "w.yaml"), "--out", out, "--format", "stl"]) == 0
    parts = _manifest(out)["parts"]
    gears = [n for n, p in parts.items() if p.get("assembly") == "wrist"]
    assert gears and all(parts[n]["source"] == "w.yaml" for n in gears)
    assert parts["assembly:wrist"]["source"] == "w.yaml"
