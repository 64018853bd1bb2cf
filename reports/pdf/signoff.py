"""The sign-off block: prepared, reviewed and approved, filled from the register where signed."""
from __future__ import annotations

import datetime

from reportlab.lib.units import mm
from reportlab.platypus import KeepTogether, Paragraph, Table, TableStyle

from reports.pdf.fonts import safe
from reports.pdf.inputs import ReportInputs
from reports.pdf.styles import HEADING_FILL, RULE_GREY, Styles
from reports.register import STAGES


def _months(seconds: float) -> str:
    months = seconds / (365.25 * 86400 / 12)
    if abs(months - round(months)) < 0.01:
        return f"{int(round(months))} months"
    return f"{seconds / 86400:.0f} days"


def signoff_section(inputs: ReportInputs, s: Styles) -> list:
    latest = {}
    for row in inputs.signoffs:
        latest[row.stage] = row            # rows come oldest first: keep the latest of each stage
    header = ["Step", "Name", "Role", "Date", "Signature"]
    data = [[Paragraph(safe(h, s.fonts), s.cell_bold) for h in header]]
    for stage in STAGES:
        row = latest.get(stage)
        cells = [stage.capitalize(), row.name if row else "", row.role if row else "",
                 row.signed_at[:10] if row else "", ""]
        data.append([Paragraph(safe(c, s.fonts), s.cell) for c in cells])
    table = Table(data, colWidths=[22 * mm, 44 * mm, 44 * mm, 24 * mm, 40 * mm],
                  rowHeights=[None] + [13 * mm] * len(STAGES), hAlign="LEFT")
    table.setStyle(TableStyle([("GRID", (0, 0), (-1, -1), 0.5, RULE_GREY),
                               ("BACKGROUND", (0, 0), (-1, 0), HEADING_FILL),
                               ("VALIGN", (0, 1), (-1, -1), "MIDDLE")]))
    interval = _months(inputs.review_interval_s)
    stated = "from the site rules" if inputs.interval_from_site else "the default, as the site rules give none"
    approval = latest.get("approved")
    if approval:
        until = (approval.signed_time + datetime.timedelta(seconds=inputs.review_interval_s)).date().isoformat()
        valid = f"Valid until {until} ({interval} after approval; {stated}), for setup fingerprint {inputs.fingerprint[:12]} only."
    else:
        valid = (f"Valid until: ____________ ({interval} after approval; {stated}), "
                 f"for setup fingerprint {inputs.fingerprint[:12]} only.")
    block = [s.para("Sign-off", s.heading),
             s.para("By signing, each person confirms they have read this checklist for the setup with the "
                    "fingerprint printed on every page, and that the checklist items are done or have been "
                    "decided on by a competent person."),
             table, s.para(valid)]
    if inputs.signoffs:
        block.append(s.para("Entries filled in from the sign-off register.", s.small))
    notes = [f"{row.stage} by {row.name}: {row.note}" for row in inputs.signoffs if row.note]
    block += [s.para(note, s.small) for note in notes]
    if inputs.status is not None and inputs.status.state == "damaged":
        block.append(s.para("Warning: the sign-off register failed its checks, so no entry from it is shown "
                            "as signed.", s.body))
    return [KeepTogether(block)]
