"""Rows that print the same values for different parts are printed once (reports.collapse).

The expected merges follow from how the inputs are built (rows equal but for the part id are one
row, rows differing in a value are not), and the teaching-lab checks count what the example
setup file holds: twelve stations, each a magnet dropped through a coil on a meter, with the
same coil, meter and magnet (setups/teaching-lab-stations.yaml). Nothing here is a stored
output of the code.
"""
from __future__ import annotations

import itertools
import re

from hypothesis import given, settings
from hypothesis import strategies as st

from reports.collapse import CollapsedRow, collapse_rows

# --- the helper ------------------------------------------------------------------------------------


def test_identical_rows_merge_into_one_naming_every_part_in_natural_order():
    rows = [(["drop-10"], ["1.81 V", "17.9"]), (["drop-2"], ["1.81 V", "17.9"]), (["drop-1"], ["1.81 V", "17.9"])]
    merged, = collapse_rows(rows)
    # 1, 2, 10 as numbers (a text sort would give 1, 10, 2)
    assert merged.parts == (("drop-1", "drop-2", "drop-10"),)
    assert merged.values == ("1.81 V", "17.9") and merged.members == (0, 1, 2) and merged.merged
    # two in a row are listed, not written as a range
    assert merged.names(code=False) == "drop-1, drop-2 and drop-10"


def test_a_consecutive_run_is_a_range_and_a_gap_is_not_hidden():
    rows = [([f"magnet-{n:02d}"], ["86.9 mm"]) for n in (1, 2, 3, 4, 6)]
    merged, = collapse_rows(rows)
    # magnet-05 is not among them, so the range stops at 04 and 06 is named on its own
    assert merged.names() == "`magnet-01` to `magnet-04` and `magnet-06`"


def test_rows_that_differ_in_a_printed_value_stay_separate():
    rows = [(["magnet-01"], ["86.9 mm"]), (["magnet-02"], ["87 mm"]), (["magnet-03"], ["87 mm"])]
    found = collapse_rows(rows)
    assert [(row.parts, row.values) for row in found] == [((("magnet-01",),), ("86.9 mm",)),
                                                         ((("magnet-02", "magnet-03"),), ("87 mm",))]


def test_a_merged_row_stands_where_its_first_member_stood():
    rows = [(["a-1"], ["x"]), (["b"], ["y"]), (["a-2"], ["x"]), (["c"], ["z"])]
    assert [row.members for row in collapse_rows(rows)] == [(0, 2), (1,), (3,)]


def test_pairs_merge_on_the_part_that_varies_and_not_when_both_vary():
    same = ["44.2 N", "30.7 mm"]
    found = collapse_rows([(["magnet-01", "frame"], same), (["magnet-02", "frame"], same),
                           (["magnet-03", "frame"], same)])
    assert [row.parts for row in found] == [(("magnet-01", "magnet-02", "magnet-03"), ("frame",))]
    # a-x and b-y share no part: one row for both would lose which goes with which
    assert len(collapse_rows([(["a", "x"], same), (["b", "y"], same)])) == 2
    # the other position varies as well: one magnet brought to three frames
    row, = collapse_rows([(["m", f"frame-{n}"], same) for n in (1, 2, 3)])
    assert row.parts == (("m",), ("frame-1", "frame-2", "frame-3"))


def test_rows_naming_no_part_never_merge():
    assert len(collapse_rows([([], ["note"]), ([], ["note"])])) == 2


def test_the_order_rows_come_in_only_moves_where_a_row_stands():
    rows = [(["drop-3"], ["v"]), (["drop-1"], ["v"]), (["drop-2"], ["v"])]
    results = {tuple(r.parts for r in collapse_rows(order)) for order in itertools.permutations(rows)}
    assert results == {((("drop-1", "drop-2", "drop-3"),),)}
    assert collapse_rows(rows) == collapse_rows(rows)


_ids = st.sampled_from(["drop-1", "drop-2", "drop-3", "drop-10", "frame", "m-a"])
_rows = st.lists(st.tuples(st.lists(_ids, min_size=0, max_size=2), st.lists(st.sampled_from(["1 V", "2 V"]),
                                                                            min_size=1, max_size=2)), max_size=12)


