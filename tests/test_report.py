"""Mesh report: SVG picture and HTML page."""

import math
import re
import xml.etree.ElementTree as ET
from functools import lru_cache
from html.parser import HTMLParser

import numpy as np
import pytest

from gen.errors import ExportError
from gen.export.report_html import CAUTION, ReportEntry, pair_rows, render_report, write_report
from gen.export.report_svg import mesh_svg
from gen.geometry.basic_rack import basic_rack
from gen.geometry.cylindrical import cutter_for, gear_sizes
from gen.geometry.gear_outline import gear_loop
from gen.geometry.generate import generate_flank
from gen.geometry.pair import mesh_pair, mesh_rack
from gen.geometry.rack_outline import rack_loop, rack_sizes
from gen.validate.pair_checks import pair_findings
from gen.validate.sweep import sweep_pair, sweep_rack

RACK_A = basic_rack("A")
SVG = "{http://www.w3.org/2000/svg}"


@lru_cache(maxsize=None)
def gear(z, x=0.0, thinning=0.1):
    s = gear_sizes(z, 2.0, RACK_A, x, thinning=thinning)
    return s, gear_loop(generate_flank(z, s.rp, cutter_for(s, RACK_A), s.ra)).polygon(0.01)


@lru_cache(maxsize=None)
def pair_case():
    (s1, p1), (s2, p2) = gear(12, 0.4), gear(30, 0.2)
    pr = mesh_pair(s1, s2)
    return p1, p2, pr, sweep_pair(p1, p2, pr)


@lru_cache(maxsize=None)
def rack_case():
    ps, pp = gear(18)
    rs = rack_sizes(2.0, RACK_A, height=6.0, teeth=14, thinning=0.1)
    rp = rack_loop(rs, RACK_A).polygon(0.01)
    pr = mesh_rack(ps, rs)
    return pp, rp, rs, pr, sweep_rack(pp, rp, pr, rs)


def _by_class(root, cls):
    return [e for e in root.iter() if cls in (e.get("class") or "").split()]


def _path_points(d):
    nums = [float(v) for v in re.findall(r"-?\d+(?:\.\d+)?", d)]
    return np.array(nums).reshape(-1, 2)


def test_pair_svg_parses_and_has_outlines_circles_and_marks():
    p1, p2, pr, sw = pair_case()
    text = mesh_svg(p1, p2, pr, sw, title="pair 12/30 <demo> & co")
    root = ET.fromstring(text)
    assert root.tag == SVG + "svg"
    outlines = [e for e in root.iter(SVG + "path") if "outline" in (e.get("class") or "")]
    assert len(outlines) == 2
    # each outline is the posed polygon, vertex for vertex
    w1, w2 = sw.pose.at(p1, p2, sw.angle_at_min)
    for el, w in zip(outlines, (w1, w2)):
        pts = _path_points(el.get("d"))
        assert pts.shape == w.shape
        assert np.allclose(pts, w, atol=1e-4)
    pitch = [e for e in _by_class(root, "pitch-circle") if e.tag == SVG + "circle"]
    base = [e for e in _by_class(root, "base-circle") if e.tag == SVG + "circle"]
    assert len(pitch) == 4 and len(base) == 4   # two members × two panels
    radii = sorted({round(float(e.get("r")), 3) for e in pitch})
    assert radii == pytest.approx(sorted(round(r, 3) for r in pr.pitch_radii), abs=1e-3)
    assert len(_by_class(root, "line-of-action")) == 2
    assert len(_by_class(root, "contact-path")) == 2
    assert len(_by_class(root, "tightest")) == 1
    assert root.find(SVG + "title").text == "pair 12/30 <demo> & co"   # escaped, round-trips


def test_rack_svg_parses_with_pitch_line():
    pp, rp, rs, pr, sw = rack_case()
    root = ET.fromstring(mesh_svg(pp, rp, pr, sw, rack=rs, title="rack"))
    assert len([e for e in root.iter(SVG + "path") if "outline" in (e.get("class") or "")]) == 2
    assert len(_by_class(root, "pitch-line")) == 2
    assert len(_by_class(root, "base-circle")) == 2
    # without a sweep the picture is drawn at the start phase with no tightest mark
    root = ET.fromstring(mesh_svg(pp, rp, pr, rack=rs))
    assert not _by_class(root, "tightest")


