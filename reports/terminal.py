"""The readable terminal summary of an assessment: figures first, then findings by severity.

Reports never compute physics: everything printed here is read from the Assessment and its
findings. Rows and blocks of figures that print the same values for different parts (twelve
identical stations) are printed once, naming every part (:func:`reports.collapse.collapse_rows`). Every threshold is printed with its source, its confidence, and where its value came
from (the default table or the site's rules).
"""
from __future__ import annotations

import textwrap

from hazards.findings import (DEFERRAL, SEVERITIES, SEVERITY_MEANINGS, approach_text, deferral_line, is_number,
                              none_if_zero, plain_number, show, show_field, threshold_text)
from planner.units import MICRO_ASCII, format_quantity
from reports.collapse import collapse_rows
from reports.pdf.formatting import key_label
from reports.zone_summary import checked_in_every_zone, largest_field_text, own_limit_name, zone_summaries

__all__ = ["render_terminal"]

WIDTH = 100
NO_BREAK = "\u00a0"
# Units read from a key's suffix (reports.pdf.formatting.key_label) that have a terminal kind in
# hazards.findings.show; any other unit is written with an SI prefix where one reads naturally.
_KIND_OF_UNIT = {"m/s": "speed", "N·m": "torque", "V": "voltage", "A": "current", "J": "energy", "C": "charge",
                 "N": "force", "m": "length", "T": "field", "kg": "mass"}
_PREFIXED_UNITS = {"s", "H", "W", "Hz", "Wb", "Ω", "F", "Pa"}
# Plain-text spellings of the PDF's unit symbols, for terminals that may not show them.
_ASCII = {"·": " ", "Ω": "ohm", "²": "^2", "³": "^3", "°C": "degC"}


def render_terminal(setup, assessment) -> str:
    """The assessment as plain text for a terminal.

    Parameters
    ----------
    setup : planner.setup.Setup or None
        Used for the site's name and competent persons in the deferral line.
    assessment : planner.assessment.Assessment
        Figures and findings (``assessment.findings``, list of hazards.findings.Finding).

    Returns
    -------
    str
        The summary, lines at most about 100 characters wide.
    """
    out: list[str] = []
    out.append(f"benchplan assessment: {assessment.title}")
    site = getattr(setup, "site", None)
    date = getattr(setup, "date", None)
    if site or date:
        out.append("  " + ", ".join(str(x) for x in (site, date) if x))
    out.append(f"  program version {assessment.program_version}")
    _site_values(out, assessment)
    _magnets(out, assessment)
    _keep_out(out, assessment)
    _pairs(out, assessment)
    _projectiles(out, assessment)
    _induction(out, assessment)
    _shipping(out, assessment)
    _listed(out, "Assumptions", getattr(assessment, "assumptions", []))
    _listed(out, "Notes", getattr(assessment, "notes", []))
    _findings(out, assessment)
    out.append("")
    out += _wrap(deferral_line(setup) if setup is not None else DEFERRAL, "", "")
    return "\n".join(out) + "\n"


def _heading(out, text):
    out += ["", text, "-" * len(text)]


def _wrap(text, indent="  ", later=None) -> list[str]:
    """Lines of at most WIDTH characters; never broken at a hyphen, so ids (``magnet-01``) stay whole."""
    return textwrap.wrap(str(text), WIDTH, initial_indent=indent, subsequent_indent=later or indent + "  ",
                         break_on_hyphens=False) or [indent]


def _table(out, headers, rows):
    rows = [[str(c) for c in row] for row in rows]
    widths = [max(len(h), *(len(r[i]) for r in rows)) if rows else len(h) for i, h in enumerate(headers)]
    out.append("  " + "  ".join(h.ljust(w) for h, w in zip(headers, widths)).rstrip())
    for row in rows:
        out.append("  " + "  ".join(c.ljust(w) for c, w in zip(row, widths)).rstrip())


def _site_values(out, assessment):
    changed = [t for t in assessment.thresholds if t.origin == "site"]
    if not changed:
        return
    _heading(out, "Thresholds set by the site's rules")
    for t in changed:
        out += _wrap(f"{t.id}: {threshold_text(t)}")


