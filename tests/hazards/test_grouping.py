"""Merging findings that say the same thing about different parts (hazards.grouping).

The expected counts follow from how the inputs are built (three findings that differ only in
the part they name are one hazard), and the expected wording is written out by hand from the
rules of hazards/grouping.py's docstring; nothing here is a stored output of the code.
"""
from __future__ import annotations

import dataclasses
import itertools
import re
import sys

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from hazards.evaluate import evaluate
from hazards.findings import ACTION, BLOCKING, NOTE, Finding
from hazards.grouping import finding_kind, group_findings, name_parts, named_parts
from hazards.thresholds import effective_thresholds
from planner.setup.model import SiteRules
from tests.hazards import assessment

T = effective_thresholds(SiteRules())
evaluate_module = sys.modules["hazards.evaluate"]   # the package exports the function under the same name


def meter(part: str, ratio: str = "17.9", severity: str = ACTION, sources=(("t1", "Source one [V]"),)) -> Finding:
    """A finding worded like the electrical rule's meter finding, about one activity."""
    return Finding(
        id=f"electrical.{part}.meter", severity=severity, concern="electrical",
        title=f"`{part}` drives the meter past full scale ({ratio} x)",
        figures=[("peak current", "1.79 mA"), ("peak / full scale", ratio)],
        why="Past full scale the needle hits its stop.",
        checklist=[f"Put a series resistor in the circuit of `{part}` and keep it there.",
                   "Try it once privately before showing it."],
        sources=list(sources))


def handling(magnet: str, other: str, gap: str = "30.7 mm") -> Finding:
    """A finding worded like the pinch rule's handling finding, about one pair."""
    return Finding(
        id=f"pinch.handling.{magnet}.{other}", severity=ACTION, concern="pinch",
        title=f"Handling `{magnet}` and `{other}`: they snap together from {gap}",
        figures=[("snap distance", gap)],
        checklist=[f"Keep `{magnet}` and `{other}` at least {gap} apart except when joining them on purpose."])


# --- what merges and what does not ---------------------------------------------------------------

def test_identical_findings_for_several_parts_become_one_naming_them_all():
    merged = group_findings([meter("stand-a"), meter("stand-b"), meter("stand-c")])
    assert len(merged) == 1                 # three findings that differ only in the part: one hazard
    finding = merged[0]
    assert finding.parts == ["stand-a", "stand-b", "stand-c"]
    # The subject of the title becomes "Each of ...", the verb stays singular.
    assert finding.title == "Each of `stand-a`, `stand-b` and `stand-c` drives the meter past full scale (17.9 x)"
    # The figures are each part's own (they were equal), after a row naming every part.
    assert finding.figures[0] == ("applies to each of these 3", "`stand-a`, `stand-b` and `stand-c`")
    assert finding.figures[1:] == meter("stand-a").figures
    assert finding.severity == ACTION and finding.concern == "electrical"


def test_a_merged_findings_checklist_names_every_part():
    finding, = group_findings([meter("stand-c"), meter("stand-a"), meter("stand-b")])
    named = [item for item in finding.checklist if "`stand-" in item]
    assert len(named) == 1                  # one tick box for the item that named the part
    for part in ("stand-a", "stand-b", "stand-c"):
        assert f"`{part}`" in named[0]
    # The parts go up front and the item follows for each, "the circuit of `stand-a`" said as
    # "its circuit": one resistor per circuit, the pronoun "it" (the resistor) stays true.
    assert named[0] == ("For each of `stand-a`, `stand-b` and `stand-c`: put a series resistor in its circuit "
                        "and keep it there.")
    # An item that named no part is unchanged.
    assert "Try it once privately before showing it." in finding.checklist


def test_pairs_with_one_part_in_common_merge_on_the_other():
    found = group_findings([handling(f"magnet-0{n}", "bench-frame") for n in range(1, 5)])
    assert len(found) == 1                  # four magnets, each with the same frame at the same distance
    title, = [found[0].title]
    # Runs of three or more consecutive numbers are written as a range (magnet-01 .. magnet-04).
    assert title == "Handling `magnet-01` to `magnet-04` and `bench-frame`: they snap together from 30.7 mm"
    # Each magnet is kept apart from the frame on its own: "it", not "them", stands for the magnet.
    assert found[0].checklist == ["For each of `magnet-01` to `magnet-04`: keep it and `bench-frame` at least "
                                  "30.7 mm apart except when joining them on purpose."]
    assert found[0].figures[0][1] == "`magnet-01`, `magnet-02`, `magnet-03` and `magnet-04`"   # every id in full


