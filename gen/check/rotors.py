"""Use-case numbers of spinning rotors (``rotors:``): reaction wheel, gyroscope, counter pair.

Each entry names one ``flywheel`` part (two for a pair), or gives the rotor's inertia and
speed inline::

    rotors:
      righting: {use: reaction_wheel, rotor: rover_rotor, body_inertia: 0.045, motor_torque: 0.25}
      steering: {use: gyroscope, rotor: rover_rotor, gimbal_rate: 60}
      pair:     {use: counter_pair, rotors: [wheel_a, wheel_b], torques: [0.1, -0.1]}

Relations (rigid bodies, standard; :mod:`gen.geometry.rotor_use`): reaction wheel α_b = T/I_b,
saturation after t = I_w ω_max / T; gyroscope τ = h Ω; pair h = I₁ω₁ + I₂ω₂, reaction on the
body −(T₁ + T₂). Units: kg·m², rpm, N·m, °/s in the file; rad/s and rad/s² inside.
"""

from __future__ import annotations

import math

from gen.errors import ParamError
from gen.findings import ERROR, Finding
from gen.geometry.rotor_use import (counter_rotating_pair, gyroscopic_torque, reaction_wheel,
                                    rpm_to_rad)
from gen.params.schema import REQUIRED, Key, Where, check_mapping

USES = ("reaction_wheel", "gyroscope", "counter_pair")

ROTOR_KEYS = (
    Key("use", "enum", REQUIRED, choices=USES, doc="what the rotor does"),
    Key("rotor", "str", None, doc="a flywheel part (reaction_wheel, gyroscope)"),
    Key("rotors", "list", None, item="str", count=2, doc="two flywheel parts (counter_pair)"),
    Key("inertia", "float", None, lo=0, hi=1e6, lo_open=True, unit="kg·m²",
        doc="rotor inertia, when no part is named"),
    Key("max_speed", "float", None, lo=0, hi=200000, lo_open=True, unit="rpm",
        doc="rotor top speed, when no part is named"),
    Key("inertias", "list", None, count=2, lo=0, hi=1e6, unit="kg·m²",
        doc="the pair's inertias, when no parts are named"),
    Key("speeds", "list", None, count=2, lo=-200000, hi=200000, unit="rpm",
        doc="the pair's signed speeds (+ counter-clockwise seen from +z); default: the parts' "
            "max_speed, the second reversed"),
    Key("torques", "list", None, count=2, lo=-1e5, hi=1e5, unit="N·m",
        doc="the pair's signed motor torques on their rotors"),
    Key("transverse_rate", "float", 0.0, lo=-1e5, hi=1e5, unit="°/s",
        doc="turn rate of the pair's axis, for the net gyroscopic torque"),
    Key("body_inertia", "float", None, lo=0, hi=1e6, lo_open=True, unit="kg·m²",
        doc="inertia of the body the reaction wheel turns, about the wheel's axis"),
    Key("motor_torque", "float", None, lo=0, hi=1e5, lo_open=True, unit="N·m",
        doc="reaction-wheel motor torque"),
    Key("gimbal_rate", "float", None, lo=0, hi=1e5, lo_open=True, unit="°/s",
        doc="gimbal turn rate, perpendicular to the spin axis"),
)
#: keys each use needs and keys it may take (besides the rotor's own)
NEEDS = {"reaction_wheel": ("body_inertia", "motor_torque"), "gyroscope": ("gimbal_rate",),
         "counter_pair": ()}
TAKES = {"reaction_wheel": {"rotor", "inertia", "max_speed", "body_inertia", "motor_torque"},
         "gyroscope": {"rotor", "inertia", "max_speed", "gimbal_rate"},
         "counter_pair": {"rotors", "inertias", "speeds", "torques", "transverse_rate"}}


def _err(where: Where, key, msg, value=None) -> Finding:
    return Finding(ERROR, "parameter", where.error(key, msg, value).one_line(), where.part, "",
                   scope="rotor")


class _Refused(Exception):
    def __init__(self, finding):
        self.finding = finding


def _part(result, name, where, key):
    """(inertia kg·m², max speed rpm) of a flywheel part; None if it failed on its own."""
    if name not in result.project.parts:
        raise _Refused(_err(where, key, f"names unknown part '{name}'"))
    m = result.models.get(name)
    if m is None:
        return None
    if m.kind != "flywheel":
        raise _Refused(_err(where, key, f"part '{name}' is not a flywheel"))
    return m.sizes["inertia_axial"], m.sizes["max_speed"]


def _single(result, v, where):
    if v["rotor"] is not None:
        if v["inertia"] is not None or v["max_speed"] is not None:
            raise _Refused(_err(where, "rotor", "give rotor, or inertia and max_speed, not both"))
        return _part(result, v["rotor"], where, "rotor")
    for k in ("inertia", "max_speed"):
        if v[k] is None:
            raise _Refused(_err(where, k, "give rotor: <flywheel part>, or inertia (kg·m²) and "
                                "max_speed (rpm)"))
    return v["inertia"], v["max_speed"]


