"""Issue 12: faults around the parameter files — output folders, manifests, missing packages,
full disks, odd files, the belt command's numbers, ``pitchline new`` — each answered in one
line with exit 1 or 2 and no traceback.
"""

import errno
import importlib
import json
import os
import subprocess
import sys

import pytest

from gen.cli import main

GEAR = "parts:\n  p:\n    kind: spur_gear\n    module: 2\n    teeth: 12\n    face_width: 4\n"
ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))


@pytest.fixture
def gear(tmp_path):
    f = tmp_path / "g.yaml"
    f.write_text(GEAR)
    return f


def _clean(cap):
    text = cap.out + cap.err
    assert "Traceback" not in text and "internal error" not in text, text
    return text


# --- item 1: the output folder
@pytest.mark.parametrize("where", ["file", "under-file"])
def test_out_that_is_a_file_is_a_usage_error(where, gear, tmp_path, capsys):
    blocker = tmp_path / "blocker"
    blocker.write_text("x")
    out = blocker if where == "file" else blocker / "sub"
    assert main(["build", str(gear), "--out", str(out), "--format", "stl"]) == 2
    text = _clean(capsys.readouterr())
    assert "blocker" in text and "is a file" in text
    assert blocker.read_text() == "x"


def test_read_only_out_is_a_usage_error(gear, tmp_path, capsys, monkeypatch):
    # a read-only file system cannot be made in a test; its errno (EROFS) is what the OS
    # returns on one
    import tempfile

    def refuse(*a, **k):
        raise OSError(errno.EROFS, os.strerror(errno.EROFS))

    monkeypatch.setattr(tempfile, "mkstemp", refuse)
    assert main(["build", str(gear), "--out", str(tmp_path / "o"), "--format", "stl"]) == 2
    text = _clean(capsys.readouterr())
    assert "Read-only file system" in text and "o" in text


# --- item 2: a manifest of another shape
@pytest.mark.parametrize("doc", [[], {"parts": []}, {"parts": {"p": "x"}},
                                 {"parts": {"p": {"files": {"stl": {"path": 3}}}}}])
def test_foreign_manifest_is_treated_as_absent(doc, gear, tmp_path, capsys):
    out = tmp_path / "o"
    out.mkdir()
    from gen import __version__
    if isinstance(doc, dict):
        doc["version"] = __version__
    (out / "manifest.json").write_text(json.dumps(doc))
    assert main(["build", str(gear), "--out", str(out), "--format", "stl"]) == 0
    text = _clean(capsys.readouterr())
    assert "treated as absent" in text
    assert (out / "p.stl").exists()
    assert json.loads((out / "manifest.json").read_text())["parts"]["p"]["status"] == "built"


# --- item 5: a format whose package is missing is refused before anything is written
def test_3mf_without_lxml_is_refused_up_front(gear, tmp_path, capsys, monkeypatch):
    monkeypatch.setitem(sys.modules, "lxml", None)   # import lxml now fails
    out = tmp_path / "o"
    assert main(["build", str(gear), "--out", str(out), "--format", "stl,3mf"]) == 2
    text = _clean(capsys.readouterr())
    assert "lxml" in text and "3mf" in text
    assert not out.exists()


# --- item 6: a command that cannot load is listed and says why; --plate without assert
def test_broken_command_module_is_reported(monkeypatch, capsys):
    real = importlib.import_module

    def fake(name, *a):
        if name == "gen.cli.ratio":
            raise ImportError("No module named 'networkx'")
        return real(name, *a)

    monkeypatch.setattr(importlib, "import_module", fake)
    with pytest.raises(SystemExit):
        main(["--help"])
    assert "ratio" in capsys.readouterr().out
    assert main(["ratio", "3"]) == 2
    assert "networkx" in capsys.readouterr().err


@pytest.mark.parametrize("plate", ["0x220", "220", "axb", "nanx10", "infx10", "-5x10"])
def test_bad_plate_refused_under_python_O(plate, gear, tmp_path):
    # python -O strips assert statements: the check must not rely on them
    out = tmp_path / "o"
    r = subprocess.run([sys.executable, "-O", "-m", "gen", "build", str(gear), "--out", str(out),
                        "--format", "3mf", "--plate", plate], capture_output=True, text=True,
                       cwd=ROOT, env=dict(os.environ, PYTHONPATH=ROOT), timeout=120)
    assert r.returncode == 2, r.stdout + r.stderr
    assert "--plate" in r.stderr and "Traceback" not in r.stderr
    assert not out.exists()


# --- item 9: a full disk names the reason and the file, and leaves no partial file
def test_disk_full_names_reason_and_file(gear, tmp_path, capsys, monkeypatch):
    real_fdopen = os.fdopen

    class Full:
        def __init__(self, fd, mode):
            self.fh = real_fdopen(fd, mode)

        def __enter__(self):
            return self

        def __exit__(self, *exc):
            self.fh.close()

        def __getattr__(self, name):
            return getattr(self.fh, name)

        def read(self, *a):
            return self.fh.read(*a)

        def write(self, data):  # every write to a file opened for writing: the disk is full
            raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))

    monkeypatch.setattr(os, "fdopen", Full)
    out = tmp_path / "o"
    assert main(["build", str(gear), "--out", str(out), "--format", "stl"]) == 1
    text = _clean(capsys.readouterr())
    line = next(ln for ln in text.splitlines() if "no space left" in ln)
    assert "p.stl" in line or "manifest.json" in line
    assert not [n for n in os.listdir(out) if n.startswith(".partial-")]


