"""Sending magnets by air: the field at 2.1 m and 4.6 m from the package (UN 2807)."""
from __future__ import annotations

from hazards.findings import ACTION, BLOCKING, NOTE, Finding, is_number, show, show_field, \
    source_entry, threshold_map, threshold_text
from hazards.rules.common import activities_of, items, missing_figure_of

CONCERN = "shipping"
EDITION = ("IATA Dangerous Goods Regulations, Packing Instruction 953, as in editions since about 2017 "
           "(check the edition in force, and your carrier's rules, before sending)")


def _past(value, limit) -> bool:
    return bool(value > limit) if is_number(value) else True


def shipping(setup, assessment, thresholds) -> list:
    """Findings for each package of magnets sent by air, against the limits at 2.1 m and 4.6 m."""
    table = threshold_map(thresholds)
    regulated, forbidden, older = (table["shipping_regulated_2_1m"], table["shipping_forbidden_4_6m"],
                                   table["shipping_older_2_1m"])
    packages = items(assessment, "shipping")
    findings: list[Finding] = []
    known = {p.activity_id for p in packages}
    for activity in activities_of(setup, "ship_package"):
        if activity.id not in known:
            findings.append(missing_figure_of(CONCERN, "the field around package {part}", activity.id,
                                              "Measure the field 2.1 m and 4.6 m from the package before sending it.",
                                              severity=BLOCKING))
    advice = ["Fit steel keepers or a steel box, or pack the magnets in pairs facing opposite ways, to shield "
              "the field; then measure it at 2.1 m and 4.6 m.",
              "Surface transport (road, rail) is not restricted by these rules."]
    for package in packages:
        at_2, at_4 = package.field_at_2_1_m_T, package.field_at_4_6_m_T
        figures = [("pieces", str(package.pieces)), ("field at 2.1 m from the package", show_field(at_2)),
                   ("field at 4.6 m from the package", show_field(at_4)),
                   ("total magnetic moment", show(package.total_moment_A_m2, "moment")),
                   ("shielded", "yes" if package.shielded else "no"), ("rules assumed", EDITION)]
        sources = [source_entry(regulated), source_entry(forbidden), source_entry(older)]
        if _past(at_4, forbidden.value):
            severity, title = BLOCKING, "forbidden by air without prior approval of the states concerned"
            why = f"The field 4.6 m from the package is above {threshold_text(forbidden)}."
            checklist = ["Do not send this package by air as it is: shield it until the field at 4.6 m is below "
                         "the limit, or obtain the prior approvals."]
        elif _past(at_2, regulated.value):
            severity, title = ACTION, "regulated as magnetized material (UN 2807, class 9)"
            why = f"The field 2.1 m from the package is above {threshold_text(regulated)}."
            checklist = ["Declare the package as UN 2807 magnetized material, with its label and paperwork, "
                         "or shield it below the limit."]
        elif _past(at_2, older.value):
            severity, title = NOTE, "below the current limit, above the older one"
            why = (f"The field 2.1 m from the package is below {threshold_text(regulated)} but above the older "
                   f"not-restricted limit {threshold_text(older)} that some carriers still quote.")
            checklist = ["Ask the carrier which limit it applies."]
        else:
            severity, title = NOTE, "not restricted as magnetized material"
            why = f"The field 2.1 m from the package is below {threshold_text(older)}."
            checklist = []
        findings.append(Finding(
            id=f"shipping.{package.activity_id}", severity=severity, concern=CONCERN,
            title=f"Package `{package.activity_id}` by air: {title}",
            figures=figures, why=why + " The rules change by edition: check the current one.",
            cautions=["The figures assume every magnet in the package points the same way (the worst case)."],
            checklist=checklist + (advice if severity != NOTE or checklist else []), sources=sources))
    return findings
