"""First page: what this checklist is for, whom it covers, and what must be settled first."""
from __future__ import annotations

from collections import Counter

from reportlab.lib.units import mm

from reports.pdf import finding_fields as ff
from reports.pdf.fonts import safe
from reports.pdf.inputs import ReportInputs
from reports.pdf.styles import Styles

GROUP_WORDS = {"staff": "staff", "students": "students", "public": "members of the public"}
IMPLANT_WORDS = {"screened_out": "screened out before entry (people with active implants do not enter)",
                 "may_be_present": "may be present (not screened)"}


def audience_text(audience: dict) -> str:
    groups = [GROUP_WORDS.get(group, group) for group in audience.get("groups") or []]
    parts = [", ".join(groups) or "not stated"]
    if audience.get("size"):
        parts.append(f"about {audience['size']} people")
    if audience.get("youngest_age") is not None:
        parts.append(f"youngest {audience['youngest_age']} years")
    return "; ".join(parts)


def cover(inputs: ReportInputs, styles: Styles) -> list:
    assessment = inputs.assessment
    s = styles
    story = [s.para("Pre-work safety checklist", s.subheading), s.para(assessment.title, s.title)]
    rows = [
        ["Site", inputs.site or "not stated"],
        ["Date of the work", inputs.work_date or "not stated"],
        ["Who is present", audience_text(inputs.audience)],
        ["People with active implants", IMPLANT_WORDS.get(inputs.audience.get("implant_wearers"),
                                                          str(inputs.audience.get("implant_wearers") or "not stated"))],
        ["Site rules", inputs.site_rules_name or "none given: default thresholds throughout"],
        ["Program", f"benchplan {assessment.program_version}"],
        ["Setup fingerprint", inputs.fingerprint],
        ["Printed", inputs.created_date],
    ]
    if inputs.status is not None:
        rows.append(["Sign-off state", inputs.status.message])
    story.append(_fact_table(s, rows))
    story.append(s.para(
        "The fingerprint identifies this exact setup file, threshold table and program version. "
        "Any change gives a new fingerprint, and a sign-off recorded for the old one no longer applies.",
        s.small))

    findings = ff.ordered(inputs.findings)
    counts = Counter(ff.severity(f) for f in findings)
    order = ff.severity_order()
    summary = sorted(counts.items(), key=lambda item: order.index(item[0].lower()) if item[0].lower() in order else 99)
    story.append(s.para("Findings at a glance", s.heading))
    if findings:
        story.append(s.table(["Severity", "What it asks", "Findings"],
                             [[word, ff.severity_meaning(word), str(n)] for word, n in summary],
                             [30 * mm, 70 * mm, 20 * mm]))
    else:
        story.append(s.para("The rules raised no findings for this setup. The general checks in the "
                            "checklist still apply."))
    first = [f for f in findings if ff.blocking(f)]
    story.append(s.para("To settle before work starts", s.heading))
    if first:
        story += s.bullets((f"{ff.title(f)} ({ff.severity(f)})" for f in first), code=True)
    else:
        story.append(s.para("No finding has to be settled before work starts; work through the checklist."))
    story.append(s.para("How to use this document", s.subheading))
    story.append(s.para(
        "Read the findings, tick each checklist item when it is done, and have the checklist reviewed and "
        "approved by the people named in the sign-off section. The figures support, and never replace, "
        "the site's own risk assessment, local codes and the judgement of its competent persons."))
    if not styles.fonts.wide:
        story.append(s.para("Note: no font with wide character coverage was found, so letters outside "
                            "Western European alphabets may not show in this copy.", s.small))
    return story


def _fact_table(s: Styles, rows: list[list[str]]):
    from reportlab.platypus import Paragraph, Table, TableStyle

    data = [[Paragraph(safe(label, s.fonts), s.cell_bold), Paragraph(safe(value, s.fonts), s.cell)]
            for label, value in rows]
    table = Table(data, colWidths=[45 * mm, 129 * mm], hAlign="LEFT")
    table.setStyle(TableStyle([("VALIGN", (0, 0), (-1, -1), "TOP"), ("LEFTPADDING", (0, 0), (-1, -1), 0),
                               ("BOTTOMPADDING", (0, 0), (-1, -1), 3)]))
    return table