@settings(max_examples=200, deadline=None)
@given(_rows)
def test_every_row_and_value_is_kept(rows):
    found = collapse_rows(rows)
    members = [index for row in found for index in row.members]
    assert sorted(members) == list(range(len(rows)))           # each input row exactly once
    assert [row.members[0] for row in found] == sorted(row.members[0] for row in found)   # in input order
    for row in found:
        assert isinstance(row, CollapsedRow)
        for index in row.members:
            parts, values = rows[index]
            assert row.values == tuple(values)                   # every value printed as it was
            assert len(parts) == len(row.parts) and all(p in names for p, names in zip(parts, row.parts))
        varying = [names for names in row.parts if len(names) > 1]
        assert len(varying) <= 1                                 # only one position lists several parts


# --- the teaching-lab example: twelve identical stations -------------------------------------------

def _covered(text: str, part: str) -> bool:
    """The id is written out, or lies inside a written range ``stem-01 to stem-12`` (consecutive numbers)."""
    if re.search(rf"(?<![\w-]){re.escape(part)}(?![\w-])", text):
        return True
    stem, digits = re.fullmatch(r"(.*?)(\d+)", part).groups()
    for first, last in re.findall(rf"`?{re.escape(stem)}(\d+)`? to `?{re.escape(stem)}(\d+)", text):
        if int(first) <= int(digits) <= int(last):
            return True
    return False


def test_teaching_lab_terminal_prints_the_identical_induction_block_once(teaching_lab):
    from reports.terminal import _value_text, render_terminal

    setup, assessment = teaching_lab
    text = render_terminal(setup, assessment)
    drops = [a.id for a in setup.activities if a.kind == "pass_through_coil"]
    assert len(drops) == 12 and len(assessment.induction) == 12       # twelve stations in the setup file
    assert "drop-07" in text
    section = text.split("Induction and eddy currents", 1)[1].split("\nAssumptions", 1)[0]
    # Before: one block per station, twelve times "(pass through coil)" and the same remark.
    assert section.count("(pass through coil)") == 1
    # the meter's overload is the figure "peak to full scale" (printed once for the twelve), not a remark
    assert section.count("remark: the meter would be driven to") == 0
    assert " ".join(section.split()).count("peak to full scale:") == 1
    assert all(_covered(section, drop) for drop in drops)               # drop-01 to drop-12 names drop-07
    flat = " ".join(section.split())
    for key, value in assessment.induction[6].values.items():            # every figure of drop-07 still printed
        words, shown = _value_text(key, value)
        assert f"{words}: {shown}" in flat


def test_teaching_lab_terminal_keeps_every_keep_out_distance(teaching_lab):
    from hazards.findings import show
    from reports.terminal import render_terminal

    setup, assessment = teaching_lab
    text = render_terminal(setup, assessment)
    section = text.split("Keep-out distances", 1)[1].split("Zones (largest", 1)[0]
    lines = " ".join(section.split())
    for row in assessment.keep_out:
        entry = re.search(rf"{row.threshold_id} at [^:]*: (.*?) source:", lines).group(1)
        # the magnet is named in the entry that carries its own distance
        distance = show(row.distance_m, "length")
        named = [piece for piece in entry.split("; ") if piece.startswith(distance + " from ")]
        assert named and any(_covered(piece, row.magnet_id) for piece in named), (row.threshold_id, row.magnet_id)
    assert lines.count("magnet-01 to magnet-12") >= 1                   # equal distances are one entry


def test_teaching_lab_json_keeps_every_row(teaching_lab):
    _, assessment = teaching_lab
    data = assessment.to_dict()
    # one keep-out row per magnet (12 in the setup file) and threshold; one induction row per drop (12)
    assert len(data["keep_out"]) == 12 * len({row["threshold_id"] for row in data["keep_out"]})
    assert len(data["induction"]) == 12


def test_teaching_lab_pdf_still_names_every_magnet(teaching_lab):
    from reports.fingerprint import fingerprint
    from reports.pdf import inputs_from_setup, render_pdf
    from tests.reports.test_pdf import pdf_text

    setup, assessment = teaching_lab
    data = render_pdf(inputs_from_setup(setup, assessment, fingerprint(setup), created_epoch=0))
    text = " ".join(" ".join(pdf_text(data)).split())
    figures = text.split("Figures", 1)[1]
    for magnet in setup.magnets:
        assert magnet.id in text
        assert _covered(figures, magnet.id), magnet.id                  # also in the figure tables
    # the twelve identical induction tables are one
    assert figures.count("(pass through coil)") == 1
