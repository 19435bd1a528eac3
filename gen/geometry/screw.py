"""Screw threads: ISO 2904 trapezoidal and ISO 68-1 metric basic sizes, profiles and sections.

Lengths mm, angles radians. Sizes (shared references, from memory):

* ISO 2904 trapezoidal, 30° thread: d2 = d − 0.5 P; h3 = 0.5 P + a_c; d3 = d − 2 h3;
  D1 = d − P; D4 = d + 2 a_c; crest clearance a_c = 0.15 (P 1.5), 0.25 (P 2–5), 0.5 (P 6–12),
  1 (P ≥ 14). The flanks run straight from d3 to d (sharp corners here: the standard's root
  roundings R1 ≤ 0.5 a_c, R2 ≤ a_c are left out).
* ISO 68-1 metric, 60° thread: H = 0.866025 P; d2 = d − 0.649519 P (= d − ¾ H · 2);
  d1 = d − 1.082532 P (= d − 5/4 H · 2). Basic profile: the screw root is the flat at d1
  (the rounded root of ISO 965 external threads is not modelled).
* Lead L = n P (n starts); lead angle tan λ = L / (π d2).

Both forms are symmetric with the screw's material exactly P/2 wide (axially) on d2, so the
axial width of one screw thread at radius r is

    w(r) = P/2 + 2 (r2 − r) tan(α/2),   r2 = d2/2, α the included flank angle.

The transverse section at z = 0 follows from w(r) (see :mod:`gen.geometry.helicoid`).

Nut: the basic nut profile (minor D1, root D4, flanks on the screw's) with every face moved
back from the screw by a clearance c measured normal to the face: crest and root radii grow by
c, each flank moves axially by c / cos(α/2). The nut's thread tooth, P − w(D1/2) wide at
its crest on the basic profile, then narrows by 2 c (1/cos(α/2) − tan(α/2)); it comes to a
point at c_max = (P − w(D1/2)) / (2 (1/cos(α/2) − tan(α/2))) (computed), which is refused.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError
from gen.geometry.helicoid import flank_samples, helicoid_loop, twist_rate
from gen.geometry.section import Loop

TRAPEZOIDAL, METRIC = "trapezoidal", "metric"


def trapezoidal_crest_clearance(pitch: float) -> float:
    """ISO 2904 crest clearance a_c (mm) for a pitch P (mm), from memory (shared references)."""
    p = float(pitch)
    if abs(p - 1.5) < 1e-9:
        return 0.15
    if 2.0 - 1e-9 <= p <= 5.0 + 1e-9:
        return 0.25
    if 6.0 - 1e-9 <= p <= 12.0 + 1e-9:
        return 0.5
    if p >= 14.0 - 1e-9:
        return 1.0
    raise GeometryError(f"ISO 2904 lists no crest clearance for a {p:g} mm pitch "
                        "(pitches 1.5, 2–5, 6–12 or 14 mm and up)")


@dataclass(frozen=True)
class ThreadSizes:
    """Basic sizes of a screw thread and its nut (mm, radians)."""

    form: str             # "trapezoidal" (ISO 2904) or "metric" (ISO 68-1)
    d: float              # nominal (major) diameter of the screw
    pitch: float          # P
    starts: int           # n
    lead: float           # L = n P
    flank_angle: float    # included angle α (30° or 60°)
    d2: float             # pitch diameter (screw and nut)
    d3: float             # screw minor (root) diameter
    D1: float             # nut minor diameter
    D4: float             # nut major (root) diameter
    h3: float             # screw thread depth (d − d3)/2
    ac: float             # crest clearance (0 for metric basic profile)
    lead_angle: float     # λ, tan λ = L / (π d2)

    @property
    def half_angle(self) -> float:
        return self.flank_angle / 2.0

    def width_at(self, r):
        """Axial width of one screw thread at radius r (mm): P/2 + 2 (r2 − r) tan(α/2)."""
        r = np.asarray(r, dtype=float)
        return self.pitch / 2.0 + 2.0 * (self.d2 / 2.0 - r) * math.tan(self.half_angle)

    @property
    def crest_width(self) -> float:
        """Axial width of the screw's crest flat on d (mm); 0.366 P for ISO 2904."""
        return float(self.width_at(self.d / 2.0))

    @property
    def root_gap(self) -> float:
        """Axial width of the screw's root flat on d3 (mm); 0.366 P − 0.536 a_c for ISO 2904."""
        return self.pitch - float(self.width_at(self.d3 / 2.0))


