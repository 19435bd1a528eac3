"""Part kind ``lead_screw``: an ISO 2904 trapezoidal or ISO 68-1 metric power screw.

Frame: axis on Z from z = 0 to the length; lobe (start) 0 of the thread centred on +X at z = 0.
The thread is exact: a helicoid is a profile turning uniformly along the axis, so the
transverse section (:func:`gen.geometry.screw.screw_section`) carried by a twisted prism of
twist 2π/L (rad/mm, + right-hand; :mod:`gen.geometry.body`) sweeps the real flanks.

Drive numbers (optional keys ``load``, ``rpm``, ``end_fixity``, ``free_length``): torque to
raise and lower the load and efficiency (Shigley, Mechanical Engineering Design §8-2, from
memory), nut speed v = n L / 60, Euler buckling on the root diameter and the first whirling
speed (:mod:`gen.geometry.screw_drive`); stiffness and density of the screw material from
:data:`gen.geometry.rotor_materials.ROTOR_MATERIALS`.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.findings import ERROR, INFO, WARNING, Finding
from gen.geometry.body import Body, Prism
from gen.geometry.rotor_materials import rotor_material
from gen.geometry.screw import screw_section, screw_twist
from gen.geometry.screw_drive import (END_CONDITIONS, buckling_load, critical_speed, linear_speed,
                                      screw_torques)
from gen.geometry.section import Section
from gen.kinds import common_keys as K
from gen.kinds.base import Part, Role
from gen.kinds.thread_common import FORMULAS, THREAD_KEYS, sizes_of, thread_manifest
from gen.params.schema import Key
from gen.tolerances import LIMITS, TOL
from gen.validate import measure

KIND = "lead_screw"
ROLE = Role.SCREW

KEYS = THREAD_KEYS + (
    Key("load", "float", None, lo=0, hi=1e7, unit="N", doc="axial load the nut moves"),
    Key("rpm", "float", None, lo=0, hi=1e5, unit="rpm", doc="screw speed"),
    Key("end_fixity", "enum", "fixed-free", choices=END_CONDITIONS,
        doc="how the screw's ends are held, for buckling and whirling"),
    Key("free_length", "float", None, lo=0, hi=5000, lo_open=True, unit="mm",
        doc="unsupported length for buckling and whirling (default: the length)"),
    K.CHORD,
)

EXAMPLE = {"thread": "trapezoidal", "diameter": 8, "pitch": 2, "starts": 4, "length": 40}


def measure_thread(poly: np.ndarray, s) -> dict:
    """Sizes measured on a transverse section of the screw (mm, rad): extreme radii, lobe
    count and angular widths on the pitch circle (each 2φ = π P / L for the ISO thickness
    P/2 on d2), and the centre angle of each lobe there."""
    r = measure.radii(poly)
    # measured a hair outside d2: the section's flank samples include points exactly on the
    # pitch circle, which a crossing test with strict sides would skip (one start: no lobe)
    arcs = measure.material_arcs(poly, s.d2 / 2.0 * (1.0 + 1e-9))
    return {"major": 2.0 * float(r.max()), "minor": 2.0 * float(r.min()),
            "lobes": len(arcs), "widths": arcs[:, 1] if len(arcs) else np.zeros(0),
            "centres": (arcs[:, 0] + arcs[:, 1] / 2.0) if len(arcs) else np.zeros(0)}


def thread_findings(name, got, s, tol, where) -> list:
    """Errors where the measured thread differs from its ISO sizes."""
    out = []
    src = "ISO 2904" if s.form == "trapezoidal" else "ISO 68-1"

    def bad(msg):
        out.append(Finding(ERROR, "thread-measure", f"{where}: {msg}", name, src))

    if abs(got["major"] - s.d) > 2 * tol:
        bad(f"major diameter {got['major']:.4f} mm, expected {s.d:.4f} mm")
    if abs(got["minor"] - s.d3) > 2 * tol:
        bad(f"minor diameter {got['minor']:.4f} mm, expected {s.d3:.4f} mm")
    if got["lobes"] != s.starts:
        bad(f"{got['lobes']} thread starts counted, expected {s.starts}")
    elif len(got["widths"]):
        axial = got["widths"] * s.lead / (2.0 * math.pi)
        if np.max(np.abs(axial - s.pitch / 2.0)) > 2 * tol:
            bad(f"thread thickness on d2 {axial.mean():.4f} mm, expected P/2 = "
                f"{s.pitch / 2.0:.4f} mm")
    return out


def lead_between(c0: np.ndarray, c1: np.ndarray, dz: float, starts: int) -> float:
    """Signed lead (mm, + right-hand) from lobe centre angles at two heights dz apart:
    L = 2π dz / Δθ, Δθ the turn of the nearest lobe (|Δθ| < π / n)."""
    d = (c1[:, None] - c0[None, :] + math.pi) % (2.0 * math.pi) - math.pi
    turn = d.flat[np.argmin(np.abs(d))]
    return 2.0 * math.pi * dz / turn if turn else math.inf


def drive_findings(name, values, s, friction) -> tuple[dict, list]:
    """Torques, speed, buckling and whirling for the optional drive keys."""
    sizes, out = {}, []
    load, rpm = values.get("load"), values.get("rpm")
    span = values.get("free_length") or values["length"]
    end = values["end_fixity"]
    mat = rotor_material(values["screw_material"])
    if load is not None:
        tq = screw_torques(load, s.d2, s.lead, s.half_angle, friction)
        sizes.update(load=load, torque_raise=tq.raise_torque, torque_lower=tq.lower_torque)
        out.append(Finding(INFO, "screw-drive", f"{load:g} N: raise {tq.raise_torque * 1000:.1f} "
                           f"N·mm, lower {tq.lower_torque * 1000:.1f} N·mm"
                           f"{' (the load back-drives the screw)' if tq.lower_torque < 0 else ''}; "
                           f"efficiency raising {tq.efficiency:.1%}", name,
                           "Shigley §8-2 power-screw torques", key="load"))
        pcr = buckling_load(s.d3, span, mat.youngs, end)
        sizes["buckling_load"] = pcr
        need = LIMITS.screw_buckling_safety * load
        sev = ERROR if load >= pcr else WARNING if pcr < need else INFO
        out.append(Finding(sev, "screw-buckling", f"Euler buckling load {pcr:.0f} N ({end}, "
                           f"free length {span:g} mm, root diameter {s.d3:.2f} mm, E "
                           f"{mat.youngs:g} MPa) against {load:g} N"
                           + ("" if sev == INFO else
                              f": keep it ≥ {LIMITS.screw_buckling_safety:g}× the load (shorter "
                              "free length, stiffer ends or a thicker screw)"),
                           name, "Euler column P_cr = C π² E I / l²", key="load"))
    if rpm is not None:
        v = linear_speed(rpm, s.lead)
        ncr = critical_speed(s.d3, span, mat.youngs, mat.density, end)
        sizes.update(rpm=rpm, linear_speed=v, critical_speed=ncr)
        lim = LIMITS.screw_whirl_fraction * ncr
        sev = ERROR if rpm >= ncr else WARNING if rpm > lim else INFO
        out.append(Finding(sev, "screw-whirl", f"{rpm:g} rpm moves the nut {v:.2f} mm/s; first "
                           f"critical speed {ncr:.0f} rpm ({end}, {span:g} mm free)"
                           + ("" if sev == INFO else
                              f": run below {LIMITS.screw_whirl_fraction:.0%} of it"),
                           name, "uniform-shaft whirling n = λ²/(2π l²) √(E I/(ρ A))",
                           key="rpm"))
    return sizes, out


def make(name, values, where):
    s = sizes_of(values, where)
    chord = values["chord_tolerance"]
    sizes, findings, _ = thread_manifest(s, values, where)
    try:
        loop = screw_section(s)
        twist = screw_twist(s, values["hand"])
    except GeometryError as exc:
        raise where.error("pitch", str(exc), values["pitch"]) from None
    section = Section(loop, ())
    length = values["length"]
    body = Body((Prism(section, 0.0, length, twist=twist),))
    outline = loop.polygon(chord)
    findings += thread_findings(name, measure_thread(outline, s), s, chord + TOL.size,
                                "section")
    drive, more = drive_findings(name, values, s, sizes["friction"])
    sizes.update(drive)
    findings += more
    sign = 1.0 if values["hand"] == "right" else -1.0

    def slice_check(slicer):
        z0 = 0.5 * length
        dz = min(0.45 * s.pitch, 0.4 * length)
        a = max(slicer(z0), key=len)
        b = max(slicer(z0 + dz), key=len)
        tol = chord + TOL.slice_extra
        ga, gb = measure_thread(a, s), measure_thread(b, s)
        out = thread_findings(name, ga, s, tol, f"mesh slice z={z0:g}")
        if not out and len(gb["centres"]):
            lead = lead_between(ga["centres"], gb["centres"], dz, s.starts)
            turn = 2.0 * math.pi * dz / s.lead
            rel = 2.0 * tol / (s.d2 / 2.0) / turn  # angle error over the turn measured
            if abs(sign * lead - s.lead) > rel * s.lead + 1e-9:
                out.append(Finding(ERROR, "thread-measure", f"mesh slices z={z0:g}/{z0 + dz:g}: "
                                   f"lead {lead:.4f} mm, expected {sign * s.lead:+.4f} mm",
                                   name, "L = n P"))
        return out

    return Part(name=name, kind=KIND, role=ROLE, values=values, shape=body, sizes=sizes,
                findings=tuple(findings), formulas=FORMULAS, outline=outline, section=section,
                slice_checks=(slice_check,), chord_tol=chord,
                data={"thread": s, "twist": twist})