def test_findings_that_differ_in_a_figure_or_the_severity_do_not_merge():
    different_ratio = group_findings([meter("stand-a"), meter("stand-b", ratio="12.3")])
    assert [f.id for f in different_ratio] == ["electrical.stand-a.meter", "electrical.stand-b.meter"]
    different_severity = group_findings([meter("stand-a"), meter("stand-b", severity=BLOCKING)])
    assert len(different_severity) == 2
    different_distance = group_findings([handling("m-1", "frame"), handling("m-2", "frame", gap="31 mm")])
    assert len(different_distance) == 2


def test_pairs_differing_in_both_parts_do_not_merge():
    # `a`-`x` and `b`-`y` share no part; listing them together would lose which goes with which.
    assert len(group_findings([handling("a", "x"), handling("b", "y")])) == 2


def test_findings_of_different_rules_do_not_merge():
    other = dataclasses.replace(meter("stand-b"), id="electrical.stand-b.other-check")
    assert len(group_findings([meter("stand-a"), other])) == 2


def test_findings_naming_no_part_are_left_alone_and_ids_stay_unique():
    plain = Finding(id="objects.keep-away", severity=NOTE, title="How far cards must stay")
    found = group_findings([plain, dataclasses.replace(plain)])
    assert [f.title for f in found] == [plain.title, plain.title]
    assert len({f.id for f in found}) == 2


def test_sources_are_the_union():
    merged, = group_findings([meter("stand-a", sources=[("t1", "Source one [V]")]),
                              meter("stand-b", sources=[("t1", "Source one [V]"), ("t2", "Source two [M]")])])
    assert merged.sources == [("t1", "Source one [V]"), ("t2", "Source two [M]")]


# --- order and ids ---------------------------------------------------------------------------------

def test_order_is_deterministic_and_parts_in_natural_order():
    members = [meter("drop-10"), meter("drop-2"), meter("drop-1")]
    results = [[(f.id, f.title, f.figures, f.why, f.checklist, f.sources) for f in
                group_findings([handling("m-1", "frame")] + list(order))] for order in itertools.permutations(members)]
    assert all(result == results[0] for result in results)   # the order the members came in does not matter
    merged = next(f for f in group_findings(members) if f.concern == "electrical")
    # 1, 2, 10 as numbers (a text sort would give 1, 10, 2); two in a row are listed, not a range.
    assert merged.parts == ["drop-1", "drop-2", "drop-10"]
    assert merged.title.startswith("Each of `drop-1`, `drop-2` and `drop-10` drives")


def test_a_merged_finding_stands_where_its_first_member_stood():
    found = group_findings([meter("stand-a"), handling("m-1", "frame"), meter("stand-b")])
    assert [f.concern for f in found] == ["electrical", "pinch"]


def test_merged_ids_are_stable_and_unlike_any_rule_id():
    ids = [f.id for f in group_findings([meter(f"drop-{n:02d}") for n in range(1, 13)])]
    # The first part and how many more; "+" cannot occur in a setup id (planner.setup.model.Identifier).
    assert ids == ["electrical.drop-01+11.meter"]
    again = [f.id for f in group_findings([meter(f"drop-{n:02d}") for n in reversed(range(1, 13))])]
    assert again == ids


def test_a_long_run_of_numbered_parts_is_written_as_a_range():
    merged, = group_findings([meter(f"drop-{n:02d}") for n in range(1, 13)])
    assert merged.title == "Each of `drop-01` to `drop-12` drives the meter past full scale (17.9 x)"
    assert [f"drop-{n:02d}" for n in range(1, 13)] == merged.parts
    assert name_parts(["d-1", "d-2", "d-3", "d-5", "d-6", "e"], code=False) == "d-1 to d-3, d-5, d-6 and e"


