"""Shaded pictures of triangle meshes on the CPU: an orthographic z-buffer rasteriser in numpy
and a minimal PNG encoder, for the build report. No GPU, no plug-in, no imaging library.

Method (the classic scan-conversion z-buffer, e.g. Foley, van Dam et al., *Computer Graphics:
Principles and Practice*, 2nd ed., §15.4): every triangle facing the eye is projected
orthographically and scan-converted row by row (each row's span between its edge crossings
is expanded into pixel centres, all triangles at once in numpy); the depth is interpolated on
the triangle's plane and, per chunk of candidates, the nearest one per pixel is kept with one
``lexsort``. Work grows with the covered area.

Shading: flat (one normal per triangle), Lambert with a key light and a weaker fill light
plus an ambient term; edges are inked where the depth jumps or the shade changes sharply
(a silhouette and crease finder on the finished buffers). The picture is rendered at twice the
size and averaged 2 × 2 (supersampling) so edges are smooth. The same input gives the same
bytes (no time stamps in the PNG).
"""

from __future__ import annotations

import math
import os
import struct
import zlib
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

#: pixels per chunk of candidate tests (memory bound: ~40 bytes per candidate)
_CHUNK = 1_500_000


@dataclass(frozen=True)
class View:
    """Eye direction by azimuth (from +X toward +Y) and elevation (above the XY plane), degrees."""

    azimuth: float = -55.0
    elevation: float = 32.0

    def frame(self):
        """(right, up, toward-eye) unit vectors of the orthographic camera."""
        az, el = math.radians(self.azimuth), math.radians(self.elevation)
        d = np.array([math.cos(el) * math.cos(az), math.cos(el) * math.sin(az), math.sin(el)])
        ref = np.array([0.0, 0.0, 1.0]) if abs(d[2]) < 0.999 else np.array([0.0, 1.0, 0.0])
        u = np.cross(ref, d)
        u /= np.linalg.norm(u)
        v = np.cross(d, u)
        return u, v, d


