"""Cards, watches, storage media and instruments: the zones they sit in and the field there."""
from __future__ import annotations

from hazards.findings import ACTION, NOTE, Finding, is_number, show, show_field, source_entry, \
    threshold_map, threshold_text
from hazards.rules.common import items, largest_distance_per_magnet, missing_figure_of, reaches, zone_max_field

CONCERN = "objects"

#: What a zone may contain -> the threshold that protects it. Computers hold storage media;
#: phones are usually carried with cards in their cases.
CONTENT_THRESHOLD = {"cards": "cards", "phones": "cards", "watches": "watches",
                     "storage_media": "storage_media", "computers": "storage_media", "instruments": "instruments"}
_EFFECT = {"cards": "magnetic stripes on cards can be erased",
           "watches": "mechanical watches can gain or lose time (those not labelled magnetic-resistant)",
           "storage_media": "magnetic storage media can lose data",
           "instruments": "sensitive instruments can read wrongly or need recalibration"}


def objects(setup, assessment, thresholds) -> list:
    """Findings for objects and instruments in zones the field reaches, and keep-away distances."""
    table = threshold_map(thresholds)
    findings: list[Finding] = []
    for zone in items(setup, "zones"):
        contents = list(dict.fromkeys(items(zone, "contains")))
        if not contents:
            continue
        field = zone_max_field(assessment, zone.id)
        if field is None:
            findings.append(missing_figure_of(
                CONCERN, "the largest field in zone {part}", zone.id,
                f"Measure the field in `{zone.id}` with a gaussmeter before work starts."))
            continue
        groups: dict[str, list[str]] = {}
        for content in contents:
            if content in CONTENT_THRESHOLD:
                groups.setdefault(CONTENT_THRESHOLD[content], []).append(content)
        for threshold_id, named in groups.items():
            threshold = table[threshold_id]
            limit, limit_text, origin = threshold.value, threshold_text(threshold), "table"
            own_limit = getattr(zone, "instrument_limit", None)
            if threshold_id == "instruments" and is_number(own_limit):
                limit, limit_text, origin = own_limit, f"{show_field(own_limit)} (the instruments' own limit)", "zone"
            if not reaches(field, limit):
                continue
            what = ", ".join(n.replace("_", " ") for n in named)
            findings.append(Finding(
                id=f"objects.{zone.id}.{threshold_id}", severity=ACTION, concern=CONCERN,
                title=f"The field in `{zone.id}` can affect the {what} there",
                figures=[("largest field in the zone", show_field(field)),
                         (f"{threshold_id.replace('_', ' ')} threshold", limit_text)],
                why=f"In this {zone.kind} zone {_EFFECT[threshold_id]}.",
                checklist=[f"Move the {what} out of `{zone.id}`, or move the magnets until the "
                           f"field there is below {show_field(limit)}."],
                sources=[source_entry(threshold)] if origin == "table" else
                [("instrument_limit", f"zone `{zone.id}`: the instruments' own specification, which wins over "
                                      f"the general guidance"), source_entry(threshold)]))
    summary = _keep_away(assessment, table)
    if summary:
        findings.append(summary)
    return findings


def _keep_away(assessment, table) -> Finding | None:
    figures, sources, checklist = [], [], []
    for threshold_id in ("cards", "watches", "storage_media", "instruments"):
        threshold = table[threshold_id]
        distances = largest_distance_per_magnet(assessment, threshold_id)
        numbers = [d for d in distances.values() if is_number(d)]
        if not distances:
            continue
        largest = max(numbers) if numbers else float("nan")
        figures.append((f"{threshold_id.replace('_', ' ')}: {threshold_text(threshold)}",
                        f"up to {show(largest, 'length')} from a magnet's centre"))
        sources.append(source_entry(threshold))
        checklist.append(f"Keep {threshold_id.replace('_', ' ')} more than {show(largest, 'length')} from the magnets.")
    if not figures:
        return None
    return Finding(
        id="objects.keep-away", severity=NOTE, concern=CONCERN,
        title="How far cards, watches, storage media and instruments must stay from the magnets",
        figures=figures,
        why="Each distance is where the field of the strongest magnet falls to that object's threshold.",
        cautions=["Presenters carry phones, cards and watches: empty pockets before handling strong magnets."],
        checklist=checklist, sources=sources)
