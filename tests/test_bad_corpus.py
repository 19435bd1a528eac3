"""Issue 12 corpus: every bad or odd input is answered in one line, exit 1 or 2, no traceback.

Each case runs through ``check`` and ``build`` (in process, via :func:`gen.cli.main`). The
assertions: the exit code, no traceback and no "internal error", one line holding the file
name, the line number and the words that name the part/section entry and key, and that a
build wrote nothing at all into its output folder. Rules checked are common practice for
parameter files (portable file names, YAML 1.1 as published at yaml.org) unless noted.
"""

import os

import pytest

from gen.cli import main

GEAR = "parts:\n  p:\n    kind: spur_gear\n    module: 2\n    teeth: 20\n    face_width: 10\n"
BIG = "1" + "0" * 400          # a whole number far beyond the float range (~1.8e308)
DRIVE = "drives:\n  d: {profile: curv3, teeth: [20, 40], %s}\n"

# (id, text, exit code, words one line must hold (besides the file name))
CASES = [
    # item 3: whole numbers beyond the float range, in every section
    ("bigint-part", GEAR.replace("face_width: 10", f"face_width: {BIG}"), 2,
     [":6", "part 'p'", "face_width", "too large"]),
    ("bigint-train", "trains:\n  t:\n    module: " + BIG + "\n    parts:\n      p: {kind: spur_gear,"
     " teeth: 20, face_width: 5}\n", 2, [":3", "train 't'", "module", "too large"]),
    ("bigint-mesh", GEAR + "  q: {kind: spur_gear, module: 2, teeth: 30, face_width: 10}\n"
     f"meshes:\n  - parts: [p, q]\n    center_distance: {BIG}\n", 2,
     [":10", "mesh 'meshes[0]'", "center_distance", "too large"]),
    ("bigint-drive", DRIVE % f"belt_teeth: {BIG}", 2, [":2", "drive 'd'", "belt_teeth", "too large"]),
    ("bigint-fit", GEAR + f"fits:\n  f: {{flank_clearance: {BIG}}}\n", 2,
     [":8", "fit 'f'", "flank_clearance", "too large"]),
    ("float-overflow", GEAR.replace("module: 2", "module: 1e400"), 2,
     [":4", "part 'p'", "module", "too large"]),
    ("drive-center-1e308", DRIVE % "center_distance: 1.0e+308", 1,
     [":2", "drive 'd'", "center_distance", "out of range"]),
    ("drive-center-inf", DRIVE % "center_distance: .inf", 1,
     [":2", "drive 'd'", "center_distance", "finite"]),
    ("drive-belt-1e308", DRIVE % "belt_teeth: 1.0e+308", 1,
     [":2", "drive 'd'", "belt_teeth", "out of range"]),
    # item 8: the plain exponent form is a number, so the range check answers
    ("module-1e308", GEAR.replace("module: 2", "module: 1e308"), 1,
     [":4", "part 'p'", "module", "out of range"]),
    # item 4: deep nesting inside the size limit
    ("nested-lists", "parts: " + "[" * 3000 + "]" * 3000 + "\n", 2, [":1", "nested"]),
    ("nested-maps", "parts: " + "{a: " * 900 + "1" + "}" * 900 + "\n", 2, [":1", "nested"]),
    # item 7: drive errors name their own key
    ("drive-stock", DRIVE % "belt_teeth: 100, stock: [x]", 1, ["drive 'd'", "stock[0]"]),
    ("drive-adjust", DRIVE % "belt_teeth: 100, adjust: -3", 1, ["drive 'd'", "'adjust'"]),
    ("drive-teeth", "drives:\n  d: {profile: curv3, teeth: [20], belt_teeth: 100}\n", 1,
     ["drive 'd'", "'teeth'"]),
    ("drive-profile", "drives:\n  d: {profile: gt9, teeth: [20, 40], belt_teeth: 100}\n", 1,
     ["drive 'd'", "'profile'"]),
    ("drive-no-profile", "drives:\n  d: {teeth: [20, 40], belt_teeth: 100}\n", 1,
     ["drive 'd'", "'profile'"]),
    # item 10: YAML syntax in plain words, line kept
    ("yaml-indent", "parts:\n  p:\n    kind: spur_gear\n   module: 2\n", 2,
     [":4", "indentation"]),
    ("yaml-tab", "parts:\n\tp: 1\n", 2, [":2", "tab"]),
    ("yaml-open-list", "parts:\n  p: {kind: spur_gear, teeth: [1, 2\n", 2, ["'['", "closed"]),
    ("yaml-open-quote", "parts:\n  p: {kind: 'spur_gear}\n", 2, ["quote"]),
    ("yaml-colon", "parts:\n  p: kind: spur_gear\n", 2, [":2", "':'"]),
    ("yaml-two-docs", GEAR + "---\n" + GEAR, 2, [":7", "one"]),
    ("yaml-alias", "parts:\n  p: *x\n", 2, [":2", "anchor"]),
    # item 11: a key held at zero says why and what to use
    ("spur-helix", GEAR + "    helix_angle: 10\n", 1,
     [":7", "part 'p'", "helix_angle", "spur gears have none", "helical_gear"]),
    ("train-helix", "trains:\n  t:\n    module: 2\n    helix_angle: 15\n    parts:\n"
     "      p: {kind: spur_gear, teeth: 20, face_width: 5}\n", 1,
     [":4", "part 'p'", "helix_angle", "helical_gear", "train 't'"]),
    ("rack-helix", "parts:\n  r: {kind: rack, module: 1, length: 50, face_width: 5, height: 5,"
     " helix_angle: 20}\n", 1, ["part 'r'", "helix_angle", "helical_rack"]),
    # item 12: names that are not portable file names
    ("name-com1", GEAR.replace("  p:", "  COM1:"), 1, [":2", "COM1", "device name"]),
    ("name-lpt9", GEAR.replace("  p:", "  lpt9:"), 1, [":2", "lpt9", "device name"]),
    ("name-con-ext", GEAR.replace("  p:", "  con.gear:"), 1, [":2", "con.gear", "device name"]),
    ("name-dot", GEAR.replace("  p:", "  gear.:"), 1, [":2", "gear.", "dot"]),
    ("name-case", GEAR + "  P: {kind: spur_gear, module: 2, teeth: 30, face_width: 10}\n", 1,
     [":7", "'P'", "'p'", "letter case"]),
    ("name-part-vs-assembly", GEAR.replace("  p:", "  w:") +
     "assemblies:\n  W: {kind: bevel_differential, module: 1.5, input_teeth: 24,"
     " output_teeth: 16, face_width: 7}\n", 1, [":8", "'W'", "'w'", "collide"]),
    ("name-space", GEAR.replace("  p:", "  my gear:"), 1, [":2", "my gear", "not allowed"]),
    ("name-manifest", GEAR.replace("  p:", "  Manifest:"), 1, [":2", "Manifest", "output"]),
    # item 13: unknown tags
    ("tag-map", GEAR.replace("  p:", "  p: !gear"), 2, [":2", "part 'p'", "!gear", "tag"]),
    ("tag-python", GEAR.replace("  p:", "  p: !!python/object:os.system"), 2,
     [":2", "part 'p'", "python/object", "tag"]),
    ("tag-scalar", GEAR.replace("teeth: 20", "teeth: !big 20"), 2,
     [":5", "part 'p'", "teeth", "!big"]),
    ("tag-binary", GEAR.replace("teeth: 20", "teeth: !!binary aGk="), 2,
     [":5", "part 'p'", "teeth", "binary"]),
    ("tag-set", "parts: !!set {a, b}\n", 2, [":1", "set"]),
    # item 15: assemblies as a list
    ("assemblies-list", "assemblies:\n  - {kind: bevel_differential, module: 1.5, input_teeth: 24,"
     " output_teeth: 16, face_width: 7}\n", 1, [":1", "assemblies", "mapping of names"]),
    # item 16: absurd work refused with its limit
    ("rack-huge", "parts:\n  r: {kind: rack, module: 0.05, length: 5000, face_width: 5,"
     " height: 3}\n", 1, [":2", "part 'r'", "length", "budget of 150000"]),
    # odd but refused from before: merge keys, duplicate keys, non-mapping top level
    ("merge-key", "base: &b {kind: spur_gear}\nparts:\n  p: {<<: *b, module: 2}\n", 2, ["merge"]),
    ("top-list", "- 1\n- 2\n", 2, [":1", "top level"]),
    ("top-text", "hello\n", 2, [":1", "top level"]),
    ("parts-list", "parts: [1, 2]\n", 1, [":1", "'parts'", "mapping"]),
    ("not-utf8", "parts:\n  p: caf\xe9\n", 2, [":2", "UTF-8"]),
    ("huge-text-value", GEAR.replace("teeth: 20", "teeth: " + "x" * 5000), 1,
     [":5", "part 'p'", "teeth", "whole number"]),
]


