"""Part series: one ``series:`` entry expands a part over lists or ranges of values.

A catalogue of every 2 mm and 3 mm pulley from 10 to 80 teeth is one entry::

    series:
      stock_pulleys:
        kind: timing_pulley
        name: "pulley_{profile}_{teeth}t"      # every varied key, in braces
        vary:
          profile: [curv2, curv3]             # a list of values
          teeth: "10..80"                     # a whole-number range, both ends included
        values: {belt_width: 6, bore: 5}      # the same for every member

``vary`` ranges are ``"a..b"`` (step 1) or ``"a..b/step"``; the members are the cartesian
product of the varied keys, in the order written, named by ``name`` (each ``{key}`` replaced by
that member's value; a value like 2.5 becomes ``2.5``). Every member is an ordinary part: it
is validated, meshed and listed in the manifest like one written out by hand.
"""

from __future__ import annotations

import itertools
import re

from gen.errors import ParamError

#: members one series may expand to (a catalogue larger than this belongs in several files)
MAX_MEMBERS = 5000
_RANGE = re.compile(r"^\s*(-?\d+)\s*\.\.\s*(-?\d+)\s*(?:/\s*(\d+)\s*)?$")
_FIELD = re.compile(r"\{([A-Za-z_][A-Za-z0-9_]*)\}")
SERIES_KEYS = ("kind", "name", "vary", "values")


def _values_of(key, spec, err):
    if isinstance(spec, list):
        if not spec:
            raise err(f"vary.{key}", "lists no values")
        return list(spec)
    if isinstance(spec, str):
        m = _RANGE.match(spec)
        if m:
            a, b, step = int(m.group(1)), int(m.group(2)), int(m.group(3) or 1)
            if b < a or step < 1:
                raise err(f"vary.{key}", f"range {spec!r} is empty", "a..b with a ≤ b, or a..b/step")
            return list(range(a, b + 1, step))
    raise err(f"vary.{key}", "must be a list of values or a whole-number range like \"10..80\"",
              "a list, \"a..b\" or \"a..b/step\"")


def expand(series_name: str, body: dict, file: str, line) -> list[tuple[str, dict]]:
    """[(part name, part body)] of one series entry; raises ParamError with the key named."""

    def err(key, msg, allowed=None):
        return ParamError(msg, file=file, line=line(key), part=series_name, key=key,
                          allowed=allowed, section="series")

    if not isinstance(body, dict):
        raise err(None, "must be a mapping with kind, name, vary and values")
    for k in body:
        if k not in SERIES_KEYS:
            raise err(str(k), f"unknown key '{k}'", ", ".join(SERIES_KEYS))
    kind, pattern = body.get("kind"), body.get("name")
    vary, fixed = body.get("vary"), body.get("values") or {}
    if not isinstance(kind, str):
        raise err("kind", "is required: the part kind of every member")
    if not isinstance(vary, dict) or not vary:
        raise err("vary", "is required: a mapping of keys to lists or ranges")
    if not isinstance(fixed, dict):
        raise err("values", "must be a mapping of keys shared by every member")
    if not isinstance(pattern, str):
        raise err("name", "is required: a name pattern such as \"gear_{teeth}t\"")
    fields = set(_FIELD.findall(pattern))
    if fields != set(vary):
        missing = sorted(set(vary) - fields) or sorted(fields - set(vary))
        raise err("name", f"the pattern must name every varied key once in braces and no "
                  f"other (check {', '.join(missing)})")
    clash = sorted(set(vary) & (set(fixed) | {"kind"}))
    if clash:
        raise err(f"vary.{clash[0]}", "is both varied and fixed")
    axes = [(k, _values_of(k, v, err)) for k, v in vary.items()]
    count = 1
    for _, vals in axes:
        count *= len(vals)
    if count > MAX_MEMBERS:
        raise err("vary", f"expands to {count} parts, more than {MAX_MEMBERS}")
    out = []
    for combo in itertools.product(*(vals for _, vals in axes)):
        member = dict(zip((k for k, _ in axes), combo))
        name = _FIELD.sub(lambda m: _text(member[m.group(1)]), pattern)
        out.append((name, {"kind": kind, **fixed, **member}))
    return out


def _text(v) -> str:
    if isinstance(v, float) and v.is_integer():
        return str(int(v))
    return str(v)
