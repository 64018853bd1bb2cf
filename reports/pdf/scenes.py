"""Map scenes for ``reports.field_map``: outlines of the setup's parts plus the Assessment's contours.

Only geometry is read from the setup (centres, sizes, axes, zone corners), projected onto the
plan (x-y) or elevation (x-z) plane; the keep-out lines are the Assessment's contour lines as
computed. Parts whose symmetry axis is not along x, y or z are drawn as the circle that encloses
them, which is never smaller than the part.
"""
from __future__ import annotations

import math

from reports.field_map import KeepOutLine, MapScene, Shape
from reports.pdf.formatting import quantity

_PLANE = {"plan": (0, 1), "elevation": (0, 2)}


def _axis_index(direction) -> int | None:
    """0, 1 or 2 if the unit vector lies along x, y or z (within about 1 degree), else None."""
    for index, component in enumerate(direction):
        if abs(component) > 0.9998:
            return index
    return None


def _round_part(kind: str, label: str, centre, radius: float, length: float, axis, view: str):
    """Outline of a cylinder-like part (magnet disc, ring, coil) seen in one view."""
    first, second = _PLANE[view]
    c = (centre[first], centre[second])
    along = _axis_index(axis)
    if along is None:
        return Shape(kind=kind, form="circle", label=label, centre=c, radius=math.hypot(radius, length / 2))
    if along not in (first, second):           # axis points out of the drawing plane: a circle
        return Shape(kind=kind, form="circle", label=label, centre=c, radius=radius)
    half = [radius, radius]
    half[0 if along == first else 1] = length / 2
    return Shape(kind=kind, form="rectangle", label=label, corner_low=(c[0] - half[0], c[1] - half[1]),
                      corner_high=(c[0] + half[0], c[1] + half[1]))


def _magnet_shape(magnet, view: str):
    first, second = _PLANE[view]
    centre = magnet.at
    if magnet.shape == "sphere":
        return Shape(kind="magnet", form="circle", label=magnet.id, centre=(centre[first], centre[second]),
                          radius=magnet.diameter / 2)
    if magnet.shape == "block":
        size = magnet.size
        if magnet.rotation:
            radius = math.sqrt(sum(s * s for s in size)) / 2
            return Shape(kind="magnet", form="circle", label=magnet.id,
                              centre=(centre[first], centre[second]), radius=radius)
        return Shape(kind="magnet", form="rectangle", label=magnet.id,
                          corner_low=(centre[first] - size[first] / 2, centre[second] - size[second] / 2),
                          corner_high=(centre[first] + size[first] / 2, centre[second] + size[second] / 2))
    axis = magnet.axis or magnet.magnetization
    return _round_part("magnet", magnet.id, centre, magnet.diameter / 2, magnet.height, axis, view)


def _clip_rectangle(shape, low, high):
    """The rectangle cut to the box [low, high], or None if it lies outside it."""
    x0, y0 = max(shape.corner_low[0], low[0]), max(shape.corner_low[1], low[1])
    x1, y1 = min(shape.corner_high[0], high[0]), min(shape.corner_high[1], high[1])
    if x0 >= x1 or y0 >= y1:
        return None
    return type(shape)(kind=shape.kind, form="rectangle", label=shape.label, corner_low=(x0, y0), corner_high=(x1, y1))


def _close_up(scene, contours):
    """The same scene cut to the keep-out lines' surroundings, when they are small on the whole map."""
    points = [p for c in contours for line in c.lines for p in line]
    xs, ys = [p[0] for p in points], [p[1] for p in points]
    span = max(max(xs) - min(xs), max(ys) - min(ys), 0.02)
    low, high = (min(xs) - 0.15 * span, min(ys) - 0.15 * span), (max(xs) + 0.15 * span, max(ys) + 0.15 * span)
    corners = [c for shape in scene.shapes if shape.form == "rectangle" for c in (shape.corner_low, shape.corner_high)]
    corners += [(x, y) for x, y in zip(xs, ys)]
    whole_span = max(max(c[0] for c in corners) - min(c[0] for c in corners),
                     max(c[1] for c in corners) - min(c[1] for c in corners))
    if whole_span < 2.5 * span:
        return None
    kept = []
    for shape in scene.shapes:
        if shape.form == "circle":
            inside = low[0] <= shape.centre[0] <= high[0] and low[1] <= shape.centre[1] <= high[1]
            kept += [shape] if inside else []
        elif shape.form == "rectangle":
            clipped = _clip_rectangle(shape, low, high)
            kept += [clipped] if clipped is not None else []
    return type(scene)(view=scene.view, title=scene.title.replace(",", ", close-up,", 1), shapes=tuple(kept),
                       lines=scene.lines)


def scenes_from_setup(setup, assessment) -> dict:
    """{view: [MapScene, ...]} for the views that have contour lines: the whole setup, then a
    close-up of the keep-out lines when they are small on it."""
    scenes = {}
    for view in ("plan", "elevation"):
        contours = [c for c in getattr(assessment, "contours", []) if c.view == view and c.lines]
        if not contours:
            continue
        first, second = _PLANE[view]
        shapes = []
        for zone in setup.zones:
            low, high = zone.corner_from, zone.corner_to
            shapes.append(Shape(kind="zone", form="rectangle", label=zone.id,
                                corner_low=(min(low[first], high[first]), min(low[second], high[second])),
                                corner_high=(max(low[first], high[first]), max(low[second], high[second]))))
        for coil in setup.coils:
            outer = coil.outer_diameter or coil.inner_diameter
            shapes.append(_round_part("coil", coil.id, coil.at, outer / 2, coil.length, coil.axis, view))
        shapes += [_magnet_shape(magnet, view) for magnet in setup.magnets]
        lines = []
        for contour in contours:
            reach = [k.distance_m for k in getattr(assessment, "keep_out", [])
                     if k.threshold_id == contour.threshold_id and math.isfinite(k.distance_m)]
            distance = f"keep-out up to {quantity(max(reach), 'm')}" if reach else ""
            lines.append(KeepOutLine(polylines=tuple(tuple(map(tuple, line)) for line in contour.lines),
                                     threshold_label=quantity(contour.threshold_T, "T").replace("µ", "u"),
                                     distance_label=distance))
        offset = contours[0].plane_offset_m
        where = f"height z = {quantity(offset, 'm')}" if view == "plan" else f"plane y = {quantity(offset, 'm')}"
        title = ("Plan, seen from above" if view == "plan" else "Elevation, seen from the front") + f", {where}"
        whole = MapScene(view=view, title=title.replace("µ", "u"), shapes=tuple(shapes), lines=tuple(lines))
        close = _close_up(whole, contours)
        scenes[view] = [whole] + ([close] if close is not None else [])
    return scenes
