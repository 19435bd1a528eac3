"""Lead screw and screw nut kinds: ISO sizes in the manifest, drive numbers against the
power-screw and column formulas, the thread measured on the exported triangles, refusals."""

import math

import numpy as np
import pytest

from gen.errors import ParamError
from gen.kinds.base import resolve
from gen.params.project import RawPart

T15 = math.tan(math.radians(15.0))


def part(kind, **values):
    raw = RawPart(name="p", kind=kind, values=values, file="t.yaml", train=None, lines={})
    return resolve(raw)


# ISO 2904 basic dimensions (shared references, from memory): Tr 8×2 d2 7.0 d3 5.5;
# Tr 10×2 d2 9.0 d3 7.5; Tr 12×3 d2 10.5 d3 8.5 (d2 = d − P/2, d3 = d − 2(P/2 + a_c),
# a_c = 0.25 for P 2–5)
@pytest.mark.parametrize("d,p,d2,d3", [(8, 2, 7.0, 5.5), (10, 2, 9.0, 7.5), (12, 3, 10.5, 8.5)])
def test_manifest_iso2904_sizes(d, p, d2, d3):
    s = part("lead_screw", diameter=d, pitch=p, length=10).sizes
    assert s["pitch_diameter"] == pytest.approx(d2, abs=1e-12)
    assert s["minor_diameter"] == pytest.approx(d3, abs=1e-12)
    assert s["lead"] == p
    # tan λ = L / (π d2) (thread geometry, computed)
    assert s["lead_angle"] == pytest.approx(math.degrees(math.atan(p / (math.pi * d2))), abs=1e-12)


def _shigley_raise(F, dm, L, f, alpha):
    """Shigley §8-2 (from memory): T_R = F dm/2 (L + π f dm sec α)/(π dm − f L sec α)."""
    sec = 1 / math.cos(alpha)
    return F * dm / 2 * (L + math.pi * f * dm * sec) / (math.pi * dm - f * L * sec)


def test_efficiency_and_self_locking():
    # Tr 8×2 single start, steel in bronze dry (Shigley Table 8-5, from memory: 0.15–0.23,
    # typical 0.19): π f d2 sec 15° = π·0.19·7/cos 15° = 4.33 mm > L = 2 mm → self-locking
    one = part("lead_screw", diameter=8, pitch=2, length=20, nut_material="bronze").sizes
    assert one["friction"] == pytest.approx(0.19, abs=1e-12)
    assert one["self_locking"] is True
    # efficiency recomputed from the raising torque: e = F L / (2π T_R) (load drops out)
    t = _shigley_raise(1.0, 7.0, 2.0, 0.19, math.radians(15))
    assert one["efficiency_raise"] == pytest.approx(2.0 / (2 * math.pi * t), rel=1e-12)
    # by a second route, the normal-plane form without the sec α approximation
    # (e = tan λ (1 − f tan λ / cos α_n) / (tan λ + f / cos α_n), from memory) agrees to 1 %
    lam = math.atan(2.0 / (math.pi * 7.0))
    an = math.atan(T15 * math.cos(lam))
    e2 = math.tan(lam) * (math.cos(an) - 0.19 * math.tan(lam)) / (math.cos(an) * math.tan(lam) + 0.19)
    assert one["efficiency_raise"] == pytest.approx(e2, rel=0.01)
    # four starts, lead 8 mm: 4.33 < 8 → the load drives it back
    four = part("lead_screw", diameter=8, pitch=2, starts=4, length=20,
                nut_material="bronze").sizes
    assert four["lead"] == 8 and four["self_locking"] is False
    assert four["efficiency_raise"] > one["efficiency_raise"]
    # a given friction overrides the material pair
    assert part("lead_screw", diameter=8, pitch=2, length=20, friction=0.08).sizes["friction"] == 0.08