def thread_sizes(form: str, d: float, pitch: float, starts: int = 1) -> ThreadSizes:
    """Basic sizes of a ``form`` thread of major diameter d and pitch P (mm), n starts."""
    if starts < 1 or int(starts) != starts:
        raise GeometryError(f"a thread needs a whole number of starts ≥ 1 (got {starts})")
    if not (pitch > 0 and d > 0):
        raise GeometryError("thread diameter and pitch must be positive")
    if form == TRAPEZOIDAL:
        ac = trapezoidal_crest_clearance(pitch)
        d2 = d - 0.5 * pitch
        h3 = 0.5 * pitch + ac
        d3 = d - 2.0 * h3
        D1, D4, angle = d - pitch, d + 2.0 * ac, math.radians(30.0)
    elif form == METRIC:
        ac = 0.0
        d2 = d - 0.649519 * pitch
        d3 = d - 1.082532 * pitch
        h3 = (d - d3) / 2.0
        D1, D4, angle = d3, d, math.radians(60.0)
    else:
        raise GeometryError(f"unknown thread form {form!r}; allowed: {TRAPEZOIDAL}, {METRIC}")
    if d3 <= 0:
        raise GeometryError(f"a {pitch:g} mm pitch is too coarse for a {d:g} mm screw: "
                            "the root diameter would be ≤ 0")
    lead = pitch * starts
    return ThreadSizes(form=form, d=d, pitch=pitch, starts=int(starts), lead=lead,
                       flank_angle=angle, d2=d2, d3=d3, D1=D1, D4=D4, h3=h3, ac=ac,
                       lead_angle=math.atan(lead / (math.pi * d2)))


# --- screw -------------------------------------------------------------------------------

def screw_axial_profile(s: ThreadSizes) -> np.ndarray:
    """Half axial section of the screw over one pitch, (n, 2) columns (r, z), mm, ccw.

    The thread is centred on z = 0; the window runs z ∈ [−P/2, P/2] from the axis (r = 0)
    out to the crest. A closed polygon (last vertex not repeated).
    """
    r3, ra = s.d3 / 2.0, s.d / 2.0
    w3, wa = float(s.width_at(r3)), s.crest_width
    h = s.pitch / 2.0
    return np.array([(0.0, -h), (r3, -h), (r3, -w3 / 2.0), (ra, -wa / 2.0),
                     (ra, wa / 2.0), (r3, w3 / 2.0), (r3, h), (0.0, h)])


def _radii(lo: float, hi: float, n: int | None, turn: float, sag: float = 1e-4) -> np.ndarray:
    """Radii for a flank running from lo to hi while its angle changes by ``turn`` (rad).

    With n None the count is chosen so a polyline through the samples stays within ``sag``
    mm of the spiral (:func:`gen.geometry.helicoid.flank_samples`).
    """
    if n is None:
        n = flank_samples(turn, hi, sag)
    return np.linspace(lo, hi, n)


def _turn(s: ThreadSizes, lo: float, hi: float) -> float:
    return math.pi * float(s.width_at(lo) - s.width_at(hi)) / s.lead


def screw_section(s: ThreadSizes, samples: int | None = None, phase: float = 0.0) -> Loop:
    """Transverse section of the screw at z = 0 as a Loop (flanks as Splines), mm.

    Lobe k is centred at polar angle ``phase`` + 2π k / n. Carry it with
    :func:`screw_twist` to sweep the thread. ``samples``: radii per flank (default: enough
    for the flank polyline to stay within 0.1 µm of the spiral).
    """
    r = _radii(s.d3 / 2.0, s.d / 2.0, samples, _turn(s, s.d3 / 2.0, s.d / 2.0))
    return helicoid_loop(r, s.width_at(r), s.lead, s.starts, phase)


def screw_polygon(s: ThreadSizes, tol: float = 0.01, samples: int | None = None) -> np.ndarray:
    """The same transverse section as an (n, 2) polygon, arcs at chordal tolerance ``tol``."""
    return screw_section(s, samples).polygon(tol)


def screw_twist(s: ThreadSizes, hand: str = "right") -> float:
    """Twist rate (rad/mm) of the prism that sweeps the thread: 2π / L, + right-hand."""
    return twist_rate(s.lead, hand)