def _run(command, path, out):
    argv = [command, str(path)] + (["--out", str(out), "--format", "stl"]
                                    if command == "build" else [])
    return main(argv)


@pytest.mark.parametrize("case", CASES, ids=[c[0] for c in CASES])
@pytest.mark.parametrize("command", ["check", "build"])
def test_corpus_case_is_refused_in_one_line(case, command, tmp_path, capsys):
    name, text, code, words = case
    f = tmp_path / "bad.yaml"
    f.write_bytes(text.encode("latin-1") if name == "not-utf8" else text.encode())
    out = tmp_path / "out"
    rc = _run(command, f, out)
    cap = capsys.readouterr()
    text_out = cap.out + cap.err
    assert rc == code, text_out
    assert "Traceback" not in text_out and "internal error" not in text_out
    hit = [ln for ln in text_out.splitlines() if "bad.yaml" in ln and all(w in ln for w in words)]
    assert hit, f"no line names bad.yaml and {words}:\n{text_out}"
    assert len(hit[0]) < 400, hit[0]            # one readable line, not a dump
    assert not out.exists() or not os.listdir(out)


def test_corpus_counts(capsys):
    """The report's figures: every case is tried through check and build."""
    assert len(CASES) >= 45
    assert len({c[0] for c in CASES}) == len(CASES)
