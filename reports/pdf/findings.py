"""The findings: each with its severity, why it matters, the figures behind it and its cautions."""
from __future__ import annotations

from reportlab.lib.units import mm
from reportlab.platypus import KeepTogether

from reports.pdf import finding_fields as ff
from reports.pdf.fonts import safe, safe_with_code
from reports.pdf.inputs import ReportInputs
from reports.pdf.styles import Styles


def findings_section(inputs: ReportInputs, s: Styles) -> list:
    story = [s.para("Findings", s.heading)]
    findings = ff.ordered(inputs.findings)
    if not findings:
        story.append(s.para("The rules raised no findings for this setup."))
        return story
    deferrals = [ff.text_of(getattr(f, "deferral", "")) for f in findings]
    common = deferrals[0] if deferrals and all(d == deferrals[0] for d in deferrals) else ""
    if common:
        story.append(s.para(common, s.small))
    for number, finding in enumerate(findings, start=1):
        first = "Settle before work starts. " if ff.blocking(finding) else ""
        head = s.markup(f"{number}. {safe_with_code(ff.title(finding), s.fonts, bold=True)}", s.subheading)
        meaning = ff.severity_meaning(ff.severity(finding))
        severity_text = ff.severity(finding) + (f" ({meaning})" if meaning else "")
        label = s.markup(f"<b>{safe(first + 'Severity: ' + severity_text, s.fonts)}</b>"
                         f"  <font size='7'>[{safe(ff.text_of(getattr(finding, 'id', '')), s.fonts)}]</font>",
                         s.body)
        block = [head, label]
        why = ff.text_of(getattr(finding, "why", ""))
        if why:
            block.append(s.para(why, code=True))
        figures = ff.figures(finding)
        if figures:
            block.append(s.table(["Figure", "Value"], [[label_text, value] for label_text, value in figures],
                                 [80 * mm, 70 * mm], code=True))
        story.append(KeepTogether(block))
        cautions = ff.cautions(finding)
        if cautions:
            story.append(s.para("Cautions", s.body))
            story += s.bullets(cautions, code=True)
        sources = ff.sources(finding)
        if sources:
            story.append(s.para("Sources: " + "; ".join(sources), s.small))
        deferral = ff.text_of(getattr(finding, "deferral", ""))
        if deferral and deferral != common:
            story.append(s.para(deferral, s.small))
    return story
