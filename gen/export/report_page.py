"""The build report: one self-contained HTML page showing the whole project — a summary of
every finding by severity with links, the cautions, every part, every mesh (drawn and moving),
every belt drive, every assembly and drive train.

Self-contained: inline CSS, inline SVG and ``data:`` PNG pictures; no scripts, fonts, links
or anything fetched. Readable on A4 paper and at phone width (CSS media queries). Colours:
Okabe–Ito palette (Okabe & Ito, "Color Universal Design", 2008), with text labels on every
severity so nothing depends on colour alone. Element ids are unique (derived from item kind
and name). The same inputs give the same page (no dates).
"""

from __future__ import annotations

from html import escape

from gen.export.report_motion import OKABE_ITO

SEVERITIES = (("error", "errors"), ("warning", "warnings"), ("info", "notes"))

CAUTIONS = (
    ("Pinch points", "gears, racks and belts pull fingers, hair, sleeves and cables in: guard "
     "them and stop the drive before reaching in."),
    ("Printed plastic under load", "printed teeth creep, wear and break, and weaken with heat; "
     "never use them where a failure could hurt someone (lifting, holding loads overhead, "
     "restraining people)."),
    ("Estimates only", "every strength, torque and clearance figure here is an estimate from "
     "nominal geometry, not a rating: test printed parts under the real load, with margin."),
    ("Stored energy", "spinning rotors, flywheels and loaded springs or belts keep energy after "
     "the power is off: let them stop and release tension before handling."),
    ("Codes and review", "follow local codes, and have safety-relevant designs reviewed by a "
     "qualified person."),
)

CSS = f"""
:root{{--ink:#1d1f22;--muted:#5b5f66;--rule:#c9c9c2;--paper:#ffffff;--band:#f4f4f0;
--err:{OKABE_ITO["vermillion"]};--warn:{OKABE_ITO["orange"]};--info:{OKABE_ITO["blue"]}}}
*{{box-sizing:border-box}}
body{{margin:0;background:var(--paper);color:var(--ink);
font:15px/1.45 system-ui,-apple-system,"Segoe UI",Roboto,Helvetica,Arial,sans-serif}}
header,main{{max-width:1320px;margin:0 auto;padding:0 20px}}
header{{padding-top:18px}}
h1{{font-size:24px;margin:0 0 2px}}
h2{{font-size:19px;margin:30px 0 10px;padding:6px 0 4px;border-bottom:3px solid var(--ink)}}
h3{{font-size:16px;margin:0 0 6px}} h3 small{{font-weight:normal;color:var(--muted)}}
nav ul{{list-style:none;padding:0;display:flex;flex-wrap:wrap;gap:6px 16px;margin:6px 0}}
a{{color:{OKABE_ITO["blue"]}}}
section.band{{padding:4px 0 14px}}
.counts{{display:flex;gap:10px;flex-wrap:wrap;margin:8px 0}}
.count{{padding:6px 12px;border:2px solid var(--rule);border-radius:6px;font-weight:bold}}
.count.error{{border-color:var(--err)}} .count.warning{{border-color:var(--warn)}}
.count.info{{border-color:var(--info)}}
.cautions{{border:2px solid var(--ink);border-left:10px solid {OKABE_ITO["orange"]};
padding:8px 14px;margin:12px 0;background:#fffaf0}}
.cautions dt{{font-weight:bold}} .cautions dd{{margin:0 0 6px 0}}
.cards{{display:grid;grid-template-columns:repeat(auto-fill,minmax(330px,1fr));gap:14px}}
.card,.item{{border:1px solid var(--rule);border-radius:6px;padding:10px;background:var(--paper);
break-inside:avoid}}
.item{{margin:0 0 14px}}
figure{{margin:0 0 6px}} figcaption{{font-size:12px;color:var(--muted)}}
img,svg{{max-width:100%;height:auto;display:block}}
.figs{{display:flex;flex-wrap:wrap;gap:10px;align-items:flex-start}}
table{{border-collapse:collapse;margin:6px 0;font-size:13px}}
th,td{{padding:2px 8px;border-bottom:1px solid #e6e6e0;text-align:left;vertical-align:top}}
table.num td{{font-variant-numeric:tabular-nums}}
table.stages td{{text-align:right}} table.stages th{{background:var(--band)}}
ul.findings{{list-style:none;padding:0;margin:6px 0;font-size:13px}}
ul.findings li{{padding:3px 8px;margin:2px 0;border-left:5px solid var(--rule)}}
li.error{{border-color:var(--err)!important;background:#fdebe3}}
li.warning{{border-color:var(--warn)!important;background:#fdf4e0}}
li.info{{border-color:var(--info)!important;background:#eaf2f8}}
.sev{{font-weight:bold;text-transform:uppercase;font-size:11px}}
.muted{{color:var(--muted);font-size:13px}}
ul.files{{margin:0;padding-left:18px;font-size:12px}} .files-head{{margin:6px 0 0;font-weight:bold}}
details summary{{cursor:pointer;font-size:13px}}
@media (max-width:700px){{
 body{{font-size:14px}} header,main{{padding:0 8px}}
 .cards{{grid-template-columns:1fr}} .figs{{display:block}}
 table{{font-size:12px}} th,td{{padding:2px 4px}}
}}
@media print{{
 @page{{size:A4;margin:12mm}}
 body{{font-size:10pt}} header,main{{max-width:none;padding:0}}
 nav{{display:none}} a{{color:inherit;text-decoration:none}}
 .cards{{grid-template-columns:1fr 1fr}} h2{{break-after:avoid}}
 .card,.item,figure,table{{break-inside:avoid}}
 details{{display:none}}
}}
"""


