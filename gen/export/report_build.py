"""Compose the whole-build report from a check result (and, after a build, the part outcomes
and the output folder): parts, meshes, belt drives, assemblies and drive trains.

The result is taken as it comes (duck-typed: ``models``, ``pairs``, ``drives``,
``assemblies``, ``drivetrains``, ``findings``), so this module imports nothing above
:mod:`gen.export`. Without ``out_dir`` (``pitchline check --report``) parts are drawn from
their measured outlines; with it, from the STL files written there.
"""

from __future__ import annotations

from html import escape

from gen.export.report_page import page, stage_table
from gen.export.report_parts import anchor, findings_html, fmt, part_card, table


def _scene_svg(scene) -> str:
    from gen.export.report_motion import scene_svg, with_overlap

    return scene_svg(with_overlap(scene))


def _numbers_rows(numbers: dict):
    rows = []
    for k, v in numbers.items():
        if v is None or isinstance(v, dict):
            continue
        if isinstance(v, (list, tuple)):
            v = ", ".join(fmt(x) for x in v)
        else:
            v = fmt(v)
        rows.append((k.replace("_", " "), v))
    return rows


def mesh_item(p, models) -> str:
    """One declared mesh: the pair drawing, the moving mesh, its numbers and findings."""
    from gen.export.report_html import pair_rows
    from gen.export.report_motion import bevel_scene, pair_scene
    from gen.export.report_svg import mesh_svg

    name = p["name"]
    figs, rows = [], _numbers_rows(p.get("numbers") or {})
    pic = p.get("picture")
    a, b = (models.get(n) for n in p["parts"])
    try:
        numbers = p.get("numbers") or {}
        if pic is not None and "swing" in numbers and a is not None and b is not None:
            figs += _sector_figs(p, models, pic)
            rows = list(pair_rows(pic[2], pic[3]))
        elif pic is not None:
            poly1, poly2, pr, sw, rack = pic
            figs.append(mesh_svg(poly1, poly2, pr, sw, rack=rack, title=name))
            names = tuple(p["parts"])
            if a is not None and a.role.value == "rack":
                names = names[::-1]
            figs.append(_scene_svg(pair_scene(poly1, poly2, pr, rack, name, names)))
            rows = list(pair_rows(pr, sw))
        elif a is not None and b is not None and {a.role.value, b.role.value} == {"bevel_gear"}:
            scene, _ = bevel_scene(a, b, f"{name} (on the back cones)")
            figs.append(_scene_svg(scene))
        elif a is not None and b is not None and "internal_gear" in (a.role.value, b.role.value):
            figs.append(_scene_svg(_internal(a, b, (p.get("numbers") or {}).get(
                "center_distance"), name)))
    except Exception as exc:   # a drawing that cannot be made is said on the page
        figs.append(f'<p class="muted">no drawing: {escape(str(exc))}</p>')
    return (f'<article class="item" id="{anchor("mesh", name)}"><h3>{escape(name)}</h3>'
            f'<div class="figs">{"".join(figs)}</div>{table(rows)}'
            f'{findings_html(p["findings"])}</article>')


def _sector_figs(p, models, pic):
    """A sector pair: the static drawing at mid-swing with its ends, the mesh zone drawing
    (tightest or worst pose of the swing sweep) and the pair moving over the whole swing."""
    import math
    from dataclasses import replace

    from gen.export.report_motion import scene_svg
    from gen.export.report_svg import mesh_svg
    from gen.export.report_swing import placement, swing_scene, swing_svg

    name, n = p["name"], p["numbers"]
    poly1, poly2, pr, sw, _ = pic
    g1, g2 = (models[k] for k in n["gear_order"])
    pl = placement(g1, g2, pr, math.radians(n["swing"]))
    rad = tuple(math.radians(v) for v in n.get("stops") or ()) or None
    rad2 = tuple(math.radians(v) for v in n.get("stops_gear2") or ()) or None
    figs = [swing_svg(pl, pr, rad, rad2, title=name)]
    if sw is not None and sw.angle_at_overlap is not None:
        # the swing sweep gives its worst angle from mid-swing: turn it into gear 1's own
        # angle, as the picture's tightest angle already is
        sw = replace(sw, angle_at_overlap=sw.angle_at_overlap + pl.mid)
    figs.append(mesh_svg(poly1, poly2, pr, sw, title=f"{name} (mesh zone)"))
    figs.append(scene_svg(swing_scene(pl, pr, name)))
    return figs


def _internal(a, b, center, title):
    from gen.geometry.internal_pair import mesh_internal
    from gen.export.report_motion import internal_scene

    pin, ring = (a, b) if a.role.value == "external_gear" else (b, a)
    pr = mesh_internal(pin.mate.sizes, ring.mate.sizes, center, check_radial=False)
    r = float(ring.sizes.get("rim_outside_diameter", 0)) / 2.0 or pr.root_radii[1] * 1.1
    return internal_scene(pin.outline, ring.outline, pr, r, title, (pin.name, ring.name))


