"""Keys shared by several part kinds (mm and degrees in files; radians after checking)."""

from __future__ import annotations

from gen.params.schema import REQUIRED, Key

MODULE = Key("module", "float", REQUIRED, lo=0.05, hi=50, unit="mm",
             doc="normal module m_n (ISO 21771)")
TEETH = Key("teeth", "int", REQUIRED, lo=1, hi=10000)
PRESSURE_ANGLE = Key("pressure_angle", "angle", 20.0, lo=10, hi=35, unit="deg",
                     doc="normal pressure angle of the basic rack")
PROFILE = Key("profile", "enum", "A", choices=("A", "B", "C", "D"),
              doc="ISO 53 basic rack profile (dedendum and root radius)")
PROFILE_SHIFT = Key("profile_shift", "float", 0.0, lo=-1.0, hi=1.5,
                    doc="profile shift coefficient x")
FACE_WIDTH = Key("face_width", "float", REQUIRED, lo=0, hi=2000, lo_open=True, unit="mm")
BACKLASH_ALLOWANCE = Key("backlash_allowance", "float", 0.0, lo=0, hi=5, unit="mm",
                         doc="tooth thinning: arc thickness removed on the reference circle, "
                             "both flanks together")
TIP_SHORTENING = Key("tip_shortening", "float", 0.0, lo=0, hi=1, choices=("auto",),
                     doc="tip shortening coefficient k (tip diameter reduced by 2 k m), or "
                         "auto: the k = x1 + x2 − y of the part's declared mesh (ISO 21771)")
BORE = Key("bore", "map", None, scalar="diameter", sub=(
    Key("diameter", "float", REQUIRED, lo=0, hi=2000, lo_open=True, unit="mm"),
    Key("flat", "float", 0.0, lo=0, hi=1000, unit="mm", doc="D-flat depth"),
    Key("keyway", "bool", False, doc="DIN 6885-1 hub keyway"),
), doc="hole along the axis: a diameter, or {diameter, flat} / {diameter, keyway: true}")
HUB = Key("hub", "map", None, sub=(
    Key("diameter", "float", REQUIRED, lo=0, hi=2000, lo_open=True, unit="mm"),
    Key("length", "float", REQUIRED, lo=0, hi=2000, lo_open=True, unit="mm"),
), doc="plain cylindrical hub on the top face")
FORCE = Key("force", "bool", False, doc="build despite an unusual tooth count")
CHORD = Key("chord_tolerance", "float", 0.01, lo=0.0005, hi=0.5, unit="mm",
            doc="largest deviation of mesh facets from the exact surface")

# printing material (density for mass, allowable stress for the strength estimate)
from gen.validate.strength import MATERIALS  # noqa: E402  (numpy-only table)

MATERIAL = Key("material", "enum", "PLA", choices=tuple(MATERIALS),
               doc="print material: density for mass, allowable stress for the rating")
SAFETY_FACTOR = Key("safety_factor", "float", 2.0, lo=1.0, hi=20.0,
                    doc="divides the allowable tooth stress in the rated torque")
RATING_SPEED = Key("rpm", "float", 60.0, lo=0, hi=100000, unit="rpm",
                   doc="speed at which the rated torque is stated")
FIT = Key("fit", "str", None, doc="fit profile name: none, fdm-0.4, fdm-0.4-petg, fdm-0.6, resin, "
                                "or one from a fits: section")
NO_FIT = {"name": "none", "flank_clearance": 0.0, "hole_allowance": 0.0, "outline_offset": 0.0,
          "min_feature": 0.0, "source": "built-in"}


def fit_of(values) -> dict:
    """The resolved fit profile of a part (no allowances when none is named)."""
    f = values.get("fit")
    return f if isinstance(f, dict) else NO_FIT


def set_screw_holes(name: str, screw, hub, bore_radius: float | None, flat_or_key: bool,
                    findings: list) -> tuple:
    """Radial tap-drill holes for the set screws through a hub (``RadialHole``s), or errors in
    ``findings`` when there is no hub or the drill does not fit it. Holes sit at mid-hub, the
    first at 90° to a D-flat or keyway, the second a quarter turn on (common practice)."""
    import math

    from gen.findings import ERROR, Finding
    from gen.geometry.body import RadialHole

    if not screw:
        return ()
    if not hub:
        findings.append(Finding(ERROR, "set-screw-needs-hub", "set screws go through a hub: "
                                "add hub: {diameter, length}", name, "", key="set_screw"))
        return ()
    d = SET_SCREW_DRILL[screw["size"]]
    if d > 0.8 * hub["length"]:
        findings.append(Finding(ERROR, "set-screw-too-big", f"{screw['size']} tap drill "
                                f"{d:g} mm does not fit a {hub['length']:g} mm hub", name,
                                "", key="set_screw"))
        return ()
    r0 = 0.0 if bore_radius is None else max(0.0, bore_radius - 0.2)
    a0 = math.pi / 2 if flat_or_key else 0.0
    return tuple(RadialHole(d, hub["length"] / 2.0, a0 - i * math.pi / 2, r0,
                            hub["diameter"] / 2.0 + 0.5) for i in range(screw["count"]))


#: tap-drill diameters for ISO metric coarse set screws (from memory; common practice)
SET_SCREW_DRILL = {"M2": 1.6, "M2.5": 2.05, "M3": 2.5, "M4": 3.3, "M5": 4.2, "M6": 5.0}
