"""Malformed setup files: one per error path, each message naming the key path and the line.

Most cases start from VALID (a setup that loads) and change one thing. The expected line is
found in the broken text itself (the line holding a marker), so the check is independent of
the loader. A good share of the cases also runs through `benchplan check`, which must exit 2
with the same message and no traceback.
"""
from __future__ import annotations

import subprocess
import sys
import time
from dataclasses import dataclass

import pytest
from click.testing import CliRunner

from planner import SetupError, load_setup, parse_setup
from planner.cli import main

VALID = """\
title: Error test bench
date: 2027-01-01
audience:
  groups: [staff, students]
  youngest_age: 16
magnets:
  - id: disc
    shape: cylinder
    diameter: 20 mm
    height: 10 mm
    grade: N42
    at: [0 mm, 0 mm, 5 mm]
    magnetization: +z
  - id: ring
    shape: ring
    diameter: 30 mm
    inner_diameter: 10 mm
    height: 5 mm
    grade: ferrite
    at: [100 mm, 0 mm, 2.5 mm]
    magnetization: +z
  - id: cube
    shape: block
    size: [10 mm, 10 mm, 10 mm]
    grade: N35
    at: [200 mm, 0 mm, 5 mm]
    magnetization: -x
  - id: ball
    shape: sphere
    diameter: 5 mm
    remanence: 1.3 T
    at: [300 mm, 0 mm, 2.5 mm]
    magnetization: [0, 1, 1]
steel_surfaces:
  - id: frame
    at: [0 m, 0 m, -20 mm]
    normal: +z
    thickness: 3 mm
loose_steel:
  - id: spanner
    shape: rod
    length: 15 cm
    diameter: 8 mm
    at: [0 m, 30 cm, 4 mm]
conductors:
  - id: pipe
    kind: tube
    material: copper
    inner_diameter: 25 mm
    outer_diameter: 30 mm
    length: 1 m
    at: [60 cm, 0 cm, 50 cm]
  - id: plate
    kind: sheet
    conductivity: 37 MS/m
    thickness: 5 mm
    size: [30 cm, 20 cm]
    at: [0 cm, -30 cm, 2.5 mm]
coils:
  - id: pickup
    turns: 400
    inner_diameter: 30 mm
    length: 30 mm
    wire_diameter: 0.3 mm
    at: [0 cm, 50 cm, 15 mm]
    connected_to: {kind: meter, full_scale_current: 100 uA, resistance: 500 ohm}
  - id: driver
    turns: 800
    inner_diameter: 32 mm
    outer_diameter: 60 mm
    length: 50 mm
    resistance: 12 ohm
    at: [30 cm, 50 cm, 25 mm]
    connected_to:
      kind: supply
      current: 1 A
      switch_off_time: 1 ms
activities:
  - id: through-coil
    kind: pass_through_coil
    magnet: disc
    coil: pickup
    drop_height: 20 cm
  - id: down-the-pipe
    kind: drop_through_tube
    magnet: disc
    tube: pipe
  - id: swing
    kind: swing_over_sheet
    magnet: cube
    sheet: plate
    height: 12 mm
    speed: 1 m/s
  - id: snap
    kind: bring_together
    magnet: disc
    other: frame
  - id: spark
    kind: switch_off
    coil: driver
  - id: post
    kind: ship_package
    magnets: [disc, ring]
    package_size: [10 cm, 10 cm, 10 cm]
zones:
  - id: seats
    kind: seating
    from: [-2 m, 1 m, -0.75 m]
    to: [2 m, 2 m, 0.5 m]
site_rules:
  review_interval: 12 months
"""


def edit(old: str, new: str, text: str = VALID) -> str:
    """``text`` with the one occurrence of ``old`` replaced by ``new``."""
    assert text.count(old) == 1, f"{old!r} occurs {text.count(old)} times"
    return text.replace(old, new)


def line_of(text: str, marker: str, occurrence: int = 1) -> int:
    """1-based line of the ``occurrence``-th line of ``text`` that contains ``marker``."""
    found = [number for number, line in enumerate(text.splitlines(), start=1) if marker in line]
    assert len(found) >= occurrence, f"{marker!r} not found {occurrence} times"
    return found[occurrence - 1]


def problems_of(text: str, **kwargs):
    with pytest.raises(SetupError) as caught:
        parse_setup(text, **kwargs)
    return caught.value.problems


