"""3MF export: package structure, millimetre units, re-read volume, deterministic bytes."""

from __future__ import annotations

import math
import os
import xml.etree.ElementTree as ET
import zipfile

import numpy as np
import pytest

from gen.errors import ExportError
from gen.export.threemf import CORE_NS, write_3mf
from gen.geometry.body import Body, Prism
from gen.geometry.section import Section, circle
from gen.triangles.prism import body_triangles


@pytest.fixture(scope="module")
def items():
    import trimesh

    ring = body_triangles(Body((Prism(Section(circle(10.0), (circle(3.0),)), 0.0, 5.0),)), 0.01)
    box = trimesh.creation.box((10.0, 20.0, 30.0))
    box.apply_translation((40.0, 0.0, 15.0))
    return [("ring", ring), ("box <&> \"q\"", box)]


def _parse(path):
    with zipfile.ZipFile(path) as zf:
        names = zf.namelist()
        root = ET.fromstring(zf.read("3D/3dmodel.model"))
        types = ET.fromstring(zf.read("[Content_Types].xml"))
        rels = ET.fromstring(zf.read("_rels/.rels"))
        stamps = {i.filename: i.date_time for i in zf.infolist()}
    return names, root, types, rels, stamps


def test_package_parts_and_units(items, tmp_path):
    path = str(tmp_path / "p.3mf")
    size = write_3mf(items, path)
    assert size == os.path.getsize(path)
    names, root, types, rels, stamps = _parse(path)
    # 3MF core spec: OPC content types, a root relationship to the model, unit attribute
    assert names == sorted(names) == ["3D/3dmodel.model", "[Content_Types].xml", "_rels/.rels"]
    assert root.tag == f"{{{CORE_NS}}}model" and root.get("unit") == "millimeter"
    exts = {d.get("Extension") for d in types}
    assert exts == {"rels", "model"}
    assert [r.get("Target") for r in rels] == ["/3D/3dmodel.model"]
    assert set(stamps.values()) == {(1980, 1, 1, 0, 0, 0)}
    assert os.listdir(tmp_path) == ["p.3mf"]  # atomic write leaves no temporary file


def test_stdlib_reparse_rebuilds_the_same_solids(items, tmp_path):
    import trimesh

    path = str(tmp_path / "p.3mf")
    write_3mf(items, path)
    _, root, _, _, _ = _parse(path)
    ns = {"m": CORE_NS}
    objs = root.findall("m:resources/m:object", ns)
    assert [o.get("name") for o in objs] == [n for n, _ in items]
    assert len(root.findall("m:build/m:item", ns)) == len(items)
    for obj, (_, mesh) in zip(objs, items):
        v = np.array([[float(e.get(k)) for k in "xyz"]
                      for e in obj.findall("m:mesh/m:vertices/m:vertex", ns)])
        f = np.array([[int(e.get(k)) for k in ("v1", "v2", "v3")]
                      for e in obj.findall("m:mesh/m:triangles/m:triangle", ns)])
        back = trimesh.Trimesh(v, f, process=False)
        assert len(f) == len(mesh.faces)
        # coordinates are printed to 1e-6 mm: volume within that rounding of the original
        assert back.volume == pytest.approx(mesh.volume, rel=1e-7)


def test_trimesh_reads_it_back_to_the_same_volume(items, tmp_path):
    import lxml  # noqa: F401  (test extra: trimesh's 3MF reader needs it)
    import trimesh

    path = str(tmp_path / "p.3mf")
    write_3mf(items, path)
    scene = trimesh.load(path)
    got = {name: g for name, g in scene.geometry.items()}
    assert set(got) == {n for n, _ in items}
    for name, mesh in items:
        assert got[name].is_watertight
        assert got[name].volume == pytest.approx(mesh.volume, rel=1e-7)
    # ring: π (R² − r²) h (computed). Both circles are inscribed polygons at chord tolerance
    # t: area deficit ≈ (4/3)·π·r·t each (θ²/6 of π r², θ² = 8 t / r), the hole's adds
    # volume back, so the net deficit is ≈ (4/3)·π·t·h·(R − r), positive.
    ring = got["ring"].volume
    exact = math.pi * (10.0 ** 2 - 3.0 ** 2) * 5.0
    assert 0 < exact - ring < 1.05 * 4.0 / 3.0 * math.pi * 0.01 * 5.0 * (10.0 - 3.0)


def test_same_meshes_same_bytes(items, tmp_path):
    a, b = str(tmp_path / "a.3mf"), str(tmp_path / "b.3mf")
    write_3mf(items, a)
    write_3mf([(n, m.copy()) for n, m in items], b)
    assert open(a, "rb").read() == open(b, "rb").read()


def test_refuses_empty_and_duplicate_names(items, tmp_path):
    with pytest.raises(ExportError):
        write_3mf([], str(tmp_path / "e.3mf"))
    with pytest.raises(ExportError, match="unique"):
        write_3mf([("a", items[0][1]), ("a", items[1][1])], str(tmp_path / "d.3mf"))
    assert os.listdir(tmp_path) == []
