"""Zones in the PDF table and the terminal summary: one row or line per zone, nothing lost.

The assessment gives one ZoneReach row per zone and threshold, each repeating the zone's largest
field. The zone rows below are invented demo data; every expected text follows from them by the
definition of a threshold being reached (largest field >= threshold, planner.physics.zones.reach)
and the SI prefixes (BIPM SI Brochure, 9th ed., 2019, table 7: m = 1e-3, µ = 1e-6).
"""
from __future__ import annotations

import math


from planner.assessment import ZoneReach
from reports.pdf import render_pdf
from reports.zone_summary import checked_in_every_zone, zone_summaries
from reports.terminal import render_terminal
from tests.reports.test_pdf import pdf_text, sample_assessment, sample_inputs

KEEP_OUT, CARDS, OWN = 5e-4, 1e-3, 5e-5     # [T] the sample's two thresholds and the desk's own limit


def _rows(zone, kind, largest, contains=(), people=True, own=None, depth=0.0):
    """The assessment's rows for one zone: one per threshold, reached when largest >= threshold."""
    limits = [("implant_keep_out", KEEP_OUT), ("magnetic_cards", CARDS)] + ([(f"{zone}:instrument_limit", own)]
                                                                         if own else [])
    return [ZoneReach(zone, kind, tid, value, largest, largest >= value, people, list(contains),
                      depth if largest >= value and math.isfinite(largest) else 0.0) for tid, value in limits]


def zone_assessment():
    a = sample_assessment()
    a.zone_reach = (_rows("front-row", "seating", 2e-6, ["cards"])
                    + _rows("office-desk", "desk", 7e-4, ["computers"], own=OWN, depth=0.012)
                    + _rows("shelf", "store_cupboard", math.inf, people=False))
    return a


def _zone_section(pages) -> str:
    text = " ".join(" ".join(page.split()) for page in pages)
    start = text.index("Zones against the thresholds")
    return text[start:text.index("Magnets brought together", start)]


def _table_body(section: str) -> str:
    """The section after the table's last heading: the rows only."""
    return section[section.index("Thresholds reached") + len("Thresholds reached"):]


def test_one_summary_per_zone_keeps_every_rows_fact():
    rows = zone_assessment().zone_reach
    summaries = zone_summaries(rows)
    assert [z.zone_id for z in summaries] == ["front-row", "office-desk", "shelf"]     # one per zone, in row order
    for z in summaries:
        mine = [r for r in rows if r.zone_id == z.zone_id]
        # every threshold checked is kept, and it is listed as reached exactly when its row says so
        assert [tid for tid, _ in z.checked] == [r.threshold_id for r in mine]
        assert [tid for tid, _, _ in z.reached] == [r.threshold_id for r in mine if r.reached]
        assert z.largest_field_T == mine[0].max_field_T
    # the desk's own limit is checked there only, so it is not among the thresholds of every zone
    assert checked_in_every_zone(summaries) == [("implant_keep_out", KEEP_OUT), ("magnetic_cards", CARDS)]
    assert not summaries[2].bounded and summaries[0].bounded


def test_the_pdf_prints_each_zone_once_with_what_reaches_it():
    section = _zone_section(pdf_text(render_pdf(sample_inputs(assessment=zone_assessment()))))
    for zone in ("front-row", "office-desk", "shelf"):
        assert _table_body(section).count(f"{zone} ") == 1, zone     # one row per zone
    # front-row: 2 µT is below both thresholds
    assert "front-row seating yes cards 2 µT none" in section
    # desk: 0.7 mT >= 0.5 mT (reached, 12 mm in), < 1 mT (not), >= its own 50 µT (reached)
    assert "office-desk desk yes computers 0.7 mT implant keep out (0.5 mT), at least 12 mm in; its own instrument " \
           "limit (50 µT, from the setup)" in section
    assert "office-desk also against its own instrument limit (50 µT, from the setup)" in section
    # shelf: a magnet in it, no bound; every threshold counts as reached
    assert "shelf store cupboard no - not bounded: a magnet is in or at the zone implant keep out (0.5 mT); " \
           "magnetic cards (1 mT)" in section
    # the thresholds checked in every zone are named once, with their values
    assert "checked against implant keep out (0.5 mT) and magnetic cards (1 mT)" in section


def test_the_terminal_prints_one_line_per_zone():
    text = render_terminal(None, zone_assessment())
    lines = [line.strip() for line in text.splitlines()]
    assert "front-row (seating, people): 2 uT; reaches none" in lines
    assert "office-desk (desk, people, own instrument_limit 50 uT): 0.7 mT; reaches implant_keep_out 0.5 mT (12 mm in), " \
           "own instrument_limit 50 uT" in " ".join(lines)
    assert "shelf (store_cupboard, no people): not bounded: a magnet is in or at the zone; reaches " \
           "implant_keep_out 0.5 mT, magnetic_cards 1 mT" in " ".join(lines)
    for zone in ("front-row (", "office-desk (", "shelf ("):
        assert sum(line.startswith(zone) for line in lines) == 1


def test_a_zone_whose_field_is_not_known_counts_as_reached_as_in_the_rules():
    # A row without a number (NaN) and the calculation's flag False: the rules count an unknown
    # field as reaching (hazards.rules.common.reaches), so the table must list every threshold too.
    from hazards.rules.common import reaches, zone_max_field

    a = sample_assessment()
    a.zone_reach = ([ZoneReach("aisle", "walkway", tid, value, math.nan, False, True, [])
                     for tid, value in (("implant_keep_out", KEEP_OUT), ("magnetic_cards", CARDS))]
                    + _rows("shelf", "store_cupboard", math.inf, people=False))
    aisle, shelf = zone_summaries(a.zone_reach)
    assert [tid for tid, _, _ in aisle.reached] == ["implant_keep_out", "magnetic_cards"]
    assert all(reaches(r.max_field_T, r.threshold_T, r.reached) for r in a.zone_reach)
    # the rules' largest field is the summary's: NaN stays unknown, infinity (no bound) is kept
    assert math.isnan(zone_max_field(a, "aisle")) and math.isnan(aisle.largest_field_T)
    assert zone_max_field(a, "shelf") == shelf.largest_field_T == math.inf
    lines = " ".join(line.strip() for line in render_terminal(None, a).splitlines())
    assert "aisle (walkway, people): not known; reaches implant_keep_out 0.5 mT, magnetic_cards 1 mT" in lines


def test_teaching_lab_zone_table_has_one_row_per_zone(teaching_lab):
    from reports.pdf import inputs_from_setup

    setup, assessment = teaching_lab
    zones = [zone.id for zone in setup.zones]
    # the assessment has a row per zone and threshold (41 for this file); the table one per zone
    assert len(assessment.zone_reach) > len(zones)
    section = _zone_section(pdf_text(render_pdf(inputs_from_setup(setup, assessment, "0" * 64))))
    for zone in zones:
        assert _table_body(section).count(f"{zone} ") == 1, zone
    # no zone of this file is reached by any threshold (every row says reached = False)
    assert not any(row.reached for row in assessment.zone_reach)
    assert _table_body(section).count(" none") == len(zones)
    terminal = render_terminal(setup, assessment)
    assert sum(line.strip().startswith(f"{zone} (") for zone in zones for line in terminal.splitlines()) == len(zones)
