"""Mass properties of a closed triangle mesh (mm in, grams and g·mm² out).

The integrals over the solid come from :func:`trimesh.triangles.mass_properties`
(divergence-theorem sums over the triangles, after D. Eberly, "Polyhedral Mass Properties").
Units: lengths mm, volume mm³, density g/cm³ at the user boundary (= 1e-3 g/mm³ inside),
mass g, moments of inertia **g·mm²** (1 g·mm² = 1e-9 kg·m²).

The moment about the part's own Z axis through the origin (its rotation axis: gears are built
centred on Z) follows from the one through the centre of mass by the parallel-axis
(Huygens–Steiner) theorem: I_z,O = I_z,G + m (x_G² + y_G²).
"""

from __future__ import annotations

import numpy as np

from gen.errors import GeometryError

#: g/cm³ → g/mm³
PER_CM3 = 1e-3


def mass_properties(mesh, density: float) -> dict:
    """Volume, mass, centre of mass and Z moments of inertia of a watertight mesh.

    Parameters
    ----------
    mesh : trimesh.Trimesh
        Closed, outward-oriented mesh in mm.
    density : float
        g/cm³ (PLA ≈ 1.24, PETG ≈ 1.27 for a solid print; scale by the infill fraction for
        a partly filled part).

    Returns
    -------
    dict with
        ``volume_mm3``, ``mass_g``, ``density_g_cm3``, ``center_of_mass_mm`` [x, y, z],
        ``izz_center_g_mm2`` (about the axis parallel to Z through the centre of mass),
        ``izz_origin_g_mm2`` (about the Z axis through the origin),
        ``inertia_center_g_mm2`` (3×3 tensor about the centre of mass, frame axes).
    """
    from trimesh.triangles import mass_properties as tri_mass

    if not density > 0:
        raise GeometryError(f"density must be positive (got {density!r} g/cm³)")
    if not mesh.is_watertight:
        raise GeometryError("mass properties need a closed (watertight) mesh")
    rho = float(density) * PER_CM3
    props = tri_mass(mesh.triangles, crosses=mesh.triangles_cross, density=rho)
    volume = float(props.volume)
    if volume <= 0:
        raise GeometryError("mesh encloses no volume (inside-out or empty)")
    com = np.asarray(props.center_mass, dtype=float)
    inertia = np.asarray(props.inertia, dtype=float)
    mass = rho * volume
    izz_c = float(inertia[2, 2])
    izz_o = izz_c + mass * float(com[0] ** 2 + com[1] ** 2)  # parallel-axis theorem
    return {
        "volume_mm3": volume,
        "mass_g": mass,
        "density_g_cm3": float(density),
        "center_of_mass_mm": [float(c) for c in com],
        "izz_center_g_mm2": izz_c,
        "izz_origin_g_mm2": izz_o,
        "inertia_center_g_mm2": inertia.tolist(),
    }
