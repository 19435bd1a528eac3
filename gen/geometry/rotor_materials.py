"""Materials for rotors: density, strength, Poisson's ratio, Young's modulus — with status words.

Every value carries how we know it: ``common practice`` (a value the trade uses without one
source), ``handbook`` (a typical published value for the named grade), ``from memory`` (recalled,
not re-read). Printed plastics are given an *allowable* stress — a deliberately conservative
estimate, about a quarter of the tensile strength of solid (100 % infill) printed specimens
loaded along the layers, rounded down; metals are given their *yield* stress, to be divided by
a safety factor. Densities assume solid material: a part printed with infill is lighter and
its inertia lower, so a rotor meant to store momentum should be printed solid.

Units: density kg/m³, stresses and Young's modulus MPa.
"""

from __future__ import annotations

from dataclasses import dataclass

from gen.errors import ParamError

PRACTICE, HANDBOOK, MEMORY = "common practice", "handbook", "from memory"


@dataclass(frozen=True)
class RotorMaterial:
    """One material. ``strength_kind`` is "allowable" (already reduced) or "yield"."""

    name: str
    density: float            # kg/m³
    strength: float           # MPa
    strength_kind: str        # "allowable" | "yield"
    poisson: float            # ν
    youngs: float             # MPa
    status: tuple             # ((field, status word), ...)
    note: str = ""

    def status_of(self, field: str) -> str:
        return dict(self.status)[field]


def _st(density, strength, poisson, youngs):
    return (("density", density), ("strength", strength), ("poisson", poisson),
            ("youngs", youngs))


ROTOR_MATERIALS = {
    # printed plastics: densities are the usual bulk values (common practice); allowables a
    # conservative quarter of printed tensile strength (common practice); ν and E from memory.
    "PLA": RotorMaterial("PLA", 1240.0, 12.0, "allowable", 0.36, 3500.0,
                         _st(PRACTICE, PRACTICE, MEMORY, MEMORY),
                         "stiff; creeps and softens above about 50 °C"),
    "PETG": RotorMaterial("PETG", 1270.0, 10.0, "allowable", 0.38, 2100.0,
                          _st(PRACTICE, PRACTICE, MEMORY, MEMORY)),
    "ABS": RotorMaterial("ABS", 1040.0, 8.0, "allowable", 0.35, 2200.0,
                         _st(PRACTICE, PRACTICE, MEMORY, MEMORY)),
    "PA": RotorMaterial("PA", 1140.0, 12.0, "allowable", 0.39, 1700.0,
                        _st(PRACTICE, PRACTICE, MEMORY, MEMORY),
                        "nylon; absorbs moisture, stiffness falls when wet"),
    "POM": RotorMaterial("POM", 1410.0, 14.0, "allowable", 0.35, 2800.0,
                         _st(PRACTICE, PRACTICE, MEMORY, MEMORY)),
    # metals: handbook-typical values for the named grade, recalled (from memory)
    "STEEL": RotorMaterial("steel", 7850.0, 235.0, "yield", 0.30, 210000.0,
                           _st(HANDBOOK, MEMORY, HANDBOOK, HANDBOOK),
                           "structural steel S235 (EN 10025) minimum yield"),
    "AL6061": RotorMaterial("aluminium 6061-T6", 2700.0, 276.0, "yield", 0.33, 68900.0,
                            _st(HANDBOOK, MEMORY, HANDBOOK, MEMORY)),
    "BRASS": RotorMaterial("brass", 8500.0, 124.0, "yield", 0.34, 97000.0,
                           _st(HANDBOOK, MEMORY, MEMORY, MEMORY),
                           "free-cutting brass, soft temper; harder tempers are stronger"),
}
_ALIASES = {"NYLON": "PA", "ACETAL": "POM", "ALUMINIUM": "AL6061", "ALUMINUM": "AL6061",
            "6061": "AL6061", "AL": "AL6061"}


def rotor_material(name: str | RotorMaterial) -> RotorMaterial:
    """Look a material up by name (case-insensitive; nylon, acetal, aluminium are aliases)."""
    if isinstance(name, RotorMaterial):
        return name
    key = str(name).strip().upper().replace(" ", "").replace("-T6", "")
    key = _ALIASES.get(key, key)
    try:
        return ROTOR_MATERIALS[key]
    except KeyError:
        raise ParamError(f"unknown rotor material {name!r}", key="material",
                         allowed=", ".join(m.name for m in ROTOR_MATERIALS.values())) from None
