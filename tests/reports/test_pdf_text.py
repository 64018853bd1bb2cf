"""Text of the PDF report: quantities with the micro sign, ids of findings in a monospaced font.

Expected quantity strings follow from the SI prefixes (BIPM SI Brochure, 9th ed., 2019, table 7:
k = 1e3, m = 1e-3, micro = 1e-6 with the symbol µ, n = 1e-9), rounded to three significant figures.
"""
from __future__ import annotations

import math

import pytest

from reports.pdf.formatting import quantity


@pytest.mark.parametrize("value, unit, text", [
    (1.5e-6, "T", "1.5 µT"),        # micro = 1e-6, written with the micro sign in the PDF
    (5.8e-5, "A", "58 µA"),
    (5e-4, "T", "0.5 mT"),          # fields in mT from 0.1 mT up
    (5e-8, "T", "50 nT"),           # ... in nT below 0.1 µT
    (0.0125, "m", "12.5 mm"),
    (2.5e-6, "m", "2.5 µm"),
    (1507.0, "g", "1.51 kg"),       # 1507 g = 1.507 kg (kilo on the gram), three figures
    (0.25, "kg", "250 g"),
    (1234.0, "rpm", "1 230 rpm"),   # no prefix for rpm; three figures, digits grouped in threes (5.4.4)
    (-2500.0, "V", "-2.5 kV"),
    (0.0, "T", "0 T"),
])
def test_quantity_writes_si_prefixes_with_the_micro_sign(value, unit, text):
    assert quantity(value, unit) == text


def test_quantity_words_for_missing_and_unbounded_values():
    assert quantity(None, "m") == "-"
    assert quantity(math.inf, "m") == "no limit"
    assert quantity(math.nan, "m") == "not defined"
