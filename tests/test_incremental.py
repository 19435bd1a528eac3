"""Incremental batch builds: unchanged parts are kept, a train's module change rebuilds
exactly that train; parallel jobs give the same bytes."""

import json
import os

from gen.cli import main

TWO_TRAINS = """trains:
  first:
    module: {m1}
    parts:
      a1: {{kind: spur_gear, teeth: 14, face_width: 4}}
      a2: {{kind: spur_gear, teeth: 21, face_width: 4}}
  second:
    module: 1.5
    parts:
      b1: {{kind: spur_gear, teeth: 16, face_width: 4}}
      b2: {{kind: rack, teeth: 6, face_width: 4, height: 5}}
"""


def _status(out):
    man = json.load(open(os.path.join(out, "manifest.json")))
    return {n: p["status"] for n, p in man["parts"].items()}


def test_module_change_rebuilds_only_its_train(tmp_path):
    src = tmp_path / "t.yaml"
    out = str(tmp_path / "out")
    src.write_text(TWO_TRAINS.format(m1=1.0))
    assert main(["build", str(src), "--out", out, "--format", "stl"]) == 0
    assert set(_status(out).values()) == {"built"}
    assert main(["build", str(src), "--out", out, "--format", "stl"]) == 0
    assert set(_status(out).values()) == {"up_to_date"}
    src.write_text(TWO_TRAINS.format(m1=1.25))
    assert main(["build", str(src), "--out", out, "--format", "stl"]) == 0
    assert _status(out) == {"a1": "built", "a2": "built", "b1": "up_to_date", "b2": "up_to_date"}
    # a file changed behind pitchline's back is rebuilt
    with open(os.path.join(out, "b1.stl"), "ab") as fh:
        fh.write(b"x")
    assert main(["build", str(src), "--out", out, "--format", "stl"]) == 0
    assert _status(out)["b1"] == "built"
    # --force rebuilds everything
    assert main(["build", str(src), "--out", out, "--format", "stl", "--force"]) == 0
    assert set(_status(out).values()) == {"built"}


def test_parallel_jobs_give_the_same_files(tmp_path):
    src = tmp_path / "t.yaml"
    src.write_text(TWO_TRAINS.format(m1=1.0))
    one, two = str(tmp_path / "one"), str(tmp_path / "two")
    assert main(["build", str(src), "--out", one, "--format", "stl,3mf"]) == 0
    assert main(["build", str(src), "--out", two, "--format", "stl,3mf", "--jobs", "2"]) == 0
    for f in sorted(os.listdir(one)):
        if f.endswith((".stl", ".3mf")):
            assert open(os.path.join(one, f), "rb").read() == open(os.path.join(two, f), "rb").read(), f
    assert os.path.exists(os.path.join(one, "plate_1.3mf"))   # numbered plates (issue 11)
