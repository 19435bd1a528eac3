"""Whole-build report (issue 18): rasteriser, PNG, moving meshes, belt drawing, the page of the
demo (check mode) and of a small build (parts shaded from the STL files written)."""

import math
import os
import re
import struct
import xml.etree.ElementTree as ET
import zlib
from html.parser import HTMLParser

import numpy as np
import pytest

from conftest import PARAMS
from gen.export.report_raster import View, png_bytes, shade

SVG = "{http://www.w3.org/2000/svg}"


# --- rasteriser and PNG ------------------------------------------------------------------

def _box(lo, hi):
    """Closed box (8 vertices, 12 triangles, counter-clockwise seen from outside)."""
    x0, y0, z0 = lo
    x1, y1, z1 = hi
    v = np.array([[x0, y0, z0], [x1, y0, z0], [x1, y1, z0], [x0, y1, z0],
                  [x0, y0, z1], [x1, y0, z1], [x1, y1, z1], [x0, y1, z1]], float)
    f = np.array([[0, 2, 1], [0, 3, 2], [4, 5, 6], [4, 6, 7], [0, 1, 5], [0, 5, 4],
                  [1, 2, 6], [1, 6, 5], [2, 3, 7], [2, 7, 6], [3, 0, 4], [3, 4, 7]])
    return v, f


def test_cube_seen_face_on_covers_the_fitted_square():
    # seen along −X (azimuth 0, elevation 0) a cube projects to a square; the picture fits the
    # vertices' box with 6 % padding each side, so the square's side is 0.88·min(w, h) px
    # (computed from the fitting rule; edges are inked, so count non-background pixels)
    w, h = 200, 120
    v, f = _box((0, 0, 0), (10, 10, 10))
    img = shade(v, f, (0.2, 0.4, 0.8), view=View(0.0, 0.0), size=(w, h))
    covered = np.any(img != 255, axis=2).mean()
    expected = (0.88 * min(w, h)) ** 2 / (w * h)
    assert covered == pytest.approx(expected, abs=0.02)


@pytest.mark.parametrize("flip", [False, True])
def test_nearer_box_hides_the_farther_whatever_the_triangle_order(flip):
    # two boxes on the line of sight (eye on +X): the one at larger x is nearer and must
    # cover the centre of the picture, whichever box's triangles come first (z-buffer)
    va, fa = _box((10, -3, -3), (12, 3, 3))     # near, red
    vb, fb = _box((0, -6, -6), (2, 6, 6))       # far, blue, larger
    parts = [(va, fa, (1, 0, 0)), (vb, fb, (0, 0, 1))]
    if flip:
        parts = parts[::-1]
    verts, faces, cols, n = [], [], [], 0
    for v, f, c in parts:
        verts.append(v)
        faces.append(f + n)
        cols.append(np.tile(c, (len(f), 1)))
        n += len(v)
    img = shade(np.vstack(verts), np.vstack(faces), np.vstack(cols).astype(float),
                view=View(0.0, 0.0), size=(120, 120))
    r, g, b = (int(c) for c in img[60, 60])
    assert r > 100 and b < 30        # red in front
    r, g, b = (int(c) for c in img[60, 15])
    assert b > 100 and r < 30        # the far box shows round it


def _decode_png(data):
    """Independent decoder (PNG spec: chunks with CRC-32, zlib stream, per-row filters 0/1)."""
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    pos, idat, ihdr = 8, b"", None
    while pos < len(data):
        n = struct.unpack(">I", data[pos:pos + 4])[0]
        tag, body = data[pos + 4:pos + 8], data[pos + 8:pos + 8 + n]
        crc = struct.unpack(">I", data[pos + 8 + n:pos + 12 + n])[0]
        assert zlib.crc32(tag + body) & 0xFFFFFFFF == crc
        if tag == b"IHDR":
            ihdr = struct.unpack(">IIBBBBB", body)
        elif tag == b"IDAT":
            idat += body
        pos += 12 + n
    w, h, depth, ctype = ihdr[:4]
    assert depth == 8 and ctype == 2
    raw = np.frombuffer(zlib.decompress(idat), np.uint8).reshape(h, 1 + 3 * w)
    out = np.zeros((h, 3 * w), np.uint8)
    for y in range(h):
        ft, row = raw[y, 0], raw[y, 1:].astype(np.int32)
        if ft == 1:
            for x in range(3, 3 * w):
                row[x] = (row[x] + row[x - 3]) % 256
        else:
            assert ft == 0
        out[y] = row
    return out.reshape(h, w, 3)


