"""The figure tables: magnets, pairs, keep-out distances, zones, loose steel, induction, shipping.

Every number comes from the Assessment as computed; this module only formats it. Rows (and
induction blocks) that print the same values for different parts are printed once, naming every
part (:func:`reports.collapse.collapse_rows`, shared with the terminal summary). Zones get one
row each, their largest field once and the thresholds that reach them
(:func:`reports.zone_summary.zone_summaries`, also shared with the terminal).
"""
from __future__ import annotations

from reportlab.lib.units import mm
from reportlab.platypus import KeepTogether

from hazards.findings import approach_text, none_if_zero
from hazards.grouping import name_parts
from reports.collapse import collapse_rows
from reports.pdf.formatting import key_label, number, quantity, value_text
from reports.pdf.inputs import ReportInputs
from reports.pdf.styles import Styles
from reports.zone_summary import checked_in_every_zone, largest_field_text, own_limit_name, zone_summaries

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
    own = own_limit_name(threshold_id)
    return f"the zone's own {own.replace('_', ' ')} (from the setup)" if own else threshold_id.replace("_", " ")


def _each_of(what: str) -> str:
    return f"A row naming several {what} gives the figures of each of them."


def _collapsed_cells(rows, names) -> tuple[list[list], bool]:
    """Table rows from ``(parts, values)`` rows, those differing only in their parts printed once.

    ``names(row)`` gives the leading cells naming a :class:`reports.collapse.CollapsedRow`'s
    parts. Also returns whether any row was merged.
    """
    collapsed = collapse_rows(rows)
    return [names(row) + list(row.values) for row in collapsed], any(row.merged for row in collapsed)


def magnet_table(inputs: ReportInputs, s: Styles) -> list:
    magnets = inputs.assessment.magnets
    if not magnets:
        return []
    rows, merged = _collapsed_cells(
        [([m.id], [f"{m.shape}, {m.size}", m.material, quantity(m.remanence_T, "T"), str(m.count),
                   quantity(m.mass_kg * 1e3, "g") if m.mass_kg < 1 else quantity(m.mass_kg, "kg"),
                   quantity(m.pole_face_field_T, "T"), number(m.flux_index_kG2_mm2)]) for m in magnets],
        lambda row: [row.names(code=False)])
    story = [s.para("Magnets", s.subheading)]
    if merged:
        story.append(s.para(_each_of("magnets"), s.small))
    story += [s.table(["Magnet", "Shape and size", "Material", "Remanence", "Count", "Mass of one",
                      "Field at pole face", "Flux index [kG²·mm²]"], rows,
                     [22 * mm, 34 * mm, 22 * mm, 21 * mm, 12 * mm, 18 * mm, 20 * mm, 25 * mm])]
    notes = collapse_rows(([m.id], [m.remanence_note]) for m in magnets if m.remanence_note)
    story += [s.para(f"{note.names(code=False)}: {note.values[0]}", s.small) for note in notes]
    return story


def _pair_names(row) -> str:
    """``a brought to b``; ``a-1 to a-3, each brought to b``; ``a brought to each of b-1 to b-3``."""
    moved, other = row.names(0, code=False), row.names(1, code=False)
    if len(row.parts[0]) > 1:
        return f"{moved}, each brought to {other}"
    return f"{moved} brought to {'each of ' if len(row.parts[1]) > 1 else ''}{other}"