def drive_item(d, models) -> str:
    from gen.export.report_belt import belt_svg

    sol = d["solution"]
    outl = tuple(models[n].outline if n in models else None for n in (d.get("pulleys") or ()))
    svg = belt_svg(sol, title=d["name"], outlines=outl if len(outl) == 2 else (None, None))
    keep = ("belt_teeth", "belt_length", "center_distance", "requested_center", "ratio",
            "wrap_angle", "teeth_in_mesh", "span_length", "center_min", "center_max",
            "adjust_pct")
    nums = sol.as_dict()
    rows = _numbers_rows({k: nums[k] for k in keep if k in nums})
    return (f'<article class="item" id="{anchor("drive", d["name"])}"><h3>{escape(d["name"])}'
            f'</h3><div class="figs">{svg}</div>{table(rows)}{findings_html(d["findings"])}'
            f"</article>")


def assembly_item(a, models, outcomes, out_dir) -> str:
    from gen.export.report_assembly import assembly_html
    from gen.export.report_motion import bevel_scene, pair_scene

    aid = anchor("assembly", a.name)
    extra = []
    roles = a.parts
    try:
        if "input_1" in roles and "output_1" in roles:
            m1, m2 = models[roles["input_1"]], models[roles["output_1"]]
            scene, _ = bevel_scene(m1, m2, f"{m1.name} + {m2.name} (on the back cones)")
            extra.append(_scene_svg(scene))
        if "sun" in roles and "planet_1" in roles and "ring" in roles:
            from gen.geometry.pair import mesh_pair

            sun, pl, ring = (models[roles[k]] for k in ("sun", "planet_1", "ring"))
            c = a.sizes.get("sun_planet_center_distance")
            pr = mesh_pair(sun.mate.sizes, pl.mate.sizes, c)
            extra.append(_scene_svg(pair_scene(sun.outline, pl.outline, pr, None,
                                               f"{sun.name} + {pl.name}", (sun.name, pl.name))))
            extra.append(_scene_svg(_internal(pl, ring, a.sizes.get(
                "planet_ring_center_distance"), f"{pl.name} in {ring.name}")))
    except Exception as exc:
        extra.append(f'<p class="muted">no mesh drawing: {escape(str(exc))}</p>')
    members = ", ".join(f'<a href="#{anchor("part", n)}">{escape(n)}</a>'
                        for n in a.parts.values())
    return (f'<article class="item" id="{aid}"><h3>{escape(a.name)} <small>{escape(a.kind)}'
            f'</small></h3><p>parts: {members}</p>'
            f'{assembly_html(a, models, outcomes, out_dir, aid)}'
            f'<div class="figs">{"".join(extra)}</div>{findings_html(a.findings)}</article>')


def section_items(models, drivetrains) -> list:
    """Axial sections: each lead screw in its nut (a nut of the same thread, when one is
    declared), each nut left over on its own, each flywheel with its stress along the radius.
    A drive train with the screw as a stage adds its figures to the screw's drawing."""
    from gen.export.report_rotor import rotor_svg
    from gen.export.report_screw import same_thread, screw_section_svg

    def kind(m):
        return getattr(m, "kind", "")

    screws = [models[n] for n in sorted(models) if kind(models[n]) == "lead_screw"]
    nuts = [models[n] for n in sorted(models) if kind(models[n]) == "screw_nut"]
    used, out = set(), []

    def item(name, parts, svg):
        links = ", ".join(f'<a href="#{anchor("part", p)}">{escape(p)}</a>' for p in parts)
        return (f'<article class="item" id="{anchor("section", name)}"><h3>{escape(name)}'
                f'</h3><p>parts: {links}</p><div class="figs">{svg}</div></article>')

    for sc in screws:
        nut = next((n for n in nuts if n.name not in used and same_thread(sc, n)), None)
        if nut is not None:
            used.add(nut.name)
        lines = []
        for d in drivetrains:
            for st in (d.numbers or {}).get("stages", []):
                if st.get("name") == sc.name:
                    lines.append(f"drive train {d.name}: {fmt(st.get('speed_out'))} out, "
                                 f"{fmt(st.get('torque_out'))} N out at the nut, margin "
                                 f"{fmt(st.get('margin'))}")
        names = [sc.name] + ([nut.name] if nut is not None else [])
        title = " in ".join(names)
        try:
            svg = screw_section_svg(sc, nut, title=title, drive_lines=lines)
        except Exception as exc:   # a drawing that cannot be made is said on the page
            svg = f'<p class="muted">no drawing: {escape(str(exc))}</p>'
        out.append(item(title, names, svg))
    for nut in nuts:
        if nut.name in used:
            continue
        try:
            svg = screw_section_svg(None, nut, title=f"{nut.name} (screw: basic profile)")
        except Exception as exc:
            svg = f'<p class="muted">no drawing: {escape(str(exc))}</p>'
        out.append(item(nut.name, [nut.name], svg))
    for name in sorted(models):
        m = models[name]
        if kind(m) != "flywheel":
            continue
        try:
            svg = rotor_svg(m, f"{name}: section and stress along the radius")
        except Exception as exc:
            svg = f'<p class="muted">no drawing: {escape(str(exc))}</p>'
        out.append(item(name, [name], svg))
    return out


