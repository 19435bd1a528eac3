"""Triangles of a straight bevel gear placed directly (no mesh boolean).

Same solid as :mod:`gen.solid.apex_faces`, frame of :mod:`gen.geometry.bevel`: the large-end
outline on the back cone is sampled in development coordinates (θ real angle, ρ distance from
the back-cone apex); the small end is its copy scaled by k = Ri/Re about the apex A.

* tooth flanks, tips and root lands: quads between the large-end polyline and its scaled
  copy. Each quad (P_i, P_i+1, kP_i+1, kP_i) lies in the plane through A, P_i and P_i+1, so it
  is exact; the only error is the large-end polyline's (flank samples thinned to tol/2 in the
  development, which is an isometry of the cone; arcs at the chord tolerance);
* back and front tooth ends: per tooth, rows of constant ρ at the flank levels, each row an
  arc split at the chord tolerance, neighbouring rows zipped into triangles; under the teeth,
  a band zipped between the root circle and the rim circle;
* the rest of the blank (back face, shoulder, bore, front face): rings at the chord tolerance,
  zipped or joined by quads.

Triangles of revolved faces are oriented by their known outward normal; the mesh is checked
closed and of positive volume. A gear whose teeth touch at the root (no root land) falls back
to the older mesh boolean of :mod:`gen.triangles.bevel`.
"""

from __future__ import annotations

import math

import numpy as np

from gen.errors import GeometryError
from gen.geometry.bevel import blank_profile
from gen.triangles.prism import _spline_polyline


def _step(r: float, tol: float) -> float:
    """Largest angle (rad) whose chord on a circle of radius r stays within tol (sagitta)."""
    if r <= tol:
        return math.pi / 2
    return min(math.pi / 8, 2.0 * math.acos(1.0 - tol / r))


def _zip(a_idx, a_key, b_idx, b_key) -> np.ndarray:
    """Triangles joining two polylines whose keys run over the same interval (orientation
    not fixed here)."""
    a_idx, b_idx = np.asarray(a_idx), np.asarray(b_idx)
    ka, kb = np.asarray(a_key)[1:], np.asarray(b_key)[1:]
    keys = np.concatenate([ka, kb])
    flag = np.concatenate([np.zeros(len(ka), int), np.ones(len(kb), int)])
    order = np.argsort(keys, kind="stable")
    flag = flag[order]
    adv_a = np.concatenate([[0], np.cumsum(flag == 0)[:-1]])
    adv_b = np.concatenate([[0], np.cumsum(flag == 1)[:-1]])
    tri = np.where((flag == 0)[:, None],
                   np.column_stack([a_idx[adv_a], a_idx[np.minimum(adv_a + 1, len(a_idx) - 1)],
                                    b_idx[adv_b]]),
                   np.column_stack([a_idx[adv_a], b_idx[np.minimum(adv_b + 1, len(b_idx) - 1)],
                                    b_idx[adv_b]]))
    return tri


def _closed(idx, key):
    return np.append(idx, idx[0]), np.append(key, key[0] + 2.0 * math.pi)


