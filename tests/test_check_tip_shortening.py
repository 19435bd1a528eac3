"""Issue 11 item 13: whether k is applied is said, and ``tip_shortening: auto`` applies it."""

import math

from gen.check.project import check

PAIR = """parts:
  p: {kind: spur_gear, module: 2, teeth: 12, profile_shift: 0.4, face_width: 8%s}
  w: {kind: spur_gear, module: 2, teeth: 30, profile_shift: 0.2, face_width: 8}
meshes:
  - parts: [p, w]
"""


def _iso_k(m, z1, z2, x1, x2, alpha=math.radians(20)):
    # ISO 21771 (computed): inv α_w = 2 tan α (x1 + x2)/(z1 + z2) + inv α, a' = a cos α / cos α_w,
    # y = (a' − a)/m, k = x1 + x2 − y; inv solved here by bisection
    inv = lambda t: math.tan(t) - t
    target = 2 * math.tan(alpha) * (x1 + x2) / (z1 + z2) + inv(alpha)
    lo, hi = 0.0, 1.5
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if inv(mid) < target else (lo, mid)
    a = m * (z1 + z2) / 2
    aw = a * math.cos(alpha) / math.cos(lo)
    return x1 + x2 - (aw - a) / m, aw


def test_auto_applies_the_mesh_k_to_the_tip(write_yaml):
    k, aw = _iso_k(2, 12, 30, 0.4, 0.2)
    assert abs(aw - 43.100) < 5e-4            # shared references (computed): a_w 43.100 mm
    res = check([write_yaml(PAIR % ", tip_shortening: auto")])
    assert res.ok
    p = res.models["p"]
    assert abs(p.sizes["tip_shortening"] - k) < 1e-6
    # d_a = d + 2 m (h_aP* + x − k) (ISO 21771)
    assert abs(p.sizes["tip_diameter"] - (24 + 2 * 2 * (1 + 0.4 - k))) < 1e-6
    assert p.sizes["tip_shortening_from"] == "p+w"
    # the generated profile carries it: its largest radius is the shortened tip
    import numpy as np
    assert abs(np.hypot(*p.outline.T).max() - (12 + 2 * (1 + 0.4 - k))) < 2e-4
    # and the mesh says what is applied to each member
    nums = res.pairs[0]["numbers"]
    assert abs(nums["tip_shortening_applied"]["p"] - k) < 1e-6
    assert nums["tip_shortening_applied"]["w"] == 0.0


def test_without_auto_the_mesh_says_k_is_not_applied(write_yaml):
    res = check([write_yaml(PAIR % "")])
    nums = res.pairs[0]["numbers"]
    assert nums["tip_shortening_applied"] == {"p": 0.0, "w": 0.0}
    note = [f for f in res.findings if f.code == "mesh-geometry" and "applied" in f.message]
    assert note and "tip_shortening: auto" in note[0].message


def test_auto_outside_any_mesh_applies_nothing_and_says_so(write_yaml):
    res = check([write_yaml("parts:\n  p: {kind: spur_gear, module: 2, teeth: 12, "
                            "face_width: 8, tip_shortening: auto}\n")])
    assert res.ok and res.models["p"].sizes["tip_shortening"] == 0.0
    assert any("no declared mesh" in f.message for f in res.findings)