def _raster(xy: np.ndarray, depth: np.ndarray, faces: np.ndarray, w: int, h: int):
    """Nearest face per pixel: (depth buffer, face-index buffer) of shape (h, w); −inf / −1
    where nothing is drawn. ``xy`` are pixel coordinates of the vertices (y down).

    Scan conversion: each triangle is cut into pixel rows; on each row the span between the
    two edge crossings is filled with the pixel centres inside it; depth comes from the
    triangle's plane z = A·x + B·y + C. Work grows with the covered area, not the boxes.
    """
    zbuf = np.full(w * h, -np.inf)
    ibuf = np.full(w * h, -1, dtype=np.int64)
    p = xy[faces]                      # (m, 3, 2)
    z = depth[faces]                   # (m, 3)
    e1, e2 = p[:, 1] - p[:, 0], p[:, 2] - p[:, 0]
    area = e1[:, 0] * e2[:, 1] - e1[:, 1] * e2[:, 0]
    ylo = np.maximum(np.ceil(p[:, :, 1].min(axis=1) - 0.5), 0).astype(np.int64)
    yhi = np.minimum(np.floor(p[:, :, 1].max(axis=1) - 0.5), h - 1).astype(np.int64)
    ok = (np.abs(area) > 1e-12) & (yhi >= ylo)
    f = np.nonzero(ok)[0]
    if len(f) == 0:
        return zbuf.reshape(h, w), ibuf.reshape(h, w)
    # plane of each triangle in pixel coordinates: z = A x + B y + C
    dz1, dz2 = z[f, 1] - z[f, 0], z[f, 2] - z[f, 0]
    A = (dz1 * e2[f, 1] - dz2 * e1[f, 1]) / area[f]
    B = (dz2 * e1[f, 0] - dz1 * e2[f, 0]) / area[f]
    C = z[f, 0] - A * p[f, 0, 0] - B * p[f, 0, 1]
    nrow = yhi[f] - ylo[f] + 1
    starts = np.cumsum(nrow) - nrow
    tri = np.repeat(np.arange(len(f)), nrow)            # index into f
    row = ylo[f][tri] + (np.arange(len(tri)) - starts[tri])
    yc = row + 0.5
    xs = np.full((len(tri), 3), np.nan)
    for k, (i, j) in enumerate(((0, 1), (1, 2), (2, 0))):
        a, b = p[f[tri], i], p[f[tri], j]
        dy = b[:, 1] - a[:, 1]
        t = np.divide(yc - a[:, 1], dy, out=np.full(len(tri), np.nan), where=dy != 0)
        good = (t >= 0) & (t <= 1)
        xs[good, k] = (a[:, 0] + t * (b[:, 0] - a[:, 0]))[good]
    x0 = np.maximum(np.ceil(np.nanmin(xs, axis=1) - 0.5), 0)
    x1 = np.minimum(np.floor(np.nanmax(xs, axis=1) - 0.5), w - 1)
    x0 = np.nan_to_num(x0, nan=1.0).astype(np.int64)
    x1 = np.nan_to_num(x1, nan=0.0).astype(np.int64)
    cnt = np.maximum(x1 - x0 + 1, 0)
    # expand spans to pixels, in chunks of spans so the candidate arrays stay small
    cum = np.cumsum(cnt)
    s = 0
    while s < len(cnt):
        e = int(np.searchsorted(cum, (cum[s - 1] if s else 0) + _CHUNK, side="right"))
        e = max(e, s + 1)
        c = cnt[s:e]
        st = np.cumsum(c) - c
        span = np.repeat(np.arange(s, e), c)
        px = x0[span] + (np.arange(len(span)) - st[span - s])
        ti = tri[span]
        dep = A[ti] * (px + 0.5) + B[ti] * yc[span] + C[ti]
        pix = row[span] * w + px
        fid = f[ti]
        order = np.lexsort((-dep, pix))
        pix, dep, fid = pix[order], dep[order], fid[order]
        first = np.ones(len(pix), dtype=bool)
        first[1:] = pix[1:] != pix[:-1]
        pix, dep, fid = pix[first], dep[first], fid[first]
        better = dep > zbuf[pix]
        zbuf[pix[better]] = dep[better]
        ibuf[pix[better]] = fid[better]
        s = e
    return zbuf.reshape(h, w), ibuf.reshape(h, w)