@dataclass
class Case:
    name: str
    text: str
    path: str                 # expected key path ("" for the file as a whole)
    marker: str | None        # text on the expected line (None: no line, e.g. an empty file)
    fragments: tuple = ()     # words the message must contain
    occurrence: int = 1       # which line holding the marker
    problems: int = 1         # how many problems the file has in all

    @property
    def line(self):
        return None if self.marker is None else line_of(self.text, self.marker, self.occurrence)


def _activity(body: str) -> str:
    """VALID with one more activity appended to the list."""
    return edit("zones:\n", body + "zones:\n")


_OTHER_DISC = "  - id: disc2\n    shape: cylinder\n    diameter: 20 mm\n    height: 10 mm\n    grade: N42\n" \
              "    at: [0 mm, 0 mm, {z}]\n    magnetization: +z\n  - id: ring\n"
_BILLION_LAUGHS = (
    "title: lol\n"
    "a: &a [\"lol\", \"lol\", \"lol\", \"lol\", \"lol\", \"lol\", \"lol\", \"lol\", \"lol\"]\n"
    + "".join(f"{b}: &{b} [{', '.join(['*' + a] * 9)}]\n" for a, b in zip("abcdefgh", "bcdefghi"))
)

CASES = [
    # --- units --------------------------------------------------------------------------------
    Case("wrong unit", edit("height: 10 mm", "height: 10 T"), "magnets[0].height", "height: 10 T",
         ("must be a length such as `10 mm`", "`T` is not a unit of length")),
    Case("bare number", edit("height: 10 mm", "height: 10"), "magnets[0].height", "height: 10",
         ("bare number `10`", "`10 mm`")),
    Case("not a number", edit("    height: 5 mm", "    height: ten"), "magnets[1].height", "height: ten",
         ("must be a length such as `10 mm`; got `ten`",)),
    Case("unknown unit", edit("length: 15 cm", "length: 15 cubits"), "loose_steel[0].length", "15 cubits",
         ("`cubits` is not a unit benchplan knows",)),
    Case("quantity without unit", edit("current: 1 A", "current: '1'"), "coils[1].connected_to.current",
         "current: '1'", ("with no unit", "`1 A`")),
    Case("wrong unit in a vector component", edit("at: [0 mm, 0 mm, 5 mm]", "at: [0 mm, 0, 5 T]"),
         "magnets[0].at", "5 T", ("component 3", "not a unit of length")),
    Case("vector with two components", edit("at: [0 mm, 0 mm, 5 mm]", "at: [0 mm, 5 mm]"),
         "magnets[0].at", "at: [0 mm, 5 mm]", ("three length values", "got 2 values")),
    Case("wrong unit in site rules", edit("review_interval: 12 months", "review_interval: 12 kg"),
         "site_rules.review_interval", "12 kg", ("must be a duration",)),
    # --- missing keys, per shape and per part ---------------------------------------------------
    Case("cylinder without height", edit("    height: 10 mm\n", ""), "magnets[0].height", "- id: disc",
         ("is required for cylinder",)),
    Case("ring without inner diameter", edit("    inner_diameter: 10 mm\n", ""), "magnets[1].inner_diameter",
         "- id: ring", ("is required for ring",)),
    Case("block without size", edit("    size: [10 mm, 10 mm, 10 mm]\n", ""), "magnets[2].size", "- id: cube",
         ("is required for block",)),
    Case("sphere without diameter", edit("    diameter: 5 mm\n", ""), "magnets[3].diameter", "- id: ball",
         ("is required for sphere",)),
    Case("magnet without position", edit("    at: [300 mm, 0 mm, 2.5 mm]\n", ""), "magnets[3].at", "- id: ball",
         ("is required for sphere",)),
    Case("magnet without magnetization", edit("    magnetization: -x\n", ""), "magnets[2].magnetization",
         "- id: cube", ("is required for block",)),
    Case("tube without length", edit("    length: 1 m\n", ""), "conductors[0].length", "- id: pipe",
         ("is required for tube",)),
    Case("rod without diameter", edit("    diameter: 8 mm\n", ""), "loose_steel[0].diameter", "- id: spanner",
         ("is required for rod",)),
    Case("coil without turns", edit("    turns: 400\n", ""), "coils[0].turns", "- id: pickup", ("is required",)),
    Case("activity without its magnet", edit("    magnet: cube\n", ""), "activities[2].magnet", "- id: swing",
         ("is required for swing_over_sheet",)),
    Case("zone without a corner", edit("    from: [-2 m, 1 m, -0.75 m]\n", ""), "zones[0].from", "- id: seats",
         ("is required",)),
    Case("no title", edit("title: Error test bench\n", ""), "title", "date:", ("is required",)),
    Case("magnet without grade or remanence", edit("    grade: N35\n", ""), "magnets[2]", "- id: cube",
         ("needs a `grade`", "or a `remanence`")),
    Case("magnet without shape", edit("    shape: sphere\n", ""), "magnets[3]", "- id: ball",
         ("needs `shape:` to say what it is",)),
    # --- unknown keys and names -------------------------------------------------------------------
    Case("misspelt key", edit("    height: 10 mm\n", "    height: 10 mm\n    heigth: 11 mm\n"), "magnets[0].heigth",
         "heigth", ("is not a known key", "did you mean `height`?")),
    Case("misspelt top-level key", edit("zones:\n", "zone:\n  - id: x\nzones:\n"), "zone", "zone:",
         ("did you mean `zones`?",)),
    Case("unknown key far from any known one",
         edit("    magnetization: [0, 1, 1]\n", "    magnetization: [0, 1, 1]\n    xyzzy: 3\n"),
         "magnets[3].xyzzy", "xyzzy", ("is not a known key", "known keys here:", "diameter", "remanence")),
    Case("unknown shape", edit("shape: block", "shape: cone"), "magnets[2].shape", "shape: cone",
         ("must be one of", "'cylinder'", "'ring'", "'block'", "'sphere'", "got `cone`")),
    Case("unknown activity kind", edit("kind: switch_off", "kind: juggle"), "activities[4].kind", "kind: juggle",
         ("must be one of", "'pass_through_coil'", "got `juggle`")),
    Case("unknown conductor kind", edit("kind: sheet", "kind: mesh"), "conductors[1].kind", "kind: mesh",
         ("'tube'", "'sheet'")),
    Case("unknown grade", edit("grade: N35", "grade: N99"), "magnets[2].grade", "grade: N99",
         ("`N99` is not a known grade", "N35 to N55", "SmCo5", "ferrite", "AlNiCo5")),
    Case("misspelt grade", edit("grade: N35", "grade: N35HS"), "magnets[2].grade", "grade: N35HS",
         ("did you mean", "`N35SH`")),
    Case("unknown conductor", edit("material: copper", "material: coper"), "conductors[0].material",
         "material: coper", ("did you mean `copper`?", "aluminium")),
    Case("unknown steel", edit("    thickness: 3 mm\n", "    thickness: 3 mm\n    steel: unobtainium\n"),
         "steel_surfaces[0].steel", "unobtainium", ("is not a known steel", "low-carbon-steel")),
    # --- physical sense ---------------------------------------------------------------------------
    Case("remanence of 5 T", edit("remanence: 1.3 T", "remanence: 5 T"), "magnets[3].remanence", "remanence: 5 T",
         ("no permanent-magnet material has a remanence above about 1.5 T",)),
    Case("remanence just above the ceiling", edit("remanence: 1.3 T", "remanence: 1.56 T"), "magnets[3].remanence",
         "remanence: 1.56 T", ("above about 1.5 T",)),
    Case("ring inner diameter equal to outer", edit("inner_diameter: 10 mm", "inner_diameter: 30 mm"),
         "magnets[1].inner_diameter", "inner_diameter: 30 mm", ("must be smaller than `diameter`",)),
    Case("ring inner diameter above outer", edit("inner_diameter: 10 mm", "inner_diameter: 31 mm"),
         "magnets[1].inner_diameter", "inner_diameter: 31 mm", ("must be smaller than `diameter`",)),
    Case("tube inner diameter equal to outer", edit("inner_diameter: 25 mm", "inner_diameter: 30 mm"),
         "conductors[0].inner_diameter", "inner_diameter: 30 mm", ("must be smaller than `outer_diameter`",)),
    Case("tube inner diameter above outer", edit("inner_diameter: 25 mm", "inner_diameter: 35 mm"),
         "conductors[0].inner_diameter", "inner_diameter: 35 mm", ("must be smaller than `outer_diameter`",)),
    Case("negative size", edit("height: 10 mm", "height: -10 mm"), "magnets[0].height", "height: -10 mm",
         ("must be greater than zero",)),
    Case("zero size", edit("    diameter: 5 mm", "    diameter: 0"), "magnets[3].diameter", "diameter: 0",
         ("must be greater than zero",)),
    Case("zero sheet size", edit("size: [30 cm, 20 cm]", "size: [30 cm, 0]"), "conductors[1].size",
         "size: [30 cm, 0]", ("greater than zero",)),
    Case("zero direction vector", edit("magnetization: [0, 1, 1]", "magnetization: [0, 0, 0]"),
         "magnets[3].magnetization", "magnetization: [0, 0, 0]", ("non-zero direction",)),
    Case("bad direction", edit("magnetization: -x", "magnetization: up"), "magnets[2].magnetization",
         "magnetization: up", ("must be a direction such as `+z`", "got `up`")),
    Case("count of zero", edit("    grade: N42\n", "    grade: N42\n    count: 0\n"), "magnets[0].count",
         "count: 0", ("greater than or equal to 1",)),
    Case("fractional turns", edit("turns: 400", "turns: 400.5"), "coils[0].turns", "turns: 400.5",
         ("must be a whole number",)),
    Case("id with spaces", edit("id: cube", "id: my cube"), "magnets[2].id", "id: my cube",
         ("must be a short name",), problems=2),  # and `swing` now refers to a missing `cube`
    # --- ids and references ----------------------------------------------------------------------
    Case("duplicate id", edit("id: plate", "id: disc"), "conductors[1].id", "id: disc", ("`disc` is already used by "
         "`magnets[0]`", "ids must be unique"), occurrence=2, problems=2),
    Case("duplicate YAML key", edit("    height: 10 mm\n", "    height: 10 mm\n    height: 12 mm\n"),
         "magnets[0].height", "height: 12 mm", ("appears twice",)),
    Case("reference to a missing magnet", edit("    magnet: cube\n", "    magnet: cubr\n"), "activities[2].magnet",
         "magnet: cubr", ("refers to `cubr`", "not a magnet in this file", "known:", "`cube`")),
    Case("reference to a missing coil", edit("coil: driver", "coil: drivr"), "activities[4].coil", "coil: drivr",
         ("refers to `drivr`", "`driver`", "`pickup`")),
    Case("missing magnet in a shipping list", edit("magnets: [disc, ring]", "magnets: [disc, rnig]"),
         "activities[5].magnets[1]", "magnets: [disc, rnig]", ("refers to `rnig`",)),
    Case("reference to the wrong kind of part", edit("tube: pipe", "tube: plate"), "activities[1].tube", "tube: plate",
         ("not a tube", "`plate` is a sheet", "`pipe`")),
    Case("bring a magnet to a coil", edit("other: frame", "other: pickup"), "activities[3].other", "other: pickup",
         ("not a magnet or steel surface or loose steel item", "`pickup` is a coil")),
    Case("pass through a coil without speed or drop height", edit("    drop_height: 20 cm\n", ""), "activities[0]",
         "- id: through-coil", ("needs exactly one of `speed`", "`drop_height`")),
    Case("pass through a coil with both speed and drop height",
         edit("    drop_height: 20 cm\n", "    drop_height: 20 cm\n    speed: 2 m/s\n"), "activities[0]",
         "- id: through-coil", ("needs exactly one of",)),
    Case("couple a coil with itself", _activity("  - id: pair\n    kind: couple_coils\n    primary: pickup\n"
         "    secondary: pickup\n"), "activities[6].secondary", "secondary: pickup", ("different coil",)),
    # --- geometry -------------------------------------------------------------------------------
    Case("magnet too large for the coil bore", edit("inner_diameter: 30 mm", "inner_diameter: 19 mm"),
         "activities[0].coil", "coil: pickup", ("`disc` needs a bore of at least 20.0 mm", "19.0 mm")),
    Case("magnet exactly the coil bore", edit("inner_diameter: 30 mm", "inner_diameter: 20 mm"),
         "activities[0].coil", "coil: pickup", ("needs a bore of at least 20.0 mm",)),
    Case("magnet too large for the tube", edit("inner_diameter: 25 mm", "inner_diameter: 18 mm"),
         "activities[1].tube", "tube: pipe", ("`disc` needs a bore of at least 20.0 mm to fall through `pipe`",)),
    Case("overlapping magnets", edit("  - id: ring\n", _OTHER_DISC.format(z="14 mm")), "magnets[1].at",
         "at: [0 mm, 0 mm, 14 mm]", ("puts `disc2` inside `disc`", "cannot overlap")),
    Case("a magnet inside a ring's hole region", edit("at: [300 mm, 0 mm, 2.5 mm]", "at: [112 mm, 0 mm, 2.5 mm]"),
         "magnets[3].at", "at: [112 mm, 0 mm, 2.5 mm]", ("puts `ball` inside `ring`",)),
    # --- coils ----------------------------------------------------------------------------------
    Case("coil without wire or resistance", edit("    resistance: 12 ohm\n", ""), "coils[1]", "- id: driver",
         ("needs a `wire_diameter`", "or a measured `resistance`")),
    Case("coil outer diameter inside its bore", edit("outer_diameter: 60 mm", "outer_diameter: 30 mm"),
         "coils[1].outer_diameter", "outer_diameter: 30 mm",
         ("must be larger than `inner_diameter`",), occurrence=2),
    Case("meter without full scale", edit("full_scale_current: 100 uA, ", ""), "coils[0].connected_to",
         "connected_to: {kind: meter", ("a meter needs `full_scale_current` or `full_scale_voltage`",)),
    Case("switch off a coil without supply", edit("coil: driver", "coil: pickup"), "activities[4].coil",
         "coil: pickup", ("has no `connected_to` supply",), occurrence=2),
    # --- top-level values -------------------------------------------------------------------------
    Case("date in words", edit("date: 2027-01-01", "date: next week"), "date", "date: next week",
         ("must be a date such as",)),
    Case("impossible date", edit("date: 2027-01-01", "date: 2027-02-30"), "date", "date: 2027-02-30",
         ("must be a date such as", "`2027-02-30`")),
    Case("bad audience group", edit("groups: [staff, students]", "groups: [staff, aliens]"), "audience.groups[1]",
         "groups:", ("must be one of", "'public'", "got `aliens`")),
    Case("bad implant answer", edit("  youngest_age: 16\n", "  youngest_age: 16\n  implant_wearers: maybe\n"),
         "audience.implant_wearers", "implant_wearers: maybe", ("'screened_out'", "'may_be_present'")),
    Case("negative age", edit("youngest_age: 16", "youngest_age: -3"), "audience.youngest_age", "youngest_age: -3",
         ("greater than or equal to 0",)),
    Case("magnets not a list", "title: T\nmagnets: 3\n", "magnets", "magnets: 3", ("must be a list",)),
    Case("a magnet that is not a mapping", edit("  - id: disc\n", "  - just a disc\n  - id: disc\n"), "magnets[0]",
         "just a disc", ("must be a mapping of keys",)),
    Case("unreadable tagged value", edit("turns: 400", "turns: !!int four hundred"), "", "four hundred",
         ("is not valid YAML", "cannot read the value")),
    Case("inline site rules with a bad key", edit("  review_interval: 12 months\n",
         "  review_interval: 12 months\n  hand_forse: 20 N\n"), "site_rules.hand_forse", "hand_forse",
         ("did you mean `hand_force`?",)),
    Case("site rules path that does not exist", edit("site_rules:\n  review_interval: 12 months\n",
         "site_rules: no-such-rules.yaml\n"), "site_rules", "site_rules:", ("`no-such-rules.yaml`", "cannot be read")),
    # --- the document as a whole ------------------------------------------------------------------
    Case("not a mapping", "- title: a list\n- magnets: []\n", "", "- title", ("must be a mapping of keys",)),
    Case("a bare scalar", "just some words\n", "", "just some words", ("must be a mapping of keys", "got a str")),
    Case("empty file", "", "", None, ("is empty", "benchplan new")),
    Case("only comments", "# nothing here yet\n\n", "", None, ("is empty",)),
    Case("invalid YAML syntax", edit("size: [10 mm, 10 mm, 10 mm]", "size: [10 mm, 10 mm, 10 mm"), "",
         "grade: N35", ("is not valid YAML",)),
    Case("tab indentation", edit("    height: 10 mm\n", "\theight: 10 mm\n"), "", "\theight", ("is not valid YAML",)),
    Case("anchors and aliases", edit("at: [0 cm, 50 cm, 15 mm]", "at: &spot [0 cm, 50 cm, 15 mm]"), "", "&spot",
         ("uses YAML anchors or aliases",)),
    Case("billion laughs", _BILLION_LAUGHS, "", "a: &a", ("uses YAML anchors or aliases",)),
    Case("nesting deeper than 40", "title: deep\nnotes: " + "[" * 40 + "]" * 40 + "\n", "", "notes:",
         ("nested more than 40 levels",)),
]


