"""The figure tables: magnets, pairs, keep-out distances, zones, loose steel, induction, shipping.

Every number comes from the Assessment as computed; this module only formats it.
"""
from __future__ import annotations

from reportlab.lib.units import mm

from reports.pdf.formatting import key_label, number, quantity, value_text
from reports.pdf.inputs import ReportInputs
from reports.pdf.styles import Styles

_THRESHOLD_UNITS = {"field": "T", "force": "N", "energy": "J", "voltage": "V", "current": "A"}


def threshold_value_text(threshold) -> str:
    """The threshold's value as the hazards package shows it (``0.5 mT``), with its own unit rules."""
    try:
        from hazards.findings import show
    except ImportError:  # the hazards package may still be being written
        return quantity(threshold.value, _THRESHOLD_UNITS.get(getattr(threshold, "kind", ""), ""))
    return show(threshold.value, getattr(threshold, "kind", "field"))


def threshold_source(assessment, threshold_id: str) -> str:
    threshold = assessment.threshold(threshold_id) if hasattr(assessment, "threshold") else None
    if threshold is None:
        return ""
    text = threshold.source
    if threshold.origin == "site":
        text = f"site rules ({text})" if text else "site rules"
        if threshold.reason:
            text += f"; reason given: {threshold.reason}"
    return text


def _threshold_name(threshold_id: str) -> str:
    """`implant_keep_out` -> 'implant keep out'; `desk:instrument_limit` -> "the zone's own instrument limit"."""
    if ":" in threshold_id:
        return f"the zone's own {threshold_id.split(':', 1)[1].replace('_', ' ')} (from the setup)"
    return threshold_id.replace("_", " ")


def magnet_table(inputs: ReportInputs, s: Styles) -> list:
    magnets = inputs.assessment.magnets
    if not magnets:
        return []
    rows = [[m.id, f"{m.shape}, {m.size}", m.material, quantity(m.remanence_T, "T"), str(m.count),
             quantity(m.mass_kg * 1e3, "g") if m.mass_kg < 1 else quantity(m.mass_kg, "kg"),
             quantity(m.pole_face_field_T, "T"), number(m.flux_index_kG2_mm2)] for m in magnets]
    story = [s.para("Magnets", s.subheading),
             s.table(["Magnet", "Shape and size", "Material", "Remanence", "Count", "Mass of one",
                      "Field at pole face", "Flux index [kG²·mm²]"], rows,
                     [22 * mm, 34 * mm, 22 * mm, 21 * mm, 12 * mm, 18 * mm, 20 * mm, 25 * mm])]
    notes = [f"{m.id}: {m.remanence_note}" for m in magnets if m.remanence_note]
    story += [s.para(note, s.small) for note in notes]
    return story


def pair_table(inputs: ReportInputs, s: Styles) -> list:
    pairs = inputs.assessment.pairs
    if not pairs:
        return []
    rows = []
    for p in pairs:
        approach = "by hand" if p.approach == "hand" else "sliding on the bench"
        upper = " (upper bound)" if p.upper_bound else ""
        rows.append([f"{p.magnet_id} to {p.other_id} ({p.other_kind.replace('_', ' ')}), {approach}",
                     quantity(p.force_at_contact_N, "N") + upper,
                     f"{quantity(p.force_at_finger_gap_N, 'N')} at {quantity(p.finger_gap_m, 'm')}",
                     quantity(p.snap_distance_hand_m, "m"), quantity(p.snap_distance_bench_m, "m"),
                     quantity(p.pinch_energy_J, "J"), quantity(p.impact_speed_m_per_s, "m/s")])
    story = [s.para("Magnets brought together", s.subheading),
             s.table(["Pair and approach", "Force at contact", "Force at the finger gap",
                      "Snaps from (held in hand)", "Snaps from (on the bench)", "Pinch energy", "Closing speed"],
                     rows, [42 * mm, 22 * mm, 28 * mm, 20 * mm, 20 * mm, 20 * mm, 22 * mm])]
    for p in pairs:
        story += [s.para(f"{p.magnet_id} / {p.other_id}: {warning}", s.small) for warning in p.warnings]
    return story


