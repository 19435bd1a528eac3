"""Measure the helix of a twisted gear or rack on outlines sliced at two heights.

A helical gear's transverse section turns by Δθ = Δz · tan β / r_p between two slices Δz
apart (r_p the transverse reference radius, β the reference helix angle; ISO 21771 helix
relations, from memory); a helical rack's section moves by Δx = Δz · tan β. A herringbone's
two halves are mirror images about the mid-plane, so slices at z_m − t and z_m + t coincide.

The offsets are measured by matching teeth: on a circle (gear) the outline's material
intervals are found exactly on the polygon edges (:mod:`gen.validate.measure`), each tooth's
centre is the middle of its interval, and the offset is the circular mean of the centre
differences, folded into one pitch; both flanks enter every centre, so a chordal error that
shifts the two flanks alike cancels. On a line (rack) the rising and falling flanks are
matched apart, leaving out the rack's end faces, so a tooth cut by an end does not count.
Polygons are (n, 2) arrays in the slice plane, mm, counter-clockwise.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.findings import ERROR, INFO, Finding
from gen.validate.measure import material_arcs, rack_teeth_on_line

#: allowed difference between the measured and the expected section turn (rad) = 0.05°
HELIX_ANGLE_TOL = math.radians(0.05)


def mesh_angle_tol(chord: float, r: float) -> float:
    """Allowed turn difference (rad) between two slices of a mesh within ``chord`` mm of the
    exact surface, measured on the circle r: HELIX_ANGLE_TOL plus the mesh's own share. A
    flank crossing of the circle moves along it by at most chord / cos α (α ≤ 35° there, so
    1.25 chord), a tooth centre (the mean of two crossings) as much, and the turn compares two
    slices: 2.5 chord / r (computed)."""
    return HELIX_ANGLE_TOL + 2.5 * chord / r


def tooth_centres(poly: np.ndarray, r: float) -> np.ndarray:
    """Angles (rad, in [0, 2π)) of the tooth centres where the outline crosses the circle r."""
    arcs = material_arcs(np.asarray(poly, dtype=float), r)
    if len(arcs) == 0:
        return np.zeros(0)
    return np.sort((arcs[:, 0] + 0.5 * arcs[:, 1]) % (2.0 * math.pi))


def angular_offset(poly_a: np.ndarray, poly_b: np.ndarray, r: float,
                   teeth: int | None = None) -> float:
    """Turn (rad) that carries outline a onto outline b, folded into [−π/z, π/z).

    The z-fold circular means of the tooth centres, arg Σ exp(i z φ), of the two outlines
    differ by z·Δθ, so no tooth has to be paired with another; ``teeth`` defaults to the
    number of teeth found on the circle.
    """
    ca, cb = tooth_centres(poly_a, r), tooth_centres(poly_b, r)
    z = teeth or len(ca)
    if z == 0 or len(cb) != len(ca):
        raise GeometryError(f"slices show {len(ca)} and {len(cb)} teeth on r = {r} mm")
    ma = np.angle(np.sum(np.exp(1j * z * ca)))
    mb = np.angle(np.sum(np.exp(1j * z * cb)))
    return fold((mb - ma) / z, 2.0 * math.pi / z)


def rack_flanks(poly: np.ndarray, y: float) -> tuple[np.ndarray, np.ndarray]:
    """x (mm) of the rising and the falling tooth flanks of a rack outline on the line y
    (teeth toward +Y): where a tooth's interval starts and ends, leaving out a start or end
    that is the outline's own end face (a tooth cut by the rack's end has one real flank)."""
    poly = np.asarray(poly, dtype=float)
    iv = rack_teeth_on_line(poly, y, -math.inf)
    if len(iv) == 0:
        return np.zeros(0), np.zeros(0)
    x0, x1 = float(poly[:, 0].min()), float(poly[:, 0].max())
    eps = 1e-6 * max(1.0, x1 - x0)
    return iv[iv[:, 0] > x0 + eps, 0], iv[iv[:, 1] < x1 - eps, 1]


def linear_offset(poly_a: np.ndarray, poly_b: np.ndarray, y: float, pitch: float) -> float:
    """Shift (mm, along +X) carrying rack outline a onto b, folded into [−p/2, p/2).

    Rising and falling flanks are matched apart (the pitch-fold circular mean of each kind,
    arg Σ exp(2πi x / p), so no flank is paired with another), and the two shifts averaged on
    the circle. Only real flanks enter: a tooth cut short by a rack end once counted as whole
    and moved the mean (m 2.5, β 25°, ends as given: 0.013 mm over 4.8 mm).
    """
    k = 2.0 * math.pi / pitch
    shifts = []
    for xa, xb in zip(rack_flanks(poly_a, y), rack_flanks(poly_b, y)):
        if len(xa) and len(xb):
            ma = np.sum(np.exp(1j * k * xa))
            mb = np.sum(np.exp(1j * k * xb))
            shifts.append(mb / abs(mb) * np.conj(ma / abs(ma)))
    if not shifts:
        raise GeometryError(f"no rack tooth flank on the line y = {y} mm")
    return fold(float(np.angle(np.sum(shifts))) / k, pitch)


def fold(value: float, period: float) -> float:
    """``value`` brought into [−period/2, period/2)."""
    return float((value + 0.5 * period) % period - 0.5 * period)


def expected_turn(dz: float, beta: float, r_p: float) -> float:
    """Δθ = Δz · tan β / r_p (rad): section turn of a helical gear over Δz mm (ISO 21771)."""
    return dz * math.tan(beta) / r_p


def helix_angle(dtheta: float, dz: float, r_p: float) -> float:
    """Reference helix angle β = atan(Δθ · r_p / Δz) from a measured turn (rad)."""
    return math.atan2(dtheta * r_p, dz)


def check_gear_helix(poly_a, poly_b, dz: float, beta: float, r_p: float, subject: str = "",
                     tol: float = HELIX_ANGLE_TOL, r_measure: float | None = None) -> list:
    """Findings comparing the measured turn between two slices with Δz · tan β / r_p.

    ``beta`` is signed: > 0 for a right hand (the section turns counter-clockwise as z grows).
    The turn is the same on every radius (one lead for the whole helicoid), so it is measured
    on ``r_measure`` (default r_p), a circle that must cross every tooth: with a large shift
    the root circle lies outside the reference circle.
    """
    r_m = r_p if r_measure is None else r_measure
    got = angular_offset(poly_a, poly_b, r_m)
    z = len(tooth_centres(poly_a, r_m))
    want = expected_turn(dz, beta, r_p)
    miss = fold(got - want, 2.0 * math.pi / z)
    want = got - miss  # the expected turn, taken modulo one angular pitch like the measurement
    src = "ISO 21771: Δθ = Δz·tan β / r_p"
    if abs(miss) > tol:
        return [Finding(ERROR, "helix-turn",
                        f"section turns {math.degrees(got):.4f}° over {dz:g} mm, expected "
                        f"{math.degrees(want):.4f}° (β {math.degrees(beta):.3f}°)", subject, src,
                        key="helix_angle")]
    turn = expected_turn(dz, beta, r_p) + miss  # the measured turn, unfolded (mod a pitch)
    return [Finding(INFO, "helix-turn",
                    f"section turn {math.degrees(turn):.4f}° over {dz:g} mm (mod one pitch) "
                    f"matches β {math.degrees(helix_angle(turn, dz, r_p)):.3f}°", subject, src)]


def mirror_offset(poly_below: np.ndarray, poly_above: np.ndarray, r: float) -> float:
    """Turn between slices at z_m − t and z_m + t of a herringbone (0 when mirror images)."""
    return angular_offset(poly_below, poly_above, r)


def check_herringbone_mirror(pairs, r: float, subject: str = "",
                             tol: float = HELIX_ANGLE_TOL) -> list:
    """Findings for slice pairs [(below, above), ...] taken symmetrically about the mid-plane."""
    worst = max(abs(mirror_offset(a, b, r)) for a, b in pairs)
    src = "herringbone halves mirror about the mid-plane"
    if worst > tol:
        return [Finding(ERROR, "herringbone-mirror",
                        f"halves differ by {math.degrees(worst):.4f}° at the same distance from "
                        f"the mid-plane", subject, src, key="helix_angle")]
    return [Finding(INFO, "herringbone-mirror",
                    f"halves mirror within {math.degrees(worst):.5f}°", subject, src)]
