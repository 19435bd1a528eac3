"""Lay printable parts flat and arrange them on a build plate.

Laying flat: a part rests on its largest *supporting* flat face, one whose plane has the
whole part on one side (so the part can stand on it). Parts are generated with their bottom
on z = 0, and that bottom is kept when it is as large as the best face (ties keep the
generated orientation); a bevel gear thus lies on its back face.

Arranging: each laid-flat part's footprint is its axis-aligned bounding box in XY. Boxes are
packed in shelves (rows), tallest first, left to right, with ``spacing`` between boxes; a
part wider than the plate but fitting when turned is turned 90° about Z. Plate coordinates:
origin at the plate's front-left corner, X to the right, Y to the back, bottom on z = 0; the
packed group is centred on the plate.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from gen.errors import GeometryError

#: plate size (mm, X × Y) and gap between parts (mm) used when none is given
DEFAULT_PLATE = (220.0, 220.0)
DEFAULT_SPACING = 5.0
#: the generated bottom is kept when its area is at least this fraction of the best face
KEEP_BOTTOM = 0.99
#: flat-face detection: face normals equal to this many decimals; plane offset tolerance (mm)
NORMAL_DECIMALS = 6
PLANE_TOL = 1e-6
#: how many of the largest same-normal face groups are tested as resting faces
CANDIDATES = 16


@dataclass
class Placed:
    """One part on the plate: its moved copy, the XY offset applied after laying it flat,
    whether it was turned 90° about Z, and the whole 4×4 transform from the input mesh."""

    name: str
    mesh: object
    offset: tuple
    turned: bool
    transform: np.ndarray


def resting_faces(mesh):
    """[(area mm², outward unit normal)] of flat faces the part can stand on, largest first."""
    normals = np.round(np.asarray(mesh.face_normals), NORMAL_DECIMALS) + 0.0
    areas = np.asarray(mesh.area_faces)
    keys, inverse = np.unique(normals, axis=0, return_inverse=True)
    inverse = inverse.ravel()
    group_area = np.bincount(inverse, weights=areas, minlength=len(keys))
    verts = np.asarray(mesh.vertices)
    tri = np.asarray(mesh.faces)
    raw = np.asarray(mesh.face_normals)
    out = []
    for g in np.argsort(-group_area)[:CANDIDATES]:
        sel = inverse == g
        n = (raw[sel] * areas[sel, None]).sum(axis=0)   # unrounded, area-weighted
        n = n / np.linalg.norm(n)
        heights = verts @ n
        top = heights.max()
        on_plane = np.all(heights[tri[sel]] >= top - PLANE_TOL, axis=1)
        area = float(areas[sel][on_plane].sum())
        if area > 0:
            out.append((area, n))
    out.sort(key=lambda t: -t[0])
    return out


def lay_flat(mesh):
    """(copy of the mesh resting on z = 0, 4×4 transform applied)."""
    from trimesh.geometry import align_vectors

    down = np.array([0.0, 0.0, -1.0])
    faces = resting_faces(mesh)
    rot = np.eye(4)
    if faces:
        best_area, best_n = faces[0]
        bottom = next((a for a, n in faces if np.allclose(n, down, atol=1e-6)), 0.0)
        if bottom < KEEP_BOTTOM * best_area:
            rot = align_vectors(best_n, down)
    moved = mesh.copy()
    moved.apply_transform(rot)
    lift = np.eye(4)
    lift[2, 3] = -moved.bounds[0][2]
    moved.apply_transform(lift)
    return moved, lift @ rot


def _fmt(v: float) -> str:
    return f"{v:.1f}"


def arrange(items, plate=DEFAULT_PLATE, spacing: float = DEFAULT_SPACING) -> list[Placed]:
    """Lay every (name, mesh) flat and pack the footprints on a plate of ``plate`` mm.

    Returns one :class:`Placed` per item in input order. Raises GeometryError naming the
    first part that does not fit and the plate size.
    """
    W, H = float(plate[0]), float(plate[1])
    if not (W > 0 and H > 0) or spacing < 0:
        raise GeometryError(f"plate size must be positive and spacing not negative "
                            f"(got {plate!r}, {spacing!r})")
    size_text = f"{W:g} × {H:g} mm plate"
    flat = []
    for name, mesh in items:
        moved, tf = lay_flat(mesh)
        lo, hi = moved.bounds[0][:2], moved.bounds[1][:2]
        w, d = float(hi[0] - lo[0]), float(hi[1] - lo[1])
        turned = False
        if w > W or d > H:
            if d <= W and w <= H:
                turned, w, d = True, d, w
            else:
                raise GeometryError(f"part '{name}' ({_fmt(w)} × {_fmt(d)} mm footprint) does "
                                    f"not fit on the {size_text}")
        flat.append([name, moved, tf, w, d, turned])
    order = sorted(range(len(flat)), key=lambda i: (-flat[i][4], -flat[i][3], i))
    corner = {}
    x = y = shelf = 0.0
    for i in order:
        name, _, _, w, d, _ = flat[i]
        if x > 0 and x + w > W:           # start a new shelf
            x, y = 0.0, y + shelf + spacing
            shelf = 0.0
        if y + d > H:
            raise GeometryError(f"part '{name}' does not fit on the {size_text} with the "
                                f"{len(corner)} parts already placed (spacing {spacing:g} mm); "
                                "use a larger plate or a second plate")
        corner[i] = (x, y)
        x += w + spacing
        shelf = max(shelf, d)
    # centre the packed group on the plate
    used_w = max(corner[i][0] + flat[i][3] for i in corner)
    used_h = max(corner[i][1] + flat[i][4] for i in corner)
    cx, cy = (W - used_w) / 2.0, (H - used_h) / 2.0
    out = []
    for i, (name, moved, tf, w, d, turned) in enumerate(flat):
        step = np.eye(4)
        if turned:  # 90° counter-clockwise about Z
            step[:2, :2] = [[0.0, -1.0], [1.0, 0.0]]
        m = moved.copy()
        m.apply_transform(step)
        lo = m.bounds[0]
        dx = corner[i][0] + cx - float(lo[0])
        dy = corner[i][1] + cy - float(lo[1])
        shift = np.eye(4)
        shift[0, 3], shift[1, 3] = dx, dy
        m.apply_transform(shift)
        out.append(Placed(name=name, mesh=m, offset=(dx, dy), turned=turned,
                          transform=shift @ step @ tf))
    return out


def arrange_plates(items, plate=DEFAULT_PLATE,
                   spacing: float = DEFAULT_SPACING) -> list[list[Placed]]:
    """Lay every (name, mesh) flat and pack them on as many plates as they need.

    Parts are taken in input order and added to the current plate while :func:`arrange` still
    packs them all; a part that does not fit starts the next plate. Returns one list of
    :class:`Placed` per plate (plate coordinates as in :func:`arrange`). Raises GeometryError
    naming a part whose footprint does not fit even on an empty plate.
    """
    items = list(items)
    for name, mesh in items:          # a part too big for an empty plate: say which
        arrange([(name, mesh)], plate, spacing)
    plates: list[list[Placed]] = []
    current: list = []
    for item in items:
        try:
            arrange(current + [item], plate, spacing)
            current.append(item)
        except GeometryError:
            plates.append(arrange(current, plate, spacing))
            current = [item]
    if current:
        plates.append(arrange(current, plate, spacing))
    return plates
