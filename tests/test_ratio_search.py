"""Tooth-count search for a ratio, its parameter-file text and the ``ratio`` subcommand.

Sources: speed ratio of a pair i = z2/z1 and of a train the product of its stages (common
practice); planetary stage with the ring held i = 1 + zr/zs, zr = zs + 2zp, (zs + zr)/N whole
(Willis and the coaxial and spacing conditions, from memory; 12/18/48 → 5 computed); the hunting-tooth
preference for pairs without a common factor (common practice); continued-fraction convergents
of π, 3, 22/7, 333/106, 355/113 (from memory). Every expected ratio is recomputed here with
exact fractions from the returned tooth counts, and a brute-force enumeration written
independently in this file checks the search over small spaces (computed).
"""

import argparse
import itertools
import json
import math
import subprocess
import sys
from fractions import Fraction
from pathlib import Path

import pytest
import yaml

from gen.cli import ratio as ratio_cmd
from gen.errors import GeometryError
from gen.findings import ERROR
from gen.geometry.ratio_search import SearchLimits, search_ratio
from gen.geometry.ratio_yaml import train_yaml, undercut_free_shift

ROOT = Path(__file__).resolve().parents[1]


def frac(stage):
    """Exact stage ratio from the tooth counts (pairs z2/z1; planetary 1 + zr/zs or inverse)."""
    if stage.kind == "planetary":
        zs, zp, zr = stage.teeth
        f = Fraction(zs + zr, zs)
        return f if stage.driven_by == "sun" else 1 / f
    return Fraction(stage.teeth[1], stage.teeth[0])


def total(sol):
    return math.prod((frac(s) for s in sol.stages), start=Fraction(1))


# --------------------------------------------------------------------------- brute force

def brute(target, zmin, zmax, stages):
    """Every unordered spur train of 1..stages reductions in zmin..zmax, ranked like the search
    (error, stages, pairs with a common factor, sum of teeth) — independent enumeration."""
    pairs = [(a, b) for a in range(zmin, zmax + 1) for b in range(zmin, zmax + 1) if b > a]
    rows = []
    for s in range(1, stages + 1):
        for combo in itertools.combinations_with_replacement(pairs, s):
            r = math.prod((Fraction(b, a) for a, b in combo), start=Fraction(1))
            err = abs(float(r) / target - 1.0)
            common = sum(math.gcd(a, b) > 1 for a, b in combo)
            rows.append((round(err / 1e-12), s, common, sum(a + b for a, b in combo), r))
    rows.sort(key=lambda t: t[:4])
    return rows


@pytest.mark.parametrize("target,zmin,zmax,stages", [
    (37.0, 10, 30, 2),            # 37 is prime: no exact train in 10..30 (computed)
    (math.pi, 10, 32, 2),
    (7.5, 10, 30, 2),
    (0.0 + 2 ** 0.5 * 3, 10, 20, 3),
])
def test_search_agrees_with_brute_force(target, zmin, zmax, stages):
    lim = SearchLimits(min_teeth=zmin, max_teeth=zmax)
    res = search_ratio(target, max_stages=stages, limits=lim, count=8)
    ref = brute(target, zmin, zmax, stages)
    got = [(round(abs(float(total(s)) / target - 1) / 1e-12), len(s.stages),
            sum(not st.hunting for st in s.stages), round(s.size)) for s in res.solutions]
    # the best train has the brute-force minimum key (size = sum of teeth at module 1)
    assert got[0] == ref[0][:4]
    # the distinct ratios listed are the brute force's best distinct ratios, in order
    want, seen = [], set()
    for row in ref:
        if row[4] not in seen:
            seen.add(row[4])
            want.append(row[4])
    listed = list(dict.fromkeys(total(s) for s in res.solutions))
    assert listed == want[:len(listed)]
    # every listed train is a valid one with its stated ratio
    for s in res.solutions:
        assert s.ratio == pytest.approx(float(total(s)), rel=1e-15)
        assert all(zmin <= z <= zmax for st in s.stages for z in st.teeth)


