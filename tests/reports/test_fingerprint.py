"""The setup fingerprint: stable for the same setup however its units are spelt, different after
any edit, and computed exactly as documented (checked with an independent hashlib computation)."""
from __future__ import annotations

import hashlib
import json

import pytest

from planner.setup import parse_setup
from reports.fingerprint import (canonical_json, canonical_setup, fingerprint, short_fingerprint,
                                 threshold_table_bytes, top_level_changes)

BASE = """
title: Fingerprint bench
site: Room 1
date: 2027-05-01
magnets:
  - {id: disc, shape: cylinder, diameter: 25 mm, height: 10 mm, grade: N42,
     at: [0 mm, 0 mm, 5 mm], magnetization: +z}
zones:
  - {id: desk, kind: desk, from: [1 m, 0 m, 0 m], to: [1.5 m, 0.5 m, 0.5 m]}
"""

EDITS = [
    ("title: Fingerprint bench", "title: Fingerprint bench 2", ["title"]),
    ("site: Room 1", "site: Room 2", ["site"]),
    ("date: 2027-05-01", "date: 2027-05-02", ["date"]),
    ("height: 10 mm", "height: 10.001 mm", ["magnets"]),
    ("grade: N42", "grade: N45", ["magnets"]),
    ("at: [0 mm, 0 mm, 5 mm]", "at: [0 mm, 0.5 mm, 5 mm]", ["magnets"]),
    ("to: [1.5 m, 0.5 m, 0.5 m]", "to: [1.5 m, 0.5 m, 0.6 m]", ["zones"]),
    ("site: Room 1", "site: Room 1\nsite_rules: {review_interval: 6 months}", ["site_rules"]),
    ("site: Room 1", "site: Room 1\naudience: {groups: [staff, public]}", ["audience"]),
]


def test_same_setup_same_fingerprint_and_unit_spelling_does_not_matter():
    # 25 mm = 2.5 cm = 0.025 m: the canonical form is SI, so these are the same setup.
    respelt = BASE.replace("diameter: 25 mm", "diameter: 2.5 cm").replace("height: 10 mm", "height: 0.01 m")
    assert fingerprint(parse_setup(BASE)) == fingerprint(parse_setup(BASE))
    assert fingerprint(parse_setup(respelt)) == fingerprint(parse_setup(BASE))


def test_float_noise_below_twelve_digits_is_ignored():
    # 0.1 + 0.2 differs from 0.3 only in the 17th significant digit
    assert canonical_json({"v": [0.1 + 0.2]}) != canonical_json({"v": [0.3]})
    from reports.fingerprint import _round_floats

    assert _round_floats({"v": [0.1 + 0.2, -0.0]}) == {"v": [0.3, 0.0]}


@pytest.mark.parametrize("old, new, keys", EDITS)
def test_any_edit_changes_the_fingerprint_and_names_the_changed_part(old, new, keys):
    assert old in BASE
    before, after = parse_setup(BASE), parse_setup(BASE.replace(old, new))
    assert fingerprint(after) != fingerprint(before)
    assert top_level_changes(canonical_setup(before), canonical_setup(after)) == keys


def test_thresholds_and_version_are_part_of_the_fingerprint():
    setup = parse_setup(BASE)
    assert fingerprint(setup, thresholds=b"a: 1") != fingerprint(setup, thresholds=b"a: 2")
    assert fingerprint(setup, version="1.0") != fingerprint(setup, version="1.1")
    assert fingerprint(setup) == fingerprint(setup, thresholds=threshold_table_bytes())


def test_fingerprint_matches_an_independent_computation_of_the_documented_layout():
    setup = parse_setup(BASE)
    data = setup.model_dump(mode="json")
    text = json.dumps(data, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
    parts = [b"benchplan setup fingerprint, format 1", text.encode(), b"thresholds", b"9.9"]
    digest = hashlib.sha256()
    for part in parts:
        digest.update(len(part).to_bytes(8, "big") + part)
    # the example's floats (0.025, 0.01, 0.005, ...) already have fewer than 12 significant digits
    assert fingerprint(setup, thresholds=b"thresholds", version="9.9") == digest.hexdigest()


def test_short_form_is_the_first_twelve_hex_digits():
    full = fingerprint(parse_setup(BASE))
    assert len(full) == 64 and int(full, 16) >= 0
    assert short_fingerprint(full) == full[:12]


def test_top_level_changes_accepts_json_text_and_sees_added_and_removed_keys():
    old = canonical_json({"title": "a", "zones": [1]})
    new = canonical_json({"title": "a", "coils": []})
    assert top_level_changes(old, new) == ["coils", "zones"]
    assert top_level_changes(old, old) == []
