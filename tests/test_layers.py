"""Imports point one way: params → geometry → validate → parts → solid/mesh → export → cli.

Checked by reading every module's import statements (module level and inside functions)."""

import ast
import os

from conftest import ROOT

KERNEL = ("cadquery", "OCP", "trimesh", "manifold3d", "ezdxf")
# package → packages of pitchline it may import (besides itself and the base modules)
ALLOWED = {
    "geometry": set(),
    "params": set(),
    "validate": {"geometry"},
    "parts": {"geometry", "validate", "params"},
}
BASE = {"gen", "gen.errors", "gen.findings", "gen.tolerances"}


def _imports(path):
    tree = ast.parse(open(path, encoding="utf-8").read())
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            yield from (a.name for a in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            yield node.module


def test_layers_import_downward_only():
    bad = []
    for pkg, allowed in ALLOWED.items():
        folder = os.path.join(ROOT, "gen", pkg)
        for f in sorted(os.listdir(folder)):
            if not f.endswith(".py"):
                continue
            for mod in _imports(os.path.join(folder, f)):
                top = mod.split(".")[0]
                if top in KERNEL:
                    bad.append(f"{pkg}/{f} imports {mod}")
                if top != "gen" or mod in BASE:
                    continue
                layer = mod.split(".")[1]
                if layer != pkg and layer not in allowed:
                    bad.append(f"{pkg}/{f} imports {mod}")
    assert not bad, bad
