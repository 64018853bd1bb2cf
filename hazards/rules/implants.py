"""People with active implants, and people in general, near static magnetic fields.

Reads the keep-out distances (``assessment.keep_out``) and how the keep-out region meets the
zones of the setup (``assessment.zone_reach``).
"""
from __future__ import annotations

from hazards.findings import ACTION, BLOCKING, NOTE, Finding, is_number, missing_figure, show, show_field, \
    source_entry, threshold_map, threshold_text
from hazards.grouping import name_parts
from hazards.rules.common import (figures_by_value, implant_wearers_screened, items, largest_distance_per_magnet,
                                  public_present, reaches)

CONCERN = "implants"


def implants(setup, assessment, thresholds) -> list:
    """Findings on the implant keep-out line, the zones it reaches and exposure limits."""
    table = threshold_map(thresholds)
    line = table["implant_keep_out"]
    findings: list[Finding] = []
    if not items(assessment, "magnets") and not items(setup, "magnets"):
        return findings
    screened = implant_wearers_screened(setup)
    distances = largest_distance_per_magnet(assessment, line.id)
    if not distances:
        findings.append(missing_figure(
            CONCERN, "the implant keep-out distance",
            f"Measure where the field falls to {show_field(line.value)} with a calibrated gaussmeter and mark it.",
            severity=BLOCKING if not screened else ACTION))
    else:
        findings.append(_keep_out_line(line, distances, table, screened))
    findings += _zones_reached(line, assessment, screened)
    findings += _exposure(setup, assessment, table)
    return findings


def _keep_out_line(line, distances, table, screened) -> Finding:
    figures = figures_by_value(f"{line.id} ({show_field(line.value)}) from {{parts}}",
                               [(magnet, show(distance, "length")) for magnet, distance in distances.items()])
    numbers = [d for d in distances.values() if is_number(d)]
    largest = show(max(numbers), "length") if numbers else "not available"
    checklist = [f"Mark the implant keep-out line {largest} from the nearest magnet, with a sign at every way in "
                 f"(threshold {threshold_text(line)}).",
                 "Tell everyone before entry that people with pacemakers, defibrillators, pumps or "
                 "neurostimulators stay outside the line."]
    if screened:
        checklist.append("Confirm that the screening of implant wearers happens at every entrance, every session.")
    context = [table[i] for i in ("implant_mr_contour_2022", "implant_test_level") if i in table]
    return Finding(
        id="implants.keep-out-line", severity=ACTION, concern=CONCERN,
        title=f"Implant keep-out line: {largest} from the magnets at {show_field(line.value)}",
        figures=figures,
        why=("Static fields above this line can switch an implanted pacemaker or defibrillator into its magnet "
             "mode or otherwise change its behaviour. For context: implant makers test to "
             f"{show_field(table['implant_test_level'].value)} (ISO 14117) and newer MR practice draws a "
             f"{show_field(table['implant_mr_contour_2022'].value)} contour; the line stays at the stricter value."),
        cautions=["Strong magnets can be carried past the line in a pocket or hand: the line moves with them.",
                  "Distances are from each magnet's centre and err on the long side."],
        checklist=checklist,
        sources=[source_entry(line)] + [source_entry(t) for t in context])


def _zones_reached(line, assessment, screened) -> list:
    findings = []
    for row in items(assessment, "zone_reach"):
        same_value = is_number(row.threshold_T) and abs(row.threshold_T - line.value) <= 1e-9 * line.value
        if row.threshold_id != line.id or not row.people or \
                not reaches(row.max_field_T, line.value, bool(row.reached) and same_value):
            continue
        known = is_number(row.max_field_T)
        findings.append(Finding(
            id=f"implants.zone.{row.zone_id}", severity=ACTION if screened else BLOCKING, concern=CONCERN,
            title=(f"The implant keep-out line reaches `{row.zone_id}` ({row.zone_kind}), where people are"
                   if known else f"Field in `{row.zone_id}` ({row.zone_kind}) not known; taken as inside the keep-out line"),
            figures=[("largest field in the zone", show_field(row.max_field_T)),
                     ("keep-out threshold", threshold_text(line))],
            why=("People in this zone could carry an active implant into a field above the keep-out line."
                 + (" Implant wearers are screened out, so the screening must hold." if screened else
                    " The setup says implant wearers may be present.")),
            cautions=["Do not rely on people knowing to keep back: mark the line on the floor or seats."],
            checklist=[f"Move `{row.zone_id}` or the magnets so the zone lies outside the line, or close the "
                       "affected part of it, or screen everyone entering it for active implants."],
            sources=[source_entry(line)]))
    return findings


def _exposure(setup, assessment, table) -> list:
    findings = []
    public = table["public_exposure"]
    worker = table["occupational_head_trunk"]
    strong = [m for m in items(assessment, "magnets") if is_number(m.pole_face_field_T)
              and m.pole_face_field_T >= public.value]
    if strong and public_present(setup):
        findings.append(Finding(
            id="implants.public-handling", severity=ACTION, concern=CONCERN,
            title=f"Fields at the faces of {name_parts([m.id for m in strong], code=False)} reach the public limit",
            figures=figures_by_value("field at the pole face of {parts}",
                                     [(m.id, show_field(m.pole_face_field_T)) for m in strong])
            + [("public limit, any part of the body", threshold_text(public))],
            why="A member of the public holding one of these magnets has a hand in a field above the public limit.",
            checklist=["Let members of the public handle these magnets only in holders, or not at all."],
            sources=[source_entry(public)]))
    for row in items(assessment, "zone_reach"):
        if row.threshold_id == public.id and row.people and is_number(row.max_field_T) \
                and row.max_field_T >= public.value:
            findings.append(Finding(
                id=f"implants.public-zone.{row.zone_id}", severity=BLOCKING, concern=CONCERN,
                title=f"Field in `{row.zone_id}` reaches the public exposure limit",
                figures=[("largest field in the zone", show_field(row.max_field_T)),
                         ("public limit", threshold_text(public))],
                why="People in this zone would be exposed above the limit for the general public.",
                checklist=[f"Move `{row.zone_id}` or the magnets until the field there is below the limit."],
                sources=[source_entry(public)]))
    impossible = [m for m in items(assessment, "magnets") if is_number(m.pole_face_field_T)
                  and m.pole_face_field_T >= worker.value]
    if impossible:
        findings.append(Finding(
            id="implants.implausible-field", severity=NOTE, concern=CONCERN,
            title="A computed surface field is at or above the occupational limit for head and trunk",
            figures=figures_by_value("field at the pole face of {parts}",
                                     [(m.id, show_field(m.pole_face_field_T)) for m in impossible]),
            why=("No permanent magnet gives a field this high at its face (remanence tops out near 1.5 T): "
                 "check the magnet's grade or remanence in the setup."),
            sources=[source_entry(worker)]))
    return findings
