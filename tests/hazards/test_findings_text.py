"""Figures of findings as text for the terminal and JSON (hazards.findings.show).

Expected strings follow from the SI prefixes (BIPM SI Brochure, 9th ed., 2019, table 7: k = 1e3,
m = 1e-3, micro = 1e-6, n = 1e-9), written with the ASCII ``u`` for micro, rounded to three
significant figures.
"""
from __future__ import annotations

import math

import pytest

from hazards.findings import plain_number, show, show_field


@pytest.mark.parametrize("value, kind, text", [
    (1.5e-6, "energy", "1.5 uJ"),          # micro = 1e-6, written u in the terminal
    (5.8e-5, "current", "58 uA"),
    (2.5e-8, "charge", "25 nC"),           # nano = 1e-9
    (1.5e-6, "field", "1.5 uT"),
    (5e-4, "field", "0.5 mT"),             # fields in mT from 0.1 mT up, the unit thresholds are written in
    (0.0123, "length", "12.3 mm"),         # milli = 1e-3
    (0.99996, "length", "1 m"),            # rounds to 1.00 m, not 1000 mm
    (1234.0, "force", "1.23 kN"),          # kilo = 1e3
    (0.25, "mass", "250 g"),               # prefixes of mass go on the gram (SI Brochure section 3)
    (1.507, "mass", "1.51 kg"),
    (0.00824, "torque", "8.24 N mm"),      # 0.00824 N m = 8.24 N mm (milli on the metre)
    (2.5, "torque", "2.5 N m"),
    (123456.0, "pressure", "12.3 N/cm^2"),  # 1 N/cm^2 = 1e4 Pa
    (-2500.0, "voltage", "-2.5 kV"),
    (0.0, "length", "0 m"),
])
def test_show_writes_si_prefixes_with_an_ascii_micro(value, kind, text):
    assert show(value, kind) == text


@pytest.mark.parametrize("value", [math.nan, math.inf, -math.inf, None, "12 mm", True])
def test_show_says_not_available_for_anything_but_a_finite_number(value):
    assert show(value, "length") == "not available"
    assert show_field(value) == "not available"


def test_plain_number_rounds_to_three_figures_and_groups_thousands():
    # 3621.7 -> 3620 at three significant figures; groups of three digits by a space (SI Brochure 5.4.4)
    assert plain_number(3621.7) == "3 620"
    assert plain_number(0.5) == "0.5"
