"""Self-contained HTML page of mesh checks: per mesh a heading, the SVG picture, a table of
the numbers and the findings. Inline CSS and inline SVG only (no scripts, fonts, images or
links to fetch); no dates or other run-dependent text, so the same input gives the same page.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from html import escape

from gen.geometry.pair import RACK, PairResult
from gen.findings import Finding
from gen.validate.sweep import SweepResult

CAUTION = ("These numbers are estimates from the nominal profiles; printed teeth shrink, swell "
           "and sag. Verify every mesh with a test print before relying on it, and keep fingers "
           "and loose items away from turning gears: moving parts pinch.")

_CSS = """
body{margin:0;padding:24px 32px;background:#f6f4ee;color:#26292e;
font:14px/1.45 Helvetica,Arial,sans-serif}
h1{font-size:22px;margin:0 0 4px}
h2{font-size:17px;margin:28px 0 8px;padding-bottom:4px;border-bottom:2px solid #cfc8b6}
.caution{background:#fff3d6;border-left:5px solid #c2362c;padding:8px 12px;margin:10px 0 18px}
.mesh{display:flex;flex-wrap:wrap;gap:18px;align-items:flex-start}
.mesh svg{max-width:100%;height:auto;background:#fff;border:1px solid #cfc8b6}
table{border-collapse:collapse;min-width:300px}
td{padding:2px 10px;border-bottom:1px solid #e4dfd2}
td.v{text-align:right;font-variant-numeric:tabular-nums}
ul.findings{list-style:none;padding:0;margin:10px 0}
ul.findings li{padding:3px 8px;margin:2px 0;border-left:4px solid #999}
li.error{border-color:#c2362c;background:#fbe4e1}
li.warning{border-color:#d49a1c;background:#fdf2d9}
li.info{border-color:#6d5fa6;background:#efedf7}
.sev{font-weight:bold;text-transform:uppercase;font-size:11px;margin-right:6px}
"""


@dataclass(frozen=True)
class ReportEntry:
    """One mesh in the report: its name, SVG text, (label, value) rows and findings."""

    name: str
    svg: str
    rows: tuple = ()
    findings: tuple = field(default_factory=tuple)


def _mm(v, digits=3):
    return "–" if v is None else f"{v:.{digits}f} mm"


def pair_rows(pair: PairResult, sweep: SweepResult | None = None) -> tuple:
    """Table rows (label, value text) for a mesh."""
    rack = pair.kind == RACK
    rows = []
    if rack:
        rows += [("teeth (pinion)", str(pair.z1)),
                 ("datum line from pinion axis", _mm(pair.center_distance)),
                 ("zero-backlash datum distance", _mm(pair.zero_backlash_center_distance)),
                 ("rack back from pinion axis", _mm(pair.rack_back_distance))]
    else:
        rows += [("teeth", f"{pair.z1} / {pair.z2}"),
                 ("center distance", _mm(pair.center_distance)),
                 ("standard center distance a", _mm(pair.reference_center_distance)),
                 ("zero-backlash center distance a_w", _mm(pair.zero_backlash_center_distance)),
                 ("center-distance modification y", f"{pair.y:.4f}"),
                 ("tip shortening k", f"{pair.k:.4f}")]
    rows += [("normal module", f"{pair.mn:g} mm"),
             ("operating pressure angle", f"{pair.working_pressure_angle:.3f}°"),
             ("contact ratio ε_α", f"{pair.contact_ratio:.3f}"),
             ("overlap ratio ε_β", f"{pair.overlap_ratio:.3f}"),
             ("backlash, normal (formula)", _mm(pair.backlash_normal)),
             ("backlash, circumferential (formula)", _mm(pair.backlash_circumferential)),
             ("tip clearance", _mm(pair.tip_clearance))]
    if sweep is not None:
        rows += [("sweep result", sweep.status),
                 ("least gap, drive flanks", _mm(sweep.min_clearance_drive, 4)),
                 ("least gap, coast flanks", _mm(sweep.min_clearance_coast, 4)),
                 ("at gear 1 angle", f"{math.degrees(sweep.angle_at_min):.2f}°"),
                 ("backlash, circumferential (swept)", _mm(sweep.swept_backlash, 4)),
                 ("largest overlap", f"{sweep.overlap_area:.4f} mm²")]
        if sweep.clear_center_distance is not None:
            rows.append(("clears at", _mm(sweep.clear_center_distance)))
    return tuple(rows)


def _findings_html(findings) -> str:
    if not findings:
        return ""
    items = []
    for f in findings:
        f = f if isinstance(f, Finding) else Finding(**f)
        items.append(f'<li class="{escape(f.severity)}"><span class="sev">{escape(f.severity)}'
                     f'</span>{escape(f.message)}</li>')
    return '<ul class="findings">' + "".join(items) + "</ul>"


def render_report(entries, *, title: str = "Mesh check") -> str:
    """The HTML page as text."""
    parts = ["<!DOCTYPE html>", '<html lang="en">', "<head>", '<meta charset="utf-8">',
             f"<title>{escape(title)}</title>", f"<style>{_CSS}</style>", "</head>", "<body>",
             f"<h1>{escape(title)}</h1>", f'<p class="caution">{escape(CAUTION)}</p>']
    for e in entries:
        rows = "".join(f'<tr><td>{escape(k)}</td><td class="v">{escape(v)}</td></tr>'
                       for k, v in e.rows)
        parts += [f"<section><h2>{escape(e.name)}</h2>", '<div class="mesh">', e.svg.strip(),
                  f"<table>{rows}</table>", "</div>", _findings_html(e.findings), "</section>"]
    parts += ["</body>", "</html>"]
    return "\n".join(p for p in parts if p) + "\n"


def write_report(path, entries, *, title: str = "Mesh check") -> None:
    """Write the page to ``path`` atomically (no partial file on failure)."""
    from gen.export.atomic import write_atomic

    write_atomic(str(path), render_report(entries, title=title).encode("utf-8"))
