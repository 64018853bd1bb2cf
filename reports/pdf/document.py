"""Assembling the checklist PDF: page frame, header and footer, sections in order, exact bytes.

Reproducible: the document is built in ReportLab's invariant mode with its creation date fixed
to ``$SOURCE_DATE_EPOCH`` (or the moment of building when unset, see
:func:`reports.pdf.inputs.creation_epoch`), so the same setup, version, register entries and
epoch give the same bytes.
"""
from __future__ import annotations

import io
import time

from reportlab.lib.pagesizes import A4
from reportlab.lib.units import mm
from reportlab.lib.utils import TimeStamp
from reportlab.pdfgen.canvas import Canvas
from reportlab.platypus import BaseDocTemplate, Frame, PageBreak, PageTemplate

from reports.fingerprint import short_fingerprint
from reports.pdf.checklist import checklist_section
from reports.pdf.cover import cover
from reports.pdf.findings import findings_section
from reports.pdf.fonts import report_fonts, runs
from reports.pdf.inputs import ReportInputs
from reports.pdf.maps import maps_section
from reports.pdf.methods import methods_section, references_section
from reports.pdf.signoff import signoff_section
from reports.pdf.styles import PAGE_MARGIN, RULE_GREY, Styles
from reports.pdf.tables import figure_tables

PAGE_WIDTH, PAGE_HEIGHT = A4


def _fixed_timestamp(epoch: int) -> TimeStamp:
    """A ReportLab time stamp at `epoch` seconds (UTC), whatever the environment says."""
    stamp = TimeStamp.__new__(TimeStamp)
    stamp.t = epoch
    stamp.lt = time.gmtime(epoch)
    stamp.YMDhms = tuple(stamp.lt)[:6]
    stamp.dhh = stamp.dmm = 0
    stamp.tzname = "UTC"
    return stamp


def _canvas_class(title: str, short: str, fonts, epoch: int):
    """A canvas that holds pages back until the end, so each footer can say "page x of y"."""

    class NumberedCanvas(Canvas):
        def __init__(self, *args, **kwargs):
            kwargs["invariant"] = 1
            super().__init__(*args, **kwargs)
            self._doc._timeStamp = _fixed_timestamp(epoch)
            self._held_pages: list[dict] = []

        def showPage(self):  # noqa: N802 - ReportLab's name
            self._held_pages.append(dict(self.__dict__))
            self._startPage()

        def save(self):
            total = len(self._held_pages)
            for state in self._held_pages:
                self.__dict__.update(state)
                self._frame_page(total)
                Canvas.showPage(self)
            Canvas.save(self)

        def _frame_page(self, total: int) -> None:
            self.saveState()
            self.setStrokeColor(RULE_GREY)
            self.setLineWidth(0.4)
            top = PAGE_HEIGHT - PAGE_MARGIN + 5 * mm
            self.line(PAGE_MARGIN, top - 1.5 * mm, PAGE_WIDTH - PAGE_MARGIN, top - 1.5 * mm)
            self._draw_runs(PAGE_MARGIN, top, _clip(self, title, fonts.regular, 7.5,
                                                    PAGE_WIDTH - 2 * PAGE_MARGIN - 55 * mm))
            self.setFont(fonts.regular, 7.5)
            self.drawRightString(PAGE_WIDTH - PAGE_MARGIN, top, f"setup fingerprint {short}")
            bottom = PAGE_MARGIN - 9 * mm
            self.line(PAGE_MARGIN, bottom + 4 * mm, PAGE_WIDTH - PAGE_MARGIN, bottom + 4 * mm)
            self.drawString(PAGE_MARGIN, bottom, "benchplan pre-work checklist - defers to the site's rules "
                                                 "and competent persons")
            self.drawRightString(PAGE_WIDTH - PAGE_MARGIN, bottom, f"page {self._pageNumber} of {total}")
            self.restoreState()

        def _draw_runs(self, x: float, y: float, text: str) -> None:
            """Draw text in the body font, with CJK runs in their fallback font."""
            for piece, font in runs(text, fonts):
                self.setFont(font, 7.5)
                self.drawString(x, y, piece)
                x += self.stringWidth(piece, font, 7.5)

    return NumberedCanvas


def _clip(canvas, text: str, font: str, size: float, width: float) -> str:
    """Shorten `text` with an ellipsis so it fits `width` points."""
    if canvas.stringWidth(text, font, size) <= width:
        return text
    while text and canvas.stringWidth(text + "…", font, size) > width:
        text = text[:-1]
    return text + "…"


def story(inputs: ReportInputs, styles: Styles) -> list:
    """The flowables of the whole report, in reading order."""
    parts = cover(inputs, styles) + [PageBreak()]
    parts += findings_section(inputs, styles)
    parts += [PageBreak()] + checklist_section(inputs, styles)
    parts += [PageBreak()] + maps_section(inputs, styles)
    parts += figure_tables(inputs, styles)
    parts += [PageBreak()] + methods_section(inputs, styles) + references_section(inputs, styles)
    parts += signoff_section(inputs, styles)
    return parts


def render_pdf(inputs: ReportInputs) -> bytes:
    """The checklist PDF as bytes."""
    fonts = report_fonts()
    styles = Styles(fonts)
    title = inputs.assessment.title
    short = short_fingerprint(inputs.fingerprint)
    buffer = io.BytesIO()
    document = BaseDocTemplate(
        buffer, pagesize=A4, leftMargin=PAGE_MARGIN, rightMargin=PAGE_MARGIN, topMargin=PAGE_MARGIN,
        bottomMargin=PAGE_MARGIN, title=title, author="benchplan", subject=f"setup fingerprint {inputs.fingerprint}",
        creator=f"benchplan {inputs.assessment.program_version}", producer="benchplan (ReportLab)",
        invariant=1)
    frame = Frame(PAGE_MARGIN, PAGE_MARGIN, PAGE_WIDTH - 2 * PAGE_MARGIN, PAGE_HEIGHT - 2 * PAGE_MARGIN,
                  id="body", leftPadding=0, rightPadding=0, topPadding=0, bottomPadding=0)
    document.addPageTemplates([PageTemplate(id="page", frames=[frame])])
    document.build(story(inputs, styles),
                   canvasmaker=_canvas_class(title, short, fonts, inputs.created_epoch))
    return buffer.getvalue()