# --- nut ---------------------------------------------------------------------------------

@dataclass(frozen=True)
class NutThread:
    """Nut thread with clearance c (mm, normal to every face): the hole the screw runs in."""

    sizes: ThreadSizes
    clearance: float       # c
    minor_diameter: float  # D1 + 2c (nut crest)
    root_diameter: float   # D4 + 2c (nut root)
    axial_play: float      # 2 c / cos(α/2): end play of the screw in the nut
    engagement: float      # radial overlap of screw crest and nut crest, (d − D1)/2 − c
    tooth_crest: float     # axial width of the nut tooth's crest flat
    max_clearance: float   # c at which the nut tooth comes to a point

    def groove_width(self, r):
        """Axial width of the nut's thread groove at radius r (mm): w(r) + 2c/cos(α/2)."""
        return self.sizes.width_at(r) + 2.0 * self.clearance / math.cos(self.sizes.half_angle)


def nut_thread(s: ThreadSizes, clearance: float = 0.0) -> NutThread:
    """Nut thread for screw ``s`` with clearance c (mm) moved back normal to every face.

    Refuses a negative clearance (the nut would overlap the screw) and one that makes the
    nut's thread tooth come to a point (the clearance closes the thread).
    """
    c = float(clearance)
    if c < 0:
        raise GeometryError(f"a nut clearance of {c:g} mm is negative: the nut thread would "
                            "overlap the screw; use 0 or more")
    ha = s.half_angle
    basic_tooth = s.pitch - float(s.width_at(s.D1 / 2.0))
    shrink = 2.0 * (1.0 / math.cos(ha) - math.tan(ha))
    c_max = basic_tooth / shrink
    tooth = basic_tooth - shrink * c
    engagement = (s.d - s.D1) / 2.0 - c
    if tooth <= 1e-9 * s.pitch or engagement <= 0:
        raise GeometryError(
            f"a nut clearance of {c:g} mm closes the thread of this {s.d:g}×{s.pitch:g} screw: "
            f"the nut's thread teeth come to a point (largest clearance {c_max:.3f} mm)")
    return NutThread(sizes=s, clearance=c, minor_diameter=s.D1 + 2.0 * c,
                     root_diameter=s.D4 + 2.0 * c, axial_play=2.0 * c / math.cos(ha),
                     engagement=engagement, tooth_crest=tooth, max_clearance=c_max)


def nut_axial_profile(nut: NutThread, outer_radius: float) -> np.ndarray:
    """Half axial section of the nut's material over one pitch, (n, 2) columns (r, z), mm.

    Window z ∈ [0, P] with the nut's thread tooth centred on z = P/2 (the screw's thread,
    and so the nut's groove, is centred on z = 0 and z = P); the material runs out to
    ``outer_radius``.
    """
    r1, r4 = nut.minor_diameter / 2.0, nut.root_diameter / 2.0
    if outer_radius <= r4:
        raise GeometryError("the nut's outer radius must lie outside its thread root")
    p = nut.sizes.pitch
    g1, g4 = float(nut.groove_width(r1)), float(nut.groove_width(r4))
    return np.array([(outer_radius, 0.0), (outer_radius, p), (r4, p), (r4, p - g4 / 2.0),
                     (r1, p - g1 / 2.0), (r1, g1 / 2.0), (r4, g4 / 2.0), (r4, 0.0)])


def nut_section(nut: NutThread, samples: int | None = None, phase: float = 0.0) -> Loop:
    """Transverse section (z = 0) of the nut's threaded hole as a Loop, mm.

    The hole is the region the nut does not occupy: everything inside its minor circle plus
    the groove lobes, groove k centred at ``phase`` + 2π k / n like the screw's thread.
    """
    lo, hi = nut.minor_diameter / 2.0, nut.root_diameter / 2.0
    r = _radii(lo, hi, samples, _turn(nut.sizes, lo, hi))
    return helicoid_loop(r, nut.groove_width(r), nut.sizes.lead, nut.sizes.starts, phase)


def nut_polygon(nut: NutThread, tol: float = 0.01, samples: int | None = None) -> np.ndarray:
    """The nut's hole section as an (n, 2) polygon at chordal tolerance ``tol``."""
    return nut_section(nut, samples).polygon(tol)
