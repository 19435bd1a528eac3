"""Is a triangle set a closed solid? Degenerate facets, edge use and signed volume (numpy).

* degenerate facet: after merging vertices at equal coordinates, a facet that repeats a
  vertex or is thinner than ``TOL.facet_height`` (twice its area over its longest edge);
* closed and manifold: every edge shared by exactly two facets (one facet: a hole; three or
  more: a pinch or a fin);
* positive volume: outward facets, signed volume by the divergence theorem
  (V = Σ p0 · (p1 × p2) / 6).

Used on triangles as built (:mod:`gen.triangles`) and on files as written
(:mod:`gen.export.readback`).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from gen.tolerances import TOL


@dataclass(frozen=True)
class TriangleReport:
    """What the re-read found in one object (lengths mm, volume mm³)."""

    name: str
    facets: int
    degenerate: int        # facets repeating a vertex or thinner than TOL.facet_height
    open_edges: int        # edges used by one facet
    overshared_edges: int  # edges used by three or more facets
    volume: float

    @property
    def ok(self) -> bool:
        return (self.facets > 0 and self.degenerate == 0 and self.open_edges == 0
                and self.overshared_edges == 0 and self.volume > 0)

    def problem(self) -> str:
        bits = []
        if self.degenerate:
            bits.append(f"{self.degenerate} degenerate facets")
        if self.open_edges:
            bits.append(f"{self.open_edges} open edges")
        if self.overshared_edges:
            bits.append(f"{self.overshared_edges} edges shared by more than two facets")
        if not self.volume > 0:
            bits.append(f"volume {self.volume:.6g} mm³ is not positive")
        if not self.facets:
            bits.append("no facets")
        return ", ".join(bits)


def _merge_equal(v: np.ndarray):
    """(distinct rows, index of each row's distinct row): rows equal in every coordinate
    (−0.0 equal to 0.0) merge. What ``np.unique(v, axis=0, return_inverse=True)`` gives, by one
    lexicographic sort of the columns (several times faster on 10⁵ rows)."""
    v = v + 0.0                                    # −0.0 → 0.0
    order = np.lexsort(v.T[::-1])
    s = v[order]
    new = np.ones(len(s), dtype=bool)
    new[1:] = np.any(s[1:] != s[:-1], axis=1)
    group = np.cumsum(new) - 1
    inverse = np.empty(len(v), dtype=np.int64)
    inverse[order] = group
    return s[new], inverse


def inspect(vertices, faces, name: str = "") -> TriangleReport:
    """Degenerate facets, edge use and signed volume of one triangle set (mm).

    Vertices at exactly equal coordinates are merged first (an STL stores three corners per
    facet), as every slicer does on load.
    """
    v = np.asarray(vertices, dtype=float)
    f = np.asarray(faces, dtype=np.int64).reshape(-1, 3)
    if len(f) == 0:
        return TriangleReport(name, 0, 0, 0, 0, 0.0)
    uniq, inverse = _merge_equal(v)
    f = inverse[f]
    repeated = (f[:, 0] == f[:, 1]) | (f[:, 1] == f[:, 2]) | (f[:, 0] == f[:, 2])
    p0, p1, p2 = uniq[f[:, 0]], uniq[f[:, 1]], uniq[f[:, 2]]
    cross = np.cross(p1 - p0, p2 - p0)
    area2 = np.linalg.norm(cross, axis=1)               # twice the area
    longest = np.max([np.linalg.norm(p1 - p0, axis=1), np.linalg.norm(p2 - p1, axis=1),
                      np.linalg.norm(p0 - p2, axis=1)], axis=0)
    height = np.divide(area2, longest, out=np.zeros_like(area2), where=longest > 0)
    degenerate = int(np.count_nonzero(repeated | (height < TOL.facet_height)))
    edges = np.sort(np.concatenate([f[:, [0, 1]], f[:, [1, 2]], f[:, [2, 0]]]), axis=1)
    # one integer per edge (vertex indices < len(uniq)): a 1-D sort, 5–10× faster than
    # np.unique over rows
    _, counts = np.unique(edges[:, 0] * len(uniq) + edges[:, 1], return_counts=True)
    volume = float(np.einsum("ij,ij->i", p0, np.cross(p1, p2)).sum() / 6.0)
    return TriangleReport(name, len(f), degenerate, int(np.count_nonzero(counts == 1)),
                          int(np.count_nonzero(counts > 2)), volume)
