"""Check a declared mesh of two sector gears, or a sector and a full external gear, over the
stated swing (not one pitch).

* ISO 21771 pair numbers at the mounted center distance (:func:`gen.geometry.pair.mesh_pair`)
  and the usual pair findings (:func:`gen.validate.pair_checks.pair_findings`);
* tooth pairs in contact at every angle of the swing on both flank sides
  (:func:`gen.geometry.sector_pair.sector_contact`): an error when contact is lost inside the
  swing, a warning when the sectors hold fewer pairs than full gears would somewhere in it;
* the hard stops: the gear angles, from mid-swing, where the last tooth pair separates;
* the real outlines swept over the whole swing (:func:`gen.validate.sector_sweep.sweep_swing`).

The swing checked is gear 1's: a sector's own swing, or its mate's converted by z₂/z₁; when
both members are sectors and their swings disagree the larger is checked and a note says so.
A sector meshing with a full gear is taken as gear 1, so its teeth stay centred on the line of
centres at mid-swing.
"""

from __future__ import annotations

import math
from dataclasses import replace

from gen.errors import GeometryError
from gen.findings import ERROR, INFO, WARNING, Finding
from gen.geometry.pair import mesh_pair
from gen.geometry.sector_pair import sector_contact
from gen.validate.pair_basic import basic_pair_findings
from gen.validate.pair_checks import pair_findings
from gen.validate.sector_sweep import gear2_offset, rotate, sweep_swing

SOURCE = "sector contact over the swing (gen.geometry.sector_pair)"


def is_sector(part) -> bool:
    return getattr(part.mate, "swing", 0.0) > 0.0


def _teeth(part) -> int:
    return part.mate.sector_teeth if is_sector(part) else part.mate.sizes.z


def check_sector_pair(label, names, a, b, v, strength=None):
    """(findings, numbers, picture-inputs) for a mesh with at least one sector gear."""
    if not is_sector(a) and is_sector(b):
        a, b = b, a  # the sector is gear 1
    ta, tb = a.mate, b.mate
    found = basic_pair_findings(label, a.name, ta, b.name, tb)
    if found:
        return found, {}, None
    z1, z2 = ta.sizes.z, tb.sizes.z
    swings = [ta.swing] if is_sector(a) else []
    if is_sector(b):
        swings.append(tb.swing * z2 / z1)
    swing = max(swings)
    out = []
    if len(swings) == 2 and abs(swings[0] - swings[1]) > 1e-6:
        out.append(Finding(WARNING, "sector-swing", f"the swings disagree: '{a.name}' turns "
                           f"{math.degrees(swings[0]):.2f}° and '{b.name}' "
                           f"{math.degrees(tb.swing):.2f}° (= {math.degrees(swings[1]):.2f}° of "
                           f"'{a.name}' at the ratio {z2}/{z1}); checked over the larger",
                           label, "rolling: Σ₂ = Σ₁ z₁/z₂", key="parts"))
    center, bw = v["center_distance"], min(ta.face_width, tb.face_width)
    try:
        pr = mesh_pair(ta.sizes, tb.sizes, center, face_width=bw,
                       form_radii=(ta.flank.r_junction, tb.flank.r_junction))
        c1 = ta.centre if is_sector(a) else 0.0
        c2 = tb.centre if is_sector(b) else 0.0
        sw = sweep_swing(a.outline, b.outline, pr, swing, c1=c1, c2=c2)
        contact = sector_contact(ta.sizes, tb.sizes, _teeth(a), _teeth(b), swing,
                                 center_distance=pr.center_distance, offset2=sw.offset2)
    except GeometryError as exc:
        return [Finding(ERROR, "no-mesh", str(exc), label, "", key="center_distance")], {}, None
    if sw.result is not None:
        out += pair_findings(pr, sw.result, subject=label, print_clearance=v["print_clearance"])
    else:
        out.append(Finding(ERROR, "sector-contact-lost", "no window of the swing has teeth of "
                           "both members in the mesh zone", label, SOURCE))
    deg = math.degrees
    lo, hi = contact.stops
    lo2, hi2 = contact.stops_gear2
    if not contact.always_in_contact:
        where = [deg(x) for x, n1, n2 in zip(contact.angles, contact.pairs_leading,
                                             contact.pairs_trailing) if min(n1, n2) < 1]
        out.append(Finding(ERROR, "sector-contact-lost",
                           f"the teeth run out inside the {deg(swing):.2f}° swing of "
                           f"'{a.name}': no tooth pair in contact from {min(where):.2f}° to "
                           f"{max(where):.2f}° (from mid-swing); add teeth (margin, arc) or "
                           "shorten the swing", label, SOURCE, key="parts"))
    elif not contact.full_ratio_kept:
        out.append(Finding(WARNING, "sector-contact-thin",
                           f"somewhere in the swing the sectors hold fewer tooth pairs than "
                           f"full gears (least {contact.min_pairs}): the contact ratio drops "
                           "near an end; a margin tooth more keeps it", label, SOURCE,
                           key="parts"))
    out.append(Finding(INFO, "sector-contact",
                       f"over the {deg(swing):.2f}° swing of '{a.name}' "
                       f"({deg(swing * z1 / z2):.2f}° of '{b.name}'): {contact.min_pairs} to "
                       f"{int(max(contact.pairs_leading.max(), contact.pairs_trailing.max()))} "
                       f"tooth pairs in contact (ε_α {contact.contact_ratio:.3f} for full gears); "
                       f"{sw.empty_windows} of {len(sw.windows)} swept windows without a "
                       "flank pair", label, SOURCE))
    out.append(Finding(INFO, "sector-stops",
                       f"hard stops (last tooth pair separates) at {deg(lo):+.2f}° and "
                       f"{deg(hi):+.2f}° of '{a.name}', {deg(lo2):+.2f}° and {deg(hi2):+.2f}° of "
                       f"'{b.name}' (from mid-swing; the swing is ±{deg(swing) / 2:.2f}°)",
                       label, SOURCE))
    if v["torque"] is not None and strength is not None:
        out += strength(label, names, a, b, v)
    numbers = {
        "center_distance": pr.center_distance,
        "working_pressure_angle": pr.working_pressure_angle,
        "contact_ratio": pr.contact_ratio,
        "backlash_normal": pr.backlash_normal,
        "tip_clearance": pr.tip_clearance,
        "swing": deg(swing),
        "sector_teeth": [_teeth(a), _teeth(b)],
        "gear_order": [a.name, b.name],
        "min_pairs_in_contact": contact.min_pairs,
        "full_contact_kept": contact.full_ratio_kept,
        "stops": [deg(lo), deg(hi)],
        "stops_gear2": [deg(lo2), deg(hi2)],
    }
    if sw.result is not None:
        r = sw.result
        numbers.update(min_clearance=min(r.min_clearance_drive, r.min_clearance_coast),
                       overlap_area=r.overlap_area, swept_backlash=r.swept_backlash,
                       swept_steps=r.steps)
    rank = {ERROR: 0, WARNING: 1, INFO: 2}
    out.sort(key=lambda f: rank[f.severity])
    picture = None
    if sw.result is not None:  # drawn at the tightest angle, in the sweep's own placement
        k2, _ = gear2_offset(z1, z2, c1, c2)
        picture = (a.outline, rotate(b.outline, k2 * 2.0 * math.pi / z2), pr,
                   replace(sw.result, angle_at_min=sw.result.angle_at_min + sw.mid_angle), None)
    return out, numbers, picture
