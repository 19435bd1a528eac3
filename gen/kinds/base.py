"""The typed part every kind returns, the roles pair and drive checks dispatch on, and the
registry that maps ``kind:`` words to kind modules.

A kind is one module in :mod:`gen.kinds` defining

* ``KIND`` — the word users write (``spur_gear``),
* ``ROLE`` — a :class:`Role`: how other parts engage it (external gear, rack, pulley …),
* ``KEYS`` — its :class:`gen.params.schema.Key` table (units, ranges, defaults, docs),
* ``EXAMPLE`` — values for ``pitchline new KIND``,
* ``make(name, values, where) -> Part`` — numpy geometry, measured against its formulas.

``make`` never imports the CAD kernel or a triangle library: the part names a *shape* (a
description such as :class:`gen.geometry.body.Body`) whose ``builder`` attribute names the
shared triangle and solid builders (:mod:`gen.triangles`, :mod:`gen.solid`) that turn it into
triangles and a B-rep. A kind registers by one line in :data:`KINDS`.
"""

from __future__ import annotations

import dataclasses
import enum
import importlib
from dataclasses import dataclass, field
from typing import Any, Callable, Mapping

from gen.findings import Finding
from gen.params.project import RawPart
from gen.params.schema import Where, check_mapping, suggest

#: kind word -> module under gen.kinds (imported on first use)
KINDS = {
    "spur_gear": "spur_gear",
    "helical_gear": "helical_gear",
    "herringbone_gear": "herringbone_gear",
    "rack": "rack",
    "helical_rack": "helical_rack",
    "herringbone_rack": "herringbone_rack",
    "bevel_gear": "bevel_gear",
    "miter_gear": "miter_gear",
    "timing_pulley": "timing_pulley",
    "fit_coupon": "coupon",
    "ring_gear": "ring_gear",
    # issue 15
    "sector_gear": "sector_gear",
    "lead_screw": "lead_screw",
    "screw_nut": "screw_nut",
    "cable_drum": "cable_drum",
    "flywheel": "flywheel",
}


class Role(str, enum.Enum):
    """How a part engages others; pair, drive and assembly checks dispatch on it."""

    EXTERNAL_GEAR = "external_gear"   # cylindrical involute gear, teeth outward
    INTERNAL_GEAR = "internal_gear"   # ring gear, teeth inward
    RACK = "rack"                     # straight, helical or herringbone rack
    BEVEL_GEAR = "bevel_gear"         # straight bevel gear (teeth toward a cone apex)
    PULLEY = "pulley"                 # synchronous-belt pulley
    SCREW = "screw"                   # threaded screw
    NUT = "nut"                       # threaded nut
    PLAIN = "plain"                   # engages nothing (coupons, bodies)


@dataclass(frozen=True)
class Formula:
    """A size a part promises, the formula it is measured against, and the formula's source."""

    name: str          # manifest key, e.g. "tip_diameter"
    formula: str       # e.g. "d_a = d + 2 m_n (h_aP* + x − k)"
    source: str        # e.g. "ISO 21771"


# --- role data: what a pair or drive check needs to know of each member -------------------
@dataclass(frozen=True, eq=False)
class GearMate:
    """A cylindrical gear in a pair check (external; later internal)."""

    sizes: Any            # gen.geometry.cylindrical.GearSizes
    flank: Any            # gen.geometry.generate.Flank
    profile: str          # ISO 53 profile letter
    face_width: float
    hand: str | None = None
    chevron: bool = False


@dataclass(frozen=True, eq=False)
class RingMate:
    """An internal (ring) gear in a pair check: ISO 21771 sizes as positive magnitudes."""

    sizes: Any            # gen.geometry.internal.RingSizes
    flank: Any            # gen.geometry.internal_cut.RingFlank (shaper-cut tooth space)
    cutter: Any           # gen.geometry.internal_cut.ShaperCutter
    profile: str          # ISO 53 profile letter
    face_width: float
    hand: str | None = None
    chevron: bool = False


@dataclass(frozen=True, eq=False)
class RackMate:
    sizes: Any            # gen.geometry.rack_outline.RackSizes
    profile: str
    face_width: float
    alpha_n: float
    beta: float = 0.0
    hand: str | None = None
    chevron: bool = False


@dataclass(frozen=True, eq=False)
class BevelMate:
    sizes: Any            # gen.geometry.bevel.BevelSizes
    flank: Any            # virtual (Tredgold) spur flank


@dataclass(frozen=True)
class PulleyMate:
    profile: str
    teeth: int


#: a check run on the exported triangles: called with ``slicer(z) -> [polygons]``
SliceCheck = Callable[[Callable[[float], list]], list]


@dataclass(frozen=True, eq=False)
class Part:
    """One checked part: geometry description, promised sizes, findings, role data.

    Frozen: later layers derive new parts with :meth:`with_` and never attach attributes.
    """

    name: str
    kind: str
    role: Role
    values: Mapping               # validated parameters (mm, rad)
    shape: Any                    # geometry description with a ``builder`` name, or None
    sizes: Mapping                # manifest sizes (mm, deg)
    findings: tuple = ()          # Finding, ...
    formulas: tuple = ()          # Formula, ...: what the sizes are measured against
    mate: Any = None              # GearMate | RingMate | RackMate | BevelMate | PulleyMate | None
    outline: Any = None           # (n, 2) polygon of the measured section
    section: Any = None           # gen.geometry.section.Section for DXF, when there is one
    slice_checks: tuple = ()      # SliceCheck, ...: re-measure the exported triangles
    rating: Callable | None = None  # () -> strength rating dict (gears)
    data: Mapping = field(default_factory=dict)  # kind-specific results its own tests read
    chord_tol: float = 0.01
    file: str = ""
    train: str | None = None
    assembly: str | None = None

    def with_(self, **changes) -> "Part":
        return dataclasses.replace(self, **changes)

    @property
    def errors(self) -> list[Finding]:
        return [f for f in self.findings if f.severity == "error"]


def kind_module(kind: str, where: Where):
    if kind not in KINDS:
        raise where.error("kind", f"unknown kind '{kind}'{suggest(kind, KINDS)}",
                          allowed=", ".join(sorted(KINDS)))
    return importlib.import_module(f"gen.kinds.{KINDS[kind]}")


def resolve(raw: RawPart, fits: dict | None = None) -> Part:
    """Check a raw part's keys against its kind and build its part.

    ``fits`` maps fit-profile names to their allowances; a part's ``fit: NAME`` is replaced by
    that dict before the kind sees it.
    """
    where = Where(raw.file, raw.name, raw.line, origin=raw.origin)
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
    part = mod.make(raw.name, values, where)
    if part.role is not mod.ROLE:
        raise TypeError(f"kind {raw.kind} returned role {part.role}, declared {mod.ROLE}")
    return part.with_(file=raw.file, train=raw.train)
