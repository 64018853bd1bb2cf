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


def _box(kind: str, label: str, low, high, view: str):
    """Rectangle of the 3-D box [low, high] seen in ``view``."""
    first, second = _PLANE[view]
    return Shape(kind=kind, form="rectangle", label=label, corner_low=(low[first], low[second]),
                 corner_high=(high[first], high[second]))


def _steel_surface_shape(surface, view: str, span):
    """(shape, note) of a steel face: its [length, width] around ``at`` and its thickness behind.

    A face given without a size is large. Seen edge-on it is drawn across ``span`` (the
    extent of the rest of the map, 3-D corners (low, high)); lying in the drawing plane it
    would cover the whole map and hide the zones, so it gets a note instead of a shape.
    """
    along = _axis_index(surface.normal)
    at = list(surface.at)
    first, second = _PLANE[view]
    if along is None:  # a tilted face: the circle around its given size, or a note for a large one
        if surface.size is None:
            return None, f"{surface.id}: a large tilted steel face through the map (not drawn)"
        return Shape(kind="steel", form="circle", label=surface.id, centre=(at[first], at[second]),
                     radius=math.hypot(*surface.size) / 2), None
    if surface.size is None and along not in (first, second):
        axis = "xyz"[along]
        return None, (f"{surface.id}: a large steel face parallel to this view at {axis} = "
                      f"{quantity(at[along], 'm')}, under or over the whole map (not drawn)").replace("µ", "u")
    low, high = list(span[0]), list(span[1])
    in_face = [i for i in range(3) if i != along]
    if surface.size is not None:
        for index, extent in zip(in_face, surface.size):
            low[index], high[index] = at[index] - extent / 2, at[index] + extent / 2
    behind = -math.copysign(surface.thickness, surface.normal[along])
    low[along], high[along] = min(at[along], at[along] + behind), max(at[along], at[along] + behind)
    return _box("steel", surface.id, low, high, view), None


def _loose_steel_shape(item, view: str):
    """A loose item as the circle that encloses it (its orientation on the bench is not given)."""
    first, second = _PLANE[view]
    if item.shape == "sphere":
        radius = item.diameter / 2
    elif item.shape == "rod":
        radius = math.hypot(item.length, item.diameter) / 2
    else:
        radius = math.hypot(item.length, item.width, item.thickness) / 2
    return Shape(kind="steel", form="circle", label=item.id, centre=(item.at[first], item.at[second]), radius=radius)


def _conductor_shape(part, view: str):
    if part.kind == "tube":
        return _round_part("conductor", part.id, part.at, part.outer_diameter / 2, part.length, part.axis, view)
    half = (part.size[0] / 2, part.size[1] / 2, part.thickness / 2)  # a sheet lies flat: size along x and y
    return _box("conductor", part.id, [c - h for c, h in zip(part.at, half)], [c + h for c, h in zip(part.at, half)],
                view)


def _span(setup, contours, view):
    """3-D corners (low, high) around the magnets, zones and the view's lines, for large steel faces."""
    points = [list(m.at) for m in setup.magnets]
    points += [list(corner) for zone in setup.zones for corner in (zone.corner_from, zone.corner_to)]
    first, second = _PLANE[view]
    for contour in contours:
        for line in contour.lines:
            for u, v in line:
                point = list(setup.magnets[0].at) if setup.magnets else [0.0, 0.0, 0.0]
                point[first], point[second] = u, v
                points.append(point)
    low = [min(p[i] for p in points) for i in range(3)]
    high = [max(p[i] for p in points) for i in range(3)]
    return low, high


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
                       lines=scene.lines, notes=scene.notes)


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
        span = _span(setup, contours, view)
        steel = [_steel_surface_shape(surface, view, span) for surface in getattr(setup, "steel_surfaces", [])]
        shapes += [shape for shape, _ in steel if shape is not None]
        notes = tuple(note for _, note in steel if note is not None)
        shapes += [_conductor_shape(part, view) for part in getattr(setup, "conductors", [])]
        shapes += [_loose_steel_shape(item, view) for item in getattr(setup, "loose_steel", [])]
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
        whole = MapScene(view=view, title=title.replace("µ", "u"), shapes=tuple(shapes), lines=tuple(lines),
                         notes=notes)
        close = _close_up(whole, contours)
        scenes[view] = [whole] + ([close] if close is not None else [])
    return scenes