def shade(vertices, faces, colors=None, *, view: View = View(), size=(300, 220),
          background=(255, 255, 255), bounds=None) -> np.ndarray:
    """Shaded picture of triangles as an (h, w, 3) uint8 array.

    Parameters
    ----------
    vertices : (n, 3) float, mm.  faces : (m, 3) int, counter-clockwise seen from outside.
    colors : (m, 3) float in 0…1 per face, or one RGB triple (default a mid grey).
    view : the eye direction; the projection is orthographic and fitted to the picture.
    size : (width, height) in pixels of the result (rendered at twice that, averaged 2 × 2).
    bounds : optional (min, max) corner points (mm) to fit instead of the vertices' own box, so
        that several pictures share one scale.
    """
    v = np.asarray(vertices, dtype=float)
    f = np.asarray(faces, dtype=np.int64)
    w, h = int(size[0]) * 2, int(size[1]) * 2
    u, up, d = view.frame()
    n = np.cross(v[f[:, 1]] - v[f[:, 0]], v[f[:, 2]] - v[f[:, 0]])
    norm = np.linalg.norm(n, axis=1)
    n = n / np.where(norm > 0, norm, 1.0)[:, None]
    front = n @ d > 0.0                      # back faces of a closed mesh are hidden anyway
    corners = v if bounds is None else _box_corners(*bounds)
    sx, sy = corners @ u, corners @ up
    pad = 0.06
    scale = min(w * (1 - 2 * pad) / max(np.ptp(sx), 1e-9), h * (1 - 2 * pad) / max(np.ptp(sy), 1e-9))
    cx, cy = 0.5 * (sx.min() + sx.max()), 0.5 * (sy.min() + sy.max())
    xy = np.column_stack([w / 2 + scale * (v @ u - cx), h / 2 - scale * (v @ up - cy)])
    depth = v @ d
    keep = np.nonzero(front)[0]
    zbuf, ibuf = _raster(xy, depth, f[keep], w, h)
    hit = ibuf >= 0
    face = np.where(hit, keep[np.maximum(ibuf, 0)], 0)
    # two lights in camera terms: key from upper left in front, fill from the right
    key = _unit(-0.45 * u + 0.6 * up + 0.65 * d)
    fill = _unit(0.7 * u - 0.1 * up + 0.7 * d)
    lam = 0.30 + 0.62 * np.clip(n @ key, 0, 1) + 0.22 * np.clip(n @ fill, 0, 1)
    if colors is None:
        colors = (0.62, 0.62, 0.62)
    col = np.asarray(colors, dtype=float)
    base = np.broadcast_to(col, (len(f), 3)) if col.ndim == 1 else col
    rgb = np.clip(base[face] * lam[face][..., None], 0, 1)
    # ink: silhouettes (depth jumps, background edges) and creases (shade jumps)
    light = np.where(hit, lam[face], -1.0)
    zf = np.where(hit, zbuf, zbuf[hit].min(initial=0.0) - 1e6)
    jump = 0.012 * max(np.ptp(depth), 1e-9) * scale / scale   # depth jump as part of the size
    ink = np.zeros_like(hit)
    for axis in (0, 1):
        dz = np.abs(np.diff(zf, axis=axis)) > jump
        ds = np.abs(np.diff(light, axis=axis)) > 0.22
        edge = dz | ds
        sl = [slice(None), slice(None)]
        sl[axis] = slice(1, None)
        ink[tuple(sl)] |= edge
    rgb[ink] *= 0.35
    bg = np.asarray(background, dtype=float) / 255.0
    rgb[~hit & ~ink] = bg
    img = (rgb.reshape(h // 2, 2, w // 2, 2, 3).mean(axis=(1, 3)) * 255.0 + 0.5).astype(np.uint8)
    return img


def _unit(a):
    return a / np.linalg.norm(a)


def _box_corners(lo, hi):
    lo, hi = np.asarray(lo, float), np.asarray(hi, float)
    return np.array([[x, y, z] for x in (lo[0], hi[0]) for y in (lo[1], hi[1])
                     for z in (lo[2], hi[2])])


def png_bytes(img: np.ndarray) -> bytes:
    """PNG file bytes of an (h, w, 3) uint8 image (PNG spec, W3C/ISO 15948: signature, IHDR,
    one IDAT of zlib-compressed scanlines each with filter byte 1 "Sub", IEND)."""
    img = np.ascontiguousarray(img, dtype=np.uint8)
    h, w, _ = img.shape
    sub = img.astype(np.int16)
    sub[:, 1:] -= img[:, :-1].astype(np.int16)
    rows = np.concatenate([np.ones((h, 1), np.uint8), (sub % 256).astype(np.uint8).reshape(h, -1)],
                          axis=1)

    def chunk(tag: bytes, data: bytes) -> bytes:
        return (struct.pack(">I", len(data)) + tag + data
                + struct.pack(">I", zlib.crc32(tag + data) & 0xFFFFFFFF))

    return (b"\x89PNG\r\n\x1a\n"
            + chunk(b"IHDR", struct.pack(">IIBBBBB", w, h, 8, 2, 0, 0, 0))
            + chunk(b"IDAT", zlib.compress(rows.tobytes(), 6))
            + chunk(b"IEND", b""))


def read_stl(path: str):
    """(vertices (n, 3), faces (m, 3)) of a binary or ASCII STL file, read back with trimesh
    (three vertices per facet, as stored: the picture is drawn facet by facet, and merging
    them changes no pixel but costs 2.7× the reading). A file read once is kept while its size and modification time stay
    the same (a part card and an assembly view read the same file)."""
    st = os.stat(path)
    return _read_stl(os.path.abspath(path), st.st_size, st.st_mtime_ns)


@lru_cache(maxsize=64)
def _read_stl(path: str, size: int, mtime: int):
    import trimesh

    mesh = trimesh.load(path, file_type="stl", force="mesh", process=False)
    v, f = np.asarray(mesh.vertices, float), np.asarray(mesh.faces, np.int64)
    v.setflags(write=False)
    f.setflags(write=False)
    return v, f