def _magnets(out, assessment):
    if not assessment.magnets:
        return
    _heading(out, "Magnets")
    rows = []
    for m in assessment.magnets:
        index = plain_number(m.flux_index_kG2_mm2) if is_number(m.flux_index_kG2_mm2) else "n/a"
        rows.append(([m.id], [f"{m.shape} {m.size}", m.material, show_field(m.remanence_T), m.count,
                              show(m.mass_kg, "mass"), show_field(m.pole_face_field_T), index,
                              "yes" if m.fits_small_parts_cylinder else "no"]))
    _collapsed_table(out, ["magnet", "shape and size", "grade", "remanence", "pieces", "mass", "face field",
                           "flux index kG^2 mm^2", "small part"], rows, lambda row: [row.names(code=False)], "magnets")
    notes = {m.remanence_note for m in assessment.magnets if m.remanence_note}
    for note in sorted(notes):
        out += _wrap(note)


def _collapsed_table(out, headers, rows, names, what):
    """A table of ``(parts, values)`` rows, rows that differ only in their parts printed once.

    ``names(row)`` gives the leading cells naming a :class:`reports.collapse.CollapsedRow`'s parts.
    """
    collapsed = collapse_rows(rows)
    _table(out, headers, [names(row) + list(row.values) for row in collapsed])
    if any(row.merged for row in collapsed):
        out.append(f"  (a row naming several {what} gives the figures of each of them)")


def _keep_out(out, assessment):
    if not assessment.keep_out:
        return
    _heading(out, "Keep-out distances (largest distance from each magnet's centre to the threshold)")
    by_threshold: dict[str, list] = {}
    for row in assessment.keep_out:
        by_threshold.setdefault(row.threshold_id, []).append(row)
    for threshold_id, rows in by_threshold.items():
        threshold = assessment.threshold(threshold_id)
        value = threshold_text(threshold) if threshold else show_field(rows[0].threshold_T)
        # magnets at the same printed distance are named together; a distance keeps its unit on its line
        distances = "; ".join(f"{row.values[0]} from {'each of ' if row.merged else ''}{row.names(code=False)}"
                              for row in collapse_rows(([r.magnet_id], [show(r.distance_m, 'length').replace(' ', NO_BREAK)])
                                                       for r in rows))
        out += [line.replace(NO_BREAK, " ") for line in _wrap(f"{threshold_id} at {value}: {distances}")]
        if threshold:
            source = f"source: {threshold.source} [{threshold.confidence}]"
            if threshold.note:
                source += f"; {threshold.note}"
            out += _wrap(source, "      ")
    _zones(out, assessment)


def _zones(out, assessment):
    """One line per zone: its largest field once, its own limit if any, the thresholds that reach it."""
    summaries = zone_summaries(getattr(assessment, "zone_reach", []))
    if not summaries:
        return
    shared = {tid for tid, _ in checked_in_every_zone(summaries)}
    out.append("")
    out += _wrap(f"Zones (largest field in each, a proven upper bound; which of the {len(shared)} field thresholds "
                 "reach it):")
    for z in summaries:
        own = [f"{_zone_threshold(tid)} {show_field(value)}" for tid, value in z.checked if tid not in shared]
        described = ", ".join([z.kind, "people" if z.people else "no people"] + own)
        largest = largest_field_text(z, show_field)
        reached = [f"{_zone_threshold(tid)} {show_field(value)}" + (f" ({show(depth, 'length')} in)" if depth > 0 else "")
                   for tid, value, depth in z.reached]
        out += _wrap(f"{z.zone_id} ({described}): {largest}; reaches {', '.join(reached) if reached else 'none'}",
                     "    ")


def _zone_threshold(threshold_id: str) -> str:
    """A threshold id as printed; a zone's own limit (``desk:instrument_limit``) as ``own instrument_limit``."""
    own = own_limit_name(threshold_id)
    return f"own {own}" if own else threshold_id


def _pairs(out, assessment):
    if not assessment.pairs:
        return
    _heading(out, "Magnets brought together")
    rows = []
    for p in assessment.pairs:
        bound = " (upper bound)" if p.upper_bound else ""
        rows.append(([p.magnet_id, p.other_id],
                     [approach_text(p.approach), show(p.force_at_contact_N, "force") + bound, show(p.force_at_finger_gap_N, "force"),
                      none_if_zero(p.snap_distance_bench_m, show(p.snap_distance_bench_m, "length")),
                      none_if_zero(p.snap_distance_hand_m, show(p.snap_distance_hand_m, "length")),
                      none_if_zero(p.pinch_energy_J, show(p.pinch_energy_J, "energy")),
                      none_if_zero(p.impact_speed_m_per_s, show(p.impact_speed_m_per_s, "speed"))]))
    _collapsed_table(out, ["pair", "approach", "force at contact", "at finger gap", "snaps (bench)", "snaps (hand)",
                           "pinch energy", "impact speed"], rows, lambda row: [f"{row.names(0, code=False)} -> {row.names(1, code=False)}"],
                     "magnets")


