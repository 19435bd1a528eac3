"""Fit profiles: named printing allowances applied to teeth, bores and grooves.

A fit is chosen per part with ``fit: NAME``; NAME is one of :data:`BUILT_IN` or defined in a
file's ``fits:`` section::

    fits:
      shop_printer: {flank_clearance: 0.08, hole_allowance: 0.25, outline_offset: 0.05,
                     min_feature: 0.8}

* ``flank_clearance`` (mm): every tooth flank is moved back by this, measured as arc on the
  reference (pitch) circle — gears and racks are thinned by twice it, pulley grooves widened.
* ``hole_allowance`` (mm): added to every bore diameter (printed holes come out small).
* ``outline_offset`` (mm): tip circles are reduced by it on the radius (outer walls print fat).
* ``min_feature`` (mm): tip lands and rims thinner than this are reported.

The built-in values are common practice starting points for the named process, to be
replaced by figures measured on a printed ``fit_coupon``.
"""

from __future__ import annotations

from gen.params.schema import Key, Where, check_mapping

FIT_KEYS = (
    Key("flank_clearance", "float", 0.0, lo=0, hi=0.5, unit="mm"),
    Key("hole_allowance", "float", 0.0, lo=-0.5, hi=1.0, unit="mm"),
    Key("outline_offset", "float", 0.0, lo=0, hi=0.5, unit="mm"),
    Key("min_feature", "float", 0.0, lo=0, hi=5, unit="mm"),
)

#: common practice starting points (shared references, "Printing (practice)"): flank
#: thinning 0.05–0.2 mm, holes 0.1–0.3 mm undersize; minimum feature ≈ two line widths
BUILT_IN = {
    "none": {"flank_clearance": 0.0, "hole_allowance": 0.0, "outline_offset": 0.0,
             "min_feature": 0.0},
    "fdm-0.4": {"flank_clearance": 0.10, "hole_allowance": 0.20, "outline_offset": 0.05,
                "min_feature": 0.8},
    "fdm-0.4-petg": {"flank_clearance": 0.12, "hole_allowance": 0.25, "outline_offset": 0.05,
                     "min_feature": 0.8},
    "fdm-0.6": {"flank_clearance": 0.15, "hole_allowance": 0.30, "outline_offset": 0.08,
                "min_feature": 1.2},
    "resin": {"flank_clearance": 0.05, "hole_allowance": 0.10, "outline_offset": 0.02,
              "min_feature": 0.4},
}


def collect_fits(entries) -> dict:
    """Built-in fits plus the validated ``fits:`` entries of the project (name → values)."""
    fits = {k: dict(v, name=k, source="built-in") for k, v in BUILT_IN.items()}
    for e in entries:
        where = Where(e.file, None, e.line)
        if e.index in fits and fits[e.index]["source"] != "built-in":
            raise where.error(None, f"duplicate fit name '{e.index}'")
        values = check_mapping(e.values, FIT_KEYS, where, prefix=f"fits.{e.index}.")
        fits[e.index] = dict(values, name=e.index, source=e.file)
    return fits
