"""The ``belt`` subcommand, in-process through argparse and once in a fresh interpreter."""

import argparse
import json
import math
import os
import subprocess
import sys
from pathlib import Path

import pytest

from gen.cli import belt as belt_cmd
from gen.geometry.belt import belt_length

ROOT = Path(__file__).resolve().parents[1]


def parse(argv):
    parser = argparse.ArgumentParser(prog="pitchline")
    belt_cmd.register(parser.add_subparsers(dest="command"))
    return parser.parse_args(argv)


def call(argv, capsys):
    args = parse(argv)
    rc = args.func(args)
    out = capsys.readouterr()
    return rc, out.out, out.err


def test_text_summary_2mm_reference(capsys):
    # open-belt length formula (from memory): 2 mm pitch, 20/60, C 40 → L 164.088 mm
    # (computed); the nearest belt
    # has 82 teeth = 164 mm
    rc, out, err = call(["belt", "--profile", "curv2", "--teeth", "20", "60",
                         "--center", "40"], capsys)
    assert rc == 0 and err == ""
    lines = out.splitlines()
    labels = [ln.split("  ")[0] for ln in lines]
    for label in ("profile", "pulleys", "belt", "center", "asked", "wrap", "in mesh"):
        assert label in labels
    assert "164.088" in out and "82 teeth" in out
    assert "\x1b" not in out                                # no colour codes


def test_json_keys_and_values(capsys):
    rc, out, _ = call(["belt", "--profile", "T5", "--teeth", "15", "45", "--center", "60",
                       "--json"], capsys)
    assert rc == 0                                          # a warning is not an error
    data = json.loads(out)
    for key in ("belt_length", "belt_teeth", "center_distance", "ratio", "wrap_angle",
                "teeth_in_mesh"):
        assert key in data
    # open-belt length formula (from memory): 5 mm, 15/45, C 60 → L 279.631 mm, 5.55 in mesh (computed)
    assert data["requested_length"] == pytest.approx(279.631, abs=5e-4)
    assert data["belt_teeth"] == 56 and data["belt_length"] == pytest.approx(280.0)
    d, D = 75.0 / math.pi, 225.0 / math.pi
    assert belt_length(data["center_distance"], D, d) == pytest.approx(280.0, abs=1e-6)
    assert data["ratio"] == pytest.approx(3.0)
    assert "few-teeth-in-mesh" in [f["code"] for f in data["findings"]]


def test_belt_teeth_and_stock(capsys):
    rc, out, _ = call(["belt", "--profile", "xl", "--teeth", "12", "24", "--belt-teeth",
                       "60", "--json"], capsys)
    data = json.loads(out)
    assert rc == 0 and data["belt_teeth"] == 60
    assert data["requested_center"] is None
    rc, out, _ = call(["belt", "--profile", "curv2", "--teeth", "20", "60", "--center", "40",
                       "--stock", "70", "85", "90", "--json"], capsys)
    assert rc == 0 and json.loads(out)["belt_teeth"] == 85


@pytest.mark.parametrize("argv,needle", [
    (["--profile", "GT9", "--teeth", "20", "40", "--center", "50"], "valid profiles"),
    (["--profile", "T5", "--teeth", "20", "40", "--center", "5"], "too small"),
    (["--profile", "T5", "--teeth", "20", "40", "--belt-teeth", "10"], "too short"),
])
def test_bad_input_exit_2_one_line(argv, needle, capsys):
    rc, out, err = call(["belt"] + argv, capsys)
    assert rc == 2 and out == ""
    assert len(err.strip().splitlines()) == 1 and needle in err
    assert "Traceback" not in err


def test_unknown_profile_lists_all(capsys):
    _, _, err = call(["belt", "--profile", "nope", "--teeth", "20", "40", "--center", "50"],
                     capsys)
    for name in ("MXL", "XL", "L", "H", "T2.5", "T5", "T10", "curv2", "curv3", "curv5"):
        assert name in err


def test_teeth_below_minimum_exit_1(capsys):
    argv = ["belt", "--profile", "H", "--teeth", "12", "30", "--belt-teeth", "80"]
    rc, out, _ = call(argv, capsys)
    assert rc == 1 and "below-min-teeth" in out
    rc, _, _ = call(argv + ["--force"], capsys)
    assert rc == 0


def test_center_and_belt_teeth_are_exclusive(capsys):
    with pytest.raises(SystemExit) as exc:
        parse(["belt", "--profile", "T5", "--teeth", "20", "40", "--center", "50",
               "--belt-teeth", "60"])
    assert exc.value.code == 2
    capsys.readouterr()


SCRIPT = """
import argparse, json, sys
from gen.cli import belt
p = argparse.ArgumentParser()
belt.register(p.add_subparsers())
a = p.parse_args(sys.argv[1:])
rc = a.func(a)
heavy = [m for m in ("cadquery", "OCP", "trimesh") if m in sys.modules]
print(json.dumps(heavy), file=sys.stderr)
sys.exit(rc)
"""


def test_fresh_interpreter_json_and_no_cad_imports():
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    proc = subprocess.run(
        [sys.executable, "-c", SCRIPT, "belt", "--profile", "curv2", "--teeth", "20", "60",
         "--center", "40", "--json"],
        cwd=ROOT, env=env, capture_output=True, text=True, timeout=60)
    assert proc.returncode == 0, proc.stderr
    assert json.loads(proc.stderr.strip().splitlines()[-1]) == []
    data = json.loads(proc.stdout)
    assert data["requested_length"] == pytest.approx(164.088, abs=5e-4)
    assert data["belt_teeth"] == 82
