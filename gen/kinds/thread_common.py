"""Keys and numbers shared by the ``lead_screw`` and ``screw_nut`` kinds.

Thread sizes: :func:`gen.geometry.screw.thread_sizes` (ISO 2904 trapezoidal, ISO 68-1 metric).
Drive numbers: :mod:`gen.geometry.screw_drive` (Shigley, Mechanical Engineering Design §8-2,
from memory). Friction: :data:`gen.geometry.screw_drive.FRICTION` by screw and nut material
(metal pairs Shigley Table 8-5 from memory, plastic nuts common practice), overridable.
"""

from __future__ import annotations

import math

from gen.errors import GeometryError
from gen.findings import INFO, Finding
from gen.geometry.screw import METRIC, TRAPEZOIDAL, thread_sizes
from gen.geometry.screw_drive import FRICTION, friction_for, screw_torques
from gen.kinds.base import Formula
from gen.params.schema import REQUIRED, Key

SCREW_MATERIALS = ("steel", "brass", "PLA", "PETG", "ABS", "PA", "POM")
NUT_MATERIALS = tuple(dict.fromkeys(b for (_, b, _) in FRICTION))

THREAD_KEYS = (
    Key("thread", "enum", TRAPEZOIDAL, choices=(TRAPEZOIDAL, METRIC),
        doc="ISO 2904 trapezoidal (30°) or ISO 68-1 metric (60°)"),
    Key("diameter", "float", REQUIRED, lo=1, hi=500, unit="mm", doc="nominal (major) diameter d"),
    Key("pitch", "float", REQUIRED, lo=0.2, hi=50, unit="mm", doc="thread pitch P"),
    Key("starts", "int", 1, lo=1, hi=12, doc="number of starts n (lead = n P)"),
    Key("hand", "enum", "right", choices=("right", "left")),
    Key("length", "float", REQUIRED, lo=0, hi=5000, lo_open=True, unit="mm"),
    Key("screw_material", "enum", "steel", choices=SCREW_MATERIALS,
        doc="for the friction pair, buckling and whirling"),
    Key("nut_material", "enum", "PLA", choices=NUT_MATERIALS, doc="for the friction pair"),
    Key("lubrication", "enum", "dry", choices=("dry", "oil")),
    Key("friction", "float", None, lo=0, hi=1, lo_open=True,
        doc="thread friction coefficient (default: the typical figure of the material pair)"),
)

FORMULAS = (
    Formula("pitch_diameter", "trapezoidal d2 = d − 0.5 P; metric d2 = d − 0.649519 P",
            "ISO 2904 / ISO 68-1"),
    Formula("minor_diameter", "trapezoidal d3 = d − 2 h3, h3 = 0.5 P + a_c; metric "
            "d1 = d − 1.082532 P", "ISO 2904 / ISO 68-1"),
    Formula("lead", "L = n P", "thread geometry"),
    Formula("lead_angle", "tan λ = L / (π d2)", "thread geometry"),
    Formula("efficiency_raise", "e = F L / (2π T_R)", "Shigley §8-2"),
)


def sizes_of(values, where):
    """ThreadSizes of the part; a bad combination raises ParamError naming the key."""
    try:
        return thread_sizes(values["thread"], values["diameter"], values["pitch"], values["starts"])
    except GeometryError as exc:
        raise where.error("pitch", str(exc), values["pitch"]) from None


def friction_of(values, where) -> tuple[float, str]:
    """(thread friction coefficient, where it comes from)."""
    if values.get("friction") is not None:
        return values["friction"], "given (friction key)"
    try:
        pair = friction_for(values["screw_material"], values["nut_material"],
                            values["lubrication"])
    except GeometryError as exc:
        raise where.error("friction", str(exc), None) from None
    return pair.typical, (f"{pair.screw}/{pair.nut} {values['lubrication']}: typical of "
                          f"{pair.low:g}–{pair.high:g}, {pair.source}")


def thread_manifest(s, values, where) -> tuple[dict, list, object]:
    """Manifest sizes, info findings and the ScrewTorques for a unit load."""
    f, source = friction_of(values, where)
    # efficiency and self-locking do not depend on the load: take 1 N (Shigley §8-2)
    tq = screw_torques(1.0, s.d2, s.lead, s.half_angle, f)
    sizes = {
        "thread": s.form, "diameter": s.d, "pitch": s.pitch, "starts": s.starts,
        "hand": values["hand"], "length": values["length"],
        "pitch_diameter": s.d2, "minor_diameter": s.d3, "nut_minor_diameter": s.D1,
        "nut_major_diameter": s.D4, "thread_depth": s.h3, "crest_clearance": s.ac,
        "flank_angle": math.degrees(s.flank_angle),
        "lead": s.lead, "lead_angle": math.degrees(s.lead_angle),
        "friction": f, "efficiency_raise": tq.thread_efficiency,
        "self_locking": tq.self_locking,
    }
    name = where.part
    notes = [Finding(INFO, "thread-sizes", f"{s.form} {s.d:g}×{s.pitch:g}"
                     f"{f' ({s.starts} starts, lead {s.lead:g})' if s.starts > 1 else ''}: "
                     f"d2 {s.d2:.3f} mm, minor {s.d3:.3f} mm, lead angle "
                     f"{math.degrees(s.lead_angle):.2f}°", name,
                     "ISO 2904" if s.form == TRAPEZOIDAL else "ISO 68-1", key="pitch"),
             Finding(INFO, "self-locking",
                     (f"self-locking at friction {f:.3f} ({source}): the load cannot turn the "
                      "screw" if tq.self_locking else
                      f"not self-locking at friction {f:.3f} ({source}): the load drives the "
                      "screw back; hold it with a brake or the motor"),
                     name, "Shigley §8-2: self-locking when π f d_m sec α > L", key="friction")]
    return sizes, notes, tq