def _ids(cases):
    return [c.name for c in cases]


def test_the_starting_setup_is_valid():
    # Every case changes one thing in VALID, so VALID itself must load.
    setup = parse_setup(VALID)
    assert [m.id for m in setup.magnets] == ["disc", "ring", "cube", "ball"]


def test_there_is_a_case_for_at_least_thirty_error_paths():
    assert len(CASES) >= 30
    assert len({c.name for c in CASES}) == len(CASES)


@pytest.mark.parametrize("case", CASES, ids=_ids(CASES))
def test_each_malformed_setup_names_the_key_path_and_line(case, tmp_path):
    problems = problems_of(case.text, base_directory=tmp_path)
    assert len(problems) == case.problems, [str(p) for p in problems]
    problem = next(p for p in problems if p.path == case.path)
    assert problem.line == case.line, str(problem)
    text = str(problem)
    for fragment in case.fragments:
        assert fragment in text
    if case.path:
        assert text.startswith(f"`{case.path}` ")
    if case.line is not None:
        assert text.endswith(f"(line {case.line})")


# Through the command line: exit 2, the same message, the file name, and no traceback.
CLI_CASES = CASES[::2] + [c for c in CASES[1::2] if c.path == ""]


@pytest.mark.parametrize("case", CLI_CASES, ids=_ids(CLI_CASES))
def test_check_exits_2_with_the_message_and_no_traceback(case, tmp_path):
    setup_file = tmp_path / "broken.yaml"
    setup_file.write_text(case.text, encoding="utf-8")
    result = CliRunner().invoke(main, ["check", str(setup_file)])
    assert result.exit_code == 2, result.output
    assert "Traceback" not in result.output
    assert str(setup_file) in result.stderr
    if case.path:
        assert f"`{case.path}`" in result.stderr
    if case.line is not None:
        assert f"(line {case.line})" in result.stderr
    assert result.stdout == ""  # nothing is claimed valid