def test_drive_numbers():
    p = part("lead_screw", diameter=10, pitch=2, length=50, load=100, rpm=300,
             end_fixity="pinned-pinned", free_length=400, nut_material="bronze",
             lubrication="oil")
    s = p.sizes
    f = 0.13  # Shigley Table 8-5 steel/bronze oiled 0.10–0.16 (from memory), typical
    assert s["friction"] == pytest.approx(f, abs=1e-12)
    assert s["torque_raise"] == pytest.approx(_shigley_raise(100, 9.0, 2.0, f, math.radians(15))
                                              / 1000, rel=1e-12)
    # nut speed v = n L / 60 (computed)
    assert s["linear_speed"] == pytest.approx(300 * 2 / 60)
    # Euler column (from memory): P_cr = π² E I / l², pinned ends, I = π d3⁴/64 on the root
    # diameter d3 = 7.5 mm, E of steel 210 GPa (handbook)
    inertia = math.pi * 7.5 ** 4 / 64
    assert s["buckling_load"] == pytest.approx(math.pi ** 2 * 210000 * inertia / 400 ** 2, rel=1e-12)
    # first whirling speed of a pinned-pinned shaft (from memory): ω = (π/l)² √(E I/(ρ A)),
    # in SI, ρ 7850 kg/m³
    area = math.pi * 7.5 ** 2 / 4
    omega = (math.pi / 0.4) ** 2 * math.sqrt(210e9 * inertia * 1e-12 / (7850 * area * 1e-6))
    assert s["critical_speed"] == pytest.approx(omega * 60 / (2 * math.pi), rel=1e-3)
    codes = {f.code: f.severity for f in p.findings}
    assert codes["screw-buckling"] == "info" and codes["screw-whirl"] == "info"


def test_overloads_are_reported():
    # fixed-free, 400 mm free, root 7.5 mm (computed by the formulas of test_drive_numbers
    # with C = ¼ and λ = 1.875): Euler load ≈ 500 N, whirling ≈ 2000 rpm; 5 kN and 3000 rpm
    # are past both
    p = part("lead_screw", diameter=10, pitch=2, length=50, load=5000, rpm=3000,
             free_length=400)
    sev = {f.code: f.severity for f in p.findings}
    assert sev["screw-buckling"] == "error" and sev["screw-whirl"] == "error"


def test_plastic_pair_needs_a_friction():
    with pytest.raises(ParamError) as exc:
        part("lead_screw", diameter=8, pitch=2, length=20, screw_material="PLA")
    assert exc.value.key == "friction"


def test_nut_clearance_that_closes_the_thread_is_refused():
    # computed (ISO 2904 Tr 8×2): the nut tooth on D1 = 6 is P − w(3) = 2 − (1 + 2·0.5 tan 15°)
    # = 0.732 mm wide, and narrows by 2c (1/cos 15° − tan 15°) = 1.535 c: it closes at
    # c = 0.477 mm
    c_max = (2 - (1 + 2 * 0.5 * T15)) / (2 * (1 / math.cos(math.radians(15)) - T15))
    assert c_max == pytest.approx(0.477, abs=1e-3)
    ok = part("screw_nut", diameter=8, pitch=2, length=10, clearance=round(c_max - 0.01, 3))
    assert ok.sizes["max_clearance"] == pytest.approx(c_max, rel=1e-9)
    with pytest.raises(ParamError) as exc:
        part("screw_nut", diameter=8, pitch=2, length=10, clearance=round(c_max + 0.01, 3))
    assert exc.value.key == "clearance" and "closes the thread" in str(exc.value)


def test_nut_clearance_from_the_fit_profile():
    nut = part("screw_nut", diameter=8, pitch=2, length=10, fit="fdm-0.6")
    # fdm-0.6 flank clearance 0.15 mm (built-in fit); minor D1 + 2c, axial play 2c/cos 15°
    assert nut.sizes["clearance"] == 0.15
    assert nut.sizes["nut_minor"] == pytest.approx(6.0 + 0.3)
    assert nut.sizes["axial_play"] == pytest.approx(0.3 / math.cos(math.radians(15)))
    with pytest.raises(ParamError) as exc:
        part("screw_nut", diameter=8, pitch=2, length=10, outer_diameter=9.5)
    assert exc.value.key == "outer_diameter"
    with pytest.raises(ParamError) as exc:
        part("screw_nut", diameter=8, pitch=2, length=10, flange_diameter=20, bolt_circle=15)
    assert exc.value.key == "bolt_circle"


