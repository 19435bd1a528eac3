"""Part kind ``rack``: straight-tooth rack with the ISO 53 basic rack form.

Rack along +X, tips toward +Y, pitch line on y = 0, back on y = −height, bottom face on
z = 0, face width along +Z. The ends are planes at x = 0 and x = length, also for slanted
(helical, herringbone) teeth: their sheared section is built past both ends and cut there.

``ends: whole_pitches`` rounds the length to a whole number of pitches so that sections
butt together with the pitch continuing across the joint; the pitch error at such a joint
(``length − N·p``) is reported in the sizes as ``joint_pitch_error``.
"""

from __future__ import annotations

import math

from gen.errors import GeometryError
from gen.geometry.basic_rack import basic_rack
from gen.geometry.body import Body, Prism
from gen.geometry.rack_outline import (extended_loop, joint_pitch_error, rack_loop, rack_sizes,
                                       whole_pitch_length)
from gen.geometry.section import Line, Loop, Section
from gen.params.schema import REQUIRED, Key
from gen.kinds import common_keys as K
from gen.kinds.base import Formula, Part, RackMate, Role
from gen.tolerances import TOL
from gen.findings import ERROR, INFO, Finding
from gen.geometry.modules import module_series
from gen.validate.rack_checks import rack_compare, rack_measure

KIND = "rack"
ROLE = Role.RACK
RACK_FORMULAS = (
    Formula("pitch", "p = π·m_n / cos β", "ISO 53 / ISO 21771"),
    Formula("tooth_thickness", "s = p/2 − thinning", "ISO 53"),
    Formula("addendum", "h_a = h_aP*·m", "ISO 53"),
    Formula("dedendum", "h_f = h_fP*·m", "ISO 53"),
)
RACK_KEYS = (K.MODULE, K.PRESSURE_ANGLE, K.PROFILE, K.FACE_WIDTH, K.BACKLASH_ALLOWANCE,
             K.MATERIAL, K.SAFETY_FACTOR, K.FIT, K.FORCE, K.CHORD,
             Key("length", "float", None, lo=0, hi=5000, lo_open=True, unit="mm"),
             Key("teeth", "int", None, lo=1, hi=5000),
             Key("height", "float", REQUIRED, lo=0, hi=1000, lo_open=True, unit="mm",
                 doc="pitch line to the back face"),
             Key("ends", "enum", "as_given", choices=("as_given", "whole_pitches"),
                 doc="whole_pitches: length rounded to whole pitches, so sections butt "
                     "together with the pitch continuing across the joint"))
KEYS = RACK_KEYS + (
    Key("helix_angle", "angle", 0.0, lo=0, hi=0, doc="straight racks have none; use helical_rack"),
    Key("module_basis", "enum", "normal", choices=("normal",)),
)


def make_rack(name, values, where, *, kind, beta=0.0, hand=None, chevron=False):
    if (values["length"] is None) == (values["teeth"] is None):
        raise where.error("length", "give either length (mm) or teeth, not both or neither")
    rack = basic_rack(values["profile"]).with_alpha(values["pressure_angle"])
    m = values["module"]
    length = values["length"]
    if length is not None and values["ends"] == "whole_pitches":
        length = whole_pitch_length(length, math.pi * m / math.cos(beta))
    try:
        sizes = rack_sizes(m, rack, height=values["height"], length=length,
                           teeth=values["teeth"], beta=beta,
                           thinning=values["backlash_allowance"]
                           + 2.0 * K.fit_of(values)["flank_clearance"])
        loop = rack_loop(sizes, rack)
    except GeometryError as exc:
        key = "height" if "height" in str(exc) else ("length" if values["length"] else "teeth")
        raise where.error(key, str(exc), values[key]) from None
    poly = loop.polygon(values["chord_tolerance"])
    findings = rack_compare(name, rack_measure(poly, sizes), sizes, tol=1e-6)
    # printability (default nozzle without a fit): tooth thickness on the pitch line (normal),
    # and the back under the tooth spaces as the rim
    from gen.validate.printability import print_limits, printability_findings

    findings += printability_findings(name, print_limits(K.fit_of(values)),
                                      tooth=sizes.s * math.cos(beta),
                                      rim=sizes.height - sizes.dedendum, rim_key="height")
    if values["face_width"] < 0.5 * m:
        findings.append(Finding(ERROR, "face-vs-module", f"face width {values['face_width']:g} mm "
                                f"is under half the module", name, "common practice", key="face_width"))
    if module_series(m) is None:
        findings.append(Finding(INFO, "module-series", f"module {m:g} mm is not in the ISO 54 / "
                                "DIN 780 preferred series", name, "ISO 54 / DIN 780", key="module"))
    if beta:
        from gen.kinds.helical import opposite, rack_shear
        # a rack meshes with the pinion of the opposite hand
        shear = rack_shear(beta, mates_with=opposite(hand))
    else:
        shear = 0.0
    fw = values["face_width"]
    if shear:
        # slanted teeth: build the section past both ends by the largest slant, cut flat there
        reach = abs(shear) * (fw / 2.0 if chevron else fw)
        long_loop, e = extended_loop(sizes, rack, reach + m)
        y0, y1 = -sizes.height - 1.0, sizes.addendum + 1.0
        x0, x1 = -e - reach - 1.0, sizes.length + e + reach + 1.0
        cuts = tuple(Prism(Section(Loop((Line((a, y0), (b, y0)), Line((b, y0), (b, y1)),
                                         Line((b, y1), (a, y1)), Line((a, y1), (a, y0))))),
                           -1.0, fw + 1.0)
                     for a, b in ((x0, 0.0), (sizes.length, x1)))
        body = Body((Prism(Section(long_loop), 0.0, fw, shear=shear, chevron=chevron),), cuts)
    else:
        body = Body((Prism(Section(loop), 0.0, fw, shear=shear, chevron=chevron),))
    manifest = {"module": m, "pressure_angle": math.degrees(rack.alpha), "pitch": sizes.pitch,
                "height": sizes.height, "length": sizes.length, "teeth": sizes.teeth,
                "face_width": values["face_width"], "tooth_thickness": sizes.s,
                "addendum": sizes.addendum, "dedendum": sizes.dedendum,
                "joint_pitch_error": joint_pitch_error(sizes.length, sizes.pitch)}
    if beta:
        manifest["helix_angle"] = math.degrees(beta)
    chord = values["chord_tolerance"]

    def slice_check(slicer):
        z = 0.5 * values["face_width"]
        got = rack_measure(max(slicer(z), key=len), sizes)
        return rack_compare(name, got, sizes, tol=2 * chord + TOL.slice_extra,
                            where=f"mesh slice z={z:g}")

    # slanted racks: their slices are measured by the helix check instead
    checks = (slice_check,) if not chevron and not shear else ()
    if beta:
        from gen.kinds.helical import rack_helix_check

        checks += (rack_helix_check(name, sizes.pitch, shear, chevron, values["face_width"]),)
    return Part(name=name, kind=kind, role=Role.RACK, values=values, shape=body,
                sizes=manifest, findings=tuple(findings), formulas=RACK_FORMULAS,
                mate=RackMate(sizes, values["profile"], values["face_width"], rack.alpha,
                              beta=beta, hand=hand, chevron=chevron),
                outline=poly, section=Section(loop), slice_checks=checks, chord_tol=chord)


def make(name, values, where):
    return make_rack(name, values, where, kind=KIND)

EXAMPLE = {"module": 1.5, "length": 120, "face_width": 8, "height": 8}
