"""Bad parameter files: exit 1 or 2, one plain line naming file, part and key, nothing written."""

import os

import pytest

from gen.cli import main

GEAR = """parts:
  pinion:
    kind: spur_gear
    module: 2
    teeth: 20
    face_width: 10
{extra}"""

CASES = [
    # (id, file text, exit code, words that must appear in the message)
    ("missing-key", "parts:\n  pinion:\n    kind: spur_gear\n    module: 2\n    face_width: 8\n",
     1, ["pinion", "teeth", "required"]),
    ("unknown-key", GEAR.format(extra="    teth: 3\n"), 1, ["pinion", "teth", "did you mean 'teeth'"]),
    ("teeth-text", GEAR.replace("teeth: 20", 'teeth: "twenty"').format(extra=""), 1,
     ["pinion", "teeth", "whole number"]),
    ("teeth-fraction", GEAR.replace("teeth: 20", "teeth: 20.5").format(extra=""), 1,
     ["pinion", "teeth", "whole number"]),
    ("module-zero", GEAR.replace("module: 2", "module: 0").format(extra=""), 1,
     ["pinion", "module", "out of range"]),
    ("module-negative", GEAR.replace("module: 2", "module: -2").format(extra=""), 1,
     ["pinion", "module", "out of range"]),
    ("face-nan", GEAR.replace("face_width: 10", "face_width: .nan").format(extra=""), 1,
     ["pinion", "face_width", "finite"]),
    ("module-inf", GEAR.replace("module: 2", "module: .inf").format(extra=""), 1,
     ["pinion", "module", "finite"]),
    ("module-vs-face", GEAR.replace("module: 2", "module: 10").replace("face_width: 10", "face_width: 2")
     .format(extra=""), 1, ["pinion", "face_width", "half the module"]),
    ("bore-too-big", GEAR.format(extra="    bore: 40\n"), 1, ["pinion", "bore", "root circle"]),
    ("flat-too-deep", GEAR.format(extra="    bore: {diameter: 5, flat: 3}\n"), 1,
     ["pinion", "bore", "D-flat"]),
    ("yaml-syntax", "parts:\n  pinion: [kind: spur_gear\n", 2, ["line", "YAML"]),
    ("duplicate-key", GEAR.format(extra="    teeth: 21\n"), 2, ["duplicate key 'teeth'", ":7"]),
    ("duplicate-part", GEAR.format(extra="") + "trains:\n  t:\n    module: 2\n    parts:\n"
     "      pinion: {kind: spur_gear, teeth: 9, face_width: 3}\n", 1, ["duplicate part name 'pinion'"]),
    ("alias-bomb", "a: &a [x,x,x,x,x,x,x,x,x,x]\nb: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a,*a]\n"
     "c: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b,*b]\nd: &d [*c,*c,*c,*c,*c,*c,*c,*c,*c,*c]\n"
     "e: [*d,*d,*d,*d,*d,*d,*d,*d,*d,*d]\n", 2, ["expands"]),
    ("path-escape", GEAR.replace("  pinion:", "  ../../etc/evil:").format(extra=""), 1,
     ["not allowed"]),
    ("unknown-kind", GEAR.replace("spur_gear", "spur_gaer").format(extra=""), 1,
     ["pinion", "kind", "did you mean 'spur_gear'"]),
    ("too-few-teeth", GEAR.replace("teeth: 20", "teeth: 4").format(extra=""), 1,
     ["pinion", "teeth", "outside 6"]),
    ("pointed", GEAR.replace("teeth: 20", "teeth: 8").format(extra="    profile_shift: 1.2\n"), 1,
     ["pinion", "profile_shift", "pointed"]),
    ("rack-length-and-teeth", "parts:\n  r:\n    kind: rack\n    module: 2\n    length: 50\n"
     "    teeth: 8\n    face_width: 5\n    height: 6\n", 1, ["'r'", "length", "not both"]),
    ("unknown-section", GEAR.format(extra="") + "mesh:\n  - parts: [pinion, pinion]\n", 1,
     ["mesh", "did you mean 'meshes'"]),
    ("unknown-profile", GEAR.format(extra="    profile: E\n"), 1, ["pinion", "profile", "A, B, C, D"]),
    ("mesh-module-mismatch", GEAR.format(extra="") + "  wheel: {kind: spur_gear, module: 1.5, teeth: 40, face_width: 10}\n"
     "meshes:\n  - parts: [pinion, wheel]\n", 1, ["pinion+wheel", "module"]),
    ("mesh-angle-mismatch", GEAR.format(extra="") + "  wheel: {kind: spur_gear, module: 2, teeth: 40, face_width: 10,"
     " pressure_angle: 25}\nmeshes:\n  - parts: [pinion, wheel]\n", 1, ["pinion+wheel", "pressure angle"]),
    ("mesh-unknown-part", GEAR.format(extra="") + "meshes:\n  - parts: [pinion, ghost]\n", 1,
     ["ghost", "parts"]),
    ("train-override", "trains:\n  t:\n    module: 2\n    parts:\n      p: {kind: spur_gear, module: 3,"
     " teeth: 20, face_width: 5}\n", 1, ["'p'", "module", "train 't'"]),
    ("empty-file", "", 2, ["empty"]),
    ("hub-too-big", GEAR.format(extra="    hub: {diameter: 60, length: 5}\n"), 1, ["pinion", "hub"]),
]


@pytest.mark.parametrize("case", CASES, ids=[c[0] for c in CASES])
@pytest.mark.parametrize("command", ["check", "build"])
def test_bad_input_is_refused(case, command, tmp_path, capsys):
    name, text, code, words = case
    f = tmp_path / "bad.yaml"
    f.write_text(text)
    out = tmp_path / "out"
    argv = [command, str(f)] + (["--out", str(out)] if command == "build" else [])
    rc = main(argv)
    cap = capsys.readouterr()
    text_out = cap.out + cap.err
    assert rc == code, text_out
    assert "Traceback" not in text_out
    lines = [ln for ln in text_out.splitlines() if "ERR" in ln or ln.startswith("pitchline:")]
    assert lines, text_out
    msg = next((ln for ln in lines if all(w in ln for w in words)), None)
    assert msg is not None, f"no single line holds {words}:\n{text_out}"
    assert "bad.yaml" in msg
    assert not out.exists() or not os.listdir(out)


def test_missing_file_is_exit_2(tmp_path, capsys):
    assert main(["check", str(tmp_path / "nope.yaml")]) == 2
    assert "no such file" in capsys.readouterr().err


def test_unknown_format_is_usage_error(tmp_path, capsys):
    f = tmp_path / "g.yaml"
    f.write_text(GEAR.format(extra=""))
    assert main(["build", str(f), "--out", str(tmp_path / "o"), "--format", "stp"]) == 2
    assert "allowed: step" in capsys.readouterr().err