def test_png_round_trips_through_an_independent_decoder():
    rng = np.random.default_rng(3)
    img = rng.integers(0, 256, (7, 5, 3), dtype=np.uint8)
    assert np.array_equal(_decode_png(png_bytes(img)), img)
    assert png_bytes(img) == png_bytes(img)   # deterministic


# --- moving meshes -----------------------------------------------------------------------

def _gear(z, x=0.0):
    from gen.geometry.basic_rack import basic_rack
    from gen.geometry.cylindrical import cutter_for, gear_sizes
    from gen.geometry.gear_outline import gear_loop
    from gen.geometry.generate import generate_flank

    rack = basic_rack("A")
    s = gear_sizes(z, 2.0, rack, x, thinning=0.1)
    return s, gear_loop(generate_flank(z, s.rp, cutter_for(s, rack), s.ra)).polygon(0.02)


def _anims(root):
    return [e for e in root.iter(SVG + "animateTransform")]


def test_pair_animation_turns_each_gear_through_one_pitch():
    from gen.export.report_motion import pair_scene, scene_svg, with_overlap
    from gen.geometry.pair import mesh_pair

    (s1, p1), (s2, p2) = _gear(12, 0.4), _gear(30, 0.2)
    pr = mesh_pair(s1, s2)
    svg = scene_svg(with_overlap(pair_scene(p1, p2, pr, title="12/30"), frames=6))
    root = ET.fromstring(svg)
    rot = [e for e in _anims(root) if e.get("type") == "rotate"]
    assert len(rot) == 4          # two members × two panels
    # computed: gear 1 from −180/z1 to +180/z1 degrees; gear 2 placed at 180 + 180/z2 and
    # turning −θ·z1/z2 (common practice: the sweep's phase, a tooth space facing gear 1)
    z1, z2 = 12, 30
    g1 = (float(rot[0].get("from")), float(rot[0].get("to")))
    g2 = (float(rot[1].get("from")), float(rot[1].get("to")))
    assert g1 == pytest.approx((-180 / z1, 180 / z1), abs=1e-3)
    assert g2 == pytest.approx((180 + 180 / z2 + 180 / z2, 180 + 180 / z2 - 180 / z2), abs=1e-3)
    # seamless loop: each gear turns exactly one of its own pitches
    assert abs(g1[1] - g1[0]) == pytest.approx(360 / z1, abs=1e-3)
    assert abs(g2[1] - g2[0]) == pytest.approx(360 / z2, abs=1e-3)
    assert not [e for e in root.iter(SVG + "path") if e.get("class") == "overlap"]
    assert any("no overlap" in (t.text or "") for t in root.iter(SVG + "text"))


def test_overlap_is_painted_with_its_area():
    from gen.export.report_motion import WARN, pair_scene, scene_svg, with_overlap
    from gen.geometry.pair import mesh_pair
    from gen.validate.sweep import sweep_pair

    (s1, p1), (s2, p2) = _gear(12, 0.4), _gear(30, 0.2)
    good = mesh_pair(s1, s2)
    pr = mesh_pair(s1, s2, good.center_distance - 0.6)   # pushed 0.6 mm too close
    scene = with_overlap(pair_scene(p1, p2, pr, title="too close"), frames=12)
    sw = sweep_pair(p1, p2, pr)
    assert sw.overlap_area > 0
    # the frames are a subset of the sweep's 90 steps' range: their largest overlap cannot
    # exceed the sweep's largest (small slack for the outline offset the sweep may use)
    assert 0 < scene.max_overlap <= sw.overlap_area * 1.05 + 1e-6
    root = ET.fromstring(scene_svg(scene))
    painted = [e for e in root.iter(SVG + "path") if e.get("class") == "overlap"]
    assert painted and all(e.get("fill") == WARN for e in painted)
    label = [t for t in root.iter(SVG + "text") if t.get("class") == "overlap-label"]
    assert label and f"{scene.max_overlap:.4f}" in label[0].text


