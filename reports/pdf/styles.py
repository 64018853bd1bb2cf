"""Paragraph and table styles of the report: plain black on white, grey rules, no colour codes."""
from __future__ import annotations

from reportlab.lib import colors
from reportlab.lib.enums import TA_LEFT
from reportlab.lib.styles import ParagraphStyle
from reportlab.lib.units import mm
from reportlab.platypus import Flowable, Paragraph, Table, TableStyle

from reports.pdf.fonts import Fonts, safe, safe_with_code

PAGE_MARGIN = 18 * mm
RULE_GREY = colors.Color(0.6, 0.6, 0.6)
HEADING_FILL = colors.Color(0.9, 0.9, 0.9)
NOTE_FILL = colors.Color(0.96, 0.96, 0.96)


class Styles:
    """The paragraph styles for one set of fonts."""

    def __init__(self, fonts: Fonts):
        self.fonts = fonts
        body = ParagraphStyle("body", fontName=fonts.regular, fontSize=9, leading=11.5, alignment=TA_LEFT,
                              spaceAfter=3)
        self.body = body
        self.small = ParagraphStyle("small", parent=body, fontSize=7.5, leading=9.5, spaceAfter=0)
        self.cell = ParagraphStyle("cell", parent=body, fontSize=7.5, leading=9, spaceAfter=0)
        self.cell_bold = ParagraphStyle("cell_bold", parent=self.cell, fontName=fonts.bold)
        self.title = ParagraphStyle("title", parent=body, fontName=fonts.bold, fontSize=18, leading=22,
                                    spaceAfter=8)
        self.heading = ParagraphStyle("heading", parent=body, fontName=fonts.bold, fontSize=13, leading=16,
                                      spaceBefore=8, spaceAfter=5, keepWithNext=1)
        self.subheading = ParagraphStyle("subheading", parent=body, fontName=fonts.bold, fontSize=10,
                                         leading=13, spaceBefore=6, spaceAfter=3, keepWithNext=1)
        self.bullet = ParagraphStyle("bullet", parent=body, leftIndent=10, bulletIndent=2, spaceAfter=1.5)

    def para(self, text, style=None, code: bool = False) -> Paragraph:
        """A paragraph of plain text (escaped); with ``code``, ids between backticks in Courier."""
        return Paragraph(self.text(text, code), style or self.body)

    def text(self, text, code: bool = False) -> str:
        """Plain text as escaped markup; with ``code``, ids between backticks set in Courier."""
        return safe_with_code(text, self.fonts) if code else safe(text, self.fonts)

    def markup(self, markup: str, style=None) -> Paragraph:
        """A paragraph of markup the report itself wrote (its variable parts already escaped)."""
        return Paragraph(markup, style or self.body)

    def bullets(self, items, style=None, code: bool = False) -> list[Paragraph]:
        return [Paragraph(self.text(item, code), style or self.bullet, bulletText="•") for item in items]

    def table(self, header: list[str], rows: list[list], widths: list[float], repeat: int = 1,
              code: bool = False) -> Table:
        """A grid table; header and string cells are escaped and wrapped (``code``: see :meth:`text`)."""
        def cell(value, style):
            if isinstance(value, Flowable):
                return value
            return Paragraph(self.text(value, code), style)

        data = [[cell(h, self.cell_bold) for h in header]]
        data += [[cell(value, self.cell) for value in row] for row in rows]
        table = Table(data, colWidths=widths, repeatRows=repeat, hAlign="LEFT")
        table.setStyle(TableStyle([
            ("GRID", (0, 0), (-1, -1), 0.4, RULE_GREY),
            ("BACKGROUND", (0, 0), (-1, 0), HEADING_FILL),
            ("VALIGN", (0, 0), (-1, -1), "TOP"),
            ("LEFTPADDING", (0, 0), (-1, -1), 3),
            ("RIGHTPADDING", (0, 0), (-1, -1), 3),
            ("TOPPADDING", (0, 0), (-1, -1), 2),
            ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
        ]))
        return table


class TickBox(Flowable):
    """An empty square to tick by hand."""

    def __init__(self, size: float = 3.2 * mm):
        super().__init__()
        self.size = size
        self.width = self.height = size

    def wrap(self, available_width, available_height):
        return self.size, self.size

    def draw(self):
        self.canv.setLineWidth(0.7)
        self.canv.rect(0, 0, self.size, self.size, stroke=1, fill=0)