# --- measured on the triangles (built once for the module) ------------------------------

@pytest.fixture(scope="module")
def screw_mesh():
    from gen.triangles import triangles

    p = part("lead_screw", diameter=8, pitch=2, starts=4, length=12, chord_tolerance=0.02)
    return p, triangles(p.shape, p.chord_tol)


@pytest.fixture(scope="module")
def nut_mesh():
    from gen.triangles import triangles

    p = part("screw_nut", diameter=8, pitch=2, starts=4, length=10, clearance=0.1,
             flange_diameter=26, chord_tolerance=0.02)
    return p, triangles(p.shape, p.chord_tol)


def _axial_profile(mesh):
    """Points of the mesh's cut by the plane y = 0 on the +X side, as (r, z)."""
    sec = mesh.section(plane_origin=(0.0, 0.0, 0.0), plane_normal=(0.0, 1.0, 0.0))
    pts = np.vstack([np.asarray(d) for d in sec.discrete])
    pts = pts[pts[:, 0] > 0]
    return pts[:, 0], pts[:, 2]


def _runs(z, mask):
    """Centres of the z-runs where ``mask`` holds, points sorted by z."""
    order = np.argsort(z)
    z, mask = z[order], mask[order]
    edges = np.flatnonzero(np.diff(mask.astype(int)))
    starts = [0] + list(edges + 1)
    out = []
    for a, b in zip(starts, starts[1:] + [len(z)]):
        if mask[a]:
            out.append(0.5 * (z[a] + z[b - 1]))
    return np.array(out)


def test_screw_thread_measured_on_the_triangles(screw_mesh):
    from gen.triangles.prism import slice_polygons

    p, mesh = screw_mesh
    assert mesh.is_watertight
    for c in p.slice_checks:
        assert c(lambda z: slice_polygons(mesh, z)) == []
    r, z = _axial_profile(mesh)
    # Tr 8×2: major 8, minor 5.5 (ISO 2904, from memory); facets within 0.02 mm
    assert 2 * r.max() == pytest.approx(8.0, abs=0.05)
    inner = (z > 1.0) & (z < 11.0)
    assert 2 * r[inner].min() == pytest.approx(5.5, abs=0.05)
    # crests along one line parallel to the axis: one per pitch, whatever the starts (each
    # start is one pitch further along) → spacing P = 2 mm
    crest = _runs(z, r > 3.9)
    crest = crest[(crest > 1.5) & (crest < 10.5)]
    assert len(crest) >= 4
    assert np.diff(crest) == pytest.approx(np.full(len(crest) - 1, 2.0), abs=0.02)


def test_nut_thread_measured_on_the_triangles(nut_mesh):
    from gen.triangles.prism import slice_polygons

    p, mesh = nut_mesh
    assert mesh.is_watertight
    for c in p.slice_checks:
        assert c(lambda z: slice_polygons(mesh, z)) == []
    r, z = _axial_profile(mesh)
    hole = r < 6.0
    # nut minor D1 + 2c = 6.2, root D4 + 2c = 8.7 (ISO 2904 D1 = d − P, D4 = d + 2 a_c; c = 0.1)
    assert 2 * r[hole].min() == pytest.approx(6.2, abs=0.05)
    assert 2 * r[hole & (z > 3.5) & (z < 9.5)].max() == pytest.approx(8.7, abs=0.05)
    # nut teeth crests (on D1 + 2c) one pitch apart
    crest = _runs(z[hole], r[hole] < 3.1 + 0.02)
    crest = crest[(crest > 0.5) & (crest < 9.5)]
    assert len(crest) >= 3
    assert np.diff(crest) == pytest.approx(np.full(len(crest) - 1, 2.0), abs=0.02)
    # flange: 26 mm across, 3 mm thick (defaults), with three 3.4 mm holes
    lo, hi = mesh.bounds
    assert hi[0] == pytest.approx(13.0, abs=0.02) and hi[2] == pytest.approx(10.0, abs=1e-6)
    flange = slice_polygons(mesh, 1.5)
    assert len(flange) == 1 + 1 + 3  # rim, threaded hole, three bolt holes
