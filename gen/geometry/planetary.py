"""Simple planetary gearset: sun, N equal planets on a carrier, internal ring (spur, one module).

Kinematics — Willis: (ω_s − ω_c)/(ω_r − ω_c) = −z_r/z_s, i.e. ω_s + k ω_r = (1 + k) ω_c with
k = z_r/z_s. The ratio of an arrangement is i = ω_in/ω_out with one member held (sign < 0: the
output turns the other way). Planet about its own axis: (ω_p − ω_c)/(ω_s − ω_c) = −z_s/z_p.

Geometry (ISO 21771 relations; internal gears with a negative tooth count, as in the shared
reference): a pair z₁, z₂ (z₂ = −z_r for the ring) with shifts x₁, x₂ has a = m(z₁ + z₂)/2,
inv α_w = inv α + 2 tan α (x₁ + x₂)/(z₁ + z₂), a_w = a cos α/cos α_w; |a_w| is the centre
distance. The ring shift x_r is in that signed convention: x_r > 0 moves the ring's profile
toward its axis (|d_a,r| = m(z_r − 2h_a − 2x_r)). Coaxial: the sun–planet and planet–ring
working distances are equal; for standard gears z_r = z_s + 2 z_p.

Assembly with equally spaced planets needs (z_s + z_r)/N whole: turning the carrier by ψ with
the ring held turns the sun by ψ(z_s + z_r)/z_s, which must be a whole number of sun pitches, so
planets can only go at ψ = 2π n/(z_s + z_r). Neighbours: planet tips must clear,
2 a_w sin(Δψ/2) − d_a,p > margin for adjacent planets Δψ apart.

Tooth phase (all angles about +z, counter-clockwise; a gear's phase is the polar angle of its
tooth 0 centre line; the ring's "tooth" is its material between two spaces). With the ring at
φ_r and planet k at carrier angle ψ_k, the pitch point of the planet–ring mesh lies at polar
angle ψ_k both from the centre and from the planet; that of the sun–planet mesh at ψ_k from the
centre and ψ_k + π from the planet. Measured in pitches, f_g = (θ − φ_g) z_g/2π for a pitch
point at polar angle θ about gear g. Tight, symmetric meshing needs a tooth facing a space:
    external (sun–planet):  f_s + f_p ≡ ½ (mod 1)    (invariant under rolling: f_s + f_p),
    internal (planet–ring): f_p − f_r ≡ ½ (mod 1)    (invariant: both move the same way).
Solving: φ_p,k = ψ_k − (2π/z_p)((ψ_k − φ_r) z_r/2π + ½) and, from planet 0 at ψ = 0,
φ_s = (2π/z_s)·frac(z_p/2 − φ_r z_r/2π). Turning the carrier by c with the ring held adds
c(1 + z_r/z_s) to φ_s, c(1 − z_r/z_p) to every φ_p and c to every ψ.

Units: lengths mm, angles rad, torques N·m, forces N.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from gen.errors import GeometryError, ParamError
from gen.findings import ERROR, WARNING, Finding
from gen.geometry.involute import inv, inv_inverse

MEMBERS = ("sun", "ring", "carrier")
WILLIS = "Willis: (ωs − ωc)/(ωr − ωc) = −zr/zs"

#: Load-sharing factor K_γ by planet count (common practice, from memory): the most loaded
#: planet carries K_γ·T/N. 1.0 up to two planets assumes a floating member; printed carriers
#: with loose tolerances may share worse — pass your own value then.
LOAD_SHARING = {1: 1.0, 2: 1.0, 3: 1.15, 4: 1.25, 5: 1.35, 6: 1.44, 7: 1.47, 8: 1.50, 9: 1.53}


# --- kinematics --------------------------------------------------------------------------------

def willis_ratio(zs: int, zr: int, held: str, driver: str, driven: str) -> float:
    """Speed ratio i = ω_in/ω_out with ``held`` fixed (members: sun, ring, carrier).

    From ω_s + k ω_r = (1 + k) ω_c, k = z_r/z_s: ring held → sun/carrier 1 + k; sun held →
    ring/carrier (1 + k)/k; carrier held → sun/ring −k; the reverse drives are the inverses.
    """
    if {held, driver, driven} != set(MEMBERS):
        raise ParamError("held, input and output must be sun, ring and carrier, once each",
                         key="arrangement", value=(held, driver, driven))
    speeds = member_speeds(zs, zr, held, driver, 1.0)
    return 1.0 / speeds[driven]


def member_speeds(zs: int, zr: int, held: str, driver: str, speed: float) -> dict:
    """Speeds of sun, ring and carrier (same unit as ``speed``) with ``held`` at rest."""
    k = zr / zs
    # unknown pair solved from ω_s + k ω_r − (1 + k) ω_c = 0
    coef = {"sun": 1.0, "ring": k, "carrier": -(1.0 + k)}
    if held == driver or held not in MEMBERS or driver not in MEMBERS:
        raise ParamError("held and input must be two different members", key="arrangement")
    (other,) = set(MEMBERS) - {held, driver}
    out = {held: 0.0, driver: float(speed), other: -coef[driver] * speed / coef[other]}
    return out


def planet_speed(zs: int, zp: int, sun: float, carrier: float) -> float:
    """Absolute planet speed: ω_p = ω_c − (ω_s − ω_c) z_s/z_p."""
    return carrier - (sun - carrier) * zs / zp


@dataclass(frozen=True)
class Arrangement:
    held: str
    driver: str
    driven: str
    ratio: float       # ω_in/ω_out, signed


def arrangements(zs: int, zr: int) -> tuple[Arrangement, ...]:
    """All six (held, input, output) arrangements with their signed ratios."""
    out = []
    for held in MEMBERS:
        a, b = (m for m in MEMBERS if m != held)
        for d, n in ((a, b), (b, a)):
            out.append(Arrangement(held, d, n, willis_ratio(zs, zr, held, d, n)))
    return tuple(out)


# --- centre distances --------------------------------------------------------------------------

def working_distance(z1: int, z2: int, x1: float, x2: float, module: float,
                     alpha: float) -> float:
    """|a_w| (mm) of a pair; z₂ < 0 for an internal gear (signed ISO 21771 relations)."""
    a = module * (z1 + z2) / 2.0
    v = float(inv(alpha)) + 2.0 * math.tan(alpha) * (x1 + x2) / (z1 + z2)
    if v <= 0.0:
        raise GeometryError(f"shift sum {x1 + x2:g} leaves no working pressure angle "
                            f"(inv αw = {v:.3g})")
    return abs(a * math.cos(alpha) / math.cos(inv_inverse(v)))


def shift_sum_for(z1: int, z2: int, module: float, alpha: float, distance: float) -> float | None:
    """x₁ + x₂ that puts the pair at working distance ``distance`` (mm); None if unreachable.

    cos α_w = |a| cos α / distance, then x₁ + x₂ = (inv α_w − inv α)(z₁ + z₂)/(2 tan α).
    """
    c = abs(module * (z1 + z2) / 2.0) * math.cos(alpha) / distance
    if not 0.0 < c <= 1.0:
        return None
    aw = math.acos(c)
    return float((inv(aw) - inv(alpha)) * (z1 + z2) / (2.0 * math.tan(alpha)))


@dataclass(frozen=True)
class Coaxial:
    """Coaxial check: both working distances (mm), and the shifts that would close a gap."""

    sun_planet: float
    planet_ring: float
    coaxial: bool
    standard_ring_teeth: int          # z_s + 2 z_p
    ring_pair_shift_sum: float | None  # x_p + x_r that matches the sun–planet distance
    sun_pair_shift_sum: float | None   # x_s + x_p that matches the planet–ring distance


def coaxial(zs: int, zp: int, zr: int, module: float, alpha: float, xs: float = 0.0,
            xp: float = 0.0, xr: float = 0.0, tol: float = 1e-6) -> Coaxial:
    """Compare the two working centre distances (within ``tol`` mm)."""
    a1 = working_distance(zs, zp, xs, xp, module, alpha)
    a2 = working_distance(zp, -zr, xp, xr, module, alpha)
    return Coaxial(a1, a2, abs(a1 - a2) <= tol, zs + 2 * zp,
                   shift_sum_for(zp, -zr, module, alpha, a1),
                   shift_sum_for(zs, zp, module, alpha, a2))


# --- spacing, neighbours -----------------------------------------------------------------------

@dataclass(frozen=True)
class Spacing:
    """Where planets can go. ``angles`` (rad) are the assemblable ones nearest 2πk/N."""

    equal: bool
    quotient: float             # (z_s + z_r)/N
    steps: tuple                # n_k, planet k at 2π n_k/(z_s + z_r)
    angles: tuple               # rad
    deviations: tuple           # angle − 2πk/N (rad)


def planet_spacing(zs: int, zr: int, n: int) -> Spacing:
    """Equal spacing if (z_s + z_r)/N is whole, else the nearest assemblable angles."""
    if n < 1:
        raise ParamError("need at least one planet", key="planets", value=n)
    total = zs + zr
    steps = tuple(int(math.floor(k * total / n + 0.5)) for k in range(n))
    angles = tuple(2.0 * math.pi * s / total for s in steps)
    dev = tuple(a - 2.0 * math.pi * k / n for k, a in enumerate(angles))
    return Spacing(total % n == 0, total / n, steps, angles, dev)


def planet_tip_diameter(zp: int, module: float, xp: float = 0.0, addendum: float = 1.0) -> float:
    """d_a = m (z + 2 h_a* + 2x) (ISO 21771, no tip shortening)."""
    return module * (zp + 2.0 * addendum + 2.0 * xp)


def tip_gaps(distance: float, tip_diameter: float, angles) -> tuple:
    """Gap (mm) between the tip circles of each planet and the next: 2 a sin(Δψ/2) − d_a."""
    n = len(angles)
    if n < 2:
        return ()
    out = []
    for k in range(n):
        d = (angles[(k + 1) % n] - angles[k]) % (2.0 * math.pi)
        out.append(2.0 * distance * math.sin(d / 2.0) - tip_diameter)
    return tuple(out)


def nearest_planet_count(zs: int, zr: int, n: int, distance: float, tip_diameter: float,
                         margin: float) -> int | None:
    """The planet count ≥ 2 nearest ``n`` with (z_s + z_r)/N whole whose tips clear by ``margin``."""
    ok = [k for k in range(2, zs + zr + 1)
          if (zs + zr) % k == 0 and 2.0 * distance * math.sin(math.pi / k) - tip_diameter > margin]
    return min(ok, key=lambda k: (abs(k - n), k)) if ok else None


# --- tooth phase -------------------------------------------------------------------------------

@dataclass(frozen=True)
class Phasing:
    """Gear phases (rad) for planets at carrier angles ``positions``; residuals in pitches."""

    sun: float
    ring: float
    positions: tuple
    planets: tuple
    sun_residual: tuple      # f_s + f_p − ½ folded to [−½, ½) per planet
    ring_residual: tuple     # f_p − f_r − ½ folded


def _fold(v: float) -> float:
    return (v + 0.5) % 1.0 - 0.5


def mesh_residuals(zs, zp, zr, sun, ring, position, planet):
    """(sun-mesh, ring-mesh) phase residuals in pitches; 0 when a tooth faces a space."""
    f_s = (position - sun) * zs / (2 * math.pi)
    f_p_sun = (position + math.pi - planet) * zp / (2 * math.pi)
    f_p_ring = (position - planet) * zp / (2 * math.pi)
    f_r = (position - ring) * zr / (2 * math.pi)
    return _fold(f_s + f_p_sun - 0.5), _fold(f_p_ring - f_r - 0.5)


def phasing(zs: int, zp: int, zr: int, positions, ring: float = 0.0,
            carrier: float = 0.0) -> Phasing:
    """Phases of sun and planets meshing with the ring at ``ring`` (rad), planets at
    ``positions`` (carrier angles at carrier 0), then the carrier turned by ``carrier`` with
    the ring held (formulas in the module docstring). Non-zero sun residuals mean a planet
    sits where it cannot be assembled."""
    sun0 = (2 * math.pi / zs) * ((zp / 2.0 - ring * zr / (2 * math.pi)) % 1.0)
    sun = sun0 + carrier * (1.0 + zr / zs)
    pos, pl, rs, rr = [], [], [], []
    for psi0 in positions:
        p0 = psi0 - (2 * math.pi / zp) * ((psi0 - ring) * zr / (2 * math.pi) + 0.5)
        psi, phi = psi0 + carrier, p0 + carrier * (1.0 - zr / zp)
        e_s, e_r = mesh_residuals(zs, zp, zr, sun, ring, psi, phi)
        pos.append(psi)
        pl.append(phi)
        rs.append(e_s)
        rr.append(e_r)
    return Phasing(sun, ring, tuple(pos), tuple(pl), tuple(rs), tuple(rr))


# --- loads -------------------------------------------------------------------------------------

@dataclass(frozen=True)
class MeshLoads:
    """Ideal (loss-free) torques (N·m, signed as the sun's) and per-mesh tangential forces (N)."""

    sun_torque: float
    ring_torque: float              # k T_s
    carrier_torque: float           # −(1 + k) T_s
    load_sharing: float
    planet_share: float             # K_γ |T_s| / N, sun torque on the most loaded planet
    sun_mesh_force: float           # on the working pitch circles of the sun mesh
    ring_mesh_force: float          # on those of the ring mesh (planet moment balance)


def mesh_loads(zs: int, zp: int, zr: int, n: int, sun_torque: float, sun_planet_distance: float,
               planet_ring_distance: float, load_sharing: float | None = None) -> MeshLoads:
    """Torques from T_s : T_r : T_c = 1 : k : −(1+k) and forces of the most loaded planet.

    Working pitch radii are in proportion to tooth counts: r_ws = a₁ z_s/(z_s + z_p),
    r_wp = a₁ z_p/(z_s + z_p) at the sun mesh, r_wp' = a₂ z_p/(z_r − z_p) at the ring mesh.
    F_sun = K_γ|T_s|/(N r_ws); the planet's moment balance gives F_ring = F_sun r_wp/r_wp'.
    """
    kg = LOAD_SHARING.get(n, 1.5) if load_sharing is None else float(load_sharing)
    if not kg >= 1.0:
        raise ParamError("load-sharing factor must be ≥ 1", key="load_sharing", value=kg)
    k = zr / zs
    share = kg * abs(sun_torque) / n
    r_ws = sun_planet_distance * zs / (zs + zp) / 1000.0
    r_wp = sun_planet_distance * zp / (zs + zp)
    r_wp2 = planet_ring_distance * zp / (zr - zp)
    f_sun = share / r_ws
    return MeshLoads(sun_torque, k * sun_torque, -(1.0 + k) * sun_torque, kg, share, f_sun,
                     f_sun * r_wp / r_wp2)


# --- the whole set -----------------------------------------------------------------------------

@dataclass(frozen=True)
class PlanetarySet:
    zs: int
    zp: int
    zr: int
    planets: int
    module: float
    alpha: float
    arrangements: tuple
    coaxial: Coaxial
    spacing: Spacing
    tip_diameter: float            # planet, mm
    tip_gaps: tuple                # mm, each planet to the next
    margin: float                  # mm
    nearest_count: int | None      # nearest N that assembles equally spaced and clears
    phasing: Phasing
    findings: tuple


def planetary_set(zs: int, zp: int, zr: int, planets: int, module: float,
                  alpha: float = math.radians(20.0), xs: float = 0.0, xp: float = 0.0,
                  xr: float = 0.0, margin: float | None = None,
                  name: str = "") -> PlanetarySet:
    """Check a planetary set. ``margin`` between planet tips defaults to 0.5·m (common
    practice, from memory). Findings: planetary-not-coaxial, planet-spacing-unequal,
    planets-collide (errors or warnings), ring-tooth-difference (warning)."""
    for key, z in (("sun_teeth", zs), ("planet_teeth", zp), ("ring_teeth", zr)):
        if int(z) != z or z < 3:
            raise ParamError("tooth count must be a whole number ≥ 3", key=key, value=z)
    if zr <= zp:
        raise ParamError("the ring needs more teeth than a planet", key="ring_teeth", value=zr)
    margin = 0.5 * module if margin is None else float(margin)
    co = coaxial(zs, zp, zr, module, alpha, xs, xp, xr)
    sp = planet_spacing(zs, zr, planets)
    da = planet_tip_diameter(zp, module, xp)
    gaps = tip_gaps(co.sun_planet, da, sp.angles)
    near = nearest_planet_count(zs, zr, planets, co.sun_planet, da, margin)
    ph = phasing(zs, zp, zr, sp.angles)
    f = []
    if not co.coaxial:
        hint = ("" if co.ring_pair_shift_sum is None else
                f"; x_p + x_r = {co.ring_pair_shift_sum:.4f} would make it coaxial")
        f.append(Finding(ERROR, "planetary-not-coaxial",
                         f"sun–planet distance {co.sun_planet:.4f} mm ≠ planet–ring distance "
                         f"{co.planet_ring:.4f} mm (standard ring: {co.standard_ring_teeth} "
                         f"teeth){hint}", name, "ISO 21771 working centre distance",
                         key="ring_teeth", scope="assembly"))
    if not sp.equal:
        degs = ", ".join(f"{math.degrees(a):.2f}°" for a in sp.angles)
        f.append(Finding(WARNING, "planet-spacing-unequal",
                         f"(z_s + z_r)/N = {sp.quotient:.3f} is not whole: planets assemble at "
                         f"{degs}; nearest count that assembles equally spaced: {near}",
                         name, "assembly condition (z_s + z_r)/N whole", key="planets",
                         scope="assembly"))
    if gaps and min(gaps) <= margin:
        f.append(Finding(ERROR, "planets-collide",
                         f"planet tips {min(gaps):.3f} mm apart, need more than {margin:.3f} mm",
                         name, "neighbour condition d_a < 2 a sin(π/N) − margin",
                         key="planets", scope="assembly"))
    if zr - zp < 10:
        f.append(Finding(WARNING, "ring-tooth-difference",
                         f"ring and planet differ by {zr - zp} teeth; below about 10 the tips "
                         "of an internal mesh may interfere (common practice)", name,
                         "internal gear tip interference", key="ring_teeth", scope="assembly"))
    return PlanetarySet(zs, zp, zr, planets, module, alpha, arrangements(zs, zr), co, sp, da,
                        gaps, margin, near, ph, tuple(f))
