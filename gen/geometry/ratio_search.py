"""Tooth counts for a wanted speed ratio over one to three stages (numpy only).

A *stage* is a spur pair, an open timing-belt pair or a planetary stage with the ring held.
Its ratio i is input speed / output speed (i > 1 reduces):

* spur or belt pair, driver z1, driven z2: i = z2/z1 (speed ratio of a pair, common practice);
  a spur pair reverses the turning sense, an open belt keeps it;
* planetary, ring held, sun in and carrier out: i = 1 + zr/zs (Willis equation with the ring
  fixed); coaxial standard gears need zr = zs + 2·zp and equally spaced planets need
  (zs + zr)/N whole; neighbouring planet tips must clear, m·(zp + 2) + gap < m·(zs + zp)·sin(π/N)
  (planet tip diameter against the chord between planet centres; the gap, in modules, is our
  own choice). For a step-up target the same stage runs carrier in, sun out: i = zs/(zs + zr).

The train ratio is the product of the stage ratios. Every stage of a reduction reduces and
every stage of a step-up steps up (no stage works against the others).

Search. The achievable single-stage ratios are enumerated once, reduced to distinct fractions
(for each fraction the best tooth counts are kept: no common factor, then smallest size), and
sorted by log ratio. Two stages: for each first stage the second is found by ``searchsorted``
on that array; three stages: the same for every unordered pair of the first two stages (a
meet-in-the-middle of the pair sums against the sorted singles). Stage order does not change
the product, so only i ≤ j ≤ k index triples are visited. A first pass takes the nearest
neighbour of every prefix and sets an error threshold from the ``count``-th best; a second pass
collects every combination inside that threshold (contiguous windows in the sorted array), so
the ``count`` best are exact, not sampled.

Ranking: relative ratio error (errors below 1e-12 count as exact, a floating-point allowance),
then fewer stages, then fewer meshing pairs with a common factor (a "hunting tooth" pair, in
which every tooth meets every tooth of its mate, spreads wear — common practice; belts are not
counted, their pulleys never touch), then size: the sum of the pitch diameters of all gears
and pulleys (mm), spur and planetary d = z·m, belt d = z·p/π (ISO 5288 pitch diameter).

Lengths mm, ratios dimensionless.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from gen.errors import GeometryError
from gen.geometry.pulley import lookup_profile

KINDS = ("spur", "belt", "planetary")
_KIND_ORDER = {"belt": 0, "spur": 1, "planetary": 2}
#: relative error below which a ratio counts as exact (floating-point allowance)
EXACT_REL = 1e-12
#: most stages searched
MAX_STAGES = 3
#: prefixes handled per block in the three-stage pass (memory bound)
_BLOCK = 1 << 20
#: most first-two-stage pairs a three-stage search visits (time and memory bound)
MAX_PAIRS = 20_000_000


@dataclass(frozen=True)
class SearchLimits:
    """What the search may use.

    Tooth counts apply to every gear and pulley (a belt pulley also respects its profile's
    smallest recommended count); ``max_diameter`` bounds every pitch diameter (a planetary
    stage: the ring's); ``max_center`` bounds a spur pair's and a sun–planet center distance
    m(z1 + z2)/2 (belts set their center distance freely and are not bounded by it).
    """

    min_teeth: int = 12
    max_teeth: int = 100
    module: float = 1.0              # mm, spur and planetary gears
    belt_profile: str = "curv2"
    max_diameter: float | None = None   # mm
    max_center: float | None = None     # mm
    planets: int = 3
    planet_gap: float = 0.5          # modules between neighbouring planet tips (our choice)

    def checked(self) -> "SearchLimits":
        if not (isinstance(self.min_teeth, int) and isinstance(self.max_teeth, int)):
            raise GeometryError("tooth-count limits must be whole numbers")
        if self.min_teeth < 3 or self.max_teeth < self.min_teeth:
            raise GeometryError(f"tooth counts must satisfy 3 <= min <= max (got "
                                f"{self.min_teeth}..{self.max_teeth})")
        if self.max_teeth > 400:
            raise GeometryError(f"at most 400 teeth per gear are searched (got {self.max_teeth})")
        if not (self.module > 0 and math.isfinite(self.module)):
            raise GeometryError(f"module must be a positive number of mm (got {self.module!r})")
        for name in ("max_diameter", "max_center"):
            v = getattr(self, name)
            if v is not None and not (v > 0 and math.isfinite(v)):
                raise GeometryError(f"{name.replace('_', ' ')} must be a positive mm value "
                                    f"(got {v!r})")
        if not (isinstance(self.planets, int) and 2 <= self.planets <= 12):
            raise GeometryError(f"planet count must be a whole number 2..12 (got {self.planets!r})")
        lookup_profile(self.belt_profile)
        return self


@dataclass(frozen=True)
class StageChoice:
    """One stage of a solution.

    ``teeth``: (driver, driven) for spur and belt pairs; (sun, planet, ring) for planetary.
    ``ratio`` = input speed / output speed. ``direction`` +1 when the output turns with the
    input, −1 when reversed. ``size``: sum of the stage's pitch diameters (mm). ``hunting``:
    no meshing pair shares a common factor (belts: always True). ``driven_by``: planetary
    member that takes the input ("sun" or "carrier"), empty for pairs.
    """

    kind: str
    teeth: tuple
    ratio: float
    direction: int
    size: float
    hunting: bool
    driven_by: str = ""

    def as_dict(self) -> dict:
        out = {"kind": self.kind, "teeth": list(self.teeth), "ratio": self.ratio,
               "direction": self.direction, "size": self.size, "hunting_tooth": self.hunting}
        if self.driven_by:
            out["input_member"] = self.driven_by
        return out


@dataclass(frozen=True)
class RatioSolution:
    """A train: its stages in order from the input, total ratio and relative error."""

    stages: tuple
    ratio: float          # product of the stage ratios
    target: float
    error: float          # (ratio − target)/target
    exact: bool
    size: float           # sum of all pitch diameters, mm
    direction: int        # product of the stage directions

    def as_dict(self) -> dict:
        return {"ratio": self.ratio, "target": self.target, "error": self.error,
                "exact": self.exact, "size": self.size, "direction": self.direction,
                "stages": [s.as_dict() for s in self.stages]}


@dataclass(frozen=True)
class RatioSearch:
    """The ranked answer of :func:`search_ratio`."""

    target: float
    tolerance: float | None
    max_stages: int
    kinds: tuple
    limits: SearchLimits
    solutions: tuple = field(default_factory=tuple)

    @property
    def best(self):
        return self.solutions[0] if self.solutions else None

    def as_dict(self) -> dict:
        lim = self.limits
        return {"target": self.target, "tolerance": self.tolerance,
                "max_stages": self.max_stages, "kinds": list(self.kinds),
                "limits": {"min_teeth": lim.min_teeth, "max_teeth": lim.max_teeth,
                           "module": lim.module, "belt_profile": lim.belt_profile,
                           "max_diameter": lim.max_diameter, "max_center": lim.max_center,
                           "planets": lim.planets},
                "solutions": [s.as_dict() for s in self.solutions]}


# --------------------------------------------------------------------------- single stages

@dataclass(frozen=True)
class _Singles:
    """Distinct single-stage ratios, sorted by log ratio, with their best tooth counts."""

    log: np.ndarray       # log ratio, ascending
    kind: np.ndarray      # index into KINDS
    teeth: np.ndarray     # (n, 3) int, −1 where unused
    common: np.ndarray    # 1 when a meshing pair shares a factor
    size: np.ndarray      # mm
    num: np.ndarray       # reduced fraction numerator / denominator of the ratio
    den: np.ndarray


def _pairs(zmin, zmax, step_up):
    """All (driver, driven) tooth counts in zmin..zmax that reduce (or step up)."""
    z = np.arange(zmin, zmax + 1)
    z1, z2 = (a.ravel() for a in np.meshgrid(z, z, indexing="ij"))
    keep = z1 > z2 if step_up else z2 > z1
    return z1[keep], z2[keep]


def _singles(kinds, lim: SearchLimits, step_up: bool) -> _Singles:
    parts = []
    m = lim.module
    if "spur" in kinds:
        zmax = lim.max_teeth
        if lim.max_diameter is not None:
            zmax = min(zmax, int(math.floor(lim.max_diameter / m + 1e-9)))
        z1, z2 = _pairs(lim.min_teeth, zmax, step_up)
        if lim.max_center is not None:
            ok = m * (z1 + z2) / 2.0 <= lim.max_center + 1e-9
            z1, z2 = z1[ok], z2[ok]
        g = np.gcd(z1, z2)
        parts.append((0, np.stack([z1, z2, -np.ones_like(z1)], 1), (g > 1).astype(np.int64),
                      m * (z1 + z2), z2 // g, z1 // g))
    if "belt" in kinds:
        prof = lookup_profile(lim.belt_profile)
        dz = prof.pitch / math.pi
        zmax = lim.max_teeth
        if lim.max_diameter is not None:
            zmax = min(zmax, int(math.floor(lim.max_diameter / dz + 1e-9)))
        z1, z2 = _pairs(max(lim.min_teeth, prof.min_teeth), zmax, step_up)
        g = np.gcd(z1, z2)
        parts.append((1, np.stack([z1, z2, -np.ones_like(z1)], 1), np.zeros_like(z1),
                      dz * (z1 + z2), z2 // g, z1 // g))
    if "planetary" in kinds:
        n = lim.planets
        z = np.arange(lim.min_teeth, lim.max_teeth + 1)
        zs, zp = (a.ravel() for a in np.meshgrid(z, z, indexing="ij"))
        zr = zs + 2 * zp
        ok = (zr <= lim.max_teeth) & ((zs + zr) % n == 0)
        ok &= (zp + 2 + lim.planet_gap) < (zs + zp) * math.sin(math.pi / n)
        if lim.max_diameter is not None:
            ok &= m * zr <= lim.max_diameter + 1e-9
        if lim.max_center is not None:
            ok &= m * (zs + zp) / 2.0 <= lim.max_center + 1e-9
        zs, zp, zr = zs[ok], zp[ok], zr[ok]
        common = ((np.gcd(zs, zp) > 1) | (np.gcd(zp, zr) > 1)).astype(np.int64)
        g = np.gcd(zs + zr, zs)
        num, den = (zs + zr) // g, zs // g
        if step_up:
            num, den = den, num
        parts.append((2, np.stack([zs, zp, zr], 1), common, m * (zs + n * zp + zr), num, den))
    parts = [p for p in parts if len(p[1])]
    if not parts:
        return _Singles(*(np.zeros(0),) * 2, np.zeros((0, 3), int), *(np.zeros(0),) * 4)
    kind = np.concatenate([np.full(len(p[1]), p[0]) for p in parts])
    teeth = np.concatenate([p[1] for p in parts])
    common = np.concatenate([p[2] for p in parts])
    size = np.concatenate([p[3] for p in parts]).astype(float)
    num = np.concatenate([p[4] for p in parts])
    den = np.concatenate([p[5] for p in parts])
    # best tooth counts per distinct fraction: sort by (fraction, common, size, kind), keep first
    order = np.lexsort((kind, size, common, den, num))
    num, den = num[order], den[order]
    first = np.ones(len(order), bool)
    first[1:] = (num[1:] != num[:-1]) | (den[1:] != den[:-1])
    pick = order[first]
    log = np.log(num[first] / den[first])
    srt = np.argsort(log, kind="stable")
    pick = pick[srt]
    return _Singles(log[srt], kind[pick], teeth[pick], common[pick], size[pick],
                    num[first][srt], den[first][srt])


# --------------------------------------------------------------------------- combinations

def _prefixes(n: int, stages: int):
    """Blocks of non-decreasing index prefixes (i,) or (i, j) for trains of ``stages``."""
    if stages == 1:
        yield ()
    elif stages == 2:
        yield (np.arange(n),)
    else:
        rows_per = max(1, _BLOCK // max(n, 1))
        for r0 in range(0, n, rows_per):
            rows = np.arange(r0, min(n, r0 + rows_per))
            cnt = n - rows                          # j runs i .. n−1
            i = np.repeat(rows, cnt)
            start = np.cumsum(cnt) - cnt
            j = np.arange(int(cnt.sum())) - np.repeat(start, cnt) + i
            yield (i, j)


def _nearest(L: np.ndarray, q: np.ndarray, lo: np.ndarray) -> np.ndarray:
    """|L[k] − q| for the nearest k ≥ lo (inf when there is none)."""
    n = len(L)
    idx = np.searchsorted(L, q)
    best = np.full(q.shape, np.inf)
    for k in (idx - 1, idx):
        k = np.maximum(k, lo)
        e = np.abs(L[np.minimum(k, n - 1)] - q)
        best = np.minimum(best, np.where(k < n, e, np.inf))
    return best


def _expand(prefix, a, b):
    """All (prefix..., k) with a ≤ k < b per row, as index arrays."""
    cnt = np.maximum(b - a, 0)
    rows = np.repeat(np.arange(len(cnt)), cnt)
    start = np.cumsum(cnt) - cnt
    k = a[rows] + (np.arange(int(cnt.sum())) - start[rows])
    return tuple(p[rows] for p in prefix) + (k,)


def _kth(values: np.ndarray, k: int) -> float:
    """k-th smallest value (1-based); inf when there are fewer than k."""
    if len(values) < k:
        return math.inf
    return float(np.partition(values, k - 1)[k - 1])


def _within(entry, thr):
    """Keep the rows of a (stages, prefix, q, lo, err) entry whose error is within thr."""
    s, prefix, q, lo, e = entry
    sel = e <= thr
    return s, tuple(p[sel] for p in prefix), q[sel], lo[sel], e[sel]


def _candidates(S: _Singles, t: float, max_stages: int, count: int, cap: float):
    """Index tuples (i ≤ j ≤ k) whose log sum lies within the ``count``-th best error of t.

    Pass 1 scans every prefix once with its nearest last stage, keeping prefixes whose nearest
    error is within a running ``count``-th best (an upper bound of the final threshold, so a
    discarded prefix can never hold one of the best trains). Pass 2 takes, for the kept
    prefixes, every last stage inside the final threshold (a contiguous window).
    """
    L = S.log
    n = len(L)
    kept = []            # (stages, prefix arrays, q, nearest error)
    thr = cap
    for s in range(1, max_stages + 1):
        for prefix in _prefixes(n, s):
            if prefix:
                q = t - sum(L[p] for p in prefix)
                lo = prefix[-1]
            else:
                q, lo = np.array([t]), np.zeros(1, np.int64)
            e = _nearest(L, q, lo)
            sel = e <= thr
            if not sel.any():
                continue
            kept.append((s, tuple(p[sel] for p in prefix), q[sel], lo[sel], e[sel]))
            thr = min(thr, _kth(np.concatenate([k[4] for k in kept]), count) + 4 * EXACT_REL)
            kept = [_within(k, thr) for k in kept]
    out = []
    for s, prefix, q, lo, e in kept:
        if len(q) == 0:
            continue
        a = np.maximum(np.searchsorted(L, q - thr, side="left"), lo)
        b = np.searchsorted(L, q + thr, side="right")
        out.append(_expand(prefix, a, b))
    return out


def search_ratio(target: float, *, max_stages: int = 2, kinds=("spur",),
                 tolerance: float | None = None, limits: SearchLimits | None = None,
                 count: int = 10) -> RatioSearch:
    """Rank tooth-count trains whose ratio comes nearest ``target`` (input/output speed).

    Parameters
    ----------
    target : wanted ratio, > 0 (< 1 asks for a step-up).
    max_stages : 1 to 3; trains of fewer stages are searched too.
    kinds : stage kinds any stage may use, from ``KINDS``.
    tolerance : largest relative error |i − target|/target accepted; ``None`` returns the
        nearest trains whatever their error (exact ones first when any exist).
    limits : :class:`SearchLimits`.
    count : how many trains to return.

    Returns
    -------
    RatioSearch with up to ``count`` :class:`RatioSolution`, best first (see the module text).
    """
    target = float(target)
    if not (math.isfinite(target) and target > 0):
        raise GeometryError(f"target ratio must be a positive number (got {target!r})")
    if abs(target - 1.0) < EXACT_REL:
        raise GeometryError("a 1:1 ratio needs no gear stage")
    if isinstance(max_stages, bool) or not (isinstance(max_stages, int)
                                            and 1 <= max_stages <= MAX_STAGES):
        raise GeometryError(f"stages must be 1, 2 or 3 (got {max_stages!r})")
    kinds = tuple(dict.fromkeys(kinds))
    bad = [k for k in kinds if k not in KINDS]
    if bad or not kinds:
        raise GeometryError(f"unknown stage kind {bad[0] if bad else '(none)'!r}; "
                            f"valid kinds: {', '.join(KINDS)}")
    if tolerance is not None and not (0 <= tolerance < 1):
        raise GeometryError(f"tolerance must be a relative error 0 <= tol < 1 (got {tolerance!r})")
    if isinstance(count, bool) or not (isinstance(count, int) and count >= 1):
        raise GeometryError(f"count must be a whole number >= 1 (got {count!r})")
    lim = (limits or SearchLimits()).checked()
    S = _singles(kinds, lim, step_up=target < 1.0)
    answer = RatioSearch(target, tolerance, max_stages, kinds, lim)
    n = len(S.log)
    if n == 0:
        return answer
    if max_stages == 3 and n * (n + 1) // 2 > MAX_PAIRS:
        raise GeometryError(f"{n} distinct stage ratios give too many three-stage trains to "
                            f"search; lower the largest tooth count or use two stages")
    cap = math.inf
    if tolerance is not None:
        cap = max(-math.log1p(-tolerance), math.log1p(tolerance)) + 4 * EXACT_REL
    cands = _candidates(S, math.log(target), max_stages, count, cap)
    sols = _rank(S, target, cands, tolerance, count)
    return RatioSearch(target, tolerance, max_stages, kinds, lim, tuple(sols))


def _rank(S: _Singles, target: float, cands, tolerance, count):
    """Best ``count`` trains among the candidates: error, stages, common factors, size."""
    keys, refs = [], []
    for g, idx in enumerate(cands):
        if len(idx[-1]) == 0:
            continue
        rel = np.expm1(sum(S.log[i] for i in idx) - math.log(target))
        keys.append((np.round(np.abs(rel) / EXACT_REL), np.full(len(rel), len(idx)),
                     sum(S.common[i] for i in idx), sum(S.size[i] for i in idx), rel))
        refs.append(np.stack([np.full(len(rel), g), np.arange(len(rel))], 1))
    if not keys:
        return []
    err_key, nst, common, size, rel = (np.concatenate([k[c] for k in keys]) for c in range(5))
    ref = np.concatenate(refs)
    order = np.lexsort((size, common, nst, err_key))
    if tolerance is not None:
        order = order[np.abs(rel[order]) <= tolerance + EXACT_REL]
    out = []
    for o in order[:count]:
        g, p = ref[o]
        out.append(_solution(S, [int(a[p]) for a in cands[g]], target))
    return out


def _stage(S: _Singles, i: int) -> StageChoice:
    kind = KINDS[int(S.kind[i])]
    z = tuple(int(v) for v in S.teeth[i] if v >= 0)
    ratio = float(S.num[i] / S.den[i])
    if kind == "planetary":
        return StageChoice(kind, z, ratio, +1, float(S.size[i]), not S.common[i],
                           "sun" if ratio > 1 else "carrier")
    return StageChoice(kind, z, ratio, -1 if kind == "spur" else +1, float(S.size[i]),
                       not S.common[i])


def _solution(S: _Singles, ids, target: float) -> RatioSolution:
    """A solution from single indices; the ratio is formed from exact integer fractions."""
    stages = sorted((_stage(S, i) for i in ids),
                    key=lambda s: (_KIND_ORDER[s.kind], abs(math.log(s.ratio))))
    num = math.prod(int(S.num[i]) for i in ids)
    den = math.prod(int(S.den[i]) for i in ids)
    ratio = num / den
    err = ratio / target - 1.0
    return RatioSolution(tuple(stages), ratio, target, err, abs(err) <= EXACT_REL,
                         sum(s.size for s in stages), math.prod(s.direction for s in stages))
