"""DXF export of a part's planar section (for laser cutting, routing and CAD sketches).

Curves map one to one onto DXF entities, in mm (``$INSUNITS = 4``):

- :class:`~gen.geometry.section.Line` → LINE;
- :class:`~gen.geometry.section.Arc` → ARC (DXF arcs run counter-clockwise, so a clockwise
  arc is written with its ends swapped); a full circle → CIRCLE (an ARC cannot close);
- :class:`~gen.geometry.section.Spline` → SPLINE, cubic, through the generated flank samples
  as fit points, with the control points and knots CAD programs derive from fit points
  (``ezdxf.math.fit_points_to_cad_cv``) stored as well, so every reader draws the same curve.
  Chosen over polylines: the flank samples are exact points of the generated tooth and the
  cubic through them stays smooth, so a CAD sketch gets one editable curve per flank and a
  laser or router moves along it without the stop-and-go of hundreds of short segments.
  Measured on m 2, z 20: the cubic stays within 0.3 µm of the generated involute and within
  0.01 mm (circumferential) of the trochoidal root between samples. The price is size (fit
  points, control points and knots: about 4.5 kB per flank). A two-point spline is a LINE.

Closed polylines, for cutting software that reads no splines (``curves="polyline"``): each loop
becomes one closed LWPOLYLINE through :meth:`gen.geometry.section.Loop.polygon`: every
generated flank sample (the points the splines pass through) and arcs divided so that the
sagitta r (1 − cos(δ/2)) stays within the part's chord tolerance. ``curves="both"`` writes the splines on the part's layer and
the polylines on a second layer ``<name>_polyline``.

Determinism: ezdxf numbers handles in creation order, and its documented
``options.write_fixed_meta_data_for_testing`` switch fixes the header dates ($TDCREATE,
$TDUPDATE …), the GUIDs and the "written by" stamp; it is switched on only while this
module writes and restored afterwards, so the same section gives the same bytes.
"""

from __future__ import annotations

import io
import math

import numpy as np

from gen.errors import ExportError
from gen.export.atomic import write_atomic

#: DXF release written (AutoCAD 2010 format: SPLINE and LWPOLYLINE readable everywhere)
DXF_VERSION = "R2010"
#: $INSUNITS code for millimetres (DXF reference, header variables)
INSUNITS_MM = 4
#: an arc spanning this much (rad) or more is written as a CIRCLE
FULL_TURN = 2.0 * math.pi - 1e-12


def _add_curve(msp, curve, attribs, fit_to_cv) -> str:
    from gen.geometry.section import Arc, Line, Spline

    if isinstance(curve, Line):
        msp.add_line(tuple(map(float, curve.p0)), tuple(map(float, curve.p1)), dxfattribs=attribs)
        return "LINE"
    if isinstance(curve, Arc):
        c = (float(curve.center[0]), float(curve.center[1]))
        if abs(curve.a1 - curve.a0) >= FULL_TURN:
            msp.add_circle(c, float(curve.radius), dxfattribs=attribs)
            return "CIRCLE"
        a0, a1 = sorted((curve.a0, curve.a1))
        msp.add_arc(c, float(curve.radius), math.degrees(a0), math.degrees(a1),
                    dxfattribs=attribs)
        return "ARC"
    if isinstance(curve, Spline):
        pts = [(float(x), float(y), 0.0) for x, y in np.asarray(curve.points)]
        if len(pts) == 2:
            msp.add_line(pts[0][:2], pts[1][:2], dxfattribs=attribs)
            return "LINE"
        spline = msp.add_spline(pts, degree=3, dxfattribs=attribs)
        spline.apply_construction_tool(fit_to_cv(pts))
        spline.fit_points = pts   # keep the fit points beside the derived control points
        return "SPLINE"
    raise ExportError(f"cannot write curve type {type(curve).__name__} to DXF")


#: what ``curves`` may ask for
CURVES = ("spline", "polyline", "both")
#: suffix of the polyline layer when both are written
POLYLINE_LAYER = "_polyline"


def dxf_bytes(section, name: str, curves: str = "spline", tol: float = 0.01) -> bytes:
    """DXF text of ``section`` (outer loop and holes) on a layer called ``name``.

    ``curves``: "spline" (exact entities), "polyline" (closed polylines within ``tol`` mm),
    or "both" (polylines on the layer ``name + "_polyline"``).
    """
    if curves not in CURVES:
        raise ExportError(f"DXF curves must be one of {', '.join(CURVES)} (got {curves!r})")
    import ezdxf
    from ezdxf import bbox, zoom
    from ezdxf.math import fit_points_to_cad_cv

    old = ezdxf.options.write_fixed_meta_data_for_testing
    ezdxf.options.write_fixed_meta_data_for_testing = True
    try:
        doc = ezdxf.new(DXF_VERSION, setup=False)
        # register the CLASS entries now, in a fixed order: left to the writer, the classes of
        # the object types in use are added while iterating a set, so the CLASSES order (and
        # the file's bytes) followed Python's string-hash seed
        from ezdxf.sections.classes import REQ_R2000

        for cls in REQ_R2000:   # the library's full list, in its order
            doc.classes.add_class(cls)
        doc.header["$INSUNITS"] = INSUNITS_MM
        doc.header["$MEASUREMENT"] = 1   # metric
        doc.header["$LUNITS"] = 2        # decimal
        poly_layer = name + POLYLINE_LAYER if curves == "both" else name
        try:
            doc.layers.add(name)
            if poly_layer != name:
                doc.layers.add(poly_layer)
        except Exception as exc:  # ezdxf rejects names DXF does not allow
            raise ExportError(f"'{name}' cannot be a DXF layer name: {exc}") from None
        msp = doc.modelspace()
        attribs = {"layer": name}
        for loop in (section.outer, *section.holes):
            if curves in ("spline", "both"):
                for curve in loop.curves:
                    _add_curve(msp, curve, attribs, fit_points_to_cad_cv)
            if curves in ("polyline", "both"):
                _add_polyline(msp, loop, tol, {"layer": poly_layer})
        box = bbox.extents(msp)
        if box.has_data:
            msp.reset_extents(box.extmin, box.extmax)  # copied to $EXTMIN/$EXTMAX on write
            zoom.extents(msp)
        text = io.StringIO()
        doc.write(text)
        return doc.encode(text.getvalue())
    finally:
        ezdxf.options.write_fixed_meta_data_for_testing = old


def _add_polyline(msp, loop, tol: float, attribs) -> None:
    """One closed LWPOLYLINE through the loop's polygon within ``tol`` (mm)."""
    pts = loop.polygon(tol)
    msp.add_lwpolyline([(float(x), float(y)) for x, y in pts], close=True, dxfattribs=attribs)


def write_dxf(section, path: str, name: str, curves: str = "spline", tol: float = 0.01) -> int:
    """Write ``section`` (a :class:`gen.geometry.section.Section`, mm) as DXF; returns bytes."""
    data = dxf_bytes(section, name, curves, tol)
    write_atomic(path, data)
    return len(data)


def write_part(part, path: str, made) -> int | None:
    """The part's flat section as DXF, or None when it has none."""
    if part.section is None:
        return None
    return write_dxf(part.section, path, part.name, made.options.get("dxf_curves", "spline"),
                     part.chord_tol)
