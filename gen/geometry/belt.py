"""Open belt drive between two timing pulleys: belt length, center distance, wrap, mesh.

Lengths are on the belt's pitch line (mm); D and d are the pitch diameters of the large and
small pulley (either order is accepted). Open-belt relations (standard belt-drive geometry):

* span angle φ = asin((D − d)/(2C)), the tilt of the straight spans against the center line;
* exact length L = 2C·cos φ + π(D + d)/2 + φ(D − d);
* approximation L ≈ 2C + π(D + d)/2 + (D − d)²/(4C); it is always a little short, by
  about C·s⁴/12 with s = (D − d)/(2C) (series of the exact form);
* wrap angle on the small pulley θ = π − 2φ; teeth in mesh z_small·θ/(2π).

Smallest center distance: the two pitch circles must not touch, C > (D + d)/2 + clearance
(``clearance`` defaults to 0). That is a geometric floor only; the belt's back, flanges and
hubs need more room, which the caller checks.

Angles are radians here; :class:`DriveSolution` reports degrees at the user boundary.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from gen.errors import GeometryError
from gen.geometry.pulley import lookup_profile, pulley_sizes
from gen.findings import ERROR, INFO, WARNING, Finding

#: center-distance solution tolerance (mm)
CENTER_TOL = 1e-9
#: fewest teeth in mesh on the small pulley before a warning (common practice)
MIN_TEETH_IN_MESH = 6.0
#: largest center distance (mm) and belt tooth count solved: far beyond any printed drive,
#: small enough that lengths, tooth counts and their text stay ordinary numbers
MAX_CENTER = 100_000.0
MAX_BELT_TEETH = 100_000
#: largest pulley tooth count solved (the drives: section allows the same)
MAX_PULLEY_TEETH = 10_000


def _check_diameters(D: float, d: float):
    D, d = float(D), float(d)
    if not (math.isfinite(D) and math.isfinite(d)) or D <= 0.0 or d <= 0.0:
        raise GeometryError(f"pitch diameters must be positive mm (got {D!r}, {d!r})")
    return max(D, d), min(D, d)


def min_center(D: float, d: float, clearance: float = 0.0) -> float:
    """Floor for the center distance (mm): (D + d)/2 + clearance; C must exceed it."""
    D, d = _check_diameters(D, d)
    return 0.5 * (D + d) + float(clearance)


def _length(C: float, D: float, d: float) -> float:
    phi = math.asin((D - d) / (2.0 * C))
    return 2.0 * C * math.cos(phi) + 0.5 * math.pi * (D + d) + phi * (D - d)


def _finite(x, what: str) -> float:
    """``x`` as a float, or GeometryError naming ``what`` when it is not a finite number."""
    try:
        v = float(x)
    except (TypeError, ValueError, OverflowError):
        raise GeometryError(f"{what} must be a finite number (got a value too large or not "
                            "a number)") from None
    if not math.isfinite(v):
        raise GeometryError(f"{what} must be a finite number (got {v!r})")
    return v


def _check_center(C: float, D: float, d: float, clearance: float) -> float:
    C = _finite(C, "center distance")
    c_min = min_center(D, d, clearance)
    if C <= c_min:
        raise GeometryError(f"center distance {C:g} mm is too small for pitch diameters "
                            f"{D:.3f} and {d:.3f} mm: it must exceed {c_min:.3f} mm "
                            f"(the pitch circles would touch)")
    return C


def span_angle(C: float, D: float, d: float, clearance: float = 0.0) -> float:
    """φ = asin((D − d)/(2C)) (rad)."""
    D, d = _check_diameters(D, d)
    C = _check_center(C, D, d, clearance)
    return math.asin((D - d) / (2.0 * C))


def belt_length(C: float, D: float, d: float, clearance: float = 0.0) -> float:
    """Exact open-belt pitch length L = 2C·cos φ + π(D + d)/2 + φ(D − d) (mm)."""
    D, d = _check_diameters(D, d)
    return _length(_check_center(C, D, d, clearance), D, d)


def belt_length_approx(C: float, D: float, d: float, clearance: float = 0.0) -> float:
    """Approximate open-belt length L ≈ 2C + π(D + d)/2 + (D − d)²/(4C) (mm)."""
    D, d = _check_diameters(D, d)
    C = _check_center(C, D, d, clearance)
    return 2.0 * C + 0.5 * math.pi * (D + d) + (D - d) ** 2 / (4.0 * C)


def wrap_angle(C: float, D: float, d: float, clearance: float = 0.0) -> float:
    """Wrap angle on the small pulley θ = π − 2φ (rad)."""
    return math.pi - 2.0 * span_angle(C, D, d, clearance)


def teeth_in_mesh(z_small: int, theta: float) -> float:
    """Belt teeth engaged on the small pulley, z·θ/(2π) (θ in rad)."""
    return z_small * theta / (2.0 * math.pi)


def shortest_belt(D: float, d: float, clearance: float = 0.0) -> float:
    """Exact length at the floor center distance; any belt must be longer (mm)."""
    D, d = _check_diameters(D, d)
    return _length(min_center(D, d, clearance), D, d)


def center_for_length(L: float, D: float, d: float, clearance: float = 0.0) -> float:
    """Center distance C (mm) at which the exact open-belt length equals ``L``.

    Newton steps on L(C) − L with dL/dC = 2·cos φ, kept inside a shrinking bisection
    bracket [(D + d)/2 + clearance, L/2]; stops when the step is below ``CENTER_TOL``.
    L(C) increases strictly with C, so the root is unique.
    """
    D, d = _check_diameters(D, d)
    L = _finite(L, "belt length")
    lo = min_center(D, d, clearance)
    L_min = _length(lo, D, d)
    if L <= L_min:
        raise GeometryError(f"belt length {L:g} mm is too short for pitch diameters "
                            f"{D:.3f} and {d:.3f} mm: it must exceed {L_min:.3f} mm")
    hi = 0.5 * L  # L > 2C always
    # start from the approximation solved for C: 2C² − (L − π(D+d)/2)C + (D−d)²/4 = 0
    b = L - 0.5 * math.pi * (D + d)
    C = 0.25 * (b + math.sqrt(max(b * b - 2.0 * (D - d) ** 2, 0.0)))
    if not lo < C < hi:
        C = 0.5 * (lo + hi)
    for _ in range(200):
        err = _length(C, D, d) - L
        if err > 0.0:
            hi = C
        else:
            lo = C
        step = err / (2.0 * math.cos(math.asin((D - d) / (2.0 * C))))
        nxt = C - step
        if not lo < nxt < hi:
            nxt = 0.5 * (lo + hi)
        if abs(nxt - C) < CENTER_TOL or hi - lo < CENTER_TOL:
            return nxt
        C = nxt
    raise GeometryError(f"center distance for belt length {L:g} mm did not converge")


# --- a whole drive ------------------------------------------------------------------------

@dataclass(frozen=True)
class DriveSolution:
    """A two-pulley open drive on a whole-tooth belt (lengths mm, angles degrees)."""

    profile: str
    pitch: float
    teeth: tuple                 # (z1, z2)
    pitch_diameters: tuple       # (d1, d2)
    outside_diameters: tuple     # (do1, do2)
    ratio: float                 # z2/z1
    belt_length: float           # pitch length of the chosen belt, belt_teeth·p
    belt_teeth: int
    center_distance: float       # center distance for that belt
    wrap_angle: float            # on the small pulley (deg)
    teeth_in_mesh: float         # on the small pulley
    span_length: float           # one straight span, C·cos φ
    approx_length: float         # approximation formula at center_distance
    requested_center: float | None   # the center asked for, if any
    requested_length: float | None   # exact belt length at the requested center
    requested_belt_teeth: float | None  # that length in pitches
    center_min: float            # tensioner range: center for belt_length·(1 − pct/100)
    center_max: float            # ... and for belt_length·(1 + pct/100)
    adjust_pct: float
    findings: tuple = field(default_factory=tuple)

    def as_dict(self) -> dict:
        """JSON-ready dict (plain floats, ints, lists, None)."""
        return {
            "profile": self.profile, "pitch": self.pitch, "teeth": list(self.teeth),
            "pitch_diameters": list(self.pitch_diameters),
            "outside_diameters": list(self.outside_diameters),
            "ratio": self.ratio, "belt_length": self.belt_length,
            "belt_teeth": self.belt_teeth, "center_distance": self.center_distance,
            "wrap_angle": self.wrap_angle, "teeth_in_mesh": self.teeth_in_mesh,
            "span_length": self.span_length, "approx_length": self.approx_length,
            "requested_center": self.requested_center,
            "requested_length": self.requested_length,
            "requested_belt_teeth": self.requested_belt_teeth,
            "center_min": self.center_min, "center_max": self.center_max,
            "adjust_pct": self.adjust_pct,
            "findings": [f.as_dict() for f in self.findings],
        }


def _whole(n, what: str) -> int:
    if isinstance(n, bool) or not isinstance(n, (int, float)) or n < 1 or \
            (isinstance(n, float) and not (math.isfinite(n) and n.is_integer())):
        raise GeometryError(f"{what} must be a positive whole number (got {n!r})")
    if n > MAX_BELT_TEETH:
        raise GeometryError(f"{what} is too large: at most {MAX_BELT_TEETH} teeth")
    return int(n)


def _pick_belt(L_req: float, pitch: float, L_min: float, stock) -> int:
    """Belt tooth count whose length is nearest ``L_req`` (ties: the shorter belt)."""
    if stock is None:
        lo = math.floor(L_req / pitch)
        candidates = [lo, lo + 1]
    else:
        candidates = sorted({_whole(n, "stock belt tooth count") for n in stock})
    fit = [n for n in candidates if n * pitch > L_min]
    if not fit:
        raise GeometryError(f"no stock belt is long enough: need more than {L_min:.3f} mm "
                            f"({L_min / pitch:.2f} teeth)")
    return min(fit, key=lambda n: (abs(n * pitch - L_req), n))


def solve_drive(profile, z1: int, z2: int, *, center: float | None = None,
                belt_teeth: int | None = None, stock=None, adjust_pct: float = 1.0,
                force: bool = False) -> DriveSolution:
    """Solve an open drive from a center distance or from a belt tooth count.

    Give exactly one of ``center`` (mm) or ``belt_teeth``. With ``center`` the exact belt
    length there is computed, the nearest belt is chosen (from ``stock``, a list of belt
    tooth counts; by default any whole count) and the center distance is re-solved for it.
    The tensioner range is the center distance for the belt length ×(1 ± adjust_pct/100).

    Findings: warning when fewer than 6 teeth are in mesh on the small pulley (common
    practice); error when a pulley has fewer teeth than its profile's recommended minimum
    (warning with ``force``); warning when ``belt_teeth`` is not in ``stock`` or the
    tensioner range is cut short by the pitch circles touching; info when the chosen belt
    moves the center away from the requested one within the tensioner range, warning when the
    requested center lies outside it (the belt cannot be tensioned at the mounted center).

    Raises
    ------
    GeometryError
        unknown profile, bad numbers, center too small, belt too short.
    """
    prof = lookup_profile(profile)
    for z in (z1, z2):
        if isinstance(z, (int, float)) and not isinstance(z, bool) and z > MAX_PULLEY_TEETH:
            raise GeometryError(f"pulley tooth count is too large: at most {MAX_PULLEY_TEETH}")
    s1, s2 = pulley_sizes(prof, z1), pulley_sizes(prof, z2)
    p = prof.pitch
    D, d = max(s1.pitch_diameter, s2.pitch_diameter), min(s1.pitch_diameter, s2.pitch_diameter)
    z_small = min(s1.teeth, s2.teeth)
    pct = float(adjust_pct)
    if not math.isfinite(pct) or not 0.0 <= pct < 100.0:
        raise GeometryError(f"tensioner adjustment must be 0 to <100 % (got {adjust_pct!r})")
    if (center is None) == (belt_teeth is None):
        raise GeometryError("give either a center distance or a belt tooth count, not both "
                            "or neither")
    L_min = shortest_belt(D, d)
    findings = []
    subject = f"{prof.name} drive {s1.teeth}/{s2.teeth}"

    def add(sev, code, msg, source="", key=""):
        findings.append(Finding(sev, code, msg, subject, source, key=key))

    req_C = req_L = req_N = None
    if center is not None:
        req_C = _finite(center, "center distance")
        if req_C > MAX_CENTER:
            raise GeometryError(f"center distance {req_C:g} mm is too large: at most "
                                f"{MAX_CENTER:g} mm")
        req_L = belt_length(req_C, D, d)
        req_N = req_L / p
        n_belt = _pick_belt(req_L, p, L_min, stock)
    else:
        n_belt = _whole(belt_teeth, "belt tooth count")
        if stock is not None and n_belt not in {_whole(n, "stock belt tooth count")
                                                for n in stock}:
            add(WARNING, "not-in-stock", f"a {n_belt}-tooth belt is not in the stock list")
    L = n_belt * p
    C = center_for_length(L, D, d)
    phi = math.asin((D - d) / (2.0 * C))
    theta = math.pi - 2.0 * phi
    mesh = teeth_in_mesh(z_small, theta)

    L_lo, L_hi = L * (1.0 - pct / 100.0), L * (1.0 + pct / 100.0)
    if L_lo > L_min:
        c_lo = center_for_length(L_lo, D, d)
    else:
        c_lo = min_center(D, d)
        add(WARNING, "adjust-clipped",
            f"the tensioner range stops at {c_lo:.3f} mm where the pitch circles touch")
    c_hi = center_for_length(L_hi, D, d)

    for s in (s1, s2):
        if s.teeth < prof.min_teeth:
            add(WARNING if force else ERROR, "below-min-teeth",
                f"{s.teeth}-tooth pulley is below the recommended minimum of "
                f"{prof.min_teeth} for {prof.name}" + (" (forced)" if force else ""),
                prof.note)
    if mesh < MIN_TEETH_IN_MESH:
        add(WARNING, "few-teeth-in-mesh",
            f"{mesh:.2f} teeth in mesh on the {z_small}-tooth pulley, fewer than "
            f"{MIN_TEETH_IN_MESH:g}", "common practice")
    if req_C is not None and abs(C - req_C) > CENTER_TOL:
        if c_lo - CENTER_TOL <= req_C <= c_hi + CENTER_TOL:
            add(INFO, "center-moved",
                f"{n_belt}-tooth belt sets the center to {C:.3f} mm instead of {req_C:.3f} mm "
                f"(within the tensioner range {c_lo:.3f}…{c_hi:.3f} mm)")
        else:
            # the pulleys are mounted at req_C: a belt whose tensioner range misses it cannot
            # be fitted and tensioned there
            add(WARNING, "center-moved",
                f"{n_belt}-tooth belt sets the center to {C:.3f} mm instead of {req_C:.3f} mm, "
                f"outside its tensioner range {c_lo:.3f}…{c_hi:.3f} mm (±{pct:g} % of the belt "
                f"length): choose another belt, widen adjust, or move the center",
                key="stock" if stock is not None else "center_distance")

    return DriveSolution(
        profile=prof.name, pitch=p, teeth=(s1.teeth, s2.teeth),
        pitch_diameters=(s1.pitch_diameter, s2.pitch_diameter),
        outside_diameters=(s1.outside_diameter, s2.outside_diameter),
        ratio=s2.teeth / s1.teeth, belt_length=L, belt_teeth=n_belt, center_distance=C,
        wrap_angle=math.degrees(theta), teeth_in_mesh=mesh, span_length=C * math.cos(phi),
        approx_length=belt_length_approx(C, D, d), requested_center=req_C,
        requested_length=req_L, requested_belt_teeth=req_N, center_min=c_lo,
        center_max=c_hi, adjust_pct=pct, findings=tuple(findings))
