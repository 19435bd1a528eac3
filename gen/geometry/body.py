"""Neutral description of prismatic bodies: straight, twisted (helical), sheared and chevron.

The solid layer (:mod:`gen.solid.prism`) and the mesh layer (:mod:`gen.triangles.prism`) both
consume these records, so a part is described once and built by either route.

Motion of the section
---------------------
A :class:`Prism` carries its :class:`~gen.geometry.section.Section` from ``z0`` to ``z1``.
At height z the section is rotated about +Z by θ(z) and moved along +X by s(z):

    straight      θ = 0,                 s = 0
    helical       θ = twist · (z − z0),  s = shear · (z − z0)
    chevron       the same up to the mid-height z_m = (z0 + z1)/2, then back:
                  θ = twist · (z_m − z0) − twist · (z − z_m)   (and likewise s),
                  so the top section equals the bottom one and the two halves are mirror
                  images about the plane z = z_m (herringbone).

Hand convention (computed from the helix x = r cos t, y = r sin t, z = c t, c > 0, which is a
right-hand screw): ``twist > 0`` turns the section counter-clockwise seen from +Z as z grows,
so a gear with ``twist > 0`` is **right-hand** and ``twist < 0`` left-hand. For a gear of
transverse reference radius r_p and helix angle β, twist = tan β / r_p (rad per mm), the lead
being 2π r_p / tan β (ISO 21771 helix relations, from memory).

A rack (transverse section in the XY plane, teeth toward +Y) with ``shear = +tan β`` has tooth
traces x = x0 + z·tan β. That is the rack that meshes with a ``twist = +tan β / r_p`` pinion
lying on its toothed side (pinion axis at y = r_p): the pinion's lowest point moves by
r_p · θ(z) = z·tan β along +X (computed). :func:`gear_twist` and :func:`rack_shear` return
these values so callers never repeat the signs.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from gen.errors import GeometryError
from gen.geometry.section import Section, signed_area


@dataclass(frozen=True, eq=False)
class Prism:
    """A section carried from z0 to z1 (mm), optionally twisting or shearing.

    Parameters
    ----------
    section : Section
        Transverse section at z0 (outer loop and holes), mm.
    z0, z1 : float
        Bottom and top heights, mm, z1 > z0.
    twist : float
        Rotation about +Z per mm of height (rad/mm); > 0 is counter-clockwise seen from +Z.
    shear : float
        Displacement along +X per mm of height (mm/mm = tan of the trace angle).
    chevron : bool
        Twist and shear reverse at the mid-height (herringbone); the top section equals the
        bottom one.
    """

    section: Section
    z0: float
    z1: float
    twist: float = 0.0
    shear: float = 0.0
    chevron: bool = False

    def __post_init__(self):
        if not (self.z1 > self.z0):
            raise GeometryError(f"prism height must be positive (z0 {self.z0}, z1 {self.z1} mm)")
        if not (math.isfinite(self.twist) and math.isfinite(self.shear)):
            raise GeometryError("prism twist and shear must be finite numbers")

    @property
    def height(self) -> float:
        return self.z1 - self.z0

    @property
    def straight(self) -> bool:
        return self.twist == 0.0 and self.shear == 0.0

    @property
    def z_mid(self) -> float:
        return 0.5 * (self.z0 + self.z1)

    def stages(self) -> tuple[tuple[float, float, float], ...]:
        """Pieces of constant motion: ((za, zb, sign), ...); sign +1 or −1 multiplies twist/shear."""
        if self.chevron and not self.straight:
            zm = self.z_mid
            return ((self.z0, zm, 1.0), (zm, self.z1, -1.0))
        return ((self.z0, self.z1, 1.0),)

    def motion(self, z) -> tuple[np.ndarray, np.ndarray]:
        """(θ(z) rad, s(z) mm) for heights ``z`` (array), following the module docstring."""
        z = np.asarray(z, dtype=float)
        t = z - self.z0
        if self.chevron:
            h = 0.5 * self.height
            t = np.where(t <= h, t, 2.0 * h - t)
        return self.twist * t, self.shear * t

    def place(self, points: np.ndarray, z: float) -> np.ndarray:
        """Section points (n, 2) at z0 → their (n, 2) position in the slice at height z."""
        th, s = self.motion(z)
        c, sn = math.cos(float(th)), math.sin(float(th))
        p = np.asarray(points, dtype=float)
        return np.column_stack([c * p[:, 0] - sn * p[:, 1] + float(s), sn * p[:, 0] + c * p[:, 1]])

    def max_turn(self) -> float:
        """Largest |θ| reached (rad)."""
        return abs(self.twist) * (0.5 if self.chevron else 1.0) * self.height


@dataclass(frozen=True, eq=False)
class RadialHole:
    """A cylindrical hole along a radius (set screws): axis in the XY plane at height z,
    at polar angle ``angle`` (rad), from radius r0 out to r1."""

    diameter: float
    z: float
    angle: float
    r0: float
    r1: float


@dataclass(frozen=True, eq=False)
class Body:
    """Union of ``solids`` minus the union of ``cuts``.

    Cuts are meant to be straight; :func:`plan_cuts` turns the straight through-cuts that
    stay clear of the moving boundary into plain holes, the rest go to booleans.
    """

    solids: tuple
    cuts: tuple = ()
    radial_holes: tuple = ()   # RadialHole: set-screw holes across the axis

    #: shared builder that turns this description into triangles and a solid
    builder: ClassVar[str] = "prism"

    def __post_init__(self):
        if not self.solids:
            raise GeometryError("a body needs at least one solid prism")
        for p in tuple(self.solids) + tuple(self.cuts):
            if not isinstance(p, Prism):
                raise GeometryError(f"body members must be Prism, got {type(p).__name__}")


@dataclass(frozen=True, eq=False)
class ApexBody:
    """A straight bevel gear: teeth ruled through the cone apex on a revolved blank.

    ``sizes`` is a :class:`gen.geometry.bevel.BevelSizes`, ``flank`` its virtual (Tredgold)
    spur flank, ``bore`` the bore diameter in mm (0: none).
    """

    sizes: object
    flank: object
    bore: float = 0.0

    builder: ClassVar[str] = "apex_ruled"


def gear_twist(beta: float, r_p: float, hand: str = "right") -> float:
    """Twist rate (rad/mm) of a helical gear: tan β / r_p, positive for a right hand."""
    if r_p <= 0:
        raise GeometryError(f"reference radius must be positive, got {r_p}")
    sign = _hand_sign(hand)
    return sign * math.tan(abs(beta)) / r_p


def rack_shear(beta: float, mates_with: str = "right") -> float:
    """Shear (mm/mm) of the rack that meshes with a gear of hand ``mates_with`` on its +Y side."""
    return _hand_sign(mates_with) * math.tan(abs(beta))


def _hand_sign(hand: str) -> float:
    if hand not in ("right", "left"):
        raise GeometryError(f"helix hand must be 'right' or 'left', got {hand!r}")
    return 1.0 if hand == "right" else -1.0


#: smallest gap (mm) kept between a straight cut and the moving boundary of a solid for the cut
#: to be built as a plain hole of that solid instead of by a boolean
CUT_CLEARANCE = 1e-3
#: chordal tolerance (mm) of the polygons used only to decide where cuts go
PLAN_TOL = 1e-3


@dataclass(frozen=True, eq=False)
class CutPlan:
    """Where each cut of a body goes.

    ``holes[i]`` are loops that become straight holes of ``body.solids[i]`` (no boolean);
    ``booleans`` are the cuts left for a boolean difference after the union.
    """

    holes: tuple
    booleans: tuple


def plan_cuts(body: Body) -> CutPlan:
    """Turn straight through-cuts into holes of the sections where that is exact.

    A cut becomes a straight hole loop of every solid it meets when it is straight, has one
    loop and no holes, spans the whole height of each such solid, and stays at least
    :data:`CUT_CLEARANCE` away from the solid's material boundary at every height (for a
    twisted solid: inside the disc that the rotating outer loop never enters and outside
    the annulus swept by each hole; for a sheared one: the cut's box swept against the
    shear lies inside the section and clear of the holes' swept boxes). Otherwise it is
    left for a boolean. Absorbed cuts are kept mutually clear as well.
    """
    holes = [[] for _ in body.solids]
    booleans = []
    taken = [[] for _ in body.solids]  # polygons already used as holes, per solid
    for cut in body.cuts:
        where = _absorb(cut, body.solids, taken)
        if where is None:
            booleans.append(cut)
            continue
        for i in where:
            holes[i].append(cut.section.outer)
            taken[i].append(_ccw(cut.section.outer.polygon(PLAN_TOL)))
    return CutPlan(tuple(tuple(h) for h in holes), tuple(booleans))


def _absorb(cut: Prism, solids, taken):
    if not cut.straight or cut.section.holes:
        return None
    c = _ccw(cut.section.outer.polygon(PLAN_TOL))
    where = []
    for i, s in enumerate(solids):
        if cut.z1 <= s.z0 or cut.z0 >= s.z1:
            continue
        if cut.z0 > s.z0 or cut.z1 < s.z1:
            return None
        if not _clear_inside(c, s):
            return None
        if any(_overlap(c, t, CUT_CLEARANCE) for t in taken[i]):
            return None
        where.append(i)
    return where or None


def _clear_inside(c: np.ndarray, s: Prism) -> bool:
    outer, holes = s.section.polygons(PLAN_TOL)
    gap = CUT_CLEARANCE
    if s.straight:
        return (_inside(c, outer, gap) and not any(_overlap(c, h, gap) for h in holes))
    if s.shear == 0.0:  # rotation about the axis: compare radii
        r_in = _dist_to_origin(outer)
        c_lo = 0.0 if _contains_point(c, (0.0, 0.0)) else _dist_to_origin(c)
        c_hi = float(np.max(np.hypot(c[:, 0], c[:, 1])))
        if c_hi > r_in - gap:
            return False
        for h in holes:
            h_lo = 0.0 if _contains_point(h, (0.0, 0.0)) else _dist_to_origin(h)
            h_hi = float(np.max(np.hypot(h[:, 0], h[:, 1])))
            if not (c_lo >= h_hi + gap or c_hi <= h_lo - gap):
                return False
        return True
    if s.twist == 0.0:  # translation along X
        _, sx = s.motion(np.linspace(s.z0, s.z1, 3))
        s_lo, s_hi = float(min(0.0, sx.min())), float(max(0.0, sx.max()))
        (xa, ya), (xb, yb) = c.min(axis=0), c.max(axis=0)
        box = np.array([[xa - s_hi, ya], [xb - s_lo, ya], [xb - s_lo, yb], [xa - s_hi, yb]])
        if not _inside(box, outer, gap):
            return False
        for h in holes:
            (ha, hy0), (hb, hy1) = h.min(axis=0), h.max(axis=0)
            if not (ha + s_lo > xb + gap or hb + s_hi < xa - gap
                    or hy0 > yb + gap or hy1 < ya - gap):
                return False
        return True
    return False


def _ccw(p: np.ndarray) -> np.ndarray:
    return p if signed_area(p) > 0 else p[::-1]


def _contains_point(poly: np.ndarray, pt) -> bool:
    return bool(_points_inside(poly, np.asarray([pt], dtype=float))[0])


def _points_inside(poly: np.ndarray, pts: np.ndarray) -> np.ndarray:
    """Even-odd point-in-polygon for many points (crossing number)."""
    a = poly
    b = np.roll(poly, -1, axis=0)
    x, y = pts[:, 0][:, None], pts[:, 1][:, None]
    cond = (a[:, 1] > y) != (b[:, 1] > y)
    with np.errstate(divide="ignore", invalid="ignore"):
        xc = a[:, 0] + (y - a[:, 1]) * (b[:, 0] - a[:, 0]) / (b[:, 1] - a[:, 1])
    return (np.count_nonzero(cond & (x < xc), axis=1) % 2) == 1


def _seg_dist(p: np.ndarray, a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """Distances from points p (n, 2) to segments a→b (m, 2): (n, m)."""
    d = b - a
    L2 = np.maximum(np.einsum("ij,ij->i", d, d), 1e-300)
    t = np.clip(np.einsum("nmj,mj->nm", p[:, None, :] - a[None], d) / L2, 0.0, 1.0)
    q = a[None] + t[..., None] * d[None]
    return np.hypot(*(p[:, None, :] - q).transpose(2, 0, 1))


def _dist_to_origin(poly: np.ndarray) -> float:
    return float(_seg_dist(np.zeros((1, 2)), poly, np.roll(poly, -1, axis=0)).min())


def _boundary_gap(p: np.ndarray, q: np.ndarray) -> float:
    """Least distance between the boundaries of two closed polygons (vertex-to-segment)."""
    d1 = _seg_dist(p, q, np.roll(q, -1, axis=0)).min()
    d2 = _seg_dist(q, p, np.roll(p, -1, axis=0)).min()
    return float(min(d1, d2))


def _inside(p: np.ndarray, q: np.ndarray, gap: float) -> bool:
    """Polygon p lies inside polygon q with its boundary at least ``gap`` from q's."""
    return bool(np.all(_points_inside(q, p))) and _boundary_gap(p, q) >= gap