def pair_table(inputs: ReportInputs, s: Styles) -> list:
    pairs = inputs.assessment.pairs
    if not pairs:
        return []
    rows = []
    for p in pairs:
        approach = approach_text(p.approach)
        upper = " (upper bound)" if p.upper_bound else ""
        rows.append(([p.magnet_id, p.other_id],
                     [f"({p.other_kind.replace('_', ' ')}), {approach}", quantity(p.force_at_contact_N, "N") + upper,
                      f"{quantity(p.force_at_finger_gap_N, 'N')} at {quantity(p.finger_gap_m, 'm')}",
                      none_if_zero(p.snap_distance_hand_m, quantity(p.snap_distance_hand_m, "m")),
                      none_if_zero(p.snap_distance_bench_m, quantity(p.snap_distance_bench_m, "m")),
                      none_if_zero(p.pinch_energy_J, quantity(p.pinch_energy_J, "J")),
                      none_if_zero(p.impact_speed_m_per_s, quantity(p.impact_speed_m_per_s, "m/s"))]))
    cells, merged = _collapsed_cells(rows, lambda row: [_pair_names(row)])
    cells = [[f"{cell[0]} {cell[1]}"] + cell[2:] for cell in cells]     # the pair and its approach share a cell
    story = [s.para("Magnets brought together", s.subheading)]
    if merged:
        story.append(s.para(_each_of("magnets"), s.small))
    story += [s.table(["Pair and approach", "Force at contact", "Force at the finger gap",
                      "Snaps from (held in hand)", "Snaps from (on the bench)", "Pinch energy", "Closing speed"],
                     cells, [42 * mm, 22 * mm, 28 * mm, 20 * mm, 20 * mm, 20 * mm, 22 * mm])]
    warnings = collapse_rows(([p.magnet_id, p.other_id], [warning]) for p in pairs for warning in p.warnings)
    story += [s.para(f"{w.names(0, code=False)} / {w.names(1, code=False)}: {w.values[0]}", s.small) for w in warnings]
    return story


def keep_out_table(inputs: ReportInputs, s: Styles) -> list:
    """Keep-out distances by threshold, magnets at the same distance in one row; each source printed once, numbered."""
    assessment = inputs.assessment
    if not assessment.keep_out:
        return []
    numbers: dict[str, int] = {}
    by_threshold: dict[str, list] = {}
    for k in assessment.keep_out:
        numbers.setdefault(k.threshold_id, len(numbers) + 1)
        by_threshold.setdefault(k.threshold_id, []).append(k)
    rows, merged = [], False
    for threshold_id, keep_out in by_threshold.items():
        cells, some = _collapsed_cells(
            [([k.magnet_id], [quantity(k.threshold_T, "T"), quantity(k.distance_m, "m")]) for k in keep_out],
            lambda row: [row.names(code=False)])
        rows += [[_threshold_name(threshold_id), field, magnets, distance, f"[{numbers[threshold_id]}]"]
                 for magnets, field, distance in cells]
        merged = merged or some
    sources = {}
    for k in assessment.keep_out:
        sources.setdefault(k.threshold_id, threshold_source(assessment, k.threshold_id) or k.source)
    story = [s.para("Keep-out distances", s.subheading),
             s.para("Largest distance from each magnet's centre at which the field still reaches the "
                    "threshold. The distances are never shorter than the true ones."
                    + (" " + _each_of("magnets") if merged else ""), s.small),
             s.table(["Threshold", "Field", "Magnet", "Keep-out distance", "Source"], rows,
                     [44 * mm, 20 * mm, 60 * mm, 30 * mm, 20 * mm])]
    story.append(s.para("Sources of these thresholds", s.body))
    story += [s.para(f"[{numbers[tid]}] {_threshold_name(tid)}: {text}", s.small) for tid, text in sources.items()]
    return story


def _zone_threshold(threshold_id: str, value: float) -> str:
    """``implant keep out (0.5 mT)``; a zone's own limit: ``its own instrument limit (50 µT, from the setup)``."""
    own = own_limit_name(threshold_id)
    if own:
        return f"its own {own.replace('_', ' ')} ({quantity(value, 'T')}, from the setup)"
    return f"{_threshold_name(threshold_id)} ({quantity(value, 'T')})"


def _largest_field(summary) -> str:
    return largest_field_text(summary, lambda tesla: quantity(tesla, "T"))