def _projectiles(out, assessment):
    if not assessment.projectiles:
        return
    _heading(out, "Loose steel")
    rows = [([p.item_id, p.magnet_id], [show(p.distance_m, "length"), show(p.pull_off_distance_m, "length"),
                                        show(p.lift_distance_m, "length"),
                                        "lifted" if p.within_lift else "pulled" if p.within_pull else "no"])
            for p in assessment.projectiles]
    _collapsed_table(out, ["item", "magnet", "distance", "pulled within", "lifted within", "moves?"], rows,
                     lambda row: [row.names(0, code=False), row.names(1, code=False)], "parts")


def _value_text(key: str, value) -> tuple[str, str]:
    """(words, value with unit) of a unit-suffixed key: ``conductivity_S_per_m`` -> 'conductivity', '5.8e+07 S/m'."""
    words, unit = key_label(key)
    if isinstance(value, bool):
        return words, "yes" if value else "no"
    if not isinstance(value, (int, float)):
        return key.replace("_", " "), str(value)
    if not is_number(value):
        return words, "not available"
    if unit in _KIND_OF_UNIT:
        return words, show(value, _KIND_OF_UNIT[unit])
    if not unit or unit == "1":
        return words, plain_number(value)
    for symbol, plain in _ASCII.items():
        unit = unit.replace(symbol, plain)
    prefixes = ("M", "k", "", "m", "u", "n") if unit in {_ASCII.get(u, u) for u in _PREFIXED_UNITS} else ("",)
    return words, format_quantity(value, unit, micro=MICRO_ASCII, prefixes=prefixes)


def _induction(out, assessment):
    if not assessment.induction:
        return
    _heading(out, "Induction and eddy currents")
    blocks = []
    for row in assessment.induction:
        values = row.values if isinstance(row.values, dict) else {}
        # a value and its unit stay on one line: joined by a no-break space while wrapping
        parts = []
        for key, value in values.items():
            words, text = _value_text(key, value)
            parts.append(f"{words}: {text.replace(' ', NO_BREAK) if isinstance(value, (int, float)) else text}")
        blocks.append(([row.activity_id], [row.kind.replace("_", " "), "; ".join(parts), tuple(map(str, row.warnings))]))
    collapsed = collapse_rows(blocks)
    for block in collapsed:
        kind, text, warnings = block.values
        out.append(f"  {block.names(code=False)} ({kind})")
        out += [line.replace(NO_BREAK, " ") for line in _wrap(text, "      ")]
        for warning in warnings:
            out += _wrap(f"remark: {warning}", "      ")
    if any(block.merged for block in collapsed):
        out.append("  (a block naming several activities gives the figures of each of them)")


def _shipping(out, assessment):
    if not assessment.shipping:
        return
    _heading(out, "Packages sent by air")
    rows = [[s.activity_id, s.pieces, show_field(s.field_at_2_1_m_T), show_field(s.field_at_4_6_m_T),
             "yes" if s.shielded else "no"] for s in assessment.shipping]
    _table(out, ["package", "pieces", "field at 2.1 m", "field at 4.6 m", "shielded"], rows)


def _listed(out, title, lines):
    if lines:
        _heading(out, title)
        for line in lines:
            out += _wrap(f"- {line}")


def _findings(out, assessment):
    findings = [f for f in assessment.findings if hasattr(f, "severity")]
    _heading(out, f"Findings ({len(findings)})")
    if not findings:
        out.append("  none")
    for severity in reversed(SEVERITIES):
        group = [f for f in findings if f.severity == severity]
        if not group:
            continue
        out.append("")
        out.append(f"  {severity.upper()}: {SEVERITY_MEANINGS[severity]} ({len(group)})")
        for f in group:
            out += _wrap(f"* {f.title}", "  ", "    ")
            for label, value in f.figures:
                # a short value ("87 mm") stays on one line with its unit; a list of ids may wrap
                value = str(value).replace(" ", NO_BREAK) if len(str(value)) <= 24 else str(value)
                out += [line.replace(NO_BREAK, " ") for line in _wrap(f"{label}: {value}", "      ", "        ")]
            if f.why:
                out += _wrap(f"why: {f.why}", "      ", "        ")
            for caution in f.cautions:
                out += _wrap(f"caution: {caution}", "      ", "        ")
            for item in f.checklist:
                out += _wrap(f"[ ] {item}", "      ", "          ")
            for threshold_id, text in f.sources:
                out += _wrap(f"source ({threshold_id}): {text}", "      ", "        ")
