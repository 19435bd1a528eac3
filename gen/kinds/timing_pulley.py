"""Part kind ``timing_pulley``: synchronous-belt pulley with optional flanges, hub, set screws.

Stacked along +Z from z = 0: hub (if any), lower flange, toothed band, upper flange. The
toothed band is ``belt_width`` plus a running margin long. Groove geometry and the
ISO 5288 sizes (dp = z·p/π, do = dp − 2a) come from :mod:`gen.geometry.pulley`.
"""

from __future__ import annotations


from gen.errors import GeometryError
from gen.geometry.body import Body, Prism
from gen.geometry.pulley import PROFILES, lookup_profile, pulley_loop, pulley_sizes
from gen.geometry.section import Section, circle
from gen.params.schema import REQUIRED, Key
from gen.kinds import common_keys as K
from gen.kinds.base import Formula, Part, PulleyMate, Role
from gen.tolerances import TOL
from gen.kinds.cylgear import bore_of
from gen.findings import ERROR, WARNING, Finding
from gen.validate.pulley_checks import measure_pulley, pulley_findings

KIND = "timing_pulley"
ROLE = Role.PULLEY
FORMULAS = (
    Formula("pitch_diameter", "d_p = z·p/π", "ISO 5288"),
    Formula("outside_diameter", "d_o = d_p − 2a (a: pitch-line differential)", "ISO 5288"),
)
SET_SCREW_DRILL = K.SET_SCREW_DRILL
#: toothed band longer than the belt so it runs clear of the flanges (common practice)
BAND_MARGIN = 1.0

KEYS = (
    Key("profile", "enum", REQUIRED, choices=tuple(sorted({p.name for p in PROFILES.values()})),
        doc="belt tooth profile"),
    K.TEETH,
    Key("belt_width", "float", REQUIRED, lo=0, hi=200, lo_open=True, unit="mm"),
    Key("flanges", "enum", "both", choices=("none", "one", "both")),
    Key("flange_height", "float", 1.5, lo=0, hi=50, lo_open=True, unit="mm",
        doc="flange rim above the outside diameter"),
    Key("flange_thickness", "float", 1.0, lo=0, hi=20, lo_open=True, unit="mm"),
    Key("fit_allowance", "float", 0.0, lo=0, hi=0.5, unit="mm",
        doc="groove enlargement per flank for printing"),
    K.BORE, K.HUB, K.MATERIAL, K.FIT,
    Key("set_screw", "map", None, sub=(
        Key("size", "enum", "M3", choices=tuple(SET_SCREW_DRILL)),
        Key("count", "int", 1, lo=1, hi=2),
    ), doc="radial set screws through the hub (tap-drill holes)"),
    K.FORCE, K.CHORD,
)
EXAMPLE = {"profile": "curv2", "teeth": 20, "belt_width": 6, "bore": 5,
           "hub": "{diameter: 14, length: 6}"}


def make(name, values, where):
    values = dict(values, fit_allowance=values["fit_allowance"] + K.fit_of(values)["flank_clearance"])
    try:
        prof = lookup_profile(values["profile"])
        sizes = pulley_sizes(prof, values["teeth"], values["fit_allowance"])
        loop = pulley_loop(prof, values["teeth"], values["fit_allowance"])
    except GeometryError as exc:
        raise where.error("teeth", str(exc), values["teeth"]) from None
    chord = values["chord_tolerance"]
    findings = [Finding(f.severity, f.code, f.message, name, f.source,
                        key="teeth" if "teeth" in f.code else "")
                for f in pulley_findings(prof, values["teeth"], loop, values["fit_allowance"],
                                         force=values["force"], chord=chord)]
    bore = bore_of(values)
    holes = ()
    r_root = sizes.fit_root_diameter / 2.0
    if bore is not None:
        try:
            holes = (bore.loop(),)
        except GeometryError as exc:
            raise where.error("bore", str(exc), values["bore"]) from None
        if bore.outer_radius() >= r_root - 0.8:
            findings.append(Finding(ERROR, "bore-too-big", f"bore reaches radius "
                                    f"{bore.outer_radius():.2f} mm, leaving under 0.8 mm below the "
                                    f"groove root (radius {r_root:.2f} mm)", name,
                                    "common practice: ≥ 2 printed perimeters", key="bore"))
    hub, screw = values.get("hub"), values.get("set_screw")
    solids, z = [], 0.0
    if hub:
        if bore is not None and hub["diameter"] / 2.0 < bore.outer_radius() + 1.5:
            findings.append(Finding(ERROR, "bore-too-big-for-hub", f"hub diameter "
                                    f"{hub['diameter']:g} mm leaves under 1.5 mm of wall around the "
                                    f"bore", name, "common practice", key="hub"))
        solids.append(Prism(Section(circle(hub["diameter"] / 2.0), holes), 0.0, hub["length"]))
        z = hub["length"]
    flange_r = sizes.fit_outside_diameter / 2.0 + values["flange_height"]
    t = values["flange_thickness"]
    if values["flanges"] in ("one", "both"):
        solids.append(Prism(Section(circle(flange_r), holes), z, z + t))
        z += t
    band = values["belt_width"] + BAND_MARGIN
    solids.append(Prism(Section(loop, holes), z, z + band))
    z_mid = z + band / 2.0
    z += band
    if values["flanges"] == "both":
        solids.append(Prism(Section(circle(flange_r), holes), z, z + t))
        z += t
    radial = K.set_screw_holes(name, screw, hub, None if bore is None else bore.d / 2.0,
                               bore is not None and bool(bore.flat or bore.keyway), findings)
    body = Body(tuple(solids), radial_holes=radial)
    manifest = {"profile": prof.name, "teeth": sizes.teeth, "pitch": sizes.pitch,
                "pitch_diameter": sizes.pitch_diameter, "outside_diameter": sizes.outside_diameter,
                "root_diameter": sizes.root_diameter, "groove_depth": sizes.groove_depth,
                "fit_allowance": values["fit_allowance"], "belt_width": values["belt_width"],
                "height": z, "flange_diameter": 2 * flange_r if values["flanges"] != "none" else None}
    if values["teeth"] < prof.min_teeth and values["force"]:
        findings.append(Finding(WARNING, "small-pulley", "belt life is short below the minimum "
                                "tooth count", name, prof.note, key="teeth"))
    def slice_check(slicer):
        outer = max(slicer(z_mid), key=len)
        got = measure_pulley(outer)
        out = []
        tol = chord + TOL.slice_extra
        if abs(got.outside_diameter - sizes.fit_outside_diameter) > 2 * tol:
            out.append(Finding(ERROR, "size-mismatch", f"mesh slice: outside diameter "
                               f"{got.outside_diameter:.4f} mm, formula "
                               f"{sizes.fit_outside_diameter:.4f} mm", name, "do = z·p/π − 2a"))
        if got.groove_count != sizes.teeth:
            out.append(Finding(ERROR, "tooth-count", f"mesh slice: {got.groove_count} grooves, "
                               f"expected {sizes.teeth}", name, ""))
        return out

    return Part(name=name, kind=KIND, role=ROLE, values=values, shape=body, sizes=manifest,
                findings=tuple(findings), formulas=FORMULAS,
                mate=PulleyMate(prof.name, sizes.teeth), outline=loop.polygon(chord),
                section=Section(loop, holes), slice_checks=(slice_check,), chord_tol=chord,
                data={"sizes": sizes})
