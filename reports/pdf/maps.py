"""To-scale plan and elevation maps of the keep-out lines (Contour data of the Assessment).

When ``reports.field_map`` is available its drawing is used; otherwise a plain to-scale drawing
of the contour lines is made here: equal scales on both axes, a scale bar, axis ticks in
metres, one dash pattern per threshold and a key.
"""
from __future__ import annotations

import math

from reportlab.graphics.shapes import Drawing, Line, PolyLine, Rect, String
from reportlab.lib import colors
from reportlab.lib.units import mm

from reports.pdf.inputs import ReportInputs
from reports.pdf.styles import Styles

VIEWS = (("plan", "Plan (seen from above)", "x", "y"), ("elevation", "Elevation (seen from the front)", "x", "z"))
_DASHES = [None, (4, 2), (1.5, 1.5), (6, 2, 1.5, 2), (8, 3)]
_GREYS = [colors.black, colors.Color(0.25, 0.25, 0.25), colors.Color(0.4, 0.4, 0.4),
          colors.Color(0.15, 0.15, 0.15), colors.Color(0.5, 0.5, 0.5)]


def _nice_step(span: float) -> float:
    """A 1-2-5 step giving about five ticks over `span` metres."""
    raw = span / 5 if span > 0 else 0.1
    power = 10 ** math.floor(math.log10(raw))
    for factor in (1, 2, 5, 10):
        if raw <= factor * power:
            return factor * power
    return 10 * power


def _ticks(low: float, high: float, step: float) -> list[float]:
    """Multiples of `step` within [low, high], computed from integers so 0 prints as 0."""
    first, last = math.ceil(low / step - 1e-9), math.floor(high / step + 1e-9)
    return [round(k * step, 12) + 0.0 for k in range(first, last + 1)]


def _metres(value: float) -> str:
    return f"{value:g} m" if abs(value) >= 1 or value == 0 else f"{value * 1000:g} mm"


def contour_drawing(contours: list, font: str, width: float = 170 * mm, height: float = 95 * mm,
                    axis_names: tuple[str, str] = ("x", "y")) -> Drawing | None:
    """A to-scale drawing of the contour lines of one view, or None if they hold no points."""
    points = [p for c in contours for line in c.lines for p in line]
    if not points:
        return None
    xs, ys = [p[0] for p in points], [p[1] for p in points]
    x0, x1, y0, y1 = min(xs), max(xs), min(ys), max(ys)
    pad = 0.08 * max(x1 - x0, y1 - y0, 0.02)
    x0, x1, y0, y1 = x0 - pad, x1 + pad, y0 - pad, y1 + pad
    key_height = 10 + 9 * len(contours)
    margin_left, margin_bottom = 28, 22 + key_height
    plot_w, plot_h = width - margin_left - 6, height - margin_bottom - 6
    scale = min(plot_w / (x1 - x0), plot_h / (y1 - y0))        # points per metre, same both ways
    origin_x = margin_left + (plot_w - scale * (x1 - x0)) / 2
    origin_y = margin_bottom + (plot_h - scale * (y1 - y0)) / 2

    def at(x: float, y: float) -> tuple[float, float]:
        return origin_x + (x - x0) * scale, origin_y + (y - y0) * scale

    drawing = Drawing(width, height)
    left, bottom = at(x0, y0)
    right, top = at(x1, y1)
    drawing.add(Rect(left, bottom, right - left, top - bottom, strokeColor=colors.Color(0.7, 0.7, 0.7),
                     fillColor=None, strokeWidth=0.4))
    step = _nice_step(max(x1 - x0, y1 - y0))
    for tick in _ticks(x0, x1, step):
        px, _ = at(tick, y0)
        drawing.add(Line(px, bottom, px, bottom - 3, strokeWidth=0.4))
        drawing.add(String(px, bottom - 10, f"{tick:.3g}", fontName=font, fontSize=6, textAnchor="middle"))
    for tick in _ticks(y0, y1, step):
        _, py = at(x0, tick)
        drawing.add(Line(left, py, left - 3, py, strokeWidth=0.4))
        drawing.add(String(left - 4, py - 2, f"{tick:.3g}", fontName=font, fontSize=6, textAnchor="end"))
    drawing.add(String((left + right) / 2, bottom - 19, f"{axis_names[0]} [m]", fontName=font, fontSize=7,
                       textAnchor="middle"))
    drawing.add(String(left - 22, top - 8, f"{axis_names[1]} [m]", fontName=font, fontSize=7))
    for index, contour in enumerate(contours):
        dash, grey = _DASHES[index % len(_DASHES)], _GREYS[index % len(_GREYS)]
        for line in contour.lines:
            flat = [coordinate for x, y in line for coordinate in at(x, y)]
            if len(flat) >= 4:
                drawing.add(PolyLine(flat, strokeColor=grey, strokeWidth=0.9, strokeDashArray=dash))
        key_y = key_height - 9 * (index + 1)
        drawing.add(Line(margin_left, key_y + 2.5, margin_left + 22, key_y + 2.5, strokeColor=grey,
                         strokeWidth=0.9, strokeDashArray=dash))
        drawing.add(String(margin_left + 26, key_y, _key_text(contour), fontName=font, fontSize=7))
    bar = step
    drawing.add(Line(right - bar * scale, 4, right, 4, strokeWidth=1.2))
    drawing.add(String(right - bar * scale / 2, 7, _metres(bar), fontName=font, fontSize=6, textAnchor="middle"))
    return drawing


def _key_text(contour) -> str:
    from reports.pdf.formatting import quantity

    return f"{contour.threshold_id.replace('_', ' ')}: |B| = {quantity(contour.threshold_T, 'T')}"


def _field_map_drawings(inputs: ReportInputs, view: str, width: float) -> list:
    """The shared map drawings of ``reports.field_map`` for this view (whole setup, close-up)."""
    scenes = (inputs.map_scenes or {}).get(view) or []
    if not scenes:
        return []
    from reports.field_map import build_drawing

    return [build_drawing(scene, width_mm=width / mm - 22, max_height_mm=105.0) for scene in scenes]


def maps_section(inputs: ReportInputs, s: Styles) -> list:
    story = [s.para("Keep-out maps", s.heading)]
    drawn = False
    for view, caption, first_axis, second_axis in VIEWS:
        contours = [c for c in inputs.assessment.contours if c.view == view]
        drawings = _field_map_drawings(inputs, view, 174 * mm)
        if not drawings and contours:
            offset = contours[0].plane_offset_m
            where = f"at height z = {_metres(offset)}" if view == "plan" else f"in the plane y = {_metres(offset)}"
            story.append(s.para(f"{caption}, {where}; to scale, both axes in metres.", s.subheading))
            drawings = [d for d in [contour_drawing(contours, s.fonts.regular, axis_names=(first_axis, second_axis))]
                        if d is not None]
        story += drawings
        drawn = drawn or bool(drawings)
    if not drawn:
        story.append(s.para("No contour lines were computed for this setup, so no map is drawn."))
    else:
        story.append(s.para("Each line encloses the region where the field magnitude is at or above the "
                            "stated value. Mark the outermost relevant line on the floor or bench.", s.small))
    return story
