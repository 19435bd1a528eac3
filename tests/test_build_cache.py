"""What a rebuild considers up to date (gen.build.cache), identical parts built once and the
job order (gen.build.run), polyline thinning (gen.triangles.prism), a light ``--help``.
No CAD kernel."""

import math
import os
import subprocess
import sys
from types import SimpleNamespace

import numpy as np

from gen.build import cache
from gen.build import run as build_run


def _model(kind="spur_gear", **values):
    return SimpleNamespace(kind=kind, values=values, section=object(), shape=None)


def _write(tmp_path, name, data: bytes):
    p = tmp_path / name
    p.write_bytes(data)
    return cache.file_info(str(p), len(data))


def test_parameter_hash_ignores_formats_and_names_only_geometry():
    a, b = _model(teeth=20, module=2), _model(teeth=20, module=2)
    assert cache.params_hash(a, ("step",)) == cache.params_hash(b, ("stl", "3mf"))
    assert cache.params_hash(a) != cache.params_hash(_model(teeth=21, module=2))


def test_dropping_a_format_keeps_the_part_adding_one_rebuilds(tmp_path):
    files = {"step": _write(tmp_path, "g.step", b"step"), "stl": _write(tmp_path, "g.stl", b"s")}
    prev = {"params_hash": "h", "status": "built", "files": files}
    assert cache.up_to_date(prev, "h", str(tmp_path), ("step", "stl"))
    assert cache.up_to_date(prev, "h", str(tmp_path), ("stl",))          # dropped: no rebuild
    assert not cache.up_to_date(prev, "h", str(tmp_path), ("stl", "3mf"))  # added: rebuild
    assert not cache.up_to_date(prev, "other", str(tmp_path), ("stl",))
    (tmp_path / "g.stl").write_bytes(b"t")                                # same size, new bytes
    assert not cache.up_to_date(prev, "h", str(tmp_path), ("stl",))
    assert cache.up_to_date(prev, "h", str(tmp_path), ("step",))         # only needed files


def test_dxf_is_not_expected_from_a_part_without_a_section():
    m = _model()
    m.section = None
    assert cache.expected_formats(m, ("step", "dxf")) == ("step",)
    assert cache.expected_formats(_model(), ("step", "dxf")) == ("step", "dxf")


def test_identical_parts_share_one_triangulation(monkeypatch):
    made = []

    def fake_triangles(model):
        made.append(model.name)
        return "tri"

    def fake_export(model, out, formats, options=None):
        from gen.build import export as ex

        return SimpleNamespace(name=model.name, tri=ex.make_triangles(model))

    monkeypatch.setattr(build_run._export, "make_triangles", fake_triangles)
    monkeypatch.setattr(build_run, "export_part", fake_export)
    models = {n: SimpleNamespace(name=n) for n in ("a", "b", "c")}
    out = build_run._export_group(models, ["a", "b", "c"], "out", ("stl",))
    assert [o.name for o in out] == ["a", "b", "c"] and all(o.tri == "tri" for o in out)
    assert made == ["a"]                                  # made once, for the first name
    assert build_run._export.make_triangles is fake_triangles   # restored afterwards


def test_refined_thinning_keeps_every_sample_within_tolerance_and_grows_with_it():
    # samples of a circle arc of radius 5 mm (sagitta of a chord ℓ: ℓ²/(8 r), computed) and of
    # a curve with a sharp bend, where the first curvature estimate is too coarse
    from gen.triangles.prism import _chord_errors, _spline_polyline

    t = np.linspace(0.0, 1.2, 400)
    arc = np.column_stack([5 * np.cos(t), 5 * np.sin(t)])
    x = np.linspace(-1, 1, 401)
    bend = np.column_stack([x, np.sqrt(x * x + 1e-4)])
    for pts in (arc, bend):
        counts = []
        for tol in (0.04, 0.02, 0.01, 0.005, 0.002):
            kept = _spline_polyline(pts, tol)
            idx = np.array([int(np.argmin(np.hypot(*(pts - q).T))) for q in kept])
            assert float(np.max(_chord_errors(pts, idx)[1])) <= tol
            counts.append(len(kept))
        assert counts == sorted(counts)
        assert counts[0] < len(pts) / 4          # thinned, not every sample
    # the arc needs about 1.2 / (2 √(2 tol / r)) chords at tol 0.01: ≈ 7 (computed)
    assert len(_spline_polyline(arc, 0.01)) <= 2 * math.ceil(1.2 / (2 * math.sqrt(0.02 / 5))) + 1


def test_help_loads_neither_numpy_nor_yaml():
    code = ("import sys\nfrom gen.cli import main\n"
            "try:\n    main(['--help'])\nexcept SystemExit:\n    pass\n"
            "print(sorted(m for m in ('numpy', 'yaml') if m in sys.modules))")
    env = dict(os.environ, PYTHONPATH=os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
    r = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env)
    assert r.returncode == 0 and r.stdout.strip().splitlines()[-1] == "[]"
    assert "build" in r.stdout and "ratio" in r.stdout


def _bevel(z):
    """A model whose cost is 18 per tooth (the straight-bevel rule of geometry_cost)."""
    return SimpleNamespace(shape=SimpleNamespace(builder="apex_ruled", sizes=SimpleNamespace(z=z)))


def test_schedule_runs_longest_first_and_an_assemblys_parts_ahead():
    models = {"big": _bevel(45), "small": _bevel(10), "in_1": _bevel(20), "in_2": _bevel(20),
              "out": _bevel(15)}
    groups = [["big"], ["small"], ["in_1", "in_2"], ["out"]]
    # without assemblies: cost × group size, longest first (45·18 > 2·20·18 > 15·18 > 10·18)
    assert cache.schedule(groups, models) == [["big"], ["in_1", "in_2"], ["out"], ["small"]]
    # an assembly placing in_1, in_2 and out: its parts count its whole cost (they go first,
    # so that its STEP overlaps the remaining parts)
    asm = SimpleNamespace(poses={"in_1": None, "in_2": None, "out": None})
    order = cache.schedule(groups, models, [asm])
    assert order[:2] == [["in_1", "in_2"], ["out"]] and order[2:] == [["big"], ["small"]]


def test_a_twist_raises_the_cost():
    from gen.geometry.body import Body, Prism
    from gen.geometry.section import Arc, Loop, Section

    disc = Section(Loop((Arc((0.0, 0.0), 10.0, 0.0, 2 * math.pi),)), ())
    flat = SimpleNamespace(shape=Body((Prism(disc, 0.0, 10.0),)))
    turned = SimpleNamespace(shape=Body((Prism(disc, 0.0, 10.0, twist=0.5),)))
    assert cache.geometry_cost(turned) > 3 * cache.geometry_cost(flat) > 0
