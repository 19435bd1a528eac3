"""``series:`` entries expand one part over lists and ranges into named parts."""

import json

import pytest

from gen.check import check
from gen.cli import main
from gen.errors import ParamError
from gen.params.series import expand

SERIES = """
series:
  stock_pulleys:
    kind: timing_pulley
    name: "p_{profile}_{teeth}t"
    vary: {profile: [curv2, curv3], teeth: "16..20/2"}
    values: {belt_width: 6, bore: 5, chord_tolerance: 0.02}
"""


def test_expand_names_and_values():
    members = expand("s", {"kind": "spur_gear", "name": "g{teeth}_m{module}",
                           "vary": {"module": [1, 1.5], "teeth": "10..12"},
                           "values": {"face_width": 5}}, "f.yaml", lambda k: None)
    names = [n for n, _ in members]
    assert names == ["g10_m1", "g11_m1", "g12_m1", "g10_m1.5", "g11_m1.5", "g12_m1.5"]
    assert members[4][1] == {"kind": "spur_gear", "face_width": 5, "module": 1.5, "teeth": 11}


@pytest.mark.parametrize("body, key", [
    ({"kind": "spur_gear", "name": "g{teeth}", "vary": {"teeth": "12..10"}}, "vary.teeth"),
    ({"kind": "spur_gear", "name": "g", "vary": {"teeth": [10]}}, "name"),
    ({"kind": "spur_gear", "name": "g{teeth}", "vary": {"teeth": "a lot"}}, "vary.teeth"),
    ({"kind": "spur_gear", "name": "g{teeth}", "vary": {"teeth": [10]},
      "values": {"teeth": 3}}, "vary.teeth"),
    ({"name": "g{teeth}", "vary": {"teeth": [10]}}, "kind"),
    ({"kind": "spur_gear", "name": "g{teeth}", "vary": {"teeth": "1..9000"}}, "vary"),
])
def test_bad_series_name_the_key(body, key):
    with pytest.raises(ParamError) as exc:
        expand("s", body, "f.yaml", lambda k: 7)
    assert exc.value.key == key and "series 's'" in str(exc.value)


def test_series_members_are_checked_and_listed_in_the_manifest(tmp_path):
    path = tmp_path / "cat.yaml"
    path.write_text(SERIES)
    res = check([str(path)])
    assert res.ok
    assert sorted(res.models) == sorted(f"p_{p}_{t}t" for p in ("curv2", "curv3")
                                        for t in (16, 18, 20))
    out = tmp_path / "out"
    assert main(["build", str(path), "--out", str(out), "--format", "stl"]) == 0
    manifest = json.loads((out / "manifest.json").read_text())
    assert sorted(manifest["parts"]) == sorted(res.models)
    assert all((out / f"{n}.stl").exists() for n in res.models)