def test_finding_kind_sets_the_parts_aside():
    merged, = group_findings([meter("stand-a"), meter("stand-b")])
    assert finding_kind(merged) == finding_kind(meter("stand-a")) == "electrical.*.meter"


def test_inputs_are_not_changed():
    inputs = [meter("stand-a"), meter("stand-b")]
    copies = [dataclasses.replace(f) for f in inputs]
    group_findings(inputs)
    assert inputs == copies


# --- how reasons, cautions and checklist items read for several parts ----------------------------

def worded(part: str, why: str = "", cautions=(), checklist=()) -> Finding:
    """A finding about one part whose texts write ``{p}`` where the part goes (backticked)."""
    quoted = f"`{part}`"
    return Finding(id=f"demo.{part}", severity=ACTION, concern="demo", title=f"About {quoted}",
                   why=why.format(p=quoted), cautions=[c.format(p=quoted) for c in cautions],
                   checklist=[c.format(p=quoted) for c in checklist])


def test_a_reason_naming_the_part_once_lists_the_parts_in_its_place():
    from hazards.rules.common import missing_figure_of

    gaps = [missing_figure_of("electrical", "the electrical figures of {part}", f"drop-{n}", "Measure it.")
            for n in (1, 2, 3)]
    merged, = group_findings(gaps)
    # Written by hand from the module docstring: the part follows "of", once, so "each of" and the
    # list take its place; the rest of the sentence is unchanged and said once.
    assert merged.why == ("The electrical check needs the electrical figures of each of `drop-1` to `drop-3`; "
                          "without it benchplan cannot say whether a threshold is passed.")
    assert "the same for" not in merged.why
    # With one part the finding is the rule's own, word for word.
    alone, = group_findings(gaps[:1])
    assert alone == gaps[0]


def test_items_said_with_a_pronoun_put_the_parts_up_front():
    texts = dict(
        why="{p} drives the meter past full scale.",
        cautions=["Move the cards out of {p}, or move the magnets."],
        checklist=["Count the {p} magnets out at the start and back in at the end (1 piece).",
                   "Mark {p} as heat-treated and keep it apart from the calibrated magnets.",
                   "Move {p} or the magnets so the zone lies outside the line."])
    merged, = group_findings([worded(f"m-{n}", **texts) for n in (1, 2, 3, 4)])
    # Expected wording written by hand from the module docstring's four ways, in order.
    assert merged.why == "Each of `m-1` to `m-4` drives the meter past full scale."            # subject
    assert merged.cautions == ["Move the cards out of each of `m-1` to `m-4`, or move the magnets."]  # after "of"
    assert merged.checklist == [
        # the count stays per part: "(1 piece)" of each magnet entry, not of all four
        "For each of `m-1` to `m-4`: count its magnets out at the start and back in at the end (1 piece).",
        "For each of `m-1` to `m-4`: mark it as heat-treated and keep it apart from the calibrated magnets.",
        # "or the magnets" after the part would join the list, so the list goes up front
        "For each of `m-1` to `m-4`: move it or the magnets so the zone lies outside the line."]
    # One part: every text exactly as the rule wrote it.
    single = worded("m-1", **texts)
    assert group_findings([single]) == [single]


def test_an_item_no_pronoun_can_say_keeps_the_first_wording_then_the_others():
    # "a `m-1` label": neither "it" nor "its" fits after the article, so the fallback is used.
    merged, = group_findings([worded(f"m-{n}", checklist=["Tape a {p} label on the box."]) for n in (1, 2, 3)])
    assert merged.checklist == ["Tape a `m-1` label on the box; the same for `m-2` and `m-3`."]
    # Two mentions, one after "the rest of": no rewrite either.
    merged, = group_findings([worded(f"m-{n}", checklist=["Move the cards out of {p} and check the rest of {p}."])
                              for n in (1, 2)])
    assert merged.checklist == ["Move the cards out of `m-1` and check the rest of `m-1`; the same for `m-2`."]