def test_internal_scene_turns_both_the_same_way():
    from gen.export.report_motion import internal_scene

    class P:   # the numbers internal_scene reads (mm)
        z1, z2, center_distance, mn = 18, 48, 25.0, 1.5
        pitch_radii, base_radii, contact_path = (14.0, 37.0), (13.0, 35.0), (2.0, 2.0)

    sq = np.array([[1.0, 0], [0, 1], [-1, 0], [0, -1]])
    sc = internal_scene(sq, sq * 30, P, 45.0)
    pin, ring = sc.members
    # common practice: an internal pair turns both members the same way, ring slower by z1/z2
    d_pin, d_ring = pin.rot[1] - pin.rot[0], ring.rot[1] - ring.rot[0]
    assert d_pin > 0 and d_ring > 0
    assert d_ring / d_pin == pytest.approx(18 / 48)


# --- belt --------------------------------------------------------------------------------

def test_belt_path_length_matches_the_open_belt_formula():
    from gen.export.report_belt import belt_path

    r1, r2, C = 6.366, 12.732, 41.5
    path = belt_path(r1, r2, C, n=4000)
    per = np.sum(np.hypot(*np.diff(np.vstack([path, path[:1]]), axis=0).T))
    # open belt (Shigley, belt drives): L = 2·C·cos φ + π(r1 + r2) + 2φ(r2 − r1), φ = asin((r2−r1)/C)
    phi = math.asin((r2 - r1) / C)
    L = 2 * C * math.cos(phi) + math.pi * (r1 + r2) + 2 * phi * (r2 - r1)
    assert per == pytest.approx(L, rel=2e-4)   # chords of the arcs shorten it slightly


def test_belt_svg_marks_every_belt_tooth_and_the_range():
    from gen.export.report_belt import belt_svg
    from gen.geometry.belt import solve_drive

    sol = solve_drive("curv2", 20, 40, center=42.0, adjust_pct=1.5)
    root = ET.fromstring(belt_svg(sol, title="t"))
    paths = {e.get("class"): e for e in root.iter(SVG + "path")}
    n_all = paths["belt-teeth"].get("d").count("M ")
    n_mesh = paths["teeth-in-mesh"].get("d").count("M ")
    assert n_all + n_mesh == sol.belt_teeth
    # marks on the small pulley's wrap: the teeth in mesh, give or take the one at each end
    assert abs(n_mesh - sol.teeth_in_mesh) <= 1.0
    assert len([e for e in root.iter(SVG + "circle") if "tensioner" in (e.get("class") or "")]) == 2


# --- the page ----------------------------------------------------------------------------

class _Page(HTMLParser):
    def __init__(self):
        super().__init__()
        self.tags, self.ids, self.hrefs, self.srcs, self.classes = [], [], [], [], []

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        self.tags.append(tag)
        if "id" in a:
            self.ids.append(a["id"])
        if "href" in a:
            self.hrefs.append(a["href"])
        if "src" in a:
            self.srcs.append(a["src"])
        self.classes.append((tag, a.get("class") or ""))

    handle_startendtag = handle_starttag


@pytest.fixture(scope="module")
def demo_check():
    from gen.api import check_files

    return check_files(PARAMS)


@pytest.fixture(scope="module")
def check_page(demo_check):
    from gen.export.report_build import render

    return render(demo_check)


def _count(parser, tag, cls):
    return sum(1 for t, c in parser.classes if t == tag and cls in c.split())


