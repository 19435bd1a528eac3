"""Typed keys for parameter files: types, ranges, defaults, unit conversion, suggestions.

User-facing angles are degrees; :class:`Key` with ``kind="angle"`` converts them to radians
once, here. Lengths are mm and stay mm.
"""

from __future__ import annotations

import difflib
import math
import sys
from dataclasses import dataclass, field

from gen.errors import ParamError

REQUIRED = object()


@dataclass(frozen=True)
class Key:
    """One accepted key of a part kind (or of a nested mapping such as ``hub``).

    kind: "int", "float", "angle" (deg in, rad out), "bool", "str", "enum", "map".
    """

    name: str
    kind: str
    default: object = None
    lo: float | None = None
    hi: float | None = None
    lo_open: bool = False
    hi_open: bool = False
    choices: tuple = ()
    unit: str = ""
    doc: str = ""
    sub: tuple = field(default_factory=tuple)   # nested Keys for kind="map"
    scalar: str | None = None                   # for "map": sub-key a bare number stands for
    item: str = "float"                         # for "list": "float", "int" or "str" items
    count: int | None = None                    # for "list": exact length, when fixed
    max_count: int | None = None                # for "list": longest accepted
    ascending: bool = False                     # for "list": strictly increasing values

    @property
    def required(self) -> bool:
        return self.default is REQUIRED

    def range_text(self) -> str:
        if self.kind == "enum":
            return ", ".join(str(c) for c in self.choices)
        lo = "" if self.lo is None else f"{self.lo:g} {'<' if self.lo_open else '≤'} "
        hi = "" if self.hi is None else f" {'<' if self.hi_open else '≤'} {self.hi:g}"
        unit = f" {self.unit}" if self.unit else ""
        if not lo and not hi:
            return {"int": "a whole number", "float": "a finite number", "angle": "an angle in degrees",
                "list": f"a list of {key_items(self)}",
                    "bool": "true or false", "str": "text", "map": "a mapping"}.get(self.kind, self.kind)
        return f"{lo}{self.name}{hi}{unit}"


def key_items(key: Key) -> str:
    n = f"{key.count} " if key.count else ""
    return n + {"float": "numbers", "int": "whole numbers", "str": "names",
                "map": "mappings", "list": "lists"}[key.item]


class Where:
    """Context for messages: file, part and a line lookup.

    ``origin(key)``, when given, names where an inherited value came from (e.g. "train 't'"),
    or returns None for a value written on the entry itself.
    """

    def __init__(self, file: str, part: str | None, line_of, section: str = "part",
                 origin=None):
        self.file, self.part, self._line_of, self.section = file, part, line_of, section
        self.origin = origin or (lambda key: None)

    def error(self, key: str | None, msg: str, value=None, allowed=None) -> ParamError:
        return ParamError(msg, file=self.file, line=self._line_of(key), part=self.part, key=key,
                          value=value, allowed=allowed, section=self.section)


def suggest(word: str, options) -> str:
    close = difflib.get_close_matches(word, list(options), n=1, cutoff=0.6)
    return f"; did you mean '{close[0]}'?" if close else ""


def check_value(key: Key, value, where: Where, path: str | None = None):
    name = path or key.name
    k = key.kind
    if k == "map":
        if key.scalar is not None and not isinstance(value, dict):
            value = {key.scalar: value}
        if not isinstance(value, dict):
            raise where.error(name, "must be a mapping", value, key.range_text())
        return check_mapping(value, key.sub, where, prefix=name + ".")
    if k == "list":  # a list of numbers (each within lo … hi) or of names
        what = {"float": "numbers, e.g. [0, 0.1]", "int": "whole numbers, e.g. [20, 40]",
                "str": "names, e.g. [a, b]", "map": "mappings",
                "list": "lists of names, e.g. [[a, b]]"}[key.item]
        if not isinstance(value, list) or not value:
            raise where.error(name, f"must be a list of {what}", value, key.range_text())
        if key.count is not None and len(value) != key.count:
            raise where.error(name, f"must list exactly {key.count} {what.split(',')[0]}",
                              value, key.range_text())
        if key.max_count is not None and len(value) > key.max_count:
            raise where.error(name, f"must list at most {key.max_count} values", value,
                              key.range_text())
        item = Key(key.name, key.item, None, lo=key.lo, hi=key.hi, unit=key.unit, sub=key.sub,
                   item="str")
        out = [check_value(item, v, where, f"{name}[{i}]") for i, v in enumerate(value)]
        if key.ascending and any(b <= a for a, b in zip(out, out[1:])):
            raise where.error(name, "must be in ascending order without repeats", value,
                              key.range_text())
        return out
    if k == "bool":
        if not isinstance(value, bool):
            raise where.error(name, "must be true or false", value)
        return value
    if k in ("str", "enum"):
        if not isinstance(value, str):
            raise where.error(name, "must be text", value, key.range_text())
        if k == "enum":
            low = {str(c).lower(): c for c in key.choices}
            if value.lower() not in low:
                raise where.error(name, f"unknown value '{value}'{suggest(value, key.choices)}",
                                  None, key.range_text())
            return low[value.lower()]
        return value
    # numbers (a number key may also take the words listed in its choices, e.g. "auto")
    if isinstance(value, str) and value.lower() in key.choices:
        return value.lower()
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        want = "a whole number" if k == "int" else "a number"
        raise where.error(name, f"must be {want}", value, key.range_text())
    if isinstance(value, int) and abs(value) > sys.float_info.max:
        raise where.error(name, f"number too large (about {int(abs(value).bit_length() * 0.30103) + 1} digits)", None,
                          key.range_text())
    if not math.isfinite(float(value)):
        raise where.error(name, "must be finite", value, key.range_text())
    v = float(value) if k != "int" else value
    bad = ((key.lo is not None and (v < key.lo or (key.lo_open and v == key.lo))) or
           (key.hi is not None and (v > key.hi or (key.hi_open and v == key.hi))))
    if bad and key.lo is not None and key.lo == key.hi:
        # a key held at one value: it exists so trains can pass shared values through
        came = where.origin(name)
        raise where.error(name, f"must be {key.lo:g} here" + (f" ({key.doc})" if key.doc else "")
                          + (f"; the value comes from {came}" if came else ""), value)
    if k == "int" and not isinstance(value, int):
        if bad:
            raise where.error(name, "out of range", value, key.range_text())
        raise where.error(name, "must be a whole number" +
                          (f" (write {int(value)})" if value.is_integer() else ""), value,
                          key.range_text())
    if bad:
        raise where.error(name, "out of range", value, key.range_text())
    if k == "angle":
        return math.radians(v)
    return v


def check_mapping(raw: dict, keys, where: Where, prefix: str = "") -> dict:
    """Validate a mapping against ``keys``; returns a dict with defaults filled in."""
    table = {k.name: k for k in keys}
    out = {}
    for name, value in raw.items():
        if name not in table:
            raise where.error(prefix + str(name), f"unknown key '{name}'{suggest(str(name), table)}",
                              allowed=", ".join(sorted(table)))
        if value is None:
            raise where.error(prefix + name, "has no value", allowed=table[name].range_text())
        out[name] = check_value(table[name], value, where, prefix + name)
    for k in keys:
        if k.name not in out:
            if k.required:
                raise where.error(prefix + k.name, "is required", allowed=k.range_text())
            d = k.default
            out[k.name] = math.radians(d) if (k.kind == "angle" and d is not None) else d
    return out