@pytest.mark.parametrize("case", [c for c in CASES if c.name in ("not a number", "billion laughs", "impossible date")],
                         ids=lambda c: c.name)
def test_python_dash_m_planner_check_exits_2_without_traceback(case, tmp_path):
    setup_file = tmp_path / "broken.yaml"
    setup_file.write_text(case.text, encoding="utf-8")
    run = subprocess.run([sys.executable, "-m", "planner", "check", str(setup_file)],
                         capture_output=True, text=True, timeout=60)
    assert run.returncode == 2, run.stderr
    assert "Traceback" not in run.stderr + run.stdout
    if case.line is not None:
        assert f"(line {case.line})" in run.stderr


# --- details of particular paths ---------------------------------------------------------------

def test_the_example_message_of_the_design():
    # DESIGN.md: "`magnets[2].height` must be a length such as `10 mm`; got `ten`" with its line.
    text = edit("    height: 5 mm", "    height: ten")
    (problem,) = problems_of(text)
    assert str(problem) == f"`magnets[1].height` must be a length such as `10 mm`; got `ten` (line {line_of(text, 'ten')})"


@pytest.mark.parametrize("z", ["15 mm", "15.5 mm", "40 mm"])
def test_touching_or_separate_magnets_are_not_reported(z):
    # disc: z from 0 to 10 mm; disc2 of the same size centred at 15 mm spans 10 to 20 mm: faces touch.
    parse_setup(edit("  - id: ring\n", _OTHER_DISC.format(z=z)))