def test_svg_is_deterministic():
    p1, p2, pr, sw = pair_case()
    assert mesh_svg(p1, p2, pr, sw, title="a") == mesh_svg(p1, p2, pr, sw, title="a")


class _Tags(HTMLParser):
    def __init__(self):
        super().__init__()
        self.tags, self.attrs = [], []

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)
        self.attrs += attrs


def _entries():
    p1, p2, pr, sw = pair_case()
    pp, rp, rs, prr, swr = rack_case()
    return [
        ReportEntry("pair 12/30", mesh_svg(p1, p2, pr, sw, title="pair 12/30"),
                    pair_rows(pr, sw), tuple(pair_findings(pr, sw, subject="pair"))),
        ReportEntry("pinion & rack", mesh_svg(pp, rp, prr, swr, rack=rs, title="rack"),
                    pair_rows(prr, swr), tuple(pair_findings(prr, swr, subject="rack"))),
    ]


def test_html_is_self_contained_and_lists_each_mesh():
    page = render_report(_entries(), title="Mesh check")
    parser = _Tags()
    parser.feed(page)
    assert {"script", "link", "img", "iframe"}.isdisjoint(parser.tags)
    for name, value in parser.attrs:
        assert name not in ("src",)
        if name == "href":
            assert value.startswith("#")          # only in-page references (SVG <use>)
    assert "url(http" not in page and "@import" not in page
    assert parser.tags.count("svg") == 2 and parser.tags.count("table") == 2
    assert parser.tags.count("h2") == 2
    assert "pinion &amp; rack" in page
    assert CAUTION.split(";")[0] in page
    assert "contact ratio ε_α" in page and "center distance" in page
    assert page == render_report(_entries(), title="Mesh check")   # deterministic


def test_write_report(tmp_path):
    out = tmp_path / "mesh.html"
    write_report(str(out), _entries()[:1], title="one")
    assert out.read_text(encoding="utf-8").startswith("<!DOCTYPE html>")
    assert [p.name for p in tmp_path.iterdir()] == ["mesh.html"]
    with pytest.raises(ExportError):
        # a file stands where the folder should be: the write fails cleanly
        write_report(str(tmp_path / "mesh.html" / "x.html"), _entries()[:1])


def test_rows_carry_the_numbers():
    p1, p2, pr, sw = pair_case()
    rows = dict(pair_rows(pr, sw))
    assert rows["center distance"] == f"{pr.center_distance:.3f} mm"
    assert rows["operating pressure angle"] == f"{pr.working_pressure_angle:.3f}°"
    assert rows["sweep result"] == sw.status
    assert math.isclose(float(rows["contact ratio ε_α"]), pr.contact_ratio, abs_tol=5e-4)


def test_demo_report_ids_are_unique(tmp_path):
    # several SVGs inlined in one page: every id must be unique, or a browser draws the
    # first figure's outlines in the later ones (seen in headless Chromium before the fix)
    import re

    from conftest import PARAMS
    from gen.cli import main

    page = tmp_path / "r.html"
    assert main(["check", PARAMS, "--report", str(page)]) == 0
    html = page.read_text(encoding="utf-8")
    ids = re.findall(r'\bid="([^"]+)"', html)
    assert len(ids) >= 6 and len(ids) == len(set(ids))
    for ref in re.findall(r'href="#([^"]+)"', html):
        assert ref in ids


def test_the_builds_picture_of_a_part_is_the_view_of_its_file(tmp_path):
    # the build's workers draw each part's shaded view from the STL they just wrote and
    # re-read; the page embeds it: it must be the very picture drawn from that file
    from gen import api
    from gen.build.export import export_part
    from gen.export.report_parts import shaded_png

    part = api.make("spur_gear", name="pic", module=1, teeth=14, face_width=4, bore=3)
    oc = export_part(part, str(tmp_path), ("stl",), {"pictures": True})
    assert oc.ok and oc.extra.get("picture")
    assert oc.extra["picture"] == shaded_png(str(tmp_path / "pic.stl"), part.role.value)
    plain = export_part(part, str(tmp_path), ("stl",))
    assert "picture" not in plain.extra        # only when asked (catalogues beyond 40 parts)
