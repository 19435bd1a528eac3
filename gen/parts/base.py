"""What every part kind provides, and the registry that maps ``kind:`` words to modules.

A part kind is one module in :mod:`gen.parts` defining ``KIND`` (the word in the file),
``KEYS`` (its :class:`gen.params.schema.Key` table) and ``make(name, values) -> PartModel``.
``make`` builds numpy-level geometry, measures it, and returns findings; it never imports the
CAD kernel. The mesh and solid layers turn ``PartModel.body`` into triangles and B-rep.
"""

from __future__ import annotations

import importlib
from dataclasses import dataclass, field

from gen.errors import ParamError
from gen.params.project import RawPart
from gen.params.schema import Where, check_mapping, suggest

#: kind word -> module under gen.parts (imported on first use)
KINDS = {
    "spur_gear": "spur_gear",
    "rack": "rack",
    "timing_pulley": "timing_pulley",
    "bevel_gear": "bevel_gear",
    "miter_gear": "miter_gear",
    "fit_coupon": "coupon",
    "helical_gear": "helical_gear",
    "herringbone_gear": "herringbone_gear",
    "helical_rack": "helical_rack",
    "herringbone_rack": "herringbone_rack",
}


@dataclass
class PartModel:
    """A part ready to export: geometry description, manifest sizes, findings."""

    name: str
    kind: str
    values: dict                 # validated parameters (mm, rad)
    body: object                 # gen.geometry.body.Body
    sizes: dict                  # manifest values (mm, deg)
    findings: list = field(default_factory=list)
    outline: object = None       # (n, 2) polygon of the toothed section (measured)
    mesh_check: object = None    # callable(slice_polygons: list[(n,2)], z) -> findings
    tooth: dict = field(default_factory=dict)  # tooth-system data for pair checks
    file: str = ""
    train: str | None = None
    chord_tol: float = 0.01
    mesh_check_z: float | None = None   # slice height for mesh_check (default: mid face)
    pulley: dict = field(default_factory=dict)  # belt data for drive checks
    bevel: dict = field(default_factory=dict)   # bevel sizes, flank and bore (body is None)
    profile_section: object = None  # the toothed 2-D Section (DXF), when the part has one
    rating: object = None        # callable → strength rating dict (gears)
    helix_check: object = None   # callable(slicer) → findings, for twisted/sheared parts


def kind_module(kind: str, where: Where):
    if kind not in KINDS:
        raise where.error("kind", f"unknown kind '{kind}'{suggest(kind, KINDS)}",
                          allowed=", ".join(sorted(KINDS)))
    return importlib.import_module(f"gen.parts.{KINDS[kind]}")


def resolve(raw: RawPart, fits: dict | None = None) -> PartModel:
    """Check a raw part's keys against its kind and build its model.

    ``fits`` maps fit-profile names to their allowances; a part's ``fit: NAME`` is replaced by
    that dict before the kind sees it.
    """
    where = Where(raw.file, raw.name, raw.line)
    mod = kind_module(raw.kind, where)
    values = check_mapping(raw.values, mod.KEYS, where)
    if values.get("fit") is not None:
        if fits is None:
            from gen.params.fits import collect_fits
            fits = collect_fits([])
        name = values["fit"]
        if name not in fits:
            raise where.error("fit", f"unknown fit profile '{name}'{suggest(name, fits)}",
                              allowed=", ".join(sorted(fits)))
        values["fit"] = fits[name]
    model = mod.make(raw.name, values, where)
    model.file, model.train = raw.file, raw.train
    return model


def param_error(where: Where, key: str, msg: str, value=None, allowed=None) -> ParamError:
    return where.error(key, msg, value, allowed)
