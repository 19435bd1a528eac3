"""The public Python API gives what the command line gives, from the same checks.

Reference values: the tray pair's working center distance 43.100 mm (ISO 21771 relations,
computed: inv αw = inv α + 2 tan α (x1+x2)/(z1+z2), aw = a cos α / cos αw, recomputed below);
the open-belt length 164.088 mm for 2 mm pitch, 20/60 teeth, C 40 mm (exact open-belt
formula L = 2C cos φ + π(D+d)/2 + φ(D−d), computed below).
"""

import hashlib
import json
import math

import pytest

from gen import api
from gen.check import check
from gen.cli import main
from gen.errors import ParamError

PINION = dict(module=2, teeth=12, profile_shift=0.4, face_width=10, backlash_allowance=0.12,
              bore={"diameter": 5, "flat": 0.5})
WHEEL = dict(module=2, teeth=30, profile_shift=0.2, face_width=10, backlash_allowance=0.12,
             bore=8, hub={"diameter": 16, "length": 6})


@pytest.fixture(scope="module")
def pair():
    return (api.make("spur_gear", "tray_pinion", **PINION),
            api.make("spur_gear", "tray_wheel", **WHEEL))


def test_api_parts_equal_the_file_parts(pair):
    res = check(["params/tray_indexer.yaml"])
    for part in pair:
        assert dict(part.sizes) == dict(res.models[part.name].sizes)


def test_api_pair_numbers_equal_check_json(pair, capsys):
    got = api.check_pair(*pair, torque=0.15, speed=30)
    assert got.ok
    assert main(["check", "--json", "params/tray_indexer.yaml"]) == 0
    doc = json.loads(capsys.readouterr().out)
    (mesh,) = doc["meshes"]
    for key in ("working_center_distance", "contact_ratio", "backlash_normal"):
        assert got.numbers[key] == pytest.approx(mesh[key], abs=1e-12)
    # computed independently (ISO 21771 relations, see the module docstring)
    a = math.radians(20)
    inv = math.tan(a) - a + 2 * math.tan(a) * 0.6 / 42
    lo, hi = 0.0, 1.2
    for _ in range(100):
        mid = (lo + hi) / 2
        lo, hi = (mid, hi) if math.tan(mid) - mid < inv else (lo, mid)
    assert got.numbers["working_center_distance"] == pytest.approx(
        42 * math.cos(a) / math.cos(lo), abs=1e-9)


def test_api_file_bytes_equal_the_cli_build(pair, tmp_path):
    written = api.write_files(pair[0], str(tmp_path / "api"), ["stl"])
    assert main(["build", "params/tray_indexer.yaml", "--out", str(tmp_path / "cli"),
                 "--format", "stl"]) == 0
    cli = (tmp_path / "cli" / "tray_pinion.stl").read_bytes()
    api_bytes = open(written["stl"], "rb").read()
    assert hashlib.sha256(api_bytes).hexdigest() == hashlib.sha256(cli).hexdigest()


def test_api_trimesh_is_measured_and_watertight(pair):
    tri = api.to_trimesh(pair[1])
    assert tri.is_watertight and tri.volume > 0


def test_api_drive_matches_the_open_belt_formula():
    sol = api.check_drive("curv2", (20, 60), center_distance=40)
    # computed: D = 60·2/π, d = 20·2/π, φ = asin((D−d)/(2C)); L at C = 40 is the exact length,
    # then the nearest whole belt is chosen: its length is a multiple of the 2 mm pitch
    D, d, C = 120 / math.pi, 40 / math.pi, 40.0
    phi = math.asin((D - d) / (2 * C))
    L = 2 * C * math.cos(phi) + math.pi * (D + d) / 2 + phi * (D - d)
    assert L == pytest.approx(164.088, abs=1e-3)
    assert sol.belt_teeth == round(L / 2)


def test_api_errors_use_the_cli_words():
    with pytest.raises(ParamError) as exc:
        api.make("spur_gear", "g", module=2, teeth=20, face_width=8, teth=3)
    msg = str(exc.value)
    assert msg.startswith("<python>, part 'g', key 'teth': unknown key 'teth'; did you mean")
    with pytest.raises(ParamError, match="key 'module': out of range"):
        api.make("spur_gear", "g", module=-2, teeth=20, face_width=8)


def test_api_refuses_a_failing_part_where_a_checked_result_is_asked():
    thin = api.make("spur_gear", "thin", module=1, teeth=20, face_width=5,
                    hub={"diameter": 30, "length": 3})   # hub past the root circle
    assert thin.errors
    with pytest.raises(api.CheckFailed) as exc:
        api.to_trimesh(thin)
    assert exc.value.findings == list(thin.findings)


def test_api_design_from_a_mapping():
    res = api.check_design({
        "parts": {"p": {"kind": "spur_gear", "module": 1, "teeth": 18, "face_width": 5},
                  "w": {"kind": "spur_gear", "module": 1, "teeth": 36, "face_width": 5}},
        "meshes": [{"parts": ["p", "w"]}]})
    assert res.ok and res.pairs[0]["numbers"]["center_distance"] == pytest.approx(27.0)
