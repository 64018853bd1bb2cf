"""To-scale plan and elevation keep-out maps in the PDF: the shared drawing of ``reports.field_map``.

The scenes (outlines of the setup's parts plus the Assessment's contour lines) come from
``reports.pdf.scenes``; this module only places them in the document.
"""
from __future__ import annotations

from reportlab.lib.units import mm

from reports.field_map import build_drawing
from reports.pdf.inputs import ReportInputs
from reports.pdf.styles import Styles

VIEWS = ("plan", "elevation")


def _field_map_drawings(inputs: ReportInputs, view: str, width: float) -> list:
    """The map drawings for this view (whole setup, then a close-up when the lines are small)."""
    scenes = (inputs.map_scenes or {}).get(view) or []
    return [build_drawing(scene, width_mm=width / mm - 22, max_height_mm=105.0) for scene in scenes]


def maps_section(inputs: ReportInputs, s: Styles) -> list:
    story = [s.para("Keep-out maps", s.heading)]
    drawn = False
    for view in VIEWS:
        drawings = _field_map_drawings(inputs, view, 174 * mm)
        story += drawings
        drawn = drawn or bool(drawings)
    if not drawn:
        story.append(s.para("No contour lines were computed for this setup, so no map is drawn."))
    else:
        story.append(s.para("Each line encloses the region where the field magnitude is at or above the "
                            "stated value. Mark the outermost relevant line on the floor or bench.", s.small))
    return story