def _count_line(findings) -> str:
    out = []
    for sev, label in SEVERITIES:
        n = sum(f.severity == sev for f in findings)
        out.append(f'<span class="count {sev}">{n} {label}</span>')
    return '<div class="counts">' + "".join(out) + "</div>"


def summary_html(groups) -> str:
    """Every finding by severity, each linked to its item. ``groups``: (anchor id, item
    label, findings) per item."""
    every = [f for _, _, fs in groups for f in fs]
    out = [_count_line(every)]
    for sev, label in SEVERITIES:
        rows = [(aid, name, f) for aid, name, fs in groups for f in fs if f.severity == sev]
        if not rows:
            continue
        items = "".join(f'<li class="{sev}"><a href="#{aid}">{escape(name)}</a>: '
                        f'<code>{escape(f.code)}</code> {escape(f.message)}</li>'
                        for aid, name, f in rows)
        if sev == "info":
            out.append(f'<details class="summary-{sev}"><summary>{len(rows)} {label}</summary>'
                       f'<ul class="findings">{items}</ul></details>')
        else:
            out.append(f'<h3>{label.capitalize()}</h3><ul class="findings summary-{sev}">'
                       f'{items}</ul>')
    return "".join(out)


def cautions_html() -> str:
    body = "".join(f"<dt>{escape(t)}</dt><dd>{escape(d)}</dd>" for t, d in CAUTIONS)
    return f'<aside class="cautions" id="cautions"><h3>Cautions</h3><dl>{body}</dl></aside>'


def stage_table(numbers) -> str:
    """A drive train's stages: speeds (rpm), torques (N·m), margins (allowable / torque)."""
    head = ("stage", "kind", "rpm in", "rpm out", "N·m in", "N·m out", "margin",
            "margin at stall")
    rows = []
    for s in numbers.get("stages", []):
        def g(k, d=4):
            v = s.get(k)
            return "–" if v is None else f"{v:.{d}g}"
        rows.append((escape(s["name"]), escape(str(s.get("kind", ""))), g("speed_in"),
                     g("speed_out"), g("torque_in"), g("torque_out"), g("margin", 3),
                     g("margin_at_stall", 3)))
    th = "".join(f"<th>{h}</th>" for h in head)
    body = "".join("<tr>" + "".join(f"<td>{c}</td>" for c in r) + "</tr>" for r in rows)
    return f'<table class="stages"><tr>{th}</tr>{body}</table>'


def page(title: str, groups, sections) -> str:
    """The HTML text. ``sections``: (id, heading, html) in order; empty ones are left out."""
    nav = "".join(f'<li><a href="#{sid}">{escape(h)}</a></li>' for sid, h, body in sections
                  if body)
    parts = ["<!DOCTYPE html>", '<html lang="en">', "<head>", '<meta charset="utf-8">',
             '<meta name="viewport" content="width=device-width, initial-scale=1">',
             f"<title>{escape(title)}</title>", f"<style>{CSS}</style>", "</head>", "<body>",
             f'<header><h1>{escape(title)}</h1><nav><ul><li><a href="#summary">summary</a>'
             f"</li>{nav}</ul></nav></header>", "<main>",
             f'<section class="band" id="summary"><h2>Summary</h2>{summary_html(groups)}'
             f"{cautions_html()}</section>"]
    for sid, heading, body in sections:
        if body:
            parts.append(f'<section class="band" id="{sid}"><h2>{escape(heading)}</h2>{body}'
                         "</section>")
    parts += ["</main>", "</body>", "</html>"]
    return "\n".join(parts) + "\n"
