"""Mass properties of meshes built by the project's own path (Prism → body_triangles → trimesh).

Reference values (computed, closed forms of a solid cylinder, any statics handbook):
V = π r² h, I_z = m r²/2 about its axis, parallel-axis theorem I_O = I_G + m d².
The mesh is not a cylinder but the inscribed prism of the chordal polygon, so the test also
recomputes the exact values of that regular n-gon prism by an independent route.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from gen.errors import GeometryError
from gen.geometry.body import Body, Prism
from gen.geometry.section import Section, circle
from gen.triangles.mass import mass_properties
from gen.triangles.prism import body_triangles

TOL = 0.01      # chordal tolerance of the mesh, mm
RHO = 1.24      # g/cm³, input only (a typical solid PLA figure, common practice)
#: manifold3d hands vertices over as float32 (about 6e-8 relative), so "exact" means this
EXACT = 1e-6


def disc(r, h, centre=(0.0, 0.0), hole=None):
    holes = (circle(hole, centre),) if hole else ()
    return body_triangles(Body((Prism(Section(circle(r, centre), holes), 0.0, h),)), TOL)


def ngon_sides(r, tol):
    """Sides of the polygon the mesh layer uses for a circle: the fewest equal chords whose
    sagitta r (1 − cos(δ/2)) stays within tol (recomputed here, not imported)."""
    step = 2.0 * math.acos(1.0 - tol / r)
    return math.ceil(2.0 * math.pi / step)


def sides_of(mesh, r, centre=(0.0, 0.0)):
    """Polygon sides the mesh layer chose for a circle of radius r: its vertices on the
    bottom face at that radius (the layer may spend less than the full tolerance there)."""
    v = mesh.vertices
    d = np.hypot(v[:, 0] - centre[0], v[:, 1] - centre[1])
    n = int(np.sum((np.abs(v[:, 2]) < 1e-9) & (np.abs(d - r) < 1e-6 * r)))
    assert n >= ngon_sides(r, TOL)
    return n


def ngon_prism(r, h, rho_g_mm3, n=None):
    """(volume, mass, I_z about the centre) of a regular n-gon prism of circumradius r.
    Each fan triangle (0, a, b) has ∫r² dA = A/6 (|a|² + a·b + |b|²) (computed)."""
    n = n or ngon_sides(r, TOL)
    th = 2.0 * math.pi / n
    area = 0.5 * n * r * r * math.sin(th)
    polar = n * r ** 4 * math.sin(th) * (2.0 + math.cos(th)) / 12.0
    return area * h, rho_g_mm3 * area * h, rho_g_mm3 * h * polar


def test_disc_about_its_axis():
    r, h = 10.0, 5.0
    mesh = disc(r, h)
    props = mass_properties(mesh, RHO)
    rho = RHO * 1e-3  # g/mm³
    # the sides the mesh layer chose (it may spend less than the full tolerance on the
    # outline): counted on the bottom face, and at least as many as the tolerance demands
    v_poly, m_poly, i_poly = ngon_prism(r, h, rho, sides_of(mesh, r))
    # exact against the inscribed prism actually meshed
    assert props["volume_mm3"] == pytest.approx(v_poly, rel=EXACT)
    assert props["mass_g"] == pytest.approx(m_poly, rel=EXACT)
    assert props["izz_center_g_mm2"] == pytest.approx(i_poly, rel=EXACT)
    assert props["izz_origin_g_mm2"] == pytest.approx(i_poly, rel=EXACT)
    assert np.allclose(props["center_of_mass_mm"], [0.0, 0.0, h / 2.0], atol=1e-6)
    # against the true cylinder: the chordal polygon loses θ²/6 of the area, θ² ≤ 8 tol / r,
    # so the relative deficit is at most (4/3) tol / r (0.13 % here); I_z loses about twice
    v = math.pi * r * r * h
    m = rho * v
    bound = 4.0 / 3.0 * TOL / r * 1.01
    assert 0 < 1 - props["volume_mm3"] / v <= bound
    assert 0 < 1 - props["izz_center_g_mm2"] / (m * r * r / 2.0) <= 2 * bound


def test_off_axis_disc_parallel_axis():
    r, h, c = 8.0, 3.0, (30.0, -40.0)
    mesh = disc(r, h, c)
    props = mass_properties(mesh, RHO)
    m = props["mass_g"]
    _, m_poly, i_poly = ngon_prism(r, h, RHO * 1e-3, sides_of(mesh, r, c))
    assert m == pytest.approx(m_poly, rel=EXACT)
    assert np.allclose(props["center_of_mass_mm"], [c[0], c[1], h / 2.0], atol=1e-6)
    assert props["izz_center_g_mm2"] == pytest.approx(i_poly, rel=EXACT)
    # I_O = I_G + m d², d = 50 mm (3-4-5 triangle)
    assert props["izz_origin_g_mm2"] == pytest.approx(i_poly + m_poly * 50.0 ** 2, rel=EXACT)
    tensor = np.array(props["inertia_center_g_mm2"])
    assert tensor[2, 2] == pytest.approx(props["izz_center_g_mm2"])
    # a prism of a regular polygon: I_x = I_y about the centre of mass
    assert tensor[0, 0] == pytest.approx(tensor[1, 1], rel=1e-6)


def test_ring_against_hollow_cylinder():
    R, r, h = 12.0, 4.0, 6.0
    mesh = disc(R, h, hole=r)
    props = mass_properties(mesh, RHO)
    rho = RHO * 1e-3
    vo, mo, io = ngon_prism(R, h, rho, sides_of(mesh, R))
    vi, mi, ii = ngon_prism(r, h, rho, sides_of(mesh, r))
    assert props["volume_mm3"] == pytest.approx(vo - vi, rel=EXACT)
    assert props["izz_center_g_mm2"] == pytest.approx(io - ii, rel=EXACT)
    # hollow cylinder I = m (R² + r²)/2 (computed), within the chordal effect
    m = rho * math.pi * (R * R - r * r) * h
    assert props["izz_center_g_mm2"] == pytest.approx(m * (R * R + r * r) / 2.0, rel=4e-3)


def test_refuses_bad_density_and_open_meshes():
    import trimesh

    mesh = disc(5.0, 2.0)
    with pytest.raises(GeometryError, match="density"):
        mass_properties(mesh, 0.0)
    opened = trimesh.Trimesh(mesh.vertices, mesh.faces[:-4], process=False)
    with pytest.raises(GeometryError, match="watertight"):
        mass_properties(opened, RHO)