def test_blocks_side_by_side_touching_are_not_reported():
    # cube spans x = 195..205 mm; a second 10 mm cube centred at 205 + 5 = 210 mm touches it.
    second = "  - id: cube2\n    shape: block\n    size: [10 mm, 10 mm, 10 mm]\n    grade: N35\n" \
             "    at: [210 mm, 0 mm, 5 mm]\n    magnetization: +z\n  - id: ball\n"
    parse_setup(edit("  - id: ball\n", second))
    overlapping = second.replace("210 mm", "208 mm")
    (problem,) = problems_of(edit("  - id: ball\n", overlapping))
    assert problem.path == "magnets[3].at" and "inside `cube`" in problem.message


def test_a_magnet_that_just_fits_the_coil_and_tube_is_accepted():
    # The 20 mm disc passes a 20.5 mm coil bore and a 20.5 mm tube bore.
    text = edit("inner_diameter: 30 mm", "inner_diameter: 20.5 mm")
    parse_setup(edit("inner_diameter: 25 mm", "inner_diameter: 20.5 mm", text))


def test_remanence_at_the_top_of_the_ndfeb_range_is_accepted():
    # standards.md: sintered NdFeB up to about 1.5 T (ASTM A1101).
    parse_setup(edit("remanence: 1.3 T", "remanence: 1.5 T"))
    parse_setup(edit("remanence: 1.3 T", "remanence: 15 kG"))  # 15 kG = 1.5 T