def test_a_part_that_is_not_the_varying_one_stays_in_place():
    # Pairs merged on the frame: the magnet is the same in each, the frames vary.
    found, = group_findings([handling("m-1", f"frame-{n}") for n in (1, 2, 3)])
    assert found.checklist == ["For each of `frame-1` to `frame-3`: keep `m-1` and it at least 30.7 mm apart "
                               "except when joining them on purpose."]


# --- properties over random lists ----------------------------------------------------------------

_parts = st.sampled_from(["drop-1", "drop-2", "drop-3", "drop-10", "m-a", "frame"])
_findings = st.lists(st.one_of(
    st.builds(meter, _parts, st.sampled_from(["17.9", "12.3"]), st.sampled_from([ACTION, NOTE])),
    st.builds(handling, _parts, _parts, st.sampled_from(["30.7 mm", "61.3 mm"]))), max_size=10)


@settings(max_examples=200, deadline=None)
@given(_findings)
def test_no_part_is_lost_and_ids_stay_unique(findings):
    grouped = group_findings(findings)
    assert len(grouped) <= len(findings)
    assert len({f.id for f in grouped}) == len(grouped)
    for finding in findings:    # every part of every input finding is named by an output of its kind
        parts = set(named_parts(finding))
        covering = [g for g in grouped if finding_kind(g) == finding_kind(finding) and g.severity == finding.severity
                    and parts <= set(g.parts) | set(named_parts(g))]
        assert covering, finding.title


# --- the teaching-lab example: twelve identical stations -------------------------------------------

@pytest.fixture(scope="module")
def teaching_lab():
    from planner.setup import site_rules_of
    from tests.conftest import assessed_example

    setup, a = assessed_example("teaching-lab-stations")
    thresholds = effective_thresholds(site_rules_of(setup))
    patch = pytest.MonkeyPatch()
    patch.setattr(evaluate_module, "group_findings", list)   # the rules' findings, not merged
    before = evaluate(setup, a, thresholds)
    patch.undo()
    return before, evaluate(setup, a, thresholds)


def test_teaching_lab_finding_count_drops(teaching_lab):
    before, after = teaching_lab
    # From the setup file: 12 drops each drive a meter past full scale (12 findings -> 1), 12 loose
    # magnets are each a hazardous small magnet (12 -> 1), 6 magnets sit over bench 1's steel frame
    # (6 handling findings -> 1). (The drops' only remark repeats the meter figure; the rule does
    # not write it, tests/hazards/test_rules_electrical_shipping.py.)
    assert len(before) - len(after) >= 11 + 11 + 5
    # Identity: merging is complete, so merging the merged findings again changes nothing.
    assert group_findings(after) == after


def test_teaching_lab_keeps_every_kind_of_hazard(teaching_lab):
    before, after = teaching_lab
    kinds_before, kinds_after = {finding_kind(f) for f in before}, {finding_kind(f) for f in after}
    # Merging only joins findings: no kind of hazard is lost.
    assert kinds_before == kinds_after
    # Every activity with a meter finding before merging is named by the merged one.
    meter_parts = {p for f in after if finding_kind(f) == "electrical.*.meter" for p in f.parts}
    metered = {re.sub(r"^electrical\.(.*)\.meter$", r"\1", f.id) for f in before if f.id.endswith(".meter")}
    assert len(metered) == 12 and metered == meter_parts
    # Severity counts on the cover count merged findings; no severity disappears.
    assert {f.severity for f in before} == {f.severity for f in after}


def test_teaching_lab_checklist_has_one_tick_box_per_merged_item(teaching_lab):
    from reports.pdf.checklist import checklist_items
    from reports.pdf.inputs import ReportInputs

    _, after = teaching_lab
    items = [item for item, _ in checklist_items(ReportInputs(assessment(findings=after), fingerprint="0" * 64))]
    counting = [item for item in items if "count its magnets out" in item]
    # One tick box for the twelve magnets, each counted on its own: the setup gives 1 piece of each.
    assert counting == ["For each of `magnet-01` to `magnet-12`: count its magnets out at the start and back in "
                        "at the end (1 piece)."]
    keeping = [item for item in items if "`bench-1-frame`" in item]
    # Six magnets sit over bench 1's frame in the setup file.
    assert len(keeping) == 1 and keeping[0].startswith("For each of `magnet-01` to `magnet-06`: keep it and")
