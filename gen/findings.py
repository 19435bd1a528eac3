"""Findings: what validation says about a part, a pair, a drive or an assembly.

A leaf module (like :mod:`gen.errors`) so every layer can report without importing upward.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

ERROR, WARNING, INFO = "error", "warning", "info"
_RANK = {ERROR: 0, WARNING: 1, INFO: 2}

#: every finding code, kebab-case, with what it is about. A Finding with a code not listed
#: here is refused, so codes keep one spelling and reports and tests can rely on them.
CODES = {
    # parameters and export
    "parameter": "a parameter file value is missing, malformed or out of range",
    "export": "writing or building an output failed",
    "no-profile": "the part has no flat profile for a 2-D format",
    "plate": "laying parts out on the build plate failed",
    # issue 11: outputs checked as written
    "shape-analysis": "the CAD kernel's full shape analysis of an exported solid",
    # issue 12: inputs refused for the work they would take
    "work-too-large": "the part's outline or triangles exceed the work budget",
    # part geometry measured against formulas
    "size-mismatch": "a measured size differs from its formula",
    "tooth-count": "the counted teeth differ from the declared count",
    "pitch": "the measured angular pitch is not uniform",
    "teeth-range": "an unusual tooth count",
    "undercut": "the rack-generated flank is undercut",
    "pointed-tip": "the tooth comes to a point",
    "thin-tip": "the tip land is thin",
    "tip-land": "tip land of a bevel gear",
    "full-round-root": "the root fillet is a full round",
    "thin-rim": "the rim under the teeth is thin",
    "module-series": "the module is not in the ISO 54 / DIN 780 preferred series",
    "face-vs-module": "the face width is small for the module",
    "face-width": "bevel face width against its limit",
    "hub-too-big": "the hub reaches the root circle",
    "hub-too-thin": "the hub leaves no wall around the bore",
    "bore-too-big": "the bore leaves too little material",
    "bore-too-big-for-hub": "the bore leaves too little hub wall",
    "below-min-feature": "a feature is under the fit profile's smallest printable feature",
    "helix": "the measured helix differs from the helix angle",
    "helix-turn": "the measured turn between two slices differs from the helix",
    "herringbone-mirror": "the two herringbone halves do not mirror",
    # pulleys and belts
    "small-pulley": "the pulley is under its profile's minimum tooth count",
    "set-screw-needs-hub": "set screws need a hub",
    "set-screw-too-big": "the set screw does not fit the hub",
    "groove-count": "the counted grooves differ from the tooth count",
    "groove-depth": "the groove depth differs from its profile",
    "groove-source": "where a groove profile's data come from",
    "groove-spacing": "the groove spacing is not uniform",
    "outside-diameter": "the outside diameter differs from its formula",
    "outline-gap": "the outline does not close",
    "outline-invalid": "the outline is not a valid polygon",
    "outline-orientation": "the outline runs the wrong way",
    "below-min-teeth": "a pulley is under its profile's minimum tooth count",
    "few-teeth-in-mesh": "too few belt teeth in mesh on the small pulley",
    "not-in-stock": "the belt is not among the stocked lengths",
    "center-moved": "the chosen belt moves the center distance",
    "adjust-clipped": "the tensioner range is cut short",
    # meshes (gears in engagement)
    "module-mismatch": "the two members have different modules",
    "pressure-angle-mismatch": "the two members have different pressure angles",
    "helix-mismatch": "the two members have different helix angles",
    "same-hand": "meshing helical members of the same hand",
    "herringbone-mix": "a herringbone with a non-herringbone",
    "no-mesh": "the members cannot be placed in mesh",
    "teeth-interfere": "the teeth overlap in mesh",
    "contact-ratio-low": "the contact ratio is below its limit",
    "contact-below-form": "contact reaches below the form circle",
    "contact-past-tangent": "the path of contact passes the interference point",
    "tip-clearance-low": "the tip clearance is small",
    "backlash-low": "the backlash is under what printing needs",
    "backlash-mismatch": "swept and formula backlash disagree",
    "mesh-geometry": "center distance and working pressure angle of a mesh",
    "mesh-contact": "contact ratio of a mesh",
    "mesh-backlash": "backlash of a mesh",
    "mesh-sweep": "least clearance found by sweeping the outlines",
    "strength-rating": "the declared load is within the Lewis rating",
    "strength-margin": "the declared load exceeds the rating with its safety factor",
    "strength-overload": "the declared load exceeds the unfactored rating",
    # bevel gears and the differential
    "bevel-mismatch": "the bevel pair members do not belong together",
    "bevel-pair": "pitch cones and mounting of a bevel pair",
    "bevel-placement": "the differential's gears cannot be placed",
    "bevel-overlap": "placed bevel gears overlap",
    "bevel-clearance": "least clearance of placed bevel gears",
    "loose-mesh": "placed bevel gears stand apart",
    "apex-offset": "a bevel gear's apex is off the common apex",
    "kinematics": "the kinematic relations of an assembly",
    # planetary sets
    # issue 14: ring gears, internal meshes, planetary sets
    "ring-tip-inside-base": "the ring's tip circle lies inside its base circle",
    "shaper-cut": "how the ring's tooth spaces were cut",
    "involute-interference": "the ring's tips reach inside the pinion's interference point",
    "trochoid-interference": "pinion and ring tips strike as the teeth leave the mesh",
    "tooth-difference": "ring and pinion tooth counts are too close",
    "contact-past-ring-involute": "contact reaches past the ring's involute into its fillet",
    "internal-hand": "a pinion and its ring of opposite hands",
    "axial-assembly-only": "the pinion cannot go into the ring along a radius",
    "planetary-not-coaxial": "sun–planet and planet–ring working distances differ",
    "planet-spacing-unequal": "the planets cannot be spaced equally",
    "planets-collide": "neighbouring planets' tips do not clear",
    "ring-tooth-difference": "ring and planet tooth counts are too close",
    # drive trains (issue 17)
    "chain-stalls": "the motor cannot move the load through the chain",
    "chain-slow": "the chain turns the output slower than wanted",
    "stage-overload": "a stage carries more than its allowable torque",
    "stage-stall-overload": "a stage carries more than its allowable torque at motor stall",
    "chain-summary": "ratio, efficiency, output and weakest stage of a drive train",
    # issue 11: honest checks
    "backlash-high": "the backlash exceeds its maximum: the teeth rattle",
    "rated-at-rest": "a mesh torque was rated without a speed (0 rpm)",
    "below-min-wall": "a wall or rim is thinner than two printed lines",
    "planetary-ratio": "ratio and member speeds of a planetary set",
    "planetary-hand": "helix hands of a planetary set's members",
    "planet-load": "torque and mesh forces on the most loaded planet",
    "planetary-phase": "planets placed out of mesh phase",
    # fit coupon
    "coupon-steps": "what the coupon holds",
    "coupon-reading": "how to read the coupon",
    "piece-missing": "a coupon piece was not found where the layout puts it",
    # issue 15: sector gears, lead screws and nuts, cable drums
    "sector-teeth": "how a sector's tooth count follows from its swing",
    "sector-swing": "the swing a sector pair is checked over",
    "sector-contact": "tooth pairs in contact over a sector pair's swing",
    "sector-contact-lost": "a sector pair loses contact inside its swing",
    "sector-contact-thin": "a sector pair has fewer pairs in contact than full gears somewhere in its swing",
    "sector-stops": "where a sector pair's teeth run out (hard stops)",
    "thread-sizes": "basic sizes of a screw thread",
    "thread-measure": "a thread measured on the section or the triangles differs from its sizes",
    "screw-drive": "lead, efficiency, torques and speed of a power screw",
    "self-locking": "whether the load can drive the screw back",
    "screw-buckling": "Euler buckling load of the screw against the stated load",
    "screw-whirl": "critical (whirling) speed of the screw against the stated speed",
    "nut-fit": "clearance and play of a printed nut on its screw",
    "drum-sizes": "groove, turns and length of a cable drum",
    "drum-ratio": "drum-to-cable diameter ratio against the cable's minimum",
    "capstan": "holding ratio of the dead turns (Euler-Eytelwein)",
    "cable-drive": "cable tension and joint ratio of a drum drive",
    # flywheels and rotors (issue 16)
    "rotor-cautions": "stored energy, containment, creep, speed and review cautions of a rotor",
    "rotor-sizing": "how a rotor's rim was sized for its target",
    "rotor-overspeed": "the rotor's speed is above its burst estimate",
    "rotor-margin": "the rotor's safety factor at its speed is below the stated least",
    "rotor-stress-method": "how a rotor's peak stress was estimated and what is left out",
    "mass-mismatch": "mass properties measured on the triangles differ from the section's",
    # issue 15/16 (kinds3): anti-backlash split nut, flywheel bolt circle
    "split-nut": "slit, bridge, preload screw and float take-up of an anti-backlash nut",
    "split-measure": "a split nut's slit, bridge or preload hole measured on the triangles differs",
    "bolt-circle": "bolt holes of a rotor and the stress they raise",
    "bolt-measure": "a rotor's bolt holes measured on the triangles differ from their layout",
}


@dataclass(frozen=True)
class Finding:
    severity: str         # error | warning | info
    code: str             # short stable identifier, e.g. "undercut"
    message: str          # one line a person reads
    subject: str = ""     # part, mesh or drive name
    source: str = ""      # formula / standard behind it
    key: str = ""         # parameter the finding is about, when there is one
    where: str = ""       # file:line of that parameter (filled in by the pipeline)
    scope: str = "part"   # what the subject is: part, mesh, drive or assembly

    def __post_init__(self):
        if self.code not in CODES:
            raise ValueError(f"finding code {self.code!r} is not in gen.findings.CODES")
        if self.severity not in _RANK:
            raise ValueError(f"finding severity {self.severity!r}")

    def as_dict(self) -> dict:
        return asdict(self)


def worst(findings) -> str | None:
    ranked = sorted((_RANK[f.severity] for f in findings), default=None)
    if ranked is None:
        return None
    return {v: k for k, v in _RANK.items()}[ranked[0]]


def has_errors(findings) -> bool:
    return any(f.severity == ERROR for f in findings)
