"""Methods and assumptions, the thresholds with their sources, references, and the deferral."""
from __future__ import annotations

from reportlab.lib.units import mm

from reports.pdf import finding_fields as ff
from reports.pdf.inputs import ReportInputs
from reports.pdf.styles import Styles
from reports.pdf.tables import threshold_value_text

DEFERRAL = (
    "This checklist is a planning aid. Its figures come from published models and cited thresholds, "
    "applied to the setup exactly as written in the file; they are estimates, chosen to err on the safe "
    "side where the text says so, and they do not replace measurement. Local law and codes, the site's "
    "own rules and the decisions of its competent persons (radiation or laser safety officers, electrical "
    "safety officers, occupational physicians, the person in charge of the room) take precedence over "
    "anything in this document. Where they differ, follow them. Anyone with an active medical implant "
    "should follow the advice of their physician and the implant's maker, whatever this document says."
)


def methods_section(inputs: ReportInputs, s: Styles) -> list:
    assessment = inputs.assessment
    story = [s.para("Methods and assumptions", s.heading)]
    if assessment.assumptions:
        story.append(s.para("Each assumption below says which way it makes the figures err.", s.small))
        story += s.bullets(assessment.assumptions)
    else:
        story.append(s.para("The assessment lists no assumptions."))
    if assessment.notes:
        story.append(s.para("Notes from the assessment", s.subheading))
        story += s.bullets(assessment.notes)
    if inputs.setup_notes:
        story.append(s.para("Notes in the setup file", s.subheading))
        story.append(s.para(inputs.setup_notes))
    return story


def threshold_rows(inputs: ReportInputs) -> list[list[str]]:
    rows = []
    for t in inputs.assessment.thresholds:
        origin = "site rules" if t.origin == "site" else "default table"
        if t.origin == "site" and t.reason:
            origin += f" (reason: {t.reason})"
        rows.append([t.id.replace("_", " "), threshold_value_text(t), t.applies_to, t.source, t.confidence, origin])
    return rows


def references_section(inputs: ReportInputs, s: Styles) -> list:
    assessment = inputs.assessment
    story = [s.para("Thresholds and their sources", s.heading)]
    rows = threshold_rows(inputs)
    if rows:
        story.append(s.table(["Threshold", "Value", "Applies to", "Source", "Confidence", "Taken from"], rows,
                             [26 * mm, 16 * mm, 34 * mm, 52 * mm, 22 * mm, 24 * mm]))
    else:
        story.append(s.para("No thresholds were used."))
    used = ({k.threshold_id for k in assessment.keep_out} | {c.threshold_id for c in assessment.contours}
            | {z.threshold_id for z in assessment.zone_reach})
    threshold_sources = [t.source for t in assessment.thresholds if t.id in used and t.source]
    references = list(dict.fromkeys(list(assessment.references) + threshold_sources
                                    + [src for f in ff.ordered(inputs.findings) for src in ff.sources(f)]))
    story.append(s.para("References", s.heading))
    if references:
        story += [s.para(f"[{number}] {text}", s.small) for number, text in enumerate(references, start=1)]
    else:
        story.append(s.para("The assessment lists no references."))
    story.append(s.para("What this document does not replace", s.heading))
    story.append(s.para(DEFERRAL))
    if inputs.competent_persons:
        story.append(s.para("Competent persons named in the site rules", s.subheading))
        story += s.bullets(f"{name}, {role}" for name, role in inputs.competent_persons)
    return story