def test_exact_37_in_two_stages():
    lim = SearchLimits(min_teeth=10, max_teeth=100)
    # one stage cannot: 37·z1 > 100 for z1 ≥ 10 (computed)
    one = search_ratio(37, max_stages=1, limits=lim)
    assert not one.best.exact
    res = search_ratio(37, max_stages=2, limits=lim, count=6)
    assert res.best.exact and len(res.best.stages) == 2
    for sol in res.solutions:
        assert total(sol) == 37                     # exact product of the tooth fractions
        assert sol.direction == +1                  # two external meshes: same sense
    # three stages do not beat an exact two-stage train (fewer stages rank first)
    assert len(search_ratio(37, max_stages=3, limits=lim).best.stages) == 2


def test_best_pi_approximations_within_limits():
    lim = SearchLimits(min_teeth=10, max_teeth=100)
    res = search_ratio(math.pi, max_stages=1, limits=lim, count=3)
    # 22/7 is the best convergent reachable with at most 100 teeth (333/106 is not; from memory)
    assert total(res.best) == Fraction(22, 7)
    assert res.best.stages[0].teeth == (14, 44)     # smallest 22:7 pair with ≥ 10 teeth
    assert res.best.error == pytest.approx(22 / 7 / math.pi - 1, rel=1e-12)
    # errors grow down the list
    errs = [abs(s.error) for s in res.solutions]
    assert errs == sorted(errs)
    # three stages get within 1e-8 (the brute force above checks the method on small spaces)
    three = search_ratio(math.pi, max_stages=3, limits=lim, count=1)
    assert abs(float(total(three.best)) / math.pi - 1) < 1e-8
    # a tolerance tighter than any one-stage pair gives nothing
    assert search_ratio(math.pi, max_stages=1, limits=lim, tolerance=1e-4).best is None


def test_pairs_without_common_factor_are_preferred():
    res = search_ratio(37, max_stages=2, limits=SearchLimits(min_teeth=12, max_teeth=100),
                       count=10)
    exact = [s for s in res.solutions if s.exact]
    assert len(exact) >= 4
    keys = [(len(s.stages), sum(not st.hunting for st in s.stages), s.size) for s in exact]
    assert keys == sorted(keys)                      # exact ones: ranked by common, then size
    errs = [abs(s.error) for s in res.solutions]
    assert errs == sorted(errs)                      # error first
    for s in res.solutions:
        for st in s.stages:                          # the flag is the gcd test (common practice)
            assert st.hunting == (math.gcd(*st.teeth) == 1)
    first, later = exact[0], exact[1:]
    # a smaller exact train exists but shares more factors; the hunting-tooth one ranks first
    assert any(s.size < first.size and
               sum(not st.hunting for st in s.stages) > sum(not st.hunting for st in first.stages)
               for s in later)


def test_planetary_stage_rules():
    lim = SearchLimits(min_teeth=12, max_teeth=100, planets=3)
    res = search_ratio(5, max_stages=1, kinds=("planetary",), limits=lim, count=5)
    # Willis, ring held (from memory): sun 12, planets 18, ring 48, N 3 → i = 1 + 48/12 = 5 (computed)
    assert res.best.stages[0].teeth == (12, 18, 48) and res.best.exact
    for sol in res.solutions:
        zs, zp, zr = sol.stages[0].teeth
        assert zr == zs + 2 * zp and (zs + zr) % 3 == 0
        assert (zp + 2) < (zs + zp) * math.sin(math.pi / 3)    # neighbouring planets clear
    # step-up: carrier in, sun out
    up = search_ratio(0.2, max_stages=1, kinds=("planetary",), limits=lim)
    assert up.best.stages[0].driven_by == "carrier" and total(up.best) == Fraction(1, 5)


