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
_TYPE = re.compile(rb"\s*([A-Z_0-9]*)")
_SPACE = re.compile(rb"\s+")

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
    return _TYPE.match(body).group(1)


def share_geometry(data: bytes) -> bytes:
    """The STEP text ``data`` with equal geometric instances merged and instances numbered
    from 1 in file order (see the module docstring); a text it cannot parse is returned
    unchanged."""
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
    kinds = {i: _kind(b) for i, b in ents}
    protected = set()   # what anything but geometry and its vertex/edge/face refers to
    for i, b in ents:
        if kinds[i] not in SHARED_TYPES and kinds[i] not in _GEOMETRY_USERS \
                and kinds[i] != b"complex":
            protected.update(int(r) for r in _REF.findall(_STRING.sub(b"", b)))
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
        key = _SPACE.sub(b"", _REF.sub(lambda m: b"#%d" % representative(int(m.group(1))),
                                       bodies[i]))
        rep[i] = seen.setdefault(key, i)
        return rep[i]

    for i, _ in ents:
        representative(i)
    if any(int(r) not in bodies for _, b in ents for r in _REF.findall(_STRING.sub(b"", b))):
        return data                       # a reference to no instance: leave the text alone
    kept = [i for i, _ in ents if rep[i] == i]
    number = {i: n for n, i in enumerate(kept, 1)}

    def renumber(s: bytes) -> bytes:
        return _REF.sub(lambda m: b"#%d" % number[rep.get(int(m.group(1)), int(m.group(1)))],
                        s)

    out = [head]
    for i in kept:
        out.append(b"#%d = " % number[i] + _outside_strings(bodies[i], renumber) + b";\n")
    out.append(tail)
    return b"".join(out)
