"""Bad input for the issue-15 kinds through the command line: exit 1, one line naming the
file, the part and the key, and nothing written."""

import pytest

from gen.cli import main

CASES = [
    # (id, part text, words that one error line must hold)
    ("nut-clearance-closes-thread",
     "  n: {kind: screw_nut, diameter: 8, pitch: 2, length: 10, clearance: 0.6}\n",
     ["part 'n'", "key 'clearance'", "closes the thread"]),
    ("sector-arc-under-one-tooth",
     "  s: {kind: sector_gear, module: 1, teeth: 30, swing: 5, margin: 0, arc: 10, "
     "face_width: 6, bore: 3}\n", ["part 's'", "key 'arc'", "shorter than one tooth"]),
    ("sector-swing-too-large-for-arc",
     "  s: {kind: sector_gear, module: 1, teeth: 30, swing: 60, arc: 40, face_width: 6, "
     "bore: 3}\n", ["part 's'", "key 'swing'", "holds only 3"]),
    ("drum-smaller-than-cable-allows",
     "  d: {kind: cable_drum, cable_diameter: 1, drum_diameter: 20, travel: 100, "
     "cable: steel-7x19}\n", ["part 'd'", "key 'drum_diameter'", "too small"]),
]


@pytest.mark.parametrize("case", CASES, ids=[c[0] for c in CASES])
@pytest.mark.parametrize("command", ["check", "build"])
def test_refused_with_the_key(case, command, tmp_path, capsys):
    name, text, words = case
    f = tmp_path / "bad.yaml"
    f.write_text("parts:\n" + text)
    out = tmp_path / "out"
    argv = [command, str(f)] + (["--out", str(out), "--format", "stl"] if command == "build" else [])
    rc = main(argv)
    cap = capsys.readouterr()
    text_out = cap.out + cap.err
    assert rc == 1, text_out
    assert "Traceback" not in text_out
    line = next((ln for ln in text_out.splitlines() if all(w in ln for w in words)), None)
    assert line is not None and "bad.yaml:2" in line, text_out
    assert not out.exists() or not any(p.suffix == ".stl" for p in out.iterdir())
