"""Command line: help, exit codes, and that `check` never loads the CAD kernel."""

import json
import os
import subprocess
import sys

from conftest import PARAMS, ROOT


def _run(code):
    return subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT,
                          timeout=120)


def test_check_does_not_import_the_kernel():
    code = ("import sys; from gen.cli import main; rc = main(['check', %r]);"
            "heavy = [m for m in ('cadquery', 'OCP', 'trimesh', 'manifold3d') if m in sys.modules];"
            "print(rc, heavy)" % PARAMS)
    r = _run(code)
    assert r.stdout.strip().splitlines()[-1] == "0 []", r.stdout + r.stderr


def test_help_is_light():
    r = _run("import sys; from gen.cli import main\n"
             "try:\n    main(['--help'])\nexcept SystemExit:\n    pass\n"
             "print([m for m in ('cadquery', 'OCP', 'trimesh', 'manifold3d') if m in sys.modules])")
    assert "build" in r.stdout and "check" in r.stdout
    assert r.stdout.strip().splitlines()[-1] == "[]"


def test_module_entry_point_and_json(tmp_path):
    r = subprocess.run([sys.executable, "-m", "gen", "check", PARAMS, "--json"], capture_output=True,
                       text=True, cwd=ROOT, timeout=120)
    assert r.returncode == 0, r.stderr
    doc = json.loads(r.stdout)
    assert doc["ok"] is True
    assert "tray_pinion" in doc["parts"]
    assert doc["parts"]["tray_pinion"]["sizes"]["pitch_diameter"] == 24.0


def test_no_command_is_usage_error():
    r = subprocess.run([sys.executable, "-m", "gen"], capture_output=True, text=True, cwd=ROOT,
                       timeout=60)
    assert r.returncode == 2


def test_new_writes_a_file_that_checks(tmp_path):
    from gen.cli import main
    from gen.kinds.base import KINDS

    for kind in sorted(KINDS):
        assert main(["new", kind, f"x_{kind}", "--dir", str(tmp_path)]) == 0
        path = os.path.join(tmp_path, f"x_{kind}.yaml")
        assert main(["check", path]) in (0,), kind
    # refuses to overwrite
    assert main(["new", "rack", "x_rack", "--dir", str(tmp_path)]) == 2
