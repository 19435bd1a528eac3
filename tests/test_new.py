"""``pitchline new`` (issue 12 item 17): names as check takes them, inside --dir, starters for
sets that check cleanly, required keys marked, the bevel module called what the README calls it.
"""

import os
import re

import pytest

from gen.cli import main
from gen.kinds.base import KINDS


@pytest.mark.parametrize("name", ["my gear", "../../x", "{abs}/abs_x", "COM1", "con.gear", "a.",
                                  "sub/x", "_x", "x" * 65])
def test_names_check_would_refuse_are_refused(name, tmp_path, capsys):
    d = tmp_path / "a" / "d"
    d.mkdir(parents=True)
    name = name.format(abs=tmp_path)   # an absolute name outside --dir
    assert main(["new", "spur_gear", name, "--dir", str(d)]) == 2
    assert "not allowed" in capsys.readouterr().err
    assert os.listdir(d) == [] and os.listdir(tmp_path) == ["a"]
    assert os.listdir(tmp_path / "a") == ["d"]


@pytest.mark.parametrize("what", ["train", "belt_drive", "bevel_differential"])
def test_set_starters_check_without_errors_or_warnings(what, tmp_path, capsys):
    assert main(["new", what, "--dir", str(tmp_path)]) == 0
    path = tmp_path / f"my_{what}.yaml"
    capsys.readouterr()
    assert main(["check", str(path)]) == 0
    out = capsys.readouterr().out
    assert "0 errors, 0 warnings" in out
    section = {"train": "1 mesh", "belt_drive": "1 drive", "bevel_differential": "1 assembly"}
    assert section[what] in out


@pytest.mark.parametrize("kind", sorted(KINDS))
def test_required_keys_are_marked(kind, tmp_path):
    import importlib

    assert main(["new", kind, "--dir", str(tmp_path)]) == 0
    text = (tmp_path / f"my_{kind}.yaml").read_text()
    mod = importlib.import_module(f"gen.kinds.{KINDS[kind]}")
    for key in mod.KEYS:
        if key.required:
            line = next(ln for ln in text.splitlines() if ln.strip().startswith(key.name + ":"))
            assert "# required" in line, line


@pytest.mark.parametrize("kind", ["bevel_gear", "miter_gear", "bevel_differential"])
def test_bevel_starters_say_outer_module(kind, tmp_path):
    # README: bevel `module` is the outer module; ISO 23509 names it m_et
    assert main(["new", kind, "--dir", str(tmp_path)]) == 0
    line = next(ln for ln in (tmp_path / f"my_{kind}.yaml").read_text().splitlines()
                if ln.strip().startswith("module:"))
    assert "outer" in line and "ISO 23509" in line and "21771" not in line


@pytest.mark.parametrize("kind", ["spur_gear", "helical_gear", "herringbone_gear", "rack",
                                  "bevel_gear"])
def test_starter_pasted_into_a_train_is_valid(kind, tmp_path, capsys):
    assert main(["new", kind, "x", "--dir", str(tmp_path)]) == 0
    lines = (tmp_path / "x.yaml").read_text().splitlines()
    body = lines[lines.index("parts:") + 1:]
    values = dict(re.match(r"\s+(\w+): ([^#]+?)\s+#", ln).groups() for ln in body
                  if re.match(r"\s+(module|pressure_angle|helix_angle): ", ln))
    shared = "".join(f"    {k}: {v}\n" for k, v in values.items())
    pasted = "".join("    " + ln + "\n" for ln in body)
    f = tmp_path / "t.yaml"
    f.write_text(f"trains:\n  t:\n{shared}    parts:\n{pasted}")
    capsys.readouterr()
    assert main(["check", str(f)]) == 0, capsys.readouterr().out
    # with the tooth-system block deleted, valid in a train of another module
    start = next(i for i, ln in enumerate(body) if "# tooth system" in ln)
    end = next(i for i, ln in enumerate(body) if "# this part's own keys" in ln)
    own = "".join("    " + ln + "\n" for ln in body[:start] + body[end:])
    f.write_text(f"trains:\n  t:\n    module: 2\n{''.join(f'    {k}: {v}' + chr(10) for k, v in values.items() if k != 'module')}    parts:\n{own}")
    assert main(["check", str(f)]) == 0, capsys.readouterr().out


def test_unknown_kind_lists_the_sets(capsys):
    assert main(["new", "bevel_diferential"]) == 2
    err = capsys.readouterr().err
    assert "did you mean 'bevel_differential'" in err and "train" in err
