"""Shared geometric instances in a STEP text (ISO 10303-21): one instance per value.

The kernel's writer makes a new instance for every use of a geometric value: the curve
that bounds a straight prism's bottom face is written once for the edge and once more as
the basis of the side face's extrusion; every pole of an edge on a twisted face is written
again as a pole of that face, every vertex point again as a curve's end pole, and the
directions (0, 0, 1) and (1, 0, 0) hundreds of times. An exchange file may refer to one
instance from many places (ISO 10303-21 instance names are references), so instances of
the same geometric value are merged here: points, directions, vectors, placements,
curves and surfaces whose text and (merged) references are equal become one instance, and
the instances are numbered again in file order.

Only pure geometric values are merged: never topology (vertices, edges, loops, faces,
shells, whose identity is the model's structure), and only where geometry or a vertex, edge
or face refers to them: what anything else refers to (a representation's placement, an
assembly transformation's axes) stays its own instance. The text keeps its order; the result is read back and
analysed like any written file (:func:`gen.export.step.write_step`).
"""

from __future__ import annotations

import re

_ENTITY = re.compile(rb"^#(\d+) = (.*?);\r?\n(?=#\d+ = |\Z)", re.M | re.S)
_REF = re.compile(rb"#(\d+)")
_STRING = re.compile(rb"'(?:[^']|'')*'")

#: instance types holding a geometric value only (merged when equal)
SHARED_TYPES = frozenset({
    b"CARTESIAN_POINT", b"DIRECTION", b"VECTOR", b"AXIS2_PLACEMENT_3D", b"LINE", b"CIRCLE",
    b"PLANE", b"CYLINDRICAL_SURFACE", b"CONICAL_SURFACE", b"B_SPLINE_CURVE_WITH_KNOTS",
    b"B_SPLINE_SURFACE_WITH_KNOTS", b"SURFACE_OF_LINEAR_EXTRUSION",
})
#: topology that refers to geometry by value: a vertex's point, an edge's curve, a face's
#: surface (whatever else refers to a geometric instance keeps that instance to itself)
_GEOMETRY_USERS = frozenset({b"VERTEX_POINT", b"EDGE_CURVE", b"ADVANCED_FACE"})
#: the first part of a complex instance that is a (rational) B-spline curve or surface
_COMPLEX_SHARED = (b"BOUNDED_CURVE()", b"BOUNDED_SURFACE()")


def _outside_strings(body: bytes, fn) -> bytes:
    """``body`` with ``fn`` applied to the text between quoted strings only."""
    out, last = [], 0
    for m in _STRING.finditer(body):
        out.append(fn(body[last:m.start()]))
        out.append(m.group(0))
        last = m.end()
    out.append(fn(body[last:]))
    return b"".join(out)


def _kind(body: bytes) -> bytes:
    if body.startswith(b"("):
        inner = body[1:].lstrip()
        return b"complex" if inner.startswith(_COMPLEX_SHARED) else b"(other"
    return body.split(b"(", 1)[0].strip()


def _plain(body: bytes) -> bool:
    """Every quoted string of ``body`` is empty (''), so a '#' is always a reference."""
    return b"'" not in body.replace(b"''", b"")


def share_geometry(data: bytes) -> bytes:
    """The STEP text ``data`` with equal geometric instances merged and instances numbered
    from 1 in file order (see the module docstring); a text it cannot parse is returned
    unchanged. Instances without a non-empty string (nearly all) take a fast path: their
    references are found in one pass, and an instance without references is its own key."""
    start = data.find(b"\nDATA;\n")
    end = data.rfind(b"ENDSEC;")
    if start < 0 or end < start:
        return data
    head, body_text, tail = data[:start + 7], data[start + 7:end], data[end:]
    matches = list(_ENTITY.finditer(body_text))
    if sum(m.end() - m.start() for m in matches) != len(body_text):
        return data                       # not one instance after another: leave it alone
    ents = [(int(m.group(1)), m.group(2)) for m in matches]
    bodies = dict(ents)
    kinds, plain, refs = {}, {}, {}
    for i, b in ents:
        kinds[i] = _kind(b)
        plain[i] = _plain(b)
        refs[i] = [int(r) for r in _REF.findall(b if plain[i] else _STRING.sub(b"", b))]
    if any(r not in bodies for rs in refs.values() for r in rs):
        return data                       # a reference to no instance: leave the text alone
    protected = set()   # what anything but geometry and its vertex/edge/face refers to
    for i, _ in ents:
        if kinds[i] not in SHARED_TYPES and kinds[i] not in _GEOMETRY_USERS \
                and kinds[i] != b"complex":
            protected.update(refs[i])
    rep: dict = {}
    seen: dict = {}

    def representative(i: int) -> int:
        if i in rep:
            return rep[i]
        k = kinds.get(i)
        if i in protected or (k not in SHARED_TYPES and k != b"complex"):
            rep[i] = i
            return i
        rep[i] = i                        # guards a cycle (none in geometry)
        body = bodies[i]
        if not refs[i]:
            key = body.translate(None, b" \t\r\n")
        elif plain[i]:      # the text with every reference blanked, and the references' values
            key = (_REF.sub(b"#", body).translate(None, b" \t\r\n"),
                   tuple(representative(r) for r in refs[i]))
        else:
            key = _REF.sub(lambda m: b"#%d" % representative(int(m.group(1))),
                           body).translate(None, b" \t\r\n")
        rep[i] = seen.setdefault(key, i)
        return rep[i]

    for i, _ in ents:
        representative(i)
    kept = [i for i, _ in ents if rep[i] == i]
    number = {i: n for n, i in enumerate(kept, 1)}

    def new_ref(m) -> bytes:
        r = int(m.group(1))
        return b"#%d" % number[rep.get(r, r)]

    def renumber(s: bytes) -> bytes:
        return _REF.sub(new_ref, s)

    out = [head]
    for i in kept:
        body = bodies[i]
        if refs[i] or not plain[i]:
            body = renumber(body) if plain[i] else _outside_strings(body, renumber)
        out.append(b"#%d = %s;\n" % (number[i], body))
    out.append(tail)
    return b"".join(out)
