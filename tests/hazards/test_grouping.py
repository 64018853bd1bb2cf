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
    # The first part's wording is kept (its pronoun "it" stays true for each), then the others.
    assert named[0] == ("Put a series resistor in the circuit of `stand-a` and keep it there; "
                        "the same for `stand-b` and `stand-c`.")
    # An item that named no part is unchanged.
    assert "Try it once privately before showing it." in finding.checklist


def test_pairs_with_one_part_in_common_merge_on_the_other():
    found = group_findings([handling(f"magnet-0{n}", "bench-frame") for n in range(1, 5)])
    assert len(found) == 1                  # four magnets, each with the same frame at the same distance
    title, = [found[0].title]
    # Runs of three or more consecutive numbers are written as a range (magnet-01 .. magnet-04).
    assert title == "Handling `magnet-01` to `magnet-04` and `bench-frame`: they snap together from 30.7 mm"
    assert found[0].checklist == ["Keep `magnet-01` and `bench-frame` at least 30.7 mm apart except when joining "
                                  "them on purpose; the same for `magnet-02` to `magnet-04`."]
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
    # Measured after merging: 9 findings, one per distinct hazard (twelve identical stations).
    assert len(after) <= 9


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
    counting = [item for item in items if item.startswith("Count the `magnet-")]
    assert len(counting) == 1 and "`magnet-01`" in counting[0] and "`magnet-02` to `magnet-12`" in counting[0]
    keeping = [item for item in items if "`bench-1-frame`" in item]
    assert len(keeping) == 1 and "`magnet-02` to `magnet-06`" in keeping[0]