def drivetrain_item(d) -> str:
    n = d.numbers
    if "stages" in n:
        head = [("total ratio", fmt(n["total_ratio"])), ("efficiency", fmt(n["efficiency"])),
                ("output", f"{fmt(n['output_torque'])} N·m at {fmt(n['output_speed'])} rpm"),
                ("weakest", escape(str(n.get("weakest"))))]
        body = table(head) + stage_table(n)
    else:
        body = table(_numbers_rows(n))
    return (f'<article class="item" id="{anchor("train", d.name)}"><h3>{escape(d.name)}</h3>'
            f"{body}{findings_html(d.findings)}</article>")


#: most parts drawn shaded from their files on one page (the rest: outlines)
MAX_SHADED = 40


def render(result, *, out_dir=None, outcomes=None, title="pitchline build report") -> str:
    """The page's HTML text."""
    models = result.models
    outcomes = outcomes or {}
    groups, owned = [], set()

    def key(f):
        return (f.severity, f.code, f.message, f.subject)

    def group(aid, label, findings):
        groups.append((aid, label, list(findings)))
        owned.update(key(f) for f in findings)

    cards = []
    for k, name in enumerate(sorted(models)):
        m = models[name]
        # shaded views cost ~0.07 s and ~20 kB each: a catalogue beyond MAX_SHADED parts shows
        # the rest as measured outlines (said on their cards), keeping the page small and quick
        shade = k < MAX_SHADED
        cards.append(part_card(m, outcomes.get(name) if shade else None,
                               out_dir if shade else None))
        group(anchor("part", name), name, m.findings)
    meshes = [mesh_item(p, models) for p in result.pairs]
    for p in result.pairs:
        group(anchor("mesh", p["name"]), p["name"], p["findings"])
    drives = [drive_item(d, models) for d in result.drives]
    for d in result.drives:
        group(anchor("drive", d["name"]), d["name"], d["findings"])
    asm = [assembly_item(a, models, outcomes, out_dir) for a in result.assemblies]
    for a in result.assemblies:
        group(anchor("assembly", a.name), a.name, a.findings)
    cuts = section_items(models, result.drivetrains)
    trains = [drivetrain_item(d) for d in result.drivetrains]
    for d in result.drivetrains:
        group(anchor("train", d.name), d.name, d.findings)
    loose = [f for f in result.findings if key(f) not in owned]
    project = ""
    if loose:
        group("project", "project", loose)
        project = findings_html(loose)
    for oc in outcomes.values():
        if getattr(oc, "findings", None):
            group(anchor("part", oc.name), oc.name, oc.findings)
    sections = [
        ("parts", "Parts", f'<div class="cards">{"".join(cards)}</div>' if cards else ""),
        ("meshes", "Meshes", "".join(meshes)),
        ("drives", "Belt drives", "".join(drives)),
        ("sections", "Screws, nuts and rotors in section", "".join(cuts)),
        ("assemblies", "Assemblies", "".join(asm)),
        ("trains", "Drive trains", "".join(trains)),
        ("project", "Other findings", project),
    ]
    return page(title, groups, sections)


#: the page's record of what it was drawn from (see :func:`write`)
INPUTS_META = '<meta name="pitchline-inputs" content="{}">'


def write(path, result, *, out_dir=None, outcomes=None, title="pitchline build report",
          inputs_key: str | None = None) -> bool:
    """Write the page atomically; returns False when it was left as it was.

    ``inputs_key`` names what the page is drawn from (parameter files, manifest, tool
    version): a page that already records the same key is not drawn again."""
    import os

    from gen.export.atomic import write_atomic

    mark = INPUTS_META.format(inputs_key) if inputs_key else None
    if mark and os.path.isfile(path):
        with open(path, "rb") as fh:
            if mark.encode() in fh.read(4096):
                return False
    text = render(result, out_dir=out_dir, outcomes=outcomes, title=title)
    if mark:
        text = text.replace('<meta charset="utf-8">', '<meta charset="utf-8">' + mark, 1)
    write_atomic(str(path), text.encode("utf-8"))
    return True