def test_limits_are_respected():
    lim = SearchLimits(min_teeth=10, max_teeth=100, module=2.0, max_diameter=120.0,
                       max_center=90.0)
    res = search_ratio(12.5, max_stages=2, limits=lim, count=10)
    for sol in res.solutions:
        for st in sol.stages:
            assert max(st.teeth) * 2.0 <= 120.0                    # d = z·m
            assert 2.0 * sum(st.teeth) / 2 <= 90.0                 # a = m(z1 + z2)/2
    belts = search_ratio(3, max_stages=1, kinds=("belt",),
                         limits=SearchLimits(min_teeth=5, max_teeth=60), count=20)
    # curv2 pulleys: at least 12 teeth (profile table, common practice)
    assert min(min(s.stages[0].teeth) for s in belts.solutions) >= 12
    assert all(s.direction == +1 for s in belts.solutions)        # open belt: same sense
    with pytest.raises(GeometryError, match="stages must be 1, 2 or 3"):
        search_ratio(3, max_stages=4)
    with pytest.raises(GeometryError, match="unknown stage kind"):
        search_ratio(3, kinds=("worm",))
    with pytest.raises(GeometryError, match="positive"):
        search_ratio(-2)


def test_step_up_target():
    res = search_ratio(0.3, max_stages=2, limits=SearchLimits(min_teeth=12, max_teeth=60))
    assert total(res.best) == Fraction(3, 10)
    assert all(frac(st) < 1 for s in res.solutions for st in s.stages)


# --------------------------------------------------------------------------- parameter file

def test_written_file_parses_checks_and_keeps_the_ratio(tmp_path):
    from gen.check import check

    lim = SearchLimits(min_teeth=10, max_teeth=100)
    sol = search_ratio(37, max_stages=2, limits=lim).best
    text = train_yaml(sol, name="hoist", module=1.5, input_torque=0.05, input_speed=300)
    data = yaml.safe_load(text)
    parts = data["trains"]["hoist"]["parts"]
    assert data["trains"]["hoist"]["module"] == 1.5 and len(parts) == 4
    # the ratio read back from the file's tooth counts (independent of the search objects)
    r = Fraction(1)
    for mesh in data["meshes"]:
        a, b = mesh["parts"]
        r *= Fraction(parts[b]["teeth"], parts[a]["teeth"])
    assert r == 37
    # undercut: x ≥ 1 − z sin²α/2 (rack generation, from memory) for every gear under 17 teeth
    for p in parts.values():
        x_min = 1 - p["teeth"] * math.sin(math.radians(20)) ** 2 / 2
        assert p.get("profile_shift", 0.0) >= x_min - 1e-12
    # second mesh torque: 0.05 N·m × first ratio × 0.98 (computed)
    m1 = data["meshes"][0]["parts"]
    i1 = parts[m1[1]]["teeth"] / parts[m1[0]]["teeth"]
    assert data["meshes"][1]["torque"] == pytest.approx(0.05 * i1 * 0.98, abs=1e-6)
    path = tmp_path / "hoist.yaml"
    path.write_text(text)
    result = check([str(path)])
    assert not [f for f in result.findings if f.severity == ERROR]
    assert len(result.pairs) == 2


def test_written_file_with_a_belt_stage(tmp_path):
    from gen.check import check

    # with 5 mm belts a coprime spur pair is smaller than the same belt pair, so a mixed train
    # comes first for 3.7 = 18/12 · 37/15 (computed)
    res = search_ratio(3.7, max_stages=2, kinds=("belt", "spur"),
                       limits=SearchLimits(min_teeth=12, max_teeth=72, belt_profile="curv5"))
    sol = res.best
    assert {st.kind for st in sol.stages} == {"belt", "spur"} and total(sol) == Fraction(37, 10)
    assert sol.stages[0].kind == "belt"              # belts listed first (motor side)
    text = train_yaml(sol, name="lift", belt_profile="curv5")
    data = yaml.safe_load(text)
    (belt,) = data["drives"].values()
    a, b = belt["pulleys"]
    assert data["parts"][a]["kind"] == "timing_pulley"
    path = tmp_path / "lift.yaml"
    path.write_text(text)
    result = check([str(path)])
    assert not [f for f in result.findings if f.severity == ERROR]
    assert undercut_free_shift(17, 20.0) == pytest.approx(0.05)   # 1 − 17·0.11698/2 = 0.0056
    assert undercut_free_shift(18, 20.0) == 0.0


