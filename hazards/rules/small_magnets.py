"""Small strong magnets and children: the flux index and the small-parts cylinder."""
from __future__ import annotations

from hazards.findings import BLOCKING, NOTE, Finding, is_number, show, source_entry, threshold_map, \
    threshold_text
from hazards.rules.common import audience_has_children, items

CONCERN = "small_magnets"
#: 1 kG^2 mm^2 in T^2 m^2: (0.1 T)^2 x (1e-3 m)^2.
KG2_MM2 = 1e-8


def small_magnets(setup, assessment, thresholds) -> list:
    """Findings for loose magnets that are hazardous if swallowed (flux index and small-parts cylinder)."""
    table = threshold_map(thresholds)
    limit, age = table["flux_index"], table["children_age"]
    children, why_children = audience_has_children(setup, age.value)
    findings: list[Finding] = []
    for magnet in items(assessment, "magnets"):
        index = magnet.flux_index_kG2_mm2
        known = is_number(index)
        strong = (index * KG2_MM2 >= limit.value) if known else True
        if not (strong and magnet.fits_small_parts_cylinder):
            continue
        count = magnet.count if isinstance(magnet.count, int) and magnet.count > 0 else 1
        figures = [("flux index", show(index * KG2_MM2, "flux_index") if known else "not available"),
                   ("hazardous at or above", threshold_text(limit)),
                   ("fits the small-parts cylinder", "yes"), ("pieces", str(count))]
        checklist = [f"Count the `{magnet.id}` magnets out at the start and back in at the end ({count} piece{'s' if count != 1 else ''}).",
                     "Search for and account for any missing piece before anyone leaves."]
        cautions = ["Two or more swallowed magnets can attract each other through the bowel walls and perforate "
                    "them; seek medical help at once if one may have been swallowed."]
        sources = [source_entry(limit), source_entry(age), source_entry(table["small_parts_cylinder_diameter"])]
        if children:
            findings.append(Finding(
                id=f"small_magnets.{magnet.id}", severity=BLOCKING, concern=CONCERN,
                title=f"`{magnet.id}` is a hazardous small magnet and children may be present",
                figures=figures + [("children", why_children)],
                why=("A loose magnet that fits in the small-parts cylinder with a flux index at or above the limit "
                     "is a hazardous magnet for children. The consumer rule exempts material sold to educators, "
                     "but a classroom still has children in it."),
                cautions=cautions,
                checklist=["Keep these magnets under an adult's direct control: none handed out loose, none "
                           "left on tables."] + checklist,
                sources=sources))
        else:
            findings.append(Finding(
                id=f"small_magnets.{magnet.id}", severity=NOTE, concern=CONCERN,
                title=f"`{magnet.id}` is a hazardous small magnet (no children expected)",
                figures=figures + [("children", why_children)],
                why="If children come into contact with them later (kits lent out, open days), the ingestion rules apply.",
                cautions=cautions, checklist=checklist, sources=sources))
    return findings