def apex_mesh_arrays(sizes, bore_radius: float, flank, tol: float = 0.01):
    """(vertices (n, 3), triangles (m, 3) with outward orientation) of one bevel gear."""
    cd, sd = math.cos(sizes.delta), math.sin(sizes.delta)
    H = sizes.mounting_distance
    apex = np.array([0.0, 0.0, H])
    k = sizes.small_end_scale
    z_bc = H - sizes.Re * cd - sizes.rv * sd
    z, pitch = sizes.z, 2.0 * math.pi / sizes.z
    rho, psi = np.asarray(flank.r, float), np.asarray(flank.psi, float)
    if psi[-1] <= 0:
        raise GeometryError("pointed teeth: the flanks meet below the tip of the virtual gear")
    n_root = int(np.searchsorted(rho, flank.r_junction, side="right"))
    pieces = [(0, n_root)] + ([(n_root - 1, len(rho))] if n_root < len(rho) else [])
    keep = []
    for a, b in pieces:   # thin each flank piece in the development (an isometry of the cone)
        dev = np.column_stack([rho[a:b] * np.cos(psi[a:b]), rho[a:b] * np.sin(psi[a:b])])
        kept = _spline_polyline(dev, 0.5 * tol)
        sel = [int(np.argmin(np.hypot(*(dev - q).T))) + a for q in kept]
        keep.extend(sel if not keep else sel[1:])
    lev_r, lev_t = rho[keep], psi[keep] / cd          # row radii ρ_i and half angles θ_i
    half_root = lev_t[0]
    root_span = pitch - 2.0 * half_root
    if root_span <= 1e-9:
        return None
    prof = blank_profile(sizes, bore_radius)
    shoulder = len(prof) == 7
    r_bl, z_bl = prof[-5]
    r_fl, z_fl = prof[-2]

    th, rh = [], []        # development coordinates of the shared (back/front) vertices

    def add(thetas, r):
        start = len(th)
        th.extend(np.atleast_1d(thetas).tolist())
        rh.extend([r] * len(np.atleast_1d(thetas)))
        return np.arange(start, len(th))

    # tooth 0 (centred on θ = 0); the other teeth are copies turned by t · pitch
    rows = []
    for r_i, h_i in zip(lev_r, lev_t):
        m = max(1, int(math.ceil(2.0 * h_i / _step(r_i * cd, tol) - 1e-9)))
        rows.append(add(np.linspace(-h_i, h_i, m + 1), r_i))
    cap0 = np.concatenate([_zip(rows[i], np.linspace(0, 1, len(rows[i])),
                                rows[i + 1], np.linspace(0, 1, len(rows[i + 1])))
                           for i in range(len(rows) - 1)])
    m_r = max(1, int(math.ceil(root_span / _step(lev_r[0] * cd, tol) - 1e-9)))
    arc = np.linspace(half_root, pitch - half_root, m_r + 1)[1:-1]
    arc_idx = add(arc, lev_r[0])
    ring0 = np.concatenate([rows[0], arc_idx])
    key0 = np.concatenate([np.linspace(-half_root, half_root, len(rows[0])), arc])
    out0 = np.concatenate([[r[0] for r in rows], rows[-1][1:], [r[-1] for r in rows[-2::-1]],
                           arc_idx]).astype(int)
    n_t = len(th)
    shift = n_t * np.arange(z)
    caps = (cap0[None, :, :] + shift[:, None, None]).reshape(-1, 3)
    ring_idx = (ring0[None, :] + shift[:, None]).ravel()
    ring_key = (key0[None, :] + pitch * np.arange(z)[:, None]).ravel()
    outline = (out0[None, :] + shift[:, None]).ravel()
    th = (np.array(th)[None, :] + pitch * np.arange(z)[:, None]).ravel()
    rh = np.tile(np.array(rh), z)
    ns = len(th)

    def cone(theta, r, scale):
        p = np.column_stack([r * cd * np.cos(theta), r * cd * np.sin(theta), z_bc + r * sd])
        return apex + scale * (p - apex)

    theta0 = -half_root
    verts = [cone(th, rh, 1.0), cone(th, rh, k)]
    n_v = 2 * ns

    def ring(r, zc):
        nonlocal n_v
        m = max(3, int(math.ceil(2.0 * math.pi / _step(r, tol) - 1e-9)))
        a = theta0 + 2.0 * math.pi * np.arange(m) / m
        verts.append(np.column_stack([r * np.cos(a), r * np.sin(a), np.full(m, zc)]))
        idx = np.arange(n_v, n_v + m)
        n_v += m
        return idx, a

    groups = []   # (triangles, outward normal kind)
    groups += [(caps, "back"), (caps + ns, "front")]
    ri, rk = _closed(ring_idx, ring_key)
    for rim_r, rim_z, off, kind in ((r_bl, z_bl, 0, "back"), (r_fl, z_fl, ns, "front")):
        rim, ra = ring(rim_r, rim_z)
        groups.append((_zip(*_closed(rim, ra), ri + off, rk), kind))
        if kind == "back":
            back_rim, back_a = rim, ra
        else:
            front_rim, front_a = rim, ra
    if shoulder:
        low, la = ring(r_bl, 0.0)
        groups.append((_zip(*_closed(low, la), *_closed(back_rim, back_a)), "out"))
        back_rim, back_a = low, la
    if bore_radius > 0:
        b0, ba = ring(bore_radius, 0.0)
        b1, _ = ring(bore_radius, z_fl)
        groups.append((_zip(*_closed(b0, ba), *_closed(b1, ba)), "in"))
        groups.append((_zip(*_closed(back_rim, back_a), *_closed(b0, ba)), "down"))
        groups.append((_zip(*_closed(front_rim, front_a), *_closed(b1, ba)), "up"))
    else:
        verts.append(np.array([[0.0, 0.0, 0.0], [0.0, 0.0, z_fl]]))
        c0, c1 = n_v, n_v + 1
        n_v += 2
        for rim, a, cc, kind in ((back_rim, back_a, c0, "down"), (front_rim, front_a, c1, "up")):
            ci, _ = _closed(rim, a)
            groups.append((np.column_stack([ci[:-1], ci[1:], np.full(len(rim), cc)]), kind))
    V = np.concatenate(verts)

    faces = []
    for tri, kind in groups:
        tri = tri[(tri[:, 0] != tri[:, 1]) & (tri[:, 1] != tri[:, 2]) & (tri[:, 0] != tri[:, 2])]
        a, b, c = V[tri[:, 0]], V[tri[:, 1]], V[tri[:, 2]]
        n = np.cross(b - a, c - a)
        g = (a + b + c) / 3.0
        phi = np.arctan2(g[:, 1], g[:, 0])
        radial = np.column_stack([np.cos(phi), np.sin(phi), np.zeros(len(phi))])
        want = {"back": sd * radial - cd * np.array([0, 0, 1.0]),
                "front": -(sd * radial - cd * np.array([0, 0, 1.0])),
                "out": radial, "in": -radial,
                "down": np.tile([0, 0, -1.0], (len(phi), 1)),
                "up": np.tile([0, 0, 1.0], (len(phi), 1))}[kind]
        flip = np.einsum("ij,ij->i", n, want) < 0
        tri = tri.copy()
        tri[flip] = tri[flip][:, ::-1]
        faces.append(tri)
    # lateral quads between the large-end outline and its scaled copy: outward by the sense
    o0 = outline
    o1 = np.roll(outline, -1)
    faces.append(np.column_stack([o0, o1, o1 + ns]))
    faces.append(np.column_stack([o0, o1 + ns, o0 + ns]))
    return V, np.concatenate(faces)


def apex_triangles(shape, tol: float = 0.01):
    """Triangles of a :class:`gen.geometry.body.ApexBody` (the builder table's entry)."""
    import trimesh

    arrays = apex_mesh_arrays(shape.sizes, shape.bore / 2.0, shape.flank, tol)
    if arrays is None:   # no root land between the teeth: the mesh boolean route
        from gen.triangles.bevel import apex_triangles as boolean_route

        return boolean_route(shape, tol)
    V, F = arrays
    tm = trimesh.Trimesh(vertices=V, faces=F, process=False)
    if not tm.is_watertight or tm.volume <= 0:
        raise GeometryError("bevel gear mesh is not closed")
    return tm
