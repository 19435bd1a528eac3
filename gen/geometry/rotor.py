"""Rotors of revolution (flywheels, reaction wheels, gyro rotors): half-section and mass.

A rotor is described by its half-section in the (r, z) plane — r the distance from the spin
axis, z along it, both mm — revolved a full turn about the z axis. Two layouts:

* plain disc: material r ∈ [bore/2, D/2], z ∈ [0, T];
* rim + web + hub: a rim r ∈ [D/2 − w, D/2], z ∈ [0, T]; a web of axial thickness t_w joining
  the rim to the hub at z ∈ [z_w, z_w + t_w] (default centred); a hub r ∈ [bore/2, d_hub/2],
  z ∈ [z_h, z_h + L_h] (default the full thickness).

Either layout may have a motor pocket (a cylindrical recess of diameter d_p and depth h_p cut
from the face z = 0, inside the rim) and the rim + web layout may have lightening holes:
``count`` axial through-holes of diameter d_h on a circle of radius R_c, all in the web.
Either layout may have a bolt circle (``bolts``): ``count`` ≥ 2 axial holes through the hub
(or the disc, or the web), each in material of one constant thickness, with a wall of
:data:`gen.tolerances.LIMITS.min_wall` to the bore, to each other, to the lightening holes
and to the edges of that material.

The section is built from axis-aligned rectangles on a grid of their edges, so it is exact;
its outline is traced into one counter-clockwise polygon. Mass properties come from that
polygon (Pappus–Guldinus, integrated by Green's theorem), the holes are subtracted in closed
form. Units: lengths mm, density kg/m³, mass kg, inertia kg·m².
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError, ParamError


@dataclass(frozen=True)
class Pocket:
    """Cylindrical recess from the face z = 0: ``diameter`` and ``depth`` (mm)."""

    diameter: float
    depth: float


@dataclass(frozen=True)
class Holes:
    """``count`` axial lightening holes of ``diameter`` (mm) on a circle of ``circle_radius`` (mm)."""

    count: int
    diameter: float
    circle_radius: float


@dataclass(frozen=True)
class Rotor:
    """A rotor of revolution (all mm). ``rim_width`` None means a plain disc.

    ``web_offset`` is the z of the web's lower face (None: centred in the thickness);
    ``hub_length``/``hub_offset`` the hub's axial length and the z of its lower face (None:
    the full thickness from z = 0).
    """

    outer_diameter: float
    thickness: float
    bore: float = 0.0
    rim_width: float | None = None
    web_thickness: float | None = None
    hub_diameter: float | None = None
    hub_length: float | None = None
    hub_offset: float = 0.0
    web_offset: float | None = None
    pocket: Pocket | None = None
    holes: Holes | None = None
    bolts: Holes | None = None

    @property
    def outer_radius(self) -> float:
        return self.outer_diameter / 2.0

    @property
    def bore_radius(self) -> float:
        return self.bore / 2.0

    @property
    def is_plain(self) -> bool:
        return self.rim_width is None

    @property
    def rim_inner_radius(self) -> float:
        """Inner radius of the rim (mm); for a plain disc, the bore radius."""
        return self.bore_radius if self.is_plain else self.outer_radius - self.rim_width


@dataclass(frozen=True)
class MassProperties:
    """Mass properties of a rotor about its spin axis z and its centre of mass.

    volume mm³; mass kg; centroid_z mm; axial_inertia = ∫ r² dm (kg·m²);
    transverse_inertia about an axis ⟂ z through the centre of mass (kg·m²).
    """

    volume: float
    mass: float
    centroid_z: float
    axial_inertia: float
    transverse_inertia: float


def _positive(value, key: str) -> float:
    if value is None or not value > 0:
        raise ParamError("must be > 0 mm", key=key, value=value)
    return float(value)


def _check(rotor: Rotor) -> None:
    _positive(rotor.outer_diameter, "outer_diameter")
    T = _positive(rotor.thickness, "thickness")
    if not 0.0 <= rotor.bore < rotor.outer_diameter:
        raise ParamError("bore must be ≥ 0 and below the outer diameter", key="bore",
                         value=rotor.bore)
    if rotor.is_plain:
        if rotor.holes is not None:
            raise ParamError("lightening holes need a rim + web rotor (set rim_width)",
                             key="holes")
        if rotor.pocket is not None and not rotor.pocket.diameter < rotor.outer_diameter:
            raise ParamError("motor pocket must be smaller than the outer diameter",
                             key="pocket", value=rotor.pocket.diameter)
    else:
        if not rotor.rim_width >= 0.0:
            raise ParamError("rim width must be ≥ 0 mm", key="rim_width", value=rotor.rim_width)
        tw = _positive(rotor.web_thickness, "web_thickness")
        if tw > T:
            raise ParamError("web must not be thicker than the rim", key="web_thickness",
                             value=tw, allowed=f"≤ thickness {T:g} mm")
        hub_r = _positive(rotor.hub_diameter, "hub_diameter") / 2.0
        if not rotor.bore_radius < hub_r <= rotor.rim_inner_radius:
            raise ParamError("hub must lie between the bore and the rim", key="hub_diameter",
                             value=rotor.hub_diameter,
                             allowed=f"{rotor.bore:g} … {2 * rotor.rim_inner_radius:g} mm")
        z0 = _web_z0(rotor)
        if z0 < 0.0 or z0 + tw > T:
            raise ParamError("web must lie within the rim's thickness", key="web_offset",
                             value=rotor.web_offset, allowed=f"0 … {T - tw:g} mm")
        if rotor.hub_length is not None:
            _positive(rotor.hub_length, "hub_length")
        if rotor.pocket is not None and rotor.pocket.diameter / 2.0 > rotor.rim_inner_radius:
            raise ParamError("motor pocket must fit inside the rim", key="pocket",
                             value=rotor.pocket.diameter,
                             allowed=f"≤ {2 * rotor.rim_inner_radius:g} mm")
    if rotor.pocket is not None:
        _positive(rotor.pocket.diameter, "pocket.diameter")
        if not 0.0 < rotor.pocket.depth < T:
            raise ParamError("motor pocket depth must be > 0 and below the thickness",
                             key="pocket.depth", value=rotor.pocket.depth,
                             allowed=f"0 … {T:g} mm")


def _web_z0(rotor: Rotor) -> float:
    if rotor.web_offset is not None:
        return float(rotor.web_offset)
    return (rotor.thickness - rotor.web_thickness) / 2.0


def _rectangles(rotor: Rotor):
    """(added, removed) lists of rectangles (r0, r1, z0, z1) making up the half-section."""
    R, T, a = rotor.outer_radius, rotor.thickness, rotor.bore_radius
    if rotor.is_plain:
        add = [(0.0, R, 0.0, T)]
    else:
        ri = rotor.rim_inner_radius
        zw = _web_z0(rotor)
        zh = rotor.hub_offset
        lh = rotor.thickness if rotor.hub_length is None else rotor.hub_length
        add = [(ri, R, 0.0, T), (0.0, ri, zw, zw + rotor.web_thickness),
               (0.0, rotor.hub_diameter / 2.0, zh, zh + lh)]
    zlo = min(r[2] for r in add)
    zhi = max(r[3] for r in add)
    remove = []
    if a > 0.0:
        remove.append((0.0, a, zlo, zhi))
    if rotor.pocket is not None:
        remove.append((0.0, rotor.pocket.diameter / 2.0, zlo, rotor.pocket.depth))
    return add, remove


@dataclass(frozen=True)
class CellGrid:
    """The half-section as filled cells between sorted r and z breakpoints (mm)."""

    r: np.ndarray          # (nr + 1,) breakpoints
    z: np.ndarray          # (nz + 1,)
    filled: np.ndarray     # (nr, nz) bool


def cell_grid(rotor: Rotor) -> CellGrid:
    """Exact cell decomposition of the half-section (every rectangle edge is a breakpoint)."""
    _check(rotor)
    add, remove = _rectangles(rotor)
    rs = np.unique([v for rect in add + remove for v in rect[:2]])
    zs = np.unique([v for rect in add + remove for v in rect[2:]])
    rc = 0.5 * (rs[:-1] + rs[1:])[:, None]
    zc = 0.5 * (zs[:-1] + zs[1:])[None, :]

    def inside(rect):
        return (rc > rect[0]) & (rc < rect[1]) & (zc > rect[2]) & (zc < rect[3])

    filled = np.zeros((len(rs) - 1, len(zs) - 1), dtype=bool)
    for rect in add:
        filled |= inside(rect)
    for rect in remove:
        filled &= ~inside(rect)
    return CellGrid(rs, zs, filled)


def half_section(rotor: Rotor) -> np.ndarray:
    """Closed half-section outline, (n, 2) array of (r, z) in mm, counter-clockwise.

    The last vertex joins the first (not repeated). Edges on r = 0 lie on the spin axis. Raises
    :class:`GeometryError` if the section falls apart or encloses a void.
    """
    g = cell_grid(rotor)
    nr, nz = g.filled.shape
    full = np.zeros((nr + 2, nz + 2), dtype=bool)
    full[1:-1, 1:-1] = g.filled
    nxt = {}

    def edge(p, q):
        if p in nxt:
            raise GeometryError("rotor section touches itself at a corner")
        nxt[p] = q

    for i, j in zip(*np.nonzero(g.filled)):
        p00, p10 = (i, j), (i + 1, j)
        p11, p01 = (i + 1, j + 1), (i, j + 1)
        if not full[i + 1, j]:          # below
            edge(p00, p10)
        if not full[i + 2, j + 1]:      # right
            edge(p10, p11)
        if not full[i + 1, j + 2]:      # above
            edge(p11, p01)
        if not full[i, j + 1]:          # left
            edge(p01, p00)
    if not nxt:
        raise GeometryError("rotor section is empty")
    start = min(nxt)
    loop = [start]
    while True:
        q = nxt[loop[-1]]
        if q == start:
            break
        loop.append(q)
    if len(loop) != len(nxt):
        raise GeometryError("rotor section is not one piece without voids "
                            "(check hub, web and pocket sizes)")
    pts = np.array([(g.r[i], g.z[j]) for i, j in loop], dtype=float)
    keep = []
    n = len(pts)
    for k in range(n):
        a, b, c = pts[k - 1], pts[k], pts[(k + 1) % n]
        cross = (b[0] - a[0]) * (c[1] - b[1]) - (b[1] - a[1]) * (c[0] - b[0])
        if abs(cross) > 0.0:
            keep.append(k)
    return pts[keep]


# --- integrals over the section ------------------------------------------------------------

_GL_T, _GL_W = np.polynomial.legendre.leggauss(4)   # exact for polynomials of degree ≤ 7


def section_moment(polygon: np.ndarray, a: int, b: int) -> float:
    """∫∫ r^a z^b dA over a counter-clockwise polygon in (r, z) (mm^(a+b+2)).

    Green's theorem with F = r^(a+1) z^b/(a+1): ∫∫ r^a z^b dA = ∮ F dz, each straight edge
    integrated by 4-point Gauss–Legendre, exact while a + b + 1 ≤ 7.
    """
    if a + b + 1 > 7:
        raise GeometryError("section_moment is exact only up to a + b = 6")
    p = np.asarray(polygon, dtype=float)
    q = np.roll(p, -1, axis=0)
    t = 0.5 * (_GL_T + 1.0)
    w = 0.5 * _GL_W
    r = p[:, :1] + (q[:, :1] - p[:, :1]) * t
    z = p[:, 1:] + (q[:, 1:] - p[:, 1:]) * t
    dz = (q[:, 1] - p[:, 1])[:, None]
    return float(np.sum(w * r ** (a + 1) * z ** b / (a + 1) * dz))


def hole_slab(rotor: Rotor) -> tuple[float, float]:
    """(z0, z1) of the constant-thickness material the lightening holes pass through (mm).

    Every r within the holes' radial span must cross exactly one slab of material, the same
    slab for all r; otherwise :class:`ParamError` (key ``holes``).
    """
    h = rotor.holes
    if h is None:
        raise GeometryError("rotor has no lightening holes")
    if h.count < 3:
        raise ParamError("use at least 3 lightening holes (fewer leave the rotor's transverse "
                         "inertia unequal about different axes)", key="holes.count",
                         value=h.count, allowed="≥ 3")
    _positive(h.diameter, "holes.diameter")
    if 2.0 * h.circle_radius * math.sin(math.pi / h.count) <= h.diameter:
        raise ParamError("lightening holes overlap their neighbours", key="holes.diameter",
                         value=h.diameter)
    g = cell_grid(rotor)
    lo, hi = h.circle_radius - h.diameter / 2.0, h.circle_radius + h.diameter / 2.0
    slabs = set()
    for i in range(len(g.r) - 1):
        if g.r[i + 1] <= lo or g.r[i] >= hi:
            continue
        col = g.filled[i]
        js = np.nonzero(col)[0]
        if len(js) == 0 or np.any(np.diff(js) != 1):
            slabs.add(None)
        else:
            slabs.add((float(g.z[js[0]]), float(g.z[js[-1] + 1])))
    if len(slabs) != 1 or None in slabs or lo <= 0.0:
        raise ParamError("lightening holes must lie wholly in the web (material of one constant "
                         "thickness), clear of hub, rim and pocket", key="holes.circle_radius",
                         value=h.circle_radius)
    return slabs.pop()


def _slabs_over(rotor: Rotor, lo: float, hi: float) -> set:
    """The (z0, z1) slabs of material crossed at radii lo … hi (None: a column that is not
    one unbroken slab, or no material)."""
    g = cell_grid(rotor)
    slabs = set()
    for i in range(len(g.r) - 1):
        if g.r[i + 1] <= lo or g.r[i] >= hi:
            continue
        js = np.nonzero(g.filled[i])[0]
        if len(js) == 0 or np.any(np.diff(js) != 1):
            slabs.add(None)
        else:
            slabs.add((float(g.z[js[0]]), float(g.z[js[-1] + 1])))
    return slabs


def hole_centres(h: Holes) -> np.ndarray:
    """(count, 2) centres (mm) of a hole circle, hole 0 on +X (as the builders place them)."""
    a = 2.0 * math.pi * np.arange(h.count) / h.count
    return h.circle_radius * np.column_stack([np.cos(a), np.sin(a)])


def bolt_slab(rotor: Rotor) -> tuple[float, float]:
    """(z0, z1) of the constant-thickness material the bolt holes pass through (mm).

    Refused (:class:`ParamError`, keys ``bolt_circle.*``): fewer than 2 holes; holes closer
    than the least wall w (:data:`gen.tolerances.LIMITS.min_wall`) to each other, to the bore
    or to a lightening hole; a circle whose holes, widened by w, do not lie in one slab of
    material (outside the hub or web, across a pocket or the rim's step).
    """
    from gen.tolerances import LIMITS

    b = rotor.bolts
    if b is None:
        raise GeometryError("rotor has no bolt circle")
    w = LIMITS.min_wall
    if int(b.count) != b.count or b.count < 2:
        raise ParamError("a bolt circle needs at least 2 holes", key="bolt_circle.count",
                         value=b.count, allowed="≥ 2")
    _positive(b.diameter, "bolt_circle.hole")
    rc, rh = b.circle_radius, b.diameter / 2.0
    gap = 2.0 * rc * math.sin(math.pi / b.count) - b.diameter
    if gap < w:
        raise ParamError(f"{b.count} holes of {b.diameter:g} mm on a {2 * rc:g} mm circle leave "
                         f"{gap:.2f} mm between neighbours, less than the {w:g} mm wall",
                         key="bolt_circle.count", value=b.count,
                         allowed=f"≤ {int(math.pi / math.asin(min(1.0, (b.diameter + w) / (2 * rc))))}"
                         if b.diameter + w < 2 * rc else "fewer or smaller holes")
    if rc - rh - w < rotor.bore_radius:
        raise ParamError(f"bolt holes of {b.diameter:g} mm on a {2 * rc:g} mm circle come within "
                         f"{rc - rh - rotor.bore_radius:.2f} mm of the {rotor.bore:g} mm bore "
                         f"(least wall {w:g} mm)", key="bolt_circle.diameter", value=2 * rc,
                         allowed=f"≥ {2 * (rotor.bore_radius + rh + w):.2f} mm")
    if rotor.holes is not None:
        cb, ch = hole_centres(b), hole_centres(rotor.holes)
        dist = np.hypot(*(cb[:, None, :] - ch[None, :, :]).transpose(2, 0, 1))
        if float(dist.min()) - rh - rotor.holes.diameter / 2.0 < w:
            raise ParamError("bolt holes run into the lightening holes (least wall "
                             f"{w:g} mm)", key="bolt_circle.diameter", value=2 * rc)
    slabs = _slabs_over(rotor, rc - rh - w, rc + rh + w)
    if len(slabs) != 1 or None in slabs or rc + rh + w > rotor.outer_radius:
        raise ParamError(f"bolt holes of {b.diameter:g} mm on a {2 * rc:g} mm circle must lie, "
                         f"with {w:g} mm of wall, in material of one constant thickness (the "
                         "hub, the disc or the web), clear of its edges, the pocket and the rim",
                         key="bolt_circle.diameter", value=2 * rc)
    return slabs.pop()


def _remove_holes(h: Holes, slab, rho: float):
    """(volume mm³, ∫ z dV, I_z kg·mm², I_x about the origin kg·mm²) of a hole circle through
    ``slab`` = (z0, z1): each hole m_h = ρ π d_h²/4 t, I_z = m_h (R_c² + d_h²/8) (parallel
    axis, standard); I_x summed over n equally spaced holes, n m_h (R_c²/2 + d_h²/16 + t²/12
    + z_c²) — for n = 2 the mean of the two transverse axes."""
    z0, z1 = slab
    t, zc = z1 - z0, 0.5 * (z0 + z1)
    vh = math.pi * h.diameter ** 2 / 4.0 * t
    mh = rho * vh
    n = h.count
    return (n * vh, n * vh * zc, n * mh * (h.circle_radius ** 2 + h.diameter ** 2 / 8.0),
            n * mh * (h.circle_radius ** 2 / 2.0 + h.diameter ** 2 / 16.0 + t * t / 12.0
                      + zc * zc))


def mass_properties(rotor: Rotor, density: float) -> MassProperties:
    """Mass, centre of mass and inertias of the rotor in a material of ``density`` (kg/m³).

    Solid of revolution (Pappus–Guldinus, integrated over the section A):
        V = 2π ∫∫ r dA,  z̄ = 2π ∫∫ r z dA / V,  I_z = ρ·2π ∫∫ r³ dA,
        I_x(origin) = ρ (π ∫∫ r³ dA + 2π ∫∫ r z² dA)    (∫ y² dV = π ∫∫ r³ dA by symmetry).
    Each of n ≥ 3 lightening holes (and likewise each bolt hole, n ≥ 2) (diameter d_h, slab thickness t, slab mid-plane z_c, on
    radius R_c) removes m_h = ρ π d_h²/4 · t, I_z,h = m_h (R_c² + d_h²/8) (parallel axis) and,
    summed over the equally spaced holes, I_x,h = n m_h (R_c²/2 + d_h²/16 + t²/12 + z_c²).
    Finally I_transverse = I_x(origin) − m z̄² (parallel axis to the centre of mass).
    """
    if not density > 0:
        raise ParamError("density must be > 0 kg/m³", key="density", value=density)
    poly = half_section(rotor)
    rho = density * 1e-9                                # kg/mm³
    m1 = section_moment(poly, 1, 0)
    vol = 2.0 * math.pi * m1
    vz = 2.0 * math.pi * section_moment(poly, 1, 1)
    m3 = section_moment(poly, 3, 0)
    iz = rho * 2.0 * math.pi * m3                        # kg·mm²
    ix = rho * (math.pi * m3 + 2.0 * math.pi * section_moment(poly, 1, 2))
    sets = []
    if rotor.holes is not None:
        sets.append((rotor.holes, hole_slab(rotor)))
    if rotor.bolts is not None:
        sets.append((rotor.bolts, bolt_slab(rotor)))
    for h, slab in sets:
        dv, dvz, diz, dix = _remove_holes(h, slab, rho)
        vol -= dv
        vz -= dvz
        iz -= diz
        ix -= dix
    mass = rho * vol
    zbar = vz / vol
    return MassProperties(volume=vol, mass=mass, centroid_z=zbar, axial_inertia=iz * 1e-6,
                          transverse_inertia=(ix - mass * zbar * zbar) * 1e-6)
