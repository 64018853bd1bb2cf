"""To-scale field map: magnets, steel, coils, zones and keep-out lines as a vector drawing.

Input is plain data (:class:`MapScene`) in metres, in the plane coordinates of the view: plan
(x along the bench, y across it) or elevation (x along the bench, z up). Nothing here computes
physics or reads a setup. Output: a reportlab ``Drawing``, written as SVG or PDF.

Every line style differs in dash pattern as well as colour, so the map reads in black and white.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from reportlab.graphics import renderPDF, renderSVG
from reportlab.graphics.shapes import Circle, Drawing, Group, Line, PolyLine, Polygon, Rect, String
from reportlab.lib import colors

POINTS_PER_METRE = 72 / 0.0254

KIND_STYLE = {  # fill, stroke, width, dash
    "magnet": (colors.Color(0.80, 0.80, 0.80), colors.black, 1.4, None),
    "steel": (colors.Color(0.93, 0.93, 0.93), colors.Color(0.25, 0.25, 0.25), 1.0, (6, 2, 1, 2)),
    "coil": (None, colors.Color(0.45, 0.25, 0.05), 1.0, (1, 2)),
    "conductor": (colors.Color(0.98, 0.93, 0.88), colors.Color(0.65, 0.35, 0.10), 1.0, None),
    "zone": (colors.Color(0.93, 0.96, 1.0), colors.Color(0.15, 0.25, 0.55), 0.8, (4, 3)),
}
KIND_WORDS = {"magnet": "magnet", "steel": "steel part", "coil": "coil", "conductor": "tube or sheet (conductor)",
              "zone": "people / equipment zone"}
LINE_STYLES = [  # stroke colour, dash pattern, width
    (colors.Color(0.70, 0.10, 0.10), None, 1.6),
    (colors.Color(0.05, 0.35, 0.55), (7, 3), 1.4),
    (colors.Color(0.40, 0.20, 0.55), (2, 2), 1.4),
    (colors.Color(0.10, 0.45, 0.20), (8, 2, 2, 2), 1.2),
    (colors.Color(0.60, 0.40, 0.00), (4, 2, 1, 2, 1, 2), 1.2),
    (colors.Color(0.30, 0.30, 0.30), (1, 3), 1.2),
]
VIEW_AXES = {"plan": ("x, along the bench", "y, across"), "elevation": ("x, along the bench", "z, up")}


@dataclass(frozen=True)
class Shape:
    """One outline in plane coordinates [m].

    kind: "magnet", "steel", "coil", "conductor" or "zone". form: "circle" (centre, radius),
    "rectangle" (corner_low, corner_high) or "polygon" (points (n, 2)).
    """

    kind: str
    form: str
    label: str = ""
    centre: tuple = (0.0, 0.0)
    radius: float = 0.0
    corner_low: tuple = (0.0, 0.0)
    corner_high: tuple = (0.0, 0.0)
    points: tuple = ()


@dataclass(frozen=True)
class KeepOutLine:
    """Closed polylines of one threshold, with its wording, e.g. "0.5 mT", "keep-out 31 cm"."""

    polylines: tuple
    threshold_label: str
    distance_label: str = ""


@dataclass(frozen=True)
class MapScene:
    """Everything one map shows. ``view`` is "plan" or "elevation"; lengths in metres."""

    view: str
    title: str
    shapes: tuple = ()
    lines: tuple = ()
    notes: tuple = field(default=())


def round_length(longest: float) -> float:
    """Largest 1, 2 or 5 times a power of ten not above ``longest`` [m].

    >>> round_length(0.37), round_length(0.09), round_length(1.0)
    (0.2, 0.05, 1.0)
    """
    power = 10 ** math.floor(math.log10(longest))
    return float(max(step * power for step in (1, 2, 5) if step * power <= longest * (1 + 1e-12)))


def _scene_box(scene):
    points = []
    for shape in scene.shapes:
        if shape.form == "circle":
            c, r = np.asarray(shape.centre), shape.radius
            points += [c - r, c + r]
        elif shape.form == "rectangle":
            points += [np.asarray(shape.corner_low), np.asarray(shape.corner_high)]
        else:
            points += list(np.asarray(shape.points, dtype=float))
    for line in scene.lines:
        for polyline in line.polylines:
            points += list(np.asarray(polyline, dtype=float))
    if not points:
        return np.array([-0.1, -0.1]), np.array([0.1, 0.1])
    points = np.array(points)
    low, high = points.min(axis=0), points.max(axis=0)
    pad = 0.06 * max(high - low) + 1e-3
    return low - pad, high + pad


def _style(node, stroke, width, dash, fill=None):
    node.strokeColor, node.strokeWidth, node.strokeDashArray = stroke, width, dash
    if not isinstance(node, (PolyLine, Line)):
        node.fillColor = fill
    return node


def build_drawing(scene: MapScene, width_mm: float = 180.0, max_height_mm: float = 200.0) -> Drawing:
    """Lay out the scene to scale in a reportlab Drawing (page units: points)."""
    low, high = _scene_box(scene)
    span = high - low
    width_pt, height_pt = width_mm / 25.4 * 72, max_height_mm / 25.4 * 72
    scale = min(width_pt / span[0], height_pt / span[1])  # points per metre of the setup
    left, bottom, top_band = 30.0, 46.0, 30.0
    legend_rows = len(scene.lines) + len({shape.kind for shape in scene.shapes}) + len(scene.notes)
    legend_height = 14.0 * legend_rows + 20
    drawing = Drawing(width_pt + 2 * left, span[1] * scale + bottom + top_band + legend_height)

    def to_page(xy):
        xy = np.asarray(xy, dtype=float).reshape(-1, 2)
        return np.column_stack([left + (xy[:, 0] - low[0]) * scale,
                                legend_height + bottom + (xy[:, 1] - low[1]) * scale])

    frame = Rect(left, legend_height + bottom, span[0] * scale, span[1] * scale)
    drawing.add(_style(frame, colors.Color(0.6, 0.6, 0.6), 0.5, None))
    ratio = POINTS_PER_METRE / scale
    drawing.add(String(left, drawing.height - 18, scene.title, fontName="Helvetica-Bold", fontSize=11))
    drawing.add(String(left, drawing.height - 29, f"{scene.view} view, to scale 1 : {ratio:.3g} when printed at 100 %",
                       fontName="Helvetica", fontSize=8))
    for shape in scene.shapes:
        drawing.add(_shape_node(shape, to_page, scale))
    for number, line in enumerate(scene.lines):
        drawing.add(_keep_out_node(line, LINE_STYLES[number % len(LINE_STYLES)], to_page))
    _add_scale_bar(drawing, left, legend_height + 18, span[0], scale)
    _add_axes(drawing, scene.view, left + span[0] * scale - 95, legend_height + 8)
    _add_legend(drawing, scene, left, legend_height - 4)
    return drawing


def _shape_node(shape, to_page, scale):
    fill, stroke, width, dash = KIND_STYLE.get(shape.kind, KIND_STYLE["zone"])
    group = Group()
    if shape.form == "circle":
        (cx, cy), = to_page(shape.centre)
        node = Circle(cx, cy, max(shape.radius * scale, 0.8))
        anchor = (cx + shape.radius * scale + 2, cy + 2)
    elif shape.form == "rectangle":
        (x0, y0), (x1, y1) = to_page([shape.corner_low, shape.corner_high])
        node = Rect(min(x0, x1), min(y0, y1), max(abs(x1 - x0), 0.8), max(abs(y1 - y0), 0.8))
        anchor = (max(x0, x1) + 2, max(y0, y1) - 8) if shape.kind != "zone" else (min(x0, x1) + 3, max(y0, y1) - 9)
    else:
        page = to_page(shape.points)
        node = Polygon([float(v) for v in page.ravel()])
        anchor = (page[:, 0].max() + 2, page[:, 1].max() - 8)
    group.add(_style(node, stroke, width, dash, fill))
    if shape.label:
        group.add(String(anchor[0], anchor[1], shape.label, fontName="Helvetica", fontSize=7,
                         fillColor=stroke))
    return group


def _keep_out_node(line, style, to_page):
    stroke, dash, width = style
    group = Group()
    best = None
    for polyline in line.polylines:
        page = to_page(polyline)
        group.add(_style(PolyLine([float(v) for v in page.ravel()]), stroke, width, dash))
        topmost = page[np.argmax(page[:, 1])]
        if best is None or topmost[1] > best[1]:
            best = topmost
    if best is not None:
        text = line.threshold_label + (f", {line.distance_label}" if line.distance_label else "")
        label = String(best[0], best[1] + 3, text, fontName="Helvetica", fontSize=7, fillColor=stroke,
                       textAnchor="middle")
        box = label.getBounds()
        group.add(_style(Rect(box[0] - 1.5, box[1] - 1, box[2] - box[0] + 3, box[3] - box[1] + 2),
                         None, 0, None, colors.white))
        group.add(label)
    return group


def _add_scale_bar(drawing, x, y, span_x, scale):
    length = round_length(span_x / 4)
    bar = length * scale
    for k in range(2):
        fill = colors.black if k == 0 else colors.white
        drawing.add(_style(Rect(x + k * bar / 2, y, bar / 2, 4), colors.black, 0.6, None, fill))
    words = f"{length * 100:g} cm" if length < 1 else f"{length:g} m"
    drawing.add(String(x, y + 7, "0", fontName="Helvetica", fontSize=7, textAnchor="middle"))
    drawing.add(String(x + bar, y + 7, words, fontName="Helvetica", fontSize=7, textAnchor="middle"))


def _add_axes(drawing, view, x, y):
    across, up = VIEW_AXES[view]
    for dx, dy, text, tx, ty in ((22, 0, across, x + 25, y - 3), (0, 22, up, x - 4, y + 26)):
        drawing.add(_style(Line(x, y, x + dx, y + dy), colors.black, 0.8, None))
        tip = (x + dx, y + dy)
        head = [tip[0], tip[1], tip[0] - 4 * (dx > 0) - 2 * (dy > 0), tip[1] - 4 * (dy > 0) - 2 * (dx > 0),
                tip[0] - 4 * (dx > 0) + 2 * (dy > 0), tip[1] - 4 * (dy > 0) + 2 * (dx > 0)]
        drawing.add(_style(Polygon(head), colors.black, 0.5, None, colors.black))
        drawing.add(String(tx, ty, text, fontName="Helvetica", fontSize=7))


def _add_legend(drawing, scene, x, top):
    y = top
    drawing.add(String(x, y, "Key", fontName="Helvetica-Bold", fontSize=8))
    for number, line in enumerate(scene.lines):
        y -= 14
        stroke, dash, width = LINE_STYLES[number % len(LINE_STYLES)]
        drawing.add(_style(Line(x, y + 3, x + 30, y + 3), stroke, width, dash))
        text = f"field reaches {line.threshold_label} inside this line"
        text += f" ({line.distance_label})" if line.distance_label else ""
        drawing.add(String(x + 38, y, text, fontName="Helvetica", fontSize=7.5))
    present = {shape.kind for shape in scene.shapes}
    for kind, (fill, stroke, width, dash) in KIND_STYLE.items():
        if kind not in present:
            continue
        y -= 14
        drawing.add(_style(Rect(x + 8, y - 1, 14, 8), stroke, width, dash, fill))
        drawing.add(String(x + 38, y, KIND_WORDS[kind], fontName="Helvetica", fontSize=7.5))
    for note in scene.notes:
        y -= 14
        drawing.add(String(x, y, note, fontName="Helvetica-Oblique", fontSize=7))


def write_svg(scene: MapScene, path) -> None:
    """Write the map as an SVG file."""
    renderSVG.drawToFile(build_drawing(scene), str(path))


def write_pdf(scene: MapScene, path) -> None:
    """Write the map as a one-page PDF file."""
    renderPDF.drawToFile(build_drawing(scene), str(path), autoSize=1)


def svg_text(scene: MapScene) -> str:
    """The map as SVG text."""
    return renderSVG.drawToString(build_drawing(scene))