def test_check_page_has_every_item_and_is_self_contained(demo_check, check_page):
    r = demo_check
    p = _Page()
    p.feed(check_page)
    assert {"script", "link", "iframe", "object", "embed"}.isdisjoint(p.tags)
    assert "@import" not in check_page and "url(http" not in check_page
    assert "@font-face" not in check_page
    assert all(s.startswith("data:image/png;base64,") for s in p.srcs)
    assert len(p.ids) == len(set(p.ids)), "element ids must be unique"
    for h in p.hrefs:                      # only in-page links
        assert h.startswith("#") and h[1:] in p.ids, h
    assert _count(p, "article", "card") == len(r.models)
    assert _count(p, "svg", "outline-view") == len(r.models)   # check: no files, outlines
    assert _count(p, "svg", "belt") == len(r.drives)
    # every declared mesh moves; the assemblies add their own pairs (bevel, sun, ring)
    assert _count(p, "svg", "motion") >= len(r.pairs) + 3
    assert _count(p, "table", "stages") == sum("stages" in d.numbers for d in r.drivetrains)
    for title, _ in __import__("gen.export.report_page", fromlist=["CAUTIONS"]).CAUTIONS:
        assert title in check_page
    for sid in ("summary", "parts", "meshes", "drives", "assemblies", "trains"):
        assert sid in p.ids
    assert "@media (max-width" in check_page and "@media print" in check_page


def test_summary_lists_every_finding_once_with_a_link(demo_check, check_page):
    n = len(demo_check.findings)
    links = re.findall(r'<li class="(error|warning|info)"><a href="#([^"]+)">', check_page)
    # each finding of the result is listed in the summary (parts, meshes, drives,
    # assemblies, trains or the project group)
    assert len(links) >= n
    counts = re.findall(r'<span class="count (\w+)">(\d+)', check_page)
    assert sum(int(c) for _, c in counts) == len(links)


def test_motion_svgs_parse_and_animate_without_scripts(check_page):
    for m in re.finditer(r'<svg[^>]*class="motion"[^>]*>.*?</svg>', check_page, re.S):
        root = ET.fromstring(m.group(0))
        assert _anims(root), "a moving mesh needs its animations"
        assert not list(root.iter(SVG + "script"))


@pytest.fixture(scope="module")
def small_build(tmp_path_factory):
    """The tray pair built to STL only (cheap), and its page."""
    from gen.api import check_files
    from gen.build import build
    from gen.export.registry import parse_formats

    out = str(tmp_path_factory.mktemp("report_build"))
    r = check_files(os.path.join(PARAMS, "tray_indexer.yaml"))
    rep = build(r, out, parse_formats("stl"))
    return r, rep, out


def test_built_page_shades_each_part_from_its_stl_file(small_build, tmp_path):
    import shutil

    from gen.export.report_build import render

    r, rep, out = small_build
    page = render(r, out_dir=out, outcomes=rep.outcomes)
    pics = re.findall(r'<img class="shaded"[^>]*src="data:image/png;base64,([^"]+)"', page)
    assert len(pics) == len(r.models)
    import base64
    for b in pics:
        img = _decode_png(base64.b64decode(b))
        assert np.any(img != 255), "picture is blank"
    # drawn from the file on disk: replace one STL by a box and the picture changes
    copy = tmp_path / "out"
    shutil.copytree(out, copy)
    import trimesh
    v, f = _box((0, 0, 0), (20, 20, 5))
    trimesh.Trimesh(v, f).export(str(copy / "tray_pinion.stl"))
    page2 = render(r, out_dir=str(copy), outcomes=rep.outcomes)
    pics2 = re.findall(r'<img class="shaded"[^>]*src="data:image/png;base64,([^"]+)"', page2)
    changed = [a != b for a, b in zip(pics, pics2)]
    assert changed.count(True) == 1


def test_cli_build_writes_the_page(small_build):
    r, rep, out = small_build
    from gen.cli.check import write_report

    path = os.path.join(out, "page.html")
    write_report(path, r, out_dir=out, outcomes=rep.outcomes)
    text = open(path, encoding="utf-8").read()
    assert text.startswith("<!DOCTYPE html>") and "tray_pinion" in text
    assert os.path.getsize(path) < 2_000_000