def _overlap(p: np.ndarray, q: np.ndarray, gap: float) -> bool:
    """The two regions meet or come closer than ``gap``."""
    (pa, pb), (qa, qb) = (p.min(axis=0), p.max(axis=0)), (q.min(axis=0), q.max(axis=0))
    if np.any(pa > qb + gap) or np.any(qa > pb + gap):
        return False
    if _boundary_gap(p, q) < gap:
        return True
    return _contains_point(q, p[0]) or _contains_point(p, q[0])


# --------------------------------------------------------------------------- solids of revolution
@dataclass(frozen=True, eq=False)
class HoleCircle:
    """``count`` axial through-holes of ``diameter`` (mm) equally spaced on a circle of
    ``circle_radius`` (mm) about the Z axis, hole 0 at polar angle ``angle`` (rad) from +X."""

    count: int
    diameter: float
    circle_radius: float
    angle: float = 0.0

    def __post_init__(self):
        if int(self.count) != self.count or self.count < 1:
            raise GeometryError(f"hole count must be a whole number ≥ 1, got {self.count!r}")
        if not (self.diameter > 0 and self.circle_radius >= 0):
            raise GeometryError("hole diameter must be > 0 and its circle radius ≥ 0 mm")

    def centers(self) -> np.ndarray:
        """(count, 2) hole centres in mm."""
        a = self.angle + 2.0 * math.pi * np.arange(self.count) / self.count
        return self.circle_radius * np.column_stack([np.cos(a), np.sin(a)])