def test_remanence_given_in_gauss_is_converted_before_the_ceiling_check():
    # 50 kG = 5 T (1 G = 1e-4 T): refused like 5 T, and the message shows tesla.
    (problem,) = problems_of(edit("remanence: 1.3 T", "remanence: 50 kG"))
    assert "is 5 T" in problem.message


def test_nesting_of_exactly_40_levels_is_not_refused_for_depth():
    # The top mapping is level 1; 39 nested lists make 40.
    problems = problems_of("title: deep\nmagnets: []\nnotes: " + "[" * 39 + "]" * 39 + "\n")
    assert not any("nested" in p.message for p in problems)
    assert [p.path for p in problems] == ["notes"]  # a list is not text


def test_billion_laughs_is_refused_at_once():
    started = time.perf_counter()
    problems_of(_BILLION_LAUGHS)
    assert time.perf_counter() - started < 2.0


def test_a_file_over_one_megabyte_is_refused_before_reading(tmp_path):
    big = tmp_path / "big.yaml"
    big.write_text(VALID + "notes: " + "x" * 1_000_001 + "\n", encoding="utf-8")
    with pytest.raises(SetupError) as caught:
        load_setup(big)
    (problem,) = caught.value.problems
    assert "larger than 1 MB" in problem.message and problem.path == ""
    assert str(big) in str(caught.value)
    with pytest.raises(SetupError, match="larger than 1 MB"):
        parse_setup(VALID + "notes: " + "x" * 1_000_001 + "\n")
    result = CliRunner().invoke(main, ["check", str(big)])
    assert result.exit_code == 2 and "larger than 1 MB" in result.stderr and "Traceback" not in result.output