def keep_out_table(inputs: ReportInputs, s: Styles) -> list:
    """Keep-out distances, one row per magnet and threshold; each source printed once, numbered."""
    assessment = inputs.assessment
    if not assessment.keep_out:
        return []
    numbers: dict[str, int] = {}
    for k in assessment.keep_out:
        numbers.setdefault(k.threshold_id, len(numbers) + 1)
    rows = [[k.magnet_id, _threshold_name(k.threshold_id), quantity(k.threshold_T, "T"), quantity(k.distance_m, "m"),
             f"[{numbers[k.threshold_id]}]"] for k in assessment.keep_out]
    sources = {}
    for k in assessment.keep_out:
        sources.setdefault(k.threshold_id, threshold_source(assessment, k.threshold_id) or k.source)
    story = [s.para("Keep-out distances", s.subheading),
             s.para("Largest distance from each magnet's centre at which the field still reaches the "
                    "threshold. The distances are never shorter than the true ones.", s.small),
             s.table(["Magnet", "Threshold", "Field", "Keep-out distance", "Source"], rows,
                     [40 * mm, 60 * mm, 24 * mm, 30 * mm, 20 * mm])]
    story.append(s.para("Sources of these thresholds", s.body))
    story += [s.para(f"[{numbers[tid]}] {_threshold_name(tid)}: {text}", s.small) for tid, text in sources.items()]
    return story


def zone_table(inputs: ReportInputs, s: Styles) -> list:
    reach = inputs.assessment.zone_reach
    if not reach:
        return []
    rows = [[z.zone_id, z.zone_kind.replace("_", " "), _threshold_name(z.threshold_id),
             quantity(z.threshold_T, "T"), quantity(z.max_field_T, "T"), "yes" if z.reached else "no",
             "yes" if z.people else "no", ", ".join(c.replace("_", " ") for c in z.contains) or "-"] for z in reach]
    return [s.para("Zones against the thresholds", s.subheading),
            s.table(["Zone", "Kind", "Threshold", "Field", "Highest field in zone", "Reached", "People",
                     "Contains"], rows, [26 * mm, 18 * mm, 28 * mm, 16 * mm, 22 * mm, 16 * mm, 14 * mm, 34 * mm])]


def projectile_table(inputs: ReportInputs, s: Styles) -> list:
    items = inputs.assessment.projectiles
    if not items:
        return []
    rows = [[p.item_id, p.magnet_id, quantity(p.mass_kg * 1e3, "g"), quantity(p.distance_m, "m"),
             quantity(p.pull_off_distance_m, "m"), quantity(p.lift_distance_m, "m"),
             "yes" if p.within_pull or p.within_lift else "no"] for p in items]
    return [s.para("Loose steel near magnets", s.subheading),
            s.table(["Item", "Magnet", "Mass", "Distance now", "Pulled along from", "Lifted from", "Within reach"],
                    rows, [28 * mm, 28 * mm, 18 * mm, 24 * mm, 26 * mm, 26 * mm, 24 * mm])]


def induction_tables(inputs: ReportInputs, s: Styles) -> list:
    activities = inputs.assessment.induction
    if not activities:
        return []
    story = [s.para("Induction and eddy-current predictions", s.subheading),
             s.para("Predicted values for each demonstration, to compare with the meters and loads connected.",
                    s.small)]
    for activity in activities:
        rows = [[key_label(str(key))[0], value_text(str(key), value)] for key, value in activity.values.items()]
        title = f"{activity.activity_id} ({activity.kind.replace('_', ' ')})"
        story.append(s.para(title, s.body))
        story.append(s.table(["Quantity", "Predicted value"], rows, [80 * mm, 70 * mm]))
        story += [s.para(f"Note: {warning}", s.small) for warning in activity.warnings]
    return story


def shipping_table(inputs: ReportInputs, s: Styles) -> list:
    packages = inputs.assessment.shipping
    if not packages:
        return []
    rows = [[p.activity_id, ", ".join(p.magnet_ids), str(p.pieces), quantity(p.field_at_2_1_m_T, "T"),
             quantity(p.field_at_4_6_m_T, "T"), "yes" if p.shielded else "no"] for p in packages]
    return [s.para("Packages for shipping", s.subheading),
            s.table(["Package", "Magnets", "Pieces", "Field at 2.1 m", "Field at 4.6 m", "Shielded"], rows,
                    [32 * mm, 46 * mm, 16 * mm, 28 * mm, 28 * mm, 20 * mm])]


def figure_tables(inputs: ReportInputs, s: Styles) -> list:
    story = [s.para("Figures", s.heading)]
    for part in (magnet_table, keep_out_table, zone_table, pair_table, projectile_table, induction_tables,
                 shipping_table):
        story += part(inputs, s)
    if len(story) == 1:
        story.append(s.para("The assessment holds no figures for this setup."))
    return story
