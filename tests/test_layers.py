"""Imports point one way over every package of gen, and heavy libraries stay where declared.

params → geometry → validate → kinds → assemblies → triangles / solid → export → check → build
→ cli. Checked by reading every module's import statements (module level and inside
functions), so a lazy import inside a function counts too."""

import ast
import os

from conftest import ROOT

# package → packages of pitchline it may import (besides itself and the base modules)
ALLOWED = {
    "params": set(),
    "geometry": set(),
    "validate": {"geometry"},
    "kinds": {"params", "geometry", "validate"},
    "assemblies": {"params", "geometry", "validate", "kinds"},
    "triangles": {"geometry"},
    "solid": {"geometry"},
    "export": {"geometry", "validate"},
    "check": {"params", "geometry", "validate", "kinds", "assemblies"},
    "build": {"params", "geometry", "validate", "kinds", "assemblies", "triangles", "solid",
              "export", "check"},
    "cli": {"params", "geometry", "validate", "kinds", "assemblies", "triangles", "solid",
            "export", "check", "build", "api"},
}
#: top-level modules above the packages (the public Python API): may import any package
TOP = {"api.py": set(ALLOWED) - {"cli"}}
BASE = {"errors", "findings", "tolerances"}
#: third-party library → the only places (package, or package/module.py) that may import it
DECLARED = {
    # the build path uses OCP only; cadquery (seconds and hundreds of MiB to import) is for
    # the Python API's users: imported in gen/api.py (to_cadquery) and in no package
    "cadquery": set(),
    "OCP": {"solid", "export/step.py", "export/shape_analysis.py", "export/step_assembly.py"},
    "trimesh": {"triangles", "export/stl.py", "export/threemf.py", "export/report_raster.py"},
    "manifold3d": {"triangles"},
    "shapely": {"validate"},
    "ezdxf": {"export/dxf.py"},
}


def _imports(path):
    tree = ast.parse(open(path, encoding="utf-8").read())
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            yield from (a.name for a in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            yield node.module


def _modules():
    gen = os.path.join(ROOT, "gen")
    for pkg in sorted(os.listdir(gen)):
        folder = os.path.join(gen, pkg)
        if os.path.isdir(folder) and pkg != "__pycache__":
            for f in sorted(os.listdir(folder)):
                if f.endswith(".py"):
                    yield pkg, f, os.path.join(folder, f)


def test_every_package_has_a_rule():
    pkgs = {pkg for pkg, _, _ in _modules()}
    assert pkgs == set(ALLOWED), pkgs ^ set(ALLOWED)


def test_layers_import_downward_only():
    bad = []
    for pkg, f, path in _modules():
        for mod in _imports(path):
            parts = mod.split(".")
            if parts[0] != "gen" or len(parts) < 2 or parts[1] in BASE:
                continue
            if parts[1] != pkg and parts[1] not in ALLOWED[pkg]:
                bad.append(f"{pkg}/{f} imports {mod}")
    assert not bad, bad


def test_heavy_libraries_only_where_declared():
    bad = []
    for pkg, f, path in _modules():
        for mod in _imports(path):
            top = mod.split(".")[0]
            if top in DECLARED and pkg not in DECLARED[top] and f"{pkg}/{f}" not in DECLARED[top]:
                bad.append(f"{pkg}/{f} imports {mod}")
    assert not bad, bad


#: top-level modules of gen → the heavy libraries each may import
TOP_DECLARED = {"api.py": {"cadquery"}}


def test_heavy_libraries_in_top_modules_only_where_declared():
    bad = []
    for f in sorted(os.listdir(os.path.join(ROOT, "gen"))):
        if f.endswith(".py"):
            tops = {m.split(".")[0] for m in _imports(os.path.join(ROOT, "gen", f))}
            bad += [f"{f} imports {t}" for t in tops & set(DECLARED)
                    if t not in TOP_DECLARED.get(f, set())]
    assert not bad, bad


def test_api_sits_below_the_cli():
    for f, allowed in TOP.items():
        mods = {m.split(".")[1] for m in _imports(os.path.join(ROOT, "gen", f))
                if m.startswith("gen.") and m.count(".") >= 1}
        assert mods - BASE <= allowed, (f, mods - BASE - allowed)


def test_base_modules_import_no_package():
    for f in ("errors.py", "findings.py", "tolerances.py"):
        mods = [m for m in _imports(os.path.join(ROOT, "gen", f)) if m.startswith("gen.")]
        assert mods == [], (f, mods)