def _reaching(summary) -> str:
    """The thresholds whose regions reach the zone, with how far in where that is known, or ``none``."""
    return "; ".join(_zone_threshold(tid, value) + (f", at least {quantity(depth, 'm')} in" if depth > 0 else "")
                     for tid, value, depth in summary.reached) or "none"


def zone_table(inputs: ReportInputs, s: Styles) -> list:
    """One row per zone: its largest field once, and which thresholds' regions reach it."""
    summaries = zone_summaries(inputs.assessment.zone_reach)
    if not summaries:
        return []
    everywhere = checked_in_every_zone(summaries)
    shared = {tid for tid, _ in everywhere}
    own = [f"{z.zone_id} also against " + ", ".join(_zone_threshold(tid, value) for tid, value in z.checked
                                                    if tid not in shared)
           for z in summaries if any(tid not in shared for tid, _ in z.checked)]
    intro = ("Every zone is checked against "
             + (name_parts([_zone_threshold(tid, value) for tid, value in everywhere], code=False, compact=False)
                if everywhere else "no threshold shared by all zones")
             + ("; " + "; ".join(own) if own else "") + ". The largest field is a proven upper bound of the "
             "field anywhere in the zone. The last column names each threshold whose region reaches the zone "
             "(with, where known, how far into the zone from its nearest side the field surely reaches it), "
             "or none.")
    rows = [[z.zone_id, z.kind.replace("_", " "), "yes" if z.people else "no",
             ", ".join(c.replace("_", " ") for c in z.contains) or "-", _largest_field(z), _reaching(z)]
            for z in summaries]
    # one row per zone keeps the table short: heading, note and table stay on one page
    return [KeepTogether([s.para("Zones against the thresholds", s.subheading), s.para(intro, s.small),
                          s.table(["Zone", "Kind", "People", "Contains", "Largest field in the zone",
                                   "Thresholds reached"], rows,
                                  [34 * mm, 16 * mm, 14 * mm, 30 * mm, 28 * mm, 52 * mm])])]


def projectile_table(inputs: ReportInputs, s: Styles) -> list:
    items = inputs.assessment.projectiles
    if not items:
        return []
    rows, merged = _collapsed_cells(
        [([p.item_id, p.magnet_id], [quantity(p.mass_kg * 1e3, "g"), quantity(p.distance_m, "m"),
                                     quantity(p.pull_off_distance_m, "m"), quantity(p.lift_distance_m, "m"),
                                     "yes" if p.within_pull or p.within_lift else "no"]) for p in items],
        lambda row: [row.names(0, code=False), row.names(1, code=False)])
    story = [s.para("Loose steel near magnets", s.subheading)]
    if merged:
        story.append(s.para(_each_of("parts"), s.small))
    return story + [s.table(["Item", "Magnet", "Mass", "Distance now", "Pulled along from", "Lifted from",
                             "Within reach"], rows, [28 * mm, 28 * mm, 18 * mm, 24 * mm, 26 * mm, 26 * mm, 24 * mm])]


def induction_tables(inputs: ReportInputs, s: Styles) -> list:
    activities = inputs.assessment.induction
    if not activities:
        return []
    blocks = collapse_rows(
        ([activity.activity_id],
         [activity.kind.replace("_", " "),
          tuple((key_label(str(key))[0], value_text(str(key), value)) for key, value in activity.values.items()),
          tuple(map(str, activity.warnings))]) for activity in activities)
    story = [s.para("Induction and eddy-current predictions", s.subheading),
             s.para("Predicted values for each demonstration, to compare with the meters and loads connected."
                    + (" A table naming several demonstrations gives the values of each of them."
                       if any(block.merged for block in blocks) else ""), s.small)]
    for block in blocks:
        kind, rows, warnings = block.values
        story.append(s.para(f"{block.names(code=False)} ({kind})", s.body))
        story.append(s.table(["Quantity", "Predicted value"], [list(row) for row in rows], [80 * mm, 70 * mm]))
        story += [s.para(f"Note: {warning}", s.small) for warning in warnings]
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
