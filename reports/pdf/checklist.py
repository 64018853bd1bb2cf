"""The pre-work checklist: one tick box per item, from the findings, the site and general practice."""
from __future__ import annotations

from reportlab.lib.units import mm
from reportlab.platypus import Paragraph, Table, TableStyle

from reports.pdf import finding_fields as ff
from reports.pdf.fonts import safe
from reports.pdf.inputs import ReportInputs
from reports.pdf.styles import RULE_GREY, Styles, TickBox

# General items of common practice for any bench with strong magnets (our own wording).
GENERAL_ITEMS = [
    "Everyone who will handle magnets has read the findings and cautions in this document.",
    "The keep-out lines are marked on the floor or bench, and signs are posted where people enter.",
    "People with pacemakers or other active implants have been told where the keep-out line is.",
    "Loose steel tools and parts are cleared from the bench; non-magnetic tools are at hand.",
    "Magnets are counted out before the work and counted back in afterwards.",
    "Magnets not in use are stored with keepers or spacers, away from the edge of the bench.",
    "Cards, phones, watches and instruments are kept outside the lines stated for them.",
    "A first-aid kit is at hand and everyone knows how to call for help.",
    "The setup on the bench matches this document (same magnets, positions and activities).",
]


def checklist_items(inputs: ReportInputs) -> list[tuple[str, str]]:
    """(item, where it comes from), without repeats, in the order: findings, site, general."""
    seen: set[str] = set()
    result: list[tuple[str, str]] = []

    def add(text: str, origin: str) -> None:
        key = " ".join(str(text).split()).lower()
        if key and key not in seen:
            seen.add(key)
            result.append((str(text), origin))

    for finding in ff.ordered(inputs.findings):
        for item in ff.checklist(finding):
            add(item, ff.title(finding))
    for item in inputs.site_requirements:
        add(item, "site rules")
    for item in inputs.protective_equipment:
        add(f"Protective equipment in use: {item}.", "site rules")
    for item in GENERAL_ITEMS:
        add(item, "general practice")
    return result


def checklist_section(inputs: ReportInputs, s: Styles) -> list:
    story = [s.para("Checklist before work starts", s.heading),
             s.para("Tick each item when it is done. Write down anything that cannot be done, and do not "
                    "start until a competent person has decided what to do about it.", s.small)]
    data = [[Paragraph("", s.cell), Paragraph(safe("Item", s.fonts), s.cell_bold),
             Paragraph(safe("From", s.fonts), s.cell_bold), Paragraph(safe("Initials", s.fonts), s.cell_bold)]]
    for number, (item, origin) in enumerate(checklist_items(inputs), start=1):
        data.append([TickBox(), Paragraph(s.text(f"{number}. {item}", code=True), s.cell),
                     Paragraph(s.text(origin, code=True), s.cell), ""])
    table = Table(data, colWidths=[8 * mm, 110 * mm, 38 * mm, 18 * mm], repeatRows=1, hAlign="LEFT")
    table.setStyle(TableStyle([
        ("LINEBELOW", (0, 0), (-1, -1), 0.4, RULE_GREY),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("TOPPADDING", (0, 0), (-1, -1), 3),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 4),
    ]))
    story.append(table)
    story.append(s.para("Notes", s.subheading))
    notes = Table([[""]] * 4, colWidths=[174 * mm], rowHeights=[8 * mm] * 4, hAlign="LEFT")
    notes.setStyle(TableStyle([("LINEBELOW", (0, 0), (-1, -1), 0.4, RULE_GREY)]))
    story.append(notes)
    return story