def test_step_writer_failure_names_a_full_device(tmp_path, monkeypatch):
    from gen.errors import ExportError
    from gen.export import step

    class Stat:
        f_bavail = 0
        f_favail = 100
        f_flag = 0

    monkeypatch.setattr(os, "statvfs", lambda p: Stat())
    with pytest.raises(ExportError, match="no space left on the device"):
        step.through_file(str(tmp_path), lambda tmp: False, "p")
    assert os.listdir(tmp_path) == []


# --- item 14: files that are not regular files
def test_fifo_is_refused_without_hanging(tmp_path, capsys):
    fifo = tmp_path / "pipe.yaml"
    os.mkfifo(fifo)
    for cmd in (["check", str(fifo)], ["build", str(fifo), "--out", str(tmp_path / "o")]):
        assert main(cmd) == 2
        text = _clean(capsys.readouterr())
        assert "pipe.yaml" in text and "FIFO" in text


def test_symlink_to_dev_zero_is_refused(tmp_path, capsys):
    link = tmp_path / "zero.yaml"
    os.symlink("/dev/zero", link)
    assert main(["check", str(link)]) == 2
    text = _clean(capsys.readouterr())
    assert "zero.yaml" in text and "device" in text


def test_file_over_the_limit_is_refused(tmp_path, capsys):
    from gen.params.yamlio import MAX_FILE_BYTES

    f = tmp_path / "big.yaml"
    f.write_text("# " + "x" * MAX_FILE_BYTES + "\n")
    assert main(["check", str(f)]) == 2
    assert "byte limit" in _clean(capsys.readouterr())


# --- items 3 and 8: the belt command's numbers
@pytest.mark.parametrize("args, words", [
    (["--center", "1e308"], "too large"),
    (["--center", "inf"], "finite"),
    (["--center", "nan"], "finite"),
    (["--belt-teeth", "1" + "0" * 400], "too large"),
    (["--center", "100", "--stock", "1" + "0" * 30], "too large"),
])
def test_belt_command_refuses_huge_and_non_finite(args, words, capsys):
    assert main(["belt", "--profile", "curv3", "--teeth", "20", "40"] + args) == 2
    err = _clean(capsys.readouterr()).splitlines()
    assert len(err) == 1 and words in err[0]


def test_belt_command_refuses_huge_pulley(capsys):
    assert main(["belt", "--profile", "curv3", "--teeth", "20", "1" + "0" * 400,
                 "--center", "100"]) == 2
    assert "too large" in _clean(capsys.readouterr())


# --- item 8: every numeric key of every table has both bounds
def _numeric_keys():
    from gen.assemblies import ASSEMBLY_KINDS
    from gen.check.drives import DRIVE_KEYS
    from gen.check.meshes import MESH_KEYS
    from gen.kinds.base import KINDS
    from gen.params import fits

    tables = {"meshes": MESH_KEYS, "drives": DRIVE_KEYS}
    tables.update({k: importlib.import_module(f"gen.kinds.{m}").KEYS for k, m in KINDS.items()})
    tables.update({k: importlib.import_module(f"gen.assemblies.{m}").KEYS
                   for k, m in ASSEMBLY_KINDS.items()})
    tables.update({f"fits.{n}": v for n, v in vars(fits).items()
                   if isinstance(v, tuple) and v and hasattr(v[0], "kind")})

    def walk(keys, pre):
        for k in keys:
            if k.kind == "map":
                yield from walk(k.sub, pre + k.name + ".")
            elif k.kind in ("int", "float", "angle") or (k.kind == "list" and k.item != "str"):
                yield pre + k.name, k

    return [(t, n, k) for t, keys in tables.items() for n, k in walk(keys, "")]


def test_every_numeric_key_has_an_upper_and_lower_bound():
    keys = _numeric_keys()
    assert len(keys) > 50
    unbounded = [f"{t}:{n}" for t, n, k in keys if k.hi is None or k.lo is None]
    assert not unbounded, unbounded


# --- item 8: the plain exponent form is a number (YAML 1.1 alone reads it as text)
@pytest.mark.parametrize("text, value", [("1e3", 1000.0), ("-2E-2", -0.02), ("+5e+1", 50.0),
                                          ("1.5e2", 150.0), ("1.0e+2", 100.0)])
def test_plain_exponent_is_a_number(text, value):
    from gen.params.yamlio import load_text

    assert load_text(f"a: {text}\n").data["a"] == pytest.approx(value, rel=1e-15)


@pytest.mark.parametrize("text", ["1e", "e5", "1e3x", "'1e3'", "v1e3"])
def test_exponent_look_alikes_stay_text(text):
    from gen.params.yamlio import load_text

    assert isinstance(load_text(f"a: {text}\n").data["a"], str)


# --- item 17 (trains): a pasted part repeating the train's values is valid, others are not
def test_train_accepts_an_equal_repeated_value_and_refuses_a_different_one(tmp_path, capsys):
    f = tmp_path / "t.yaml"
    body = "trains:\n  t:\n    module: 2\n    pressure_angle: 20\n    parts:\n" \
           "      p: {{kind: spur_gear, module: {m}, pressure_angle: 20.0, teeth: 20, face_width: 5}}\n"
    f.write_text(body.format(m="2.0"))
    assert main(["check", str(f)]) == 0
    f.write_text(body.format(m="3"))
    assert main(["check", str(f)]) == 1
    assert "set by train 't'" in _clean(capsys.readouterr())