def test_a_file_just_under_one_megabyte_is_read(tmp_path):
    # The limit is on size only: a long but valid note below 1 MB is refused by the note's
    # own length limit, not by the size check.
    problems = problems_of(VALID + "notes: " + "x" * 900_000 + "\n")
    assert [p.path for p in problems] == ["notes"]


def test_a_file_that_is_not_utf8_is_refused(tmp_path):
    latin = tmp_path / "latin1.yaml"
    latin.write_bytes(VALID.replace("Error test bench", "Caf\xe9 bench").encode("latin-1"))
    with pytest.raises(SetupError, match="not UTF-8"):
        load_setup(latin)


def test_a_missing_setup_file_exits_2(tmp_path):
    result = CliRunner().invoke(main, ["check", str(tmp_path / "nothing.yaml")])
    assert result.exit_code == 2 and "cannot be read" in result.stderr and "Traceback" not in result.output


def test_a_site_rules_file_with_bad_keys_names_that_file_and_its_lines(tmp_path):
    rules = tmp_path / "rules.yaml"
    rules.write_text("name: Our rules\nhand_forse: 20 N\nreview_interval: 12\n", encoding="utf-8")
    setup_text = edit("site_rules:\n  review_interval: 12 months\n", "site_rules: rules.yaml\n")
    setup_file = tmp_path / "setup.yaml"
    setup_file.write_text(setup_text, encoding="utf-8")
    with pytest.raises(SetupError) as caught:
        load_setup(setup_file)
    messages = sorted(str(p) for p in caught.value.problems)
    setup_line = line_of(setup_text, "site_rules:")
    assert len(messages) == 2
    assert all(m.startswith("`site_rules -> rules.yaml: ") and m.endswith(f"(line {setup_line})") for m in messages)
    assert "hand_forse` is not a known key; did you mean `hand_force`? (line 2 of that file)" in messages[0]
    assert "review_interval` must be a duration" in messages[1] and "(line 3 of that file)" in messages[1]
    result = CliRunner().invoke(main, ["check", str(setup_file)])
    assert result.exit_code == 2 and "line 2 of that file" in result.stderr and "Traceback" not in result.output