def _pair(result, v, where):
    if v["rotors"] is not None:
        if v["inertias"] is not None:
            raise _Refused(_err(where, "rotors", "give rotors or inertias, not both"))
        got = [_part(result, n, where, "rotors") for n in v["rotors"]]
        if None in got:
            return None
        inertias = [g[0] for g in got]
        speeds = v["speeds"] or [got[0][1], -got[1][1]]
    else:
        if v["inertias"] is None or v["speeds"] is None:
            raise _Refused(_err(where, "rotors", "give rotors: [a, b], or inertias and speeds"))
        if min(v["inertias"]) <= 0:
            raise _Refused(_err(where, "inertias", "inertias must be > 0 kg·m²", v["inertias"]))
        inertias, speeds = v["inertias"], v["speeds"]
    return inertias, speeds


def evaluate(result, entry) -> tuple[dict | None, list]:
    """The numbers of one ``rotors:`` entry, or None and the findings that say why not."""
    where = Where(entry.file, entry.label, entry.line, section="rotor")
    try:
        v = check_mapping(entry.values, ROTOR_KEYS, where)
    except ParamError as exc:
        return None, [Finding(ERROR, "parameter", exc.one_line(), entry.label, "", scope="rotor")]
    use = v["use"]
    given = {k for k in entry.values if k != "use"}
    stray = sorted(given - TAKES[use])
    if stray:
        return None, [_err(where, stray[0], f"does not belong to use: {use}")]
    for k in NEEDS[use]:
        if v[k] is None:
            return None, [_err(where, k, f"is required for use: {use}")]
    try:
        out = {"name": entry.label, "use": use}
        if use == "counter_pair":
            got = _pair(result, v, where)
            if got is None:
                return None, []
            (i1, i2), (n1, n2) = got
            t1, t2 = v["torques"] or (0.0, 0.0)
            cp = counter_rotating_pair(i1, rpm_to_rad(n1), i2, rpm_to_rad(n2), t1, t2,
                                       math.radians(v["transverse_rate"]))
            out.update(rotors=v["rotors"], inertias=[i1, i2], speeds=[n1, n2],
                       torques=[t1, t2], net_momentum=cp.net_momentum,
                       net_reaction_torque=cp.net_reaction_torque,
                       reaction_direction=cp.reaction_direction,
                       transverse_rate=v["transverse_rate"],
                       gyroscopic_torque=cp.gyroscopic_torque)
            return out, []
        got = _single(result, v, where)
        if got is None:
            return None, []
        inertia, n_max = got
        out.update(rotor=v["rotor"], inertia=inertia, max_speed=n_max,
                   angular_momentum=inertia * rpm_to_rad(n_max))
        if use == "reaction_wheel":
            rw = reaction_wheel(inertia, v["body_inertia"], v["motor_torque"], rpm_to_rad(n_max))
            out.update(body_inertia=v["body_inertia"], motor_torque=v["motor_torque"],
                       body_acceleration=rw.body_acceleration,
                       saturation_time=rw.saturation_time,
                       body_rate_at_saturation=rw.body_rate_at_saturation)
        else:
            out.update(gimbal_rate=v["gimbal_rate"],
                       output_torque=gyroscopic_torque(out["angular_momentum"],
                                                       math.radians(v["gimbal_rate"])))
        return out, []
    except _Refused as exc:
        return None, [exc.finding]


def check_rotors(result) -> None:
    """Evaluate every ``rotors:`` entry into ``result.rotors`` (errors into findings)."""
    for entry in result.project.entries.get("rotors", []):
        numbers, findings = evaluate(result, entry)
        result.findings += findings
        if numbers is not None:
            result.rotors.append(numbers)


def rotor_lines(rotors) -> list[str]:
    """A few plain lines per ``rotors:`` entry for ``pitchline check``."""
    lines = []
    for r in rotors:
        if r["use"] == "reaction_wheel":
            lines.append(f"  rotor {r['name']} (reaction wheel{_of(r)}): body turns at "
                         f"{r['body_acceleration']:.3g} rad/s² ({math.degrees(r['body_acceleration']):.3g} °/s²); "
                         f"wheel saturates at {r['max_speed']:g} rpm after {r['saturation_time']:.3g} s, "
                         f"body then at {math.degrees(r['body_rate_at_saturation']):.3g} °/s")
        elif r["use"] == "gyroscope":
            lines.append(f"  rotor {r['name']} (gyroscope{_of(r)}): h = {r['angular_momentum']:.3g} "
                         f"N·m·s at {r['max_speed']:g} rpm, gimbal {r['gimbal_rate']:g} °/s → "
                         f"output torque {r['output_torque']:.3g} N·m")
        else:
            lines.append(f"  rotor {r['name']} (counter-rotating pair"
                         f"{' ' + '/'.join(r['rotors']) if r['rotors'] else ''}): net h "
                         f"{r['net_momentum']:.3g} N·m·s; motor reaction on the body "
                         f"{r['net_reaction_torque']:.3g} N·m ({r['reaction_direction']}); "
                         f"gyroscopic torque {r['gyroscopic_torque']:.3g} N·m at "
                         f"{r['transverse_rate']:g} °/s")
    return lines


def _of(r) -> str:
    return f", {r['rotor']}" if r.get("rotor") else ""