def test_planetary_train_is_not_written():
    sol = search_ratio(5, max_stages=1, kinds=("planetary",)).best
    with pytest.raises(GeometryError, match="planetary"):
        train_yaml(sol)


# --------------------------------------------------------------------------- command

def call(argv, capsys):
    parser = argparse.ArgumentParser(prog="pitchline")
    ratio_cmd.register(parser.add_subparsers(dest="command"))
    try:
        args = parser.parse_args(["ratio"] + argv)
        rc = args.func(args)
    except SystemExit as exc:
        rc = exc.code
    out = capsys.readouterr()
    return rc, out.out, out.err


@pytest.mark.parametrize("text,value", [("37", 37.0), ("37/1", 37.0), ("37:1", 37.0),
                                        ("355/113", 355 / 113), ("pi", math.pi),
                                        ("2pi", 2 * math.pi), ("pi/2", math.pi / 2),
                                        ("1/pi", 1 / math.pi), ("2.5", 2.5)])
def test_target_forms(text, value):
    assert ratio_cmd.parse_target(text) == pytest.approx(value, rel=1e-15)


def test_command_text_json_and_write(capsys, tmp_path):
    rc, out, err = call(["37", "--min-teeth", "10", "--count", "2"], capsys)
    assert rc == 0 and err == "" and "exact" in out and out.count("stage 1") == 2
    rc, out, _ = call(["pi", "--stages", "3", "--json", "--count", "3"], capsys)
    data = json.loads(out)
    assert rc == 0 and len(data["solutions"]) == 3
    best = data["solutions"][0]
    r = math.prod(Fraction(s["teeth"][1], s["teeth"][0]) for s in best["stages"])
    assert float(r) == pytest.approx(best["ratio"], rel=1e-15)
    target = tmp_path / "t.yaml"
    rc, out, _ = call(["6", "--stages", "1", "--write", str(target)], capsys)
    assert rc == 0 and "wrote" in out and "spur_gear" in target.read_text()
    rc, _, err = call(["6", "--write", str(target)], capsys)         # never overwrites
    assert rc == 2 and "exists" in err


@pytest.mark.parametrize("argv,needle", [
    (["abc"], "cannot read"), (["37", "--stages", "4"], "stages must be"),
    (["37", "--stages", "x"], "invalid int"), (["37", "--kind", "worm"], "--kind"),
    (["1/0"], "denominator"), (["0"], "positive"), (["37", "--tolerance", "2"], "tolerance"),
    (["37", "--max-teeth", "5"], "tooth counts"),
])
def test_usage_errors_are_one_line_exit_2(argv, needle, capsys):
    rc, out, err = call(argv, capsys)
    assert rc == 2 and needle in err and len(err.strip().splitlines()) == 1
    assert "Traceback" not in err


def test_no_train_within_tolerance_exits_1(capsys):
    rc, out, err = call(["pi", "--stages", "1", "--tolerance", "1e-6"], capsys)
    assert rc == 1 and "no train found" in err


def test_planetary_write_is_refused(capsys, tmp_path):
    rc, _, err = call(["5", "--kind", "planetary", "--stages", "1", "--write",
                       str(tmp_path / "p.yaml")], capsys)
    assert rc == 2 and "planetary" in err and not (tmp_path / "p.yaml").exists()


def test_command_does_not_load_the_cad_kernel():
    code = ("import argparse, sys; from gen.cli import ratio as r; "
            "p = argparse.ArgumentParser(); r.register(p.add_subparsers()); "
            "a = p.parse_args(['ratio', '37', '--json']); a.func(a); "
            "bad = [m for m in ('cadquery', 'OCP', 'trimesh', 'manifold3d') if m in sys.modules]; "
            "sys.exit(3 if bad else 0)")
    proc = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True,
                          env={"PYTHONPATH": str(ROOT), "PATH": "/usr/bin:/bin"})
    assert proc.returncode == 0, proc.stderr.decode()