@dataclass(frozen=True, eq=False)
class Revolved:
    """A solid of revolution about +Z, minus axial through-holes.

    Parameters
    ----------
    profile : (n, 2) array_like
        The closed half-section in the (r, z) plane (mm), r ≥ 0, the last vertex joining
        the first (not repeated). Edges on r = 0 lie on the axis. Stored counter-clockwise.
    holes : tuple of HoleCircle
        Axial holes through the whole height of the body.

    The builders approximate circles by inscribed regular polygons whose sagitta stays within
    the chord tolerance: :meth:`segments`. For an inscribed n-gon of circumradius R,
    θ = 2π/n, the area is n R² sin θ / 2 and the polar moment n R⁴ sin θ (2 + cos θ)/12
    (computed: n triangles (0, P_i, P_i+1), each J = A (|a|² + |b|² + a·b)/6), so the ratios to
    the circle's πR² and πR⁴/2 (:meth:`polygon_ratios`) do not depend on R: a revolved body of
    n segments has exactly those ratios of volume and axial inertia.
    """

    profile: np.ndarray
    holes: tuple = ()

    #: shared builder that turns this description into triangles and a solid
    builder: ClassVar[str] = "revolved"

    def __post_init__(self):
        p = np.asarray(self.profile, dtype=float)
        if p.ndim != 2 or p.shape[1] != 2 or len(p) < 3 or not np.all(np.isfinite(p)):
            raise GeometryError("a revolved profile needs at least 3 finite (r, z) points")
        if np.any(p[:, 0] < 0.0):
            raise GeometryError("a revolved profile must lie at r ≥ 0 (one side of the axis)")
        a = signed_area(p)
        if a == 0.0:
            raise GeometryError("a revolved profile must enclose an area")
        if a < 0.0:
            p = p[::-1].copy()
        p.setflags(write=False)
        object.__setattr__(self, "profile", p)
        object.__setattr__(self, "holes", tuple(self.holes))
        for h in self.holes:
            if not isinstance(h, HoleCircle):
                raise GeometryError(f"revolved holes must be HoleCircle, got {type(h).__name__}")
            if h.circle_radius + h.diameter / 2.0 >= self.r_max:
                raise GeometryError("an axial hole reaches past the outer radius")

    @property
    def r_max(self) -> float:
        return float(self.profile[:, 0].max())

    @property
    def z_range(self) -> tuple[float, float]:
        return float(self.profile[:, 1].min()), float(self.profile[:, 1].max())

    @staticmethod
    def segments(radius: float, tol: float, least: int = 16) -> int:
        """Sides n of the inscribed polygon of a circle of ``radius`` (mm) whose sagitta
        R (1 − cos(π/n)) stays within ``tol`` (mm); at least ``least``, a multiple of 4."""
        if not (radius > 0 and tol > 0):
            raise GeometryError("segments need a radius and a chord tolerance > 0")
        n = math.pi / math.acos(max(-1.0, 1.0 - tol / radius)) if tol < 2 * radius else 3
        n = max(least, int(math.ceil(n - 1e-9)))
        return 4 * int(math.ceil(n / 4))

    @staticmethod
    def polygon_ratios(n: int) -> tuple[float, float]:
        """(area ratio, polar-moment ratio) of the inscribed regular n-gon to its circle."""
        t = 2.0 * math.pi / n
        return n * math.sin(t) / (2.0 * math.pi), n * math.sin(t) * (2.0 + math.cos(t)) / (6.0 * math.pi)
