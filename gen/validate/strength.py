"""Tooth bending strength of (printed) plastic gears: metric Lewis formula with Barth's Kv.

    σ = K_v · F_t / (b · m · Y)                    (Lewis, metric form; Shigley eq. 14-7)

F_t transmitted tangential load at the pitch circle (N), b face width (mm), m (normal) module
(mm), Y the Lewis form factor measured on the generated tooth (:mod:`gen.geometry.lewis`),
σ in MPa. The rating inverts it with an allowable stress reduced by a safety factor:

    F_t,rated = σ_allow · b · m · Y / (S · K_v),    T_rated = F_t,rated · d / 2.

Everything here is an estimate (see :data:`CAUTION`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

from gen.errors import ParamError, PitchlineError
from gen.geometry.basic_rack import BasicRack
from gen.geometry.cylindrical import GearSizes
from gen.geometry.lewis import lewis_gear, lewis_rack
from gen.findings import ERROR, INFO, WARNING, Finding

#: text for reports and part summaries
CAUTION = ("Strength figures are estimates only (Lewis bending formula, conservative material "
           "values, no wear, heat, creep or print-quality effects). Test printed parts under "
           "the real load before relying on them, and guard the pinch points where teeth mesh.")

SOURCE = "Lewis bending σ = Kv·Ft/(b·m·Y) (Shigley §14-1), Barth velocity factor"


# --- velocity factor --------------------------------------------------------------------------

#: Barth velocity factors in Shigley's metric forms, V in m/s (from memory):
#: name → (constant A, square root of V?) for Kv = (A + V)/A or (A + √V)/A.
KV_FORMS = {
    "cast": (3.05, False),      # cast iron, cast profile
    "cut": (6.1, False),        # cut or milled profile
    "hobbed": (3.56, True),     # hobbed or shaped profile
    "shaved": (5.56, True),     # shaved or ground profile
}

#: The form used for printed gears. Printed teeth are formed, not machined: layer steps,
#: extrusion width and shrinkage leave profile and pitch errors of roughly 0.05–0.2 mm, as
#: large as or larger than on cast teeth, so the dynamic load is rated like a cast profile.
#: Of the four it gives the largest Kv above 0.73 m/s; below that the hobbed form is higher,
#: by at most 0.06 (at 0.18 m/s), where Kv is close to 1 anyway.
PRINTED_KV = "cast"


def velocity_factor(v: float, form: str | Callable[[float], float] = PRINTED_KV) -> float:
    """Barth velocity factor Kv at pitch-line velocity ``v`` (m/s).

    ``form`` is a name from :data:`KV_FORMS` or a callable v → Kv (any other rule).
    """
    if v < 0:
        raise PitchlineError(f"pitch-line velocity must be ≥ 0 m/s, got {v}")
    if callable(form):
        return float(form(v))
    try:
        a, root = KV_FORMS[form]
    except KeyError:
        raise ParamError(f"unknown velocity factor form {form!r}", key="kv_form",
                         allowed=", ".join(KV_FORMS)) from None
    return (a + (math.sqrt(v) if root else v)) / a


def pitch_line_velocity(diameter: float, rpm: float) -> float:
    """V = π d n / 60000 (m/s) for a pitch diameter d (mm) turning at n (rpm)."""
    return math.pi * diameter * abs(rpm) / 60000.0


# --- materials ---------------------------------------------------------------------------------

@dataclass(frozen=True)
class Material:
    """Allowable bending stress for a gear tooth (MPa) and density (g/cm³)."""

    name: str
    allowable_bending: float
    density: float | None = None
    note: str = ""


#: Printed-part values, common practice, deliberately conservative ESTIMATES, not datasheet
#: figures: about a quarter of typical flexural strength of printed specimens, rounded down,
#: for dry material at room temperature with solid walls around the teeth. Densities are
#: the usual bulk values of the polymer.
MATERIALS = {
    "PLA": Material("PLA", 14.0, 1.24, "stiff; creeps and softens above about 50 °C"),
    "PETG": Material("PETG", 12.0, 1.27, "tougher than PLA, somewhat lower strength"),
    "ABS": Material("ABS", 10.0, 1.04, "layer bonding limits tooth strength"),
    "PA": Material("PA", 16.0, 1.14, "nylon; good fatigue and wear, absorbs moisture"),
    "POM": Material("POM", 16.0, 1.41, "acetal; low friction, hard to print without warping"),
}
_ALIASES = {"NYLON": "PA", "PA6": "PA", "PA12": "PA", "ACETAL": "POM", "DELRIN": "POM"}


def material(name: str | Material) -> Material:
    """Look up a material by name (PLA, PETG, ABS, PA/nylon, POM/acetal), case-insensitive."""
    if isinstance(name, Material):
        return name
    key = str(name).strip().upper()
    key = _ALIASES.get(key, key)
    try:
        return MATERIALS[key]
    except KeyError:
        raise ParamError(f"unknown material {name!r}", key="material",
                         allowed="PLA, PETG, ABS, PA (nylon), POM (acetal)") from None


def mass_grams(volume_mm3: float, mat: str | Material) -> float:
    """Mass (g) of a solid of ``volume_mm3`` in the material: V·ρ / 1000."""
    m = material(mat)
    if m.density is None:
        raise PitchlineError(f"material {m.name} has no density")
    return volume_mm3 * m.density / 1000.0


# --- gear under load ---------------------------------------------------------------------------

@dataclass(frozen=True)
class LoadedGear:
    """What the Lewis rating needs about one gear or rack (lengths mm)."""

    name: str
    module: float                  # normal module
    face_width: float
    form_factor: float             # Lewis Y
    pitch_diameter: float | None   # None for a rack
    teeth: float | None            # None for a rack

    @property
    def is_rack(self) -> bool:
        return self.pitch_diameter is None


def _check_width(face_width: float) -> None:
    if not face_width > 0:
        raise ParamError("face width must be > 0 mm", key="face_width", value=face_width)


def loaded_gear(sizes: GearSizes, rack: BasicRack, face_width: float, name: str = "",
                form_factor: float | None = None) -> LoadedGear:
    """A gear for rating; Y is measured on its generated tooth unless ``form_factor`` is given.

    For helical gears the rating is the normal-section Lewis check on the virtual spur gear
    (Y of z/cos³β, normal module): σ = (F_t/cos β) / ((b/cos β)·m_n·Y) = F_t/(b·m_n·Y).
    """
    _check_width(face_width)
    y = form_factor if form_factor is not None else lewis_gear(sizes, rack).form_factor
    return LoadedGear(name=name, module=sizes.mn, face_width=face_width, form_factor=y,
                      pitch_diameter=sizes.d, teeth=sizes.z)


def loaded_rack(module: float, rack: BasicRack, face_width: float, name: str = "",
                thinning: float = 0.0, form_factor: float | None = None) -> LoadedGear:
    """A rack for rating (it carries a force, not a torque)."""
    _check_width(face_width)
    y = (form_factor if form_factor is not None
         else lewis_rack(rack, module, thinning=thinning).form_factor)
    return LoadedGear(name=name, module=module, face_width=face_width, form_factor=y,
                      pitch_diameter=None, teeth=None)


def bending_stress(gear: LoadedGear, force: float, speed: float = 0.0,
                   kv_form: str | Callable = PRINTED_KV) -> float:
    """Lewis bending stress σ = Kv·F_t/(b·m·Y) in MPa for a tangential load F_t (N) at V (m/s)."""
    kv = velocity_factor(speed, kv_form)
    return kv * force / (gear.face_width * gear.module * gear.form_factor)


def _check_safety(safety_factor: float) -> None:
    if not safety_factor > 0:
        raise ParamError("safety factor must be > 0", key="safety_factor", value=safety_factor)


def rated_force(gear: LoadedGear, mat: str | Material, safety_factor: float = 2.0,
                speed: float = 0.0, kv_form: str | Callable = PRINTED_KV) -> float:
    """Largest tangential load (N): F_t = σ_allow·b·m·Y / (S·Kv), at pitch-line speed V (m/s)."""
    _check_safety(safety_factor)
    m = material(mat)
    kv = velocity_factor(speed, kv_form)
    return m.allowable_bending * gear.face_width * gear.module * gear.form_factor / (
        safety_factor * kv)


def rated_torque(gear: LoadedGear, mat: str | Material, safety_factor: float = 2.0,
                 rpm: float = 0.0, kv_form: str | Callable = PRINTED_KV) -> float:
    """Largest torque (N·m) on a gear turning at ``rpm``: T = F_t,rated · d / 2 / 1000."""
    if gear.is_rack:
        label = f"rack '{gear.name}'" if gear.name else "a rack"
        raise PitchlineError(f"{label} carries a force, not a torque: use rated_force")
    v = pitch_line_velocity(gear.pitch_diameter, rpm)
    return rated_force(gear, mat, safety_factor, v, kv_form) * gear.pitch_diameter / 2000.0


def strength_findings(gear: LoadedGear, mat: str | Material, *, torque: float | None = None,
                      force: float | None = None, safety_factor: float = 2.0, rpm: float = 0.0,
                      speed: float | None = None, kv_form: str | Callable = PRINTED_KV,
                      subject: str = "") -> list[Finding]:
    """Compare a declared load with the Lewis rating.

    Gears take ``torque`` (N·m) at ``rpm``; racks take ``force`` (N) at ``speed`` (m/s). The
    result is one finding: error when the load exceeds the rating even without the safety
    factor (stress above the allowable), warning when it exceeds the rating with it, info
    with the rating otherwise.
    """
    _check_safety(safety_factor)
    m = material(mat)
    subject = subject or gear.name
    if gear.is_rack:
        if force is None:
            raise ParamError("a rack needs a declared force (N) for the strength check",
                             key="force", part=subject or None)
        v = abs(speed or 0.0)
        load, rate = abs(force), rated_force(gear, m, safety_factor, v, kv_form)
        rate_1 = rated_force(gear, m, 1.0, v, kv_form)
        what, unit, at = "force", "N", f"{v:.3g} m/s"
    else:
        if torque is None:
            raise ParamError("a gear needs a declared torque (N·m) for the strength check",
                             key="torque", part=subject or None)
        v = pitch_line_velocity(gear.pitch_diameter, rpm) if speed is None else abs(speed)
        load = abs(torque)
        rate = rated_force(gear, m, safety_factor, v, kv_form) * gear.pitch_diameter / 2000.0
        rate_1 = rate * safety_factor
        what, unit, at = "torque", "N·m", f"{abs(rpm):.4g} rpm"
    kv = velocity_factor(v, kv_form)
    terms = (f"{m.name}, allowable {m.allowable_bending:g} MPa, safety factor "
             f"{safety_factor:g}, {at}, Lewis Y {gear.form_factor:.3f}, Kv {kv:.3f}")
    src = SOURCE + "; material values are common-practice estimates"
    if load > rate_1:
        return [Finding(ERROR, "strength-overload",
                        f"declared {what} {load:.3g} {unit} exceeds the rated {what} "
                        f"{rate:.3g} {unit} and even the unfactored {rate_1:.3g} {unit} "
                        f"({terms})", subject, src)]
    if load > rate:
        return [Finding(WARNING, "strength-margin",
                        f"declared {what} {load:.3g} {unit} exceeds the rated {what} "
                        f"{rate:.3g} {unit} ({terms})", subject, src)]
    return [Finding(INFO, "strength-rating",
                    f"declared {what} {load:.3g} {unit} within the rated {what} "
                    f"{rate:.3g} {unit} ({terms})", subject, src)]