def test_a_site_rules_file_that_is_not_yaml(tmp_path):
    (tmp_path / "rules.yaml").write_text("name: [unclosed\n", encoding="utf-8")
    text = edit("site_rules:\n  review_interval: 12 months\n", "site_rules: rules.yaml\n")
    (problem,) = problems_of(text, base_directory=tmp_path)
    assert problem.path == "site_rules" and "is not valid YAML" in problem.message
    assert problem.line == line_of(text, "site_rules:")


def test_site_rules_path_is_resolved_beside_the_setup_file(tmp_path):
    (tmp_path / "rules.yaml").write_text("name: Our rules\nhand_force: 20 N\n", encoding="utf-8")
    setup_file = tmp_path / "setup.yaml"
    setup_file.write_text(edit("site_rules:\n  review_interval: 12 months\n", "site_rules: rules.yaml\n"))
    setup = load_setup(setup_file)
    assert setup.site_rules.name == "Our rules" and setup.site_rules.hand_force == pytest.approx(20.0)


# --- several problems at once ------------------------------------------------------------------

def test_several_problems_in_one_file_are_all_reported_in_line_order(tmp_path):
    text = VALID
    text = edit("    height: 5 mm", "    height: 5", text)                         # schema: bare number
    text = edit("inner_diameter: 25 mm", "inner_diameter: 35 mm", text)           # cross check: tube
    text = edit("grade: N35", "grade: N99", text)                                 # cross check: grade
    text = edit("coil: driver", "coil: drivr", text)                              # cross check: reference
    text = edit("date: 2027-01-01", "date: soon", text)                           # schema: date
    text = edit("    turns: 800\n", "    turns: 800\n    windings: 3\n", text)   # schema: unknown key
    expected = {
        "date": line_of(text, "date: soon"),
        "magnets[1].height": line_of(text, "height: 5"),
        "magnets[2].grade": line_of(text, "grade: N99"),
        "conductors[0].inner_diameter": line_of(text, "inner_diameter: 35 mm"),
        "coils[1].windings": line_of(text, "windings"),
        "activities[4].coil": line_of(text, "coil: drivr"),
    }
    problems = problems_of(text)
    assert {p.path: p.line for p in problems} == expected
    assert [p.line for p in problems] == sorted(expected.values())
    setup_file = tmp_path / "many.yaml"
    setup_file.write_text(text, encoding="utf-8")
    result = CliRunner().invoke(main, ["check", str(setup_file)])
    assert result.exit_code == 2 and "6 problems" in result.stderr and "Traceback" not in result.output
    for path, line in expected.items():
        assert f"`{path}`" in result.stderr and f"(line {line})" in result.stderr


def test_a_reference_to_an_item_with_its_own_problem_is_not_reported_again():
    # `cube` is invalid (bare size), so `swing` referring to it must not add "cube is missing".
    text = edit("size: [10 mm, 10 mm, 10 mm]", "size: [10, 10, 10]")
    problems = problems_of(text)
    assert [p.path for p in problems] == ["magnets[2].size"]


def test_errors_in_two_items_of_the_same_list_are_both_reported():
    text = edit("height: 10 mm", "height: 10")
    text = edit("    height: 5 mm", "    height: five", text)
    problems = problems_of(text)
    assert [p.path for p in problems] == ["magnets[0].height", "magnets[1].height"]


def test_a_magnet_with_a_bad_value_still_has_its_unknown_grade_reported():
    # Two problems on one magnet: the unit error and the unknown grade both appear in one run.
    text = ("title: t\nmagnets:\n  - id: disc\n    shape: cylinder\n    diameter: 25 mm\n"
            "    at: [0 mm, 0 mm, 5 mm]\n    magnetization: +z\n    height: ten\n    grade: N43\n")
    with pytest.raises(SetupError) as caught:
        parse_setup(text)
    shown = [str(p) for p in caught.value.problems]
    assert any("`magnets[0].height`" in p and "(line 8)" in p for p in shown)
    assert any("`magnets[0].grade`" in p and "N43" in p and "(line 9)" in p for p in shown)
