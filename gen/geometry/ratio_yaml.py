"""A found tooth-count train as a ready parameter file (YAML text; no YAML library needed).

Spur stages become one ``trains:`` entry (a shared module and pressure angle) with a driver
and a driven ``spur_gear`` per stage and one ``meshes:`` entry per pair; belt stages become two
``timing_pulley`` parts and a ``drives:`` entry. Planetary stages cannot be written yet (the
project has no internal-gear part kind) and are refused.

Choices written into the file (all visible and editable there):

* profile shift of a gear below the undercut limit: x = 1 − z·sin²α/2 rounded up to 0.05
  (no undercut for a rack-generated gear when x ≥ 1 − z·sin²α/2, the ISO 53 basic rack with
  h_aP = m; the mate keeps x = 0, so the pair runs at its working center distance);
* tooth thinning ``backlash_allowance`` 0.12 mm per gear (printing practice 0.05–0.2 mm);
* face width 8·m unless given (8–12 m is the usual range for spur gears, from memory);
* belt center distance: the sum of the two pitch diameters rounded up to a whole mm (a
  starting value of our own; ``pitchline check`` reports wrap and teeth in mesh);
* with an input torque and speed, each mesh gets the torque and speed at its driver, after
  the default stage efficiencies of :mod:`gen.geometry.drivetrain` (common practice).
"""

from __future__ import annotations

import math
import re

from gen.errors import GeometryError
from gen.geometry.drivetrain import DEFAULT_EFFICIENCY
from gen.geometry.pulley import lookup_profile

_NAME = re.compile(r"^[A-Za-z0-9][A-Za-z0-9_.-]{0,40}$")
#: rounding step of a written profile shift (coefficient)
SHIFT_STEP = 0.05


def _num(v: float) -> str:
    """A short, exact-enough number for a parameter file."""
    return f"{round(float(v), 6):g}"


def undercut_free_shift(z: int, pressure_angle: float) -> float:
    """Smallest profile shift, rounded up to ``SHIFT_STEP``, that avoids undercut.

    x_min = 1 − z·sin²α/2 (rack-generated gear, addendum of the basic rack 1·m); 0 when the
    gear needs none. ``pressure_angle`` in degrees.
    """
    x = 1.0 - z * math.sin(math.radians(pressure_angle)) ** 2 / 2.0
    if x <= 0:
        return 0.0
    return math.ceil(x / SHIFT_STEP - 1e-9) * SHIFT_STEP


def train_yaml(solution, *, name: str = "drive", module: float = 1.0,
               pressure_angle: float = 20.0, face_width: float | None = None,
               backlash_allowance: float = 0.12,
               belt_profile: str = "curv2", belt_width: float = 6.0,
               input_torque: float | None = None, input_speed: float | None = None) -> str:
    """Parameter-file text for ``solution`` (a :class:`~gen.geometry.ratio_search.RatioSolution`).

    ``module`` mm, ``pressure_angle`` degrees, ``face_width`` and ``belt_width`` mm,
    ``backlash_allowance`` mm of tooth thinning per gear (printing practice 0.05–0.2 mm),
    ``input_torque`` N·m and ``input_speed`` rpm at the first stage's driver (optional).
    """
    if not _NAME.match(name):
        raise GeometryError(f"train name {name!r} is not allowed: letters, digits, '_', '-', "
                            f"'.', starting with a letter or digit, at most 41 characters")
    if any(s.kind == "planetary" for s in solution.stages):
        raise GeometryError("planetary stages cannot be written as a parameter file yet (no "
                            "internal-gear part kind); search with spur or belt stages")
    if not (module > 0 and math.isfinite(module)):
        raise GeometryError(f"module must be a positive number of mm (got {module!r})")
    prof = lookup_profile(belt_profile)
    b = face_width if face_width is not None else 8.0 * module
    gears, pulleys, meshes, drives, shafts = [], [], [], [], [[]]
    torque, speed = input_torque, input_speed
    for k, st in enumerate(solution.stages, start=1):
        z1, z2 = st.teeth
        a, c = f"{name}_{k}_driver", f"{name}_{k}_driven"
        shafts[-1].append(a)
        shafts.append([c])
        load = ""
        if torque is not None:
            load += f"\n    torque: {_num(torque)}  # N·m at {a}"
        if speed is not None:
            load += f"\n    speed: {_num(speed)}  # rpm of {a}"
        if st.kind == "spur":
            for part, z in ((a, z1), (c, z2)):
                x = undercut_free_shift(z, pressure_angle)
                shift = f", profile_shift: {_num(x)}" if x else ""
                gears.append(f"      {part}: {{kind: spur_gear, teeth: {z}{shift}, "
                             f"face_width: {_num(b)}, "
                             f"backlash_allowance: {_num(backlash_allowance)}}}")
            meshes.append(f"  - parts: [{a}, {c}]" + load)
        else:
            for part, z in ((a, z1), (c, z2)):
                pulleys.append(f"  {part}: {{kind: timing_pulley, profile: {prof.name}, "
                               f"teeth: {z}, belt_width: {_num(belt_width)}}}")
            center = math.ceil((z1 + z2) * prof.pitch / math.pi - 1e-9)
            drives.append(f"  {name}_{k}_belt: {{pulleys: [{a}, {c}], "
                          f"center_distance: {center}}}")
        if torque is not None:
            torque = torque * st.ratio * DEFAULT_EFFICIENCY[st.kind]
        if speed is not None:
            speed = speed / st.ratio
    lines = [
        f"# {name}: {len(solution.stages)}-stage train, ratio {solution.ratio:.10g} "
        f"for a wanted {solution.target:.10g} (error {solution.error:+.3g}).",
        "# Written by `pitchline ratio`; check it with `pitchline check` before printing.",
        "# Parts on one shaft, from the input: "
        + "; ".join(f"shaft {i + 1}: " + " + ".join(s) for i, s in enumerate(shafts)) + ".",
        "# Units: mm and degrees.",
    ]
    if pulleys:
        lines += ["parts:"] + pulleys
    if gears:
        lines += ["trains:", f"  {name}:", f"    module: {_num(module)}",
                  f"    pressure_angle: {_num(pressure_angle)}", "    parts:"] + gears
    if meshes:
        lines += ["meshes:"] + meshes
    if drives:
        lines += ["drives:"] + drives
    return "\n".join(lines) + "\n"
